//! The coordinate JSON form (`docs/formats.md`, section 2):
//! `{"field": "Q", "kind": "algebra", "dims": [a, b, c], "names": [[..], [..], [..]],
//! "entries": [[i, j, k, "p/q"], ...]}`.
//!
//! `field` is optional (default `Q`), `names` optional (default names), the other keys are
//! required and no other key is accepted. Coefficients are strings in the table format's
//! number syntax (`"3"`, `"-1/2"`, `"0.25"`) or JSON integers. Syntax errors carry the
//! parser's line and column; semantic errors point at the offending key or entry.
//! Cost: linear in the input size.

use super::cursor::{Cursor, LineRef};
use super::is_valid_name;
use crate::error::{Error, Position, Result};
use crate::scalar::{Field, FieldSpec, PrimeField, Q, q_to_string};
use crate::tensor::{Kind, MAX_DIM, Tensor, check_shape, default_names};
use num_bigint::BigInt;
use serde_json::Value;
use std::collections::{HashMap, HashSet};

fn byte_pos(text: &str, source: &str, byte: usize) -> Position {
    let byte = byte.min(text.len());
    let before = text.get(..byte).unwrap_or(text);
    let line = before.matches('\n').count() + 1;
    let col_start = before.rfind('\n').map_or(0, |p| p + 1);
    let column = before[col_start..].chars().count() + 1;
    Position {
        source: source.to_string(),
        line,
        column,
    }
}

/// Byte offset of the first occurrence of `"key"` followed by `:` (best effort).
fn key_byte(text: &str, key: &str) -> usize {
    let pat = format!("\"{key}\"");
    let mut from = 0;
    while let Some(p) = text[from..].find(&pat) {
        let at = from + p;
        if text[at + pat.len()..].trim_start().starts_with(':') {
            return at;
        }
        from = at + pat.len();
    }
    0
}

/// Byte offsets of the elements of the array value of `key` (best effort).
fn array_element_bytes(text: &str, key: &str) -> Vec<usize> {
    let mut out = Vec::new();
    let start = key_byte(text, key);
    let Some(open) = text[start..].find('[').map(|p| start + p) else {
        return out;
    };
    let bytes = text.as_bytes();
    let (mut depth, mut in_str, mut esc, mut expect) = (0usize, false, false, true);
    for (b, &c) in bytes.iter().enumerate().skip(open) {
        if in_str {
            match (esc, c) {
                (true, _) => esc = false,
                (false, b'\\') => esc = true,
                (false, b'"') => in_str = false,
                _ => {}
            }
            continue;
        }
        match c {
            b'[' | b'{' => {
                if depth == 1 && expect {
                    out.push(b);
                    expect = false;
                }
                depth += 1;
            }
            b']' | b'}' => {
                depth = depth.saturating_sub(1);
                if depth == 0 {
                    break;
                }
            }
            b',' if depth == 1 => expect = true,
            c if c.is_ascii_whitespace() => {}
            _ => {
                if depth == 1 && expect {
                    out.push(b);
                    expect = false;
                }
                if c == b'"' {
                    in_str = true;
                }
            }
        }
    }
    out
}

/// Parse a coefficient string with the table format's number syntax.
fn parse_coef(s: &str) -> std::result::Result<Q, String> {
    let t = s.trim();
    let line = LineRef {
        source: "",
        text: t,
        number: 1,
    };
    let mut cur = Cursor::new(line, 0, t.len());
    let neg = cur.take_sign();
    if !cur.peek().is_some_and(|c| c.is_ascii_digit()) {
        return Err(format!(
            "expected a coefficient such as \"3\" or \"-1/2\", found \"{s}\""
        ));
    }
    let v = cur.number().map_err(|e| match e {
        Error::Parse { message, .. } => message,
        other => other.to_string(),
    })?;
    if !cur.at_end() {
        return Err(format!(
            "expected a coefficient such as \"3\" or \"-1/2\", found \"{s}\""
        ));
    }
    Ok(if neg { -v } else { v })
}

/// A parse error at element `n` of the `"entries"` array (at the key when the element
/// cannot be located). Cost: one scan of `text`.
fn entry_error(text: &str, source: &str, n: usize, message: String) -> Error {
    let b = array_element_bytes(text, "entries")
        .get(n)
        .copied()
        .unwrap_or_else(|| key_byte(text, "entries"));
    Error::Parse {
        at: byte_pos(text, source, b),
        message,
    }
}

