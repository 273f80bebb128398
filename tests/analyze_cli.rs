//! Integration tests of `bilin analyze`: the real binary on built-in generators and on
//! files under tests/data/, text and JSON output, exit codes.

mod common;

use common::run;

fn json(args: &[&str]) -> serde_json::Value {
    let mut a = args.to_vec();
    a.push("--json");
    let (code, out, err) = run(&a);
    assert_eq!(code, 0, "{err}");
    serde_json::from_str(&out).expect("valid JSON")
}

fn law<'a>(j: &'a serde_json::Value, name: &str) -> &'a serde_json::Value {
    j["laws"]["results"]
        .as_array()
        .unwrap()
        .iter()
        .find(|r| r["law"] == name)
        .unwrap()
}

/// Octonions: alternative, not associative (Schafer 1966, An Introduction to
/// Nonassociative Algebras, ch. III).
#[test]
fn octonions_text_and_json() {
    let (code, out, _) = run(&["analyze", "octonions"]);
    assert_eq!(code, 0);
    assert!(out.contains("== Laws"), "{out}");
    assert!(out.contains("unit: e0"), "{out}");
    let line = out
        .lines()
        .find(|l| l.trim_start().starts_with("alternative "))
        .unwrap();
    assert!(line.contains("yes"), "{line}");
    let j = json(&["analyze", "octonions"]);
    assert_eq!(j["schema"], "bilin.analyze/2");
    assert_eq!(j["input"]["dims"], serde_json::json!([8, 8, 8]));
    assert_eq!(law(&j, "associative")["holds"], false);
    assert!(law(&j, "associative")["witness"]["value"].is_string());
    assert_eq!(law(&j, "alternative")["holds"], true);
    assert_eq!(j["ranks"]["flattening"], serde_json::json!([8, 8, 8]));
}

