//! Runs the real binary's `invariants` subcommand on built-in generators: published
//! dimensions appear in the JSON report, bad requests exit with code 2.

mod common;

use common::bilin;

#[test]
fn octonion_derivations_json() {
    // Der(O) = G2 of dimension 14; nucleus = scalars: Schafer 1966, An Introduction to
    // Nonassociative Algebras, ch. III.
    let o = bilin(&[
        "invariants",
        "octonions",
        "--json",
        "--only",
        "derivations,nuclei",
    ]);
    assert_eq!(o.status.code(), Some(0));
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["schema"], "bilin.invariants/1");
    assert_eq!(j["derivations"]["dim"], 14);
    assert_eq!(j["nucleus"]["dim"], 1);
    assert_eq!(j["nucleus"]["basis"][0], "e0");
}

#[test]
fn generators_published_facts() {
    // Q[S_3]: centre of dim 3 (conjugacy classes), semisimple (Maschke): Curtis and
    // Reiner 1962, Representation Theory of Finite Groups and Associative Algebras.
    let o = bilin(&[
        "invariants",
        "symmetric:3",
        "--json",
        "--only",
        "centre,radical",
    ]);
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["centre"]["dim"], 3);
    assert_eq!(j["radical"]["semisimple"], true);
    assert_eq!(j["radical"]["quotient_dim"], 6);
    // sl_2: Killing form nondegenerate (Jacobson 1962, Lie Algebras, ch. III).
    let o = bilin(&["invariants", "sl:2", "--json", "--only", "lie,derivations"]);
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["lie"]["semisimple"], true);
    assert_eq!(j["derivations"]["dim"], 3);
    assert_eq!(j["derivations"]["outer_dim"], 0);
    // Heisenberg of dim 3: nilpotent, Der of dim 6 (computed by hand, see
    // src/invariants/maps.rs).
    let o = bilin(&[
        "invariants",
        "heisenberg:1",
        "--json",
        "--only",
        "lie,derivations",
    ]);
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["lie"]["nilpotent"], true);
    assert_eq!(j["derivations"]["dim"], 6);
    // Q[x]/(x^4): radical of dim 3 (common practice).
    let o = bilin(&[
        "invariants",
        "quotient:0,0,0,0,1",
        "--json",
        "--only",
        "radical",
    ]);
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["radical"]["radical"]["dim"], 3);
    // matmul <2,2,2> as a bilinear map: text report names the triples.
    let o = bilin(&["invariants", "matmul:2,2,2"]);
    assert_eq!(o.status.code(), Some(0));
    assert!(String::from_utf8_lossy(&o.stdout).contains("derivation triples"));
}

#[test]
fn bad_requests_exit_2() {
    let o = bilin(&["invariants", "octonions", "--only", "nonsense"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("unknown invariant"));
    let o = bilin(&["invariants", "matmul:2,2,2", "--only", "centre"]);
    assert_eq!(o.status.code(), Some(2));
    let o = bilin(&["invariants", "no-such-input"]);
    assert_eq!(o.status.code(), Some(2));
}

#[test]
fn large_inputs_finish_or_name_the_memory_limit() {
    // The zero algebra of dimension 64: every linear map is a derivation and in the
    // centroid (dimension 64^2 = 4096, common practice); the bases are too large to write
    // out, so the report gives the dimensions and says why the bases are left out.
    let dir = common::tmpdir("zero64");
    let path = dir.join("zero64.bilin");
    let names: Vec<String> = (0..64).map(|i| format!("e{i}")).collect();
    std::fs::write(&path, format!("field Q\nbasis {}\n", names.join(" "))).unwrap();
    let p = path.to_str().unwrap();
    let o = bilin(&["invariants", p, "--json", "--only", "derivations,centre"]);
    assert_eq!(o.status.code(), Some(0), "{}", common::stderr(&o));
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["derivations"]["dim"], 4096);
    assert!(j["derivations"]["basis_omitted"].is_string());
    assert_eq!(j["centre"]["dim"], 64);

    // <64,64,1> (a 4096 x 64 x 64 map): its radicals finish.
    let o = bilin(&[
        "invariants",
        "matmul:64,64,1",
        "--json",
        "--only",
        "radicals",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", common::stderr(&o));
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    assert_eq!(j["left_radical"]["dim"], 0);
    assert_eq!(j["right_radical"]["dim"], 0);

    // A dense table (octonions in a random basis): under a tiny memory limit the part
    // with a dense system of 64 unknowns (derivations) is skipped, the limit is named, the
    // others are computed (the centroid of a unital algebra comes from its centre, 8
    // unknowns) and the command succeeds.
    let table = bilin(&["transform", "octonions", "--random", "1", "--to", "json"]);
    let path = dir.join("octonions-random.json");
    std::fs::write(&path, &table.stdout).unwrap();
    let p = path.to_str().unwrap();
    let only = "centroid,derivations,centre";
    let o = bilin(&[
        "invariants",
        p,
        "--json",
        "--max-memory",
        "10K",
        "--only",
        only,
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", common::stderr(&o));
    let j: serde_json::Value = serde_json::from_slice(&o.stdout).unwrap();
    let skipped = j["skipped"].as_array().expect("skipped parts");
    assert!(skipped.iter().any(|s| s["part"] == "derivations"));
    assert_eq!(j["centroid"]["dim"], 1);
    let reason = skipped[0]["reason"].as_str().unwrap();
    assert!(
        reason.contains("--max-memory") && reason.contains("16 KiB"),
        "{reason}"
    );
    assert_eq!(j["centre"]["dim"], 1);

    // a bad size is a usage error
    let o = bilin(&["invariants", "octonions", "--max-memory", "lots"]);
    assert_eq!(o.status.code(), Some(2));
}
