//! One flip-walk run of the search driver: a walk from a member of the pool (or from the
//! start scheme), its candidates checked over the search field or lifted to Q, the pool
//! updated with what the walk found.
//!
//! Invariant: a scheme reaches [`Shared::offer`] only after an exact check against the goal
//! tensor (over GF(p) by [`crate::scheme::verify`], over Q by the verified lift of
//! [`super::hensel::lift_scheme`]).

use super::flip::{FastRng, Snapshot, WalkEvent, WalkState, walk_state};
use super::pool::Pool;
use super::{Params, Shared};
use crate::scalar::FieldSpec;
use crate::scheme::verify;
use crate::tensor::Tensor;
use std::sync::Mutex;
use std::sync::atomic::Ordering;
use std::time::Instant;

/// What the walks of one search share.
pub(crate) struct WalkPlan<'a, S> {
    /// The tensor a result must satisfy (over Q or over the walk's field).
    pub goal: &'a Tensor,
    /// The walks start here when there is no pool.
    pub start: S,
    pub pool: Mutex<Pool<S>>,
    pub params: &'a Params,
}

impl<S: Snapshot> WalkPlan<'_, S> {
    /// One run: a walk that ends after `params.walk_budget` moves without a new lowest
    /// rank. `make` builds the walker at a
    /// snapshot with a seed; `halted` is polled with the move reports.
    pub fn run<Wk: WalkState<Snap = S>>(
        &self,
        make: &dyn Fn(&S, u64) -> Wk,
        seed: u64,
        shared: &Shared,
        halted: &dyn Fn() -> bool,
    ) {
        let p = self.params;
        let target = p.target_rank.unwrap_or(0);
        let lift = self.goal.field() == FieldSpec::Rational;
        let mut rng = FastRng::new(seed);
        let use_pool = p.pool.size > 0;
        let start = if use_pool {
            self.pool.lock().expect("lock").pick(rng.next_u64())
        } else {
            self.start.clone()
        };
        let mut w = make(&start, rng.next_u64());
        let level = w.rank();
        // lifting costs one elimination of the Jacobian; retries at a rank already tried
        // get at most a fifth of the walk's time
        let walk_t0 = Instant::now();
        let mut lift_secs = 0.0f64;
        let mut tried_rank = usize::MAX;
        let mut ev = |e: WalkEvent<S>| -> bool {
            match e {
                WalkEvent::Moves(m) => {
                    shared.moves.fetch_add(m, Ordering::Relaxed);
                    halted()
                }
                WalkEvent::Candidate(b) => {
                    let r = b.rank();
                    shared.note_walk_scheme(r, || b.to_scheme());
                    let lower = r < level;
                    let improves = r < shared.best_rank.load(Ordering::SeqCst) || r <= target;
                    if !lift {
                        if use_pool && lower {
                            let pick = shared.moves.load(Ordering::Relaxed);
                            self.pool.lock().expect("lock").offer(b.clone(), r, pick);
                        }
                        if !improves {
                            return false;
                        }
                        let s = b.to_scheme();
                        let ok = verify(&s, self.goal).is_ok() && shared.offer(s, target);
                        return ok && r <= target;
                    }
                    if !(improves || use_pool && lower) {
                        return false;
                    }
                    // above the best verified rank a scheme is a waypoint of a walk going
                    // down from a higher start: it joins the pool unlifted (a lift costs
                    // an elimination and could not improve the result)
                    if !improves && r > shared.best_rank.load(Ordering::SeqCst) {
                        let pick = shared.moves.load(Ordering::Relaxed);
                        self.pool.lock().expect("lock").offer(b.clone(), r, pick);
                        return false;
                    }
                    if r >= tried_rank && lift_secs > 0.2 * walk_t0.elapsed().as_secs_f64() {
                        return false;
                    }
                    tried_rank = tried_rank.min(r);
                    let l0 = Instant::now();
                    let s = super::hensel::lift_scheme(&b.to_scheme(), self.goal, &p.hensel);
                    lift_secs += l0.elapsed().as_secs_f64();
                    let lifted = s.is_some();
                    if use_pool && lower && (lifted || !p.pool.lifted_only) {
                        let pick = shared.moves.load(Ordering::Relaxed);
                        self.pool.lock().expect("lock").offer(b.clone(), r, pick);
                    }
                    let met = s.is_some_and(|s| shared.offer(s, target)) && r <= target;
                    if r <= target && !met {
                        shared.target_lifts_failed.fetch_add(1, Ordering::SeqCst);
                    }
                    met
                }
            }
        };
        let flip = match p.flip_mix.len() {
            0 => &p.flip,
            n => &p.flip_mix[rng.below(n)],
        };
        walk_state(&mut w, target, flip, p.walk_budget, &mut ev);
        if use_pool {
            let end = (!halted()).then(|| (w.snap(), w.rank()));
            self.pool.lock().expect("lock").finish(end, rng.next_u64());
        }
    }
}
