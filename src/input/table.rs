//! The table format (`docs/formats.md`, section 1): statements `field`, `basis`,
//! `left`/`right`/`result`, `unit`, `commutative` / `anticommutative`, product lines
//! `x*y = combination`, bracket lines `[x, y] = combination`, `grid ... end` blocks and
//! (maps) `slice AXIS NAME ... end` blocks, with `#` comments.
//!
//! A bracket line gives `x*y` and its mirror `y*x = -(x*y)`; a declaration
//! `commutative` (`anticommutative`) gives the mirror `y*x = x*y` (`-(x*y)`) of every
//! product; a product that contradicts a mirror already given is refused at its line.
//!
//! Statements are read line by line into a [`Builder`] (names resolved to indices,
//! coefficients parsed, no allocation per name); each product goes straight into the tensor
//! (`products.rs`), except products with a bare number, which wait for the `unit` and are
//! stored by [`finish`], which also applies the unit. Every error carries the line and
//! column of the offending token; a conflicting duplicate is reported at the later line.
//! Cost: linear in the input size plus O(terms log terms) per product (about 0.2 s of CPU
//! in a release build for the 518k-line table of the group algebra of S_6).

use super::combination::{Term, parse_combination};
use super::cursor::{Cursor, LineRef, tokens};
use super::is_valid_name;
use super::products::{Built, NameIndex, show};
use crate::error::{Error, Position, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{Kind, MAX_DIM, Tensor, check_shape};
use num_traits::{One, Zero};
use std::collections::HashMap;

/// One term of a product with its result index resolved: `k = None` for a bare number
/// (a multiple of the unit), and the byte offset of the term in its line.
pub(super) struct Resolved {
    pub k: Option<usize>,
    pub coef: Q,
    pub pos: usize,
}

/// One product `x*y = terms` read from a line or a grid cell.
pub(super) struct Pending {
    pub i: usize,
    pub j: usize,
    pub terms: Vec<Resolved>,
    /// Given as a bracket `[x, y]` (its mirror is `-(x*y)`).
    pub bracket: bool,
    /// Line index (0-based) and byte offset of the product's left factor.
    pub line: usize,
    pub byte: usize,
}

/// The statements read so far.
pub(super) struct Builder<'a> {
    pub source: &'a str,
    pub lines: Vec<&'a str>,
    pub field: Option<(FieldSpec, usize)>,
    pub kind: Option<Kind>,
    /// Names per axis (for an algebra all three are the basis) and the line declaring each.
    pub names: [Option<(Vec<String>, usize)>; 3],
    pub index: [NameIndex; 3],
    pub unit: Option<(usize, usize)>,
    /// Products with a bare number, resolved once the `unit` is known (in `finish`).
    pub pending: Vec<Pending>,
    /// Number of products read so far.
    pub products: usize,
    /// The tensor under construction, created at the first product.
    pub built: Option<Built>,
    pub statements: usize,
    /// A `commutative` or `anticommutative` declaration and its line index.
    pub symmetry: Option<(Symmetry, usize)>,
    /// The slices of a map given by `slice` blocks.
    pub slices: Option<SliceEntries>,
    /// Nonzero coefficients stored so far (at most [`crate::tensor::MAX_NONZERO`]).
    pub nonzero: usize,
}

/// A declared symmetry of the product.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Symmetry {
    /// `y*x = x*y`.
    Commutative,
    /// `y*x = -(x*y)` and `x*x = 0`.
    Anticommutative,
}

impl Symmetry {
    pub fn keyword(self) -> &'static str {
        match self {
            Symmetry::Commutative => "commutative",
            Symmetry::Anticommutative => "anticommutative",
        }
    }
}

/// The coefficients read from `slice` blocks.
pub(super) struct SliceEntries {
    pub axis: usize,
    pub first_line: usize,
    /// Per slice index, the line index of its block.
    pub seen: Vec<Option<usize>>,
    pub values: Vec<(usize, usize, usize, Q)>,
}

