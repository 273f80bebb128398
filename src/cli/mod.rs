//! Command-line front end. Each subcommand lives in its own file and only parses
//! arguments, calls the library and renders the result.
//!
//! Exit codes: 0 success, 1 a checked claim is false (e.g. a scheme fails verification),
//! 2 bad input or usage.

use clap::{Parser, Subcommand};

mod analyze;
mod bounds;
mod catalog;
pub mod common;
mod convert;
mod draw;
mod emit;
mod equiv;
mod identify;
mod invariants;
mod manual;
mod merge;
mod outputs;
mod scheme;
mod scheme_io;
mod search;
mod split;
mod transform;
mod verify;

/// Exit code: success.
pub const EXIT_OK: i32 = 0;
/// Exit code: a checked claim is false.
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
    /// Laws, ranks and the full analysis of a product.
    Analyze(analyze::Args),
    /// Print an input (file, generator or catalog name) as a table, grid or JSON.
    Convert(convert::Args),
    /// Verify a scheme (bilinear algorithm) exactly against a tensor.
    Verify(verify::Args),
    /// Proven lower bounds for the tensor rank, each with its theorem.
    Bounds(bounds::Args),
    /// Emit a verified scheme as exact C, Rust or Python (block code for matrix formats), or LaTeX.
    Emit(emit::Args),
    /// Schemes as data: convert, cost, polish, equiv, kron, sum, permute, cyclic, transpose,
    /// restrict.
    Scheme(scheme::Args),
    /// Invariant algebras: centre, nuclei, centroid, derivations, radical, ... (exact).
    Invariants(invariants::Args),
    /// What a product is made of: indecomposable blocks, radical and simple components,
    /// Lie radicals, Levi factor and Cartan subalgebra (exact, checked).
    Split(split::Args),
    /// Search for a low-rank scheme (bilinear algorithm) of a tensor.
    Search(Box<search::SearchArgs>),
    /// Keep the lowest-rank verified scheme among result and checkpoint files.
    Merge(merge::MergeArgs),
    /// Browse the catalog of known algebras and bilinear maps (list, show, check, doc).
    Catalog(catalog::CatalogArgs),
    /// Identify an input against the catalog by invariants (and explicit isomorphisms).
    Identify(identify::IdentifyArgs),
    /// Apply a change of basis (a basis file or a seeded random one) and print the result.
    Transform(transform::Args),
    /// SVG pictures: a tensor's slices, a scheme's factor matrices, a block decomposition.
    Draw(draw::DrawArgs),
    /// Print a shell completion script (bash, zsh, fish, elvish, powershell).
    Completions(manual::CompletionsArgs),
    /// Print the man page, or write one page per command into a folder (`--dir`).
    Manual(manual::ManualArgs),
}

/// True for the panic of `print!` on a closed standard output.
fn is_closed_stdout(message: &str) -> bool {
    message.contains("failed printing to stdout") && message.contains("Broken pipe")
}

/// Panics never show a backtrace: a closed standard output (`bilin catalog list | head`)
/// ends the program quietly with exit 0, as Unix filters do; anything else is reported in
/// one line as an internal error (exit 101).
fn install_panic_hook() {
    std::panic::set_hook(Box::new(|info| {
        let payload = info.payload();
        let message = payload
            .downcast_ref::<&str>()
            .map(|s| s.to_string())
            .or_else(|| payload.downcast_ref::<String>().cloned())
            .unwrap_or_else(|| "unknown panic".into());
        if is_closed_stdout(&message) {
            std::process::exit(EXIT_OK);
        }
        let at = info
            .location()
            .map(|l| format!(" at {}:{}", l.file(), l.line()))
            .unwrap_or_default();
        eprintln!(
            "error: internal error: {message}{at}; please report this with the command that caused it"
        );
    }));
}

/// Flush standard output at the end: a closed pipe is a normal end (exit 0 unless the
/// command failed), another failure (a full disk) is an error.
fn finish_stdout(code: i32) -> i32 {
    use std::io::Write;
    match std::io::stdout().flush() {
        Ok(()) => code,
        Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => code,
        Err(e) => {
            eprintln!(
                "error: cannot write to standard output: {}",
                bilin::error::describe_io(&e)
            );
            EXIT_USAGE
        }
    }
}

/// Parse the command line, run it, return the exit code.
pub fn run() -> i32 {
    install_panic_hook();
    let code = dispatch();
    finish_stdout(code)
}

fn dispatch() -> i32 {
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
        Command::Analyze(a) => analyze::run(a),
        Command::Convert(a) => convert::run(a),
        Command::Verify(a) => verify::run(&a),
        Command::Bounds(a) => bounds::run(&a),
        Command::Emit(a) => emit::run(&a),
        Command::Scheme(a) => scheme::run(&a),
        Command::Invariants(a) => invariants::run(a),
        Command::Split(a) => split::run(a),
        Command::Search(a) => search::run(*a),
        Command::Merge(a) => merge::run(a),
        Command::Catalog(a) => catalog::run(a),
        Command::Identify(a) => identify::run(a),
        Command::Transform(a) => transform::run(a),
        Command::Draw(a) => draw::run(a),
        Command::Completions(a) => manual::completions(a),
        Command::Manual(a) => manual::manual(a),
    }
}
