//! The grid (Cayley table) form of the table format: after `grid`, a header line of column
//! names (right factors), then one line per row name (left factor) with one cell per column,
//! then `end`. Cells are whitespace-free combinations (`i+2j`, `-1/2e`, `0`). Every basis name
//! appears exactly once among the columns and once among the rows.
//!
//! A bilinear map is given by its slices along one axis instead: `slice AXIS NAME` (AXIS
//! one of `left`, `right`, `result`, NAME a basis name of that axis), a header line of
//! column names, one line per row name with one number per column, then `end`. A result
//! slice `c_k` has rows `u_i` (left) and columns `v_j` (right) and holds `c[i][j][k]`; a
//! left slice `u_i` has rows `v_j` and columns `w_k`; a right slice `v_j` has rows `u_i` and
//! columns `w_k`. A file gives every slice along one axis exactly once and no product lines.

use super::combination::parse_combination;
use super::cursor::{Cursor, LineRef, tokens};
use super::table::{Builder, Pending, SliceEntries};
use crate::error::Result;
use crate::scalar::Q;
use crate::tensor::Kind;
use std::collections::HashMap;

/// Parse the grid whose `grid` keyword is on line index `start`; returns the index of the
/// line after `end`.
pub(super) fn parse_grid(b: &mut Builder<'_>, start: usize) -> Result<usize> {
    let gline = b.line(start);
    let gpos = gline.text.len() - gline.text.trim_start().len();
    match b.kind {
        Some(Kind::Algebra) => {}
        Some(Kind::Bilinear) => {
            return Err(gline.err(
                gpos,
                "a grid is only for algebras; write a bilinear map as product lines `x*y = ...`",
            ));
        }
        None => return Err(gline.err(gpos, "a grid before the basis: declare `basis ...` first")),
    }
    let n = b.names[0].as_ref().map_or(0, |v| v.0.len());
    let mut columns: Option<Vec<usize>> = None;
    let mut rows_seen: HashMap<usize, usize> = HashMap::new();
    let mut idx = start + 1;
    while idx < b.lines.len() {
        let line = b.line(idx);
        idx += 1;
        let toks = tokens(line.text);
        if toks.is_empty() {
            continue;
        }
        let is_end = toks.len() == 1 && toks[0].1 == "end";
        let Some(cols) = &columns else {
            if is_end {
                return Err(line.err(
                    toks[0].0,
                    "expected the grid header (the column names), found `end`",
                ));
            }
            let mut cols = Vec::with_capacity(toks.len());
            let mut where_: HashMap<usize, usize> = HashMap::new();
            for &(pos, name) in &toks {
                let j = b.lookup(1, name, &line, pos)?;
                if let Some(c) = where_.get(&j) {
                    return Err(line.err(pos, format!("column `{name}` appears twice in the grid header (already at column {c})")));
                }
                where_.insert(j, line.pos(pos).column);
                cols.push(j);
            }
            if let Some(missing) = (0..n).find(|j| !where_.contains_key(j)) {
                let end = line.text.trim_end().len();
                return Err(line.err(
                    end,
                    format!(
                        "the grid header has no column for `{}`: every basis name must appear once",
                        b.names[0].as_ref().map_or("", |v| v.0[missing].as_str())
                    ),
                ));
            }
            columns = Some(cols);
            continue;
        };
        if is_end {
            if let Some(missing) = (0..n).find(|i| !rows_seen.contains_key(i)) {
                return Err(line.err(
                    toks[0].0,
                    format!(
                        "the grid has no row for `{}`: every basis name must appear once",
                        b.names[0].as_ref().map_or("", |v| v.0[missing].as_str())
                    ),
                ));
            }
            return Ok(idx);
        }
        let (rpos, rname) = toks[0];
        let i = b.lookup(0, rname, &line, rpos)?;
        if let Some(first) = rows_seen.get(&i) {
            return Err(line.err(
                rpos,
                format!(
                    "row `{rname}` appears twice in the grid (first on line {})",
                    first + 1
                ),
            ));
        }
        rows_seen.insert(i, idx - 1);
        let cells = &toks[1..];
        if cells.len() != cols.len() {
            let at = if cells.len() > cols.len() {
                cells[cols.len()].0
            } else {
                line.text.trim_end().len()
            };
            return Err(line.err(
                at,
                format!(
                    "expected {} cells in row `{rname}` (one per column), found {}",
                    cols.len(),
                    cells.len()
                ),
            ));
        }
        let cols = cols.clone();
        for (&(pos, cell), &j) in cells.iter().zip(&cols) {
            let mut cur = Cursor::new(line, pos, pos + cell.len());
            let terms = b.resolve_terms(parse_combination(&mut cur)?, &line)?;
            b.add_product(Pending {
                i,
                j,
                terms,
                bracket: false,
                line: idx - 1,
                byte: pos,
            })?;
        }
    }
    Err(gline.err(
        gpos,
        "this grid is not closed: expected a line `end` before the end of the input",
    ))
}

