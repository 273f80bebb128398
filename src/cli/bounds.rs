//! `bilin bounds INPUT [--json] [--scheme FILE]...`: proven lower bounds for the tensor
//! rank, and the interval `lower <= R <= upper` with a verified scheme for the upper side.

use super::EXIT_OK;
use super::scheme_io::{fail, load_tensor};
use bilin::scheme::bounds::{BoundsParams, lower_bounds};

#[derive(clap::Args)]
pub struct Args {
    /// The tensor: a file, a generator spec such as matmul:3,3,3, or a catalog name.
    pub input: String,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
    /// Read the input over this field (Q or GF(p)).
    #[arg(long)]
    pub field: Option<String>,
    /// Seed of the random slice combinations.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// A scheme for the tensor (text or JSON form; repeatable): verified exactly, then
    /// counted among the upper bounds.
    #[arg(long, value_name = "FILE")]
    pub scheme: Vec<String>,
    /// Write the scheme attaining the upper bound to this file (text form for `.txt`,
    /// JSON otherwise).
    #[arg(long, value_name = "FILE")]
    pub out: Option<String>,
}

pub fn run(a: &Args) -> i32 {
    let t = match load_tensor(&a.input, a.field.as_deref()) {
        Ok(t) => t,
        Err(e) => return fail(&e),
    };
    let b = lower_bounds(
        &t,
        &BoundsParams {
            seed: a.seed,
            ..BoundsParams::default()
        },
    );
    let mut given = Vec::new();
    for path in &a.scheme {
        match super::scheme_io::load_scheme(path, &t) {
            Ok(s) => given.push((path.clone(), s)),
            Err(e) => return fail(&e),
        }
    }
    let iv = bilin::report::interval::interval_of(
        &t,
        &b,
        &bilin::interval::UpperParams {
            simultaneous: bilin::decompose::SimultaneousParams {
                seed: a.seed,
                ..Default::default()
            },
            ..Default::default()
        },
        &given,
    );
    if let Some(path) = &a.out {
        let target = match bilin::output::Target::resolve(path) {
            Ok(x) => x,
            Err(e) => return fail(&e),
        };
        if !super::outputs::emit_result(Some(&target), iv.scheme(), &t, false) {
            return super::EXIT_USAGE;
        }
    }
    if a.json {
        let v = serde_json::json!({
            "interval": iv.to_json(),
            "input": a.input,
            "field": t.field().name(),
            "dims": t.dims(),
            "best": b.best(),
            "bounds": b.bounds,
            "notes": b.notes,
        });
        println!("{}", serde_json::to_string_pretty(&v).unwrap_or_default());
        return EXIT_OK;
    }
    let d = t.dims();
    println!(
        "lower bounds for the rank of {} ({}x{}x{}, over {}):",
        a.input,
        d[0],
        d[1],
        d[2],
        t.field().name()
    );
    for line in bilin::report::sections::bounds_lines(&b) {
        println!("  {line}");
    }
    println!("rank interval:");
    for line in iv.lines() {
        println!("  {line}");
    }
    EXIT_OK
}
