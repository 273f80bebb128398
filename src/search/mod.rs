//! Search for low-rank schemes (bilinear algorithms with fewer multiplications).
//!
//! Engines, all ending in an exact check with [`crate::scheme::verify`]:
//! - flip-graph walks ([`flip`] over GF(2) with factors in multi-word masks, [`flip_p`]
//!   over GF(p), [`cyclic`] over GF(2) restricted to schemes of <n,n,n> invariant under
//!   the cyclic symmetry), restarted from a [`pool`] of schemes at the lowest rank reached,
//!   with plateau handling by plus transitions; for a tensor over Q each new rank is lifted
//!   p-adically ([`hensel`], any small prime) to a scheme over Z or Q, verified exactly;
//! - the numerical route ([`numeric`]: [`als`] or Levenberg-Marquardt [`lm`], in whitened
//!   coordinates when the tensor is ill-conditioned ([`whiten`]), rounding by rational
//!   reconstruction, exact solve of the result factors, exact check), over Q.
//!
//! [`plan_runs`] chooses the engines of a search ([`Method::Auto`]: walks and
//! Levenberg-Marquardt runs over Q sharing the time, walks over GF(p)). The driver
//! [`search_scheme`] splits the work into *runs* numbered 0, 1, 2, ...; run n uses the
//! engine `n mod k` of the plan and its own RNG seeded from `(seed, n)`. A shard `K/N`
//! executes only the runs `n = K (mod N)`, so N independent jobs cover the same runs as one
//! job. With one engine the runs go out in order; with several, by time share
//! (module `schedule`: the engines' weights follow whether the fits converge). Workers share the
//! best verified scheme and the pool; the search ends when the target rank is reached, the
//! time limit passes, the run limit is used up, or the stop flag is set. Each run is a
//! deterministic function of its number and the seed; with one thread and one engine, so
//! is the whole search.
//!
//! Invariant: every scheme this module returns has passed `verify` against the tensor (over
//! Q, or over GF(p) when the search field is GF(p)).

pub mod als;
pub mod bits;
pub mod cyclic;
pub mod dependent;
mod engines;
pub mod flip;
pub mod flip_p;
pub mod halt;
pub mod hensel;
pub(crate) mod hensel_step;
pub mod json;
pub mod lm;
pub mod numeric;
pub mod pool;
pub mod recover;
mod schedule;
pub mod sign_lift;
pub mod slice_start;
mod starts;
pub mod store;
mod walks;
pub mod whiten;

pub use engines::{RunKind, RunPlan, Walk, plan_runs};
pub use starts::known_start;
use starts::{check_walk_from, lower_start};

use crate::error::{Error, Result};
use crate::scalar::FieldSpec;
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use cyclic::{CyclicScheme, CyclicWalker};
use flip::{BitScheme, FlipParams, Snapshot, Walker};
use flip_p::{PScheme, PWalker};
use numeric::{Fit, NumericParams};
use pool::{Pool, PoolParams};
use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;
use std::sync::atomic::{AtomicBool, AtomicU64, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};
use walks::WalkPlan;

/// The search engine.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Method {
    /// Flip-graph walks (over GF(2), or GF(p) with `walk_prime`), lifted to Q unless the
    /// search field is GF(p).
    Flip,
    /// The numerical route with alternating least squares (tensors over Q).
    Als,
    /// The numerical route with Levenberg-Marquardt (tensors over Q).
    Lm,
    /// Over Q: walks and Levenberg-Marquardt runs sharing the time (walks only where the tensor
    /// reduces mod the walk prime); over GF(p): walks.
    Auto,
}

impl Method {
    /// `flip`, `als`, `lm` or `auto`.
    pub fn parse(s: &str) -> Result<Method> {
        match s.to_ascii_lowercase().as_str() {
            "flip" => Ok(Method::Flip),
            "als" => Ok(Method::Als),
            "lm" => Ok(Method::Lm),
            "auto" => Ok(Method::Auto),
            _ => Err(Error::Invalid(format!(
                "unknown method `{s}` (expected flip, als, lm or auto)"
            ))),
        }
    }
}

/// A symmetry the walks keep.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Symmetry {
    None,
    /// The cyclic symmetry of a square matrix format <n,n,n> ([`cyclic`]).
    Cyclic,
}

