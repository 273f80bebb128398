//! The rank interval section of the `analyze` report and of `bounds`: the best proven
//! lower bound (from [`crate::scheme::bounds::lower_bounds`]) against the verified upper
//! bounds of [`crate::interval`].

use super::Section;
use crate::interval::{Lower, RankInterval, UpperParams, rank_interval};
use crate::scheme::Scheme;
use crate::scheme::bounds::Bounds;
use crate::tensor::Tensor;

/// The best lower bound of a set of proven lower bounds, with its theorem.
pub fn best_lower(b: &Bounds) -> Lower {
    b.bounds
        .iter()
        .max_by_key(|x| x.value)
        .map(|x| Lower {
            value: x.value,
            name: x.name.clone(),
            theorem: x.theorem.clone(),
        })
        .unwrap_or(Lower {
            value: 0,
            name: "none".into(),
            theorem: "-".into(),
        })
}

/// The best lower bound recorded in a lower-bounds section's data (its `bounds` list).
pub fn lower_of_section(s: &Section) -> Lower {
    let best = s.data["bounds"]
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|b| Some((b["value"].as_u64()?, b)))
        .max_by_key(|(v, _)| *v);
    match best {
        Some((v, b)) => Lower {
            value: v as usize,
            name: b["name"].as_str().unwrap_or("").into(),
            theorem: b["theorem"].as_str().unwrap_or("").into(),
        },
        None => Lower {
            value: 0,
            name: "none".into(),
            theorem: "-".into(),
        },
    }
}

/// The interval `lower <= R <= upper` for `t` given its lower bounds and extra schemes.
/// Cost: that of [`rank_interval`].
pub fn interval_of(
    t: &Tensor,
    lower: &Bounds,
    params: &UpperParams,
    given: &[(String, Scheme)],
) -> RankInterval {
    rank_interval(t, best_lower(lower), params, given)
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
