//! The hand-out of runs to the worker threads of a search.
//!
//! Run n of a shard is of kind `n mod k` (the plan's k engines, [`super::RunPlan`]) and has
//! its own seed, whichever thread executes it. With one kind the runs are handed out in
//! order. With several, a free worker takes the next run of the kind whose *weighted
//! time* (wall time of its finished runs plus that of its running ones, divided by the
//! kind's weight) is least: engines whose runs differ a hundredfold in length (a walk that
//! ends only when it stalls, a fit of a few seconds) still share the machine as weighted,
//! where handing the runs out in turn gave nearly all of it to the longer runs. The weights
//! come from the search as evidence arrives ([`kind_weights`]).
//!
//! Invariants: every run number handed out is of this shard and of the kind it is run as;
//! no run is handed out twice; with `restarts = Some(m)` only runs of sequence number
//! below m are handed out; the progress `next_run` is a run number below which every run
//! of the shard has finished.

use super::{Params, Progress, Shared};
use std::cell::Cell;
use std::sync::Mutex;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

/// Numerical runs that end without a converged fit before their share of the time falls
/// (fits of a polynomial product with 8 coefficients converge in about a third of the
/// runs at its rank 15, measured: twelve failures in a row happen about once in a hundred
/// searches).
const FITS_BEFORE_EVIDENCE: u64 = 12;

/// And, for Levenberg-Marquardt fits (small problems, see [`evidence_secs`]), the wall
/// time those runs must have had together, in seconds: a fit of a small data tensor
/// takes a few hundredths of a second and may converge in one run of thirty (a planted
/// 4 x 5 x 6 array of rank 9, measured: 3 of 12 searches of 8 runs found it), so twelve
/// quick failures are no evidence.
const FIT_SECS_BEFORE_EVIDENCE: f64 = 5.0;

/// The fit time, in seconds, that failed fits of kind `fit` need before they count as
/// evidence: [`FIT_SECS_BEFORE_EVIDENCE`] for Levenberg-Marquardt, none for alternating
/// least squares (large problems, where twelve fits take long already and the walks should
/// not wait: matrix products over Q below their border rank). Cost: O(1).
pub fn evidence_secs(fit: super::Fit) -> f64 {
    match fit {
        super::Fit::Lm => FIT_SECS_BEFORE_EVIDENCE,
        super::Fit::Als => 0.0,
    }
}

/// The weight of a kind of run whose evidence is against it (fits that never converge at
/// the rank asked): a thirty-second of the share of the others, not nothing (with an
/// eighth, searches of <4,4,4> at rank 48 over Q made 0.82 times the walk moves of the
/// former hand-out in turn, measured over 60 s).
const WEIGHT_AGAINST: f64 = 1.0 / 32.0;

/// The weight of numerical runs whose fits converge at the rank asked.
const WEIGHT_FOR_FITS: f64 = 8.0;

/// Schemes the walks reached at the target whose lifts failed, before the walks' share
/// falls to [`WEIGHT_AGAINST`] (the numerical runs keep theirs): a data tensor of rank 11
/// reduced mod 2 has many decompositions of rank 11 that are no reduction of one over Q,
/// and the walks at the target, lifting in vain, took nearly all the time from the fits
/// that find it (a planted 6 x 6 x 6 array of rank 11: not within 60 s, against 2 s for
/// the fits alone, measured).
const LIFTS_BEFORE_EVIDENCE: u64 = 256;