impl<'a> Builder<'a> {
    pub fn line(&self, idx: usize) -> LineRef<'a> {
        let raw = self.lines[idx];
        let text = raw.find('#').map_or(raw, |c| &raw[..c]);
        LineRef {
            source: self.source,
            text,
            number: idx + 1,
        }
    }

    pub fn pos(&self, idx: usize, byte: usize) -> Position {
        self.line(idx).pos(byte)
    }

    pub(super) fn err(&self, idx: usize, byte: usize, message: impl Into<String>) -> Error {
        Error::Parse {
            at: self.pos(idx, byte),
            message: message.into(),
        }
    }

    /// Look up a name on an axis, with an error listing the basis.
    pub fn lookup(
        &self,
        axis: usize,
        name: &str,
        line: &LineRef<'_>,
        byte: usize,
    ) -> Result<usize> {
        if let Some(&i) = self.index[axis].get(name) {
            return Ok(i);
        }
        let names = self.names[axis]
            .as_ref()
            .map(|n| n.0.as_slice())
            .unwrap_or(&[]);
        let mut list = names
            .iter()
            .take(12)
            .cloned()
            .collect::<Vec<_>>()
            .join(", ");
        if names.len() > 12 {
            list.push_str(", ...");
        }
        let what = match (self.kind, axis) {
            (Some(Kind::Algebra), _) => "basis name",
            (_, 0) => "left basis name",
            (_, 1) => "right basis name",
            _ => "result basis name",
        };
        Err(line.err(
            byte,
            format!("unknown {what} `{name}` (expected one of: {list})"),
        ))
    }

    /// Resolve the names of the terms to result indices (errors in file order).
    pub fn resolve_terms(&self, terms: Vec<Term<'_>>, line: &LineRef<'_>) -> Result<Vec<Resolved>> {
        terms
            .into_iter()
            .map(|t| {
                let k = match t.name {
                    Some(n) => Some(self.lookup(2, n, line, t.pos)?),
                    None => None,
                };
                Ok(Resolved {
                    k,
                    coef: t.coef,
                    pos: t.pos,
                })
            })
            .collect()
    }

    /// Refuse a coefficient that has no value in the declared field GF(p).
    /// Count `n` more nonzero coefficients (given at a line and byte), refusing the input
    /// beyond [`crate::tensor::MAX_NONZERO`] before they are stored.
    pub(super) fn count_nonzero(&mut self, n: usize, line: usize, byte: usize) -> Result<()> {
        self.nonzero = self.nonzero.saturating_add(n);
        crate::tensor::check_nonzero(self.nonzero).map_err(|m| self.err(line, byte, m))
    }

    pub(super) fn check_coefficient(&self, v: &Q, line: usize, byte: usize) -> Result<()> {
        if let Some((FieldSpec::Prime(p), _)) = self.field
            && (v.denom() % p).is_zero()
        {
            return Err(self.err(
                line,
                byte,
                format!(
                    "the coefficient {} has a denominator divisible by {p}, so it has no \
                     value in GF({p})",
                    crate::scalar::q_to_string(v)
                ),
            ));
        }
        Ok(())
    }

    fn declared(&self) -> bool {
        match self.kind {
            Some(Kind::Algebra) => true,
            Some(Kind::Bilinear) => self.names.iter().all(Option::is_some),
            None => false,
        }
    }
}

