//! The documented size limits (`docs/formats.md`, "Limits"): at most 2^22 products
//! `dims[0] * dims[1]`, refused by the parsers and generators before allocating; and the
//! order of error reports of the table parser, which stores products as it reads them.

use super::{parse_json, parse_table};
use crate::generators::generate;

#[test]
fn json_refuses_too_many_products() {
    let text = "{\"kind\": \"bilinear\",\n \"dims\": [4096, 4096, 4096], \"entries\": []}";
    let e = parse_json(text, "j").unwrap_err().to_string();
    assert!(
        e.starts_with("j:2:10: $.dims: 4096 x 4096 = 16777216 products"),
        "{e}"
    );
    assert!(e.contains("2^22"), "{e}");
    let text = "{\"kind\": \"algebra\", \"dims\": [2049, 2049, 2049], \"entries\": []}";
    assert!(
        parse_json(text, "j")
            .unwrap_err()
            .to_string()
            .contains("at most 2048")
    );
    // At the limit for a map: 4096 x 1024 = 2^22 products is accepted.
    let text = "{\"kind\": \"bilinear\", \"dims\": [4096, 1024, 1], \"entries\": []}";
    assert!(parse_json(text, "j").is_ok());
}

#[test]
fn table_refuses_too_many_products() {
    let names = |p: &str, n: usize| {
        (0..n)
            .map(|i| format!("{p}{i}"))
            .collect::<Vec<_>>()
            .join(" ")
    };
    let text = format!("field Q\nbasis {}\n", names("e", 2049));
    let e = parse_table(&text, "t").unwrap_err().to_string();
    assert!(e.starts_with("t:2:1: this algebra: 2049 x 2049"), "{e}");
    let text = format!(
        "left {}\nright {}\nresult c\n",
        names("a", 3000),
        names("b", 3000)
    );
    let e = parse_table(&text, "t").unwrap_err().to_string();
    assert!(
        e.starts_with("t:2:1: the left and right bases give: 3000 x 3000"),
        "{e}"
    );
    let text = format!(
        "right {}\nleft {}\nresult c\n",
        names("b", 3000),
        names("a", 2000)
    );
    let e = parse_table(&text, "t").unwrap_err().to_string();
    assert!(
        e.starts_with("t:2:1: the left and right bases give: 2000 x 3000"),
        "{e}"
    );
}

#[test]
fn generators_refuse_too_many_products() {
    let e = generate("matmul:64,64,64").unwrap_err().to_string();
    assert!(e.contains("4096 x 4096 = 16777216 products"), "{e}");
    let e = generate("matrix:46").unwrap_err().to_string();
    assert!(e.contains("dimension 2116, above the limit of 2048"), "{e}");
    assert!(generate("poly:4096,4096").is_err());
    assert!(generate("poly:4096,1").is_ok());
    assert!(generate("cd:12").is_err());
}

#[test]
fn duplicate_with_a_bare_number_is_reported_at_the_later_line() {
    // Products with a bare number are stored after the others; the conflict is still
    // reported at the later line of the file.
    let e = parse_table("basis e i\nunit e\ni*i = -1\ni*i = i\n", "t")
        .unwrap_err()
        .to_string();
    assert!(
        e.starts_with("t:4:1: conflicting duplicate product `i*i`: here `i`, but line 3 gave `-e`"),
        "{e}"
    );
    let e = parse_table("basis e i\nunit e\ni*i = i\ni*i = -1\n", "t")
        .unwrap_err()
        .to_string();
    assert!(
        e.starts_with("t:4:1: conflicting duplicate product `i*i`: here `-e`, but line 3 gave `i`"),
        "{e}"
    );
}

#[test]
fn sums_of_coefficients_stay_within_the_digit_limit() {
    // every number is within the limit, their sum is not: refused, so that whatever is
    // read can be written and read back
    let big = "9".repeat(super::MAX_DIGITS);
    let text = format!("basis e\ne*e = {big} e + {big} e\n");
    let e = parse_table(&text, "t").unwrap_err().to_string();
    assert!(e.starts_with("t:2:7: the coefficients here add up"), "{e}");
    let ok = format!("basis e\ne*e = {big} e\n");
    assert!(parse_table(&ok, "t").is_ok());
    let t = generate("matmul:1,1,1").unwrap();
    let text = format!("m1 = ({big} a11 + {big} a11)*b11\nc11 = m1\n");
    let e = crate::scheme::parse_scheme(&text, "s", &t)
        .unwrap_err()
        .to_string();
    assert!(e.starts_with("s:1:"), "{e}");
    assert!(
        e.contains("add up to a number with more than 4096 digits"),
        "{e}"
    );
    let long = "9".repeat(super::MAX_DIGITS + 1);
    let e = crate::scheme::parse_scheme(&format!("m1 = {long} a11*b11\n"), "s", &t)
        .unwrap_err()
        .to_string();
    assert!(
        e.starts_with("s:1:6: a number with more than 4096 digits"),
        "{e}"
    );
}
