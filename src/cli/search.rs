//! `bilin search`: look for a low-rank scheme of a tensor; `bilin merge` lives in merge.rs.
//!
//! Parses arguments, restores a checkpoint (its seed and shard included), checks the
//! output files before any work, stops cleanly on SIGINT, SIGTERM and SIGHUP (the best
//! scheme and the checkpoint are still written), writes the checkpoint and any improved
//! result every `--checkpoint-every` seconds, and never loses the final result: when it
//! cannot be written where asked, it goes to standard output. Output files follow
//! `bilin::search::store` (a better result is never replaced unless `--overwrite`).
//! Progress goes to stderr: one overwritten line on a terminal, a line every few seconds
//! in a log, none with `--quiet`.

use super::common::{note, report_error, usage_error};
use super::outputs::OutputFiles;
use super::scheme_io::read_scheme_file;
use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::error::Error;
use bilin::input::read_text_file;
use bilin::interval::plan::{Plan, known_interval, method_name, plan_search};
use bilin::scalar::FieldSpec;
use bilin::search::flip::FlipParams;
use bilin::search::json::{Checkpoint, Saved, parse_saved};
use bilin::search::pool::PoolParams;
use bilin::search::{Method, Params, Progress, Symmetry, WalkStart, search_scheme};
use bilin::tensor::Tensor;
use clap::Args;
use std::io::IsTerminal;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

#[derive(Args)]
pub struct SearchArgs {
    /// The tensor: a file, a generator (`matmul:2,2,2`, `poly:3,3`, `complex`, ...) or a
    /// catalog name.
    pub input: String,
    /// Target rank: stop when a verified scheme of at most this rank is found.
    #[arg(long)]
    pub rank: Option<usize>,
    /// Search engine: `auto` (the default: chosen from the tensor, the choice and its
    /// reason printed), `flip` (flip-graph walks, lifted to Q), `lm` (Levenberg-Marquardt
    /// and rounding, over Q) or `als` (alternating least squares and rounding, over Q).
    #[arg(long, default_value = "auto")]
    pub method: String,
    /// Walk over GF(P) and lift p-adically to Q (default 2); an odd prime finds schemes
    /// whose denominators are even.
    #[arg(long, value_name = "P")]
    pub prime: Option<u64>,
    /// Keep a symmetry in the walks: `cyclic` (square formats matmul:n,n,n) or `none`.
    #[arg(long, default_value = "none")]
    pub symmetry: String,
    /// Where the walks start: `best` (the best known scheme that reduces modulo the walk
    /// prime) or `standard` (the standard scheme; the known scheme stays the result).
    #[arg(long, value_name = "FROM")]
    pub walk_start: Option<String>,
    /// Schemes kept at the lowest rank reached, from which walks restart (0: every walk
    /// starts from the standard scheme).
    #[arg(long, value_name = "N")]
    pub pool: Option<usize>,
    /// A walk ends after this many moves in a row without a new lowest rank (or twice as
    /// many as it took to reach that rank, if more; default 100000000).
    #[arg(long, value_name = "MOVES")]
    pub walk_moves: Option<u64>,
    /// Moves without a lower rank before a plus transition (given, or --max-excess given:
    /// every walk uses these; otherwise each walk draws one of three settings).
    #[arg(long, value_name = "MOVES")]
    pub plateau: Option<u64>,
    /// Plus transitions raise a walk's rank to at most its lowest rank plus this (default
    /// 2); a walk that far above its lowest rank returns to its lowest scheme instead.
    #[arg(long, value_name = "N")]
    pub max_excess: Option<usize>,
    /// Field the scheme must hold over (default: the tensor's field), e.g. `GF(2)`.
    #[arg(long)]
    pub field: Option<String>,
    /// Ring the scheme's coefficients must lie in, for a tensor over Q with integer
    /// entries: `Z` (integers only: a scheme with fractions does not count) or `Q` (the
    /// default).
    #[arg(long)]
    pub ring: Option<String>,
    /// Time limit in seconds.
    #[arg(long)]
    pub time: Option<f64>,
    /// Seed of the search (default 0; with --resume, the checkpoint's).
    #[arg(long)]
    pub seed: Option<u64>,
    /// Worker threads (0: all cores).
    #[arg(long, default_value_t = 0)]
    pub threads: usize,
    /// Number of runs (random starts / walks) in this job.
    #[arg(long)]
    pub restarts: Option<u64>,
    /// Write the best scheme here (the text form for a `.txt` name, JSON otherwise);
    /// default: standard output (JSON). An existing better result in the file is kept.
    /// Over Q, a lower scheme the walks reached over GF(P) that did not lift goes beside
    /// it, with `.gfP` before the extension.
    #[arg(long)]
    pub out: Option<String>,
    /// Resume from a checkpoint (its seed, shard and progress) or start from a scheme (a
    /// file in the JSON or text form, or a stored scheme's name); a scheme over GF(p) of a
    /// tensor over Q is where the walks start (over GF(p)), its lift tried first.
    #[arg(long)]
    pub resume: Option<String>,
    /// Checkpoint file (default: OUT.checkpoint.json when --out is a file).
    #[arg(long)]
    pub checkpoint: Option<String>,
    /// Seconds between two checkpoints (and writes of an improved result to --out).
    #[arg(long, default_value_t = 10.0)]
    pub checkpoint_every: f64,
    /// Run only shard K of N (runs numbered K mod N), e.g. `--shard 3/100`.
    #[arg(long)]
    pub shard: Option<String>,
    /// Replace the --out and checkpoint files even when they hold a better result or
    /// something else.
    #[arg(long)]
    pub overwrite: bool,
    /// No progress on standard error (neither the terminal line nor the log lines).
    #[arg(long)]
    pub quiet: bool,
    /// Seconds between two progress lines when standard error is not a terminal (a log).
    #[arg(long, default_value_t = 5.0, value_name = "SECONDS")]
    pub progress_every: f64,
}

