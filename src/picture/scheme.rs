//! The picture of a scheme: its three factor matrices U, V and W side by side, one row per
//! multiplication m_t (u_t, v_t, w_t), one column per basis vector of the left, right and
//! result space; coefficients coloured on one diverging scale. The caption states the
//! rank, the additions (as counted by `scheme::cost`), the field, and whether the scheme
//! verifies exactly against the tensor.

use super::palette::{self, Scale};
use super::panel::{self, MARGIN, Overlay, Panel};
use super::svg::{Anchor, Svg, text_width};
use crate::scalar::Q;
use crate::scheme::{Scheme, cost::count_cost, verify};
use crate::tensor::Tensor;
use num_traits::Zero;

const GAP: i64 = 26;

/// The caption lines of a scheme picture.
pub fn scheme_caption(s: &Scheme, t: &Tensor) -> Vec<String> {
    let c = count_cost(s);
    let check = match verify(s, t) {
        Ok(()) => "verified exactly against the tensor".to_string(),
        Err(m) => format!(
            "does NOT verify: {} coefficient{} of the tensor differ",
            m.count,
            if m.count == 1 { "" } else { "s" }
        ),
    };
    vec![
        format!(
            "rank {} over {}, {} additions ({} before common subexpressions), {} scalings",
            s.rank(),
            s.field.name(),
            c.total(),
            c.naive_total(),
            c.scalings_total()
        ),
        format!(
            "{check}; m_t = (u_t . a)(v_t . b), c_k = sum_t w_t[k] m_t; rows are m1..m{}",
            s.rank()
        ),
    ]
}

/// Draw the scheme. `s.dims` must equal `t.dims()` (the caller checks).
/// Cost: O(rank * (dims sum)) plus one exact verification and one cost count.
pub(super) fn draw_scheme(s: &Scheme, t: &Tensor, title: &str) -> String {
    let mut caption = scheme_caption(s, t);
    if let Some(l) = super::tensor::field_line(s.field) {
        caption.push(l);
    }
    let r = s.rank();
    let d = s.dims;
    let cs = panel::cell_size(r.max(d[0]).max(d[1]).max(d[2]));
    let px = panel::label_px(cs);
    let rows: Vec<String> = (1..=r).map(|n| format!("m{n}")).collect();
    let factors = [&s.u, &s.v, &s.w];
    let cells: Vec<Vec<(usize, usize, Q)>> = factors
        .iter()
        .map(|m| {
            m.iter()
                .enumerate()
                .flat_map(|(row, v)| {
                    v.iter()
                        .enumerate()
                        .filter(|(_, x)| !x.is_zero())
                        .map(move |(col, x)| (row, col, palette::display_value(s.field, x)))
                })
                .collect()
        })
        .collect();
    let scale = Scale::fit(cells.iter().flatten().map(|c| &c.2));
    let names = t.names();
    let band = (0..3)
        .map(|a| panel::col_label_height(&names[a], px, cs))
        .max()
        .unwrap_or(0);
    let mut svg = Svg::new();
    let header_h = panel::draw_header(&mut svg, MARGIN, MARGIN, title, &caption);
    let top = MARGIN + header_h + 8 + 16 + band;
    let rw = panel::row_label_width(&rows, px);
    panel::draw_row_labels(&mut svg, MARGIN + rw, top, &rows, cs, px);
    let mut x = MARGIN + rw;
    let heads = ["U (left forms)", "V (right forms)", "W (outputs)"];
    let mut non_integer = false;
    for a in 0..3 {
        svg.text(x, top - band - 6, Anchor::Start, "c", heads[a]);
        panel::draw_col_labels(&mut svg, x, top, &names[a], cs, px);
        let p = Panel {
            rows: r,
            cols: d[a],
            cells: &cells[a],
            cell: cs,
        };
        non_integer |= panel::draw_panel(&mut svg, x, top, &p, &scale, &Overlay::default());
        x += (d[a] as i64 * cs).max(text_width(heads[a], 12)) + GAP;
    }
    let y = top + r as i64 * cs + 14;
    let legend_w = panel::draw_legend(&mut svg, MARGIN, y, &scale, non_integer);
    panel::finish_picture(svg, x - GAP, (y, legend_w), title, &caption, px)
}
