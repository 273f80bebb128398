//! Unit tests of the parsers, writers and loader (hand-made inputs and error positions).

use super::*;
use crate::error::Error;
use crate::generators;
use crate::scalar::{FieldSpec, q};
use crate::tensor::Kind;

const QUAT: &str =
    "# Hamilton's quaternions. Lines starting with '#' are comments; '#' also ends a line.
field Q
basis e i j k
unit e
i*i = -1          # a bare number is a multiple of the declared unit
j*j = -1
k*k = -1
i*j = k
j*i = -k
j*k = i
k*j = -i
k*i = j
i*k = -j
";

const QUAT_GRID: &str = "field Q
basis e i j k
grid
      e    i    j    k
e     e    i    j    k
i     i   -e    k   -j
j     j   -k   -e    i
k     k    j   -i   -e
end
";

/// The error message with its position, for assertions.
fn err(r: crate::error::Result<crate::tensor::Tensor>) -> String {
    match r {
        Ok(_) => panic!("expected an error"),
        Err(e @ Error::Parse { .. }) => e.to_string(),
        Err(e) => format!("(not a parse error) {e}"),
    }
}

#[test]
fn quaternions_from_docs_agree() {
    // The two examples of docs/formats.md describe the quaternions (Hamilton 1843,
    // i^2 = j^2 = k^2 = ijk = -1) in the basis e, i, j, k = generators::cayley_dickson(2).
    let a = parse_table(QUAT, "q.bilin").unwrap();
    let b = parse_table(QUAT_GRID, "g.bilin").unwrap();
    assert_eq!(a, b);
    let mut h = generators::cayley_dickson(2).unwrap();
    h.set_names(0, ["e", "i", "j", "k"].map(String::from).to_vec());
    assert_eq!(a, h);
}

#[test]
fn bilinear_and_forms() {
    let t = parse_table(
        "left a b\nright c\nresult x y\na*c = 2 x - 1/3 y\nb * c = 3/2*x + y + 0.25x\n",
        "m",
    )
    .unwrap();
    assert_eq!(t.kind(), Kind::Bilinear);
    assert_eq!(t.dims(), [2, 1, 2]);
    assert_eq!(t.product(0, 0), &[(0, q(2, 1)), (1, q(-1, 3))]);
    assert_eq!(t.product(1, 0), &[(0, q(7, 4)), (1, q(1, 1))]);
    // Duplicate with the same value is fine; zero product lines are fine.
    let t = parse_table("basis x\nx*x = 2x\nx*x = x + x\n", "d").unwrap();
    assert_eq!(t.product(0, 0), &[(0, q(2, 1))]);
    assert!(
        parse_table("basis x\nx*x = 0\n", "z")
            .unwrap()
            .product(0, 0)
            .is_empty()
    );
}

#[test]
fn prime_field() {
    let t = parse_table("field GF(5)\nbasis x y\nx*y = 7 y - 1/2 x\n", "p").unwrap();
    assert_eq!(t.field(), FieldSpec::Prime(5));
    // -1/2 = -3 = 2 mod 5; 7 = 2 mod 5.
    assert_eq!(t.product(0, 1), &[(0, q(2, 1)), (1, q(2, 1))]);
    // 5 y vanishes mod 5, so `x*y = 5y` and `x*y = 0` agree.
    assert!(parse_table("field GF(5)\nbasis x y\nx*y = 5y\nx*y = 0\n", "p").is_ok());
    let e = err(parse_table("field GF(2)\nbasis x\nx*x = 1/2 x\n", "p"));
    assert!(
        e.starts_with("p:3:7:") && e.contains("divisible by 2"),
        "{e}"
    );
    let e = err(parse_table("field GF(9)\nbasis x\n", "p"));
    assert!(e.starts_with("p:1:7:") && e.contains("not a prime"), "{e}");
}

