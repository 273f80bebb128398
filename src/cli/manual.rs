//! `bilin completions SHELL` and `bilin manual [--dir DIR]`: shell completion scripts and
//! man pages generated from the command-line definitions themselves, so they never drift
//! from the options the binary accepts.

use super::common::write_output;
use super::{Cli, EXIT_OK, EXIT_USAGE};
use clap::CommandFactory;
use clap_complete::Shell;

#[derive(clap::Args)]
pub struct CompletionsArgs {
    /// The shell: bash, zsh, fish, elvish or powershell.
    shell: Shell,
}

#[derive(clap::Args)]
pub struct ManualArgs {
    /// Write one page per command (`bilin.1`, `bilin-analyze.1`, `bilin-catalog-site.1`,
    /// ...) into this folder instead of printing the main page.
    #[arg(long)]
    dir: Option<String>,
}

/// Write to standard output; a closed pipe (`| head`) is not an error.
fn print_bytes(b: &[u8]) {
    use std::io::Write;
    let _ = std::io::stdout().write_all(b);
}

/// Print the completion script for a shell on standard output.
pub fn completions(a: CompletionsArgs) -> i32 {
    let mut cmd = Cli::command();
    let mut text = Vec::new();
    clap_complete::generate(a.shell, &mut cmd, "bilin", &mut text);
    print_bytes(&text);
    EXIT_OK
}

/// Every man page: (file name, roff text), the main page first, then every subcommand at
/// every depth in definition order.
fn pages() -> Vec<(String, Vec<u8>)> {
    fn walk(cmd: &clap::Command, out: &mut Vec<(String, Vec<u8>)>) {
        let man = clap_mangen::Man::new(cmd.clone());
        let mut text = Vec::new();
        man.render(&mut text).expect("rendering into memory");
        out.push((man.get_filename(), text));
        for sub in cmd.get_subcommands().filter(|s| !s.is_hide_set()) {
            walk(sub, out);
        }
    }
    let mut cmd = Cli::command().disable_help_subcommand(true);
    cmd.build();
    let mut out = Vec::new();
    walk(&cmd, &mut out);
    out
}

/// Print the main man page, or write all pages into a folder.
pub fn manual(a: ManualArgs) -> i32 {
    let pages = pages();
    let Some(dir) = a.dir else {
        print_bytes(&pages[0].1);
        return EXIT_OK;
    };
    if let Err(e) = std::fs::create_dir_all(&dir) {
        eprintln!("error: {dir}: {e}");
        return EXIT_USAGE;
    }
    for (name, text) in &pages {
        let path = std::path::Path::new(&dir).join(name);
        let text = String::from_utf8_lossy(text);
        if let Err(code) = write_output(&path.to_string_lossy(), &text) {
            return code;
        }
    }
    println!("wrote {} man pages to {dir}", pages.len());
    EXIT_OK
}