/// Where the flip walks of a search start.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum WalkStart {
    /// The lowest-rank known scheme (given, stored or built) whose coefficients reduce
    /// modulo the walk prime, when it is below the standard rank.
    Best,
    /// The standard scheme (one term per nonzero structure constant) whatever is known: the
    /// known scheme stays the best result, but a stored best can sit in a region of the
    /// flip graph with no path down, which walks from higher up avoid.
    Standard,
}

impl WalkStart {
    /// `best` or `standard`.
    pub fn parse(s: &str) -> Result<WalkStart> {
        match s.to_ascii_lowercase().as_str() {
            "best" => Ok(WalkStart::Best),
            "standard" => Ok(WalkStart::Standard),
            _ => Err(Error::Invalid(format!(
                "unknown walk start `{s}` (expected best or standard)"
            ))),
        }
    }
}

/// Settings of a search.
#[derive(Clone, Debug)]
pub struct Params {
    /// Stop when a verified scheme of at most this rank is found (`None`: keep improving
    /// until the time or run limit; the numerical route needs a rank).
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
    /// A walk (one run) ends after this many moves in a row without a new lowest rank, or
    /// twice as many as it took to reach that rank if more.
    pub walk_budget: u64,
    /// The prime of the walks of a search over Q (2: bit-packed GF(2); an odd prime below
    /// 65536: walks over GF(p), lifted p-adically, for schemes with even denominators).
    pub walk_prime: u64,
    /// A symmetry the walks keep.
    pub symmetry: Symmetry,
    /// Where the walks start.
    pub walk_start: WalkStart,
    /// A scheme of the tensor reduced modulo the walk prime (over GF(p), e.g. the result of
    /// an earlier search with `field: GF(p)`) from which the walks start whatever
    /// `walk_start` says, when it is below the standard rank; a search over Q first tries
    /// its lift. It must verify against the tensor over GF(p).
    pub walk_from: Option<Scheme>,
    pub pool: PoolParams,
    /// Plateau handling of the walks when `flip_mix` is empty.
    pub flip: FlipParams,
    /// Plateau handlings drawn at random, one per walk (empty: every walk uses `flip`).
    /// No one setting suits every format: near the standard scheme of a large format the
    /// first reductions come from short walks returned often to their start (plateau 3 000,
    /// one plus transition), deep descents need long plateaus (200 000), and <4,4,4>
    /// prefers plus transitions that never return (docs/benchmarks.md).
    pub flip_mix: Vec<FlipParams>,
    pub numeric: NumericParams,
    pub hensel: hensel::HenselParams,
    /// Without a start scheme, start from the best scheme [`known_start`] builds (matrix
    /// formats only): the search returns it at once when it meets the target, and the
    /// walks start from it otherwise.
    pub known_start: bool,
    /// Over Z: only schemes whose coefficients are all integers count (a tensor over Q
    /// with integer entries); a scheme with fractions is neither a result nor a start.
    pub integral: bool,
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
            walk_budget: 100_000_000,
            walk_prime: 2,
            symmetry: Symmetry::None,
            walk_start: WalkStart::Standard,
            walk_from: None,
            pool: PoolParams::default(),
            flip: FlipParams::default(),
            flip_mix: FlipParams::mix(),
            numeric: NumericParams::default(),
            hensel: hensel::HenselParams::default(),
            known_start: true,
            integral: false,
        }
    }
}

/// A snapshot for progress display and checkpoints.
#[derive(Clone, Debug)]
pub struct Progress {
    pub best: Option<Scheme>,
    /// Flip moves attempted so far (all workers).
    pub moves: u64,
    /// The lowest rank a walk reached over its own field (GF(2) or GF(p)), which may lie
    /// below the best rank over Q when those schemes do not lift.
    pub walk_rank: Option<usize>,
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
    pub walk_rank: Option<usize>,
    /// For a search over Q: the walks' lowest-rank scheme over their field GF(p) when it
    /// lies below `best` (it did not lift to Q), verified exactly against the tensor
    /// reduced mod p: a result over GF(p) that must not be lost.
    pub walk_best: Option<Scheme>,
    pub next_run: u64,
    pub elapsed: Duration,
}

