//! `bilin transform INPUT (--basis FILE | --random SEED) [--to table|grid|json] [--field F]`:
//! apply a change of basis (a file in the format of `docs/formats.md`, "Change of basis",
//! or a seeded random invertible integer matrix per axis) and print the result.

use super::EXIT_USAGE;
use super::common::{generators_help, report_error};
use super::convert::{Form, print_as};
use bilin::input::{apply_basis_change, parse_basis_file, random_basis_change, read_text_file};

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// A change-of-basis file: columns of each matrix are the new basis vectors in old
    /// coordinates.
    #[arg(
        long,
        value_name = "FILE",
        conflicts_with = "random",
        required_unless_present = "random"
    )]
    pub basis: Option<String>,
    /// A random change of basis (entries in -2..2, invertible), one matrix per axis
    /// (one for an algebra), from this seed.
    #[arg(long, value_name = "SEED")]
    pub random: Option<u64>,
    /// The output form.
    #[arg(long, value_enum, default_value = "table")]
    pub to: Form,
}

/// Run the subcommand; returns the exit code.
pub fn run(args: Args) -> i32 {
    let t = match args.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let change = match (&args.basis, args.random) {
        (Some(path), _) => match read_text_file(path).and_then(|s| parse_basis_file(&s, path)) {
            Ok(c) => c,
            Err(e) => return report_error(&e),
        },
        (None, Some(seed)) => random_basis_change(&t, seed),
        (None, None) => {
            eprintln!("error: give --basis FILE or --random SEED");
            return EXIT_USAGE;
        }
    };
    let out = match apply_basis_change(&t, &change) {
        Ok(t) => t,
        Err(e) => return report_error(&e),
    };
    print_as(&out, args.to)
}
