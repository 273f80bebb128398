//! `bilin convert INPUT --to table|grid|json [--field F]`: read an input (file, generator or
//! catalog name) and print it in another form on stdout.

use super::EXIT_OK;
use super::common::{generators_help, load, report_error};
use bilin::input::{write_grid, write_json, write_table};
use bilin::tensor::Tensor;

/// The output forms.
#[derive(clap::ValueEnum, Clone, Copy, Debug)]
pub enum Form {
    /// Product lines `x*y = combination`.
    Table,
    /// A Cayley table (algebras only).
    Grid,
    /// Coordinate JSON.
    Json,
}

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    /// A file (table format or JSON), a generator spec such as `quaternions` or
    /// `matmul:2,2,2`, or a catalog name.
    pub input: String,
    /// The output form.
    #[arg(long, value_enum, default_value = "table")]
    pub to: Form,
    /// Read the input over this field (`Q` or `GF(p)`).
    #[arg(long)]
    pub field: Option<String>,
}

/// Run the subcommand; returns the exit code.
pub fn run(args: Args) -> i32 {
    let t = match load(&args.input, args.field.as_deref()) {
        Ok(t) => t,
        Err(code) => return code,
    };
    print_as(&t, args.to)
}

/// Print `t` on stdout in the given form; returns the exit code (a Cayley table of a
/// non-algebra is an error).
pub fn print_as(t: &Tensor, form: Form) -> i32 {
    let out = match form {
        Form::Table => write_table(t),
        Form::Json => write_json(t),
        Form::Grid => match write_grid(t) {
            Ok(s) => s,
            Err(e) => return report_error(&e),
        },
    };
    print!("{out}");
    EXIT_OK
}