/// Parse the coordinate JSON form. `source` names the input in error positions.
pub fn parse_json(text: &str, source: &str) -> Result<Tensor> {
    let v: Value = serde_json::from_str(text).map_err(|e| Error::Parse {
        at: Position {
            source: source.to_string(),
            line: e.line().max(1),
            column: e.column().max(1),
        },
        message: format!("invalid JSON: {e}")
            .replace(&format!(" at line {} column {}", e.line(), e.column()), ""),
    })?;
    let at_key = |key: &str, message: String| Error::Parse {
        at: byte_pos(text, source, key_byte(text, key)),
        message,
    };
    let Value::Object(obj) = &v else {
        return Err(Error::Parse {
            at: byte_pos(text, source, text.len() - text.trim_start().len()),
            message: "expected a JSON object `{\"field\": .., \"kind\": .., \"dims\": .., \"entries\": ..}`".into(),
        });
    };
    for key in obj.keys() {
        if !["field", "kind", "dims", "names", "entries"].contains(&key.as_str()) {
            return Err(at_key(
                key,
                format!("unknown key \"{key}\" (expected field, kind, dims, names, entries)"),
            ));
        }
    }
    let field = match obj.get("field") {
        None => FieldSpec::Rational,
        Some(Value::String(s)) => FieldSpec::parse(s).map_err(|m| at_key("field", m))?,
        Some(other) => {
            return Err(at_key(
                "field",
                format!(
                    "expected \"field\" to be a string such as \"Q\" or \"GF(7)\", found {other}"
                ),
            ));
        }
    };
    let kind = match obj.get("kind") {
        Some(Value::String(s)) if s == "algebra" => Kind::Algebra,
        Some(Value::String(s)) if s == "bilinear" => Kind::Bilinear,
        None => {
            return Err(at_key(
                "entries",
                "missing key \"kind\" (\"algebra\" or \"bilinear\")".into(),
            ));
        }
        Some(other) => {
            return Err(at_key(
                "kind",
                format!("expected \"kind\" to be \"algebra\" or \"bilinear\", found {other}"),
            ));
        }
    };
    let dims_v = obj
        .get("dims")
        .ok_or_else(|| at_key("kind", "missing key \"dims\" ([a, b, c])".into()))?;
    let dims: Vec<u64> = match dims_v {
        Value::Array(a) if a.len() == 3 && a.iter().all(Value::is_u64) => {
            a.iter().filter_map(Value::as_u64).collect()
        }
        other => {
            return Err(at_key(
                "dims",
                format!(
                    "expected \"dims\" to be three non-negative integers [a, b, c], found {other}"
                ),
            ));
        }
    };
    if let Some(d) = dims.iter().find(|&&d| d == 0 || d > MAX_DIM as u64) {
        return Err(at_key(
            "dims",
            format!("dimension {d} is out of range: dimensions are between 1 and {MAX_DIM}"),
        ));
    }
    let dims = [dims[0] as usize, dims[1] as usize, dims[2] as usize];
    check_shape(dims).map_err(|m| at_key("dims", m))?;
    if kind == Kind::Algebra && !(dims[0] == dims[1] && dims[1] == dims[2]) {
        return Err(at_key(
            "dims",
            format!("an algebra has equal dimensions, found {dims:?}"),
        ));
    }
    let names = match obj.get("names") {
        None => default_names(kind, dims),
        Some(nv) => parse_names(nv, kind, dims).map_err(|m| at_key("names", m))?,
    };
    let Some(Value::Array(entries)) = obj.get("entries") else {
        return Err(at_key(
            if obj.contains_key("entries") {
                "entries"
            } else {
                "dims"
            },
            "expected \"entries\": a list of [i, j, k, \"coefficient\"]".into(),
        ));
    };
    let prime = match field {
        FieldSpec::Prime(p) => PrimeField::new(p),
        FieldSpec::Rational => None,
    };
    let mut t = Tensor::zero(field, kind, dims, Some(names));
    let mut seen: HashMap<(usize, usize, usize), (Q, usize)> = HashMap::new();
    for (n, e) in entries.iter().enumerate() {
        let check = entry(e, dims, prime.as_ref());
        let (idx, val) = match check {
            Ok(x) => x,
            Err(m) => {
                return Err(entry_error(
                    text,
                    source,
                    n,
                    format!("entry {}: {m}", n + 1),
                ));
            }
        };
        if let Some((old, first)) = seen.get(&idx) {
            if *old != val {
                let message = format!(
                    "entry {}: conflicting duplicate of entry {} for {:?}: {} here, {} there",
                    n + 1,
                    first + 1,
                    idx,
                    q_to_string(&val),
                    q_to_string(old)
                );
                return Err(entry_error(text, source, n, message));
            }
            continue;
        }
        t.set(idx.0, idx.1, idx.2, val.clone());
        seen.insert(idx, (val, n));
    }
    Ok(t)
}

