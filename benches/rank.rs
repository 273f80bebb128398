//! The rank answer for any tensor: the interval `lower <= R <= upper` and the searches
//! that narrow it, on planted tensors in a user's basis (integer factors, every axis
//! scrambled by an integer change of basis with entries up to 100), random counts, and
//! the standard products (the numerical cases by Levenberg-Marquardt alone, without the
//! stored or built schemes). Prints one table: per input the median over the seeds of the
//! wall time, and beside it the ratio to a reference measured in the same run (one exact
//! verification of the scheme found against the tensor).
//!
//! Run: `cargo bench --bench rank`. `BILIN_BENCH_SEEDS` (default 3) sets the seeds,
//! `BILIN_BENCH_SCALE` (default 1) scales the search time limits of the table
//! (60 s, 10 s, 30 s); `BILIN_BENCH_ONLY` keeps the inputs whose name contains it.

use bilin::decompose::planted::planted;
use bilin::interval::RankInterval;
use bilin::interval::plan::{Plan, known_interval, plan_search};
use bilin::scalar::{FieldSpec, Q};
use bilin::scheme::{Scheme, verify};
use bilin::search::{Method, Params, search_scheme};
use bilin::tensor::{Kind, Tensor};
use rand::{Rng, SeedableRng};
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

fn interval(t: &Tensor) -> RankInterval {
    known_interval(t, &[], 1)
}

fn counts(seed: u64) -> Tensor {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [10, 12, 7], None);
    for i in 0..10 {
        for j in 0..12 {
            for k in 0..7 {
                let v: i64 = [0, 0, 0, 1, 1, 2, 3, 5, 8, 13][rng.gen_range(0..10)];
                if v != 0 {
                    t.set(i, j, k, Q::from_integer(v.into()));
                }
            }
        }
    }
    t
}

/// One measured run: seconds, the reference seconds, and what was found.
struct Run {
    secs: f64,
    reference: f64,
    found: String,
}

fn reference(t: &Tensor, s: &bilin::scheme::Scheme) -> f64 {
    let t0 = Instant::now();
    assert!(verify(s, t).is_ok());
    t0.elapsed().as_secs_f64().max(1e-6)
}

fn interval_run(t: &Tensor) -> Run {
    let t0 = Instant::now();
    let iv = interval(t);
    let secs = t0.elapsed().as_secs_f64();
    let found = match iv.exact {
        Some(r) => format!("R = {r}"),
        None => format!("{} <= R <= {}", iv.lower.value, iv.upper.value),
    };
    Run {
        secs,
        reference: reference(t, iv.scheme()),
        found,
    }
}

/// Search below the interval's upper bound for `target` (None: improve) with `method`
/// for at most `secs`, planned by the library's one planner.
fn search_run(t: &Tensor, target: Option<usize>, method: Method, secs: f64, seed: u64) -> Run {
    let t0 = Instant::now();
    let iv = interval(t);
    let params = Params {
        target_rank: target,
        time_limit: Some(Duration::from_secs_f64(secs)),
        seed,
        threads: 2,
        method,
        ..Params::default()
    };
    let start = match plan_search(t, &params, &iv).expect("a plan") {
        Plan::Known { scheme, .. } | Plan::Refuse { known: scheme, .. } => {
            return Run {
                secs: t0.elapsed().as_secs_f64(),
                reference: reference(t, &scheme),
                found: format!("rank {} (known)", scheme.rank()),
            };
        }
        Plan::Search { start, .. } => start,
    };
    let stop = Arc::new(AtomicBool::new(false));
    let o = search_scheme(t, &params, &stop, Some(start), &|_| {}).expect("search");
    let best = o.best.expect("a start scheme");
    let secs_taken = t0.elapsed().as_secs_f64();
    Run {
        secs: secs_taken,
        reference: reference(t, &best),
        found: format!(
            "rank {}{} (upper before: {})",
            best.rank(),
            if o.reached {
                ""
            } else {
                ", target not reached"
            },
            iv.upper.value
        ),
    }
}

/// The numerical route alone for `target`: Levenberg-Marquardt from random starts, no
/// known or stored scheme, for at most `secs`.
fn numeric_run(t: &Tensor, target: usize, secs: f64, seed: u64) -> Run {
    let t0 = Instant::now();
    let params = Params {
        target_rank: Some(target),
        time_limit: Some(Duration::from_secs_f64(secs)),
        seed,
        threads: 2,
        method: Method::Lm,
        known_start: false,
        ..Params::default()
    };
    let stop = Arc::new(AtomicBool::new(false));
    let o = search_scheme(t, &params, &stop, None, &|_| {}).expect("search");
    let secs = t0.elapsed().as_secs_f64();
    match o.best {
        Some(best) => Run {
            secs,
            reference: reference(t, &best),
            found: format!(
                "rank {}{}",
                best.rank(),
                if o.reached {
                    ""
                } else {
                    ", target not reached"
                }
            ),
        },
        None => Run {
            secs,
            reference: reference(t, &Scheme::standard(t)),
            found: "none".into(),
        },
    }
}

