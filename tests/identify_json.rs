//! `identify --json` end to end: the output reads back into the documented report types
//! (unknown fields refused) and writes out to the same JSON; a reported isomorphism is
//! checked again here, exactly; the example of docs/identify-json.md round-trips too.

mod common;

use bilin::catalog::catalog_tensor;
use bilin::input::load_input;
use bilin::linalg::Matrix;
use bilin::report::identify::{IDENTIFY_SCHEMA, IdentifyReport, Isomorphism};
use bilin::scalar::{Q, parse_rational};
use bilin::tensor::change_basis_algebra;
use common::run as bilin;
use num_traits::Zero;
use serde_json::Value;

/// Parse a report into the typed form and check that it writes back to the same JSON.
fn round_trip(text: &str) -> IdentifyReport {
    let typed: IdentifyReport = serde_json::from_str(text).expect("the documented schema");
    let raw: Value = serde_json::from_str(text).unwrap();
    assert_eq!(serde_json::to_value(&typed).unwrap(), raw, "round trip");
    assert_eq!(typed.schema, IDENTIFY_SCHEMA);
    typed
}

#[test]
fn identify_json_round_trips_and_its_isomorphism_checks_exactly() {
    let (code, out, err) = bilin(&["identify", "tests/data/quaternions.bilin", "--json"]);
    assert_eq!(code, 0, "{err}");
    let r = round_trip(&out);
    assert_eq!(r.dims, [4, 4, 4]);
    assert_eq!(r.basis, ["e", "i", "j", "k"]);
    assert!(r.fingerprint.iter().any(|f| f.key() == "derivations"));
    let m = r
        .matches
        .iter()
        .find(|m| m.name == "quaternions")
        .expect("the catalog's quaternions match");
    let Isomorphism::Found { images } = &m.isomorphism else {
        panic!("an isomorphism with small coordinates exists: {m:?}");
    };
    // columns = images of the input's basis vectors in the entry's basis
    let mut p = Matrix::filled(4, 4, Q::zero());
    for (j, col) in images.iter().enumerate() {
        for (i, x) in col.iter().enumerate() {
            p[(i, j)] = parse_rational(x).unwrap();
        }
    }
    let entry = catalog_tensor("quaternions").unwrap();
    let input = load_input("tests/data/quaternions.bilin", None).unwrap();
    let mapped = change_basis_algebra(&entry, &p).unwrap();
    assert!(
        mapped.entries().eq(input.entries()),
        "the reported isomorphism is exact"
    );

    // the other two outcomes
    let (_, out, _) = bilin(&["identify", "quaternions", "--json", "--no-iso"]);
    let r = round_trip(&out);
    assert!(
        r.matches
            .iter()
            .all(|m| matches!(m.isomorphism, Isomorphism::NotAttempted { .. }))
    );
    let (_, out, _) = bilin(&["identify", "split-quaternions", "--json", "--no-iso"]);
    let r = round_trip(&out);
    // the quaternions and the split quaternions differ in the signature of the trace form
    let near = r.near.iter().find(|n| n.name == "quaternions").unwrap();
    assert!(near.differences.iter().any(|d| d.key == "trace.signature"));
    let (_, out, _) = bilin(&["identify", "matmul:2,2,2", "--json"]);
    assert_eq!(round_trip(&out).kind, bilin::tensor::Kind::Bilinear);
}

#[test]
fn the_documented_example_and_fields_match_the_output() {
    let doc = include_str!("../docs/identify-json.md");
    let start = doc.find("```json\n").unwrap() + 8;
    let end = start + doc[start..].find("```").unwrap();
    let example = round_trip(&doc[start..end]);
    assert_eq!(example.input, "complex");
    let (_, out, _) = bilin(&["identify", "complex", "--json"]);
    let raw: Value = serde_json::from_str(&out).unwrap();
    for key in raw.as_object().unwrap().keys() {
        assert!(
            doc.contains(&format!("| `{key}` |")),
            "`{key}` is documented"
        );
    }
    // the example's values are the command's (the listed part of the fingerprint)
    let live = round_trip(&out);
    for f in &example.fingerprint {
        assert!(live.fingerprint.contains(f), "{f:?}");
    }
    assert_eq!(live.matches, example.matches);
}