/// The best rank so far (`-` before the first scheme) and the moves per second since the
/// snapshot `last` (elapsed, moves), which becomes this one.
fn best_and_rate(last: &mut (Duration, u64), p: &Progress) -> (String, f64) {
    let dt = p.elapsed.saturating_sub(last.0).as_secs_f64().max(1e-9);
    let rate = p.moves.saturating_sub(last.1) as f64 / dt;
    *last = (p.elapsed, p.moves);
    let best = p.best.as_ref().map_or("-".into(), |s| s.rank().to_string());
    (best, rate)
}

/// `, walk at rank N` when the lowest rank the walks reached differs from the best verified
/// rank: below it, schemes over the walk's field that have not lifted to Q; above it,
/// walks still on their way down from a higher start (`--walk-start standard`).
fn walk_note(p: &Progress) -> String {
    match (p.walk_rank, &p.best) {
        (Some(w), Some(b)) if w != b.rank() => format!(", walk at rank {w}"),
        (Some(w), None) => format!(", walk at rank {w}"),
        _ => String::new(),
    }
}

/// Progress for a log (standard error is not a terminal): at most one line per interval
/// with the best rank so far, the moves per second since the last line and the time elapsed.
struct LogProgress {
    every: Duration,
    last: std::sync::Mutex<(Duration, u64)>,
}

impl LogProgress {
    fn new(every: Duration) -> Self {
        LogProgress {
            every,
            last: std::sync::Mutex::new((Duration::ZERO, 0)),
        }
    }

    /// Print a line if the interval has passed since the last one.
    fn tick(&self, p: &Progress) {
        let mut last = self.last.lock().expect("lock");
        if p.elapsed < last.0 + self.every {
            return;
        }
        let (best, rate) = best_and_rate(&mut last, p);
        eprintln!(
            "bilin search: best rank {best}, {rate:.3e} moves/s, elapsed {:.1} s{}",
            p.elapsed.as_secs_f64(),
            walk_note(p)
        );
    }
}

fn parse_shard(s: &str) -> Result<(u64, u64), String> {
    let bad = || format!("expected K/N (two integers, 0 <= K < N), found `{s}`");
    let (k, n) = s.split_once('/').ok_or_else(bad)?;
    let digits = |x: &str| !x.is_empty() && x.bytes().all(|b| b.is_ascii_digit());
    if !digits(k) || !digits(n) {
        return Err(bad());
    }
    let (k, n): (u64, u64) = (k.parse().map_err(|_| bad())?, n.parse().map_err(|_| bad())?);
    if n == 0 || k >= n {
        return Err(format!("shard {k}/{n}: need 0 <= K < N"));
    }
    Ok((k, n))
}

/// Write `scheme`, known before any search, as the result and in the checkpoint (seed,
/// shard and first run as given); exit code 0, or 2 when it cannot be written.
fn finish_known(
    files: &OutputFiles,
    scheme: &bilin::scheme::Scheme,
    t: &bilin::tensor::Tensor,
    (seed, shard, next_run): (u64, (u64, u64), u64),
    ring: &str,
) -> i32 {
    files.save_checkpoint(
        &Checkpoint {
            seed,
            shard,
            next_run,
            best: Some(scheme.clone()),
        },
        t,
    );
    if !files.save_result(scheme, t) {
        return EXIT_USAGE;
    }
    note(format!(
        "best verified rank {} over {ring} (known before any search)",
        scheme.rank(),
    ));
    EXIT_OK
}

