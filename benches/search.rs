//! Search benchmarks: medians over seeds of the time to an exactly verified scheme, and the
//! flip-walk throughput. A plain `main` (harness = false): each case is a whole search, far
//! too long for statistical repetition.
//!
//! Run: `cargo bench --bench search -- [CASE...]` with CASE among strassen, small, m333,
//! als, gf4, poly, throughput, records, walks (default: all but m333, records and walks). `SEEDS=n` sets
//! the seeds per case.
//!
//! `records` prints the record table of docs/benchmarks.md: per matrix format <n,m,p> with
//! n <= m <= p <= 5, the best published ranks over Q and GF(2) (from the catalog, with
//! sources), then a search over Q (walks over GF(2), lifted 2-adically, 2 threads) with a
//! budget of `RECORD_SECS` seconds per format (default 20), stopping at the published rank
//! over Q. The best scheme built from the catalog's stored schemes (`bilin::scheme::build`)
//! is known first, so a format whose stored or built scheme is at the published rank takes
//! no time; the walks go down from the schoolbook scheme (the default walk start). `RECORD_OUT=dir` writes each best scheme there as `matmulNMP.txt`.

use bilin::scalar::{FieldSpec, Q, q};
use bilin::scheme::verify;
use bilin::search::flip::{BitScheme, FlipParams, WalkEvent, WalkState, Walker, walk_state};
use bilin::search::{Method, Params, search_scheme};
use bilin::tensor::{Kind, Tensor};
use num_traits::One;
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

fn matmul(n: usize, m: usize, p: usize) -> Tensor {
    let mut t = Tensor::zero(
        FieldSpec::Rational,
        Kind::Bilinear,
        [n * m, m * p, n * p],
        None,
    );
    for i in 0..n {
        for l in 0..m {
            for j in 0..p {
                t.set(i * m + l, l * p + j, i * p + j, Q::one());
            }
        }
    }
    t
}

fn poly(m: usize, n: usize) -> Tensor {
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [m, n, m + n - 1], None);
    for i in 0..m {
        for j in 0..n {
            t.set(i, j, i + j, Q::one());
        }
    }
    t
}

fn complex() -> Tensor {
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [2, 2, 2], None);
    t.set(0, 0, 0, q(1, 1));
    t.set(1, 1, 0, q(-1, 1));
    t.set(0, 1, 1, q(1, 1));
    t.set(1, 0, 1, q(1, 1));
    t
}

fn gf4() -> Tensor {
    let mut t = Tensor::zero(FieldSpec::Prime(2), Kind::Bilinear, [2, 2, 2], None);
    for (i, j, k) in [(0, 0, 0), (0, 1, 1), (1, 0, 1), (1, 1, 0), (1, 1, 1)] {
        t.set(i, j, k, q(1, 1));
    }
    t
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    if v.is_empty() {
        f64::NAN
    } else {
        v[v.len() / 2]
    }
}

/// Time to a verified scheme of rank `r` for each seed; prints median and success count.
fn case(name: &str, t: &Tensor, method: Method, r: usize, seeds: u64, threads: usize, limit: f64) {
    let mut times = Vec::new();
    let mut ok = 0;
    for seed in 0..seeds {
        let p = Params {
            target_rank: Some(r),
            method,
            seed,
            threads,
            time_limit: Some(Duration::from_secs_f64(limit)),
            // the walk itself is measured: from the standard scheme
            known_start: false,
            ..Params::default()
        };
        let stop = Arc::new(AtomicBool::new(false));
        let t0 = Instant::now();
        let o = search_scheme(t, &p, &stop, None, &|_| {}).expect("search");
        let dt = t0.elapsed().as_secs_f64();
        let good = o.best.as_ref().is_some_and(|s| {
            s.rank() <= r && {
                let g = if s.field == t.field() {
                    t.clone()
                } else {
                    t.with_field(s.field).unwrap()
                };
                verify(s, &g).is_ok()
            }
        });
        if good {
            ok += 1;
            times.push(dt);
        }
    }
    println!(
        "{name:<34} rank {r:>2} {:<5} threads {threads}  success {ok}/{seeds}  median {:.4} s  (limit {limit} s)",
        format!("{method:?}"),
        median(times)
    );
}

