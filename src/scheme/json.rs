//! The JSON form of a scheme: the three factor matrices, one row per multiplication.
//!
//! ```json
//! {"schema": "bilin.scheme/1", "field": "Q", "dims": [4, 4, 4], "rank": 7,
//!  "u": [["1", "0", "0", "1"], ...], "v": [...], "w": [...]}
//! ```
//!
//! Coefficients are strings `"p/q"` (JSON integers are also accepted). `u` has `rank` rows
//! of length `dims[0]`, `v` of `dims[1]`, `w` of `dims[2]`. Over GF(p) entries are reduced
//! to `0..p`. See docs/schemes.md.

use super::{Scheme, reduce_into};
use crate::error::{Error, Position};
use crate::scalar::{FieldSpec, Q, parse_rational, q_to_string};
use serde_json::{Value, json};

/// The schema tag written and accepted.
pub const SCHEMA: &str = "bilin.scheme/1";

/// The JSON value of a scheme. Cost: O(r (d0 + d1 + d2)).
pub fn to_json(s: &Scheme) -> Value {
    let m = |rows: &[Vec<Q>]| -> Value {
        Value::Array(
            rows.iter()
                .map(|r| Value::Array(r.iter().map(|x| Value::String(q_to_string(x))).collect()))
                .collect(),
        )
    };
    let mut v = json!({
        "schema": SCHEMA,
        "field": s.field.name(),
        "dims": s.dims,
        "rank": s.rank(),
        "u": m(&s.u),
        "v": m(&s.v),
        "w": m(&s.w),
    });
    if !s.labels.is_empty() {
        v["labels"] = json!(s.labels);
    }
    v
}

/// The JSON text of a scheme, one multiplication per line inside each matrix.
pub fn write_json(s: &Scheme) -> String {
    let row = |r: &Vec<Q>| {
        let items: Vec<String> = r
            .iter()
            .map(|x| format!("\"{}\"", q_to_string(x)))
            .collect();
        format!("[{}]", items.join(","))
    };
    let mat = |rows: &[Vec<Q>]| {
        if rows.is_empty() {
            return "[]".to_string();
        }
        let lines: Vec<String> = rows.iter().map(|r| format!("    {}", row(r))).collect();
        format!("[\n{}\n  ]", lines.join(",\n"))
    };
    let labels = if s.labels.is_empty() {
        String::new()
    } else {
        format!(
            ",\n  \"labels\": {}",
            serde_json::to_string(&s.labels).unwrap_or_default()
        )
    };
    format!(
        "{{\n  \"schema\": \"{SCHEMA}\",\n  \"field\": \"{}\",\n  \"dims\": [{}, {}, {}],\n  \"rank\": {},\n  \"u\": {},\n  \"v\": {},\n  \"w\": {}{labels}\n}}\n",
        s.field.name(),
        s.dims[0],
        s.dims[1],
        s.dims[2],
        s.rank(),
        mat(&s.u),
        mat(&s.v),
        mat(&s.w)
    )
}

/// Parse the JSON form. Syntax errors carry serde's line and column; structural errors
/// name the offending field (reported at line 1, column 1). Cost: linear in the text.
pub fn parse_json(text: &str, source: &str) -> Result<Scheme, Error> {
    let at = |line: usize, column: usize| Position {
        source: source.to_string(),
        line,
        column,
    };
    let v: Value = serde_json::from_str(text).map_err(|e| Error::Parse {
        at: at(e.line(), e.column()),
        message: format!("invalid JSON: {e}"),
    })?;
    from_value(&v, source)
}

