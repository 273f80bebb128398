//! Times every invariant of the given inputs (files, generator specs), one run each:
//! `cargo run --release --example invariants_timing -- matrix:4 octonions FILE.json`.
//! Prints one line per input: total seconds and the seconds of each part.
use bilin::input::load_input;
use bilin::report::invariants::{InvariantParams, Part, invariants_report};

fn main() {
    let mut args: Vec<String> = std::env::args().skip(1).collect();
    let mut only = None;
    if let Some(pos) = args.iter().position(|a| a == "--only") {
        only = Some(Part::parse_list(&args[pos + 1]).expect("--only list"));
        args.drain(pos..pos + 2);
    }
    for spec in args {
        let t = load_input(&spec, None).expect("input");
        let params = InvariantParams {
            only: only.clone(),
            omit_bases: true,
            ..Default::default()
        };
        let start = std::time::Instant::now();
        let r = invariants_report(&t, &params, &mut |_| {}).expect("invariants");
        let total = start.elapsed().as_secs_f64();
        let parts: Vec<String> = r
            .seconds
            .iter()
            .map(|(l, s)| format!("{l} {s:.3}"))
            .collect();
        let dims = format!(
            "der {:?} centroid {:?} centre {:?}",
            r.derivations.as_ref().map(|d| d.space.dim),
            r.centroid.as_ref().map(|c| c.space.dim),
            r.centre.as_ref().map(|c| c.dim)
        );
        println!(
            "{spec} (dim {}): total {total:.3} s | {} | {dims}",
            t.dim(),
            parts.join(", ")
        );
    }
}
