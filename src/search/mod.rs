//! Search for low-rank schemes (bilinear algorithms with fewer multiplications).
//!
//! Two engines, both ending in an exact check with [`crate::scheme::verify`]:
//! - [`als`]: numerical alternating least squares in f64, rounding to small rationals,
//!   exact verification over Q;
//! - [`flip`]: a flip-graph random walk over GF(2), then [`hensel`] lifting to Z / Q when
//!   the tensor is over Q; [`flip_p`]: the same walk over GF(p) for tensors over GF(p).
//!
//! The driver [`search_scheme`] splits the work into *runs* numbered 0, 1, 2, ...; run n
//! uses its own RNG seeded from `(seed, n)`, so a run's outcome depends only on the seed
//! and its number (not on the thread that executes it or the thread count). A shard
//! `K/N` executes only the runs `n = K (mod N)`, so N independent jobs cover the same runs
//! as one job. Workers share the best verified scheme; the search ends when the target rank
//! is reached, the time limit passes, the run limit is used up, or the stop flag is set.
//!
//! Invariant: every scheme this module returns has passed `verify` against the tensor (over
//! Q, or over GF(2) when the search field is GF(2)).

pub mod als;
pub mod flip;
pub mod flip_p;
pub mod hensel;
pub mod json;
pub mod store;

use crate::error::{Error, Result};
use crate::scalar::FieldSpec;
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use flip::{BitScheme, FlipParams, WalkEvent};
use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;
use std::sync::atomic::{AtomicBool, AtomicU64, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

/// The search engine.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    /// Alternating least squares with rounding (tensors over Q).
    Als,
    /// Flip-graph walk over GF(2), lifted to Q unless the search field is GF(2).
    Flip,
}

/// Settings of a search.
#[derive(Clone, Debug)]
pub struct Params {
    /// Stop when a verified scheme of at most this rank is found (`None`: keep improving
    /// until the time or run limit; ALS needs a rank).
    pub target_rank: Option<usize>,
    /// Wall-clock limit.
    pub time_limit: Option<Duration>,
    pub seed: u64,
    /// Worker threads (0: all cores).
    pub threads: usize,
    /// Runs to execute in this shard (`None`: unlimited).
    pub restarts: Option<u64>,
    pub method: Method,
    /// Field the scheme must be valid over (`None`: the tensor's field). `GF(2)` for a
    /// tensor over Q searches the tensor reduced mod 2 and returns a GF(2) scheme.
    pub field: Option<FieldSpec>,
    /// This job is shard `K` of `N` (`(0, 1)`: the whole search).
    pub shard: (u64, u64),
    /// Execute only runs numbered at least this (to resume: the checkpoint's `next_run`).
    pub first_run: u64,
    /// Moves per flip run.
    pub walk_budget: u64,
    pub flip: FlipParams,
    pub als: als::AlsParams,
    pub hensel: hensel::HenselParams,
}

impl Default for Params {
    fn default() -> Self {
        Params {
            target_rank: None,
            time_limit: None,
            seed: 0,
            threads: 0,
            restarts: None,
            method: Method::Flip,
            field: None,
            shard: (0, 1),
            first_run: 0,
            walk_budget: 20_000_000,
            flip: FlipParams::default(),
            als: als::AlsParams::default(),
            hensel: hensel::HenselParams::default(),
        }
    }
}

/// A snapshot for progress display and checkpoints.
#[derive(Clone, Debug)]
pub struct Progress {
    pub best: Option<Scheme>,
    /// Flip moves attempted so far (all workers).
    pub moves: u64,
    /// All runs of this shard below this number are finished (for a checkpoint).
    pub next_run: u64,
    pub elapsed: Duration,
}

/// The result of a search.
#[derive(Clone, Debug)]
pub struct Outcome {
    /// The lowest-rank verified scheme seen (including a resumed start scheme).
    pub best: Option<Scheme>,
    /// True when `best` reaches the target rank.
    pub reached: bool,
    pub moves: u64,
    pub next_run: u64,
    pub elapsed: Duration,
}

/// The seed of run n: a SplitMix64 mix of `(seed, n)`.
pub fn run_seed(seed: u64, run: u64) -> u64 {
    let mut r = flip::FastRng::new(seed ^ run.wrapping_mul(0xD1B5_4A32_D192_ED03));
    r.next_u64();
    r.next_u64()
}

struct Shared {
    best: Mutex<Option<Scheme>>,
    best_rank: AtomicUsize,
    found: AtomicBool,
    moves: AtomicU64,
    /// runs handed out (sequence numbers within the shard) and finished flags
    next_seq: AtomicU64,
    done: Mutex<Vec<u64>>,
}

