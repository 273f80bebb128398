//! Reading a 3-way array from a CSV file (`.csv`), in one of two documented layouts
//! (`docs/formats.md`):
//!
//! - **long form**: a header line `i,j,k,value`, then one line per coefficient with 0-based
//!   indices; the dimensions are one more than the largest index on each axis (a line with
//!   value 0 extends them); a repeated `(i, j, k)` must agree;
//! - **slices**: the result slices `k = 0, 1, ...` one after the other, separated by one
//!   or more empty lines; slice k has one line per left index i and one cell per right
//!   index j, the cell holding `c[i][j][k]`. Every slice has the same shape.
//!
//! Cells hold integers of any size, fractions `p/q`, or decimals and exponent forms read
//! by the float rule of [`super::numbers`] (a decimal is accepted when it is exactly its
//! binary64 value). Records are split by the `csv` crate (quoted cells, CRLF line ends);
//! every refusal is located at the line and column of the cell. Cost: linear.

use super::ReadOptions;
use super::npy::kind_for;
use super::numbers::text_value;
use crate::error::{Error, Position, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{MAX_DIM, Tensor, check_nonzero, check_shape};
use num_traits::Zero;
use std::collections::HashMap;

/// One record: its 1-based line, and its cells with their 1-based columns.
struct Record {
    line: usize,
    cells: Vec<(usize, String)>,
}

fn err(source: &str, line: usize, column: usize, message: impl Into<String>) -> Error {
    Error::Parse {
        at: Position {
            source: source.to_string(),
            line,
            column,
        },
        message: message.into(),
    }
}

/// The 1-based columns (in characters) where the cells of a raw CSV line start.
fn cell_columns(raw: &str) -> Vec<usize> {
    let mut cols = vec![1];
    let mut quoted = false;
    for (n, c) in raw.chars().enumerate() {
        match c {
            '"' => quoted = !quoted,
            ',' if !quoted => cols.push(n + 2),
            _ => {}
        }
    }
    cols
}

/// The records of one block of lines (starting at 1-based line `first`), split by the
/// csv crate.
fn records(source: &str, lines: &[&str], first: usize) -> Result<Vec<Record>> {
    // a quote left open would swallow the rest of the block: refuse it at the quote
    let mut open: Option<(usize, usize)> = None;
    for (n, l) in lines.iter().enumerate() {
        for (c, ch) in l.chars().enumerate() {
            if ch == '"' {
                open = match open {
                    Some(_) => None,
                    None => Some((n, c)),
                };
            }
        }
    }
    if let Some((n, c)) = open {
        return Err(err(
            source,
            first + n,
            c + 1,
            "invalid CSV: this quote is not closed",
        ));
    }
    let text = lines.join("\n");
    let mut rd = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .from_reader(text.as_bytes());
    let mut out = Vec::new();
    let mut rec = csv::StringRecord::new();
    loop {
        match rd.read_record(&mut rec) {
            Ok(false) => break,
            Ok(true) => {
                let line = rec.position().map_or(1, |p| p.line() as usize);
                let raw = lines.get(line - 1).copied().unwrap_or("");
                let cols = cell_columns(raw);
                let cells = rec
                    .iter()
                    .enumerate()
                    .map(|(n, c)| (cols.get(n).copied().unwrap_or(1), c.trim().to_string()))
                    .collect();
                out.push(Record {
                    line: first + line - 1,
                    cells,
                });
            }
            Err(e) => {
                let line = e.position().map_or(1, |p| p.line() as usize);
                return Err(err(
                    source,
                    first + line - 1,
                    1,
                    format!("invalid CSV: {e}"),
                ));
            }
        }
    }
    Ok(out)
}

fn cell_value(source: &str, line: usize, col: usize, cell: &str, opts: &ReadOptions) -> Result<Q> {
    if cell.is_empty() {
        return Err(err(
            source,
            line,
            col,
            "expected a number such as 3, -1/2 or 0.5, found an empty cell",
        ));
    }
    text_value(cell, opts.rationalize.as_ref()).map_err(|m| err(source, line, col, m))
}

/// Parse a CSV text in one of the two layouts. `source` names it in errors.
pub fn parse_csv(text: &str, source: &str, opts: &ReadOptions) -> Result<Tensor> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let lines: Vec<&str> = text
        .split('\n')
        .map(|l| l.strip_suffix('\r').unwrap_or(l))
        .collect();
    let blank = |l: &str| l.trim().is_empty();
    let Some(first) = lines.iter().position(|l| !blank(l)) else {
        return Err(err(
            source,
            lines.len().max(1),
            1,
            "the input is empty: expected CSV rows (slices, or a header i,j,k,value)",
        ));
    };
    let head: Vec<String> = lines[first]
        .split(',')
        .map(|c| c.trim().trim_matches('"').to_ascii_lowercase())
        .collect();
    if head == ["i", "j", "k", "value"] {
        long_form(source, &lines, first, opts)
    } else {
        slices(source, &lines, opts)
    }
}

