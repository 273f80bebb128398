//! Change-of-basis files (`docs/formats.md`, section "Change of basis") and their
//! application to a structure tensor.
//!
//! A file gives either one square matrix (`matrix` ... `end`, for an algebra: the same change
//! on all three axes) or three (`matrix left`, `matrix right`, `matrix result`), each as rows
//! of rational numbers whose *columns* are the new basis vectors in old coordinates (the
//! convention of [`crate::tensor::change_basis`]), plus optional `names` statements renaming
//! the new bases.
//!
//! Invariants: the parser never panics; every refusal is an [`Error::Parse`] with a 1-based
//! line and column. [`apply_basis_change`] refuses (with the position of the offending block)
//! a matrix of the wrong size, a coefficient without value in GF(p) and a singular matrix,
//! so a successful result is always an isomorphic (isotopic for three matrices) tensor.

use super::cursor::{Cursor, LineRef, tokens};
use super::is_valid_name;
use crate::error::{Error, Position, Result};
use crate::linalg::{Matrix, determinant};
use crate::scalar::{Field, FieldSpec, PrimeField, Q};
use crate::tensor::{Kind, MAX_DIM, Tensor, change_basis, random_invertible};
use std::collections::HashSet;

/// One `matrix` block: the matrix and the position of its `matrix` keyword.
#[derive(Clone, Debug)]
pub struct MatrixBlock {
    pub matrix: Matrix<Q>,
    pub at: Position,
}

/// One `names` statement: the new names and the position of its first name.
#[derive(Clone, Debug)]
pub struct NamesLine {
    pub names: Vec<String>,
    pub at: Position,
}

/// A parsed change-of-basis file. Exactly one of the two forms is present: `single` (one
/// matrix for all axes) or all three of `axes` (left, right, result).
#[derive(Clone, Debug)]
pub struct BasisChange {
    pub single: Option<MatrixBlock>,
    pub axes: [Option<MatrixBlock>; 3],
    /// `names ...` (the one-matrix form).
    pub single_names: Option<NamesLine>,
    /// `names left ...`, `names right ...`, `names result ...`.
    pub names: [Option<NamesLine>; 3],
}

const AXIS_WORDS: [&str; 3] = ["left", "right", "result"];

fn axis_of(word: &str) -> Option<usize> {
    AXIS_WORDS.iter().position(|w| *w == word)
}

/// A signed rational token (`3`, `-1/2`, `+0.25`) spanning `line.text[start..end]`.
fn parse_entry(line: LineRef<'_>, start: usize, end: usize) -> Result<Q> {
    let mut cur = Cursor::new(line, start, end);
    let neg = cur.take_sign();
    if !cur.peek().is_some_and(|c| c.is_ascii_digit()) {
        return Err(cur.expected("a rational number such as `2`, `-1/3` or `0.5`"));
    }
    let v = cur.number()?;
    if !cur.at_end() {
        return Err(cur.expected("whitespace after the number"));
    }
    Ok(if neg { -v } else { v })
}

/// A matrix block being read.
struct Open {
    axis: Option<usize>,
    at: Position,
    line: usize,
    rows: Vec<Vec<Q>>,
}

