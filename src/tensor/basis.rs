//! Change of basis.
//!
//! Convention: a change of basis on an axis is an invertible matrix P whose *columns* are
//! the new basis vectors written in the old basis (`e'_j = sum_a P[a][j] e_a`). For a
//! bilinear map with matrices (P, R, S) on (left, right, result) the new coefficients are
//! `c'[i][j][k] = sum_{a,b,c} P[a][i] R[b][j] c[a][b][c] (S^-1)[k][c]`.
//! For an algebra one matrix P serves all three axes.

use super::Tensor;
use crate::linalg::{Matrix, inverse};
use crate::scalar::Q;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};

/// A rational matrix as an integer matrix over a common denominator: `m = ints / den`.
fn integer_form(m: &Matrix<Q>) -> (Vec<BigInt>, BigInt) {
    let den = m
        .data
        .iter()
        .fold(BigInt::one(), |acc, x| acc.lcm(x.denom()));
    let ints = m
        .data
        .iter()
        .map(|x| x.numer() * (&den / x.denom()))
        .collect();
    (ints, den)
}

/// `out[.][j] = sum_b m[b][j] in[.][b]` on a dense stack of `rows` vectors of length `len`
/// along the contracted index (`in` is `rows x len`, `m` is `len x len` row-major).
fn contract(input: &[BigInt], m: &[BigInt], rows: usize, len: usize) -> Vec<BigInt> {
    use rayon::prelude::*;
    let mut out = vec![BigInt::zero(); rows * len];
    out.par_chunks_mut(len)
        .zip(input.par_chunks(len))
        .for_each(|(o, x)| {
            for (b, xb) in x.iter().enumerate() {
                if xb.is_zero() {
                    continue;
                }
                for (j, oj) in o.iter_mut().enumerate() {
                    let mbj = &m[b * len + j];
                    if !mbj.is_zero() {
                        *oj += xb * mbj;
                    }
                }
            }
        });
    out
}

/// Apply (P, R, S) as above. Returns `None` if S is singular or a shape does not match.
/// The tensor must be over Q or the matrices over the tensor's field (integer
/// representatives); entries are reduced into the field. The contractions run over the
/// integers (matrices and constants brought to common denominators, one division per
/// result). Cost: O(nnz d0 + d0 d1 (d1 + d2) d2) big-integer multiply-adds.
pub fn change_basis(t: &Tensor, p: &Matrix<Q>, r: &Matrix<Q>, s: &Matrix<Q>) -> Option<Tensor> {
    let d = t.dims();
    if p.rows != d[0] || p.cols != d[0] || r.rows != d[1] || r.cols != d[1] {
        return None;
    }
    if s.rows != d[2] || s.cols != d[2] {
        return None;
    }
    let sinv = match t.field() {
        crate::scalar::FieldSpec::Rational => crate::linalg::modular::inverse_q(s),
        _ => crate::with_field!(t.field(), f => {
            let sm = s.map(|x| crate::scalar::Field::from_rational(f, x).expect("in field"));
            inverse(f, &sm).map(|m| m.map(|x| crate::scalar::Field::to_rational(f, x)))
        }),
    }?;
    let it = super::IntegralTensor::from_tensor(t);
    let (pi, pd) = integer_form(p);
    let (ri, rd) = integer_form(r);
    let (si, sd) = integer_form(&sinv);
    // c1[i][b][c] = sum_a P[a][i] c[a][b][c]
    let mut c1 = vec![BigInt::zero(); d[0] * d[1] * d[2]];
    for a in 0..d[0] {
        for b in 0..d[1] {
            for (c, v) in it.product(a, b) {
                for i in 0..d[0] {
                    let pa = &pi[a * d[0] + i];
                    if !pa.is_zero() {
                        c1[(i * d[1] + b) * d[2] + *c as usize] += pa * v;
                    }
                }
            }
        }
    }
    // c2[i][j][c] = sum_b R[b][j] c1[i][b][c]: contract the middle index
    let mut c1t = vec![BigInt::zero(); d[0] * d[2] * d[1]];
    for i in 0..d[0] {
        for b in 0..d[1] {
            for c in 0..d[2] {
                c1t[(i * d[2] + c) * d[1] + b] = std::mem::take(&mut c1[(i * d[1] + b) * d[2] + c]);
            }
        }
    }
    let c2t = contract(&c1t, &ri, d[0] * d[2], d[1]); // [i][c][j]
    let mut c2 = vec![BigInt::zero(); d[0] * d[1] * d[2]];
    for i in 0..d[0] {
        for c in 0..d[2] {
            for j in 0..d[1] {
                c2[(i * d[1] + j) * d[2] + c] = c2t[(i * d[2] + c) * d[1] + j].clone();
            }
        }
    }
    // out[i][j][k] = sum_c Sinv[k][c] c2[i][j][c] = sum_c Sinv^T[c][k] c2[i][j][c]
    let mut sit = vec![BigInt::zero(); d[2] * d[2]];
    for k in 0..d[2] {
        for c in 0..d[2] {
            sit[c * d[2] + k] = si[k * d[2] + c].clone();
        }
    }
    let c3 = contract(&c2, &sit, d[0] * d[1], d[2]);
    let den = Q::from_integer(&it.scale * &pd * &rd * &sd);
    let mut out = Tensor::zero(t.field(), t.kind(), d, Some(t.names().clone()));
    for i in 0..d[0] {
        for j in 0..d[1] {
            let row: Vec<(usize, Q)> = (0..d[2])
                .filter_map(|k| {
                    let x = &c3[(i * d[1] + j) * d[2] + k];
                    (!x.is_zero()).then(|| (k, Q::from_integer(x.clone()) / &den))
                })
                .collect();
            out.set_product(i, j, row);
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
        if crate::linalg::rank_q(&m) == n {
            return m;
        }
    }
}
