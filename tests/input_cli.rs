//! Runs the real binary's `convert` subcommand on the files in tests/data: valid inputs
//! convert with exit code 0, bad inputs exit with 2 and an `error: file:line:col:` message.

mod common;

use common::{bilin, stderr, stdout};

#[test]
fn good_files_convert() {
    for (file, form) in [
        ("tests/data/quaternions.bilin", "table"),
        ("tests/data/quaternions_grid.bilin", "grid"),
        ("tests/data/poly2x2.bilin", "json"),
        ("tests/data/gf2_field4.bilin", "grid"),
        ("tests/data/complex.json", "table"),
        ("quaternions", "json"),
    ] {
        let o = bilin(&["convert", file, "--to", form]);
        assert_eq!(o.status.code(), Some(0), "{file}: {}", stderr(&o));
        assert!(!stdout(&o).is_empty());
    }
}

#[test]
fn both_quaternion_files_give_the_same_table() {
    let a = bilin(&["convert", "tests/data/quaternions.bilin", "--to", "json"]);
    let b = bilin(&[
        "convert",
        "tests/data/quaternions_grid.bilin",
        "--to",
        "json",
    ]);
    assert_eq!(stdout(&a), stdout(&b));
    // i*j = k (Hamilton 1843).
    let t = stdout(&bilin(&["convert", "tests/data/quaternions.bilin"]));
    assert!(t.contains("i*j = k\n"), "{t}");
}

#[test]
fn gf2_product_and_field_override() {
    // In GF(4) = GF(2)[w]/(w^2+w+1): w*w = one + w (common practice).
    let t = stdout(&bilin(&["convert", "tests/data/gf2_field4.bilin"]));
    assert!(
        t.contains("field GF(2)") && t.contains("w*w = one + w"),
        "{t}"
    );
    let o = bilin(&[
        "convert",
        "tests/data/complex.json",
        "--field",
        "GF(5)",
        "--to",
        "table",
    ]);
    assert!(stdout(&o).contains("i*i = 4 one"), "{}", stdout(&o));
    let o = bilin(&["convert", "jordan:2", "--field", "GF(2)"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("denominator divisible by 2"));
    let o = bilin(&["convert", "tests/data/gf2_field4.bilin", "--field", "Q"]);
    assert_eq!(o.status.code(), Some(2));
}

#[test]
fn bad_files_report_positions() {
    for (file, pos, msg) in [
        (
            "bad_syntax.bilin",
            "3:11",
            "expected a coefficient or a basis name",
        ),
        ("bad_unknown_name.bilin", "3:7", "unknown basis name `k`"),
        (
            "bad_conflict.bilin",
            "4:1",
            "conflicting duplicate product `i*i`",
        ),
        ("bad_div_zero.bilin", "2:9", "division by zero"),
        ("bad_field.bilin", "1:7", "6 is not a prime"),
        ("bad_empty.bilin", "1:1", "empty input"),
        ("bad_binary.bilin", "2:", "binary"),
        (
            "bad_json.json",
            "3:21",
            "$.entries[1][2]: expected an index in 0..2",
        ),
    ] {
        let path = format!("tests/data/{file}");
        let o = bilin(&["convert", &path]);
        let e = stderr(&o);
        assert_eq!(o.status.code(), Some(2), "{file}: {e}");
        assert!(
            e.starts_with(&format!("error: {path}:{pos}")),
            "{file}: {e}"
        );
        assert!(e.contains(msg), "{file}: {e}");
        assert!(stdout(&o).is_empty());
    }
}

#[test]
fn usage_errors() {
    let o = bilin(&["convert", "no-such-input"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("no file, generator or catalog entry named `no-such-input`"));
    // a map in the grid form is one matrix per slice; an unknown axis is a usage error
    let o = bilin(&["convert", "matmul:2,2,2", "--to", "grid"]);
    assert_eq!(o.status.code(), Some(0));
    assert!(String::from_utf8_lossy(&o.stdout).contains("slice result c11"));
    let o = bilin(&["convert", "matmul:2,2,2", "--to", "grid", "--axis", "up"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--axis"));
    let o = bilin(&["convert", "quaternions", "--field", "GF(4)"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--field"));
    let o = bilin(&["convert", "matrix:100"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("4096"));
}
