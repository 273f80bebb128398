//! Command-line tests of `verify`, `bounds`, `emit` and `scheme`: exit codes and key lines,
//! on the example schemes in examples/schemes/.

mod common;

use common::run as bilin;

fn tmp(name: &str, content: &str) -> String {
    let p = std::env::temp_dir().join(format!("bilin-cli-{}-{name}", std::process::id()));
    std::fs::write(&p, content).unwrap();
    p.to_string_lossy().into_owned()
}

#[test]
fn verify_exit_codes() {
    // Strassen 1969 (from memory), Karatsuba and Ofman 1962, Gauss (common practice)
    let (c, out, _) = bilin(&["verify", "matmul:2,2,2", "examples/schemes/strassen.txt"]);
    assert_eq!(c, 0);
    assert!(
        out.starts_with("verified: rank 7 scheme for matmul:2,2,2"),
        "{out}"
    );
    assert_eq!(
        bilin(&["verify", "poly:2,2", "examples/schemes/karatsuba.txt"]).0,
        0
    );
    assert_eq!(
        bilin(&["verify", "complex", "examples/schemes/gauss.txt"]).0,
        0
    );
    let bad = std::fs::read_to_string("examples/schemes/strassen.txt")
        .unwrap()
        .replace("c12 = m3 + m5", "c12 = m3 + 2 m5");
    let f = tmp("bad.txt", &bad);
    let (c, out, _) = bilin(&["verify", "matmul:2,2,2", &f]);
    assert_eq!(c, 1);
    assert!(
        out.contains("c12 in a11*b22 is 0 but the scheme gives 1; 2 coefficients"),
        "{out}"
    );
    // the faulty line is named, with the repair that makes the scheme verify
    assert!(
        out.contains("most likely at fault: line 11 `c12 = m3 + 2 m5`"),
        "{out}"
    );
    assert!(
        out.contains("with `c12 = m3 + m5` the scheme verifies"),
        "{out}"
    );
    // JSON: every wrong coefficient with its product and output coordinate
    let (c, out, _) = bilin(&["verify", "matmul:2,2,2", &f, "--json"]);
    assert_eq!(c, 1);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["verified"], false);
    assert_eq!(v["wrong_count"], 2);
    let wrong = v["wrong"].as_array().unwrap();
    assert_eq!(wrong.len(), 2);
    assert_eq!(wrong[0]["left"], "a11");
    assert_eq!(wrong[0]["right"], "b22");
    assert_eq!(wrong[0]["output"], "c12");
    assert_eq!(wrong[0]["expected"], "0");
    assert_eq!(wrong[0]["got"], "1");
    assert_eq!(v["likely_fault"]["line"], 11);
    assert_eq!(v["likely_fault"]["fix"], "c12 = m3 + m5");
    let (c, out, _) = bilin(&[
        "verify",
        "matmul:2,2,2",
        "examples/schemes/strassen.txt",
        "--json",
    ]);
    assert_eq!(c, 0);
    assert!(out.contains("\"verified\": true"), "{out}");
    // a product line with a wrong factor: the product line is named
    let bad = std::fs::read_to_string("examples/schemes/strassen.txt")
        .unwrap()
        .replace(
            "m6 = (a21 - a11)*(b11 + b12)",
            "m6 = (a21 - a12)*(b11 + b12)",
        );
    let f = tmp("badprod.txt", &bad);
    let (c, out, _) = bilin(&["verify", "matmul:2,2,2", &f]);
    assert_eq!(c, 1);
    assert!(
        out.contains("`m6 = (a21 - a12)*(b11 + b12)` (the product m6)"),
        "{out}"
    );
    assert!(
        out.contains("with `m6 = (-a11 + a21)*(b11 + b12)`"),
        "{out}"
    );
    let f = tmp("syntax.txt", "m1 = (a11 + *b11\n");
    let (c, _, err) = bilin(&["verify", "matmul:2,2,2", &f]);
    assert_eq!(c, 2);
    assert!(err.contains(":1:"), "{err}");
}

