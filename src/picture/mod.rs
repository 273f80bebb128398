//! Pictures as SVG documents: a structure tensor, a scheme, a block decomposition.
//!
//! - [`tensor_svg`]: the slices of a tensor along one axis as a grid of small matrices
//!   (up to [`TensorPictureParams::max_slice_dim`] per axis; beyond, a density view of the
//!   three projections of its support);
//! - [`scheme_svg`]: the factor matrices U, V, W of a scheme side by side, with its rank,
//!   additions, field and exact verification in the caption;
//! - [`blocks_svg`]: a tensor in a reordered basis cut into blocks ([`BlockLayout`]), the
//!   shape of a direct-sum decomposition, with every coefficient outside the blocks ringed.
//!
//! One diverging colour scale (blue positive, orange negative, shade by magnitude; see
//! [`palette`]) and a corner mark for every coefficient that is not an integer. Over
//! GF(p) residues are shown balanced. The functions are pure and deterministic: equal
//! inputs give equal bytes (integer coordinates only). No browser or font is needed to
//! make a picture; the text uses a monospace font where one is installed.

pub mod blocks;
pub mod palette;
mod panel;
mod scheme;
pub mod svg;
mod tensor;

pub use blocks::{BlockLayout, count_inside};
pub use scheme::scheme_caption;
pub use tensor::grid_columns;

use crate::error::{Error, Result};
use crate::scheme::Scheme;
use crate::tensor::{AXES, Tensor};

/// Slices or density.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum View {
    /// Slices up to `max_slice_dim` per axis, the density view beyond.
    Auto,
    Slices,
    Density,
}

impl View {
    /// `auto`, `slices` or `density`.
    pub fn parse(s: &str) -> Result<View> {
        match s {
            "auto" => Ok(View::Auto),
            "slices" => Ok(View::Slices),
            "density" => Ok(View::Density),
            _ => Err(Error::Invalid(format!(
                "unknown view `{s}` (expected auto, slices or density)"
            ))),
        }
    }
}

/// Parameters of [`tensor_svg`] and [`blocks_svg`].
#[derive(Clone, Debug)]
pub struct TensorPictureParams {
    /// The axis the slices are taken along: 0 left, 1 right, 2 result.
    pub axis: usize,
    /// Only these slices (indices along `axis`), in this order; `None`: all.
    pub slices: Option<Vec<usize>>,
    pub view: View,
    /// The automatic view draws slices while every dimension is at most this.
    pub max_slice_dim: usize,
    /// The title line (default: "structure tensor").
    pub title: Option<String>,
}

impl Default for TensorPictureParams {
    fn default() -> Self {
        TensorPictureParams {
            axis: 2,
            slices: None,
            view: View::Auto,
            max_slice_dim: 64,
            title: None,
        }
    }
}

/// Parse an axis name: `left`/`0`, `right`/`1`, `result`/`2`.
pub fn parse_axis(s: &str) -> Result<usize> {
    match s {
        "left" | "0" => Ok(0),
        "right" | "1" => Ok(1),
        "result" | "2" => Ok(2),
        _ => Err(Error::Invalid(format!(
            "unknown axis `{s}` (expected left, right or result)"
        ))),
    }
}

fn checked_slices(t: &Tensor, p: &TensorPictureParams) -> Result<Vec<usize>> {
    if p.axis > 2 {
        return Err(Error::Invalid(format!("axis {} is not 0, 1 or 2", p.axis)));
    }
    let n = t.dims()[p.axis];
    match &p.slices {
        None => Ok((0..n).collect()),
        Some(list) => {
            if let Some(bad) = list.iter().find(|&&s| s >= n) {
                return Err(Error::Invalid(format!(
                    "slice {bad} is out of range: the {} axis has dimension {n}",
                    AXES[p.axis]
                )));
            }
            if list.is_empty() {
                return Err(Error::Invalid("the list of slices is empty".into()));
            }
            Ok(list.clone())
        }
    }
}

/// The slices view draws at most this many cells (slices x rows x columns): four times a
/// full 64 x 64 x 64 tensor.
pub const MAX_SLICE_CELLS: usize = 1 << 20;

fn check_slice_area(t: &Tensor, axis: usize, slices: usize) -> Result<()> {
    let (o1, o2) = crate::tensor::others(axis);
    let cells = slices as u128 * t.dims()[o1] as u128 * t.dims()[o2] as u128;
    if cells > MAX_SLICE_CELLS as u128 {
        return Err(Error::Invalid(format!(
            "{slices} slices of {} x {} are {cells} cells, above the limit of {MAX_SLICE_CELLS} \
             for the slices view; choose fewer slices or the density view",
            t.dims()[o1],
            t.dims()[o2]
        )));
    }
    Ok(())
}

