//! `bilin merge`: keep the lowest-rank scheme that verifies, among result and checkpoint
//! files of a split search.

use super::common::{note, report_error};
use super::outputs::emit_result;
use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::input::read_text_file;
use bilin::output::Target;
use bilin::search::json::parse_saved;
use bilin::search::merge_schemes;
use clap::Args;

#[derive(Args)]
pub struct MergeArgs {
    /// The tensor the schemes are for (file or built-in, as for `bilin search`).
    #[arg(long)]
    pub tensor: String,
    /// Scheme or checkpoint files.
    #[arg(required = true)]
    pub files: Vec<String>,
    /// Write the merged scheme here (default: standard output); a better scheme already in
    /// the file is kept.
    #[arg(long)]
    pub out: Option<String>,
    /// Replace the --out file even when it holds a better scheme or something else.
    #[arg(long)]
    pub overwrite: bool,
}

pub fn run(a: MergeArgs) -> i32 {
    let t = match super::common::load(&a.tensor, None) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let out = match a.out.as_deref().map(Target::resolve).transpose() {
        Ok(o) => o,
        Err(e) => return report_error(&e),
    };
    let mut schemes = Vec::new();
    for f in &a.files {
        match read_text_file(f).and_then(|s| parse_saved(&s, f)) {
            Ok(saved) => schemes.extend(saved.into_best()),
            Err(e) => return report_error(&e),
        }
    }
    let Some(best) = merge_schemes(&t, &schemes) else {
        eprintln!(
            "error: none of the {} schemes in {} files verifies against {}",
            schemes.len(),
            a.files.len(),
            a.tensor
        );
        return EXIT_FALSE;
    };
    let written = emit_result(out.as_ref(), &best, &t, a.overwrite);
    note(format!(
        "rank {} verified ({} of {} files had a scheme)",
        best.rank(),
        schemes.len(),
        a.files.len()
    ));
    if written { EXIT_OK } else { EXIT_USAGE }
}