/// The seed of run n: a SplitMix64 mix of `(seed, n)`.
pub fn run_seed(seed: u64, run: u64) -> u64 {
    let mut r = flip::FastRng::new(seed ^ run.wrapping_mul(0xD1B5_4A32_D192_ED03));
    r.next_u64();
    r.next_u64()
}

pub(crate) struct Shared {
    /// Only schemes with integer coefficients are accepted.
    integral: bool,
    best: Mutex<Option<Scheme>>,
    best_rank: AtomicUsize,
    found: Arc<AtomicBool>,
    moves: AtomicU64,
    walk_rank: AtomicUsize,
    /// the scheme over the walk field at `walk_rank`
    walk_best: Mutex<Option<Scheme>>,
    /// the hand-out of runs to the workers
    turns: schedule::Turns,
    /// numerical runs ended, how many of their fits converged at the rank asked, and the
    /// wall time they took together (microseconds)
    fits: AtomicU64,
    fits_converged: AtomicU64,
    fit_micros: AtomicU64,
    /// schemes the walks reached at or below the target whose lift did not give a result
    target_lifts_failed: AtomicU64,
}

impl Shared {
    /// A walk reached rank `r` over its field: the lowest such rank, and (made by
    /// `scheme` only when it is a new lowest) its scheme, kept for the outcome.
    fn note_walk_scheme(&self, r: usize, scheme: impl FnOnce() -> Scheme) {
        if self.walk_rank.fetch_min(r, Ordering::SeqCst) > r {
            let mut wb = self.walk_best.lock().expect("lock");
            if wb.as_ref().is_none_or(|w| w.rank() > r) {
                *wb = Some(scheme());
            }
        }
    }

    /// Offer a verified scheme; false when it does not count (fractions over Z).
    fn offer(&self, s: Scheme, target: usize) -> bool {
        if self.integral && !hensel::is_integral(&s) {
            return false;
        }
        let r = s.rank();
        let mut b = self.best.lock().expect("lock");
        if b.as_ref().is_none_or(|x| r < x.rank()) {
            *b = Some(s);
            self.best_rank.store(r, Ordering::SeqCst);
        }
        if r <= target {
            self.found.store(true, Ordering::SeqCst);
        }
        true
    }
}