#[test]
fn table_errors_have_positions() {
    let cases: &[(&str, &str, &str)] = &[
        (
            "",
            "s:1:1:",
            "empty input: expected a `basis` or `left/right/result` statement",
        ),
        ("# only a comment\n\n", "s:1:1:", "empty input"),
        ("field Q\n", "s:1:1:", "no basis declared"),
        ("basis e i\ni*q = e\n", "s:2:3:", "unknown basis name `q`"),
        (
            "basis e i\ni*i = e + w\n",
            "s:2:11:",
            "unknown basis name `w`",
        ),
        ("basis e i i\n", "s:1:11:", "duplicate basis name `i`"),
        ("basis e 1i\n", "s:1:9:", "invalid basis name `1i`"),
        (
            "basis e i\ni*i = e\ni*i = -e\n",
            "s:3:1:",
            "conflicting duplicate product `i*i`",
        ),
        ("basis e i\ni*i = 1/0 e\n", "s:2:9:", "division by zero"),
        ("basis e i\ni*i = -1\n", "s:2:8:", "no `unit` statement"),
        ("basis e i\ni i = e\n", "s:2:3:", "expected `*` after `i`"),
        (
            "basis e i\ni*i == e\n",
            "s:2:6:",
            "expected a coefficient or a basis name",
        ),
        ("basis e i\ni*i = e e\n", "s:2:9:", "expected `+`, `-`"),
        ("basis e i\nfoo e\n", "s:2:1:", "expected a statement"),
        ("i*i = e\n", "s:1:1:", "a product before the basis"),
        ("basis e\nleft a\n", "s:2:1:", "not both"),
        (
            "left a\nright b\na*b = a\n",
            "s:3:1:",
            "a product before the basis",
        ),
        ("left a\nright b\n", "s:1:1:", "`result` is missing"),
        ("basis e\nbasis f\n", "s:2:1:", "declared twice"),
        (
            "basis e i\nunit e\ne*i = e\n",
            "s:3:1:",
            "contradicts `unit e`",
        ),
        (
            "left a\nright b\nresult c\nunit a\n",
            "s:4:1:",
            "only meaningful for an algebra",
        ),
        (
            "basis e\nend\n",
            "s:2:1:",
            "`end` without a matching `grid`",
        ),
        ("basis e\ngrid\ne\ne e\n", "s:2:1:", "not closed"),
        (
            "basis e i\ngrid\ne i\ne e i\ni i\nend\n",
            "s:5:4:",
            "expected 2 cells",
        ),
        ("basis e i\ngrid\ne\n", "s:3:2:", "no column for `i`"),
        (
            "basis e i\ngrid\ne i\ne e i\nend\n",
            "s:5:1:",
            "no row for `i`",
        ),
        (
            "basis e i\ngrid\ne i\ne e i\ne e i\n",
            "s:5:1:",
            "appears twice",
        ),
        (
            "basis e i\ngrid\ne i\ne e q\n",
            "s:4:5:",
            "unknown basis name `q`",
        ),
        (
            "basis e\ne*e = e\nfield Q\n",
            "s:3:1:",
            "must come before the products",
        ),
        ("basis e\x01\n", "s:1:8:", "control character U+0001"),
        (
            "basis x\nx*x = 99999999999999999999999999/3 x\nx*x = x\n",
            "s:3:1:",
            "conflicting",
        ),
    ];
    for (text, at, msg) in cases {
        let e = err(parse_table(text, "s"));
        assert!(
            e.starts_with(at) && e.contains(msg),
            "input {text:?}: got `{e}`, want `{at} ... {msg}`"
        );
    }
    let long = format!("basis x\nx*x = {} x\n", "1".repeat(5000));
    assert!(err(parse_table(&long, "s")).contains("at most 4096 digits"));
    let many: Vec<String> = (0..5000).map(|i| format!("x{i}")).collect();
    let e = err(parse_table(&format!("basis {}\n", many.join(" ")), "s"));
    assert!(e.contains("dimensions are at most 4096"), "{e}");
}

#[test]
fn grid_with_sums_and_unit() {
    let t = parse_table(
        "basis e x\nunit e\ngrid\n  x  e\nx  1/2e+2x  x\ne x e\nend\n",
        "g",
    )
    .unwrap();
    assert_eq!(t.product(1, 1), &[(0, q(1, 2)), (1, q(2, 1))]);
    // In a grid and a product line the same product must agree.
    let e = err(parse_table(
        "basis e x\ngrid\n x e\nx 0 x\ne x e\nend\nx*x = e\n",
        "g",
    ));
    assert!(e.starts_with("g:7:1:") && e.contains("conflicting"), "{e}");
}

