//! The coordinate JSON form (`docs/formats.md`, section 2):
//! `{"field": "Q", "kind": "algebra", "dims": [a, b, c], "names": [[..], [..], [..]],
//! "entries": [[i, j, k, "p/q"], ...]}`.
//!
//! `field` is optional (default `Q`), `names` optional (default names), the other keys are
//! required and no other key is accepted. Coefficients are strings in the table format's
//! number syntax (`"3"`, `"-1/2"`, `"0.25"`) or JSON integers. Every error carries the line
//! and column of the offending value and its JSON path (`$.entries[3][2]`); the JSON
//! itself is read by the strict reader of [`super::json_tree`] (duplicate keys refused).
//! Cost: linear in the input size.

use super::ReadOptions;
use super::cursor::{Cursor, LineRef};
use super::is_valid_name;
use super::json_tree::{JValue, Json, JsonDoc, check_keys};
use super::numbers::{Rationalize, text_value};
use super::table::Symmetry;
use crate::error::{Error, Result};
use crate::scalar::{Field, FieldSpec, PrimeField, Q, q_to_string};
use crate::tensor::{Kind, MAX_DIM, Tensor, check_nonzero, check_shape, default_names};
use std::collections::{HashMap, HashSet};

/// A coefficient in a JSON form: a string in the table format's number syntax (an optional
/// sign, then `3`, `1/2` or `0.25`, nothing around it, read exactly), or a JSON number: an
/// integer of any size, or a float accepted when it is exactly its binary64 value (`3.0`,
/// `0.5`, `1e3`; see [`super::numbers`]). `path` names the value in errors.
pub fn json_coefficient(doc: &JsonDoc, v: &Json, path: &str) -> Result<Q> {
    json_value(doc, v, path, None)
}

/// [`json_coefficient`], rounding inexact floats when `round` says so.
pub fn json_value(doc: &JsonDoc, v: &Json, path: &str, round: Option<&Rationalize>) -> Result<Q> {
    let bad = |found: String| {
        doc.error(
            v.at,
            path,
            format!("expected a coefficient such as \"3\", \"-1/2\" or \"0.25\", found {found}"),
        )
    };
    let text = match &v.value {
        JValue::Str(s) => s.as_str(),
        JValue::Number(n) if n.bytes().all(|b| b.is_ascii_digit() || b == b'-') => n.as_str(),
        JValue::Number(n) => {
            return text_value(n, round).map_err(|m| doc.error(v.at, path, m));
        }
        _ => return Err(bad(v.describe())),
    };
    let line = LineRef {
        source: "",
        text,
        number: 1,
    };
    let mut cur = Cursor::new(line, 0, text.len());
    let neg = cur.take_sign();
    if !cur.peek().is_some_and(|c| c.is_ascii_digit()) {
        return Err(bad(v.describe()));
    }
    let x = cur.number().map_err(|e| match e {
        Error::Parse { message, .. } => doc.error(v.at, path, message),
        other => other,
    })?;
    if !cur.at_end() {
        return Err(bad(v.describe()));
    }
    Ok(if neg { -x } else { x })
}

/// A field name in a JSON form: a string `"Q"` or `"GF(p)"`.
pub fn json_field(doc: &JsonDoc, v: &Json, path: &str) -> Result<FieldSpec> {
    match &v.value {
        JValue::Str(s) => FieldSpec::parse(s).map_err(|m| doc.error(v.at, path, m)),
        _ => Err(doc.error(
            v.at,
            path,
            format!(
                "expected a field \"Q\" or \"GF(p)\", found {}",
                v.describe()
            ),
        )),
    }
}

/// A JSON list (its items), or an error naming what was expected.
pub fn json_list<'j>(doc: &JsonDoc, v: &'j Json, path: &str, what: &str) -> Result<&'j [Json]> {
    match &v.value {
        JValue::Array(a) => Ok(a),
        _ => Err(doc.error(
            v.at,
            path,
            format!("expected {what}, found {}", v.describe()),
        )),
    }
}

/// Three dimensions `[a, b, c]`, each a non-negative integer at most `max`.
pub fn json_dims(doc: &JsonDoc, v: &Json, path: &str, min: u64) -> Result<[usize; 3]> {
    let items = json_list(doc, v, path, "three dimensions [a, b, c]")?;
    if items.len() != 3 {
        return Err(doc.error(
            v.at,
            path,
            format!(
                "expected three dimensions [a, b, c], found {}",
                v.describe()
            ),
        ));
    }
    let mut dims = [0usize; 3];
    for (a, d) in items.iter().enumerate() {
        match d.as_index() {
            Some(x) if x >= min && x <= MAX_DIM as u64 => dims[a] = x as usize,
            _ => {
                return Err(doc.error(
                    d.at,
                    &format!("{path}[{a}]"),
                    format!(
                        "expected a dimension between {min} and {MAX_DIM}, found {}",
                        d.describe()
                    ),
                ));
            }
        }
    }
    Ok(dims)
}

