//! Explicit isomorphisms between matrix products written in bases of their own: both are
//! put in their standard form by frames ([`crate::structure::matrix_frame`]) and the
//! frames are composed.
//!
//! If `change_basis(x', B_x) = H = change_basis(e', B_e)` for the same permutation of the
//! axes (x', e' the permuted tensors, H the standard product of the permuted format), then
//! `x' = change_basis(e', B_e B_x^-1)` axis by axis (changes of basis compose as products
//! of their matrices). Back on the original axes, a matrix M that moved between an input
//! axis and the result axis becomes `(M^-1)^T` (coefficients transform covariantly on the
//! inputs, contravariantly on the result).
//!
//! Invariant: a triple of maps is returned only after `change_basis(e, M_0, M_1, M_2)`
//! reproduces `x`'s coefficients exactly ([`super::same_constants`]).

use crate::linalg::Matrix;
use crate::linalg::modular::inverse_q;
use crate::scalar::{Q, Rationals};
use crate::structure::matrix_frame::{FrameParams, candidate_permutations, frame_for};
use crate::tensor::{Tensor, change_basis};

/// Invertible `[M_0, M_1, M_2]` (columns: the images in e's bases of x's basis vectors,
/// axis by axis) with `change_basis(e, M_0, M_1, M_2)` equal to x, when both are the same
/// matrix product in bases of their own and the format is one the frames reach; `None`
/// otherwise (which does not mean "not isomorphic"). Cost: two frames per permutation
/// tried ([`frame_for`]), three inverses and products, one change of basis.
pub fn find_product_isomorphism(
    x: &Tensor,
    e: &Tensor,
    params: &FrameParams,
) -> Option<[Matrix<Q>; 3]> {
    if x.dims() != e.dims() || x.field() != e.field() {
        return None;
    }
    for (perm, _) in candidate_permutations(x.dims()) {
        let (Some(bx), Some(be)) = (frame_for(x, perm, params), frame_for(e, perm, params)) else {
            continue;
        };
        let mut maps: [Option<Matrix<Q>>; 3] = Default::default();
        for i in 0..3 {
            let m = be[i].mul(&Rationals, &inverse_q(&bx[i])?);
            // an input axis moved to the result (or back) changes variance: the
            // coefficients transform by M on an input axis and by the inverse of S on the
            // result, so M there is S = (M^-1)^T
            maps[perm[i]] = Some(if (i == 2) == (perm[i] == 2) {
                m
            } else {
                inverse_q(&m)?.transpose()
            });
        }
        let [Some(m0), Some(m1), Some(m2)] = maps else {
            continue;
        };
        let image = change_basis(e, &m0, &m1, &m2)?;
        if super::same_constants(&image, x) {
            return Some([m0, m1, m2]);
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;
    use crate::tensor::random_invertible;

    #[test]
    fn a_matrix_product_against_its_generator() {
        for f in [[2, 2, 3], [3, 2, 4]] {
            let e = generate(&format!("matmul:{},{},{}", f[0], f[1], f[2])).unwrap();
            let d = e.dims();
            let [p, q, r] = [0, 1, 2].map(|i| random_invertible(d[i], 500, 70 + i as u64));
            let x = change_basis(&e, &p, &q, &r).unwrap();
            let [m0, m1, m2] = find_product_isomorphism(&x, &e, &FrameParams::default()).unwrap();
            let back = change_basis(&e, &m0, &m1, &m2).unwrap();
            assert!(crate::iso::same_constants(&back, &x), "{f:?}");
        }
        // another product of the same dimensions: none
        let x = generate("matmul:2,2,3").unwrap();
        let e = generate("poly:2,5").unwrap();
        assert!(find_product_isomorphism(&x, &e, &FrameParams::default()).is_none());
    }
}