#[test]
fn json_forms_and_errors() {
    let doc = r#"{"field": "Q", "kind": "algebra", "dims": [4, 4, 4],
 "names": [["e","i","j","k"], ["e","i","j","k"], ["e","i","j","k"]],
 "entries": [[0, 0, 0, "1"], [1, 2, 3, "1"], [2, 1, 3, "-1"]]}"#;
    let t = parse_json(doc, "j").unwrap();
    assert_eq!(t.nnz(), 3);
    assert_eq!(t.get(2, 1, 3), q(-1, 1));
    let t = parse_json(
        r#"{"kind":"bilinear","dims":[1,2,1],"entries":[[0,1,0,3],[0,0,0,"-1/2"]]}"#,
        "j",
    )
    .unwrap();
    assert_eq!(t.get(0, 1, 0), q(3, 1));
    assert_eq!(t.name(1, 1), "b1");
    let cases: &[(&str, &str, &str)] = &[
        ("{\"kind\": ", "j:1:10:", "invalid JSON"),
        ("[1]", "j:1:1:", "expected a JSON object"),
        (
            "{\"kind\":\"algebra\",\"dims\":[2,2,2],\"entries\":[\n[0,0,0,\"1\"],\n  [0,0,5,\"1\"]]}",
            "j:3:8:",
            "$.entries[1][2]: expected an index in 0..2",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[2,2,2],\"entries\":[[0,0,0,\"1\"],[0,0,0,\"2\"]]}",
            "j:1:57:",
            "conflicting duplicate",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[2,2,2],\"entries\":[[0,0,0,\"1/0\"]]}",
            "j:1:52:",
            "$.entries[0][3]: division by zero",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[2,2,2],\"entries\":[[0,0,0,0.1]]}",
            "j:1:52:",
            "$.entries[0][3]: the floating-point number 0.1 is not exactly 1/10",
        ),
        (
            "{\"field\":\"GF(4)\",\"kind\":\"algebra\",\"dims\":[1,1,1],\"entries\":[]}",
            "j:1:10:",
            "$.field: 4 is not a prime",
        ),
        (
            "{\"field\":\"GF(3)\",\"kind\":\"algebra\",\"dims\":[1,1,1],\"entries\":[[0,0,0,\"1/3\"]]}",
            "j:1:68:",
            "divisible by 3",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[5000,5000,5000],\"entries\":[]}",
            "j:1:27:",
            "$.dims[0]: expected a dimension between 1 and 4096",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[1,2,1],\"entries\":[]}",
            "j:1:26:",
            "equal dimensions",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[1,1,1],\"names\":[[\"a\"],[\"a\"],[\"1\"]],\"entries\":[]}",
            "j:1:56:",
            "$.names[2][0]: invalid basis name",
        ),
        (
            "{\"kind\":\"algebra\",\"dims\":[1,1,1],\"entries\":[],\"extra\":1}",
            "j:1:47:",
            "unknown key",
        ),
        (
            "{\"dims\":[1,1,1],\"entries\":[]}",
            "j:1:1:",
            "$: missing key \"kind\"",
        ),
    ];
    for (text, at, msg) in cases {
        let e = err(parse_json(text, "j"));
        assert!(
            e.starts_with(at) && e.contains(msg),
            "input {text:?}: got `{e}`, want `{at} ... {msg}`"
        );
    }
}

#[test]
fn writers_round_trip_generators() {
    for spec in [
        "quaternions",
        "matmul:2,3,2",
        "clifford:1,2",
        "jordan:3",
        "quotient:1/2,-3,0,2",
    ] {
        let t = generators::generate(spec).unwrap();
        assert_eq!(parse_table(&write_table(&t), "w").unwrap(), t, "{spec}");
        assert_eq!(parse_json(&write_json(&t), "w").unwrap(), t, "{spec}");
        if t.kind() == Kind::Algebra {
            assert_eq!(
                parse_table(&write_grid(&t).unwrap(), "w").unwrap(),
                t,
                "{spec}"
            );
        } else {
            assert!(write_grid(&t).is_err());
        }
    }
    let t = generators::generate("quaternions").unwrap();
    let grid = write_grid(&t).unwrap();
    let rows: Vec<String> = grid
        .lines()
        .map(|l| l.split_whitespace().collect::<Vec<_>>().join(" "))
        .collect();
    assert!(rows.contains(&"e1 e1 -e0 e3 -e2".to_string()), "{grid}");
    assert!(write_table(&t).contains("e1*e1 = -e0\n"));
}