#[test]
fn bounds_and_emit() {
    let (c, out, _) = bilin(&["bounds", "matrix:2"]);
    assert_eq!(c, 0);
    assert!(out.contains("best lower bound: 7"), "{out}"); // Alder and Strassen 1981
    let (c, out, _) = bilin(&["bounds", "matmul:3,3,3", "--json"]);
    assert_eq!(c, 0);
    // Alder and Strassen 1981 (On the algorithmic complexity of associative algebras,
    // Theoret. Comput. Sci. 15): 2 n^2 - 1 = 17 for <3,3,3>, through its unital isotope M_3
    assert!(out.contains("\"best\": 17"), "{out}");
    let (c, out, _) = bilin(&[
        "emit",
        "matmul:2,2,2",
        "examples/schemes/winograd.txt",
        "--lang",
        "c",
    ]);
    assert_eq!(c, 0);
    assert!(out.contains("15 additions"), "{out}");
    let bad = std::fs::read_to_string("examples/schemes/strassen.txt")
        .unwrap()
        .replace("c21 = m2 + m4", "c21 = m2");
    let f = tmp("bad2.txt", &bad);
    assert_eq!(
        bilin(&["emit", "matmul:2,2,2", &f, "--lang", "python"]).0,
        1
    );
    assert_eq!(
        bilin(&[
            "emit",
            "matmul:2,2,2",
            "examples/schemes/strassen.txt",
            "--lang",
            "cobol"
        ])
        .0,
        2
    );
}

#[test]
fn scheme_constructions() {
    let (c, out, _) = bilin(&[
        "scheme",
        "kron",
        "matmul:2,2,2",
        "examples/schemes/strassen.txt",
        "matmul:2,2,2",
        "examples/schemes/strassen.txt",
        "--matmul",
        "--json",
    ]);
    assert_eq!(c, 0);
    let f = tmp("s444.json", &out);
    let (c, out, _) = bilin(&["verify", "matmul:4,4,4", &f]);
    assert_eq!(c, 0, "{out}");
    assert!(out.contains("rank 49"));
    let (c, out, _) = bilin(&[
        "scheme",
        "cost",
        "matmul:2,2,2",
        "examples/schemes/winograd.txt",
    ]);
    assert_eq!(c, 0);
    assert!(out.contains("additions after CSE: 15"), "{out}");
    let (c, out, _) = bilin(&["scheme", "cyclic", "matmul:4,4,4", &f]);
    assert_eq!(c, 0);
    assert!(out.contains("rank 49"));
    assert_eq!(
        bilin(&["scheme", "restrict", "matmul:4,4,4", &f, "--to", "3,3,3"]).0,
        0
    );
    assert_eq!(
        bilin(&["scheme", "restrict", "matmul:4,4,4", &f, "--to", "5,3,3"]).0,
        2
    );
}