/// The (rows, columns) axes of a slice along `axis`.
pub(super) fn slice_axes(axis: usize) -> (usize, usize) {
    match axis {
        0 => (1, 2),
        1 => (0, 2),
        _ => (0, 1),
    }
}

/// Parse the slice block whose `slice AXIS NAME` line is on line index `start` (tokens
/// `toks`); returns the index of the line after `end`.
pub(super) fn parse_slice(
    b: &mut Builder<'_>,
    start: usize,
    toks: &[(usize, &str)],
) -> Result<usize> {
    let sline = b.line(start);
    let kpos = toks[0].0;
    if b.kind != Some(Kind::Bilinear) || !b.names.iter().all(Option::is_some) {
        return Err(sline.err(
            kpos,
            "a slice is for a bilinear map: declare `left`, `right` and `result` first \
             (an algebra is given by product lines or a grid)",
        ));
    }
    if b.products > 0 {
        return Err(sline.err(
            kpos,
            "a map is given either by product lines or by slices, not both",
        ));
    }
    let Some(&(apos, aname)) = toks.get(1) else {
        return Err(sline.err(
            kpos + 5,
            "expected an axis after `slice`: `slice left NAME`, `slice right NAME` or \
             `slice result NAME`",
        ));
    };
    let Some(axis) = ["left", "right", "result"].iter().position(|a| *a == aname) else {
        return Err(sline.err(
            apos,
            format!("expected an axis `left`, `right` or `result`, found `{aname}`"),
        ));
    };
    let Some(&(npos, name)) = toks.get(2) else {
        return Err(sline.err(
            apos + aname.len(),
            format!("expected a {aname} basis name after `slice {aname}`"),
        ));
    };
    if let Some(&(xpos, x)) = toks.get(3) {
        return Err(sline.err(xpos, format!("expected the end of the line, found `{x}`")));
    }
    let k = b.lookup(axis, name, &sline, npos)?;
    let dims: [usize; 3] = std::array::from_fn(|a| b.names[a].as_ref().map_or(0, |n| n.0.len()));
    let entries = b.slices.get_or_insert_with(|| SliceEntries {
        axis,
        first_line: start,
        seen: vec![None; dims[axis]],
        values: Vec::new(),
    });
    if entries.axis != axis {
        return Err(sline.err(
            apos,
            format!(
                "all slices are along one axis: line {} gives `{}` slices",
                entries.first_line + 1,
                crate::tensor::AXES[entries.axis]
            ),
        ));
    }
    if let Some(first) = entries.seen[k] {
        return Err(sline.err(
            npos,
            format!(
                "slice `{name}` is given twice (first on line {})",
                first + 1
            ),
        ));
    }
    entries.seen[k] = Some(start);
    let (ra, ca) = slice_axes(axis);
    let mut columns: Option<Vec<usize>> = None;
    let mut rows_seen: HashMap<usize, usize> = HashMap::new();
    let mut values: Vec<(usize, usize, usize, Q)> = Vec::new();
    let mut idx = start + 1;
    while idx < b.lines.len() {
        let line = b.line(idx);
        idx += 1;
        let toks = tokens(line.text);
        if toks.is_empty() {
            continue;
        }
        let is_end = toks.len() == 1 && toks[0].1 == "end";
        let Some(cols) = &columns else {
            if is_end {
                return Err(line.err(
                    toks[0].0,
                    "expected the slice header (the column names), found `end`",
                ));
            }
            let mut cols = Vec::with_capacity(toks.len());
            let mut where_: HashMap<usize, usize> = HashMap::new();
            for &(pos, cname) in &toks {
                let j = b.lookup(ca, cname, &line, pos)?;
                if let Some(c) = where_.get(&j) {
                    return Err(line.err(
                        pos,
                        format!("column `{cname}` appears twice in the slice header (already at column {c})"),
                    ));
                }
                where_.insert(j, line.pos(pos).column);
                cols.push(j);
            }
            if let Some(missing) = (0..dims[ca]).find(|j| !where_.contains_key(j)) {
                return Err(line.err(
                    line.text.trim_end().len(),
                    format!(
                        "the slice header has no column for `{}`: every {} basis name must appear once",
                        b.names[ca].as_ref().map_or("", |v| v.0[missing].as_str()),
                        crate::tensor::AXES[ca]
                    ),
                ));
            }
            columns = Some(cols);
            continue;
        };
        if is_end {
            if let Some(missing) = (0..dims[ra]).find(|i| !rows_seen.contains_key(i)) {
                return Err(line.err(
                    toks[0].0,
                    format!(
                        "the slice has no row for `{}`: every {} basis name must appear once",
                        b.names[ra].as_ref().map_or("", |v| v.0[missing].as_str()),
                        crate::tensor::AXES[ra]
                    ),
                ));
            }
            if let Some(e) = b.slices.as_mut() {
                e.values.extend(values);
            }
            return Ok(idx);
        }
        let (rpos, rname) = toks[0];
        let r = b.lookup(ra, rname, &line, rpos)?;
        if let Some(first) = rows_seen.get(&r) {
            return Err(line.err(
                rpos,
                format!(
                    "row `{rname}` appears twice in the slice (first on line {})",
                    first + 1
                ),
            ));
        }
        rows_seen.insert(r, idx - 1);
        let cells = &toks[1..];
        if cells.len() != cols.len() {
            let at = if cells.len() > cols.len() {
                cells[cols.len()].0
            } else {
                line.text.trim_end().len()
            };
            return Err(line.err(
                at,
                format!(
                    "expected {} numbers in row `{rname}` (one per column), found {}",
                    cols.len(),
                    cells.len()
                ),
            ));
        }
        for (&(pos, cell), &c) in cells.iter().zip(cols) {
            let v = cell_number(line, pos, cell)?;
            if v != Q::from_integer(0.into()) {
                let mut ijk = [0usize; 3];
                ijk[axis] = k;
                ijk[ra] = r;
                ijk[ca] = c;
                b.check_coefficient(&v, idx - 1, pos)?;
                b.count_nonzero(1, idx - 1, pos)?;
                values.push((ijk[0], ijk[1], ijk[2], v));
            }
        }
    }
    Err(sline.err(
        kpos,
        "this slice is not closed: expected a line `end` before the end of the input",
    ))
}

/// A cell of a slice: a number `3`, `-1/2`, `0.25` (no basis name).
fn cell_number(line: LineRef<'_>, pos: usize, cell: &str) -> Result<Q> {
    let mut cur = Cursor::new(line, pos, pos + cell.len());
    let neg = cur.take_sign();
    if !cur.peek().is_some_and(|c| c.is_ascii_digit()) {
        return Err(cur.expected("a number such as `3`, `-1/2` or `0.25`"));
    }
    let x = cur.number()?;
    if !cur.at_end() {
        return Err(cur.expected("the end of the number"));
    }
    Ok(if neg { -x } else { x })
}
