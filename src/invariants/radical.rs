//! The (Jacobson) radical of a finite-dimensional associative algebra over Q, by Dickson's
//! trace-form criterion, and the semisimple quotient.
//!
//! Criterion (char 0): `rad A = {x : Tr(L_{xy}) = 0 for all y in A}` with `L` the left
//! regular representation. Proof sketch: `T(x, y) = Tr(L_x L_y)` is symmetric and
//! associative (`T(xy, z) = T(x, yz)`), so its radical I is an ideal; for x in I,
//! `Tr(L_x^k) = 0` for all k >= 1, so in characteristic 0 `L_x` is nilpotent and so is x
//! (`L_x^k 1 = x^k` in the unital hull), hence I is a nil ideal, I ⊆ rad A; conversely
//! x in rad A makes `xy` nilpotent and `Tr(L_{xy}) = 0`. (Curtis and Reiner 1962,
//! Representation Theory of Finite Groups and Associative Algebras; Pierce 1982,
//! Associative Algebras.) The condition `Tr(L_x) = 0` (y = 1 in the unital hull) is added
//! to the equations; it is implied by the others. Over GF(p) the criterion fails and the
//! radical is reported as not available.
//!
//! Cost: one n x n Gram system, plus the quotient's structure constants
//! (O((n - r)^2 (nnz-row + r n))) and its centre.

use super::elements::{ElementSpace, element_space};
use super::equations::{Eq, System};
use crate::error::Result;
use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
use crate::linalg::{Matrix, echelon};
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::IntegralTensor;
use crate::tensor::Tensor;
use num_traits::Zero;

/// The radical and the semisimple quotient A / rad A.
#[derive(Clone, Debug)]
pub struct Radical {
    pub space: Space,
    pub semisimple: bool,
    pub quotient_dim: usize,
    /// Dimension of the centre of A / rad A (its number of simple components over their
    /// centres' degrees, by Wedderburn's theorem).
    pub quotient_centre_dim: usize,
}

/// The radical of an associative algebra over Q (the caller checks associativity).
/// `None` over GF(p) (the trace-form criterion needs characteristic 0).
pub fn radical(t: &Tensor, it: &IntegralTensor, params: &SolveParams) -> Result<Option<Radical>> {
    if t.field() != FieldSpec::Rational {
        return Ok(None);
    }
    let n = t.dim();
    let space = solve_nullspace(&System::new(it, &[Eq::TraceForm]), params)?;
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
    }))
}

/// The quotient algebra A / I for an ideal I with the given basis: basis the images of
/// the e_s for s outside the pivot columns of I's reduced echelon form.
pub fn quotient(t: &Tensor, ideal: &[Vec<Q>]) -> Tensor {
    let n = t.dim();
    let mut m = Matrix::from_rows(ideal.to_vec(), n);
    let pivots = echelon::rref(&Rationals, &mut m);
    let mut is_p = vec![false; n];
    for &p in &pivots {
        is_p[p] = true;
    }
    let keep: Vec<usize> = (0..n).filter(|&c| !is_p[c]).collect();
    let names: Vec<String> = keep.iter().map(|&s| t.name(0, s).to_string()).collect();
    let mut out = Tensor::algebra(t.field(), names);
    for (a, &i) in keep.iter().enumerate() {
        for (b, &j) in keep.iter().enumerate() {
            let mut w = vec![Q::zero(); n];
            for (k, c) in t.product(i, j) {
                w[*k] = c.clone();
            }
            for (row, &p) in pivots.iter().enumerate() {
                if !w[p].is_zero() {
                    let f = w[p].clone();
                    for (x, y) in w.iter_mut().zip(m.row(row)) {
                        if !y.is_zero() {
                            *x -= &f * y;
                        }
                    }
                }
            }
            for (c, &s) in keep.iter().enumerate() {
                if !w[s].is_zero() {
                    out.set(a, b, c, w[s].clone());
                }
            }
        }
    }
    out
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
}
