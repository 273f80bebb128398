//! The slice-span bound: contracting one axis of T with a linear form maps a rank-one
//! tensor to a matrix of rank <= 1 and is linear, so every matrix in the span of the
//! slices along one axis has rank at most the rank of T, and (a vanishing minor stays
//! vanishing in a limit) at most its border rank:
//!
//! ```text
//! border rank(T) >= rank(sum_s c_s M_s)  for any coefficients c_s
//! ```
//!
//! (common practice; Buergisser, Clausen and Shokrollahi 1997, "Algebraic Complexity
//! Theory", ch. 14). bilin takes the exact rank of seeded random combinations; the
//! statement holds over every extension of the tensor's field.

use super::bound::{Bound, BoundsParams, Measure, Method};
use crate::tensor::{AXES, Tensor};
use rand::{Rng, SeedableRng};

/// The theorem, for reports.
pub const THEOREM: &str = "border rank (hence rank) >= the rank of any matrix in the span of \
     the slices along one axis (Buergisser, Clausen and Shokrollahi 1997, Algebraic \
     Complexity Theory, ch. 14; common practice)";

/// The slice-span bound: the best exact rank among seeded random combinations.
/// Cost: `3 slice_trials` exact ranks of slice combinations.
pub fn bound(t: &Tensor, params: &BoundsParams) -> Bound {
    let (value, axis) = slice_span_rank(t, params);
    Bound::proven(
        Method::SliceSpan,
        value,
        Measure::BorderRank,
        t.field(),
        true,
        format!(
            "exact rank of a seeded random combination of the {} slices (seed {})",
            AXES[axis], params.seed
        ),
    )
}

/// The largest exact rank among seeded random combinations of the slices along each axis;
/// returns (rank, axis).
pub fn slice_span_rank(t: &Tensor, params: &BoundsParams) -> (usize, usize) {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    let mut best = (0, 0);
    for axis in 0..3 {
        let k = t.dims()[axis];
        if k == 0 {
            continue;
        }
        for _ in 0..params.slice_trials.max(1) {
            let c: Vec<i64> = (0..k).map(|_| rng.gen_range(-1000i64..=1000)).collect();
            let r = super::combination_rank(t, axis, &c);
            if r > best.0 {
                best = (r, axis);
            }
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::matmul;

    #[test]
    fn slice_span_of_matmul() {
        // a generic combination of the slices of <2,2,2> is invertible (common practice)
        assert_eq!(
            slice_span_rank(&matmul(2, 2, 2), &BoundsParams::default()).0,
            4
        );
    }
}
