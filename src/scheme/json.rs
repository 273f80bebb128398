//! The JSON form of a scheme: the three factor matrices, one row per multiplication.
//!
//! ```json
//! {"schema": "bilin.scheme/1", "field": "Q", "dims": [4, 4, 4], "rank": 7,
//!  "u": [["1", "0", "0", "1"], ...], "v": [...], "w": [...]}
//! ```
//!
//! Coefficients are strings `"p/q"` (JSON integers are also accepted). `u` has `rank` rows
//! of length `dims[0]`, `v` of `dims[1]`, `w` of `dims[2]`. Over GF(p) entries are reduced
//! to `0..p`. No other key is accepted. See docs/schemes.md.

use super::{Scheme, reduce_into};
use crate::error::Error;
use crate::input::json_tree::{JValue, Json, JsonDoc, check_keys};
use crate::input::{json_coefficient, json_dims, json_field, json_list, json_required};
use crate::scalar::{FieldSpec, Q, q_to_string};
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

/// Parse the JSON form. Every error carries the line and column of the offending value
/// and its JSON path (`$.u[2][1]`); the JSON itself is read strictly (duplicate keys,
/// unknown keys and numbers where strings are expected are refused). Cost: linear in the
/// text.
pub fn parse_json(text: &str, source: &str) -> Result<Scheme, Error> {
    let doc = JsonDoc { text, source };
    from_node(&doc, &doc.parse()?, "$", None)
}

/// Read a scheme from a JSON value at path `path` of `doc` (a whole file, or the `best` of
/// a search checkpoint). With `into = Some(f)` the scheme is brought to the field `f` as
/// it is read (a scheme over Q is reduced mod p coefficient by coefficient, so an error
/// points at the coefficient; a scheme over GF(p) cannot be read over another field).
pub fn from_node(
    doc: &JsonDoc,
    v: &Json,
    path: &str,
    into: Option<FieldSpec>,
) -> Result<Scheme, Error> {
    if !matches!(v.value, JValue::Object(_)) {
        return Err(doc.error(
            v.at,
            path,
            format!(
                "expected a scheme object {{\"dims\": .., \"u\": .., \"v\": .., \"w\": ..}}, found {}",
                v.describe()
            ),
        ));
    }
    let key = |k: &str| format!("{path}.{k}");
    check_keys(
        doc,
        v,
        path,
        &["schema", "field", "dims", "rank", "u", "v", "w", "labels"],
    )?;
    if let Some(sc) = v.get("schema")
        && sc.value != JValue::Str(SCHEMA.into())
    {
        return Err(doc.error(
            sc.at,
            &key("schema"),
            format!("expected \"{SCHEMA}\", found {}", sc.describe()),
        ));
    }
    let declared = match v.get("field") {
        None => FieldSpec::Rational,
        Some(f) => json_field(doc, f, &key("field"))?,
    };
    let field = into.unwrap_or(declared);
    if declared != field && declared != FieldSpec::Rational {
        let at = v.get("field").map_or(v.at, |f| f.at);
        return Err(doc.error(
            at,
            &key("field"),
            format!(
                "a scheme over {} cannot be read for a tensor over {} (read the tensor over {0}: --field '{0}')",
                declared.name(),
                field.name()
            ),
        ));
    }
    let dims_v = json_required(doc, v, path, "dims", "three dimensions [d0, d1, d2]")?;
    let dims = json_dims(doc, dims_v, &key("dims"), 1)?;
    let mut mats = Vec::new();
    for (axis, k) in ["u", "v", "w"].into_iter().enumerate() {
        let kp = key(k);
        let rows_v = json_required(doc, v, path, k, "a list of rows, one per multiplication")?;
        let rows = json_list(doc, rows_v, &kp, "a list of rows, one per multiplication")?;
        let mut m = Vec::with_capacity(rows.len());
        for (t, row_v) in rows.iter().enumerate() {
            let rp = format!("{kp}[{t}]");
            let row = json_list(doc, row_v, &rp, "a list of coefficients")?;
            if row.len() != dims[axis] {
                return Err(doc.error(
                    row_v.at,
                    &rp,
                    format!(
                        "{} coefficients, expected {} (dims[{axis}])",
                        row.len(),
                        dims[axis]
                    ),
                ));
            }
            let mut r = Vec::with_capacity(row.len());
            for (i, x) in row.iter().enumerate() {
                let xp = format!("{rp}[{i}]");
                let q = json_coefficient(doc, x, &xp)?;
                r.push(reduce_into(field, &q).map_err(|e| doc.error(x.at, &xp, e))?);
            }
            m.push(r);
        }
        mats.push((m, rows_v.at));
    }
    let (w, w_at) = mats.pop().unwrap_or_default();
    let (v_rows, _) = mats.pop().unwrap_or_default();
    let (u, _) = mats.pop().unwrap_or_default();
    if u.len() != v_rows.len() || v_rows.len() != w.len() {
        return Err(doc.error(
            w_at,
            path,
            format!(
                "`u`, `v`, `w` must have the same number of rows (found {}, {}, {})",
                u.len(),
                v_rows.len(),
                w.len()
            ),
        ));
    }
    if let Some(r) = v.get("rank")
        && r.as_index() != Some(u.len() as u64)
    {
        return Err(doc.error(
            r.at,
            &key("rank"),
            format!("found {} but there are {} rows", r.describe(), u.len()),
        ));
    }
    let labels = match v.get("labels") {
        None => Vec::new(),
        Some(l) if matches!(l.value, JValue::Null) => Vec::new(),
        Some(l) => {
            let lp = key("labels");
            let items = json_list(doc, l, &lp, "a list of product labels")?;
            if items.len() != u.len() {
                return Err(doc.error(
                    l.at,
                    &lp,
                    format!(
                        "{} labels, expected {} (one per product)",
                        items.len(),
                        u.len()
                    ),
                ));
            }
            items
                .iter()
                .enumerate()
                .map(|(i, x)| match &x.value {
                    JValue::Str(s) => Ok(s.clone()),
                    _ => Err(doc.error(
                        x.at,
                        &format!("{lp}[{i}]"),
                        format!("expected a string, found {}", x.describe()),
                    )),
                })
                .collect::<Result<Vec<_>, _>>()?
        }
    };
    Ok(Scheme {
        field,
        dims,
        u,
        v: v_rows,
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
