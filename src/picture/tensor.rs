//! The picture of a structure tensor: its slices along one axis as a grid of small
//! coloured matrices (optionally grouped and cut into blocks), or, for large tensors, a
//! density view of its three projections.
//!
//! Slice s along axis a is the matrix of the coefficients with index s on axis a, rows and
//! columns indexed by the two other axes in increasing order (as `tensor::slice`).

use super::palette::{self, Scale};
use super::panel::{self, MARGIN, Overlay, Panel};
use super::svg::{Anchor, Batch, Svg, shorten, text_width};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{AXES, Kind, Tensor, others};

const GAP: i64 = 14;
const SLICE_TITLE: i64 = 16;
const GROUP_HEADING: i64 = 20;

/// How many slices per grid row for n slices: few empty places, rows about 1.5 times as
/// wide as the grid is tall.
pub fn grid_columns(n: usize) -> usize {
    (1..=n.max(1))
        .min_by_key(|&c| {
            let rows = n.max(1).div_ceil(c);
            (c * rows - n.max(1)) * 4 + (2 * c).abs_diff(3 * rows)
        })
        .unwrap_or(1)
}

/// The caption line describing the shape of a tensor.
pub fn shape_line(t: &Tensor) -> String {
    let d = t.dims();
    let shape = match t.kind() {
        Kind::Algebra => format!("algebra of dimension {}", d[0]),
        Kind::Bilinear => format!("bilinear map {} x {} -> {}", d[0], d[1], d[2]),
    };
    format!(
        "{shape} over {}, {} nonzero coefficients",
        t.field().name(),
        t.nnz()
    )
}

/// The caption line saying how a slice is read.
pub fn reading_line(axis: usize) -> String {
    match axis {
        0 => "one slice per left basis vector i: row j, column k holds the coefficient of k in i*j",
        1 => {
            "one slice per right basis vector j: row i, column k holds the coefficient of k in i*j"
        }
        _ => {
            "one slice per result basis vector k: row i, column j holds the coefficient of k in i*j"
        }
    }
    .to_string()
}

/// The caption line for residues, over GF(p).
pub fn field_line(field: FieldSpec) -> Option<String> {
    match field {
        FieldSpec::Rational => None,
        FieldSpec::Prime(p) => Some(format!(
            "over GF({p}) residues are shown balanced, from -{h} to {h}",
            h = (p - 1) / 2
        )),
    }
}

/// The nonzero displayed values of every slice along `axis`: `(row, col, value)`.
fn slice_cells(t: &Tensor, axis: usize) -> Vec<Vec<(usize, usize, Q)>> {
    let (o1, o2) = others(axis);
    let mut out = vec![Vec::new(); t.dims()[axis]];
    for (i, j, k, v) in t.entries() {
        let idx = [i, j, k];
        out[idx[axis]].push((idx[o1], idx[o2], palette::display_value(t.field(), v)));
    }
    out
}

/// Blocks in the order drawn: the block of every position on each axis and the positions
/// where a new block starts.
pub(super) struct Blocks {
    pub block_of: [Vec<usize>; 3],
    pub cuts: [Vec<usize>; 3],
}

impl Blocks {
    /// The positions `first..end` of block b on an axis.
    fn span(&self, axis: usize, b: usize) -> (usize, usize) {
        let v = &self.block_of[axis];
        let first = v.iter().position(|&x| x == b).unwrap_or(0);
        let last = v.iter().rposition(|&x| x == b).unwrap_or(0);
        (first, last + 1)
    }

    /// The size of block b on an axis.
    fn len(&self, axis: usize, b: usize) -> usize {
        self.block_of[axis].iter().filter(|&&x| x == b).count()
    }
}

/// What to draw in a slice grid.
pub(super) struct SliceGrid<'a> {
    /// The tensor, already in the order to draw.
    pub t: &'a Tensor,
    pub axis: usize,
    /// The slice indices, one grid group per inner list (each group starts a grid row).
    pub groups: Vec<Vec<usize>>,
    /// For a block picture: the blocks, in the order drawn.
    pub blocks: Option<Blocks>,
    pub title: String,
    pub caption: Vec<String>,
}

