//! `bilin bounds INPUT [--json]`: proven lower bounds for the tensor rank.

use super::EXIT_OK;
use super::scheme_io::{fail, load_tensor};
use bilin::ranks::{BoundsParams, lower_bounds};

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
    if a.json {
        let v = serde_json::json!({
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
    EXIT_OK
}