/// Check control characters (binary data) and return the first offending position.
/// Fast path: a byte scan (C0 controls other than tab, LF, CR; DEL; C1 controls, which are
/// encoded as 0xC2 0x80..0x9F); only a text with a hit is walked by characters.
fn check_text(text: &str, source: &str) -> Result<()> {
    let bytes = text.as_bytes();
    let suspicious = bytes.iter().enumerate().any(|(n, &c)| {
        (c < 0x20 && c != b'\n' && c != b'\r' && c != b'\t')
            || c == 0x7f
            || (c == 0xc2 && bytes.get(n + 1).is_some_and(|d| (0x80..0xa0).contains(d)))
    });
    if !suspicious {
        return Ok(());
    }
    let mut line = 1;
    let mut col = 1;
    for c in text.chars() {
        if c == '\n' {
            line += 1;
            col = 1;
            continue;
        }
        if c.is_control() && c != '\r' && c != '\t' {
            return Err(Error::Parse {
                at: Position {
                    source: source.to_string(),
                    line,
                    column: col,
                },
                message: format!(
                    "control character U+{:04X} found: the input looks like binary data, \
                     expected a text file",
                    c as u32
                ),
            });
        }
        col += 1;
    }
    Ok(())
}

/// Parse a text in the table format. `source` names it in error positions.
pub fn parse_table(text: &str, source: &str) -> Result<Tensor> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    check_text(text, source)?;
    let mut b = Builder {
        source,
        lines: text
            .split('\n')
            .map(|l| l.strip_suffix('\r').unwrap_or(l))
            .collect(),
        field: None,
        kind: None,
        names: [None, None, None],
        index: Default::default(),
        unit: None,
        pending: Vec::new(),
        products: 0,
        built: None,
        statements: 0,
        symmetry: None,
        slices: None,
        nonzero: 0,
    };
    let mut idx = 0;
    while idx < b.lines.len() {
        let line = b.line(idx);
        idx += 1;
        if line.text.trim().is_empty() {
            continue;
        }
        b.statements += 1;
        if line.text.contains('=') {
            if let Some(sl) = &b.slices {
                return Err(line.err(
                    0,
                    format!(
                        "a map is given either by slices (line {}) or by product lines, not both",
                        sl.first_line + 1
                    ),
                ));
            }
            if line.text.trim_start().starts_with('[') {
                parse_bracket(&mut b, line, idx - 1)?;
            } else {
                parse_product(&mut b, line, idx - 1)?;
            }
            continue;
        }
        let toks = tokens(line.text);
        let (kpos, keyword) = toks[0];
        match keyword {
            "field" => parse_field(&mut b, line, idx - 1, kpos + keyword.len())?,
            "basis" | "left" | "right" | "result" => parse_basis(&mut b, line, idx - 1, &toks)?,
            "unit" => parse_unit(&mut b, line, idx - 1, &toks)?,
            "commutative" | "anticommutative" => parse_symmetry(&mut b, line, idx - 1, &toks)?,
            "slice" => idx = super::grid::parse_slice(&mut b, idx - 1, &toks)?,
            "grid" => {
                if toks.len() > 1 {
                    return Err(line.err(
                        toks[1].0,
                        format!("expected nothing after `grid`, found `{}`", toks[1].1),
                    ));
                }
                idx = super::grid::parse_grid(&mut b, idx - 1)?;
            }
            "end" => return Err(line.err(kpos, "`end` without a matching `grid`")),
            other => {
                return Err(line.err(
                    kpos,
                    format!(
                        "expected a statement (`field`, `basis`, `left`, `right`, `result`, \
                         `unit`, `commutative`, `anticommutative`, `grid`, `slice`), a product \
                         `x*y = ...` or a bracket `[x, y] = ...`, found `{other}`"
                    ),
                ));
            }
        }
    }
    finish(b)
}

fn parse_field(b: &mut Builder<'_>, line: LineRef<'_>, idx: usize, after: usize) -> Result<()> {
    let rest = &line.text[after..];
    let start = after + (rest.len() - rest.trim_start().len());
    if let Some((_, first)) = b.field {
        return Err(line.err(
            0,
            format!("the field is declared twice (first on line {})", first + 1),
        ));
    }
    if b.products > 0 {
        return Err(line.err(0, "the `field` statement must come before the products"));
    }
    let spec = FieldSpec::parse(rest.trim()).map_err(|m| line.err(start, m))?;
    b.field = Some((spec, idx));
    Ok(())
}

