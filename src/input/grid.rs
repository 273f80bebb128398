//! The grid (Cayley table) form of the table format: after `grid`, a header line of column
//! names (right factors), then one line per row name (left factor) with one cell per column,
//! then `end`. Cells are whitespace-free combinations (`i+2j`, `-1/2e`, `0`). Every basis name
//! appears exactly once among the columns and once among the rows.

use super::combination::parse_combination;
use super::cursor::{Cursor, tokens};
use super::table::{Builder, Pending};
use crate::error::Result;
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