fn long_form(source: &str, lines: &[&str], header: usize, opts: &ReadOptions) -> Result<Tensor> {
    let recs = records(source, &lines[header + 1..], header + 2)?;
    let mut entries: HashMap<[usize; 3], (Q, usize)> = HashMap::new();
    let mut order: Vec<[usize; 3]> = Vec::new();
    let mut dims = [0usize; 3];
    let mut widest = [(0usize, 1usize); 3];
    for r in &recs {
        if r.cells.len() == 1 && r.cells[0].1.is_empty() {
            continue; // an empty line
        }
        if r.cells.len() != 4 {
            let col = r
                .cells
                .get(4)
                .map_or_else(|| lines[r.line - 1].chars().count() + 1, |c| c.0);
            return Err(err(
                source,
                r.line,
                col,
                format!("expected 4 cells i,j,k,value, found {}", r.cells.len()),
            ));
        }
        let mut idx = [0usize; 3];
        for (a, (col, cell)) in r.cells[..3].iter().enumerate() {
            match cell.parse::<usize>() {
                Ok(x) if x < MAX_DIM && cell.bytes().all(|b| b.is_ascii_digit()) => idx[a] = x,
                _ => {
                    return Err(err(
                        source,
                        r.line,
                        *col,
                        format!(
                            "expected a 0-based index below {MAX_DIM} ({} axis), found `{cell}`",
                            crate::tensor::AXES[a]
                        ),
                    ));
                }
            }
        }
        let (vcol, vcell) = &r.cells[3];
        let v = cell_value(source, r.line, *vcol, vcell, opts)?;
        for a in 0..3 {
            if idx[a] + 1 > dims[a] {
                dims[a] = idx[a] + 1;
                widest[a] = (r.line, r.cells[a].0);
            }
        }
        match entries.get(&idx) {
            Some((old, line)) if *old != v => {
                return Err(err(
                    source,
                    r.line,
                    *vcol,
                    format!(
                        "({}, {}, {}) is given twice with different values: here {}, on line \
                         {line} {}",
                        idx[0],
                        idx[1],
                        idx[2],
                        crate::scalar::q_to_string(&v),
                        crate::scalar::q_to_string(old)
                    ),
                ));
            }
            Some(_) => {}
            None => {
                check_nonzero(order.len() + 1).map_err(|m| err(source, r.line, *vcol, m))?;
                entries.insert(idx, (v, r.line));
                order.push(idx);
            }
        }
    }
    if order.is_empty() {
        return Err(err(
            source,
            header + 1,
            1,
            "no coefficient after the header i,j,k,value",
        ));
    }
    if let Err(m) = check_shape(dims) {
        let (line, col) = if widest[0].0 >= widest[1].0 {
            widest[0]
        } else {
            widest[1]
        };
        return Err(err(source, line, col, m));
    }
    let kind = kind_for(dims, opts).map_err(|m| err(source, header + 1, 1, m))?;
    let mut t = Tensor::zero(FieldSpec::Rational, kind, dims, None);
    for idx in order {
        let v = &entries[&idx].0;
        if !v.is_zero() {
            t.set(idx[0], idx[1], idx[2], v.clone());
        }
    }
    Ok(t)
}