/// Parse a change-of-basis file. `source` names it in error positions.
/// Cost: linear in the input size.
pub fn parse_basis_file(text: &str, source: &str) -> Result<BasisChange> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let mut out = BasisChange {
        single: None,
        axes: [None, None, None],
        single_names: None,
        names: [None, None, None],
    };
    let mut open: Option<Open> = None;
    let mut last_line = LineRef {
        source,
        text: "",
        number: 1,
    };
    for (idx, raw) in text.split('\n').enumerate() {
        let raw = raw.strip_suffix('\r').unwrap_or(raw);
        let line = LineRef {
            source,
            text: raw.find('#').map_or(raw, |c| &raw[..c]),
            number: idx + 1,
        };
        last_line = line;
        let toks = tokens(line.text);
        let Some(&(kpos, kw)) = toks.first() else {
            continue;
        };
        if let Some(c) = line.text.chars().find(|c| c.is_control() && *c != '\t') {
            let b = line.text.find(c).unwrap_or(0);
            return Err(line.err(
                b,
                format!(
                    "control character U+{:04X} found: expected a text file",
                    c as u32
                ),
            ));
        }
        if let Some(o) = open.as_mut() {
            if kw == "end" {
                if toks.len() > 1 {
                    return Err(line.err(toks[1].0, "expected nothing after `end`"));
                }
                let o = open.take().expect("an open block");
                close_block(o, &line, kpos, &mut out)?;
                continue;
            }
            if o.rows.len() == MAX_DIM {
                return Err(line.err(
                    kpos,
                    format!("a matrix has at most {MAX_DIM} rows (the dimension limit)"),
                ));
            }
            let width = o.rows.first().map(Vec::len);
            if let Some(w) = width
                && toks.len() != w
            {
                let at = toks.get(w).map_or(line.text.trim_end().len(), |t| t.0);
                return Err(line.err(
                    at,
                    format!(
                        "expected {w} numbers in this row (as in the first row, line {}), found {}",
                        o.line + 2,
                        toks.len()
                    ),
                ));
            }
            if toks.len() > MAX_DIM {
                return Err(line.err(
                    toks[MAX_DIM].0,
                    format!("a matrix has at most {MAX_DIM} columns (the dimension limit)"),
                ));
            }
            let row = toks
                .iter()
                .map(|&(p, tok)| parse_entry(line, p, p + tok.len()))
                .collect::<Result<Vec<Q>>>()?;
            o.rows.push(row);
            continue;
        }
        match kw {
            "matrix" => {
                let axis = match toks.get(1) {
                    None => None,
                    Some(&(p, w)) => match axis_of(w) {
                        Some(a) if toks.len() == 2 => Some(a),
                        Some(_) => {
                            return Err(line.err(toks[2].0, "expected nothing after the axis"));
                        }
                        None => {
                            return Err(line.err(
                                p,
                                format!(
                                    "expected `left`, `right`, `result` or nothing after \
                                     `matrix`, found `{w}`"
                                ),
                            ));
                        }
                    },
                };
                let taken = match axis {
                    None => out.single.as_ref(),
                    Some(a) => out.axes[a].as_ref(),
                };
                if let Some(first) = taken {
                    return Err(line.err(
                        kpos,
                        format!(
                            "this matrix is given twice (first on line {})",
                            first.at.line
                        ),
                    ));
                }
                let mixed = match axis {
                    None => out.axes.iter().flatten().next(),
                    Some(_) => out.single.as_ref(),
                };
                if let Some(other) = mixed {
                    return Err(line.err(
                        kpos,
                        format!(
                            "a file gives either one `matrix` (all axes) or `matrix left`, \
                             `matrix right` and `matrix result`, not both (see line {})",
                            other.at.line
                        ),
                    ));
                }
                open = Some(Open {
                    axis,
                    at: line.pos(kpos),
                    line: idx,
                    rows: Vec::new(),
                });
            }
            "names" => parse_names(&line, &toks, &mut out)?,
            "end" => return Err(line.err(kpos, "`end` without a matching `matrix`")),
            other => {
                return Err(line.err(
                    kpos,
                    format!("expected `matrix`, `names` or a comment, found `{other}`"),
                ));
            }
        }
    }
    if let Some(o) = open {
        return Err(Error::Parse {
            at: o.at,
            message: "this matrix is not closed: expected a line `end`".into(),
        });
    }
    let given = out.axes.iter().flatten().count();
    if out.single.is_none() && given == 0 {
        return Err(last_line.err(0, "no `matrix` block: expected `matrix` ... `end`"));
    }
    if given > 0 && given < 3 {
        let missing = (0..3).find(|&a| out.axes[a].is_none()).unwrap_or(0);
        let at = out.axes.iter().flatten().next().map(|b| b.at.clone());
        return Err(Error::Parse {
            at: at.unwrap_or_else(|| last_line.pos(0)),
            message: format!(
                "`matrix {}` is missing: a file with axis matrices gives all three",
                AXIS_WORDS[missing]
            ),
        });
    }
    if out.single.is_some() && out.names.iter().any(Option::is_some) {
        let n = out.names.iter().flatten().next().map(|n| n.at.clone());
        return Err(Error::Parse {
            at: n.unwrap_or_else(|| last_line.pos(0)),
            message: "`names AXIS ...` goes with `matrix AXIS` blocks; with one `matrix` write \
                      `names ...`"
                .into(),
        });
    }
    if given == 3 && out.single_names.is_some() {
        let n = out.single_names.as_ref().map(|n| n.at.clone());
        return Err(Error::Parse {
            at: n.unwrap_or_else(|| last_line.pos(0)),
            message: "with `matrix left/right/result` blocks write `names left ...`, \
                      `names right ...`, `names result ...`"
                .into(),
        });
    }
    Ok(out)
}