/// A required member of a JSON object, or an error at the object.
pub fn json_required<'j>(
    doc: &JsonDoc,
    obj: &'j Json,
    path: &str,
    key: &str,
    what: &str,
) -> Result<&'j Json> {
    obj.get(key)
        .ok_or_else(|| doc.error(obj.at, path, format!("missing key \"{key}\" ({what})")))
}

/// Parse the coordinate JSON form. `source` names the input in error positions.
pub fn parse_json(text: &str, source: &str) -> Result<Tensor> {
    parse_json_with(text, source, &ReadOptions::default())
}

/// [`parse_json`] with the options of the array readers (rounding of inexact floats).
pub fn parse_json_with(text: &str, source: &str, opts: &ReadOptions) -> Result<Tensor> {
    let doc = JsonDoc { text, source };
    let root = doc.parse()?;
    if !matches!(root.value, JValue::Object(_)) {
        return Err(doc.error(
            root.at,
            "$",
            format!(
                "expected a JSON object {{\"field\": .., \"kind\": .., \"dims\": .., \"entries\": ..}}, found {}",
                root.describe()
            ),
        ));
    }
    check_keys(
        &doc,
        &root,
        "$",
        &["field", "kind", "dims", "names", "symmetry", "entries"],
    )?;
    let field = match root.get("field") {
        None => FieldSpec::Rational,
        Some(f) => json_field(&doc, f, "$.field")?,
    };
    let kind_v = json_required(&doc, &root, "$", "kind", "\"algebra\" or \"bilinear\"")?;
    let kind = match &kind_v.value {
        JValue::Str(s) if s == "algebra" => Kind::Algebra,
        JValue::Str(s) if s == "bilinear" => Kind::Bilinear,
        _ => {
            return Err(doc.error(
                kind_v.at,
                "$.kind",
                format!(
                    "expected \"algebra\" or \"bilinear\", found {}",
                    kind_v.describe()
                ),
            ));
        }
    };
    let dims_v = json_required(&doc, &root, "$", "dims", "[a, b, c]")?;
    let dims = json_dims(&doc, dims_v, "$.dims", 1)?;
    check_shape(dims).map_err(|m| doc.error(dims_v.at, "$.dims", m))?;
    if kind == Kind::Algebra && !(dims[0] == dims[1] && dims[1] == dims[2]) {
        return Err(doc.error(
            dims_v.at,
            "$.dims",
            format!("an algebra has equal dimensions, found {dims:?}"),
        ));
    }
    let symmetry = match root.get("symmetry") {
        None => None,
        Some(sv) => {
            let sym = match &sv.value {
                JValue::Str(s) if s == "commutative" => Symmetry::Commutative,
                JValue::Str(s) if s == "anticommutative" => Symmetry::Anticommutative,
                _ => {
                    return Err(doc.error(
                        sv.at,
                        "$.symmetry",
                        format!(
                            "expected \"commutative\" or \"anticommutative\", found {}",
                            sv.describe()
                        ),
                    ));
                }
            };
            if kind != Kind::Algebra {
                return Err(doc.error(
                    sv.at,
                    "$.symmetry",
                    "a symmetry is declared for an algebra (\"kind\": \"algebra\"), not a \
                     bilinear map",
                ));
            }
            Some(sym)
        }
    };
    let names = match root.get("names") {
        None => default_names(kind, dims),
        Some(nv) => parse_names(&doc, nv, kind, dims)?,
    };
    let entries_v = json_required(
        &doc,
        &root,
        "$",
        "entries",
        "a list of [i, j, k, \"coefficient\"]",
    )?;
    let entries = json_list(
        &doc,
        entries_v,
        "$.entries",
        "a list of [i, j, k, \"coefficient\"]",
    )?;
    let prime = match field {
        FieldSpec::Prime(p) => PrimeField::new(p),
        FieldSpec::Rational => None,
    };
    let mut t = Tensor::zero(field, kind, dims, Some(names));
    // (value, entry that gave it, given as the mirror of that entry)
    let mut seen: HashMap<(usize, usize, usize), (Q, usize, bool)> = HashMap::new();
    let round = opts.rationalize.as_ref();
    for (n, e) in entries.iter().enumerate() {
        let path = format!("$.entries[{n}]");
        let (idx, val) = entry(&doc, e, &path, dims, prime.as_ref(), round)?;
        let mirror = symmetry.map(|s| {
            let neg = s == Symmetry::Anticommutative;
            let w = if neg { -val.clone() } else { val.clone() };
            let w = match prime.as_ref() {
                Some(f) => f.to_rational(&f.from_rational(&w).unwrap_or_default()),
                None => w,
            };
            ((idx.1, idx.0, idx.2), w, s)
        });
        if let Some((_, w, s)) = &mirror
            && idx.0 == idx.1
            && *w != val
        {
            return Err(doc.error(
                e.at,
                &path,
                format!(
                    "{:?} is a coefficient of a square x*x, which is 0 in a table declared \
                     \"{}\"",
                    idx,
                    s.keyword()
                ),
            ));
        }
        let mut put = |idx: (usize, usize, usize), val: Q, mirrored: bool| -> Result<()> {
            if let Some((old, first, was_mirror)) = seen.get(&idx) {
                if *old != val {
                    let how = match (was_mirror, mirrored) {
                        (false, false) => String::new(),
                        (true, _) => {
                            format!(" (there as the mirror of $.entries[{first}] by the symmetry)")
                        }
                        (false, true) => {
                            " (here as the mirror of this entry by the symmetry)".into()
                        }
                    };
                    return Err(doc.error(
                        e.at,
                        &path,
                        format!(
                            "conflicting duplicate of $.entries[{first}] for {:?}: {} here, {} \
                             there{how}",
                            idx,
                            q_to_string(&val),
                            q_to_string(old)
                        ),
                    ));
                }
                return Ok(());
            }
            if !num_traits::Zero::is_zero(&val) {
                check_nonzero(seen.len() + 1).map_err(|m| doc.error(e.at, &path, m))?;
            }
            t.set(idx.0, idx.1, idx.2, val.clone());
            seen.insert(idx, (val, n, mirrored));
            Ok(())
        };
        put(idx, val, false)?;
        if let Some((midx, w, _)) = mirror
            && midx != idx
        {
            put(midx, w, true)?;
        }
    }
    Ok(t)
}

