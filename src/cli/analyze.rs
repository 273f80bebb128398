//! `bilin analyze INPUT [--json] [--field F] [--laws a,b] [--expect a,!b] [--seed N]`: laws,
//! ranks and the rest of the analysis of one product, as text or JSON (schema
//! `bilin.analyze/1`). With `--expect`, exit code 1 when a claimed law verdict is false, and
//! `all N claims hold` on standard error when every one is true.

use super::common::{generators_help, load, report_error};
use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::laws::Law;
use bilin::report::invariants::{InvariantParams, Part};
use bilin::report::{Params, analyze_with_progress, render_json, render_text};
use bilin::scheme::bounds::BoundsParams;

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
    /// Claims to check, comma-separated: `law` must hold, `!law` must fail
    /// (e.g. `alternative,!associative`). Exit code 1 if a claim is false or undecided.
    #[arg(long)]
    pub expect: Option<String>,
    /// Seed of the random elements used for the slice-span ranks and lower bounds.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Only these invariants, comma-separated (e.g. `centre,derivations`; see
    /// `bilin invariants --help`); default all that apply.
    #[arg(long)]
    pub invariants: Option<String>,
    /// Leave out the invariants section.
    #[arg(long)]
    pub no_invariants: bool,
    /// Leave out the lower bounds for the tensor rank.
    #[arg(long)]
    pub no_bounds: bool,
    /// Also write a picture of the tensor (its slices, SVG) to this file.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<String>,
    /// Memory the invariant systems may use (e.g. `4G`, `512M`); a part that would need
    /// more is skipped with a note. Default: three quarters of the memory available now.
    #[arg(long, value_parser = super::common::parse_memory, value_name = "SIZE")]
    pub max_memory: Option<usize>,
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
    let mut claims = Vec::new();
    for item in args.expect.iter().flat_map(|s| s.split(',')).map(str::trim) {
        if item.is_empty() {
            continue;
        }
        let (want, name) = match item.strip_prefix('!') {
            Some(n) => (false, n),
            None => (true, item),
        };
        match Law::parse(name) {
            Some(l) => claims.push((l, want)),
            None => return unknown_law(name),
        }
    }
    for (l, _) in &claims {
        if !params.laws.laws.contains(l) {
            params.laws.laws.push(*l);
        }
    }
    if !args.no_invariants {
        let only = match args.invariants.as_deref().map(Part::parse_list).transpose() {
            Ok(o) => o,
            Err(e) => return report_error(&e),
        };
        let mut inv = InvariantParams {
            only,
            ..InvariantParams::default()
        };
        if let Some(m) = args.max_memory {
            inv.solve.max_memory = m;
        }
        params.invariants = Some(inv);
    }
    if !args.no_bounds {
        params.bounds = Some(BoundsParams {
            seed: args.seed,
            ..BoundsParams::default()
        });
    }
    let r = super::common::with_progress(|p| analyze_with_progress(&t, &args.input, &params, p));
    let r = match r {
        Ok(r) => r,
        Err(e) => return report_error(&e),
    };
    if args.json {
        println!("{}", render_json(&r));
    } else {
        print!("{}", render_text(&r));
    }
    if let Some(path) = &args.svg
        && let Err(code) = super::draw::write_tensor_picture(&t, &args.input, path)
    {
        return code;
    }
    let mut code = EXIT_OK;
    let n = claims.len();
    for (l, want) in claims {
        let got = r.laws.as_ref().and_then(|x| x.holds(l));
        if got != Some(want) {
            let said = match got {
                Some(true) => "holds",
                Some(false) => "fails",
                None => "is not decided",
            };
            let claim = if want { "hold" } else { "fail" };
            eprintln!(
                "claim false: `{}` was expected to {claim} but {said}",
                l.name()
            );
            code = EXIT_FALSE;
        }
    }
    if n > 0 && code == EXIT_OK {
        let (s, verb) = if n == 1 { ("", "holds") } else { ("s", "hold") };
        eprintln!("all {n} claim{s} {verb}");
    }
    code
}

fn unknown_law(name: &str) -> i32 {
    let known: Vec<&str> = Law::ALL.iter().map(|l| l.name()).collect();
    eprintln!("error: unknown law `{name}`; known: {}", known.join(", "));
    EXIT_USAGE
}
