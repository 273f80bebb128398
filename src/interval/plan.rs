//! The plan of a search from what is known about the rank: at or above the verified upper
//! bound the known scheme is the answer at once; below a proven lower bound the target is
//! refused with the bound; otherwise a method is chosen from the tensor (when the user
//! gave none) and the walks start from the known scheme. Every choice carries its reason
//! in words, for the user to read.

use super::RankInterval;
use crate::error::Result;
use crate::scalar::FieldSpec;
use crate::scheme::Scheme;
use crate::search::{Method, Outcome, Params, Progress, search_scheme};
use crate::tensor::{Tensor, flattening_ranks};
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};

/// One stage of a search: a method, the share of the time limit it gets, and why.
#[derive(Clone, Debug, PartialEq)]
pub struct Stage {
    pub method: Method,
    /// Fraction of the time limit (the stages' shares add up to 1).
    pub share: f64,
    pub reason: String,
}

/// What a search should do.
#[derive(Clone, Debug)]
pub enum Plan {
    /// The known scheme already reaches the target.
    Known { scheme: Scheme, reason: String },
    /// The target is below a proven lower bound; `known` is the best verified scheme.
    Refuse {
        bound: usize,
        reason: String,
        known: Scheme,
    },
    /// Run these stages in turn, starting from `start` (the known scheme).
    Search { stages: Vec<Stage>, start: Scheme },
}

/// The plan for a search of `t` for a scheme of rank at most `target` (`None`: improve on
/// the upper bound), with the user's method if any. Cost: for a tensor over Q without a
/// method, the flattening ranks of its reduction mod 2.
pub fn plan_search(
    t: &Tensor,
    target: Option<usize>,
    interval: &RankInterval,
    method: Option<Method>,
) -> Plan {
    let upper = &interval.upper;
    if let Some(r) = target {
        if r >= upper.value {
            return Plan::Known {
                scheme: upper.scheme.clone(),
                reason: format!(
                    "rank {r} is at or above the verified upper bound {} ({}: {})",
                    upper.value, upper.name, upper.detail
                ),
            };
        }
        if r < interval.lower.value {
            return Plan::Refuse {
                known: upper.scheme.clone(),
                bound: interval.lower.value,
                reason: format!(
                    "rank {r} is below the proven lower bound R >= {} over {} ({}: {})",
                    interval.lower.value,
                    t.field().name(),
                    interval.lower.name,
                    interval.lower.theorem
                ),
            };
        }
    }
    let stages = match method {
        Some(m) => vec![Stage {
            method: m,
            share: 1.0,
            reason: "the method asked for".into(),
        }],
        None => choose_stages(t),
    };
    Plan::Search {
        stages,
        start: upper.scheme.clone(),
    }
}

/// The method chosen from the tensor: over GF(p), walks over GF(p); over Q, walks over
/// GF(2) then lifting when the reduction mod 2 keeps the flattening ranks (followed by the
/// numerical route for the second half of the time, since a rank over GF(2) may exceed the
/// rank over Q), else the numerical route alone.
pub fn choose_stages(t: &Tensor) -> Vec<Stage> {
    let numeric = |share: f64, why: String| Stage {
        method: Method::Als,
        share,
        reason: format!("numerical route over Q, rounding and exact verification: {why}"),
    };
    if let FieldSpec::Prime(p) = t.field() {
        return vec![Stage {
            method: Method::Flip,
            share: 1.0,
            reason: format!("walks over GF({p}), the tensor's own field"),
        }];
    }
    let over_q = flattening_ranks(t);
    let Ok(mod2) = t.with_field(FieldSpec::Prime(2)) else {
        return vec![numeric(
            1.0,
            "the tensor has even denominators, so it does not reduce mod 2".into(),
        )];
    };
    let kept = flattening_ranks(&mod2);
    if kept != over_q {
        return vec![numeric(
            1.0,
            format!(
                "reduced mod 2 the flattening ranks drop from {:?} to {:?}, so schemes found \
                 over GF(2) cannot lift to this tensor",
                over_q, kept
            ),
        )];
    }
    vec![
        Stage {
            method: Method::Flip,
            share: 0.5,
            reason: format!(
                "reduced mod 2 the tensor keeps its flattening ranks {:?}: flip-graph walks \
                 over GF(2), then Hensel lifting to Q and exact verification",
                over_q
            ),
        },
        numeric(
            0.5,
            "the rank over GF(2) may exceed the rank over Q, so the second half of the \
             time goes to it"
                .into(),
        ),
    ]
}

/// Run the stages of a plan in turn with [`search_scheme`], each from the best scheme so
/// far: a stage gets its share of `params.time_limit` (the last one what is left), or 30 s
/// without a limit (the last one: no limit). Without a target the numerical route aims one
/// below the best rank so far. Stops when the target is reached or `stop` is set.
/// `on_stage` is told of each stage before it runs.
pub fn run_stages(
    t: &Tensor,
    stages: &[Stage],
    start: Scheme,
    params: &Params,
    stop: &Arc<AtomicBool>,
    progress: &(dyn Fn(&Progress) + Sync),
    on_stage: &mut dyn FnMut(&Stage),
) -> Result<Outcome> {
    let t0 = Instant::now();
    let mut best = Some(start);
    let mut outcome = None;
    for (n, stage) in stages.iter().enumerate() {
        let last = n + 1 == stages.len();
        on_stage(stage);
        let time_limit = match params.time_limit {
            Some(l) if last => Some(l.saturating_sub(t0.elapsed())),
            Some(l) => Some(l.mul_f64(stage.share)),
            None if last => None,
            None => Some(Duration::from_secs(30)),
        };
        // the numerical route needs a rank: without a target, one below the best so far
        let target_rank = match (params.target_rank, stage.method, &best) {
            (None, Method::Als, Some(b)) => Some(b.rank().saturating_sub(1)),
            (t, _, _) => t,
        };
        let p = Params {
            method: stage.method,
            time_limit,
            target_rank,
            ..params.clone()
        };
        let o = search_scheme(t, &p, stop, best.clone(), progress)?;
        best.clone_from(&o.best);
        let done = o.reached || stop.load(Ordering::SeqCst);
        outcome = Some(o);
        if done {
            break;
        }
    }
    let mut o = outcome.ok_or_else(|| crate::Error::Invalid("no search stage".into()))?;
    o.elapsed = t0.elapsed();
    Ok(o)
}