fn slices(source: &str, lines: &[&str], opts: &ReadOptions) -> Result<Tensor> {
    // blocks of non-empty lines
    let mut blocks: Vec<(usize, usize)> = Vec::new();
    let mut start = None;
    for (n, l) in lines.iter().enumerate() {
        match (l.trim().is_empty(), start) {
            (false, None) => start = Some(n),
            (true, Some(s)) => {
                blocks.push((s, n));
                start = None;
            }
            _ => {}
        }
    }
    if let Some(s) = start {
        blocks.push((s, lines.len()));
    }
    let mut shape: Option<(usize, usize)> = None;
    // per slice, per row: the nonzero (column, value)
    let mut values: Vec<Vec<Vec<(usize, Q)>>> = Vec::new();
    let mut nonzero = 0usize;
    for &(s, e) in &blocks {
        let recs = records(source, &lines[s..e], s + 1)?;
        let mut rows = Vec::with_capacity(recs.len());
        for r in &recs {
            let width = shape.map_or(recs[0].cells.len(), |sh| sh.1);
            if r.cells.len() != width {
                let col = r
                    .cells
                    .get(width)
                    .map_or_else(|| lines[r.line - 1].chars().count() + 1, |c| c.0);
                return Err(err(
                    source,
                    r.line,
                    col,
                    format!(
                        "expected {width} cells in this row (as in the first row of the first \
                         slice), found {}",
                        r.cells.len()
                    ),
                ));
            }
            // only the nonzero cells are kept, counted against the limit
            let mut row = Vec::new();
            for (j, (col, cell)) in r.cells.iter().enumerate() {
                let v = cell_value(source, r.line, *col, cell, opts)?;
                if !v.is_zero() {
                    nonzero += 1;
                    check_nonzero(nonzero).map_err(|m| err(source, r.line, *col, m))?;
                    row.push((j, v));
                }
            }
            rows.push(row);
        }
        match shape {
            None => {
                let sh = (rows.len(), recs[0].cells.len());
                if let Err(m) = check_shape([sh.0, sh.1, 1]) {
                    return Err(err(source, s + 1, 1, m));
                }
                shape = Some(sh);
            }
            Some((a, _)) if rows.len() != a => {
                return Err(err(
                    source,
                    s + 1,
                    1,
                    format!(
                        "this slice (number {}) has {} rows, the first has {a}: every slice has \
                         one row per left index",
                        values.len(),
                        rows.len()
                    ),
                ));
            }
            _ => {}
        }
        if values.len() >= MAX_DIM {
            return Err(err(
                source,
                s + 1,
                1,
                format!("more than {MAX_DIM} slices: dimensions are at most {MAX_DIM}"),
            ));
        }
        values.push(rows);
    }
    let (a, b) = shape.unwrap_or((0, 0));
    let dims = [a, b, values.len()];
    let kind = kind_for(dims, opts).map_err(|m| err(source, 1, 1, m))?;
    let mut t = Tensor::zero(FieldSpec::Rational, kind, dims, None);
    // slices in order: for each product (i, j), k increases (appends)
    for (k, slice) in values.into_iter().enumerate() {
        for (i, row) in slice.into_iter().enumerate() {
            for (j, v) in row {
                t.set(i, j, k, v);
            }
        }
    }
    Ok(t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn layouts_agree() {
        let o = ReadOptions::default();
        let slices = "1,0\r\n0,2\r\n\r\n0,0.5\r\n3,0\r\n";
        let long = "i,j,k,value\n0,0,0,1\n1,1,0,2\n0,1,1,0.5\n1,0,1,3\n";
        let a = parse_csv(slices, "s", &o).unwrap();
        let b = parse_csv(long, "l", &o).unwrap();
        assert_eq!(a, b);
        assert_eq!(a.get(0, 1, 1), q(1, 2));
        assert_eq!(a.dims(), [2, 2, 2]);
        for (text, want) in [
            ("1,2\n3\n", "s:2:2: expected 2 cells"),
            ("1,x\n", "s:1:3: expected a number"),
            ("1,0.1\n", "s:1:3: the floating-point number 0.1"),
            (
                "1,2\n\n1,2\n3,4\n",
                "s:3:1: this slice (number 1) has 2 rows",
            ),
            (
                "i,j,k,value\n0,0,0,1\n0,0,0,2\n",
                "s:3:7: (0, 0, 0) is given twice",
            ),
            ("i,j,k,value\n0,-1,0,1\n", "s:2:3: expected a 0-based index"),
            (
                "i,j,k,value\n0,4096,0,1\n",
                "s:2:3: expected a 0-based index below 4096",
            ),
            ("\n \n", "s:3:1: the input is empty"),
            ("1,\"2\n", "s:1:3: invalid CSV: this quote is not closed"),
        ] {
            let e = parse_csv(text, "s", &o).unwrap_err().to_string();
            assert!(e.starts_with(want), "{text:?}: {e}");
        }
    }
}
