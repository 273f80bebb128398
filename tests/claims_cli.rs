//! The real binary on the claims users make and on maps that stay maps: Malcev, solvable,
//! nilpotent (with class), semisimple in `--laws` and `--expect`; no laws for a bilinear
//! map unless asked; `--laws none`; bracket lines and declared symmetries; slices of a map
//! in the grid form.

mod common;

use common::run;
use rand::{Rng, SeedableRng};

fn scratch(name: &str, text: &str) -> String {
    let dir = std::env::temp_dir().join(format!("bilin-claims-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p.to_string_lossy().into_owned()
}

const QUICK: [&str; 2] = ["--no-invariants", "--no-bounds"];

fn analyze(args: &[&str]) -> (i32, String, String) {
    let mut a = vec!["analyze"];
    a.extend_from_slice(args);
    a.extend_from_slice(&QUICK);
    run(&a)
}

/// The solvable, nilpotent and semisimple verdicts of a JSON report: the first part of its
/// structure section (an empty list when there is no such section).
fn properties(j: &serde_json::Value) -> Vec<serde_json::Value> {
    j["extra"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["id"] == "structure")
        .and_then(|s| s["data"]["properties"].as_array().cloned())
        .unwrap_or_default()
}

/// The Heisenberg algebra is nilpotent of class 2, hence solvable, and not semisimple;
/// sl_2 is semisimple and not solvable (Jacobson 1962, Lie Algebras, ch. I-III; common
/// practice). The upper triangular 2 x 2 matrices under the commutator are solvable, not
/// nilpotent (common practice). Names in any case.
#[test]
fn structure_claims() {
    let (code, _, err) = analyze(&["heisenberg:1", "--expect", "Solvable,nilpotent,!SEMISIMPLE"]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("all 3 claims hold"), "{err}");
    let (code, out, _) = analyze(&["heisenberg:1", "--json"]);
    assert_eq!(code, 0);
    let j: serde_json::Value = serde_json::from_str(&out).unwrap();
    let nil = properties(&j)
        .into_iter()
        .find(|p| p["property"] == "nilpotent")
        .unwrap();
    assert_eq!(
        (nil["holds"].as_bool(), nil["class"].as_u64()),
        (Some(true), Some(2))
    );
    let (code, out, err) = analyze(&["sl:2", "--expect", "semisimple,!solvable,!nilpotent"]);
    assert_eq!(code, 0, "{err}");
    // the witness of "not solvable": the last derived term, here all of sl_2
    assert!(
        out.contains("witness: the derived series stops at a nonzero term"),
        "{out}"
    );
    let b2 = scratch(
        "b2.bilin",
        "# upper triangular 2 x 2 matrices under the commutator\nbasis E11 E12 E22\n\
         [E11, E12] = E12\n[E12, E22] = E12\n",
    );
    let (code, out, err) = analyze(&[&b2, "--expect", "lie,solvable,!nilpotent,!semisimple"]);
    assert_eq!(code, 0, "{err}\n{out}");
    // the octonions are neither Lie nor associative: semisimplicity is undecided, and a
    // claim about it is not confirmed
    let (code, _, err) = analyze(&["octonions", "--expect", "semisimple"]);
    assert_eq!(code, 1);
    assert!(
        err.contains("`semisimple` was expected to hold but is not decided"),
        "{err}"
    );
}

/// The imaginary octonions under the commutator (here with the central e0) form a Malcev
/// algebra that is not Lie (Sagle 1961, Malcev algebras, Trans. AMS 101).
#[test]
fn malcev_claims() {
    let (code, out, err) = analyze(&["commutator:octonions", "--expect", "MALCEV,!lie"]);
    assert_eq!(code, 0, "{err}\n{out}");
    let (code, _, err) = analyze(&["octonions", "--laws", "bogus"]);
    assert_eq!(code, 2);
    assert!(
        err.starts_with("error: --laws: unknown law `bogus`"),
        "{err}"
    );
}

/// A scrambled 8 x 8 x 8 data array given as a bilinear map gets no law section unless
/// asked; `--laws none` drops the laws of an algebra.
#[test]
fn a_map_is_a_map() {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(8);
    let mut entries = Vec::new();
    for i in 0..8 {
        for j in 0..8 {
            for k in 0..8 {
                let v: i64 = rng.gen_range(-9..=9);
                if v != 0 {
                    entries.push(format!("[{i}, {j}, {k}, {v}]"));
                }
            }
        }
    }
    let f = scratch(
        "map8.json",
        &format!(
            "{{\"kind\": \"bilinear\", \"dims\": [8, 8, 8], \"entries\": [{}]}}",
            entries.join(", ")
        ),
    );
    let (code, out, _) = analyze(&[&f]);
    assert_eq!(code, 0);
    assert!(
        !out.contains("== Laws") && !out.contains("nilpotent  "),
        "{out}"
    );
    assert!(
        out.contains("laws are not checked for a bilinear map"),
        "{out}"
    );
    let (code, out, _) = analyze(&[&f, "--json"]);
    assert_eq!(code, 0);
    let j: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert!(j["laws"].is_null() && properties(&j).is_empty(), "{j}");
    let (code, out, _) = analyze(&[&f, "--laws", "associative"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("== Laws") && out.contains("read as an algebra"),
        "{out}"
    );
    let (code, out, _) = analyze(&["quaternions", "--laws", "none"]);
    assert_eq!(code, 0);
    assert!(
        !out.contains("== Laws") && !out.contains("nilpotent  "),
        "{out}"
    );
    let (code, out, _) = analyze(&["quaternions", "--laws", "none", "--json"]);
    assert_eq!(code, 0);
    let j: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert!(properties(&j).is_empty(), "{j}");
    // the flattening line of the bounds never contradicts its numbers
    let (code, out, _) = run(&["analyze", "heisenberg:1", "--no-invariants"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("left 2 of 3, right 2 of 3, result 1 of 3"),
        "{out}"
    );
}

/// A dense map too large for a quick report: the cheap sections come first, the costly
/// invariants are skipped, each named with its estimate, and the report says how to ask
/// for them with this input's name (a part named by `--invariants` runs whatever its cost).
#[test]
fn large_map_skips_costly_invariants_and_says_how_to_ask() {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(40);
    let slices: Vec<String> = (0..50)
        .map(|_| {
            let rows: Vec<String> = (0..50)
                .map(|_| {
                    let row: Vec<String> =
                        (0..10).map(|_| rng.gen_range(-5..=5).to_string()).collect();
                    format!("[{}]", row.join(","))
                })
                .collect();
            format!("[{}]", rows.join(","))
        })
        .collect();
    let f = scratch("dense50.json", &format!("[{}]\n", slices.join(",\n")));
    let (code, out, err) = run(&["analyze", &f, "--no-bounds", "--no-structure"]);
    assert_eq!(code, 0, "{err}");
    let ranks = out.find("== Ranks").unwrap();
    let inv = out.find("== Invariants").unwrap();
    assert!(ranks < inv, "{out}");
    for part in ["centroid-triples", "derivation-triples", "adjoint-pairs"] {
        assert!(
            out.contains(&format!("{part}: skipped: its linear system has")),
            "{out}"
        );
    }
    assert!(
        out.contains("left radical {u : T(u,V) = 0}: dim 0"),
        "{out}"
    );
    assert!(
        out.contains(&format!(
            "run `bilin invariants {f} --only centroid-triples,derivation-triples,adjoint-pairs`"
        )),
        "{out}"
    );
    let (code, out, err) = run(&[
        "analyze",
        &f,
        "--no-bounds",
        "--no-structure",
        "--invariants",
        "radicals",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("right radical {v : T(U,v) = 0}: dim 0"),
        "{out}"
    );
    assert!(!out.contains("skipped"), "{out}");
}

/// Brackets, declarations and their contradictions, located.
#[test]
fn brackets_and_symmetries() {
    let bad = scratch("bad.bilin", "basis a b\ncommutative\n[a, b] = b\n");
    let (code, _, err) = run(&["convert", &bad]);
    assert_eq!(code, 2);
    assert!(
        err.starts_with(&format!(
            "error: {bad}:3:1: a bracket `[x, y]` is anticommutative"
        )),
        "{err}"
    );
    let bad = scratch(
        "bad2.bilin",
        "basis h e f\nanticommutative\ne*f = h\nf*e = h\n",
    );
    let (code, _, err) = run(&["convert", &bad]);
    assert_eq!(code, 2);
    assert!(
        err.contains(":4:1: `f*e` = `h` contradicts `anticommutative` (line 2)"),
        "{err}"
    );
    let bad = scratch(
        "bad3.json",
        "{\"kind\": \"algebra\", \"dims\": [2, 2, 2], \"symmetry\": \"anticommutative\",\n \
         \"entries\": [[0, 1, 0, 1], [1, 0, 0, 1]]}",
    );
    let (code, _, err) = run(&["convert", &bad]);
    assert_eq!(code, 2);
    assert!(
        err.contains(":2:28: $.entries[1]: conflicting duplicate"),
        "{err}"
    );
}

/// The grid form of a map: its slices along a chosen axis, read back the same.
#[test]
fn slices_of_a_map_round_trip() {
    for axis in ["left", "right", "result"] {
        let (code, grid, err) = run(&["convert", "matmul:2,3,2", "--to", "grid", "--axis", axis]);
        assert_eq!(code, 0, "{err}");
        assert!(grid.contains(&format!("slice {axis} ")), "{grid}");
        let f = scratch(&format!("slices-{axis}.bilin"), &grid);
        let (_, a, _) = run(&["convert", &f, "--to", "json"]);
        let (_, b, _) = run(&["convert", "matmul:2,3,2", "--to", "json"]);
        assert_eq!(a, b, "{axis}");
    }
    let (code, _, err) = run(&["convert", "matmul:2,2,2", "--axis", "left"]);
    assert_eq!(code, 2);
    assert!(err.starts_with("error: --axis:"), "{err}");
    let (code, _, err) = run(&[
        "convert",
        "examples/inputs/counts.npy",
        "--rationalize",
        "x",
    ]);
    assert_eq!(code, 2);
    assert!(err.starts_with("error: --rationalize:"), "{err}");
    let (code, _, _) = run(&["convert", "quaternions", "--field", "gf(3)"]);
    assert_eq!(code, 0);
}