fn parse_basis(
    b: &mut Builder<'_>,
    line: LineRef<'_>,
    idx: usize,
    toks: &[(usize, &str)],
) -> Result<()> {
    let (kpos, kw) = toks[0];
    let (kind, axis) = match kw {
        "basis" => (Kind::Algebra, 0),
        "left" => (Kind::Bilinear, 0),
        "right" => (Kind::Bilinear, 1),
        _ => (Kind::Bilinear, 2),
    };
    match b.kind {
        Some(k) if k != kind => {
            return Err(line.err(
                kpos,
                "an input declares either `basis` (an algebra) or `left`, `right` and \
                 `result` (a bilinear map), not both",
            ));
        }
        _ => {}
    }
    if let Some((_, first)) = &b.names[axis] {
        return Err(line.err(
            kpos,
            format!("`{kw}` is declared twice (first on line {})", first + 1),
        ));
    }
    if toks.len() == 1 {
        return Err(line.err(
            kpos + kw.len(),
            format!("expected basis names after `{kw}`, found the end of the line"),
        ));
    }
    if toks.len() - 1 > MAX_DIM {
        return Err(line.err(
            kpos,
            format!(
                "`{kw}` lists {} names: dimensions are at most {MAX_DIM}",
                toks.len() - 1
            ),
        ));
    }
    let n = toks.len() - 1;
    let other = match axis {
        0 if kind == Kind::Bilinear => b.names[1].as_ref().map(|v| v.0.len()),
        1 => b.names[0].as_ref().map(|v| v.0.len()),
        _ => None,
    };
    let shape = match (kind, other) {
        (Kind::Algebra, _) => Some([n, n, n]),
        (_, Some(m)) if axis == 0 => Some([n, m, 1]),
        (_, Some(m)) => Some([m, n, 1]),
        _ => None,
    };
    if let Some(Err(m)) = shape.map(check_shape) {
        let what = if kind == Kind::Algebra {
            "this algebra"
        } else {
            "the left and right bases give"
        };
        return Err(line.err(kpos, format!("{what}: {m}")));
    }
    let mut names = Vec::with_capacity(n);
    let mut index = NameIndex::default();
    let mut columns: HashMap<&str, usize> = HashMap::new();
    for &(pos, name) in &toks[1..] {
        if !is_valid_name(name) {
            return Err(line.err(
                pos,
                format!(
                    "invalid basis name `{name}`: a name starts with a letter or `_` and \
                     continues with letters, digits, `_`, `'` or `.`"
                ),
            ));
        }
        if let Some(c) = columns.get(name) {
            return Err(line.err(
                pos,
                format!("duplicate basis name `{name}` (already at column {c})"),
            ));
        }
        columns.insert(name, line.pos(pos).column);
        index.insert(name.to_string(), names.len());
        names.push(name.to_string());
    }
    b.kind = Some(kind);
    if kind == Kind::Algebra {
        for a in 0..3 {
            b.names[a] = Some((names.clone(), idx));
            b.index[a] = index.clone();
        }
    } else {
        b.names[axis] = Some((names, idx));
        b.index[axis] = index;
    }
    Ok(())
}

fn parse_unit(
    b: &mut Builder<'_>,
    line: LineRef<'_>,
    idx: usize,
    toks: &[(usize, &str)],
) -> Result<()> {
    let kpos = toks[0].0;
    match b.kind {
        None => return Err(line.err(kpos, "`unit` before the basis: declare `basis ...` first")),
        Some(Kind::Bilinear) => {
            return Err(line.err(
                kpos,
                "`unit` is only meaningful for an algebra (a `basis` statement)",
            ));
        }
        _ => {}
    }
    if let Some((_, first)) = b.unit {
        return Err(line.err(
            kpos,
            format!("`unit` is declared twice (first on line {})", first + 1),
        ));
    }
    if let Some((Symmetry::Anticommutative, sline)) = b.symmetry {
        return Err(line.err(
            kpos,
            format!(
                "`unit` contradicts `anticommutative` (line {}): a unit u has u*u = u, not 0",
                sline + 1
            ),
        ));
    }
    if toks.len() != 2 {
        let at = toks.get(2).map_or(kpos + 4, |t| t.0);
        return Err(line.err(at, "expected exactly one basis name after `unit`"));
    }
    let u = b.lookup(0, toks[1].1, &line, toks[1].0)?;
    b.unit = Some((u, idx));
    Ok(())
}

