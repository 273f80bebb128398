//! `bilin merge`: keep the lowest-rank scheme that verifies, among result and checkpoint
//! files of a split search.

use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::search::json::{checkpoint_from_json, scheme_to_json, write_atomic};
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
    /// Write the merged scheme here (default: standard output).
    #[arg(long)]
    pub out: Option<String>,
}

pub fn run(a: MergeArgs) -> i32 {
    let t = match super::common::load(&a.tensor, None) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let mut schemes = Vec::new();
    for f in &a.files {
        match std::fs::read_to_string(f)
            .map_err(|e| e.to_string())
            .and_then(|s| checkpoint_from_json(&s).map_err(|e| e.to_string()))
        {
            Ok(c) => schemes.extend(c.best),
            Err(e) => {
                eprintln!("bilin merge: {f}: {e}");
                return EXIT_USAGE;
            }
        }
    }
    let Some(best) = merge_schemes(&t, &schemes) else {
        eprintln!(
            "bilin merge: none of the {} schemes verifies",
            schemes.len()
        );
        return EXIT_FALSE;
    };
    let text = format!("{}\n", scheme_to_json(&best));
    match &a.out {
        Some(p) => {
            if let Err(e) = write_atomic(p, &text) {
                eprintln!("bilin merge: {e}");
                return EXIT_USAGE;
            }
        }
        None => print!("{text}"),
    }
    eprintln!(
        "bilin merge: rank {} verified ({} of {} files had a scheme)",
        best.rank(),
        schemes.len(),
        a.files.len()
    );
    EXIT_OK
}