fn close_block(o: Open, line: &LineRef<'_>, kpos: usize, out: &mut BasisChange) -> Result<()> {
    let n = o.rows.len();
    if n == 0 {
        return Err(line.err(kpos, "an empty matrix: expected its rows before `end`"));
    }
    if o.rows[0].len() != n {
        return Err(line.err(
            kpos,
            format!(
                "the matrix is not square: {n} rows of {} numbers (a change of basis is an \
                 invertible square matrix)",
                o.rows[0].len()
            ),
        ));
    }
    let block = MatrixBlock {
        matrix: Matrix::from_rows(o.rows, n),
        at: o.at,
    };
    match o.axis {
        None => out.single = Some(block),
        Some(a) => out.axes[a] = Some(block),
    }
    Ok(())
}

fn parse_names(line: &LineRef<'_>, toks: &[(usize, &str)], out: &mut BasisChange) -> Result<()> {
    let axis = toks.get(1).and_then(|t| axis_of(t.1));
    let first = if axis.is_some() { 2 } else { 1 };
    if toks.len() <= first {
        let end = line.text.trim_end().len();
        return Err(line.err(
            end,
            "expected the new basis names, found the end of the line",
        ));
    }
    let slot = match axis {
        None => &mut out.single_names,
        Some(a) => &mut out.names[a],
    };
    if let Some(prev) = slot {
        return Err(line.err(
            toks[0].0,
            format!(
                "these names are given twice (first on line {})",
                prev.at.line
            ),
        ));
    }
    let mut seen = HashSet::new();
    let mut names = Vec::with_capacity(toks.len() - first);
    for &(p, name) in &toks[first..] {
        if !is_valid_name(name) {
            return Err(line.err(
                p,
                format!(
                    "invalid basis name `{name}`: a name starts with a letter or `_` and \
                     continues with letters, digits, `_`, `'` or `.`"
                ),
            ));
        }
        if !seen.insert(name) {
            return Err(line.err(p, format!("duplicate basis name `{name}`")));
        }
        names.push(name.to_string());
    }
    *slot = Some(NamesLine {
        names,
        at: line.pos(toks[first].0),
    });
    Ok(())
}

fn at_err(at: &Position, message: String) -> Error {
    Error::Parse {
        at: at.clone(),
        message,
    }
}

/// Check one block for axis `axis` of dimension `n` over `field`: size, denominators, and
/// invertibility (exact determinant over the field). Cost: O(n^3) field operations.
fn check_block(b: &MatrixBlock, what: &str, n: usize, field: FieldSpec) -> Result<()> {
    if b.matrix.rows != n {
        return Err(at_err(
            &b.at,
            format!(
                "the {what} matrix is {0} x {0}, but the {what} space has dimension {n}",
                b.matrix.rows
            ),
        ));
    }
    let singular = match field {
        FieldSpec::Rational => crate::linalg::rank_q(&b.matrix) < n,
        FieldSpec::Prime(p) => {
            let f = PrimeField::new(p).expect("a prime field");
            if b.matrix.data.iter().any(|x| f.denominator_vanishes(x)) {
                return Err(at_err(
                    &b.at,
                    format!(
                        "the {what} matrix has an entry whose denominator is divisible by {p}, \
                         so it has no value in GF({p})"
                    ),
                ));
            }
            let m = b.matrix.map(|x| f.from_rational(x).unwrap_or_default());
            f.is_zero(&determinant(&f, &m))
        }
    };
    if singular {
        return Err(at_err(
            &b.at,
            format!(
                "the {what} matrix is singular over {field} (determinant 0): a change of \
                 basis must be invertible"
            ),
        ));
    }
    Ok(())
}

