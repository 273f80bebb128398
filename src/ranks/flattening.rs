//! The flattening bound: a rank-one tensor u (x) v (x) w has flattenings of rank 1, and a
//! limit of tensors of rank r has flattenings of rank <= r (a minor that vanishes along a
//! sequence vanishes at its limit), so
//!
//! ```text
//! border rank(T) >= rank of each of the three flattenings U* -> V (x) W, ...
//! ```
//!
//! (common practice; Buergisser, Clausen and Shokrollahi 1997, "Algebraic Complexity
//! Theory", ch. 14). Matrix ranks do not change under field extension, so the bound holds
//! over every extension of the tensor's field. Along the result axis this is the number
//! of independent result coordinates.

use super::bound::{Bound, Measure, Method};
use crate::tensor::{Tensor, flattening_ranks};

/// The theorem, for reports.
pub const THEOREM: &str = "border rank (hence rank) >= the rank of each flattening \
     (Buergisser, Clausen and Shokrollahi 1997, Algebraic Complexity Theory, ch. 14; common practice)";

/// The flattening bound of `t`. Cost: three exact flattening ranks (one elimination modulo
/// a prime each, plus an exact nullspace when a rank is not full).
pub fn bound(t: &Tensor) -> Bound {
    let fr = flattening_ranks(t);
    Bound::proven(
        Method::Flattening,
        fr.iter().copied().max().unwrap_or(0),
        Measure::BorderRank,
        t.field(),
        true,
        format!(
            "flattening ranks: left {} of {}, right {} of {}, result {} of {} (the rank of \
             each flattening against the dimension of its space)",
            fr[0],
            t.dims()[0],
            fr[1],
            t.dims()[1],
            fr[2],
            t.dims()[2]
        ),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::matmul;

    #[test]
    fn flattenings_of_matmul() {
        // flattening ranks of <n,n,n> are n^2 (common practice)
        assert_eq!(bound(&matmul(2, 2, 2)).value, 4);
        assert_eq!(bound(&matmul(3, 3, 3)).value, 9);
        assert_eq!(bound(&matmul(2, 3, 4)).value, 12);
    }
}