fn parse_names(doc: &JsonDoc, v: &Json, kind: Kind, dims: [usize; 3]) -> Result<[Vec<String>; 3]> {
    let lists = json_list(doc, v, "$.names", "three lists of names")?;
    if lists.len() != 3 {
        return Err(doc.error(
            v.at,
            "$.names",
            format!("expected three lists of names, found {}", v.describe()),
        ));
    }
    let mut out: [Vec<String>; 3] = Default::default();
    for (a, l) in lists.iter().enumerate() {
        let path = format!("$.names[{a}]");
        let items = json_list(doc, l, &path, "a list of names")?;
        if items.len() != dims[a] {
            return Err(doc.error(
                l.at,
                &path,
                format!(
                    "{} names but dims gives {} ({} axis)",
                    items.len(),
                    dims[a],
                    crate::tensor::AXES[a]
                ),
            ));
        }
        let mut set = HashSet::new();
        for (i, it) in items.iter().enumerate() {
            let path = format!("$.names[{a}][{i}]");
            let JValue::Str(s) = &it.value else {
                return Err(doc.error(
                    it.at,
                    &path,
                    format!("expected a name string, found {}", it.describe()),
                ));
            };
            if !is_valid_name(s) {
                return Err(doc.error(
                    it.at,
                    &path,
                    format!(
                        "invalid basis name \"{s}\": a name starts with a letter or `_` and continues with letters, digits, `_`, `'` or `.`"
                    ),
                ));
            }
            if !set.insert(s.clone()) {
                return Err(doc.error(it.at, &path, format!("duplicate basis name \"{s}\"")));
            }
            out[a].push(s.clone());
        }
    }
    if kind == Kind::Algebra && !(out[0] == out[1] && out[1] == out[2]) {
        return Err(doc.error(
            v.at,
            "$.names",
            "an algebra has one basis: the three name lists must be equal",
        ));
    }
    Ok(out)
}

type Entry = ((usize, usize, usize), Q);