/// <2,3,4> has flattening ranks 6, 12, 8 (Buergisser, Clausen, Shokrollahi 1997,
/// Algebraic Complexity Theory) and no laws (not square).
#[test]
fn matmul_is_not_square() {
    let j = json(&["analyze", "matmul:2,3,4"]);
    assert!(j["laws"].is_null());
    assert_eq!(j["ranks"]["flattening"], serde_json::json!([6, 12, 8]));
    let (code, out, _) = run(&["analyze", "matmul:2,3,4"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("flattening ranks: left 6, right 12, result 8"),
        "{out}"
    );
}

/// Reduction mod 3 keeps the quaternion identities (common practice).
#[test]
fn field_option() {
    let j = json(&["analyze", "quaternions", "--field", "GF(3)"]);
    assert_eq!(j["input"]["field"], "GF(3)");
    assert_eq!(law(&j, "associative")["holds"], true);
    let j = json(&["analyze", "sl:2", "--laws", "lie,unital"]);
    assert_eq!(j["laws"]["results"].as_array().unwrap().len(), 2);
    assert_eq!(law(&j, "lie")["holds"], true);
}

#[test]
fn bad_usage_exits_2() {
    assert_eq!(run(&["analyze", "no-such-generator:7"]).0, 2);
    assert_eq!(run(&["analyze", "octonions", "--laws", "bogus"]).0, 2);
    assert_eq!(run(&["analyze", "octonions", "--field", "GF(4)"]).0, 2);
}

/// Hamilton 1844, On quaternions: associative, not commutative, unital.
#[test]
fn files() {
    let j = json(&["analyze", "tests/data/laws_quaternions.bilin"]);
    assert_eq!(
        j["input"]["names"][0],
        serde_json::json!(["e", "i", "j", "k"])
    );
    assert_eq!(law(&j, "associative")["holds"], true);
    assert_eq!(law(&j, "commutative")["witness"]["expression"], "i*j - j*i");
    assert_eq!(law(&j, "commutative")["witness"]["value"], "2 k");
    assert_eq!(law(&j, "unital")["unit"], "e");
    // sl(2) is a Lie algebra (Humphreys 1972, Introduction to Lie Algebras, 1.2)
    let j = json(&["analyze", "tests/data/laws_sl2_gf5.bilin"]);
    assert_eq!(j["input"]["field"], "GF(5)");
    assert_eq!(law(&j, "lie")["holds"], true);
    assert_eq!(law(&j, "unital")["holds"], false);
    // hand-computed: (a*a)*a - a*(a*a) = a
    let j = json(&["analyze", "tests/data/laws_nonassoc.bilin"]);
    let w = &law(&j, "associative")["witness"];
    assert_eq!(w["expression"], "(a*a)*a - a*(a*a)");
    assert_eq!(w["value"], "a");
    let j = json(&["analyze", "tests/data/laws_map.bilin"]);
    assert!(j["laws"].is_null());
    assert_eq!(j["input"]["kind"], "bilinear");
    let (code, _, err) = run(&["analyze", "tests/data/laws_bad.bilin"]);
    assert_eq!(code, 2);
    assert!(err.contains("laws_bad.bilin"), "{err}");
}

/// Exit code 1 when a claim is false: octonions are alternative but not associative
/// (Schafer 1966, An Introduction to Nonassociative Algebras, ch. III).
#[test]
fn expect_claims() {
    let (code, _, err) = run(&[
        "analyze",
        "octonions",
        "--laws",
        "unital",
        "--expect",
        "alternative,!associative",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("all 2 claims hold"), "{err}");
    let (code, out, err) = run(&["analyze", "octonions", "--json", "--expect", "flexible"]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("all 1 claim holds"), "{err}");
    serde_json::from_str::<serde_json::Value>(&out).expect("standard output stays JSON");
    let (code, _, err) = run(&["analyze", "octonions", "--expect", "associative"]);
    assert_eq!(code, 1);
    assert!(err.contains("associative"), "{err}");
    assert!(!err.contains("claims hold"), "{err}");
    assert_eq!(run(&["analyze", "octonions", "--expect", "!nonsense"]).0, 2);
}

/// The invariants and lower-bounds sections of `analyze`.
/// Der(octonions) is the exceptional Lie algebra G2, dimension 14 (Schafer 1966, An
/// Introduction to Nonassociative Algebras, ch. III); the Alder-Strassen bound for M_2 is
/// 2 * 4 - 1 = 7 (Alder and Strassen 1981, On the algorithmic complexity of associative
/// algebras).
#[test]
fn invariants_and_bounds_sections() {
    let j = json(&["analyze", "octonions", "--invariants", "derivations,centre"]);
    let extra = j["extra"].as_array().unwrap();
    let inv = extra
        .iter()
        .find(|s| s["id"] == "invariants")
        .expect("invariants section");
    assert_eq!(inv["data"]["derivations"]["dim"], 14);
    assert_eq!(inv["data"]["centre"]["dim"], 1);
    let j = json(&["analyze", "matrix:2"]);
    let extra = j["extra"].as_array().unwrap();
    let lb = extra
        .iter()
        .find(|s| s["id"] == "lower-bounds")
        .expect("bounds section");
    assert_eq!(lb["data"]["best"], 7);
    let j = json(&[
        "analyze",
        "quaternions",
        "--no-invariants",
        "--no-bounds",
        "--no-structure",
    ]);
    // left: the structure section with the verdicts decided with the laws, without `split`
    let extra = j["extra"].as_array().unwrap();
    assert_eq!(extra.len(), 1, "{j}");
    assert_eq!(extra[0]["id"], "structure");
    assert!(extra[0]["data"]["split"].is_null(), "{j}");
    assert_eq!(extra[0]["data"]["properties"].as_array().unwrap().len(), 3);
    let j = json(&[
        "analyze",
        "quaternions",
        "--no-invariants",
        "--no-bounds",
        "--no-structure",
        "--laws",
        "none",
    ]);
    assert!(j["extra"].as_array().unwrap().is_empty());
    let (code, _, err) = run(&["analyze", "quaternions", "--invariants", "nonsense"]);
    assert_eq!(code, 2, "{err}");
}
