//! The (Jacobson) radical of a finite-dimensional associative algebra, in every
//! characteristic, and the semisimple quotient.
//!
//! Over Q, Dickson's trace-form criterion (char 0): `rad A = {x : Tr(L_{xy}) = 0 for all
//! y in A}` with `L` the left regular representation. Proof sketch: `T(x, y) = Tr(L_x L_y)`
//! is symmetric and associative (`T(xy, z) = T(x, yz)`), so its radical I is an ideal; for
//! x in I, `Tr(L_x^k) = 0` for all k >= 1, so in characteristic 0 `L_x` is nilpotent and so
//! is x (`L_x^k 1 = x^k` in the unital hull), hence I is a nil ideal, I ⊆ rad A; conversely
//! x in rad A makes `xy` nilpotent and `Tr(L_{xy}) = 0`. (Curtis and Reiner 1962,
//! Representation Theory of Finite Groups and Associative Algebras; Pierce 1982,
//! Associative Algebras.) The condition `Tr(L_x) = 0` (y = 1 in the unital hull) is added
//! to the equations; it is implied by the others.
//!
//! Over GF(p) the criterion fails (the trace of 1 may vanish); the radical is computed by
//! the method of Cohen, Ivanyos and Wales 1997 ([`super::radical_modp`]) and checked to be
//! a nilpotent ideal.
//!
//! Cost: one n x n Gram system over Q (see [`super::radical_modp`] over GF(p)), plus the
//! quotient's structure constants (O((n - r)^2 (nnz-row + r n))) and its centre.

use super::elements::{ElementSpace, element_space};
use super::equations::{Eq, System};
use super::radical_modp::radical_mod_p;
use crate::error::Result;
use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
use crate::scalar::FieldSpec;
use crate::tensor::IntegralTensor;
use crate::tensor::Tensor;

pub use super::quotient::quotient;

/// The radical and the semisimple quotient A / rad A.
#[derive(Clone, Debug)]
pub struct Radical {
    pub space: Space,
    pub semisimple: bool,
    pub quotient_dim: usize,
    /// Dimension of the centre of A / rad A (its number of simple components over their
    /// centres' degrees, by Wedderburn's theorem).
    pub quotient_centre_dim: usize,
    /// How the radical was computed (the criterion and its source).
    pub method: String,
}

/// The text naming the method of each characteristic.
pub fn radical_method(field: FieldSpec) -> &'static str {
    match field {
        FieldSpec::Rational => "trace form Tr(L_xy), Dickson's criterion (char 0)",
        FieldSpec::Prime(_) => {
            "characteristic-polynomial ideals (Cohen, Ivanyos and Wales 1997), \
             checked to be a nilpotent ideal"
        }
    }
}

/// The radical of an associative algebra (the caller checks associativity), over Q or
/// GF(p). Always `Some` (the option is kept for callers written when GF(p) had none).
/// Errors: those of the engine (GF(p) with p >= 2^28).
pub fn radical(t: &Tensor, it: &IntegralTensor, params: &SolveParams) -> Result<Option<Radical>> {
    let n = t.dim();
    let space = match t.field() {
        FieldSpec::Rational => solve_nullspace(&System::new(it, &[Eq::TraceForm]), params)?,
        FieldSpec::Prime(_) => radical_mod_p(t, it, params)?,
    };
    let r = space.dim();
    let q = quotient(t, &space.dense_basis());
    let qc = if q.dim() == 0 {
        0
    } else {
        element_space(
            &IntegralTensor::from_tensor(&q),
            ElementSpace::Centre,
            params,
        )?
        .dim()
    };
    Ok(Some(Radical {
        semisimple: r == 0,
        quotient_dim: n - r,
        quotient_centre_dim: qc,
        space,
        method: radical_method(t.field()).to_string(),
    }))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::*;

    fn rad(t: &Tensor) -> Radical {
        let it = IntegralTensor::from_tensor(t);
        radical(t, &it, &SolveParams::default()).unwrap().unwrap()
    }

    #[test]
    fn radicals() {
        // Q[S_3] is semisimple (Maschke), A/rad = A of dim 6, centre of dim 3 = number of
        // conjugacy classes: Curtis and Reiner 1962, Representation Theory of Finite
        // Groups and Associative Algebras.
        let r = rad(&group_algebra_s3());
        assert!(r.semisimple);
        assert_eq!((r.quotient_dim, r.quotient_centre_dim), (6, 3));
        // Upper triangular 2x2: rad = Q e12, A/rad = Q x Q: Pierce 1982, Associative
        // Algebras, ch. 4.
        let r = rad(&upper_triangular_2());
        assert_eq!(
            (r.space.dim(), r.quotient_dim, r.quotient_centre_dim),
            (1, 2, 2)
        );
        // Q[x]/(x^n): rad = (x), dim n - 1 (local ring, common practice).
        for n in 1..=5 {
            assert_eq!(rad(&truncated_polynomials(n)).space.dim(), n - 1);
        }
        // M_2 simple: rad = 0, centre of the quotient = Q.
        let r = rad(&matrix_algebra(2));
        assert_eq!((r.space.dim(), r.quotient_centre_dim), (0, 1));
    }

    #[test]
    fn radicals_in_characteristic_p() {
        // F_p[x]/(x^n) is local with radical (x) in every characteristic; F_2[C_2] =
        // F_2[x]/(x^2 - 1) = F_2[y]/(y^2) with y = x + 1 (common practice).
        for p in [2u64, 3, 5] {
            let t = truncated_polynomials(4)
                .with_field(FieldSpec::Prime(p))
                .unwrap();
            assert_eq!(rad(&t).space.dim(), 3, "p = {p}");
        }
        let mut c2 = Tensor::algebra(FieldSpec::Prime(2), vec!["g0".into(), "g1".into()]);
        for i in 0..2 {
            for j in 0..2 {
                c2.set(i, j, (i + j) % 2, crate::scalar::q(1, 1));
            }
        }
        let r = rad(&c2);
        assert_eq!((r.space.dim(), r.quotient_dim), (1, 1));
        // F_p[S_3]: semisimple for p = 5, 7 (Maschke); for p = 2 the radical is the line
        // of the sum of all group elements (F_2[S_3] = B_0 + M_2(F_2) with B_0 local of
        // dimension 2); for p = 3 it has dimension 4 (two simple modules, both of
        // dimension 1). Brauer theory; common practice, checked by hand.
        for (p, want) in [(2u64, 1usize), (3, 4), (5, 0), (7, 0)] {
            let t = group_algebra_s3().with_field(FieldSpec::Prime(p)).unwrap();
            assert_eq!(rad(&t).space.dim(), want, "p = {p}");
        }
        // upper triangular 2x2 over GF(2): rad = the strictly upper part
        let t = upper_triangular_2()
            .with_field(FieldSpec::Prime(2))
            .unwrap();
        assert_eq!(rad(&t).space.dim(), 1);
    }
}
