//! `bilin analyze INPUT [--json] [--field F] [--laws a,b] [--expect a,!b] [--seed N]`: laws,
//! ranks and the rest of the analysis of one product, as text or JSON (schema
//! `bilin.analyze/2`). With `--expect`, exit code 1 when a claimed law verdict is false, and
//! `all N claims hold` on standard error when every one is true.

use super::common::{generators_help, report_error};
use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::invariants::structure::Property;
use bilin::laws::Law;
use bilin::ranks::BoundsParams;
use bilin::report::invariants::{InvariantParams, Part};
use bilin::report::{
    Params, Piece, analyze_streaming, render_head, render_json, render_notes, render_section,
};

#[derive(clap::Args, Debug)]
#[command(after_help = generators_help())]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// Print the report as JSON (schema `bilin.analyze/2`, see docs/report-json.md).
    #[arg(long)]
    pub json: bool,
    /// Only these laws and properties, comma-separated, in any case (e.g.
    /// `associative,jordan`, `malcev,nilpotent`), or `none`; default: all of them for an
    /// algebra, none for a bilinear map (a square map is read as an algebra when asked).
    #[arg(long)]
    pub laws: Option<String>,
    /// Claims to check, comma-separated: `law` must hold, `!law` must fail (e.g.
    /// `alternative,!associative`, `solvable,!nilpotent`, `semisimple`). Exit code 1 if a
    /// claim is false or undecided.
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
    /// Leave out the structure section (blocks, radical and simple components, Lie
    /// structure; see `bilin split`).
    #[arg(long)]
    pub no_structure: bool,
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
    let t = match args.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let mut params = Params::default();
    params.ranks.seed = args.seed;
    if let Some(list) = &args.laws {
        let (laws, props) = match parse_claim_list(list) {
            Ok(x) => x,
            Err(code) => return code,
        };
        params.laws.laws = laws;
        params.properties = props;
        params.laws_of_maps = true;
    }
    let mut claims = Vec::new();
    for item in args.expect.iter().flat_map(|s| s.split(',')).map(str::trim) {
        if item.is_empty() {
            continue;
        }
        let (want, name) = match item.strip_prefix('!') {
            Some(n) => (false, n.trim()),
            None => (true, item),
        };
        match Claim::parse(name) {
            Some(c) => claims.push((c, want)),
            None => return unknown_claim("--expect", name),
        }
        params.laws_of_maps = true;
    }
    for (c, _) in &claims {
        match *c {
            Claim::Law(l) if !params.laws.laws.contains(&l) => params.laws.laws.push(l),
            Claim::Property(p) if !params.properties.contains(&p) => params.properties.push(p),
            _ => {}
        }
    }
    if !args.no_invariants {
        let only = match args.invariants.as_deref().map(Part::parse_list).transpose() {
            Ok(o) => o,
            Err(e) => return report_error(&e),
        };
        // the parts named by --invariants run whatever their cost; the default set keeps
        // to a budget of a few seconds (a skipped part says so and how to ask for it)
        let max_work = only.is_none().then_some(QUICK_INVARIANTS_WORK);
        let mut inv = InvariantParams {
            only,
            max_work,
            ..InvariantParams::default()
        };
        if let Some(m) = args.max_memory {
            inv.solve.max_memory = m;
        }
        params.invariants = Some(inv);
    }
    if !args.no_structure {
        params.structure = Some(bilin::structure::StructureParams {
            seed: args.seed,
            ..Default::default()
        });
    }
    if !args.no_bounds {
        params.bounds = Some(BoundsParams {
            seed: args.seed,
            ..BoundsParams::default()
        });
    }
    // text: each part is printed as soon as it is computed (the invariants come last)
    let json = args.json;
    let mut emit = |piece: Piece| {
        if json {
            return;
        }
        let text = match piece {
            Piece::Head(r) => render_head(r),
            Piece::Section(sec) => render_section(sec),
        };
        print!("{text}");
        use std::io::Write;
        let _ = std::io::stdout().flush();
    };
    let r = super::common::with_progress(|p| {
        analyze_streaming(&t, &args.source.input, &params, p, &mut emit)
    });
    let r = match r {
        Ok(r) => r,
        Err(e) => return report_error(&e),
    };
    if args.json {
        println!("{}", render_json(&r));
    } else {
        print!("{}", render_notes(&r));
    }
    if let Some(path) = &args.svg
        && let Err(code) = super::draw::write_tensor_picture(&t, &args.source.input, path)
    {
        return code;
    }
    let mut code = EXIT_OK;
    let n = claims.len();
    for (c, want) in claims {
        let got = match c {
            Claim::Law(l) => r.laws.as_ref().and_then(|x| x.holds(l)),
            Claim::Property(p) => r
                .properties
                .iter()
                .find(|x| x.property == p)
                .and_then(|x| x.holds),
        };
        if got != Some(want) {
            let said = match got {
                Some(true) => "holds",
                Some(false) => "fails",
                None => "is not decided",
            };
            let claim = if want { "hold" } else { "fail" };
            eprintln!(
                "claim false: `{}` was expected to {claim} but {said}",
                c.name()
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

/// The work budget of each default invariant of `analyze` (multiply-adds of a dense
/// elimination): a few seconds with the vector kernels, enough for the derivations and
/// the centroid of a dense table of dimension 64 (4096 unknowns).
const QUICK_INVARIANTS_WORK: f64 = 3e10;

/// A claim of `--laws` and `--expect`: a law or a structural property.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Claim {
    Law(Law),
    Property(Property),
}

impl Claim {
    /// Parse a name in any case.
    fn parse(s: &str) -> Option<Claim> {
        Law::parse(s)
            .map(Claim::Law)
            .or_else(|| Property::parse(s).map(Claim::Property))
    }

    fn name(self) -> &'static str {
        match self {
            Claim::Law(l) => l.name(),
            Claim::Property(p) => p.name(),
        }
    }
}

/// The laws and properties of a `--laws` list (`none` for no law at all).
fn parse_claim_list(list: &str) -> Result<(Vec<Law>, Vec<Property>), i32> {
    let (mut laws, mut props) = (Vec::new(), Vec::new());
    if list.trim().eq_ignore_ascii_case("none") {
        return Ok((laws, props));
    }
    for name in list.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        match Claim::parse(name) {
            Some(Claim::Law(l)) if !laws.contains(&l) => laws.push(l),
            Some(Claim::Property(p)) if !props.contains(&p) => props.push(p),
            Some(_) => {}
            None => return Err(unknown_claim("--laws", name)),
        }
    }
    Ok((laws, props))
}

fn unknown_claim(option: &str, name: &str) -> i32 {
    let mut known: Vec<&str> = Law::ALL.iter().map(|l| l.name()).collect();
    known.extend(Property::ALL.iter().map(|p| p.name()));
    eprintln!(
        "error: {option}: unknown law `{name}`; known (in any case): {}, or `none` for --laws",
        known.join(", ")
    );
    EXIT_USAGE
}