/// The weights of the kinds `numeric` (true for a numerical kind) from the outcomes of the
/// numerical runs so far: `fits` tried, `converged` of them converged at the rank asked,
/// `fit_secs` the wall time they took together and `needed_secs` the time they need
/// before failures count ([`evidence_secs`]); `lifts_failed` schemes the walks reached at
/// the target that did not lift to a result.
///
/// Once a fit has converged, the numerical runs get [`WEIGHT_FOR_FITS`] (the rank is
/// reached over the reals, and a product such as a polynomial one may need far more terms
/// over a small field than over Q, so the walks may never get there). When
/// [`FITS_BEFORE_EVIDENCE`] fits have ended in `needed_secs` seconds or more and none
/// converged, they get
/// [`WEIGHT_AGAINST`] (the real rank at this target is likely above it, as for matrix
/// products below their border rank, where the walks are the route). Likewise the walks,
/// when [`LIFTS_BEFORE_EVIDENCE`] of their schemes at the target failed to lift and the
/// plan has numerical runs (both against: equal shares again). Equal weights before.
/// Cost: O(k).
pub fn kind_weights(
    numeric: &[bool],
    fits: u64,
    converged: u64,
    (fit_secs, needed_secs): (f64, f64),
    lifts_failed: u64,
) -> Vec<f64> {
    let walks = if lifts_failed >= LIFTS_BEFORE_EVIDENCE && numeric.contains(&true) {
        WEIGHT_AGAINST
    } else {
        1.0
    };
    let w = if converged > 0 {
        WEIGHT_FOR_FITS
    } else if fits >= FITS_BEFORE_EVIDENCE && fit_secs >= needed_secs {
        WEIGHT_AGAINST
    } else {
        1.0
    };
    numeric.iter().map(|&n| if n { w } else { walks }).collect()
}

/// The state of the hand-out: per kind, the next sequence number to look at, the wall
/// time of its finished runs and the start times of its running ones; the finished
/// sequence numbers.
pub(crate) struct Turns {
    state: Mutex<TurnState>,
    done: Mutex<Vec<u64>>,
}

struct TurnState {
    cursor: Vec<u64>,
    spent: Vec<Duration>,
    running: Vec<Vec<Instant>>,
}

impl TurnState {
    /// The weighted time of `kind` at `now`: its finished runs plus its running ones,
    /// over its weight.
    fn charge(&self, kind: usize, weights: &[f64], now: Instant) -> f64 {
        let busy: Duration = self.running[kind].iter().map(|t| now - *t).sum();
        (self.spent[kind] + busy).as_secs_f64() / weight(weights, kind)
    }
}

/// The weight of `kind` (1 when not given; never zero).
fn weight(weights: &[f64], kind: usize) -> f64 {
    weights.get(kind).copied().unwrap_or(1.0).max(1e-9)
}

impl Turns {
    /// A hand-out over `kinds` kinds of run (at least one).
    pub fn new(kinds: usize) -> Turns {
        let k = kinds.max(1);
        Turns {
            state: Mutex::new(TurnState {
                cursor: vec![0; k],
                spent: vec![Duration::ZERO; k],
                running: vec![Vec::new(); k],
            }),
            done: Mutex::new(Vec::new()),
        }
    }

    /// The next run to execute: `(sequence number, kind, start time)`, or `None` when every
    /// kind is used up (`limit`, or no run of the kind in this shard). `run_of` maps a
    /// sequence number to its run number; `weights` gives the current weight per kind.
    /// Cost: O(k^2).
    fn claim(
        &self,
        run_of: &dyn Fn(u64) -> u64,
        limit: Option<u64>,
        weights: &[f64],
    ) -> Option<(u64, usize, Instant)> {
        let mut st = self.state.lock().expect("lock");
        let k = st.cursor.len();
        let now = Instant::now();
        let mut pick: Option<(f64, u64, usize)> = None;
        for kind in 0..k {
            // the run numbers of a shard visit the kinds with a period dividing k
            let Some(seq) = (st.cursor[kind]..st.cursor[kind] + k as u64)
                .find(|&s| (run_of(s) % k as u64) as usize == kind)
            else {
                continue;
            };
            if limit.is_some_and(|m| seq >= m) {
                continue;
            }
            let charge = st.charge(kind, weights, now);
            if pick.is_none_or(|(c, s, _)| charge < c || (charge == c && seq < s)) {
                pick = Some((charge, seq, kind));
            }
        }
        let (_, seq, kind) = pick?;
        st.cursor[kind] = seq + 1;
        st.running[kind].push(now);
        Some((seq, kind, now))
    }

    /// True when a running run of `kind` should give way: another kind has a higher
    /// weight, and this kind's weighted time exceeds twice that kind's plus one second.
    /// Only a disfavoured kind is ever cut (a walk's deep descent is never cut while the
    /// weights are equal); the search cuts only runs with no bound of their own (walks end
    /// when they stall, fits after a bounded number of steps). Cost: O(k) under the lock.
    fn over_share(&self, kind: usize, weights: &[f64]) -> bool {
        let st = self.state.lock().expect("lock");
        let now = Instant::now();
        let mine = st.charge(kind, weights, now);
        (0..st.cursor.len()).any(|j| {
            j != kind
                && weight(weights, j) > weight(weights, kind)
                && mine > 2.0 * st.charge(j, weights, now) + 1.0
        })
    }