#[test]
fn load_resolution_and_field_override() {
    let t = load_input("octonions", None).unwrap();
    assert_eq!(t.dim(), 8);
    let t7 = load_input("jordan:2", Some(FieldSpec::Prime(7))).unwrap();
    assert_eq!(t7.get(0, 2, 2), q(4, 1)); // 1/2 = 4 mod 7
    let e = load_input("jordan:2", Some(FieldSpec::Prime(2)))
        .unwrap_err()
        .to_string();
    assert!(e.contains("denominator divisible by 2"), "{e}");
    let e = load_input("no-such-thing.bilin", None)
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("no file, generator or catalog entry named `no-such-thing.bilin`"),
        "{e}"
    );
    let e = load_input("matmul:2", None).unwrap_err().to_string();
    assert!(e.contains("expects 3"), "{e}");
    fn hook(name: &str) -> Option<crate::error::Result<crate::tensor::Tensor>> {
        (name == "test-hook-entry").then(|| generators::generate("dual"))
    }
    register_resolver(hook);
    assert_eq!(load_input("test-hook-entry", None).unwrap().dim(), 2);
}

#[test]
fn file_loader_limits() {
    let dir = std::env::temp_dir();
    let pid = std::process::id();
    // A sparse file just above 64 MiB is refused before reading.
    let big = dir.join(format!("bilin-test-big-{pid}.bilin"));
    let f = std::fs::File::create(&big).unwrap();
    f.set_len(MAX_FILE_BYTES + 1).unwrap();
    drop(f);
    let e = read_text_file(big.to_str().unwrap())
        .unwrap_err()
        .to_string();
    assert!(e.contains("larger than the limit of 64 MiB"), "{e}");
    std::fs::remove_file(&big).unwrap();
    // Invalid UTF-8 is reported at its line and column.
    let bin = dir.join(format!("bilin-test-bin-{pid}.bilin"));
    std::fs::write(&bin, b"basis e\nxy\xff\xfe\n").unwrap();
    let path = bin.to_str().unwrap().to_string();
    let e = load_input(&path, None).unwrap_err().to_string();
    assert!(
        e.starts_with(&format!("{path}:2:3:")) && e.contains("not UTF-8"),
        "{e}"
    );
    std::fs::remove_file(&bin).unwrap();
    // JSON is chosen by the first non-space character.
    let js = dir.join(format!("bilin-test-json-{pid}.txt"));
    std::fs::write(
        &js,
        " \n{\"kind\":\"algebra\",\"dims\":[1,1,1],\"entries\":[[0,0,0,\"1\"]]}",
    )
    .unwrap();
    assert_eq!(load_input(js.to_str().unwrap(), None).unwrap().nnz(), 1);
    std::fs::remove_file(&js).unwrap();
}

/// Files are recognised by content first: a zip archive (numpy's `.npz`) and a file named
/// `.npy` without the magic bytes are refused with what was expected; the same text under
/// another name reads as usual.
#[test]
fn archives_and_misnamed_arrays() {
    let o = ReadOptions::default();
    let e = parse_bytes(b"PK\x03\x04rest".to_vec(), "a.npz", &o)
        .unwrap_err()
        .to_string();
    assert!(e.starts_with("a.npz: byte 0: a zip archive"), "{e}");
    assert!(e.contains("np.save"), "{e}");
    let e = parse_bytes(b"basis e\ne*e = e\n".to_vec(), "t.NPY", &o)
        .unwrap_err()
        .to_string();
    assert!(
        e.starts_with("t.NPY: byte 0: not a .npy file: expected the bytes 93 4E 55 4D 50 59"),
        "{e}"
    );
    assert!(e.ends_with("found 62 61 73 69 73 20"), "{e}");
    let e = parse_bytes(Vec::new(), "t.npy", &o)
        .unwrap_err()
        .to_string();
    assert!(e.ends_with("found an empty file"), "{e}");
    assert!(parse_bytes(b"basis e\ne*e = e\n".to_vec(), "t.txt", &o).is_ok());
}
