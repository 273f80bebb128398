//! Re-deriving stored bounds on the tensor rank of a catalog entry.
//!
//! - `rank.lower = r` agrees when bilin *proves* R >= r with its own lower bounds
//!   ([`crate::ranks::lower_bounds`], over GF(2) with an exhaustive proof up to r); a stored lower bound above what bilin proves stays
//!   "not computable" (e.g. bounds from deeper theorems).
//! - `rank.upper = r` agrees when a seeded search finds a scheme of rank at most r that
//!   verifies exactly over the fact's field; it *disagrees* when r is below a lower bound
//!   bilin proves (a contradiction); otherwise, when the search budget runs out, it stays
//!   "not computable".
//!
//! Searches run only for tensors whose largest axis is at most `max_dim` and stop after
//! `search_seconds`, so the check stays cheap.

use super::facts::FactCheck;
use crate::ranks::exhaustive::ExhaustiveParams;
use crate::ranks::{BoundsParams, lower_bounds};
use crate::scalar::FieldSpec;
use crate::search::{self, Method};
use crate::tensor::Tensor;
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::Duration;

/// Budget of the rank checks.
#[derive(Clone, Debug)]
pub struct RankCheckParams {
    /// Wall-clock limit of each search for an upper bound.
    pub search_seconds: f64,
    /// Searches run only when every dimension of the tensor is at most this.
    pub max_dim: usize,
    /// Seed of the searches and of the random slice combinations.
    pub seed: u64,
}

impl Default for RankCheckParams {
    fn default() -> Self {
        RankCheckParams {
            search_seconds: 2.0,
            max_dim: 16,
            seed: 0,
        }
    }
}

/// Check a stored `rank.lower` or `rank.upper` fact of `t`; `domain` is the fact's field
/// (`Q` or `GF(p)`; `None` means the tensor's own field). Cost: the lower bounds of `t`,
/// plus at most one search of `params.search_seconds` for an upper bound.
pub fn check_rank_fact(
    key: &str,
    value: &str,
    domain: Option<&str>,
    t: &Tensor,
    params: &RankCheckParams,
) -> FactCheck {
    let Ok(r) = value.trim().parse::<usize>() else {
        return FactCheck::NotComputable(format!("`{value}` is not a rank"));
    };
    let field = match domain.map(FieldSpec::parse) {
        None => t.field(),
        Some(Ok(f)) => f,
        Some(Err(m)) => return FactCheck::NotComputable(m),
    };
    let goal = if field == t.field() {
        t.clone()
    } else {
        match t.with_field(field) {
            Ok(g) => g,
            Err(m) => return FactCheck::NotComputable(m),
        }
    };
    // exhaustive proofs (over GF(2)) run for a stored lower bound, up to that bound only
    let exhaustive = (key == "rank.lower").then(|| ExhaustiveParams {
        goal: Some(r),
        max_work: 200_000_000,
        ..ExhaustiveParams::default()
    });
    let bounds = lower_bounds(
        &goal,
        &BoundsParams {
            seed: params.seed,
            exhaustive,
            ..BoundsParams::default()
        },
    );
    let proven = bounds.best();
    match key {
        "rank.lower" if proven >= r => FactCheck::Agrees,
        "rank.lower" => FactCheck::NotComputable(format!(
            "bilin proves R >= {proven} over {field}, not R >= {r}"
        )),
        "rank.upper" if r < proven => {
            FactCheck::Disagrees(format!("bilin proves R >= {proven} over {field}"))
        }
        "rank.upper" => search_upper(&goal, t, field, r, proven, params),
        _ => FactCheck::NotComputable(format!("no computation for the fact key `{key}`")),
    }
}

/// Search for a verified scheme of rank at most `r` over `field`.
fn search_upper(
    goal: &Tensor,
    t: &Tensor,
    field: FieldSpec,
    r: usize,
    proven: usize,
    params: &RankCheckParams,
) -> FactCheck {
    if goal.dims().iter().any(|&d| d > params.max_dim) {
        return FactCheck::NotComputable(format!(
            "no search for tensors with an axis above {} (checking budget)",
            params.max_dim
        ));
    }
    if goal.nnz() <= r {
        return FactCheck::Agrees; // the standard scheme already has rank nnz <= r
    }
    // Over Q the flip walk runs over GF(2) and lifts; numerical search covers tensors whose
    // reduction mod 2 loses the structure (fractions with even denominators).
    let methods: &[Method] = match field {
        FieldSpec::Rational => &[Method::Flip, Method::Als],
        FieldSpec::Prime(2) => &[Method::Flip],
        FieldSpec::Prime(_) => {
            return FactCheck::NotComputable(format!("no rank search over {field}"));
        }
    };
    let share = params.search_seconds / methods.len() as f64;
    for &method in methods {
        let p = search::Params {
            target_rank: Some(r),
            time_limit: Some(Duration::from_secs_f64(share)),
            seed: params.seed,
            method,
            field: if field == t.field() {
                None
            } else {
                Some(field)
            },
            ..search::Params::default()
        };
        let stop = Arc::new(AtomicBool::new(false));
        if let Ok(out) = search::search_scheme(t, &p, &stop, None, &|_| {})
            && out.best.as_ref().is_some_and(|s| s.rank() <= r)
        {
            return FactCheck::Agrees;
        }
    }
    FactCheck::NotComputable(format!(
        "no scheme of rank {r} found within {} s; bilin proves R >= {proven}",
        params.search_seconds
    ))
}
