//! The plan of `bilin search` from what is known about the rank: the interval
//! `lower <= R <= upper` of the tensor (lower bounds over the field searched, the upper
//! side a verified scheme, the resumed scheme counted), then
//! [`bilin::interval::plan::plan_search`].

use bilin::interval::plan::{Plan, plan_search};
use bilin::interval::{UpperParams, rank_interval};
use bilin::scheme::Scheme;
use bilin::scheme::bounds::{BoundsParams, lower_bounds};
use bilin::search::Method;
use bilin::tensor::Tensor;

/// The method named by `--method` (`None` for `auto` or no option), or the usage message.
pub fn parse_method(m: Option<&str>) -> Result<Option<Method>, String> {
    match m {
        None | Some("auto") => Ok(None),
        Some("flip") => Ok(Some(Method::Flip)),
        Some("als") => Ok(Some(Method::Als)),
        Some(other) => Err(format!(
            "unknown method `{other}` (expected auto, flip or als)"
        )),
    }
}

/// The plan for searching `t` at `target` with the user's method, counting `start` (a
/// resumed scheme) among the upper bounds.
pub fn plan(
    t: &Tensor,
    target: Option<usize>,
    method: Option<Method>,
    start: Option<&Scheme>,
    seed: u64,
) -> Plan {
    let lower = lower_bounds(
        t,
        &BoundsParams {
            seed: seed.max(1),
            ..BoundsParams::default()
        },
    );
    let given: Vec<(String, Scheme)> = start
        .map(|s| ("the resumed scheme".to_string(), s.clone()))
        .into_iter()
        .collect();
    let iv = rank_interval(
        t,
        bilin::report::interval::best_lower(&lower),
        &UpperParams::default(),
        &given,
    );
    plan_search(t, target, &iv, method)
}

/// A method's name as the user types it.
pub fn method_name(m: Method) -> &'static str {
    match m {
        Method::Flip => "flip",
        Method::Als => "als",
    }
}
