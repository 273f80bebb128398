//! The `catalog` and `identify` commands end to end: output and exit codes
//! (0 success, 1 a checked claim is false, 2 bad input).

mod common;

use common::random_basis_file;
use common::run as bilin;

#[test]
fn list_filters_by_law_family_and_dimension() {
    let (code, out, _) = bilin(&["catalog", "list", "--law", "lie"]);
    assert_eq!(code, 0);
    assert!(out.contains("sl2") && out.contains("heisenberg3") && !out.contains("quaternions"));
    let (_, out, _) = bilin(&["catalog", "list", "--family", "matmul", "--dim", "4"]);
    assert!(out.contains("matmul222") && !out.contains("matmul333"));
}

#[test]
fn show_prints_sources_and_recomputes_facts() {
    let (code, out, _) = bilin(&["catalog", "show", "octonions", "--check"]);
    assert_eq!(code, 0);
    // Cartan 1914: the derivation algebra of the octonions is G2, of dimension 14 (from memory)
    assert!(
        out.contains("derivations = 14  [recomputed: agrees]"),
        "{out}"
    );
    assert!(out.contains("source: Cayley 1845"));
    let (code, _, err) = bilin(&["catalog", "show", "no-such-algebra"]);
    assert_eq!(code, 2);
    assert!(err.contains("no catalog entry"));
}

#[test]
fn check_counts_facts() {
    let (code, out, _) = bilin(&["catalog", "check", "sl2"]);
    assert_eq!(code, 0);
    assert!(out.contains("0 disagree"), "{out}");
}