/// CPU time of this thread in seconds (Linux: /proc/thread-self/stat, utime + stime in
/// clock ticks of 1/100 s); `None` elsewhere.
fn thread_cpu_seconds() -> Option<f64> {
    let st = std::fs::read_to_string("/proc/thread-self/stat").ok()?;
    let rest = &st[st.rfind(')')? + 2..];
    let f: Vec<&str> = rest.split_whitespace().collect();
    let ut: f64 = f.get(11)?.parse().ok()?;
    let stt: f64 = f.get(12)?.parse().ok()?;
    Some((ut + stt) / 100.0)
}

fn throughput() {
    let t = matmul(4, 4, 4);
    let s = BitScheme::standard(&t).expect("bits");
    let mut w = Walker::<1>::new(&s, 1);
    let t0 = Instant::now();
    let c0 = thread_cpu_seconds();
    let mut moves = 0u64;
    while t0.elapsed() < Duration::from_secs(5) {
        for _ in 0..100_000 {
            w.flip();
        }
        moves += 100_000;
        // stay on the plateau near the start rank: reload if the walk reduced far
        if w.rank() < 56 {
            w.load(&s);
        }
    }
    let dt = t0.elapsed().as_secs_f64();
    let cpu = c0.zip(thread_cpu_seconds()).map(|(a, b)| b - a);
    let per_cpu = cpu.map_or("no CPU clock".into(), |c| {
        format!(
            "{:.2e} moves per CPU second ({c:.2} CPU s in {dt:.2} s)",
            moves as f64 / c
        )
    });
    println!(
        "flip throughput <4,4,4> GF(2), 1 thread: {:.2e} moves per wall second, {per_cpu} (rank now {})",
        moves as f64 / dt,
        w.rank()
    );
}

/// The lowest `rank.upper` of a catalog entry over a domain, with its source.
fn published(entry: &str, domain: &str) -> Option<(usize, String)> {
    let e = bilin::catalog::find_entry(entry)?;
    e.meta
        .facts
        .iter()
        .filter(|f| f.key == "rank.upper" && f.domain.as_deref() == Some(domain))
        .filter_map(|f| Some((f.value.parse::<usize>().ok()?, f.source.clone())))
        .min_by_key(|x| x.0)
}

/// Short form of a source: its first words up to the year.
fn short_source(s: &str) -> String {
    let words: Vec<&str> = s.split_whitespace().collect();
    let end = words
        .iter()
        .position(|w| {
            w.trim_end_matches(',')
                .parse::<u32>()
                .is_ok_and(|y| y > 1900)
        })
        .map_or(words.len().min(4), |i| i + 1);
    words[..end].join(" ").trim_end_matches(',').to_string()
}

