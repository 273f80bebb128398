//! The rank interval section of the `analyze` report and of `bounds`: the best proven
//! lower bound (from [`crate::ranks::lower_bounds`]) against the verified upper
//! bounds of [`crate::interval`].

use super::Section;
use crate::interval::{Lower, RankInterval, UpperParams, rank_interval};
use crate::ranks::Bounds;
use crate::scheme::Scheme;
use crate::tensor::Tensor;

/// The interval `lower <= R <= upper` for `t` given its lower bounds and extra schemes.
/// Cost: that of [`rank_interval`].
pub fn interval_of(
    t: &Tensor,
    lower: &Bounds,
    params: &UpperParams,
    given: &[(String, Scheme)],
) -> RankInterval {
    rank_interval(t, Lower::best_of(lower), params, given)
}

/// The interval as a report section.
pub fn interval_section(iv: &RankInterval) -> Section {
    Section {
        id: "rank-interval".into(),
        title: "Tensor rank interval".into(),
        lines: iv.lines(),
        data: iv.to_json(),
    }
}