impl Shared {
    fn offer(&self, s: Scheme, target: usize) {
        let r = s.rank();
        let mut b = self.best.lock().expect("lock");
        if b.as_ref().is_none_or(|x| r < x.rank()) {
            *b = Some(s);
            self.best_rank.store(r, Ordering::SeqCst);
        }
        if r <= target {
            self.found.store(true, Ordering::SeqCst);
        }
    }
}

/// Search for a scheme of the tensor of rank at most `params.target_rank`.
///
/// `start` (e.g. from a checkpoint) must verify against the tensor; it seeds the best result
/// and is the starting point of the flip walks. `progress` is called about twice a second
/// from the calling thread. Returns the best verified scheme found.
/// Cost: bounded by the time and run limits; each flip move O(r), each ALS sweep
/// O(nnz r + d r^2 + r^3).
pub fn search_scheme(
    t: &Tensor,
    params: &Params,
    stop: &Arc<AtomicBool>,
    start: Option<Scheme>,
    progress: &(dyn Fn(&Progress) + Sync),
) -> Result<Outcome> {
    let (k, n) = params.shard;
    if n == 0 || k >= n {
        return Err(Error::Invalid(format!("shard {k}/{n}: need 0 <= K < N")));
    }
    let field = params.field.unwrap_or(t.field());
    // the tensor the scheme must satisfy, over the search field
    let goal = if field == t.field() {
        t.clone()
    } else {
        t.with_field(field).map_err(Error::Invalid)?
    };
    if params.method == Method::Als && field != FieldSpec::Rational {
        return Err(Error::Invalid(
            "the ALS search works over Q; use --method flip for GF(2)".into(),
        ));
    }
    if params.method == Method::Als && params.target_rank.is_none() {
        return Err(Error::Invalid(
            "the ALS search needs a target rank (--rank)".into(),
        ));
    }
    if params.target_rank.is_none() && params.time_limit.is_none() && params.restarts.is_none() {
        return Err(Error::Invalid(
            "give a target rank, a time limit or a run limit".into(),
        ));
    }
    if let Some(s) = &start
        && verify(s, &goal).is_err()
    {
        return Err(Error::Invalid(
            "the start scheme does not verify against the tensor".into(),
        ));
    }
    let target = params.target_rank.unwrap_or(0);
    // rank 0: only the zero tensor, decided at once
    if params.target_rank == Some(0) || goal.nnz() == 0 {
        let empty = Scheme::empty(field, goal.dims());
        let ok = verify(&empty, &goal).is_ok();
        let best = if ok { Some(empty) } else { start };
        return Ok(Outcome {
            reached: best.as_ref().is_some_and(|s| s.rank() <= target),
            best,
            moves: 0,
            next_run: params.first_run,
            elapsed: Duration::ZERO,
        });
    }
    let p_start = match (params.method, field) {
        (Method::Flip, FieldSpec::Prime(p)) if p != 2 => Some(flip_p::PScheme::standard(&goal)?),
        _ => None,
    };
    let flip_start = match params.method {
        Method::Flip if p_start.is_some() => None,
        Method::Flip => {
            let std = BitScheme::standard(&goal)?;
            Some(match &start {
                Some(s) => BitScheme::from_scheme(s).unwrap_or(std),
                None => std,
            })
        }
        Method::Als => None,
    };
    let shared = Shared {
        best_rank: AtomicUsize::new(start.as_ref().map_or(usize::MAX, Scheme::rank)),
        found: AtomicBool::new(start.as_ref().is_some_and(|s| s.rank() <= target)),
        best: Mutex::new(start),
        moves: AtomicU64::new(0),
        next_seq: AtomicU64::new(0),
        done: Mutex::new(Vec::new()),
    };
    let threads = if params.threads == 0 {
        std::thread::available_parallelism().map_or(1, |x| x.get())
    } else {
        params.threads
    };
    let t0 = Instant::now();
    let out_of_time = || params.time_limit.is_some_and(|l| t0.elapsed() >= l);
    let halted =
        || stop.load(Ordering::Relaxed) || shared.found.load(Ordering::Relaxed) || out_of_time();
    // run numbers of this shard: base, base + N, base + 2N, ... with base = K (mod N)
    let base = params.first_run + (k + n - params.first_run % n) % n;
    let run_of = |seq: u64| base + seq * n;
    let workers_left = AtomicUsize::new(threads);
    std::thread::scope(|sc| {
        for _ in 0..threads {
            sc.spawn(|| {
                loop {
                    if halted() {
                        break;
                    }
                    let seq = shared.next_seq.fetch_add(1, Ordering::SeqCst);
                    if params.restarts.is_some_and(|m| seq >= m) {
                        break;
                    }
                    let run = run_of(seq);
                    let seed = run_seed(params.seed, run);
                    match params.method {
                        Method::Als => {
                            let mut rng = ChaCha8Rng::seed_from_u64(seed);
                            if let Some(s) =
                                als::als_run(&goal, target, &params.als, &mut rng, &halted)
                            {
                                shared.offer(s, target);
                            }
                        }
                        Method::Flip if p_start.is_some() => {
                            let startp = p_start.as_ref().expect("GF(p) start");
                            let mut ev = |e: WalkEvent<flip_p::PScheme>| -> bool {
                                match e {
                                    WalkEvent::Moves(m) => {
                                        shared.moves.fetch_add(m, Ordering::Relaxed);
                                        halted()
                                    }
                                    WalkEvent::Candidate(b) => {
                                        let s = b.to_scheme();
                                        let ok = verify(&s, &goal).is_ok();
                                        let r = s.rank();
                                        if ok {
                                            shared.offer(s, target);
                                        }
                                        ok && r <= target
                                    }
                                }
                            };
                            flip_p::walk_p(
                                startp,
                                target,
                                &params.flip,
                                seed,
                                params.walk_budget,
                                &mut ev,
                            );
                        }
                        Method::Flip => {
                            let startb = flip_start.as_ref().expect("flip start");
                            // lifting costs one GF(2) elimination of the Jacobian; retries
                            // at a rank already tried get at most a fifth of the walk's time
                            let walk_t0 = Instant::now();
                            let mut lift_secs = 0.0f64;
                            let mut tried_rank = usize::MAX;
                            let mut ev = |e: WalkEvent<BitScheme>| -> bool {
                                match e {
                                    WalkEvent::Moves(m) => {
                                        shared.moves.fetch_add(m, Ordering::Relaxed);
                                        halted()
                                    }
                                    WalkEvent::Candidate(b) => {
                                        let r = b.rank();
                                        if r >= shared.best_rank.load(Ordering::SeqCst)
                                            && r > target
                                        {
                                            return false;
                                        }
                                        let s = if field == FieldSpec::Rational {
                                            if r >= tried_rank
                                                && lift_secs > 0.2 * walk_t0.elapsed().as_secs_f64()
                                            {
                                                return false;
                                            }
                                            tried_rank = tried_rank.min(r);
                                            let l0 = Instant::now();
                                            let s = hensel::lift_scheme(b, &goal, &params.hensel);
                                            lift_secs += l0.elapsed().as_secs_f64();
                                            s
                                        } else {
                                            let s = b.to_scheme(field);
                                            verify(&s, &goal).is_ok().then_some(s)
                                        };
                                        match s {
                                            Some(s) => {
                                                shared.offer(s, target);
                                                r <= target
                                            }
                                            None => false,
                                        }
                                    }
                                }
                            };
                            flip::walk(
                                startb,
                                target,
                                &params.flip,
                                seed,
                                params.walk_budget,
                                &mut ev,
                            );
                        }
                    }
                    if !halted() {
                        shared.done.lock().expect("lock").push(seq);
                    }
                }
                workers_left.fetch_sub(1, Ordering::SeqCst);
            });
        }
        let mut last = Instant::now();
        while workers_left.load(Ordering::SeqCst) > 0 {
            std::thread::sleep(Duration::from_millis(2));
            if last.elapsed() >= Duration::from_millis(500) {
                last = Instant::now();
                progress(&snapshot(&shared, t0, &run_of));
            }
        }
    });
    let snap = snapshot(&shared, t0, &run_of);
    progress(&snap);
    let reached = snap.best.as_ref().is_some_and(|s| s.rank() <= target);
    Ok(Outcome {
        best: snap.best,
        reached,
        moves: snap.moves,
        next_run: snap.next_run,
        elapsed: snap.elapsed,
    })
}

fn snapshot(shared: &Shared, t0: Instant, run_of: &dyn Fn(u64) -> u64) -> Progress {
    // the first sequence number not finished: every earlier run is complete
    let mut done = shared.done.lock().expect("lock").clone();
    done.sort_unstable();
    let mut first_open = 0;
    for d in done {
        if d == first_open {
            first_open += 1;
        } else if d > first_open {
            break;
        }
    }
    Progress {
        best: shared.best.lock().expect("lock").clone(),
        moves: shared.moves.load(Ordering::Relaxed),
        next_run: run_of(first_open),
        elapsed: t0.elapsed(),
    }
}

/// The lowest-rank scheme among `schemes` that verifies against `t` (ties: the first).
pub fn merge_schemes(t: &Tensor, schemes: &[Scheme]) -> Option<Scheme> {
    schemes
        .iter()
        .filter(|s| {
            let goal = if s.field == t.field() {
                Some(t.clone())
            } else {
                t.with_field(s.field).ok()
            };
            goal.is_some_and(|g| verify(s, &g).is_ok())
        })
        .min_by_key(|s| s.rank())
        .cloned()
}

#[cfg(test)]
mod tests;
