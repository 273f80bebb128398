//! `bilin search`: look for a low-rank scheme of a tensor; `bilin merge` lives in merge.rs.
//!
//! Parses arguments, builds `search::Params`, installs the Ctrl-C handler (which sets the
//! stop flag so the best scheme found is still written), renders progress on stderr when
//! it is a terminal, and writes checkpoints and the result atomically.

use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::scalar::{FieldSpec, Q, parse_rational};
use bilin::search::json::{Checkpoint, checkpoint_from_json, checkpoint_to_json, scheme_to_json, write_atomic};
use bilin::search::{Method, Params, Progress, search_scheme};
use bilin::tensor::{Kind, Tensor};
use clap::Args;
use std::io::IsTerminal;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};

#[derive(Args)]
pub struct SearchArgs {
    /// The tensor: a coordinate JSON file, or `matmul:N,M,P`, `poly:M,N`, `complex`, `gf4`.
    pub input: String,
    /// Target rank: stop when a verified scheme of at most this rank is found.
    #[arg(long)]
    pub rank: Option<usize>,
    /// Search engine: `flip` (GF(2) flip graph, lifted to Q) or `als` (numerical, over Q).
    #[arg(long, default_value = "flip")]
    pub method: String,
    /// Field the scheme must hold over (default: the tensor's field), e.g. `GF(2)`.
    #[arg(long)]
    pub field: Option<String>,
    /// Time limit in seconds.
    #[arg(long)]
    pub time: Option<f64>,
    #[arg(long, default_value_t = 0)]
    pub seed: u64,
    /// Worker threads (0: all cores).
    #[arg(long, default_value_t = 0)]
    pub threads: usize,
    /// Number of runs (random starts / walks) in this job.
    #[arg(long)]
    pub restarts: Option<u64>,
    /// Write the best scheme here (JSON); default: standard output.
    #[arg(long)]
    pub out: Option<String>,
    /// Resume from a checkpoint (or start from a scheme file).
    #[arg(long)]
    pub resume: Option<String>,
    /// Checkpoint file (default: OUT.checkpoint.json when --out is given).
    #[arg(long)]
    pub checkpoint: Option<String>,
    /// Run only shard K of N (runs numbered K mod N), e.g. `--shard 3/100`.
    #[arg(long)]
    pub shard: Option<String>,
}

fn usage(msg: impl std::fmt::Display) -> i32 {
    eprintln!("bilin search: {msg}");
    EXIT_USAGE
}

/// Read a tensor: a coordinate JSON file (docs/formats.md, section 2) or a small built-in.
pub(crate) fn load_tensor(input: &str) -> Result<Tensor, String> {
    if std::path::Path::new(input).exists() {
        let text = std::fs::read_to_string(input).map_err(|e| format!("cannot read {input}: {e}"))?;
        return tensor_from_json(&text).map_err(|e| format!("{input}: {e}"));
    }
    let nums = |s: &str| -> Result<Vec<usize>, String> {
        s.split(',').map(|x| x.trim().parse::<usize>().map_err(|_| format!("expected sizes, found `{s}`"))).collect()
    };
    let one = Q::from_integer(1.into());
    let (name, args) = input.split_once(':').unwrap_or((input, ""));
    match name {
        "matmul" => {
            let v = nums(args)?;
            let [n, m, p] = v[..] else { return Err("matmul:N,M,P needs three sizes".into()) };
            if n * m * p == 0 || n * m > 4096 || m * p > 4096 || n * p > 4096 {
                return Err("matmul sizes out of range".into());
            }
            let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [n * m, m * p, n * p], None);
            for i in 0..n {
                for l in 0..m {
                    for j in 0..p {
                        t.set(i * m + l, l * p + j, i * p + j, one.clone());
                    }
                }
            }
            Ok(t)
        }
        "poly" => {
            let v = nums(args)?;
            let [m, n] = v[..] else { return Err("poly:M,N needs two sizes".into()) };
            if m * n == 0 || m > 4096 || n > 4096 {
                return Err("poly sizes out of range".into());
            }
            let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [m, n, m + n - 1], None);
            for i in 0..m {
                for j in 0..n {
                    t.set(i, j, i + j, one.clone());
                }
            }
            Ok(t)
        }
        "complex" | "gf4" => {
            let field = if name == "gf4" { FieldSpec::Prime(2) } else { FieldSpec::Rational };
            let mut t = Tensor::zero(field, Kind::Bilinear, [2, 2, 2], None);
            t.set(0, 0, 0, one.clone());
            t.set(0, 1, 1, one.clone());
            t.set(1, 0, 1, one.clone());
            t.set(1, 1, 0, if name == "gf4" { one.clone() } else { -one.clone() });
            if name == "gf4" {
                t.set(1, 1, 1, one);
            }
            Ok(t)
        }
        _ => Err(format!("no file and no built-in named `{input}`")),
    }
}