fn records() {
    let secs: f64 = std::env::var("RECORD_SECS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(20.0);
    let out = std::env::var("RECORD_OUT").ok();
    println!(
        "| format | published over Q/Z | published over GF(2) | bilin over Z | time (s) | bilin over Q | bilin over GF(2) | seed |"
    );
    println!("|---|---|---|---|---|---|---|---|");
    for n in 2..=5 {
        for m in n..=5 {
            for p in m..=5 {
                let name = format!("matmul{n}{m}{p}");
                let t = matmul(n, m, p);
                let q = published(&name, "Q");
                let g = published(&name, "GF(2)");
                let show = |x: &Option<(usize, String)>| {
                    x.as_ref().map_or("-".to_string(), |(r, s)| {
                        format!("{r} ({})", short_source(s))
                    })
                };
                // the search over Z (integer coefficients only), stopping at the
                // published rank over Q
                let params = Params {
                    target_rank: q.as_ref().map(|x| x.0),
                    time_limit: Some(Duration::from_secs_f64(secs)),
                    seed: 1,
                    threads: 2,
                    integral: true,
                    ..Params::default()
                };
                let stop = Arc::new(AtomicBool::new(false));
                let o = search_scheme(&t, &params, &stop, None, &|_| {}).expect("search");
                let z = o.best.as_ref().map(|s| {
                    assert!(verify(s, &t).is_ok() && bilin::search::hensel::is_integral(s));
                    s.rank()
                });
                // over Q and over GF(2): the best of that and the schemes built from the
                // stored ones (no search)
                let known = |f: FieldSpec| {
                    let g = t.with_field(f).ok()?;
                    let s = bilin::search::known_start(&g, None, false)?;
                    verify(&s, &g).is_ok().then(|| s.rank())
                };
                let show_rank = |r: Option<usize>| r.map_or("-".to_string(), |r| r.to_string());
                let over_q = [z, known(FieldSpec::Rational)].into_iter().flatten().min();
                let over_2 = [z, known(FieldSpec::Prime(2))].into_iter().flatten().min();
                if let (Some(dir), Some(s)) = (&out, &o.best) {
                    let path = format!("{dir}/{name}.txt");
                    let title = format!(
                        "found by bilin search matmul:{n},{m},{p} --rank {} --ring Z --seed 1 --threads 2 --time {secs}",
                        s.rank()
                    );
                    std::fs::write(&path, bilin::scheme::write_for_path(&path, s, &t, &title))
                        .expect("write");
                }
                println!(
                    "| <{n},{m},{p}> | {} | {} | {} | {:.1} | {} | {} | 1 |",
                    show(&q),
                    show(&g),
                    show_rank(z),
                    o.elapsed.as_secs_f64(),
                    show_rank(over_q),
                    show_rank(over_2),
                );
            }
        }
    }
}

/// The walker with the reductions of every move only (no dependent products at plateaus).
struct PairsOnly(Walker<1>);

impl WalkState for PairsOnly {
    type Snap = BitScheme;
    fn flip(&mut self) -> bool {
        self.0.flip()
    }
    fn plus(&mut self) -> bool {
        self.0.plus()
    }
    fn rank(&self) -> usize {
        self.0.rank()
    }
    fn snap(&self) -> BitScheme {
        self.0.scheme()
    }
    fn restore(&mut self, s: &BitScheme) {
        self.0.load(s)
    }
}

/// Single walks over GF(2) from the schoolbook scheme of `WALK` (e.g. `4,4,4`, axes up to
/// 64), `WALK_SECS` seconds each (default 30), seeds 1..=SEEDS, `PLATEAU` and `MAX_EXCESS`
/// as in `bilin search`, `REDUCE=pairs` to leave out the reductions by dependent products:
/// the lowest rank of each walk and when it was reached (`WALK_TRACE=1`: every new lowest
/// rank).
fn walks(seeds: u64) {
    let env = |k: &str| std::env::var(k).ok();
    let fmt = env("WALK").unwrap_or_else(|| "4,4,4".into());
    let d: Vec<usize> = fmt.split(',').filter_map(|x| x.parse().ok()).collect();
    let secs: f64 = env("WALK_SECS")
        .and_then(|s| s.parse().ok())
        .unwrap_or(30.0);
    let mut params = FlipParams::default();
    if let Some(v) = env("PLATEAU").and_then(|s| s.parse().ok()) {
        params.plateau = v;
    }
    if let Some(v) = env("MAX_EXCESS").and_then(|s| s.parse().ok()) {
        params.max_excess = v;
    }
    let pairs_only = env("REDUCE").as_deref() == Some("pairs");
    let trace = env("WALK_TRACE").is_some();
    let t = matmul(d[0], d[1], d[2]);
    let start = BitScheme::standard(&t).expect("a format with axes up to 64");
    let mut lows = Vec::new();
    for seed in 1..=seeds {
        let t0 = Instant::now();
        let (mut low, mut at, mut moves, mut at_moves) = (start.rank(), 0.0, 0u64, 0u64);
        let mut event = |e: WalkEvent<BitScheme>| match e {
            WalkEvent::Candidate(b) => {
                (low, at, at_moves) = (b.rank(), t0.elapsed().as_secs_f64(), moves);
                if trace {
                    println!("  rank {low} after {moves:.2e} moves");
                }
                false
            }
            WalkEvent::Moves(m) => {
                moves += m;
                t0.elapsed().as_secs_f64() > secs
            }
        };
        if pairs_only {
            let mut w = PairsOnly(Walker::<1>::new(&start, seed));
            walk_state(&mut w, 0, &params, u64::MAX, &mut event);
        } else {
            let mut w = Walker::<1>::new(&start, seed);
            walk_state(&mut w, 0, &params, u64::MAX, &mut event);
        }
        println!(
            "walk <{fmt}> seed {seed}: lowest rank {low} at {at:.1} s ({at_moves:.2e} moves), {moves:.2e} moves in all"
        );
        lows.push(low as f64);
    }
    println!(
        "walk <{fmt}> {}: median lowest rank {} over {seeds} seeds, {secs} s each",
        if pairs_only {
            "pairs only"
        } else {
            "with dependent products"
        },
        median(lows)
    );
}

fn main() {
    let args: Vec<String> = std::env::args()
        .skip(1)
        .filter(|a| !a.starts_with('-'))
        .collect();
    let want = |c: &str| {
        if args.is_empty() {
            c != "m333" && c != "records" && c != "walks"
        } else {
            args.iter().any(|a| a == c)
        }
    };
    let seeds: u64 = std::env::var("SEEDS")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(10);
    if want("walks") {
        walks(seeds);
    }
    if want("strassen") {
        case(
            "<2,2,2> flip GF(2) + lift to Q",
            &matmul(2, 2, 2),
            Method::Flip,
            7,
            seeds,
            1,
            10.0,
        );
        case(
            "<2,2,2> ALS + rounding",
            &matmul(2, 2, 2),
            Method::Als,
            7,
            seeds,
            1,
            60.0,
        );
    }
    if want("small") {
        case(
            "<2,2,3> flip + lift",
            &matmul(2, 2, 3),
            Method::Flip,
            11,
            seeds,
            1,
            60.0,
        );
        case(
            "<2,3,3> flip + lift",
            &matmul(2, 3, 3),
            Method::Flip,
            15,
            seeds,
            1,
            60.0,
        );
        case(
            "<2,2,4> flip + lift",
            &matmul(2, 2, 4),
            Method::Flip,
            14,
            seeds,
            1,
            60.0,
        );
    }
    if want("als") {
        case("complex ALS", &complex(), Method::Als, 3, seeds, 1, 10.0);
        case(
            "poly 3x3 Levenberg-Marquardt",
            &poly(3, 3),
            Method::Lm,
            5,
            seeds,
            1,
            30.0,
        );
    }
    if want("gf4") {
        case(
            "GF(4) over GF(2) flip",
            &gf4(),
            Method::Flip,
            3,
            seeds,
            1,
            10.0,
        );
    }
    if want("m333") {
        case(
            "<3,3,3> flip + lift",
            &matmul(3, 3, 3),
            Method::Flip,
            23,
            seeds,
            2,
            300.0,
        );
    }
    if want("poly") {
        // Toom 1963; Cook 1966: rank m + n - 1 by evaluation and interpolation
        for (m, n) in [
            (3, 4),
            (4, 4),
            (5, 5),
            (6, 6),
            (6, 7),
            (7, 7),
            (7, 8),
            (8, 8),
        ] {
            let name = format!("poly {m}x{n} Levenberg-Marquardt");
            case(&name, &poly(m, n), Method::Lm, m + n - 1, seeds, 2, 60.0);
        }
    }
    if want("records") {
        records();
    }
    if want("throughput") {
        throughput();
    }
}