/// Draw a slice grid. Cost: O(nnz + slices * (rows + cols)).
pub(super) fn draw_slice_grid(g: &SliceGrid) -> String {
    let t = g.t;
    let d = t.dims();
    let (o1, o2) = others(g.axis);
    let (rows, cols) = (d[o1], d[o2]);
    let cs = panel::cell_size(rows.max(cols));
    let px = panel::label_px(cs);
    let label_all = rows.max(cols) <= 16;
    let names = t.names();
    let rw = panel::row_label_width(&names[o1], px);
    let ch = panel::col_label_height(&names[o2], px, cs);
    let ncols = grid_columns(g.groups.iter().map(Vec::len).max().unwrap_or(1));
    let slot_w = if label_all { rw } else { 0 } + cols as i64 * cs;
    let x0 = MARGIN + if label_all { 0 } else { rw };

    let cells = slice_cells(t, g.axis);
    let scale = Scale::fit(cells.iter().flatten().map(|c| &c.2));
    let mut svg = Svg::new();
    let header_h = panel::draw_header(&mut svg, MARGIN, MARGIN, &g.title, &g.caption);
    let mut y = MARGIN + header_h + 8;
    let mut grid_w = 0;
    let mut non_integer = false;
    let mut grid_row = 0;
    for (b, group) in g.groups.iter().enumerate() {
        if let Some(bl) = &g.blocks {
            let sizes: Vec<String> = (0..3).map(|a| bl.len(a, b).to_string()).collect();
            let heading = format!("block {}: {}", b + 1, sizes.join(" x "));
            svg.text(MARGIN, y + 13, Anchor::Start, "c", &heading);
            y += GROUP_HEADING;
        }
        for chunk in group.chunks(ncols) {
            let labelled_cols = label_all || grid_row == 0;
            let band = if labelled_cols { ch } else { 0 };
            for (c, &s) in chunk.iter().enumerate() {
                let sx = x0 + c as i64 * (slot_w + GAP);
                let px0 = sx + if label_all { rw } else { 0 };
                let py0 = y + SLICE_TITLE + band;
                let title = format!("{} = {}", ["i", "j", "k"][g.axis], names[g.axis][s]);
                let title = shorten(&title, (cols * cs as usize / 7).max(MAX_TITLE));
                svg.text(px0, y + 12, Anchor::Start, "c", &title);
                if labelled_cols {
                    panel::draw_col_labels(&mut svg, px0, py0, &names[o2], cs, px);
                }
                if label_all || c == 0 {
                    panel::draw_row_labels(&mut svg, px0, py0, &names[o1], cs, px);
                }
                let block = g.blocks.as_ref().map(|bl| (bl, bl.block_of[g.axis][s]));
                let ring = |r: usize, c: usize| {
                    block.is_some_and(|(bl, b)| bl.block_of[o1][r] != b || bl.block_of[o2][c] != b)
                };
                let ov = match block {
                    Some((bl, b)) => Overlay {
                        row_cuts: &bl.cuts[o1],
                        col_cuts: &bl.cuts[o2],
                        tint: Some((bl.span(o1, b), bl.span(o2, b))),
                        ring: Some(&ring),
                    },
                    None => Overlay::default(),
                };
                let p = Panel {
                    rows,
                    cols,
                    cells: &cells[s],
                    cell: cs,
                };
                non_integer |= panel::draw_panel(&mut svg, px0, py0, &p, &scale, &ov);
                grid_w = grid_w.max(px0 + cols as i64 * cs - MARGIN);
            }
            y += SLICE_TITLE + band + rows as i64 * cs + GAP;
            grid_row += 1;
        }
    }
    y += 4;
    let legend_w = panel::draw_legend(&mut svg, MARGIN, y, &scale, non_integer);
    panel::finish_picture(
        svg,
        MARGIN + grid_w,
        (y, legend_w),
        &g.title,
        &g.caption,
        px,
    )
}

/// Slice titles keep at least this many characters.
const MAX_TITLE: usize = 10;

/// Largest number of bins per side in the density view.
pub const DENSITY_BINS: usize = 64;