/// Read a scheme from an already parsed JSON value (e.g. inside a search checkpoint);
/// structural errors are reported at line 1, column 1 of `source`.
pub fn from_value(v: &Value, source: &str) -> Result<Scheme, Error> {
    let at = |line: usize, column: usize| Position {
        source: source.to_string(),
        line,
        column,
    };
    let bad = |m: String| Error::Parse {
        at: at(1, 1),
        message: m,
    };
    let obj = v
        .as_object()
        .ok_or_else(|| bad("a scheme must be a JSON object".into()))?;
    if let Some(sc) = obj.get("schema")
        && sc.as_str() != Some(SCHEMA)
    {
        return Err(bad(format!("unknown schema {sc}, expected \"{SCHEMA}\"")));
    }
    let field = match obj.get("field") {
        None => FieldSpec::Rational,
        Some(f) => FieldSpec::parse(
            f.as_str()
                .ok_or_else(|| bad("`field` must be a string".into()))?,
        )
        .map_err(bad)?,
    };
    let dims_v = obj
        .get("dims")
        .and_then(Value::as_array)
        .ok_or_else(|| bad("missing `dims` (three integers)".into()))?;
    let dims: Vec<usize> = dims_v
        .iter()
        .filter_map(|d| d.as_u64().map(|x| x as usize))
        .collect();
    if dims.len() != 3 || dims_v.len() != 3 {
        return Err(bad("`dims` must be three non-negative integers".into()));
    }
    if dims.iter().any(|&d| d > crate::tensor::MAX_DIM) {
        return Err(bad(format!(
            "a dimension exceeds the limit {}",
            crate::tensor::MAX_DIM
        )));
    }
    let dims = [dims[0], dims[1], dims[2]];
    let mut mats = Vec::new();
    for (axis, key) in ["u", "v", "w"].into_iter().enumerate() {
        let rows = obj
            .get(key)
            .and_then(Value::as_array)
            .ok_or_else(|| bad(format!("missing `{key}` (a list of rows)")))?;
        let mut m = Vec::with_capacity(rows.len());
        for (t, row) in rows.iter().enumerate() {
            let row = row
                .as_array()
                .ok_or_else(|| bad(format!("`{key}[{t}]` must be a list of coefficients")))?;
            if row.len() != dims[axis] {
                return Err(bad(format!(
                    "`{key}[{t}]` has {} entries, expected {}",
                    row.len(),
                    dims[axis]
                )));
            }
            let mut r = Vec::with_capacity(row.len());
            for (i, x) in row.iter().enumerate() {
                let q = match x {
                    Value::String(s) => parse_rational(s),
                    Value::Number(n) if n.is_i64() => {
                        Ok(Q::from_integer(n.as_i64().unwrap_or(0).into()))
                    }
                    _ => Err("expected a string \"p/q\" or an integer".to_string()),
                }
                .map_err(|m| bad(format!("`{key}[{t}][{i}]`: {m}")))?;
                r.push(reduce_into(field, &q).map_err(|e| bad(format!("`{key}[{t}][{i}]`: {e}")))?);
            }
            m.push(r);
        }
        mats.push(m);
    }
    let (w, v, u) = (
        mats.pop().unwrap_or_default(),
        mats.pop().unwrap_or_default(),
        mats.pop().unwrap_or_default(),
    );
    if u.len() != v.len() || v.len() != w.len() {
        return Err(bad(format!(
            "`u`, `v`, `w` must have the same number of rows (found {}, {}, {})",
            u.len(),
            v.len(),
            w.len()
        )));
    }
    if let Some(r) = obj.get("rank")
        && r.as_u64() != Some(u.len() as u64)
    {
        return Err(bad(format!("`rank` is {r} but there are {} rows", u.len())));
    }
    let labels = match obj.get("labels") {
        None | Some(Value::Null) => Vec::new(),
        Some(l) => {
            let list: Option<Vec<String>> = l
                .as_array()
                .and_then(|a| a.iter().map(|x| x.as_str().map(String::from)).collect());
            match list {
                Some(list) if list.len() == u.len() => list,
                _ => {
                    return Err(bad(format!(
                        "`labels` must be a list of {} strings, one per product",
                        u.len()
                    )));
                }
            }
        }
    };
    Ok(Scheme {
        field,
        dims,
        u,
        v,
        w,
        labels,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use proptest::prelude::*;

    #[test]
    fn rejects_bad_json() {
        for bad in [
            "{",
            "[]",
            r#"{"dims":[1,1],"u":[],"v":[],"w":[]}"#,
            r#"{"dims":[1,1,1],"u":[["1"]],"v":[],"w":[]}"#,
            r#"{"dims":[1,1,1],"u":[["x"]],"v":[["1"]],"w":[["1"]]}"#,
            r#"{"dims":[1,1,1],"u":[["1","2"]],"v":[["1"]],"w":[["1"]]}"#,
            r#"{"field":"GF(3)","dims":[1,1,1],"u":[["1/3"]],"v":[["1"]],"w":[["1"]]}"#,
            r#"{"schema":"other","dims":[1,1,1],"u":[],"v":[],"w":[]}"#,
            r#"{"dims":[1,1,1],"rank":2,"u":[],"v":[],"w":[]}"#,
        ] {
            assert!(
                matches!(parse_json(bad, "j"), Err(Error::Parse { .. })),
                "{bad}"
            );
        }
        let ok = r#"{"dims":[1,1,1],"u":[[1]],"v":[["1"]],"w":[["-1/2"]]}"#;
        assert_eq!(
            parse_json(ok, "j").unwrap().w[0][0],
            crate::scalar::q(-1, 2)
        );
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]
        #[test]
        fn json_round_trip(seed in 0u64..10_000, r in 0usize..6, gf in proptest::bool::ANY) {
            let field = if gf { FieldSpec::Prime(13) } else { FieldSpec::Rational };
            let t = matmul(2, 2, 3).with_field(field).unwrap();
            let s = random_scheme(&t, r, seed, field);
            prop_assert_eq!(parse_json(&write_json(&s), "rt").unwrap(), s.clone());
            prop_assert_eq!(parse_json(&to_json(&s).to_string(), "rt").unwrap(), s);
        }
    }
}