fn parse_names(
    v: &Value,
    kind: Kind,
    dims: [usize; 3],
) -> std::result::Result<[Vec<String>; 3], String> {
    let Value::Array(lists) = v else {
        return Err(format!(
            "expected \"names\" to be three lists of strings, found {v}"
        ));
    };
    if lists.len() != 3 {
        return Err(format!(
            "expected three name lists in \"names\", found {}",
            lists.len()
        ));
    }
    let mut out: [Vec<String>; 3] = Default::default();
    for (a, l) in lists.iter().enumerate() {
        let Value::Array(items) = l else {
            return Err(format!(
                "expected name list {} to be a list of strings",
                a + 1
            ));
        };
        if items.len() != dims[a] {
            return Err(format!(
                "name list {} has {} names but dims gives {}",
                a + 1,
                items.len(),
                dims[a]
            ));
        }
        let mut set = HashSet::new();
        for it in items {
            let Value::String(s) = it else {
                return Err(format!(
                    "expected a name string in list {}, found {it}",
                    a + 1
                ));
            };
            if !is_valid_name(s) {
                return Err(format!(
                    "invalid basis name \"{s}\": a name starts with a letter or `_` and continues with letters, digits, `_`, `'` or `.`"
                ));
            }
            if !set.insert(s.clone()) {
                return Err(format!("duplicate basis name \"{s}\" in list {}", a + 1));
            }
            out[a].push(s.clone());
        }
    }
    if kind == Kind::Algebra && !(out[0] == out[1] && out[1] == out[2]) {
        return Err("an algebra has one basis: the three name lists must be equal".into());
    }
    Ok(out)
}

type Entry = ((usize, usize, usize), Q);

fn entry(
    e: &Value,
    dims: [usize; 3],
    prime: Option<&PrimeField>,
) -> std::result::Result<Entry, String> {
    let Value::Array(a) = e else {
        return Err(format!("expected [i, j, k, \"coefficient\"], found {e}"));
    };
    if a.len() != 4 {
        return Err(format!(
            "expected 4 items [i, j, k, \"coefficient\"], found {}",
            a.len()
        ));
    }
    let mut idx = [0usize; 3];
    for ax in 0..3 {
        match a[ax].as_u64() {
            Some(x) if (x as u128) < dims[ax] as u128 => idx[ax] = x as usize,
            _ => {
                return Err(format!(
                    "index {} must be an integer in 0..{} ({} axis), found {}",
                    ax + 1,
                    dims[ax],
                    crate::tensor::AXES[ax],
                    a[ax]
                ));
            }
        }
    }
    let val = match &a[3] {
        Value::String(s) => parse_coef(s)?,
        Value::Number(n) if n.is_i64() || n.is_u64() => {
            let b: BigInt = n
                .to_string()
                .parse()
                .map_err(|_| format!("expected an integer, found {n}"))?;
            Q::from_integer(b)
        }
        other => {
            return Err(format!(
                "expected the coefficient as a string such as \"-1/2\" or an integer, found {other}"
            ));
        }
    };
    let val = match prime {
        None => val,
        Some(f) => {
            if f.denominator_vanishes(&val) {
                return Err(format!(
                    "the coefficient {} has a denominator divisible by {}, so it has no value in GF({})",
                    q_to_string(&val),
                    f.modulus(),
                    f.modulus()
                ));
            }
            f.to_rational(&f.from_rational(&val).unwrap_or_default())
        }
    };
    Ok(((idx[0], idx[1], idx[2]), val))
}
