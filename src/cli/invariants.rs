//! `bilin invariants INPUT [--json] [--only centre,centroid,...] [--field F] [--no-bases]`:
//! the invariant algebras of a product (centre, nuclei, annihilators, unit, centroid,
//! derivations, adjoint algebra, radical, Lie invariants; for a bilinear map: centroid and
//! derivation triples, adjoint pairs, radicals), every basis proven exactly.

use super::EXIT_OK;
use super::common::{generators_help, report_error};
use bilin::report::invariants::{InvariantParams, Part, invariants_report, render_text};

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// Print the report as JSON (schema `bilin.invariants/1`).
    #[arg(long)]
    pub json: bool,
    /// Compute only these parts (comma-separated): centre, nuclei, annihilators, unit,
    /// centroid, derivations, adjoint, radical, lie; for bilinear maps centroid-triples,
    /// derivation-triples, adjoint-pairs, radicals.
    #[arg(long)]
    pub only: Option<String>,
    /// Report dimensions and properties only, without bases.
    #[arg(long)]
    pub no_bases: bool,
    /// Memory the linear systems may use (e.g. `4G`, `512M`); a part that would need more
    /// is skipped with a note. Default: three quarters of the memory available now.
    #[arg(long, value_parser = super::common::parse_memory, value_name = "SIZE")]
    pub max_memory: Option<usize>,
}

/// Run the subcommand; returns the exit code.
pub fn run(args: Args) -> i32 {
    let t = match args.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let only = match args.only.as_deref().map(Part::parse_list) {
        None => None,
        Some(Ok(p)) => Some(p),
        Some(Err(e)) => return report_error(&e),
    };
    let mut params = InvariantParams {
        only,
        omit_bases: args.no_bases,
        ..Default::default()
    };
    if let Some(m) = args.max_memory {
        params.solve.max_memory = m;
    }
    let r = super::common::with_progress(|p| invariants_report(&t, &params, p));
    let r = match r {
        Ok(r) => r,
        Err(e) => return report_error(&e),
    };
    if args.json {
        println!(
            "{}",
            serde_json::to_string_pretty(&r).expect("a report serialises")
        );
    } else {
        print!("{}", render_text(&r, &t.names()[0]));
    }
    EXIT_OK
}