fn tensor_from_json(text: &str) -> Result<Tensor, String> {
    let v: serde_json::Value = serde_json::from_str(text).map_err(|e| format!("not valid JSON: {e}"))?;
    let field = match v.get("field").and_then(|x| x.as_str()) {
        Some(f) => FieldSpec::parse(f)?,
        None => FieldSpec::Rational,
    };
    let dims: Vec<usize> = v
        .get("dims")
        .and_then(|d| d.as_array())
        .ok_or("missing \"dims\"")?
        .iter()
        .map(|x| x.as_u64().map(|n| n as usize).ok_or("dimensions must be integers"))
        .collect::<Result<_, _>>()?;
    let [a, b, c] = dims[..] else { return Err("\"dims\" must have three entries".into()) };
    if [a, b, c].iter().any(|&d| d == 0 || d > bilin::tensor::MAX_DIM) {
        return Err("dimensions must be 1..=4096".into());
    }
    let mut t = Tensor::zero(field, Kind::Bilinear, [a, b, c], None);
    for e in v.get("entries").and_then(|x| x.as_array()).ok_or("missing \"entries\"")? {
        let e = e.as_array().filter(|x| x.len() == 4).ok_or("an entry is [i, j, k, \"p/q\"]")?;
        let idx: Vec<usize> = e[..3].iter().map(|x| x.as_u64().map(|n| n as usize)).collect::<Option<_>>().ok_or("indices must be integers")?;
        if idx[0] >= a || idx[1] >= b || idx[2] >= c {
            return Err(format!("entry index {idx:?} out of range {:?}", [a, b, c]));
        }
        let val = match &e[3] {
            serde_json::Value::String(s) => parse_rational(s)?,
            serde_json::Value::Number(n) if n.is_i64() => Q::from_integer(n.as_i64().unwrap_or(0).into()),
            x => return Err(format!("coefficient {x} is not \"p/q\"")),
        };
        if let FieldSpec::Prime(p) = field
            && bilin::scalar::PrimeField::new(p).is_some_and(|f| f.denominator_vanishes(&val))
        {
            return Err(format!("coefficient {val} has no value mod {p}"));
        }
        t.set(idx[0], idx[1], idx[2], val);
    }
    Ok(t)
}

fn parse_shard(s: &str) -> Result<(u64, u64), String> {
    let (k, n) = s.split_once('/').ok_or_else(|| format!("expected K/N, found `{s}`"))?;
    let k: u64 = k.trim().parse().map_err(|_| format!("expected K/N, found `{s}`"))?;
    let n: u64 = n.trim().parse().map_err(|_| format!("expected K/N, found `{s}`"))?;
    if n == 0 || k >= n {
        return Err(format!("shard {k}/{n}: need 0 <= K < N"));
    }
    Ok((k, n))
}

