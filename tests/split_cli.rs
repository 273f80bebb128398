//! Runs the real binary's `split` subcommand and the structure section of `analyze`:
//! published decompositions appear in the text and JSON reports, the change of basis it
//! writes makes the table block diagonal, bad requests exit with code 2.

mod common;

use common::{run, tmpdir};

fn json(args: &[&str]) -> serde_json::Value {
    let (code, out, err) = run(args);
    assert_eq!(code, 0, "{args:?}: {err}");
    serde_json::from_str(&out).unwrap()
}

/// Q[S_3] = Q + Q + M_2(Q) (Curtis and Reiner 1962, Representation Theory of Finite Groups
/// and Associative Algebras).
#[test]
fn rational_s3_in_json() {
    let j = json(&["split", "symmetric:3", "--json"]);
    assert_eq!(j["schema"], "bilin.split/1");
    let b = &j["blocks"];
    assert_eq!(b["count"], 3);
    assert_eq!(b["block_diagonal_checked"], true);
    assert_eq!(b["coefficients_outside"], 0);
    let c = &j["components"];
    assert_eq!(c["semisimple"], true);
    let mut dims: Vec<u64> = c["components"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x["dim"].as_u64().unwrap())
        .collect();
    dims.sort();
    assert_eq!(dims, vec![1, 1, 4]);
    let shapes: Vec<&str> = c["components"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x["shape"].as_str().unwrap())
        .collect();
    assert!(shapes.contains(&"M_2(Q)"), "{shapes:?}");
}

/// F_2[C_4] = F_2[x]/((x - 1)^4) is local, radical of dimension 3 (common practice).
#[test]
fn radical_over_gf2_in_text() {
    let (code, out, err) = run(&[
        "split",
        "cyclic:4",
        "--field",
        "GF(2)",
        "--only",
        "components",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("): dim 3"), "{out}");
    assert!(out.contains("dim A/rad A = 1"), "{out}");
    assert!(out.contains("simple components of A/rad A: 1"), "{out}");
}

/// The structure is a section of `analyze` (text and JSON) unless `--no-structure`.
#[test]
fn analyze_has_the_structure_section() {
    let j = json(&["analyze", "Q8", "--json", "--no-bounds", "--no-invariants"]);
    let s = j["extra"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["id"] == "structure")
        .expect("a structure section");
    // Q[Q_8] = 4 Q + H (common practice)
    let comps = s["data"]["split"]["components"]["components"]
        .as_array()
        .unwrap();
    assert_eq!(comps.len(), 5);
    assert_eq!(comps.iter().filter(|c| c["division_dim"] == 4).count(), 1);
    let (code, out, _) = run(&["analyze", "Q8", "--no-bounds", "--no-invariants"]);
    assert_eq!(code, 0);
    // one structure section: the verdicts first, then the blocks and components
    assert_eq!(out.matches("== Structure").count(), 1, "{out}");
    let (verdicts, blocks) = (
        out.find("semisimple  ").unwrap(),
        out.find("block 1").unwrap(),
    );
    assert!(verdicts < blocks, "{out}");
    // without the costly part the section keeps the verdicts only
    let (_, out, _) = run(&["analyze", "Q8", "--no-structure", "--no-bounds"]);
    assert!(
        out.contains("== Structure") && out.contains("semisimple  "),
        "{out}"
    );
    assert!(!out.contains("block 1"), "{out}");
}

/// `--basis-out` writes the change of basis; `transform --basis` applies it and the table
/// has no product between the blocks (dihedral:3 = Q[S_3] = Q + Q + M_2(Q)).
#[test]
fn basis_out_makes_the_table_block_diagonal() {
    let dir = tmpdir("split-basis");
    let basis = dir.join("blocks.txt");
    let svg = dir.join("blocks.svg");
    let (code, _, err) = run(&[
        "split",
        "dihedral:3",
        "--basis-out",
        basis.to_str().unwrap(),
        "--svg",
        svg.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(std::fs::read_to_string(&svg).unwrap().contains("<svg"));
    let (code, out, err) = run(&[
        "transform",
        "dihedral:3",
        "--basis",
        basis.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    // the new basis names are f{block}_{i}: a product of two different blocks is absent and
    // every product lands in its own block
    for line in out.lines().filter(|l| l.contains('*')) {
        let block = |w: &str| w.trim().split('_').next().unwrap().to_string();
        let (lhs, rhs) = line.split_once('=').unwrap();
        let (x, y) = lhs.split_once('*').unwrap();
        assert_eq!(block(x), block(y), "{line}");
        for term in rhs.split(['+', '-']).filter(|t| t.contains('f')) {
            let name = term.split_whitespace().last().unwrap();
            assert_eq!(block(name), block(x), "{line}");
        }
    }
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn bad_requests_exit_2() {
    let (code, _, err) = run(&["split", "symmetric:3", "--only", "nonsense"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown part"), "{err}");
    let (code, _, _) = run(&["split", "no-such-input-anywhere"]);
    assert_eq!(code, 2);
    let (code, _, err) = run(&[
        "split",
        "symmetric:3",
        "--only",
        "lie",
        "--basis-out",
        "x.txt",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("blocks"), "{err}");
}
