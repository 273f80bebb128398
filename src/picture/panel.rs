//! Drawing pieces shared by all pictures: a matrix panel of coloured cells with grid,
//! frame, block edges and marks; its row and column labels; the caption block; the
//! colour legend.
//!
//! Invariant: every piece draws inside the box it reports, so callers can lay pieces out
//! by adding sizes.

use super::palette::{self, Scale};
use super::svg::{Anchor, Batch, Svg, shorten, text_width};
use crate::scalar::Q;
use num_traits::One;
use std::fmt::Write;

/// The blank border around every picture.
pub const MARGIN: i64 = 16;

/// Names longer than this are shortened on the axes.
pub const MAX_LABEL_CHARS: usize = 12;

/// Pixels per cell for a matrix whose larger side is `n`.
pub fn cell_size(n: usize) -> i64 {
    match n {
        0..=8 => 18,
        9..=16 => 14,
        17..=32 => 10,
        _ => 8,
    }
}

/// Label font size for a cell size.
pub fn label_px(cell: i64) -> i64 {
    (cell - 4).clamp(7, 11)
}

/// One matrix to draw: its shape and its nonzero displayed values `(row, col, value)`.
pub struct Panel<'a> {
    pub rows: usize,
    pub cols: usize,
    pub cells: &'a [(usize, usize, Q)],
    pub cell: i64,
}

/// Block structure drawn over a panel: edges before the given rows and columns, a tinted
/// rectangle (rows `r0..r1`, columns `c0..c1`), and which cells get a ring.
#[derive(Default)]
pub struct Overlay<'a> {
    pub row_cuts: &'a [usize],
    pub col_cuts: &'a [usize],
    pub tint: Option<((usize, usize), (usize, usize))>,
    pub ring: Option<&'a dyn Fn(usize, usize) -> bool>,
}

/// Draw a panel with its top-left corner at (x, y). Returns whether a non-integer value
/// was drawn (for the legend). Cost: O(rows + cols + nonzeros).
pub fn draw_panel(svg: &mut Svg, x: i64, y: i64, p: &Panel, scale: &Scale, ov: &Overlay) -> bool {
    let (w, h) = (p.cols as i64 * p.cell, p.rows as i64 * p.cell);
    svg.rect(x, y, w, h, palette::ZERO);
    if let Some(((r0, r1), (c0, c1))) = ov.tint {
        let cs = p.cell;
        svg.rect(
            x + c0 as i64 * cs,
            y + r0 as i64 * cs,
            (c1 - c0) as i64 * cs,
            (r1 - r0) as i64 * cs,
            palette::BLOCK_TINT,
        );
    }
    let mut grid = String::new();
    if p.cell >= 6 {
        for c in 1..p.cols {
            let _ = write!(grid, "M{} {}v{h}", x + c as i64 * p.cell, y);
        }
        for r in 1..p.rows {
            let _ = write!(grid, "M{} {}h{w}", x, y + r as i64 * p.cell);
        }
    }
    svg.path(&grid, palette::GRID, 1);
    let mut non_integer = false;
    let cs = p.cell;
    let (mut cells, mut marks) = (Batch::default(), Batch::default());
    let mut rings = Vec::new();
    for (r, c, v) in p.cells {
        let (cx, cy) = (x + *c as i64 * cs, y + *r as i64 * cs);
        let (fill, shade) = scale.colour(v);
        cells.rect(fill, cx, cy, cs, cs);
        if !v.denom().is_one() {
            non_integer = true;
            let ink = if shade >= 3 { "#ffffff" } else { "#111111" };
            marks.corner(ink, cx, cy, cs, (cs * 2 / 5).max(3));
        }
        if ov.ring.is_some_and(|f| f(*r, *c)) {
            rings.push((cx, cy));
        }
    }
    cells.flush(svg);
    marks.flush(svg);
    for (cx, cy) in rings {
        svg.rect_outlined((cx + 1, cy + 1, cs - 2, cs - 2), "none", palette::EDGE, 2);
    }
    let mut edges = String::new();
    for &c in ov.col_cuts {
        let _ = write!(edges, "M{} {}v{h}", x + c as i64 * cs, y);
    }
    for &r in ov.row_cuts {
        let _ = write!(edges, "M{} {}h{w}", x, y + r as i64 * cs);
    }
    svg.path(&edges, palette::EDGE, 2);
    svg.rect_outlined((x, y, w, h), "none", palette::FRAME, 1);
    non_integer
}

/// Width of the row-label column for these names.
pub fn row_label_width(names: &[String], px: i64) -> i64 {
    names
        .iter()
        .map(|n| text_width(&shorten(n, MAX_LABEL_CHARS), px))
        .max()
        .unwrap_or(0)
        + 4
}

/// Whether column labels fit horizontally in their cells; otherwise they are drawn upwards.
pub fn columns_fit(names: &[String], px: i64, cell: i64) -> bool {
    names
        .iter()
        .all(|n| text_width(&shorten(n, MAX_LABEL_CHARS), px) <= cell - 3)
}