fn parse_symmetry(
    b: &mut Builder<'_>,
    line: LineRef<'_>,
    idx: usize,
    toks: &[(usize, &str)],
) -> Result<()> {
    let (kpos, kw) = toks[0];
    let sym = if kw == "commutative" {
        Symmetry::Commutative
    } else {
        Symmetry::Anticommutative
    };
    match b.kind {
        None => {
            return Err(line.err(
                kpos,
                format!("`{kw}` before the basis: declare `basis ...` first"),
            ));
        }
        Some(Kind::Bilinear) => {
            return Err(line.err(
                kpos,
                format!("`{kw}` is for an algebra (a `basis` statement), not a bilinear map"),
            ));
        }
        _ => {}
    }
    if let Some((old, first)) = b.symmetry {
        return Err(line.err(
            kpos,
            format!(
                "the product is already declared `{}` on line {}",
                old.keyword(),
                first + 1
            ),
        ));
    }
    if b.products > 0 {
        return Err(line.err(kpos, format!("`{kw}` must come before the products")));
    }
    if let Some(&(pos, x)) = toks.get(1) {
        return Err(line.err(pos, format!("expected nothing after `{kw}`, found `{x}`")));
    }
    if sym == Symmetry::Anticommutative
        && let Some((_, uline)) = b.unit
    {
        return Err(line.err(
            kpos,
            format!(
                "`anticommutative` contradicts `unit` (line {}): a unit u has u*u = u, not 0",
                uline + 1
            ),
        ));
    }
    b.symmetry = Some((sym, idx));
    Ok(())
}

/// A bracket line `[x, y] = combination`.
fn parse_bracket(b: &mut Builder<'_>, line: LineRef<'_>, idx: usize) -> Result<()> {
    let mut cur = Cursor::new(line, 0, line.text.len());
    cur.skip_ws();
    let start = cur.pos;
    if !b.declared() {
        return Err(cur.err("a bracket before the basis: declare `basis ...` first"));
    }
    if b.kind == Some(Kind::Bilinear) {
        return Err(cur.err(
            "a bracket `[x, y]` is for an algebra (a `basis` statement); write a map's \
             products as `x*y = ...`",
        ));
    }
    if let Some((Symmetry::Commutative, first)) = b.symmetry {
        return Err(cur.err(format!(
            "a bracket `[x, y]` is anticommutative, but the product is declared `commutative` \
             on line {}",
            first + 1
        )));
    }
    cur.bump();
    cur.skip_ws();
    let xpos = cur.pos;
    let Some(x) = cur.name() else {
        return Err(cur.expected("a basis name after `[`"));
    };
    let i = b.lookup(0, x, &line, xpos)?;
    cur.skip_ws();
    if cur.peek() != Some(',') {
        return Err(cur.expected(&format!("`,` after `{x}`")));
    }
    cur.bump();
    cur.skip_ws();
    let ypos = cur.pos;
    let Some(y) = cur.name() else {
        return Err(cur.expected("a basis name after `,`"));
    };
    let j = b.lookup(1, y, &line, ypos)?;
    cur.skip_ws();
    if cur.peek() != Some(']') {
        return Err(cur.expected(&format!("`]` after `{y}`")));
    }
    cur.bump();
    cur.skip_ws();
    if cur.peek() != Some('=') {
        return Err(cur.expected("`=`"));
    }
    cur.bump();
    let terms = b.resolve_terms(parse_combination(&mut cur)?, &line)?;
    b.add_product(Pending {
        i,
        j,
        terms,
        bracket: true,
        line: idx,
        byte: start,
    })
}

