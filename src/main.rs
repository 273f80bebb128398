//! The `bilin` command line: parses arguments, calls the library, renders results.

mod cli;

fn main() {
    std::process::exit(cli::run());
}