/// Height of the column-label band for these names.
pub fn col_label_height(names: &[String], px: i64, cell: i64) -> i64 {
    if columns_fit(names, px, cell) {
        px + 4
    } else {
        row_label_width(names, px)
    }
}

/// Row labels right-aligned against x_right, one per cell row starting at y.
pub fn draw_row_labels(svg: &mut Svg, x_right: i64, y: i64, names: &[String], cell: i64, px: i64) {
    for (r, n) in names.iter().enumerate() {
        let base = y + r as i64 * cell + (cell + px) / 2 - 1;
        svg.text(
            x_right - 3,
            base,
            Anchor::End,
            "l",
            &shorten(n, MAX_LABEL_CHARS),
        );
    }
}

/// Column labels above y (the band's bottom edge), one per cell column starting at x.
pub fn draw_col_labels(svg: &mut Svg, x: i64, y: i64, names: &[String], cell: i64, px: i64) {
    let fit = columns_fit(names, px, cell);
    for (c, n) in names.iter().enumerate() {
        let label = shorten(n, MAX_LABEL_CHARS);
        let cx = x + c as i64 * cell + cell / 2;
        if fit {
            svg.text(cx, y - 3, Anchor::Middle, "l", &label);
        } else {
            svg.text_up(cx + px / 2 - 1, y - 3, "l", &label);
        }
    }
}

/// The title and caption lines at the top; returns the height used.
pub fn draw_header(svg: &mut Svg, x: i64, y: i64, title: &str, lines: &[String]) -> i64 {
    svg.text(x, y + 16, Anchor::Start, "t", title);
    for (n, l) in lines.iter().enumerate() {
        svg.text(x, y + 36 + 16 * n as i64, Anchor::Start, "c", l);
    }
    header_height(lines.len())
}

/// Height of a header with this many caption lines.
pub fn header_height(lines: usize) -> i64 {
    28 + 16 * lines as i64
}

/// Width needed by a header.
pub fn header_width(title: &str, lines: &[String]) -> i64 {
    let t = text_width(title, 15) + 10;
    lines
        .iter()
        .map(|l| text_width(l, 12))
        .max()
        .unwrap_or(0)
        .max(t)
}

/// Height of the legend.
pub const LEGEND_HEIGHT: i64 = 46;

/// The colour legend at (x, y): the negative shades in use (darkest first), zero, the
/// positive shades, each with the largest magnitude it stands for, and the mark of a
/// non-integer when `non_integer`. Returns the width used.
pub fn draw_legend(svg: &mut Svg, x: i64, y: i64, scale: &Scale, non_integer: bool) -> i64 {
    let sw = 30;
    let bounds = scale.shade_bounds();
    let mut items: Vec<(&str, String)> = Vec::new();
    for (s, l) in bounds.iter().rev() {
        items.push((
            palette::NEGATIVE[*s],
            format!("-{}", palette::level_bound_text(*l)),
        ));
    }
    items.push((palette::ZERO, "0".into()));
    for (s, l) in &bounds {
        items.push((palette::POSITIVE[*s], palette::level_bound_text(*l)));
    }
    svg.text(
        x,
        y + 11,
        Anchor::Start,
        "s",
        "coefficient (shade: magnitude up to)",
    );
    let mut cx = x;
    for (fill, label) in &items {
        let w = sw.max(text_width(label, 10) + 6);
        svg.rect_outlined((cx, y + 16, w - 4, 12), fill, palette::FRAME, 1);
        svg.text(cx + (w - 4) / 2, y + 41, Anchor::Middle, "s", label);
        cx += w;
    }
    if non_integer {
        cx += 16;
        let m = 7;
        svg.rect_outlined(
            (cx, y + 14, 16, 16),
            palette::POSITIVE[1],
            palette::FRAME,
            1,
        );
        svg.polygon(
            &[
                (cx + 16 - m, y + 14),
                (cx + 16, y + 14),
                (cx + 16, y + 14 + m),
            ],
            "#111111",
        );
        svg.text(cx + 22, y + 26, Anchor::Start, "s", "not an integer");
        cx += 22 + text_width("not an integer", 10);
    }
    cx - x
}

/// Close a picture whose content reaches `right` (the largest x drawn) and whose legend,
/// `legend_w` wide, starts at `legend_top`: the document's size leaves a margin around
/// the content, the legend and the header.
pub fn finish_picture(
    svg: Svg,
    right: i64,
    (legend_top, legend_w): (i64, i64),
    title: &str,
    caption: &[String],
    label_px: i64,
) -> String {
    let width = (right + MARGIN)
        .max(2 * MARGIN + legend_w)
        .max(2 * MARGIN + header_width(title, caption));
    let height = legend_top + LEGEND_HEIGHT + MARGIN;
    svg.finish(
        width,
        height,
        title,
        &caption.join("; "),
        &palette::style(label_px),
    )
}
