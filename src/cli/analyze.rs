//! `bilin analyze INPUT [--json] [--field F] [--laws a,b] [--seed N]`: laws, ranks and the
//! rest of the analysis of one product, as text or JSON (schema `bilin.analyze/1`).

use super::common::{generators_help, load, report_error};
use super::{EXIT_OK, EXIT_USAGE};
use bilin::laws::Law;
use bilin::report::{Params, analyze, render_json, render_text};

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    /// A file (table format or JSON), a generator spec such as `octonions` or
    /// `matmul:2,2,2`, or a catalog name.
    pub input: String,
    /// Print the report as JSON (schema `bilin.analyze/1`, see docs/report-json.md).
    #[arg(long)]
    pub json: bool,
    /// Read the input over this field (`Q` or `GF(p)`).
    #[arg(long)]
    pub field: Option<String>,
    /// Only these laws, comma-separated (e.g. `associative,jordan`); default all.
    #[arg(long)]
    pub laws: Option<String>,
    /// Seed of the random elements used for the slice-span ranks.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
}

/// Run the subcommand; returns the exit code.
pub fn run(args: Args) -> i32 {
    let t = match load(&args.input, args.field.as_deref()) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let mut params = Params::default();
    params.ranks.seed = args.seed;
    if let Some(list) = &args.laws {
        let mut laws = Vec::new();
        for name in list.split(',').map(str::trim).filter(|s| !s.is_empty()) {
            match Law::parse(name) {
                Some(l) => laws.push(l),
                None => {
                    let known: Vec<&str> = Law::ALL.iter().map(|l| l.name()).collect();
                    eprintln!(
                        "error: --laws: unknown law `{name}`; known: {}",
                        known.join(", ")
                    );
                    return EXIT_USAGE;
                }
            }
        }
        params.laws.laws = laws;
    }
    match analyze(&t, &args.input, &params) {
        Ok(r) => {
            if args.json {
                println!("{}", render_json(&r));
            } else {
                print!("{}", render_text(&r));
            }
            EXIT_OK
        }
        Err(e) => report_error(&e),
    }
}
