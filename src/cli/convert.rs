//! `bilin convert INPUT --to table|grid|json [--axis left|right|result] [--field F]`: read
//! an input (file, generator or catalog name) and print it in another form on stdout. The
//! grid of an algebra is its Cayley table; the grid of a bilinear map is its slices along
//! one axis (one matrix of numbers per basis vector of that axis; default the result).

use super::EXIT_OK;
use super::common::{generators_help, usage_error};
use bilin::input::{write_grid, write_json, write_slices, write_table};
use bilin::tensor::{Kind, Tensor};

/// The output forms.
#[derive(clap::ValueEnum, Clone, Copy, Debug)]
pub enum Form {
    /// Product lines `x*y = combination`.
    Table,
    /// A Cayley table (algebras), or one matrix per slice (bilinear maps).
    Grid,
    /// Coordinate JSON.
    Json,
}

/// The axes of a tensor.
#[derive(clap::ValueEnum, Clone, Copy, Debug)]
pub enum Axis {
    /// Slices `u_i`: rows v_j, columns w_k.
    Left,
    /// Slices `v_j`: rows u_i, columns w_k.
    Right,
    /// Slices `w_k`: rows u_i, columns v_j (the coefficient of w_k in u_i * v_j).
    Result,
}

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// The output form.
    #[arg(long, value_enum, default_value = "table")]
    pub to: Form,
    /// With `--to grid` for a bilinear map: the axis of the slices (default result). An
    /// algebra given this option is written as a map, one slice per basis vector.
    #[arg(long, value_enum)]
    pub axis: Option<Axis>,
}

/// Run the subcommand; returns the exit code.
pub fn run(args: Args) -> i32 {
    let t = match args.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    if args.axis.is_some() && !matches!(args.to, Form::Grid) {
        return usage_error("--axis", "the axis of the slices goes with `--to grid`");
    }
    let axis = args.axis.map(|a| a as usize);
    print!("{}", written(&t, args.to, axis));
    EXIT_OK
}

/// `t` in the given form (a map's grid: its slices along `axis`, default the result).
pub fn written(t: &Tensor, form: Form, axis: Option<usize>) -> String {
    match form {
        Form::Table => write_table(t),
        Form::Json => write_json(t),
        Form::Grid => match (t.kind(), axis) {
            (Kind::Algebra, None) => write_grid(t).unwrap_or_else(|_| write_table(t)),
            (_, a) => write_slices(t, a.unwrap_or(2)),
        },
    }
}

/// Print `t` on stdout in the given form; returns the exit code.
pub fn print_as(t: &Tensor, form: Form) -> i32 {
    print!("{}", written(t, form, None));
    EXIT_OK
}