fn parse_product(b: &mut Builder<'_>, line: LineRef<'_>, idx: usize) -> Result<()> {
    let mut cur = Cursor::new(line, 0, line.text.len());
    cur.skip_ws();
    let start = cur.pos;
    if !b.declared() {
        return Err(cur.err(
            "a product before the basis: declare `basis ...` (or `left`, `right` and `result`) first",
        ));
    }
    let Some(x) = cur.name() else {
        return Err(cur.expected("a product `x*y = combination`"));
    };
    let i = b.lookup(0, x, &line, start)?;
    cur.skip_ws();
    if cur.peek() != Some('*') {
        return Err(cur.expected(&format!("`*` after `{x}`")));
    }
    cur.bump();
    cur.skip_ws();
    let ypos = cur.pos;
    let Some(y) = cur.name() else {
        return Err(cur.expected("a basis name after `*`"));
    };
    let j = b.lookup(1, y, &line, ypos)?;
    cur.skip_ws();
    if cur.peek() != Some('=') {
        return Err(cur.expected("`=`"));
    }
    cur.bump();
    let terms = b.resolve_terms(parse_combination(&mut cur)?, &line)?;
    b.add_product(Pending {
        i,
        j,
        terms,
        bracket: false,
        line: idx,
        byte: start,
    })
}

/// Second pass: build the tensor from the statements.
fn finish(mut b: Builder<'_>) -> Result<Tensor> {
    let kind = match b.kind {
        Some(k) => k,
        None => {
            let message = if b.statements == 0 {
                "empty input: expected a `basis` or `left/right/result` statement"
            } else {
                "no basis declared: expected a `basis` or `left/right/result` statement"
            };
            return Err(b.err(0, 0, message));
        }
    };
    if kind == Kind::Bilinear {
        for (a, kw) in ["left", "right", "result"].iter().enumerate() {
            if b.names[a].is_none() {
                let first = b.names.iter().flatten().map(|n| n.1).min().unwrap_or(0);
                return Err(b.err(
                    first,
                    0,
                    format!("a bilinear map needs `left`, `right` and `result`: `{kw}` is missing"),
                ));
            }
        }
    }
    b.ensure_built();
    for p in std::mem::take(&mut b.pending) {
        b.insert(&p)?;
    }
    if let Some(sl) = b.slices.take() {
        if let Some(missing) = sl.seen.iter().position(Option::is_none) {
            return Err(b.err(
                sl.first_line,
                0,
                format!(
                    "the map is given by {} slices, but slice `{}` is missing: every slice \
                     along the axis must be given once",
                    crate::tensor::AXES[sl.axis],
                    b.names[sl.axis]
                        .as_ref()
                        .map_or("", |v| v.0[missing].as_str())
                ),
            ));
        }
        if let Some(built) = b.built.as_mut() {
            for (i, j, k, v) in sl.values {
                built.t.set(i, j, k, v);
            }
        }
    }
    let Some(built) = b.built.take() else {
        return Err(b.err(0, 0, "no basis declared"));
    };
    let dims = built.t.dims();
    let mut t = built.t;
    if let Some((u, uline)) = b.unit {
        for x in 0..dims[0] {
            let expect = vec![(x, Q::one())];
            for (i, j) in [(u, x), (x, u)] {
                match built.first[i * dims[1] + j] {
                    (0, _) => t.set(i, j, x, Q::one()),
                    (l, byte) if t.product(i, j) != expect.as_slice() => {
                        let v = t.product(i, j);
                        let line = l as usize - 1;
                        return Err(b.err(
                            line,
                            byte as usize,
                            format!(
                                "`{}*{}` = `{}` contradicts `unit {}` (line {}): expected `{}`",
                                t.name(0, i),
                                t.name(1, j),
                                show(&t, v),
                                t.name(0, u),
                                uline + 1,
                                t.name(0, x)
                            ),
                        ));
                    }
                    _ => {}
                }
            }
        }
    }
    Ok(t)
}