    /// Record the end of a run claimed at `started`; `finished` when it ran to its end
    /// (not cut by the halt), which lets the checkpoint move past it.
    fn release(&self, seq: u64, kind: usize, started: Instant, finished: bool) {
        let mut st = self.state.lock().expect("lock");
        if let Some(i) = st.running[kind].iter().position(|t| *t == started) {
            st.running[kind].swap_remove(i);
        }
        st.spent[kind] += started.elapsed();
        drop(st);
        if finished {
            self.done.lock().expect("lock").push(seq);
        }
    }

    /// The first sequence number not finished: every earlier run is complete.
    fn first_open(&self) -> u64 {
        let mut done = self.done.lock().expect("lock").clone();
        done.sort_unstable();
        let mut first_open = 0;
        for d in done {
            if d == first_open {
                first_open += 1;
            } else if d > first_open {
                break;
            }
        }
        first_open
    }
}

/// One run: `(run number, seed, cut)`, polling `cut` to end early.
pub(crate) type RunFn<'a> = dyn Fn(u64, u64, &dyn Fn() -> bool) + Sync + 'a;

/// Run the runs of this shard on the worker threads until halted or the run limit is
/// used up; report progress from the calling thread. `run(run_no, seed, cut)` executes
/// one run and polls `cut` (the halt, or its kind over its share of the time: see
/// [`Turns::over_share`]); `weights()` gives the current weight of each of the plan's
/// kinds. Returns the final snapshot.
pub(crate) fn drive_runs(
    params: &Params,
    shared: &Shared,
    t0: Instant,
    halted: &(dyn Fn() -> bool + Sync),
    run: &RunFn,
    weights: &(dyn Fn() -> Vec<f64> + Sync),
    progress: &(dyn Fn(&Progress) + Sync),
) -> Progress {
    let (k, n) = params.shard;
    let threads = if params.threads == 0 {
        std::thread::available_parallelism().map_or(1, |x| x.get())
    } else {
        params.threads
    };
    // run numbers of this shard: base, base + N, base + 2N, ... with base = K (mod N)
    let base = params.first_run + (k + n - params.first_run % n) % n;
    let run_of = |seq: u64| base + seq * n;
    let workers_left = AtomicUsize::new(threads);
    std::thread::scope(|sc| {
        for _ in 0..threads {
            sc.spawn(|| {
                while !halted() {
                    let Some((seq, kind, started)) =
                        shared.turns.claim(&run_of, params.restarts, &weights())
                    else {
                        break;
                    };
                    let run_no = run_of(seq);
                    // the share is checked at most every 50 ms (the walks poll often)
                    let last_check = Cell::new((Instant::now(), false));
                    let cut = || {
                        if halted() {
                            return true;
                        }
                        let (at, over) = last_check.get();
                        if !over && at.elapsed() >= Duration::from_millis(50) {
                            let now = (Instant::now(), shared.turns.over_share(kind, &weights()));
                            last_check.set(now);
                            return now.1;
                        }
                        over
                    };
                    run(run_no, super::run_seed(params.seed, run_no), &cut);
                    shared.turns.release(seq, kind, started, !halted());
                }
                workers_left.fetch_sub(1, Ordering::SeqCst);
            });
        }
        let mut last = Instant::now();
        while workers_left.load(Ordering::SeqCst) > 0 {
            std::thread::sleep(Duration::from_millis(2));
            if last.elapsed() >= Duration::from_millis(500) {
                last = Instant::now();
                progress(&snapshot(shared, t0, &run_of));
            }
        }
    });
    let snap = snapshot(shared, t0, &run_of);
    progress(&snap);
    snap
}

