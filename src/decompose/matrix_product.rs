//! The matrix product `<n,m,p>` written in three bases of the user's own: the catalog's
//! best scheme of the format carried into those bases through the frame found exactly by
//! [`crate::structure::matrix_frame`] (which formats are reached is said there).
//!
//! If `u_ik`, `v_kj`, `w_ij` are the frame vectors, a linear form `α` of the model scheme
//! reads `x -> α(B_U^-1 x)` (`B_U` the matrix of the `u_ik`), a model result `z` is
//! `B_W z`; the sum is the model scheme in the tensor's bases, of the same rank.
//!
//! Invariant: a scheme is returned only after the exact check against the tensor
//! ([`crate::scheme::verify`]).

use super::transport::push_transported;
use crate::linalg::Matrix;
use crate::linalg::modular::inverse_exact;
use crate::scalar::Field;
use crate::scheme::construct::permute_axes;
use crate::scheme::{Scheme, verify};
use crate::structure::matrix_frame::{
    FrameParams, candidate_permutations, format_of_dims, frame_in,
};
use crate::tensor::{Tensor, inverse_permutation};

/// A matrix product recognised in the tensor's bases.
#[derive(Clone, Debug)]
pub struct MatrixProduct {
    /// `[n, m, p]`: the tensor is `<n,m,p>` in some bases of its three spaces.
    pub format: [usize; 3],
    /// The model scheme of the format carried into the tensor's bases, verified exactly.
    pub scheme: Scheme,
}

/// The catalog's scheme of the recognised format (`scheme_of([n, m, p])`: a scheme of the
/// generator `matmul:n,m,p` over the tensor's field) carried into the tensor's bases, or
/// `None`: the dimensions are not those of a matrix product, the format is not one the
/// frame reaches, the tensor is not a matrix product, or the format has no scheme. Cost:
/// that of [`frame_in`] for the permutations tried (the first that applies, as a rule),
/// two inverses of sizes a and b, one combination of integer rows per factor, and one
/// exact verification.
pub fn matrix_product_scheme(
    t: &Tensor,
    params: &FrameParams,
    scheme_of: &dyn Fn([usize; 3]) -> Option<Scheme>,
) -> Option<MatrixProduct> {
    let format = format_of_dims(t.dims())?;
    for (perm, permuted) in candidate_permutations(t.dims()) {
        let moved = t.permute_axes(perm);
        let Some(s) =
            crate::with_field!(t.field(), f => carried(f, &moved, permuted, params, scheme_of))
        else {
            continue;
        };
        // a scheme of t.permute_axes(perm) back on t's axes
        let Ok(scheme) = permute_axes(&s, inverse_permutation(perm)) else {
            continue;
        };
        if verify(&scheme, t).is_ok() {
            return Some(MatrixProduct { format, scheme });
        }
    }
    None
}

/// The model scheme of `format` carried through the frame of `t` (not yet verified).
fn carried<F: Field>(
    f: &F,
    t: &Tensor,
    format: [usize; 3],
    params: &FrameParams,
    scheme_of: &dyn Fn([usize; 3]) -> Option<Scheme>,
) -> Option<Scheme> {
    let fv = frame_in(f, t, format, params)?;
    // model coordinates of the tensor's basis vectors: the columns of the inverses
    let coords = |basis: &[Vec<F::Elem>]| -> Option<Vec<Vec<F::Elem>>> {
        let d = basis.len();
        let cols = Matrix::from_rows(basis.to_vec(), d).transpose();
        let inv = inverse_exact(f, &cols)?;
        Some((0..d).map(|e| inv.column(e)).collect())
    };
    let (pu, pv) = (coords(&fv.us)?, coords(&fv.vs)?);
    let model = scheme_of(format)?;
    let mut out = Scheme::empty(t.field(), t.dims());
    push_transported(f, &mut out, &model, [&pu, &pv], &fv.ws);
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;
    use crate::structure::matrix_frame::tests::scrambled;

    /// The schoolbook scheme of a format (the catalog's schemes live above this layer).
    fn schoolbook(f: [usize; 3]) -> Option<Scheme> {
        Some(Scheme::standard(
            &generate(&format!("matmul:{},{},{}", f[0], f[1], f[2])).ok()?,
        ))
    }

    #[test]
    fn schemes_carried_into_three_random_bases() {
        for f in [[2, 2, 3], [2, 3, 2], [3, 2, 2], [2, 3, 4], [1, 2, 3]] {
            for (b, seed) in [(2, 1), (1000, 2)] {
                let t = scrambled(f, b, seed);
                let s = matrix_product_scheme(&t, &FrameParams::default(), &schoolbook)
                    .unwrap_or_else(|| panic!("{f:?} entries {b} seed {seed}"));
                assert_eq!(s.format, f);
                assert_eq!(s.scheme.rank(), f[0] * f[1] * f[2]);
            }
        }
        assert!(
            matrix_product_scheme(
                &generate("matmul:2,2,4").unwrap(),
                &FrameParams::default(),
                &schoolbook
            )
            .is_none()
        );
    }

    proptest::proptest! {
        #![proptest_config(proptest::prelude::ProptestConfig { cases: 12, rng_algorithm: proptest::test_runner::RngAlgorithm::ChaCha, ..Default::default() })]
        /// The format and the rank do not depend on the bases: seeded random changes of
        /// basis of the three spaces (entries up to 5 or up to 10^6) of <2,2,3>, <2,3,2>
        /// and <1,3,2> give the format and a verified scheme of the schoolbook rank.
        #[test]
        fn found_in_any_bases(which in 0usize..3, big in proptest::bool::ANY, seed in 0u64..1000) {
            let f = [[2, 2, 3], [2, 3, 2], [1, 3, 2]][which];
            let t = scrambled(f, if big { 1_000_000 } else { 5 }, seed);
            let s = matrix_product_scheme(&t, &FrameParams::default(), &schoolbook);
            let s = s.expect("found");
            proptest::prop_assert_eq!(s.format, f);
            proptest::prop_assert_eq!(s.scheme.rank(), f[0] * f[1] * f[2]);
            proptest::prop_assert!(verify(&s.scheme, &t).is_ok());
        }
    }
}