fn check_names(n: &NamesLine, what: &str, dim: usize) -> Result<()> {
    if n.names.len() != dim {
        return Err(at_err(
            &n.at,
            format!(
                "{} new names given, but the {what} space has dimension {dim}",
                n.names.len()
            ),
        ));
    }
    Ok(())
}

/// Apply a parsed change of basis to `t`: with matrices (P, R, S) the new coefficients are
/// `c'[i][j][k] = sum P[a][i] R[b][j] c[a][b][c] (S^-1)[k][c]` (columns of P = new basis in
/// old coordinates). One matrix acts on all three axes of an algebra (or of a map with three
/// equal dimensions) and keeps the kind; three matrices give a bilinear map (an isotope).
/// Renames the new bases when `names` are given (otherwise the old names are kept).
/// Cost: O(n^3) per invertibility check plus that of [`change_basis`].
pub fn apply_basis_change(t: &Tensor, c: &BasisChange) -> Result<Tensor> {
    let d = t.dims();
    let field = t.field();
    let (mats, base): ([&MatrixBlock; 3], Tensor) = match (&c.single, &c.axes) {
        (Some(s), _) => {
            if !t.is_square() {
                return Err(at_err(
                    &s.at,
                    format!(
                        "one `matrix` fits an algebra or a map with three equal dimensions; \
                         this map has dimensions {d:?}: give `matrix left`, `matrix right` \
                         and `matrix result`"
                    ),
                ));
            }
            let what = if t.kind() == Kind::Algebra {
                "basis"
            } else {
                "left"
            };
            check_block(s, what, d[0], field)?;
            ([s, s, s], t.clone())
        }
        (None, [Some(l), Some(r), Some(s)]) => {
            for (b, a) in [(l, 0), (r, 1), (s, 2)] {
                check_block(b, AXIS_WORDS[a], d[a], field)?;
            }
            ([l, r, s], t.as_bilinear())
        }
        _ => {
            return Err(Error::Invalid(
                "a change of basis needs one `matrix` or all three axis matrices".into(),
            ));
        }
    };
    let mut out = change_basis(&base, &mats[0].matrix, &mats[1].matrix, &mats[2].matrix)
        .ok_or_else(|| Error::Invalid("the change of basis does not fit the tensor".into()))?;
    if let Some(n) = &c.single_names {
        check_names(n, "basis", d[0])?;
        for a in 0..3 {
            out.set_names(a, n.names.clone());
        }
    }
    for (a, n) in c.names.iter().enumerate() {
        if let Some(n) = n {
            check_names(n, AXIS_WORDS[a], d[a])?;
            out.set_names(a, n.names.clone());
        }
    }
    Ok(out)
}

/// A random change of basis for `t` from `seed`: for an algebra one matrix, for a map one
/// per axis (seeds derived from `seed` and the axis), each from
/// [`random_invertible`] with entries in `-2..=2` and redrawn until invertible over the
/// tensor's field. Deterministic in `seed`. Cost: O(n^3) per draw.
pub fn random_basis_change(t: &Tensor, seed: u64) -> BasisChange {
    let d = t.dims();
    let field = t.field();
    let draw = |axis: usize, n: usize| -> MatrixBlock {
        let at = Position {
            source: format!("<random seed {seed}>"),
            line: 1,
            column: 1,
        };
        let mut attempt = 0u64;
        loop {
            let s = seed
                .wrapping_mul(0x9E37_79B9_7F4A_7C15)
                .wrapping_add((axis as u64) << 32)
                .wrapping_add(attempt);
            let b = MatrixBlock {
                matrix: random_invertible(n, 2, s),
                at: at.clone(),
            };
            if check_block(&b, "", n, field).is_ok() {
                return b;
            }
            attempt += 1;
        }
    };
    let mut c = BasisChange {
        single: None,
        axes: [None, None, None],
        single_names: None,
        names: [None, None, None],
    };
    if t.kind() == Kind::Algebra {
        c.single = Some(draw(0, d[0]));
    } else {
        c.axes = std::array::from_fn(|a| Some(draw(a, d[a])));
    }
    c
}

#[cfg(test)]
#[path = "basis_file_tests.rs"]
mod tests;