fn snapshot(shared: &Shared, t0: Instant, run_of: &dyn Fn(u64) -> u64) -> Progress {
    let wr = shared.walk_rank.load(Ordering::SeqCst);
    Progress {
        best: shared.best.lock().expect("lock").clone(),
        moves: shared.moves.load(Ordering::Relaxed),
        walk_rank: (wr != usize::MAX).then_some(wr),
        next_run: run_of(shared.turns.first_open()),
        elapsed: t0.elapsed(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// One kind: the runs go out in order, as many as the limit allows.
    #[test]
    fn one_kind_in_order() {
        let t = Turns::new(1);
        let run_of = |s: u64| s;
        let seqs: Vec<u64> = std::iter::from_fn(|| {
            let (s, kind, at) = t.claim(&run_of, Some(5), &[1.0])?;
            t.release(s, kind, at, true);
            Some(s)
        })
        .collect();
        assert_eq!(seqs, vec![0, 1, 2, 3, 4]);
        assert_eq!(t.first_open(), 5);
    }

    /// Two kinds: each run handed out is of its kind (run number mod 2), none twice, and a
    /// shard whose run numbers are all even never gets a run of the odd kind.
    #[test]
    fn kinds_follow_run_numbers() {
        let t = Turns::new(2);
        let run_of = |s: u64| 3 + 2 * s; // shard 1/2 from run 3: all odd
        for _ in 0..6 {
            let (s, kind, at) = t.claim(&run_of, None, &[1.0, 1.0]).expect("a run");
            assert_eq!(kind, 1);
            t.release(s, kind, at, true);
        }
        let t = Turns::new(2);
        let run_of = |s: u64| s;
        let mut seen = Vec::new();
        for _ in 0..8 {
            let (s, kind, at) = t.claim(&run_of, None, &[1.0, 1.0]).expect("a run");
            assert_eq!(kind as u64, s % 2);
            assert!(!seen.contains(&s));
            seen.push(s);
            t.release(s, kind, at, true);
        }
    }

    /// The kind with the least weighted time goes next: a long run of kind 0 still
    /// running sends the next claims to kind 1, and an unfinished run holds the
    /// checkpoint back.
    #[test]
    fn least_weighted_time_goes_next() {
        let t = Turns::new(2);
        let run_of = |s: u64| s;
        let (s0, k0, at0) = t.claim(&run_of, None, &[1.0, 1.0]).unwrap();
        assert_eq!((s0, k0), (0, 0));
        std::thread::sleep(Duration::from_millis(30));
        for expect in [1, 3, 5] {
            let (s, kind, at) = t.claim(&run_of, None, &[1.0, 1.0]).unwrap();
            assert_eq!((s, kind), (expect, 1));
            t.release(s, kind, at, true);
        }
        assert_eq!(t.first_open(), 0);
        t.release(s0, k0, at0, true);
        assert_eq!(t.first_open(), 2);
    }

    /// The policy: fits that never converge lose most of their share, one converged fit
    /// gains it, and nothing changes before the evidence.
    #[test]
    fn weights_follow_the_fits() {
        let kinds = [false, true];
        let lm = evidence_secs(crate::search::Fit::Lm);
        assert_eq!(kind_weights(&kinds, 11, 0, (60.0, lm), 0), vec![1.0, 1.0]);
        assert_eq!(
            kind_weights(&kinds, 12, 0, (60.0, lm), 0),
            vec![1.0, WEIGHT_AGAINST]
        );
        // twelve quick failures of Levenberg-Marquardt are no evidence yet
        assert_eq!(kind_weights(&kinds, 40, 0, (2.0, lm), 0), vec![1.0, 1.0]);
        let als = evidence_secs(crate::search::Fit::Als);
        assert_eq!(
            kind_weights(&kinds, 12, 0, (2.0, als), 0),
            vec![1.0, WEIGHT_AGAINST]
        );
        assert_eq!(
            kind_weights(&kinds, 2, 1, (0.1, lm), 0),
            vec![1.0, WEIGHT_FOR_FITS]
        );
        // walks lifting in vain at the target lose their share to the fits
        assert_eq!(
            kind_weights(&kinds, 2, 0, (0.1, lm), LIFTS_BEFORE_EVIDENCE),
            vec![WEIGHT_AGAINST, 1.0]
        );
        assert_eq!(
            kind_weights(&[false], 0, 0, (0.0, 0.0), LIFTS_BEFORE_EVIDENCE),
            vec![1.0]
        );
    }
}
