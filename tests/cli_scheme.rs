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
    assert!(out.contains("\"best\": 9"), "{out}");
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
    assert!(out.contains("additions after greedy CSE: 15"), "{out}");
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
