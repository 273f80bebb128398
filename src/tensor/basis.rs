//! Change of basis.
//!
//! Convention: a change of basis on an axis is an invertible matrix P whose *columns* are
//! the new basis vectors written in the old basis (`e'_j = sum_a P[a][j] e_a`). For a
//! bilinear map with matrices (P, R, S) on (left, right, result) the new coefficients are
//! `c'[i][j][k] = sum_{a,b,c} P[a][i] R[b][j] c[a][b][c] (S^-1)[k][c]`.
//! For an algebra one matrix P serves all three axes.

use super::Tensor;
use crate::linalg::{Matrix, inverse};
use crate::scalar::{Q, Rationals};
use num_traits::Zero;

/// Apply (P, R, S) as above. Returns `None` if S is singular or a shape does not match.
/// The tensor must be over Q or the matrices over the tensor's field (integer
/// representatives); entries are reduced into the field. Computed through word-size
/// primes ([`super::basis_modular`]) when the dense result fits, else directly.
/// Cost: O(d^4) word operations per prime, or O(nnz * d^2 + d^4) exact operations.
pub fn change_basis(t: &Tensor, p: &Matrix<Q>, r: &Matrix<Q>, s: &Matrix<Q>) -> Option<Tensor> {
    let d = t.dims();
    if p.rows != d[0] || p.cols != d[0] || r.rows != d[1] || r.cols != d[1] {
        return None;
    }
    if s.rows != d[2] || s.cols != d[2] {
        return None;
    }
    match super::basis_modular::change_basis_modular(t, p, r, s) {
        Some(result) => result,
        None => change_basis_direct(t, p, r, s),
    }
}

/// [`change_basis`] by exact rational sums (the reference for the modular path).
pub(crate) fn change_basis_direct(
    t: &Tensor,
    p: &Matrix<Q>,
    r: &Matrix<Q>,
    s: &Matrix<Q>,
) -> Option<Tensor> {
    let d = t.dims();
    if p.rows != d[0] || p.cols != d[0] || r.rows != d[1] || r.cols != d[1] {
        return None;
    }
    if s.rows != d[2] || s.cols != d[2] {
        return None;
    }
    let sinv = crate::with_field!(t.field(), f => {
        let sm = s.map(|x| crate::scalar::Field::from_rational(f, x).expect("in field"));
        inverse(f, &sm).map(|m| m.map(|x| crate::scalar::Field::to_rational(f, x)))
    })?;
    let mut out = Tensor::zero(t.field(), t.kind(), d, Some(t.names().clone()));
    // first contract the left and right axes: c1[i][j][c] = sum P[a][i] R[b][j] c[a][b][c]
    let mut c1 = vec![Q::zero(); d[0] * d[1] * d[2]];
    for (a, b, c, v) in t.entries() {
        for i in 0..d[0] {
            let pa = &p[(a, i)];
            if pa.is_zero() {
                continue;
            }
            let pv = pa * v;
            for j in 0..d[1] {
                let rb = &r[(b, j)];
                if !rb.is_zero() {
                    c1[(i * d[1] + j) * d[2] + c] += &pv * rb;
                }
            }
        }
    }
    for i in 0..d[0] {
        for j in 0..d[1] {
            let base = (i * d[1] + j) * d[2];
            for k in 0..d[2] {
                let mut acc = Q::zero();
                for c in 0..d[2] {
                    let x = &c1[base + c];
                    if !x.is_zero() {
                        acc += &sinv[(k, c)] * x;
                    }
                }
                if !acc.is_zero() {
                    out.set(i, j, k, acc);
                }
            }
        }
    }
    Some(out)
}

/// Change of basis of an algebra by one invertible matrix P (columns = new basis).
pub fn change_basis_algebra(t: &Tensor, p: &Matrix<Q>) -> Option<Tensor> {
    change_basis(t, p, p, p)
}

/// A random invertible integer matrix with entries in `-b..=b`, from a seeded generator
/// (used by property tests and by `identify`). Retries until invertible over Q.
pub fn random_invertible(n: usize, b: i64, seed: u64) -> Matrix<Q> {
    use rand::{Rng, SeedableRng};
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    loop {
        let m = Matrix {
            rows: n,
            cols: n,
            data: (0..n * n)
                .map(|_| Q::from_integer(rng.gen_range(-b..=b).into()))
                .collect(),
        };
        if inverse(&Rationals, &m).is_some() {
            return m;
        }
    }
}