/// The file given to --resume: a checkpoint or a scheme in the JSON form; else a scheme in
/// the text form or the name of a stored scheme, read against the tensor or, when that
/// fails, against the tensor reduced modulo the walk prime (a scheme to walk from).
fn read_resumed(path: &str, t: &Tensor, prime: u64) -> Result<Saved, Error> {
    let exists = std::path::Path::new(path).exists();
    if exists {
        let text = read_text_file(path)?;
        if text.trim_start().starts_with('{') {
            return parse_saved(&text, path);
        }
    }
    match read_scheme_file(path, t) {
        Ok((s, ..)) => Ok(Saved::Scheme(s)),
        Err(e) if t.field() == FieldSpec::Rational => t
            .with_field(FieldSpec::Prime(prime))
            .ok()
            .and_then(|tp| read_scheme_file(path, &tp).ok())
            .map(|(s, ..)| Saved::Scheme(s))
            .ok_or(e),
        Err(e) => Err(e),
    }
}

/// Seed, shard and first run: from the checkpoint when resuming one (a conflicting
/// `--seed` or `--shard` is refused), else from the arguments.
fn seed_and_shard(
    a: &SearchArgs,
    shard_arg: Option<(u64, u64)>,
    resumed: Option<&Saved>,
) -> Result<(u64, (u64, u64), u64), String> {
    let Some(Saved::Checkpoint(c)) = resumed else {
        return Ok((a.seed.unwrap_or(0), shard_arg.unwrap_or((0, 1)), 0));
    };
    let path = a.resume.as_deref().unwrap_or("");
    if let Some(s) = a.seed.filter(|&s| s != c.seed) {
        return Err(format!(
            "--seed {s} conflicts with the checkpoint {path}, which continues seed {}; \
             omit --seed to continue it",
            c.seed
        ));
    }
    if let Some((k, n)) = shard_arg.filter(|&s| s != c.shard) {
        return Err(format!(
            "--shard {k}/{n} conflicts with the checkpoint {path}, which is shard {}/{}; \
             omit --shard to continue it",
            c.shard.0, c.shard.1
        ));
    }
    Ok((c.seed, c.shard, c.next_run))
}

