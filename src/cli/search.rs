//! `bilin search`: look for a low-rank scheme of a tensor; `bilin merge` lives in merge.rs.
//!
//! Parses arguments, builds `search::Params`, installs the Ctrl-C handler (which sets the
//! stop flag so the best scheme found is still written), renders progress on stderr when
//! it is a terminal, and writes checkpoints and the result atomically.

use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::search::json::{
    Checkpoint, checkpoint_from_json, checkpoint_to_json, scheme_to_json, write_atomic,
};
use bilin::search::{Method, Params, Progress, search_scheme};
use clap::Args;
use std::io::IsTerminal;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};

#[derive(Args)]
pub struct SearchArgs {
    /// The tensor: a file, a generator (`matmul:2,2,2`, `poly:3,3`, `complex`, ...) or a
    /// catalog name.
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
    /// Write the best scheme here (the text form for a `.txt` name, JSON otherwise);
    /// default: standard output (JSON).
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

fn parse_shard(s: &str) -> Result<(u64, u64), String> {
    let (k, n) = s
        .split_once('/')
        .ok_or_else(|| format!("expected K/N, found `{s}`"))?;
    let k: u64 = k
        .trim()
        .parse()
        .map_err(|_| format!("expected K/N, found `{s}`"))?;
    let n: u64 = n
        .trim()
        .parse()
        .map_err(|_| format!("expected K/N, found `{s}`"))?;
    if n == 0 || k >= n {
        return Err(format!("shard {k}/{n}: need 0 <= K < N"));
    }
    Ok((k, n))
}

pub fn run(a: SearchArgs) -> i32 {
    // over another field (e.g. GF(2)) the tensor is read reduced into it, so the scheme
    // is searched and verified there
    let t = match super::common::load(&a.input, a.field.as_deref()) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let method = match a.method.as_str() {
        "flip" => Method::Flip,
        "als" => Method::Als,
        m => return usage(format!("unknown method `{m}` (expected flip or als)")),
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
        Some(path) => match std::fs::read_to_string(path)
            .map_err(|e| e.to_string())
            .and_then(|s| checkpoint_from_json(&s).map_err(|e| e.to_string()))
        {
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
        field: None,
        shard,
        first_run: resumed.as_ref().map_or(0, |c| c.next_run),
        ..Params::default()
    };
    let stop = Arc::new(AtomicBool::new(false));
    {
        let s = stop.clone();
        let _ = ctrlc::set_handler(move || s.store(true, Ordering::SeqCst));
    }
    let ckpt_path = a
        .checkpoint
        .clone()
        .or_else(|| a.out.as_ref().map(|o| format!("{o}.checkpoint.json")));
    let tty = std::io::stderr().is_terminal();
    let last_ckpt = std::sync::Mutex::new(Instant::now());
    let last_moves = std::sync::Mutex::new((Duration::ZERO, 0u64));
    let write_ckpt = |p: &Progress| {
        if let Some(path) = &ckpt_path {
            let c = Checkpoint {
                seed: a.seed,
                shard,
                next_run: p.next_run,
                best: p.best.clone(),
            };
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
            let best = p
                .best
                .as_ref()
                .map_or("-".to_string(), |s| s.rank().to_string());
            eprint!(
                "\rbest rank {best}  moves {:.3e}  {:.2e} moves/s  elapsed {:.1}s   ",
                p.moves as f64,
                rate,
                p.elapsed.as_secs_f64()
            );
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
    write_ckpt(&Progress {
        best: outcome.best.clone(),
        moves: outcome.moves,
        next_run: outcome.next_run,
        elapsed: outcome.elapsed,
    });
    match &outcome.best {
        Some(s) => {
            match &a.out {
                Some(path) => {
                    // the text form for X.txt, JSON otherwise
                    let title = format!("found by bilin search for {}, verified exactly", a.input);
                    let text = bilin::scheme::write_for_path(path, s, &t, &title);
                    if let Err(e) = write_atomic(path, &text) {
                        eprintln!("bilin search: {e}");
                        return EXIT_USAGE;
                    }
                }
                None => println!("{}", scheme_to_json(s)),
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
    if outcome.reached || (a.rank.is_none() && outcome.best.is_some()) {
        EXIT_OK
    } else {
        EXIT_FALSE
    }
}