fn entry(
    doc: &JsonDoc,
    e: &Json,
    path: &str,
    dims: [usize; 3],
    prime: Option<&PrimeField>,
    round: Option<&Rationalize>,
) -> Result<Entry> {
    let a = json_list(doc, e, path, "[i, j, k, \"coefficient\"]")?;
    if a.len() != 4 {
        return Err(doc.error(
            e.at,
            path,
            format!(
                "expected 4 items [i, j, k, \"coefficient\"], found {}",
                e.describe()
            ),
        ));
    }
    let mut idx = [0usize; 3];
    for ax in 0..3 {
        match a[ax].as_index() {
            Some(x) if (x as u128) < dims[ax] as u128 => idx[ax] = x as usize,
            _ => {
                return Err(doc.error(
                    a[ax].at,
                    &format!("{path}[{ax}]"),
                    format!(
                        "expected an index in 0..{} ({} axis), found {}",
                        dims[ax],
                        crate::tensor::AXES[ax],
                        a[ax].describe()
                    ),
                ));
            }
        }
    }
    let cpath = format!("{path}[3]");
    let val = json_value(doc, &a[3], &cpath, round)?;
    let val = match prime {
        None => val,
        Some(f) => {
            if f.denominator_vanishes(&val) {
                return Err(doc.error(
                    a[3].at,
                    &cpath,
                    format!(
                        "the coefficient {} has a denominator divisible by {}, so it has no value in GF({})",
                        q_to_string(&val),
                        f.modulus(),
                        f.modulus()
                    ),
                ));
            }
            f.to_rational(&f.from_rational(&val).unwrap_or_default())
        }
    };
    Ok(((idx[0], idx[1], idx[2]), val))
}

/// Parse a dense nested JSON list `[[[c000, c001, ...], ...], ...]` of shape a x b x c
/// (`c[i][j][k]` at `$[i][j][k]`): a bilinear map, or an algebra when asked. Values are
/// JSON numbers (integers of any size; floats read exactly, see [`super::numbers`]) or
/// coefficient strings (`"1/3"`). Every list must have the length of the first one at its
/// depth; errors name the JSON path of the offending value.
pub fn parse_nested_list(text: &str, source: &str, opts: &ReadOptions) -> Result<Tensor> {
    let doc = JsonDoc { text, source };
    let root = doc.parse()?;
    let what = [
        "a list of a slices [[[...]]]",
        "a list of b lists",
        "a list of c numbers",
    ];
    let top = json_list(&doc, &root, "$", what[0])?;
    let mut dims = [top.len(), 0, 0];
    let mut probe = &root;
    for (d, w) in what.iter().enumerate().skip(1) {
        let path = format!("${}", "[0]".repeat(d));
        let items = json_list(&doc, probe, &path[..path.len() - 3], w)?;
        let Some(first) = items.first() else {
            return Err(doc.error(
                probe.at,
                &path[..path.len() - 3],
                "an empty list: every dimension is at least 1",
            ));
        };
        let inner = json_list(&doc, first, &path, w)?;
        dims[d] = inner.len();
        probe = first;
    }
    if dims.contains(&0) {
        return Err(doc.error(
            root.at,
            "$",
            format!("shape {dims:?}: every dimension is at least 1"),
        ));
    }
    if let Some(d) = dims.iter().find(|&&d| d > MAX_DIM) {
        return Err(doc.error(
            root.at,
            "$",
            format!("dimension {d} is above the limit of {MAX_DIM}"),
        ));
    }
    check_shape(dims).map_err(|m| doc.error(root.at, "$", m))?;
    let kind = super::npy::kind_for(dims, opts).map_err(|m| doc.error(root.at, "$", m))?;
    let mut t = Tensor::zero(FieldSpec::Rational, kind, dims, None);
    let round = opts.rationalize.as_ref();
    let mut nonzero = 0usize;
    for (i, a) in top.iter().enumerate() {
        let pa = format!("$[{i}]");
        let rows = json_list(&doc, a, &pa, what[1])?;
        if rows.len() != dims[1] {
            return Err(doc.error(
                a.at,
                &pa,
                format!(
                    "expected {} lists (as $[0]), found {}",
                    dims[1],
                    a.describe()
                ),
            ));
        }
        for (j, r) in rows.iter().enumerate() {
            let pr = format!("{pa}[{j}]");
            let cells = json_list(&doc, r, &pr, what[2])?;
            if cells.len() != dims[2] {
                return Err(doc.error(
                    r.at,
                    &pr,
                    format!(
                        "expected {} numbers (as $[0][0]), found {}",
                        dims[2],
                        r.describe()
                    ),
                ));
            }
            let mut row = Vec::new();
            for (k, c) in cells.iter().enumerate() {
                let path = format!("{pr}[{k}]");
                let v = json_value(&doc, c, &path, round)?;
                if !num_traits::Zero::is_zero(&v) {
                    nonzero += 1;
                    check_nonzero(nonzero).map_err(|m| doc.error(c.at, &path, m))?;
                    row.push((k, v));
                }
            }
            t.set_product(i, j, row);
        }
    }
    Ok(t)
}
