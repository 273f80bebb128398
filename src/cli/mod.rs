//! Command-line front end. Each subcommand lives in its own file and only parses
//! arguments, calls the library and renders the result.
//!
//! Exit codes: 0 success, 1 a checked claim is false (e.g. a scheme fails verification),
//! 2 bad input or usage.

mod catalog;
pub mod common;
mod convert;
mod identify;

use clap::{Parser, Subcommand};

/// Exit code: success.
pub const EXIT_OK: i32 = 0;
/// Exit code: a checked claim is false.
#[allow(dead_code)]
pub const EXIT_FALSE: i32 = 1;
/// Exit code: bad input or usage.
pub const EXIT_USAGE: i32 = 2;

#[derive(Parser)]
#[command(name = "bilin", version, about = "Exact analysis of bilinear products", long_about = None)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Print an input (file, generator or catalog name) as a table, grid or JSON.
    Convert(convert::Args),
    /// Browse the catalog of known algebras and bilinear maps (list, show, check, doc).
    Catalog(catalog::CatalogArgs),
    /// Identify an input against the catalog by invariants (and explicit isomorphisms).
    Identify(identify::IdentifyArgs),
}

/// Parse the command line, run it, return the exit code.
pub fn run() -> i32 {
    // catalog names resolve wherever an input is expected
    bilin::catalog::register_input_resolver();
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { EXIT_USAGE } else { EXIT_OK };
            let _ = e.print();
            return code;
        }
    };
    match cli.command {
        Command::Convert(a) => convert::run(a),
        Command::Catalog(a) => catalog::run(a),
        Command::Identify(a) => identify::run(a),
    }
}