#[test]
fn identify_reports_matches_and_separating_invariants() {
    let dir = std::env::temp_dir().join(format!("bilin-identify-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    // sl_2 in the basis (e + f, h, e - f): still sl_2 (Humphreys 1972).
    let file = dir.join("x.bilin");
    std::fs::write(
        &file,
        "basis a b c\na*b = -2c\nb*a = 2c\na*c = -2b\nc*a = 2b\nb*c = 2a\nc*b = -2a\n",
    )
    .unwrap();
    let (code, out, _) = bilin(&["identify", file.to_str().unwrap()]);
    assert_eq!(code, 0);
    assert!(out.contains("sl2: ISOMORPHIC, verified exactly"), "{out}");
    // so_3 has a definite Killing form over Q, sl_2 an indefinite one (Jacobson 1962)
    assert!(out.contains("so3: trace.signature"), "{out}");
    assert!(out.contains("not a proof"));
    let (code, _, err) = bilin(&["identify", "definitely-not-an-input"]);
    assert_eq!(code, 2);
    assert!(err.contains("no file, generator or catalog entry"), "{err}");
}

/// M_2(Q) in a basis of the user's own (a seeded random change of basis): `identify` proves
/// it isomorphic to the catalog's M2 and to the split quaternions (a quaternion algebra
/// (a, b)_Q with b = 1 is M_2(Q); Serre 1973, A Course in Arithmetic, ch. III; from
/// memory) through matrix units, each map verified exactly; the quaternions (a division
/// algebra) are told apart by their invariants.
#[test]
fn identify_proves_a_matrix_algebra_in_a_random_basis() {
    let dir = std::env::temp_dir().join(format!("bilin-identify-m2-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = random_basis_file(&dir, "matrix:2", "9", "m2.txt");
    let (code, out, err) = bilin(&["identify", &file]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("M2: ISOMORPHIC, verified exactly"), "{out}");
    assert!(
        out.contains("split-quaternions: ISOMORPHIC, verified exactly"),
        "{out}"
    );
    assert!(out.contains("quaternions: trace.signature"), "{out}");
    std::fs::remove_dir_all(&dir).ok();
}

/// `identify` proves that a matrix product written in three random bases of its own is
/// the catalog's <2,3,4>, with the three maps, and says so in the JSON report too.
#[test]
fn identify_proves_a_matrix_product_in_three_random_bases() {
    let dir = std::env::temp_dir().join(format!("bilin-identify-234-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = random_basis_file(&dir, "matmul:2,3,4", "3", "m234.txt");
    let (code, out, err) = bilin(&["identify", &file]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("matmul234: ISOMORPHIC, verified exactly"),
        "{out}"
    );
    for axis in ["left axis:", "right axis:", "result axis:"] {
        assert!(out.contains(axis), "{out}");
    }
    let (code, out, err) = bilin(&["identify", &file, "--json"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("\"found-maps\""), "{out}");
    assert!(out.contains("\"matrix_product\": null"), "{out}");
    std::fs::remove_dir_all(&dir).ok();
}

/// A matrix product whose sides are not in increasing order (<3,2,5>, <5,3,2>) has no
/// catalog entry of its shape: `identify` proves it is that product by its frame (the
/// maps onto the generator, verified exactly) and names the entry of the same sides,
/// matmul235, whose rank facts hold for every order (the rank of <n,m,p> is invariant
/// under permuting n, m, p: Buergisser, Clausen and Shokrollahi 1997, Algebraic
/// Complexity Theory, ch. 15, from memory). A bilinear map of the same dimensions that is
/// not a product gets no such line.
#[test]
fn identify_names_a_matrix_product_with_its_sides_out_of_order() {
    let dir = std::env::temp_dir().join(format!("bilin-identify-325-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    for (format, dims) in [("3,2,5", [6, 10, 15]), ("5,3,2", [15, 6, 10])] {
        let file = random_basis_file(
            &dir,
            &format!("matmul:{format}"),
            "4",
            &format!("m{format}.txt"),
        );
        let f = file.as_str();
        let (code, out, err) = bilin(&["identify", f]);
        assert_eq!(code, 0, "{err}");
        assert!(
            out.contains(&format!("a matrix product <{format}>")),
            "{out}"
        );
        assert!(out.contains("catalog entry matmul235"), "{out}");
        let generator = format!("ISOMORPHIC to the generator matmul:{format}");
        assert!(out.contains(&generator), "{out}");
        let (code, out, err) = bilin(&["identify", f, "--json"]);
        assert_eq!(code, 0, "{err}");
        let raw: serde_json::Value = serde_json::from_str(&out).unwrap();
        assert_eq!(raw["schema"], "bilin.identify/2");
        assert_eq!(raw["matrix_product"]["entry"], "matmul235", "{out}");
        // the maps: one column of images per basis vector of each axis
        let cols = |k: &str| raw["matrix_product"][k].as_array().unwrap().len();
        assert_eq!([cols("left"), cols("right"), cols("result")], dims);
    }
    // the dimensions of <3,2,5> (6 x 10 x 15) but the product of polynomials is not one
    let (code, out, err) = bilin(&["identify", "poly:6,10"]);
    assert_eq!(code, 0, "{err}");
    assert!(!out.contains("a matrix product"), "{out}");
    std::fs::remove_dir_all(&dir).ok();
}

/// The schemes stored with the catalog: `catalog show` lists them (verified exactly), and
/// `verify`, `scheme cost` and `emit` accept them by name. Strassen 1969: <2,2,2> in 7
/// multiplications.
#[test]
fn stored_schemes_are_shown_and_accepted_by_name() {
    let (code, out, _) = bilin(&["catalog", "show", "matmul222"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("matmul222.strassen: rank 7, over Q, verified exactly"),
        "{out}"
    );
    let (code, out, _) = bilin(&["verify", "matmul:2,2,2", "matmul222.strassen"]);
    assert_eq!(code, 0, "{out}");
    let (code, out, _) = bilin(&["scheme", "cost", "matmul:2,2,2", "matmul222.strassen"]);
    assert_eq!(code, 0);
    assert!(out.contains('7'), "{out}");
    let (code, _, _) = bilin(&["emit", "--lang", "c", "matmul:2,2,2", "matmul222.strassen"]);
    assert_eq!(code, 0);
    // a name that is neither a file nor a stored scheme is a clear error
    let (code, _, err) = bilin(&["verify", "matmul:2,2,2", "matmul222.nothing"]);
    assert_eq!(code, 2);
    assert!(err.contains("matmul222.nothing"), "{err}");
}
