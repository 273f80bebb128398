//! The plan of a search from what is known about the rank, the one method choice of
//! `bilin search` and of the benchmarks: at or above the verified upper bound the known
//! scheme is the answer at once (when the rank is at most two of the dimensions,
//! simultaneous diagonalisation usually makes the interval a single value, so every target
//! is answered or refused without a walk); below a proven lower bound over the field
//! searched the target is refused with the bound; otherwise the engines come from
//! [`crate::search::plan_runs`] (with [`Method::Auto`]: a prime whose reduction keeps the
//! flattening ranks, then lifting, sharing the time with Levenberg-Marquardt runs) and
//! the search starts from the known scheme. Every choice carries its reason in words.
//!
//! [`known_interval`] is the one place a search learns what is known: the lower bounds of
//! [`crate::ranks`] and the verified upper bounds of [`super::upper`], with any scheme the
//! caller already holds.

use super::{Lower, RankInterval, Upper, UpperParams, rank_interval};
use crate::error::Result;
use crate::ranks::{BoundsParams, lower_bounds};
use crate::scheme::Scheme;
use crate::search::hensel::is_integral;
use crate::search::{Method, Params, RunPlan, known_start, plan_runs};
use crate::tensor::Tensor;

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
    /// Search with these engines, starting from `start` (the known scheme).
    Search { runs: RunPlan, start: Scheme },
}

/// The interval of `t` over its own field: the best proven lower bound of
/// [`lower_bounds`] (seeded with `seed`) against the verified upper bounds, `given`
/// schemes (a resumed search, a stored result) counted among them.
/// Cost: that of [`lower_bounds`] and [`super::upper_bounds`].
pub fn known_interval(t: &Tensor, given: &[(String, Scheme)], seed: u64) -> RankInterval {
    let lower = lower_bounds(
        t,
        &BoundsParams {
            seed: seed.max(1),
            ..BoundsParams::default()
        },
    );
    rank_interval(t, Lower::best_of(&lower), &UpperParams::default(), given)
}

/// The plan for a search of `t` (over its own field) with `params` (target rank, method;
/// [`Method::Auto`] chooses from the tensor) given what is known, `interval`.
/// Errors: the engines do not fit the tensor (see [`plan_runs`]).
/// With `params.integral` (over Z) only schemes with integer coefficients count: the
/// lowest such upper bound, or the scheme built from the stored integer schemes of a
/// matrix format ([`known_start`]) when lower (the standard scheme when none is known).
pub fn plan_search(t: &Tensor, params: &Params, interval: &RankInterval) -> Result<Plan> {
    let integral_best;
    let upper = if params.integral {
        let built = known_start(t, None, true).map(|s| Upper {
            value: s.rank(),
            name: "built".into(),
            detail: "a scheme built from the stored integer schemes, verified exactly".into(),
            scheme: s,
        });
        integral_best = interval
            .uppers
            .iter()
            .filter(|u| is_integral(&u.scheme))
            .chain(built.iter())
            .min_by_key(|u| u.value)
            .cloned()
            .unwrap_or_else(|| {
                let s = Scheme::standard(t);
                Upper {
                    value: s.rank(),
                    name: "standard".into(),
                    detail: "one term per nonzero entry".into(),
                    scheme: s,
                }
            });
        &integral_best
    } else {
        &interval.upper
    };
    if let Some(r) = params.target_rank {
        if r >= upper.value {
            return Ok(Plan::Known {
                scheme: upper.scheme.clone(),
                reason: format!(
                    "rank {r} is at or above the verified upper bound {} ({}: {})",
                    upper.value, upper.name, upper.detail
                ),
            });
        }
        if r < interval.lower.value {
            return Ok(Plan::Refuse {
                known: upper.scheme.clone(),
                bound: interval.lower.value,
                reason: format!(
                    "rank {r} is below the proven lower bound R >= {} over {} ({}: {})",
                    interval.lower.value,
                    t.field().name(),
                    interval.lower.name,
                    interval.lower.theorem
                ),
            });
        }
    }
    let runs = plan_runs(t, params, Some(upper.value))?;
    Ok(Plan::Search {
        runs,
        start: upper.scheme.clone(),
    })
}

/// A method's name as the user types it.
pub fn method_name(m: Method) -> &'static str {
    match m {
        Method::Flip => "flip",
        Method::Als => "als",
        Method::Lm => "lm",
        Method::Auto => "auto",
    }
}
