//! `bilin draw tensor|scheme|blocks ...`: SVG pictures of a tensor's slices, a scheme's
//! factor matrices, or a block decomposition; to standard output or `--out FILE`.

use super::common::{emit_output, report_error, write_output};
use super::scheme::parse_list;
use super::scheme_io::{load_scheme, load_tensor};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::error::Error;
use bilin::picture::{
    BlockLayout, SchemePictureParams, TensorPictureParams, View, blocks_svg, parse_axis,
    scheme_svg, tensor_svg,
};
use bilin::scheme::Scheme;
use bilin::tensor::Tensor;
use clap::{Args, Subcommand};

#[derive(Args)]
pub struct DrawArgs {
    #[command(subcommand)]
    what: What,
}

/// Options shared by the tensor pictures.
#[derive(Args)]
struct TensorOptions {
    /// The tensor: a file, a generator spec such as `matmul:2,2,2`, or a catalog name.
    input: String,
    /// Read the input over this field (`Q` or `GF(p)`).
    #[arg(long)]
    field: Option<String>,
    /// Slice along this axis: left, right or result.
    #[arg(long, default_value = "result")]
    axis: String,
    /// The title line of the picture (default: the input).
    #[arg(long)]
    title: Option<String>,
    /// Write the SVG here instead of standard output.
    #[arg(long)]
    out: Option<String>,
}

#[derive(Subcommand)]
enum What {
    /// The slices of a tensor along one axis as a grid of coloured matrices (a density
    /// view of the three projections when an axis is above 64).
    Tensor {
        #[command(flatten)]
        common: TensorOptions,
        /// Only these slices (0-based indices along the axis), e.g. `0,1,5`.
        #[arg(long)]
        slices: Option<String>,
        /// auto (slices up to dimension 64, density beyond), slices or density.
        #[arg(long, default_value = "auto")]
        view: String,
    },
    /// The factor matrices U, V, W of a scheme side by side, with rank, additions and
    /// field; exit 1 if the scheme does not verify (the picture is written anyway).
    Scheme {
        /// The tensor: a file, a generator spec or a catalog name.
        input: String,
        /// The scheme file (text or JSON form, see docs/schemes.md).
        scheme: String,
        /// Read the input over this field (`Q` or `GF(p)`).
        #[arg(long)]
        field: Option<String>,
        /// The title line of the picture (default: the scheme file).
        #[arg(long)]
        title: Option<String>,
        /// Write the SVG here instead of standard output.
        #[arg(long)]
        out: Option<String>,
    },
    /// A block decomposition: the tensor in a reordered basis cut into blocks, the block
    /// edges drawn and every coefficient outside the blocks ringed.
    Blocks {
        #[command(flatten)]
        common: TensorOptions,
        /// Block sizes, e.g. `4,2` (all axes) or `4,2/4,2/3,1` (left/right/result).
        #[arg(long)]
        sizes: String,
        /// The new basis order (old indices, 0-based), e.g. `4,5,0,1,2,3`, or one list per
        /// axis separated by `/`; default: the basis order as it is.
        #[arg(long)]
        order: Option<String>,
    },
}

/// One list for all three axes, or three lists separated by `/`.
fn per_axis(s: &str) -> Result<[Vec<usize>; 3], Error> {
    let parts: Vec<&str> = s.split('/').collect();
    match parts.as_slice() {
        [one] => {
            let v = parse_list(one)?;
            Ok([v.clone(), v.clone(), v])
        }
        [a, b, c] => Ok([parse_list(a)?, parse_list(b)?, parse_list(c)?]),
        _ => Err(Error::Invalid(format!(
            "expected one list or three lists separated by `/`, found `{s}`"
        ))),
    }
}

fn picture_params(c: &TensorOptions) -> Result<TensorPictureParams, Error> {
    Ok(TensorPictureParams {
        axis: parse_axis(&c.axis)?,
        title: Some(c.title.clone().unwrap_or_else(|| c.input.clone())),
        ..TensorPictureParams::default()
    })
}

fn load(c: &TensorOptions) -> Result<Tensor, Error> {
    load_tensor(&c.input, c.field.as_deref())
}

/// Run `bilin draw`; returns the exit code.
pub fn run(args: DrawArgs) -> i32 {
    match draw(args.what) {
        Ok(code) => code,
        Err(e) => report_error(&e),
    }
}

fn draw(what: What) -> Result<i32, Error> {
    let (svg, out, code) = match what {
        What::Tensor {
            common,
            slices,
            view,
        } => {
            let t = load(&common)?;
            let params = TensorPictureParams {
                slices: slices.as_deref().map(parse_list).transpose()?,
                view: View::parse(&view)?,
                ..picture_params(&common)?
            };
            (tensor_svg(&t, &params)?, common.out, EXIT_OK)
        }
        What::Scheme {
            input,
            scheme,
            field,
            title,
            out,
        } => {
            let t = load_tensor(&input, field.as_deref())?;
            let s = load_scheme(&scheme, &t)?;
            let ok = bilin::scheme::verify(&s, &t).is_ok();
            let params = SchemePictureParams {
                title: Some(title.unwrap_or_else(|| format!("{scheme} for {input}"))),
            };
            if !ok {
                eprintln!("the scheme does NOT verify against {input}; the picture says so");
            }
            let code = if ok { EXIT_OK } else { EXIT_FALSE };
            (scheme_svg(&s, &t, &params)?, out, code)
        }
        What::Blocks {
            common,
            sizes,
            order,
        } => {
            let t = load(&common)?;
            let sizes = per_axis(&sizes)?;
            let layout = match order.as_deref() {
                Some(o) => BlockLayout {
                    order: per_axis(o)?,
                    sizes,
                },
                None => BlockLayout::in_place(t.dims(), sizes),
            };
            (
                blocks_svg(&t, &layout, &picture_params(&common)?)?,
                common.out,
                EXIT_OK,
            )
        }
    };
    Ok(match emit_output(out.as_deref(), &svg) {
        Ok(()) => code,
        Err(c) => c,
    })
}

/// Write the default picture of a tensor (`--svg` of other commands). Errors are printed;
/// the `Err` holds the exit code.
pub fn write_tensor_picture(t: &Tensor, input: &str, path: &str) -> Result<(), i32> {
    let params = TensorPictureParams {
        title: Some(input.to_string()),
        ..TensorPictureParams::default()
    };
    let svg = tensor_svg(t, &params).map_err(|e| report_error(&e))?;
    write_output(path, &svg)
}

/// Write the picture of a scheme (`--svg` of other commands).
pub fn write_scheme_picture(s: &Scheme, t: &Tensor, name: &str, path: &str) -> Result<(), i32> {
    let params = SchemePictureParams {
        title: Some(name.to_string()),
    };
    let svg = scheme_svg(s, t, &params).map_err(|e| report_error(&e))?;
    write_output(path, &svg)
}