pub fn run(a: SearchArgs) -> i32 {
    let t = match load_tensor(&a.input) {
        Ok(t) => t,
        Err(e) => return usage(e),
    };
    let method = match a.method.as_str() {
        "flip" => Method::Flip,
        "als" => Method::Als,
        m => return usage(format!("unknown method `{m}` (expected flip or als)")),
    };
    let field = match a.field.as_deref().map(FieldSpec::parse).transpose() {
        Ok(f) => f,
        Err(e) => return usage(e),
    };
    let shard = match a.shard.as_deref().map(parse_shard).transpose() {
        Ok(s) => s.unwrap_or((0, 1)),
        Err(e) => return usage(e),
    };
    if a.time.is_some_and(|x| !(x.is_finite() && x >= 0.0)) {
        return usage("--time must be a nonnegative number of seconds");
    }
    let resumed = match &a.resume {
        None => None,
        Some(path) => match std::fs::read_to_string(path).map_err(|e| e.to_string()).and_then(|s| checkpoint_from_json(&s).map_err(|e| e.to_string())) {
            Ok(c) => Some(c),
            Err(e) => return usage(format!("{path}: {e}")),
        },
    };
    let params = Params {
        target_rank: a.rank,
        time_limit: a.time.map(Duration::from_secs_f64),
        seed: a.seed,
        threads: a.threads,
        restarts: a.restarts,
        method,
        field,
        shard,
        first_run: resumed.as_ref().map_or(0, |c| c.next_run),
        ..Params::default()
    };
    let stop = Arc::new(AtomicBool::new(false));
    {
        let s = stop.clone();
        let _ = ctrlc::set_handler(move || s.store(true, Ordering::SeqCst));
    }
    let ckpt_path = a.checkpoint.clone().or_else(|| a.out.as_ref().map(|o| format!("{o}.checkpoint.json")));
    let tty = std::io::stderr().is_terminal();
    let last_ckpt = std::sync::Mutex::new(Instant::now());
    let last_moves = std::sync::Mutex::new((Duration::ZERO, 0u64));
    let write_ckpt = |p: &Progress| {
        if let Some(path) = &ckpt_path {
            let c = Checkpoint { seed: a.seed, shard, next_run: p.next_run, best: p.best.clone() };
            if let Err(e) = write_atomic(path, &checkpoint_to_json(&c).to_string()) {
                eprintln!("bilin search: {e}");
            }
        }
    };
    let progress = |p: &Progress| {
        if tty {
            let mut lm = last_moves.lock().expect("lock");
            let dt = (p.elapsed - lm.0).as_secs_f64().max(1e-9);
            let rate = (p.moves - lm.1) as f64 / dt;
            *lm = (p.elapsed, p.moves);
            let best = p.best.as_ref().map_or("-".to_string(), |s| s.rank().to_string());
            eprint!("\rbest rank {best}  moves {:.3e}  {:.2e} moves/s  elapsed {:.1}s   ", p.moves as f64, rate, p.elapsed.as_secs_f64());
        }
        let mut lc = last_ckpt.lock().expect("lock");
        if lc.elapsed() >= Duration::from_secs(10) {
            *lc = Instant::now();
            write_ckpt(p);
        }
    };
    let start = resumed.and_then(|c| c.best);
    let outcome = match search_scheme(&t, &params, &stop, start, &progress) {
        Ok(o) => o,
        Err(e) => return usage(e),
    };
    if tty {
        eprintln!();
    }
    write_ckpt(&Progress { best: outcome.best.clone(), moves: outcome.moves, next_run: outcome.next_run, elapsed: outcome.elapsed });
    match &outcome.best {
        Some(s) => {
            let text = format!("{}\n", scheme_to_json(s));
            match &a.out {
                Some(path) => {
                    if let Err(e) = write_atomic(path, &text) {
                        eprintln!("bilin search: {e}");
                        return EXIT_USAGE;
                    }
                }
                None => print!("{text}"),
            }
            eprintln!(
                "bilin search: best verified rank {} over {} ({:.2} s, {} moves)",
                s.rank(),
                s.field.name(),
                outcome.elapsed.as_secs_f64(),
                outcome.moves
            );
        }
        None => eprintln!("bilin search: no verified scheme found"),
    }
    if outcome.reached || (a.rank.is_none() && outcome.best.is_some()) { EXIT_OK } else { EXIT_FALSE }
}