pub fn run(a: SearchArgs) -> i32 {
    // over another field (e.g. GF(2)) the tensor is read reduced into it, so the scheme
    // is searched and verified there
    let t = match super::common::load(&a.input, a.field.as_deref()) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let method = match Method::parse(&a.method) {
        Ok(m) => m,
        Err(e) => return usage_error("--method", e.to_string()),
    };
    let symmetry = match a.symmetry.to_ascii_lowercase().as_str() {
        "none" => Symmetry::None,
        "cyclic" => Symmetry::Cyclic,
        s => {
            return usage_error(
                "--symmetry",
                format!("unknown symmetry `{s}` (expected cyclic or none)"),
            );
        }
    };
    let integral = match a.ring.as_deref().map(str::to_ascii_lowercase).as_deref() {
        None | Some("q") => false,
        Some("z") => true,
        Some(r) => {
            return usage_error("--ring", format!("unknown ring `{r}` (expected Z or Q)"));
        }
    };
    if integral
        && (t.field() != bilin::scalar::FieldSpec::Rational
            || t.entries().any(|(_, _, _, c)| !c.is_integer()))
    {
        return usage_error(
            "--ring",
            format!(
                "a scheme over Z needs a tensor over Q with integer entries; this one is over {}{}",
                t.field().name(),
                if t.field() == bilin::scalar::FieldSpec::Rational {
                    " with fractions"
                } else {
                    ""
                }
            ),
        );
    }
    let ring_name = |s: &bilin::scheme::Scheme| {
        if integral {
            "Z".to_string()
        } else {
            s.field.name()
        }
    };
    let defaults = Params::default();
    let walk_start = match a.walk_start.as_deref().map(WalkStart::parse).transpose() {
        Ok(w) => w.unwrap_or(defaults.walk_start),
        Err(e) => return usage_error("--walk-start", e.to_string()),
    };
    if let Some(p) = a.prime
        && !(bilin::scalar::is_prime(p) && p < 1 << 16)
    {
        return usage_error(
            "--prime",
            format!("expected a prime below 65536, found {p}"),
        );
    }
    if a.walk_moves == Some(0) || a.plateau == Some(0) {
        let opt = if a.walk_moves == Some(0) {
            "--walk-moves"
        } else {
            "--plateau"
        };
        return usage_error(opt, "expected a positive number of moves");
    }
    let shard_arg = match a.shard.as_deref().map(parse_shard).transpose() {
        Ok(s) => s,
        Err(e) => return usage_error("--shard", e),
    };
    if a.time.is_some_and(|x| !(x.is_finite() && x >= 0.0)) {
        return usage_error("--time", "expected a nonnegative number of seconds");
    }
    if !(a.checkpoint_every.is_finite() && a.checkpoint_every > 0.0) {
        return usage_error(
            "--checkpoint-every",
            "expected a positive number of seconds",
        );
    }
    let resumed = match &a.resume {
        None => None,
        Some(path) => match read_resumed(path, &t, a.prime.unwrap_or(2)) {
            Ok(c) => Some(c),
            Err(e) => return report_error(&e),
        },
    };
    let (seed, shard, first_run) = match seed_and_shard(&a, shard_arg, resumed.as_ref()) {
        Ok(x) => x,
        Err(e) => return usage_error("--resume", e),
    };
    // a scheme over another field (GF(p) for a tensor over Q): the walks start from it
    let walk_from = resumed
        .as_ref()
        .and_then(Saved::best)
        .filter(|s| s.field != t.field())
        .cloned();
    let walk_prime = match (walk_from.as_ref().map(|s| s.field), a.prime) {
        (Some(FieldSpec::Prime(p)), Some(q)) if p != q => {
            return usage_error(
                "--prime",
                format!(
                    "the resumed scheme is over GF({p}): walks over GF({q}) cannot start from it"
                ),
            );
        }
        (Some(FieldSpec::Prime(p)), _) => p,
        (_, q) => q.unwrap_or(2),
    };
    if let Some(w) = &walk_from {
        note(format!(
            "the resumed scheme (rank {}) holds over {}, not over {}: the walks start from it{}",
            w.rank(),
            w.field.name(),
            t.field().name(),
            if t.field() == FieldSpec::Rational {
                ", and its lift to Q is tried first"
            } else {
                ""
            }
        ));
    }
    let files = match OutputFiles::open(
        a.out.as_deref(),
        a.checkpoint.as_deref(),
        a.resume.as_deref(),
        &t,
        a.overwrite,
    ) {
        Ok(f) => f,
        Err(code) => return code,
    };
    let params = Params {
        target_rank: a.rank,
        time_limit: a.time.map(Duration::from_secs_f64),
        seed,
        threads: a.threads,
        restarts: a.restarts,
        method,
        field: None,
        shard,
        first_run,
        walk_prime,
        symmetry,
        walk_start,
        walk_from,
        integral,
        walk_budget: a.walk_moves.unwrap_or(defaults.walk_budget),
        pool: PoolParams {
            size: a.pool.unwrap_or(defaults.pool.size),
            ..defaults.pool.clone()
        },
        flip: FlipParams {
            plateau: a.plateau.unwrap_or(defaults.flip.plateau),
            max_excess: a.max_excess.unwrap_or(defaults.flip.max_excess),
            ..defaults.flip.clone()
        },
        // a plateau handling given on the command line is used by every walk
        flip_mix: if a.plateau.is_some() || a.max_excess.is_some() {
            Vec::new()
        } else {
            defaults.flip_mix.clone()
        },
        ..defaults
    };
    let stop = Arc::new(AtomicBool::new(false));
    let signals = Arc::new(AtomicUsize::new(0));
    {
        let (s, n) = (stop.clone(), signals.clone());
        let installed = ctrlc::set_handler(move || {
            s.store(true, Ordering::SeqCst);
            if n.fetch_add(1, Ordering::SeqCst) == 0 {
                eprintln!(
                    "\nbilin search: stop requested (SIGINT, SIGTERM or SIGHUP): writing the \
                     best scheme and the checkpoint"
                );
            }
        });
        if let Err(e) = installed {
            eprintln!(
                "warning: cannot handle stop signals ({e}); a stopped search loses its result"
            );
        }
    }
    if !(a.progress_every.is_finite() && a.progress_every > 0.0) {
        return usage_error("--progress-every", "expected a positive number of seconds");
    }
    let tty = std::io::stderr().is_terminal() && !a.quiet;
    let log = (!std::io::stderr().is_terminal() && !a.quiet)
        .then(|| LogProgress::new(Duration::from_secs_f64(a.progress_every)));
    let every = Duration::from_secs_f64(a.checkpoint_every);
    let last_write = Mutex::new(Instant::now());
    let last_moves = Mutex::new((Duration::ZERO, 0u64));
    let progress = |p: &Progress| {
        if let Some(l) = &log {
            l.tick(p);
        }
        if tty {
            let (best, rate) =
                best_and_rate(&mut last_moves.lock().unwrap_or_else(|e| e.into_inner()), p);
            eprint!(
                "\rbest rank {best}  moves {:.3e}  {:.2e} moves/s  elapsed {:.1}s{}   ",
                p.moves as f64,
                rate,
                p.elapsed.as_secs_f64(),
                walk_note(p)
            );
        }
        let mut lw = last_write.lock().unwrap_or_else(|e| e.into_inner());
        if lw.elapsed() >= every {
            *lw = Instant::now();
            files.save_progress(
                &Checkpoint {
                    seed,
                    shard,
                    next_run: p.next_run,
                    best: p.best.clone(),
                },
                &t,
            );
        }
    };
    if a.rank.is_none() && a.time.is_none() && a.restarts.is_none() {
        return usage_error("--rank", "give a target rank, a time limit or a run limit");
    }
    // what is known first: the resumed scheme counts among the verified upper bounds
    let given: Vec<(String, bilin::scheme::Scheme)> = resumed
        .and_then(Saved::into_best)
        .filter(|s| s.field == t.field())
        .map(|s| ("the resumed scheme".to_string(), s))
        .into_iter()
        .collect();
    let interval = known_interval(&t, &given, seed);
    let start = match plan_search(&t, &params, &interval) {
        Err(e) => return usage_error("--method", e.to_string()),
        Ok(Plan::Known { scheme, reason }) => {
            note(format!("answered at once: {reason}"));
            return finish_known(
                &files,
                &scheme,
                &t,
                (seed, shard, first_run),
                &ring_name(&scheme),
            );
        }
        Ok(Plan::Refuse { reason, known, .. }) => {
            eprintln!("error: refused: {reason}; no scheme of that rank exists");
            // the best known scheme is still the result, so that nothing is lost
            let ring = ring_name(&known);
            if finish_known(&files, &known, &t, (seed, shard, first_run), &ring) != EXIT_OK {
                return EXIT_USAGE;
            }
            return EXIT_FALSE;
        }
        Ok(Plan::Search { runs, start }) => {
            note(format!("method {}: {}", method_name(method), runs.reason));
            start
        }
    };
    let outcome = match search_scheme(&t, &params, &stop, Some(start), &progress) {
        Ok(o) => o,
        Err(e) => {
            let e = match &a.resume {
                Some(p) => format!("{p}: {e}"),
                None => e.to_string(),
            };
            eprintln!("error: {e}");
            return EXIT_USAGE;
        }
    };
    if tty {
        eprintln!();
    }
    files.save_checkpoint(
        &Checkpoint {
            seed,
            shard,
            next_run: outcome.next_run,
            best: outcome.best.clone(),
        },
        &t,
    );
    let mut code = if outcome.reached || (a.rank.is_none() && outcome.best.is_some()) {
        EXIT_OK
    } else {
        EXIT_FALSE
    };
    match &outcome.best {
        Some(s) => {
            if !files.save_result(s, &t) {
                code = EXIT_USAGE;
            }
            note(format!(
                "best verified rank {} over {} ({:.2} s, {} moves{})",
                s.rank(),
                ring_name(s),
                outcome.elapsed.as_secs_f64(),
                outcome.moves,
                if stop.load(Ordering::SeqCst) {
                    ", stopped by a signal"
                } else {
                    ""
                }
            ));
        }
        None => note("no verified scheme found"),
    }
    if let Some(w) = &outcome.walk_best
        && !files.save_walk_scheme(w, &t)
    {
        code = EXIT_USAGE;
    }
    note(closing_interval(&interval, outcome.best.as_ref()));
    code
}

/// The rank interval after a search: the proven lower bound with its name, and the lower
/// of the known upper bound and the best scheme the search verified.
fn closing_interval(
    iv: &bilin::interval::RankInterval,
    best: Option<&bilin::scheme::Scheme>,
) -> String {
    let field = iv.upper.scheme.field.name();
    let lower = &iv.lower;
    let upper = best.map_or(iv.upper.value, |s| s.rank().min(iv.upper.value));
    if lower.value >= upper {
        format!(
            "the rank over {field} is {upper}: a verified scheme of rank {upper} meets the \
             proven lower bound ({})",
            lower.name
        )
    } else {
        format!(
            "the rank over {field} lies in {} <= R <= {upper} (lower: {}, proven; upper: a \
             verified scheme)",
            lower.value, lower.name
        )
    }
}
