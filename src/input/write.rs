//! Writers for the three text forms: product lines, grid, coordinate JSON.
//!
//! Each writer is the inverse of its parser: `parse(write(t)) == t` whenever the basis names
//! of `t` are valid names (all generators and parsers produce valid names). Every nonzero
//! product is listed; products not listed are zero. Cost: O(nnz) plus the names.

use crate::error::{Error, Result};
use crate::scalar::{Q, q_to_string};
use crate::tensor::{Kind, Tensor};
use num_traits::{One, Signed, ToPrimitive};

/// A combination `2 z - 1/3 w` (`spaced`) or `2z-1/3w` (for grid cells); `0` when empty.
pub fn format_combination<'a>(
    terms: impl IntoIterator<Item = (&'a str, &'a Q)>,
    spaced: bool,
) -> String {
    let mut out = String::new();
    for (name, c) in terms {
        let neg = c.is_negative();
        let a = c.abs();
        if out.is_empty() {
            if neg {
                out.push('-');
            }
        } else if spaced {
            out.push_str(if neg { " - " } else { " + " });
        } else {
            out.push(if neg { '-' } else { '+' });
        }
        if !a.is_one() {
            out.push_str(&q_to_string(&a));
            if spaced {
                out.push(' ');
            }
        }
        out.push_str(name);
    }
    if out.is_empty() {
        out.push('0');
    }
    out
}

fn product_cell(t: &Tensor, i: usize, j: usize, spaced: bool) -> String {
    format_combination(
        t.product(i, j).iter().map(|(k, c)| (t.name(2, *k), c)),
        spaced,
    )
}

fn header(t: &Tensor) -> String {
    let mut s = format!("field {}\n", t.field().name());
    match t.kind() {
        Kind::Algebra => s.push_str(&format!("basis {}\n", t.names()[0].join(" "))),
        Kind::Bilinear => {
            for (a, kw) in ["left", "right", "result"].iter().enumerate() {
                s.push_str(&format!("{kw} {}\n", t.names()[a].join(" ")));
            }
        }
    }
    s
}

/// The table format with one product line `x*y = combination` per nonzero product.
pub fn write_table(t: &Tensor) -> String {
    let mut s = header(t);
    let [a, b, _] = t.dims();
    for i in 0..a {
        for j in 0..b {
            if !t.product(i, j).is_empty() {
                s.push_str(&format!(
                    "{}*{} = {}\n",
                    t.name(0, i),
                    t.name(1, j),
                    product_cell(t, i, j, true)
                ));
            }
        }
    }
    s
}

/// The grid (Cayley table) form; only for algebras.
pub fn write_grid(t: &Tensor) -> Result<String> {
    if t.kind() != Kind::Algebra {
        return Err(Error::Invalid(
            "the grid form is only for algebras; write a bilinear map as a table or JSON".into(),
        ));
    }
    let n = t.dim();
    let mut rows: Vec<Vec<String>> = Vec::with_capacity(n + 1);
    let mut head = vec![String::new()];
    head.extend(t.names()[0].iter().cloned());
    rows.push(head);
    for i in 0..n {
        let mut row = vec![t.name(0, i).to_string()];
        row.extend((0..n).map(|j| product_cell(t, i, j, false)));
        rows.push(row);
    }
    let mut s = header(t);
    s.push_str("grid\n");
    s.push_str(&aligned(&rows));
    s.push_str("end\n");
    Ok(s)
}

fn json_str(s: &str) -> String {
    serde_json::to_string(s).unwrap_or_else(|_| "\"\"".into())
}

/// The coordinate JSON form, one entry per line.
pub fn write_json(t: &Tensor) -> String {
    let kind = match t.kind() {
        Kind::Algebra => "algebra",
        Kind::Bilinear => "bilinear",
    };
    let d = t.dims();
    let names: Vec<String> = t
        .names()
        .iter()
        .map(|v| {
            format!(
                "[{}]",
                v.iter().map(|n| json_str(n)).collect::<Vec<_>>().join(", ")
            )
        })
        .collect();
    let mut out = format!(
        "{{\"field\": {}, \"kind\": \"{kind}\", \"dims\": [{}, {}, {}],\n \"names\": [{}],\n \"entries\": [\n",
        json_str(&t.field().name()),
        d[0],
        d[1],
        d[2],
        names.join(",\n           "),
    );
    // One buffer, no temporary string per entry (small integers without big-number
    // formatting): this writer is on the path of every large conversion.
    out.reserve(t.nnz() * 20);
    for (n, (i, j, k, v)) in t.entries().enumerate() {
        use std::fmt::Write;
        if n > 0 {
            out.push_str(",\n");
        }
        let small = if v.denom().is_one() {
            v.numer().to_i64()
        } else {
            None
        };
        let _ = match small {
            Some(x) => write!(out, "  [{i}, {j}, {k}, \"{x}\"]"),
            None => write!(out, "  [{i}, {j}, {k}, \"{}\"]", q_to_string(v)),
        };
    }
    out.push_str("\n ]}\n");
    out
}

/// A bilinear map as its slices along `axis` (0 left, 1 right, 2 result): one
/// `slice AXIS NAME ... end` block per basis vector of that axis, each a matrix of numbers
/// with a header of column names and one row per row name (see `docs/formats.md`). The
/// table parser reads it back. An algebra is written as a map with the same names.
pub fn write_slices(t: &Tensor, axis: usize) -> String {
    let t = if t.kind() == Kind::Algebra {
        t.as_bilinear()
    } else {
        t.clone()
    };
    let (ra, ca) = super::grid::slice_axes(axis);
    let dims = t.dims();
    let mut s = header(&t);
    for k in 0..dims[axis] {
        let mut rows: Vec<Vec<String>> = Vec::with_capacity(dims[ra] + 1);
        let mut head = vec![String::new()];
        head.extend(t.names()[ca].iter().cloned());
        rows.push(head);
        for r in 0..dims[ra] {
            let mut row = vec![t.name(ra, r).to_string()];
            for c in 0..dims[ca] {
                let mut ijk = [0usize; 3];
                ijk[axis] = k;
                ijk[ra] = r;
                ijk[ca] = c;
                row.push(q_to_string(&t.get(ijk[0], ijk[1], ijk[2])));
            }
            rows.push(row);
        }
        s.push_str(&format!(
            "slice {} {}\n",
            crate::tensor::AXES[axis],
            t.name(axis, k)
        ));
        s.push_str(&aligned(&rows));
        s.push_str("end\n");
    }
    s
}

/// Rows of cells with the first column left-aligned and the others right-aligned.
fn aligned(rows: &[Vec<String>]) -> String {
    let cols = rows.iter().map(Vec::len).max().unwrap_or(0);
    let mut width = vec![0; cols];
    for r in rows {
        for (c, cell) in r.iter().enumerate() {
            width[c] = width[c].max(cell.chars().count());
        }
    }
    let mut s = String::new();
    for r in rows {
        let line: Vec<String> = r
            .iter()
            .enumerate()
            .map(|(c, cell)| {
                if c == 0 {
                    format!("{cell:<w$}", w = width[0])
                } else {
                    format!("{cell:>w$}", w = width[c])
                }
            })
            .collect();
        s.push_str(line.join("  ").trim_end());
        s.push('\n');
    }
    s
}