fn use_density(t: &Tensor, p: &TensorPictureParams) -> bool {
    match p.view {
        View::Density => true,
        View::Slices => false,
        View::Auto => t.dims().iter().any(|&d| d > p.max_slice_dim),
    }
}

fn base_caption(t: &Tensor, p: &TensorPictureParams, shown: usize) -> Vec<String> {
    let mut c = vec![tensor::shape_line(t)];
    if let Some(l) = tensor::field_line(t.field()) {
        c.push(l);
    }
    let n = t.dims()[p.axis];
    let mut reading = tensor::reading_line(p.axis);
    if shown != n {
        reading.push_str(&format!(" ({shown} of {n} slices shown)"));
    }
    c.push(reading);
    c
}

/// The picture of a tensor: slices along `params.axis` (or the density view). Errors on
/// an axis or slice index out of range. Cost: O(nnz + slices * dim^2) for the slices view,
/// O(nnz + 64^2) for the density view; the SVG has one element per nonzero coefficient.
pub fn tensor_svg(t: &Tensor, params: &TensorPictureParams) -> Result<String> {
    let slices = checked_slices(t, params)?;
    let title = params
        .title
        .clone()
        .unwrap_or_else(|| "structure tensor".into());
    let mut caption = base_caption(t, params, slices.len());
    if use_density(t, params) {
        caption.pop();
        return Ok(tensor::draw_density(t, &title, caption));
    }
    check_slice_area(t, params.axis, slices.len())?;
    Ok(tensor::draw_slice_grid(&tensor::SliceGrid {
        t,
        axis: params.axis,
        groups: vec![slices],
        blocks: None,
        title,
        caption,
    }))
}

/// The picture of a block decomposition: the tensor in the basis order of `layout`, its
/// slices along `params.axis` grouped by block (one grid row per block), the block edges
/// drawn in every slice, the diagonal block tinted, and each coefficient outside the
/// blocks ringed; the caption counts them. `params.slices` and `params.view` are ignored.
/// Cost: as [`tensor_svg`].
pub fn blocks_svg(
    t: &Tensor,
    layout: &BlockLayout,
    params: &TensorPictureParams,
) -> Result<String> {
    let p = TensorPictureParams {
        slices: None,
        ..params.clone()
    };
    checked_slices(t, &p)?;
    check_slice_area(t, p.axis, t.dims()[p.axis])?;
    let (inside, outside) = count_inside(t, layout)?;
    let shown = layout.reorder(t)?;
    let block_of = layout.block_of_position();
    let groups: Vec<Vec<usize>> = (0..layout.blocks())
        .map(|b| {
            (0..t.dims()[p.axis])
                .filter(|&s| block_of[p.axis][s] == b)
                .collect()
        })
        .collect();
    let mut caption = base_caption(t, &p, t.dims()[p.axis]);
    let sizes: Vec<String> = (0..3)
        .map(|a| {
            let s: Vec<String> = layout.sizes[a].iter().map(|n| n.to_string()).collect();
            format!("{} {}", AXES[a], s.join("+"))
        })
        .collect();
    caption.push(format!(
        "{} blocks (sizes: {}); {}",
        layout.blocks(),
        sizes.join(", "),
        if outside == 0 {
            format!("all {inside} nonzero coefficients lie inside the blocks")
        } else {
            format!(
                "{outside} of {} nonzero coefficients lie outside the blocks (ringed)",
                inside + outside
            )
        }
    ));
    let title = p
        .title
        .clone()
        .unwrap_or_else(|| "block decomposition".into());
    Ok(tensor::draw_slice_grid(&tensor::SliceGrid {
        t: &shown,
        axis: p.axis,
        groups,
        blocks: Some(tensor::Blocks {
            block_of,
            cuts: layout.cuts(),
        }),
        title,
        caption,
    }))
}

/// Parameters of [`scheme_svg`].
#[derive(Clone, Debug, Default)]
pub struct SchemePictureParams {
    /// The title line (default: "scheme").
    pub title: Option<String>,
}

/// The picture of a scheme for a tensor (basis names from the tensor). The scheme's shape
/// must match the tensor's; it is verified exactly over the scheme's field and the outcome
/// is stated in the caption. Cost: O(rank * dims) plus one verification and a cost count.
pub fn scheme_svg(s: &Scheme, t: &Tensor, params: &SchemePictureParams) -> Result<String> {
    if s.dims != t.dims() {
        return Err(Error::Invalid(format!(
            "the scheme has format {:?} but the tensor has {:?}",
            s.dims,
            t.dims()
        )));
    }
    let goal = if s.field == t.field() {
        t.clone()
    } else {
        t.with_field(s.field).map_err(Error::Invalid)?
    };
    let title = params.title.clone().unwrap_or_else(|| "scheme".into());
    Ok(scheme::draw_scheme(s, &goal, &title))
}