/// Equivalence: de Groote 1978 ("On varieties of optimal algorithms for the computation of
/// bilinear mappings II"): every rank-7 scheme for 2 x 2 matrices is equivalent to
/// Strassen's. Strassen's, Winograd's and a rank-7 scheme found by bilin's search (written
/// with `search --out X.txt`, the text form) are reported equivalent with a verified
/// transformation; a rank-8 scheme is separated by an invariant.
#[test]
fn rank_seven_schemes_are_equivalent() {
    let dir = std::env::temp_dir().join(format!("bilin-equiv-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let found = dir.join("found.txt");
    let found_s = found.to_str().unwrap();
    let (c, _, err) = bilin(&[
        "search",
        "matmul:2,2,2",
        "--rank",
        "7",
        "--threads",
        "1",
        "--seed",
        "5",
        "--out",
        found_s,
    ]);
    assert_eq!(c, 0, "{err}");
    let text = std::fs::read_to_string(&found).unwrap();
    assert!(
        text.starts_with("# found by bilin search") && text.contains("rank 7"),
        "{text}"
    );
    let als = dir.join("als.txt");
    let (c, _, err) = bilin(&[
        "search",
        "matmul:2,2,2",
        "--rank",
        "7",
        "--method",
        "als",
        "--threads",
        "1",
        "--out",
        als.to_str().unwrap(),
    ]);
    assert_eq!(c, 0, "{err}");
    let schemes = [
        "examples/schemes/strassen.txt",
        "examples/schemes/winograd.txt",
        found_s,
        als.to_str().unwrap(),
    ];
    for a in &schemes[..2] {
        for b in &schemes {
            if a == b {
                continue;
            }
            let (c, out, err) = bilin(&["scheme", "equiv", "matmul:2,2,2", a, b]);
            assert_eq!(c, 0, "{a} {b}\n{out}{err}");
            assert!(
                out.starts_with("equivalent:") && out.contains("verified exactly"),
                "{out}"
            );
            assert!(out.contains("X = ") && out.contains("products: "), "{out}");
        }
    }
    let (c, out, _) = bilin(&[
        "scheme",
        "equiv",
        "matmul:2,2,2",
        schemes[0],
        schemes[2],
        "--json",
    ]);
    assert_eq!(c, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["verdict"], "equivalent");
    assert_eq!(v["detail"]["matching"].as_array().unwrap().len(), 7);
    let std8 = dir.join("std.txt");
    let (_, out, _) = bilin(&["scheme", "standard", "matmul:2,2,2"]);
    std::fs::write(&std8, out).unwrap();
    let (c, out, _) = bilin(&[
        "scheme",
        "equiv",
        "matmul:2,2,2",
        schemes[0],
        std8.to_str().unwrap(),
    ]);
    assert_eq!(c, 1);
    assert!(out.starts_with("not equivalent: the rank is 7"), "{out}");
    std::fs::remove_dir_all(&dir).ok();
}

/// Polish: Winograd's 15 additions stay 15 under the additions objective (Probert 1976,
/// from memory), and the command reports the shared measures.
#[test]
fn polish_reports_the_cost_model() {
    let (c, out, err) = bilin(&[
        "scheme",
        "polish",
        "matmul:2,2,2",
        "examples/schemes/winograd.txt",
        "--objective",
        "additions",
    ]);
    assert_eq!(c, 0, "{err}");
    assert!(
        err.contains("additions after CSE: 15 (left 4, right 4, output 7) -> 15"),
        "{err}"
    );
    assert!(out.contains("rank 7 scheme, verified exactly"), "{out}");
    let (c, _, err) = bilin(&[
        "scheme",
        "polish",
        "matmul:2,2,2",
        "examples/schemes/winograd.txt",
        "--objective",
        "beauty",
    ]);
    assert_eq!(c, 2);
    assert!(err.contains("unknown objective"), "{err}");
    let (c, out, _) = bilin(&[
        "scheme",
        "cost",
        "poly:3,3",
        "examples/schemes/toom3.txt",
        "--json",
    ]);
    assert_eq!(c, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["cost"]["multiplications"], 5);
    assert_eq!(v["cost"]["max_denominator"], "6");
}

/// Schemes built from schemes: `scheme build` gives <4,4,4> at 49 (Strassen 1969 on 2 x 2
/// blocks), `scheme join` glues <2,2,2> and <2,2,1> along p into <2,2,3> at 7 + 4 = 11,
/// `bounds` prints the built upper bound; bad axes and formats exit 2.
#[test]
fn build_and_join_matrix_formats() {
    let (c, out, err) = bilin(&["scheme", "build", "matmul:4,4,4"]);
    assert_eq!(c, 0, "{err}");
    assert!(out.contains("rank 49 scheme, verified exactly"), "{out}");
    let join = |second: &str, axis: &str| {
        bilin(&[
            "scheme",
            "join",
            "matmul:2,2,2",
            "examples/schemes/strassen.txt",
            "matmul:2,2,1",
            second,
            "--axis",
            axis,
        ])
    };
    assert_eq!(join("matmul221.none", "p").0, 2);
    let (_, school, _) = bilin(&["scheme", "standard", "matmul:2,2,1"]);
    let f = tmp("s221.txt", &school);
    let (c, out, err) = join(&f, "p");
    assert_eq!(c, 0, "{err}");
    assert!(
        out.contains("matmul:2,2,3") && out.contains("rank 11"),
        "{out}"
    );
    assert_eq!(join(&f, "q").0, 2);
    assert_eq!(join(&f, "n").0, 2);
    assert_eq!(bilin(&["scheme", "build", "poly:3,3"]).0, 2);
    let (c, out, _) = bilin(&["bounds", "matmul:4,4,4", "--exhaustive-work", "0"]);
    assert_eq!(c, 0);
    assert!(
        out.contains("R <= 49") && out.contains("upper 49: built"),
        "{out}"
    );
}