fn median(mut xs: Vec<f64>) -> f64 {
    xs.sort_by(|a, b| a.total_cmp(b));
    xs[xs.len() / 2]
}

fn main() {
    let seeds: u64 = std::env::var("BILIN_BENCH_SEEDS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(3);
    let scale: f64 = std::env::var("BILIN_BENCH_SCALE")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(1.0);
    type Case = (String, String, Box<dyn Fn(u64) -> Run>);
    let mut cases: Vec<Case> = Vec::new();
    for (dims, r) in [
        ([6, 5, 4], 3),
        ([8, 8, 8], 5),
        ([10, 12, 7], 8),
        ([10, 10, 10], 10),
    ] {
        let target = if r == 10 { "< 5 s" } else { "< 2 s" };
        cases.push((
            format!("planted rank {r} in {}x{}x{}", dims[0], dims[1], dims[2]),
            format!("exact rank {target}"),
            Box::new(move |seed| interval_run(&planted(dims, r, 100, seed).0)),
        ));
    }
    cases.push((
        "planted rank 14 in 10x10x10".into(),
        "rank in < 60 s, or interval".into(),
        Box::new(move |seed| {
            search_run(
                &planted([10, 10, 10], 14, 100, seed).0,
                Some(14),
                Method::Auto,
                60.0 * scale,
                seed,
            )
        }),
    ));
    // above every dimension in small arrays: the walks reach the rank mod 2 at once and
    // cannot lift, the fits must find it
    for (dims, r) in [([4, 5, 6], 9), ([5, 6, 6], 10), ([6, 6, 6], 11)] {
        cases.push((
            format!("planted rank {r} in {}x{}x{}", dims[0], dims[1], dims[2]),
            "rank in < 30 s, or interval".into(),
            Box::new(move |seed| {
                search_run(
                    &planted(dims, r, 10, seed).0,
                    Some(r),
                    Method::Auto,
                    30.0 * scale,
                    seed,
                )
            }),
        ));
    }
    cases.push((
        "10x12x7 random counts: interval".into(),
        "at once".into(),
        Box::new(|seed| interval_run(&counts(seed))),
    ));
    cases.push((
        "10x12x7 random counts: search".into(),
        "upper < slice bound in 60 s".into(),
        Box::new(move |seed| {
            // a target one below the slice bound
            let t = counts(seed);
            let below = bilin::decompose::slice_decomposition(&t).0.rank() - 1;
            search_run(&t, Some(below), Method::Auto, 60.0 * scale, seed)
        }),
    ));
    for (spec, r, limit, method) in [
        ("matmul:2,2,3", 11, 10.0, Method::Lm),
        ("matmul:3,3,3", 23, 60.0, Method::Lm),
        ("poly:3,4", 6, 30.0, Method::Auto),
        ("poly:4,4", 7, 30.0, Method::Auto),
    ] {
        let label = if method == Method::Lm {
            "numerical route"
        } else {
            "auto"
        };
        cases.push((
            format!("{spec} at {r} ({label})"),
            format!("< {limit} s"),
            Box::new(move |seed| {
                let t = bilin::input::load_input(spec, None).expect("generator");
                if method == Method::Lm {
                    numeric_run(&t, r, limit * scale, seed)
                } else {
                    search_run(&t, Some(r), method, limit * scale, seed)
                }
            }),
        ));
    }
    let only = std::env::var("BILIN_BENCH_ONLY").unwrap_or_default();
    cases.retain(|c| c.0.contains(&only));
    println!("| input | target | median time (s) | ratio to one verification | found (per seed) |");
    println!("|---|---|---|---|---|");
    for (name, target, f) in &cases {
        let runs: Vec<Run> = (1..=seeds).map(f).collect();
        let secs = median(runs.iter().map(|r| r.secs).collect());
        let ratio = median(runs.iter().map(|r| r.secs / r.reference).collect());
        let found: Vec<String> = runs.iter().map(|r| r.found.clone()).collect();
        println!(
            "| {name} | {target} | {secs:.3} | {ratio:.0} | {} |",
            found.join("; ")
        );
    }
}
