//! `bilin split INPUT [--json] [--only blocks,components,lie] [--field F] [--seed N]
//! [--no-certify] [--basis-out FILE] [--svg FILE]`: what a product is made of. Its
//! indecomposable blocks with the change of basis (checked block diagonal, each block
//! certified not to split further), the radical and simple components of an associative
//! algebra, the radicals, Levi factor and Cartan subalgebra of a Lie algebra.

use super::EXIT_OK;
use super::common::{generators_help, report_error, write_output};
use bilin::picture::{BlockLayout, TensorPictureParams, blocks_svg};
use bilin::report::structure::{basis_file, render_text, split_report};
use bilin::structure::{Decomposition, Part, StructureParams};

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// Print the report as JSON (schema `bilin.split/1`, see docs/split.md).
    #[arg(long)]
    pub json: bool,
    /// Only these parts (comma-separated): blocks, components (radical and simple
    /// components of an associative algebra), lie (radicals, Levi factor and Cartan
    /// subalgebra of a Lie algebra over Q). Default: all that apply.
    #[arg(long)]
    pub only: Option<String>,
    /// Seed of the random elements used to split fields and find Cartan subalgebras
    /// (the results are exact whatever the seed).
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Do not recompute each block's centroid to certify that it does not split further.
    #[arg(long)]
    pub no_certify: bool,
    /// Write the change of basis into blocks as a change-of-basis file (for
    /// `bilin transform INPUT --basis FILE`).
    #[arg(long, value_name = "FILE")]
    pub basis_out: Option<String>,
    /// Write a picture of the tensor in the new basis with its blocks (SVG).
    #[arg(long, value_name = "FILE")]
    pub svg: Option<String>,
}

/// Run the subcommand; returns the exit code.
pub fn run(args: Args) -> i32 {
    let t = match args.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let only = match args.only.as_deref().map(Part::parse_list).transpose() {
        Ok(o) => o,
        Err(e) => return report_error(&e),
    };
    let wants_blocks = only.as_ref().is_none_or(|o| o.contains(&Part::Blocks));
    if (args.basis_out.is_some() || args.svg.is_some()) && !wants_blocks {
        eprintln!("error: --basis-out and --svg need the blocks part (see --only)");
        return super::EXIT_USAGE;
    }
    let params = StructureParams {
        only,
        seed: args.seed,
        certify_blocks: !args.no_certify,
        ..StructureParams::default()
    };
    let (r, s) = match super::common::with_progress(|p| split_report(&t, &params, p)) {
        Ok(x) => x,
        Err(e) => return report_error(&e),
    };
    if args.json {
        println!(
            "{}",
            serde_json::to_string_pretty(&r).expect("a report serialises")
        );
    } else {
        print!("{}", render_text(&r));
    }
    if let Some(d) = &s.blocks {
        if let Some(path) = &args.basis_out
            && let Err(code) = write_output(path, &basis_file(&t, d))
        {
            return code;
        }
        if let Some(path) = &args.svg {
            let params = TensorPictureParams {
                title: Some(format!("{} in blocks", args.source.input)),
                ..TensorPictureParams::default()
            };
            let svg = match blocks_svg(&d.tensor, &picture_layout(d), &params) {
                Ok(s) => s,
                Err(e) => return report_error(&e),
            };
            if let Err(code) = write_output(path, &svg) {
                return code;
            }
        }
    }
    EXIT_OK
}

/// Block sizes for the picture: every block with a positive dimension on each axis, then
/// the one-dimensional degenerate blocks of a map merged into one (or into the last block
/// when an axis would be empty).
fn picture_layout(d: &Decomposition) -> BlockLayout {
    let mut sizes: [Vec<usize>; 3] = [Vec::new(), Vec::new(), Vec::new()];
    let mut rest = [0usize; 3];
    for b in &d.blocks {
        let target = if b.dims.iter().all(|&x| x > 0) {
            for (axis, &x) in sizes.iter_mut().zip(&b.dims) {
                axis.push(x);
            }
            continue;
        } else {
            &mut rest
        };
        for (r, &x) in target.iter_mut().zip(&b.dims) {
            *r += x;
        }
    }
    if rest.iter().all(|&x| x > 0) || sizes[0].is_empty() {
        for (axis, &x) in sizes.iter_mut().zip(&rest) {
            axis.push(x);
        }
    } else {
        for (axis, &x) in sizes.iter_mut().zip(&rest) {
            *axis.last_mut().expect("a block") += x;
        }
    }
    BlockLayout::in_place(d.tensor.dims(), sizes)
}