/// The density view: the three projections of the support (count of nonzero coefficients
/// over the third axis), binned to at most [`DENSITY_BINS`] squares per side.
/// Cost: O(nnz + bins^2).
pub(super) fn draw_density(t: &Tensor, title: &str, mut caption: Vec<String>) -> String {
    let d = t.dims();
    let bins = d.map(|n| n.div_ceil(DENSITY_BINS).max(1));
    let nb = [0, 1, 2].map(|a| d[a].div_ceil(bins[a]));
    caption.push(format!(
        "density view: each square covers up to {} x {} index pairs (left x right), {} x {} (left x result), {} x {} (right x result)",
        bins[0], bins[1], bins[0], bins[2], bins[1], bins[2]
    ));
    caption.push(
        "shade: number of nonzero coefficients in the square, summed over the third axis".into(),
    );
    let pairs = [(0usize, 1usize), (0, 2), (1, 2)];
    let mut counts: Vec<Vec<usize>> = pairs.iter().map(|&(a, b)| vec![0; nb[a] * nb[b]]).collect();
    for (i, j, k, _) in t.entries() {
        let idx = [i, j, k];
        for (p, &(a, b)) in pairs.iter().enumerate() {
            counts[p][(idx[a] / bins[a]) * nb[b] + idx[b] / bins[b]] += 1;
        }
    }
    let cs = 6;
    let px = 9;
    let names = t.names();
    let tick = |a: usize| -> Vec<(usize, String)> {
        (0..nb[a])
            .step_by(8)
            .map(|bin| (bin, shorten(&names[a][bin * bins[a]], 10)))
            .collect()
    };
    let label_w = (0..3)
        .flat_map(|a| tick(a).into_iter().map(|(_, s)| text_width(&s, px)))
        .max()
        .unwrap_or(0)
        + 6;
    let mut svg = Svg::new();
    let header_h = panel::draw_header(&mut svg, MARGIN, MARGIN, title, &caption);
    let top = MARGIN + header_h + 8 + 16 + label_w;
    let mut x = MARGIN;
    let mut max_h = 0;
    for (p, &(a, b)) in pairs.iter().enumerate() {
        let max = counts[p].iter().copied().max().unwrap_or(0);
        let px0 = x + label_w + 14;
        let (w, h) = (nb[b] as i64 * cs, nb[a] as i64 * cs);
        svg.text(
            px0,
            MARGIN + header_h + 8 + 12,
            Anchor::Start,
            "c",
            &format!("{} x {}", AXES[a], AXES[b]),
        );
        svg.rect(px0, top, w, h, palette::ZERO);
        let mut squares = Batch::default();
        for r in 0..nb[a] {
            for c in 0..nb[b] {
                let n = counts[p][r * nb[b] + c];
                if n > 0 {
                    let s = palette::density_shade(n, max);
                    let (x, y) = (px0 + c as i64 * cs, top + r as i64 * cs);
                    squares.rect(palette::DENSITY[s], x, y, cs, cs);
                }
            }
        }
        squares.flush(&mut svg);
        svg.rect_outlined((px0, top, w, h), "none", palette::FRAME, 1);
        for (bin, name) in tick(a) {
            svg.text(px0 - 3, top + bin as i64 * cs + cs, Anchor::End, "l", &name);
        }
        for (bin, name) in tick(b) {
            svg.text_up(px0 + bin as i64 * cs + cs, top - 3, "l", &name);
        }
        x = px0 + w + 2 * GAP;
        max_h = max_h.max(h);
    }
    let y = top + max_h + 12;
    svg.text(
        MARGIN,
        y + 11,
        Anchor::Start,
        "s",
        "nonzero coefficients per square (fraction of the panel's largest count, up to)",
    );
    let mut lx = MARGIN;
    for (s, fill) in palette::DENSITY.iter().enumerate() {
        svg.rect_outlined((lx, y + 16, 26, 12), fill, palette::FRAME, 1);
        svg.text(
            lx + 13,
            y + 41,
            Anchor::Middle,
            "s",
            &format!("{}/6", s + 1),
        );
        lx += 30;
    }
    panel::finish_picture(svg, x - 2 * GAP, (y, lx - MARGIN), title, &caption, px)
}