/// Search for a scheme of the tensor of rank at most `params.target_rank`.
///
/// `start` (e.g. from a checkpoint) must verify against the tensor; it seeds the best result
/// and the pool of the walks. `progress` is called about twice a second from the calling
/// thread. Returns the best verified scheme found.
/// Cost: bounded by the time and run limits; each flip move O(r), each numerical step
/// O(nnz r + d r^2 + r^3) (ALS) or O((r d)^3) (Levenberg-Marquardt).
pub fn search_scheme(
    t: &Tensor,
    params: &Params,
    stop: &Arc<AtomicBool>,
    start: Option<Scheme>,
    progress: &(dyn Fn(&Progress) + Sync),
) -> Result<Outcome> {
    let called = Instant::now();
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
    // without a start: the best built scheme as the best so far, and the best one whose
    // coefficients reduce modulo the walk prime as the walks' start
    let integer_entries = || goal.entries().all(|(_, _, _, c)| c.is_integer());
    if params.integral && (goal.field() != FieldSpec::Rational || !integer_entries()) {
        return Err(Error::Invalid(
            "a scheme over Z needs a tensor over Q with integer entries".into(),
        ));
    }
    let known = start.is_none() && params.known_start;
    let walk_start = known
        .then(|| known_start(&goal, Some(params), params.integral))
        .flatten();
    let start = match start {
        None if known => known_start(&goal, None, params.integral),
        s => s,
    }
    .filter(|s| !params.integral || hensel::is_integral(s));
    let walk_from = match &params.walk_from {
        None => None,
        Some(s) => Some(check_walk_from(s, &goal, params.walk_prime)?),
    };
    let starts = match params.walk_start {
        WalkStart::Best => [walk_from.as_ref(), start.as_ref(), walk_start.as_ref()],
        WalkStart::Standard => [walk_from.as_ref(), None, None],
    };
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
            walk_rank: None,
            walk_best: None,
            next_run: params.first_run,
            elapsed: Duration::ZERO,
        });
    }
    let plan = plan_runs(&goal, params, start.as_ref().map(Scheme::rank))?;
    let walk = plan.kinds.iter().find_map(|k| match k {
        RunKind::Walk(w) => Some(*w),
        RunKind::Numeric(_) => None,
    });
    let shared = Shared {
        integral: params.integral,
        best_rank: AtomicUsize::new(start.as_ref().map_or(usize::MAX, Scheme::rank)),
        found: Arc::new(AtomicBool::new(
            start.as_ref().is_some_and(|s| s.rank() <= target),
        )),
        best: Mutex::new(start.clone()),
        moves: AtomicU64::new(0),
        walk_rank: AtomicUsize::new(usize::MAX),
        walk_best: Mutex::new(None),
        turns: schedule::Turns::new(plan.kinds.len()),
        fits: AtomicU64::new(0),
        fits_converged: AtomicU64::new(0),
        fit_micros: AtomicU64::new(0),
        target_lifts_failed: AtomicU64::new(0),
    };
    // every long step polls the same halt: the time limit (counted from the call), the
    // stop flag and the target met by another worker
    let halt = halt::Halt {
        deadline: params.time_limit.and_then(|l| called.checked_add(l)),
        flags: vec![stop.clone(), shared.found.clone()],
    };
    let params = &Params {
        hensel: hensel::HenselParams {
            halt: halt.clone(),
            integral: params.integral || params.hensel.integral,
            ..params.hensel.clone()
        },
        ..params.clone()
    };
    let t0 = Instant::now();
    // the given walk start is a result itself over its field, and over Q when it lifts
    if let Some(w) = &walk_from
        && w.rank() < shared.best_rank.load(Ordering::SeqCst)
    {
        let result = if goal.field() == w.field {
            Some(w.clone())
        } else {
            hensel::lift_scheme(w, &goal, &params.hensel)
        };
        if let Some(r) = result {
            shared.offer(r, target);
        }
    }
    let halted = || halt.reached();
    // a fit ends by its own iteration bound: only the halt cuts it
    let numeric_run = |fit: Fit, seed: u64, turn: u64| {
        let mut rng = ChaCha8Rng::seed_from_u64(seed);
        let mut np = NumericParams {
            fit,
            ..params.numeric.clone()
        };
        // every other fit lets its ridge vanish: fastest where the decomposition is unique
        // (planted data), while a ridge held at a floor keeps the fits of a family of
        // decompositions (matrix products) away from their border-rank limits
        if turn.is_multiple_of(2) {
            np.lm.gamma_min = 0.0;
        }
        // without a target rank: one below the best verified rank so far
        let aim = match params.target_rank {
            Some(r) => r,
            None => match shared.best_rank.load(Ordering::SeqCst) {
                usize::MAX => return,
                b => b.saturating_sub(1),
            },
        };
        let started = Instant::now();
        let outcome = numeric::numeric_run(&goal, aim, &np, &mut rng, &halted);
        // a fit cut short is no evidence either way
        if !halted() {
            let micros = u64::try_from(started.elapsed().as_micros()).unwrap_or(u64::MAX);
            shared.fit_micros.fetch_add(micros, Ordering::SeqCst);
            shared.fits.fetch_add(1, Ordering::SeqCst);
            if outcome.fitted() {
                shared.fits_converged.fetch_add(1, Ordering::SeqCst);
            }
        }
        if let Some(s) = outcome.scheme() {
            shared.offer(s, target);
        }
    };
    let numeric_kinds: Vec<bool> = plan
        .kinds
        .iter()
        .map(|k| matches!(k, RunKind::Numeric(_)))
        .collect();
    let needed_secs = plan
        .kinds
        .iter()
        .map(|k| match k {
            RunKind::Numeric(fit) => schedule::evidence_secs(*fit),
            RunKind::Walk(_) => 0.0,
        })
        .fold(0.0, f64::max);
    let weights = || {
        schedule::kind_weights(
            &numeric_kinds,
            shared.fits.load(Ordering::SeqCst),
            shared.fits_converged.load(Ordering::SeqCst),
            (
                shared.fit_micros.load(Ordering::SeqCst) as f64 * 1e-6,
                needed_secs,
            ),
            shared.target_lifts_failed.load(Ordering::SeqCst),
        )
    };
    let drive = |walk_run: &(dyn Fn(u64, &dyn Fn() -> bool) + Sync)| {
        let run = |run_no: u64, seed: u64, cut: &dyn Fn() -> bool| match plan.kinds
            [(run_no % plan.kinds.len() as u64) as usize]
        {
            RunKind::Walk(_) => walk_run(seed, cut),
            RunKind::Numeric(fit) => numeric_run(fit, seed, run_no / plan.kinds.len() as u64),
        };
        schedule::drive_runs(params, &shared, t0, &halted, &run, &weights, progress)
    };
    // a walk start below the best verified rank (a slice scheme in a basis of low slice
    // rank) is a result itself, lifted when the search is over Q
    let take_start = |s0: Scheme| {
        if s0.rank() >= shared.best_rank.load(Ordering::SeqCst) {
            return;
        }
        if goal.field() == s0.field {
            if verify(&s0, &goal).is_ok() {
                shared.offer(s0, target);
            }
            return;
        }
        match hensel::lift_scheme(&s0, &goal, &params.hensel) {
            Some(r) => {
                shared.offer(r, target);
            }
            // not lifted: kept as the walks' scheme over their field
            None => shared.note_walk_scheme(s0.rank(), || s0),
        }
    };
    let snap = match walk {
        None => drive(&|_, _| {}),
        Some(Walk::Bits { words }) => {
            let std = lower_start(BitScheme::standard(&goal)?, &goal, 2, |s| {
                BitScheme::from_scheme(s).ok()
            });
            let s0 = starts
                .iter()
                .flatten()
                .filter_map(|s| BitScheme::from_scheme(s).ok())
                .min_by_key(|b| b.rank())
                .filter(|b| b.rank() < std.rank())
                .unwrap_or(std);
            take_start(s0.to_scheme(FieldSpec::Prime(2)));
            let wp = walk_plan(&goal, s0, params);
            crate::with_words!(words, W => drive(&|seed, cut| wp.run(&|s: &BitScheme, sd| Walker::<W>::new(s, sd), seed, &shared, cut)))
        }
        Some(Walk::Cyclic { n: side, words }) => {
            let std = CyclicScheme::standard(side)?;
            let s0 = starts
                .iter()
                .flatten()
                .filter_map(|s| BitScheme::from_scheme(s).ok())
                .filter_map(|b| CyclicScheme::from_bits(&b, side))
                .min_by_key(|c| c.rank())
                .filter(|c| c.rank() < std.rank())
                .unwrap_or(std);
            let wp = walk_plan(&goal, s0, params);
            crate::with_words!(words, W => drive(&|seed, cut| wp.run(&|s: &CyclicScheme, sd| CyclicWalker::<W>::new(s, sd), seed, &shared, cut)))
        }
        Some(Walk::Prime { p }) => {
            let gp = goal
                .with_field(FieldSpec::Prime(p))
                .map_err(Error::Invalid)?;
            let std = lower_start(PScheme::standard(&gp)?, &goal, p, |s| {
                PScheme::from_scheme(s, p).ok()
            });
            let s0 = starts
                .iter()
                .flatten()
                .filter_map(|s| PScheme::from_scheme(s, p).ok())
                .min_by_key(|b| b.rank())
                .filter(|b| b.rank() < std.rank())
                .unwrap_or(std);
            take_start(s0.to_scheme());
            let wp = walk_plan(&goal, s0, params);
            drive(&|seed, cut| wp.run(&PWalker::new, seed, &shared, cut))
        }
    };
    let reached = snap.best.as_ref().is_some_and(|s| s.rank() <= target);
    let best_rank = snap.best.as_ref().map_or(usize::MAX, Scheme::rank);
    let walk_best = shared
        .walk_best
        .lock()
        .expect("lock")
        .take()
        .filter(|w| goal.field() != w.field && w.rank() < best_rank)
        .filter(|w| {
            goal.with_field(w.field)
                .is_ok_and(|g| verify(w, &g).is_ok())
        });
    Ok(Outcome {
        best: snap.best,
        reached,
        moves: snap.moves,
        walk_rank: snap.walk_rank,
        walk_best,
        next_run: snap.next_run,
        elapsed: snap.elapsed,
    })
}

fn walk_plan<'a, S: Snapshot>(goal: &'a Tensor, start: S, params: &'a Params) -> WalkPlan<'a, S> {
    let rank = start.rank();
    WalkPlan {
        goal,
        pool: Mutex::new(Pool::new(start.clone(), rank, params.pool.clone())),
        start,
        params,
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
