//! Symmetries of a tensor acting on its schemes, as used by `polish` and the
//! equivalence test.
//!
//! - *Discrete forms of matrix multiplication* <n,m,p>: the cyclic map (a scheme for
//!   <n,m,p> gives one for <m,p,n>) and the transposition (<p,m,n>) give schemes of the same
//!   tensor exactly when the format is kept: all of the cyclic forms when n = m = p, the
//!   transposition when n = p. [`discrete_forms`] lists those images.
//! - *Diagonal symmetries* of any tensor: diagonal (P, Q, R) with `p_i q_j r_k = 1`
//!   wherever `c_ijk != 0` fix the tensor. With `p = lambda^e0`, `q = lambda^e1`,
//!   `r = lambda^e2` this is the linear condition `e0_i + e1_j + e2_k = 0`;
//!   [`diagonal_symmetries`] returns an integer basis of its solutions (for polynomial
//!   multiplication it contains `x -> lambda x`). [`apply_diagonal`] acts on a scheme by
//!   `u_t -> P u_t`, `v_t -> Q v_t`, `w_t -> R w_t`.

use super::construct::{matmul_cyclic, matmul_transpose};
use super::{Scheme, reduce_into, verify};
use crate::linalg::{Matrix, nullspace};
use crate::scalar::common_denominator;
use crate::scalar::{Q, Rationals};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};

/// The images of `s` under the discrete symmetries of <n,m,p> that keep the format (the
/// identity excluded), each named (`cyclic`, `cyclic twice`, `transposed`, ...) and each
/// verified against `t`. Cost: O(6 r d) plus the verifications.
pub fn discrete_forms(s: &Scheme, t: &Tensor, nmp: [usize; 3]) -> Vec<(String, Scheme)> {
    let [n, m, p] = nmp;
    let mut out = Vec::new();
    let mut push = |name: &str, x: Result<Scheme, crate::Error>| {
        if let Ok(mut x) = x
            && x.dims == t.dims()
            && verify(&x, t).is_ok()
        {
            x.labels = s.labels.clone();
            out.push((name.to_string(), x));
        }
    };
    if n == m && m == p {
        let c1 = matmul_cyclic(s, nmp).ok();
        let c2 = c1.as_ref().and_then(|c| matmul_cyclic(c, nmp).ok());
        for (name, x) in [("cyclic", &c1), ("cyclic twice", &c2)] {
            if let Some(x) = x {
                push(name, Ok(x.clone()));
            }
        }
        push("transposed", matmul_transpose(s, nmp));
        for (name, x) in [
            ("cyclic, transposed", &c1),
            ("cyclic twice, transposed", &c2),
        ] {
            if let Some(x) = x {
                push(name, matmul_transpose(x, nmp));
            }
        }
    } else if n == p {
        push("transposed", matmul_transpose(s, nmp));
    }
    out
}

/// An integer basis of the exponent vectors `(e0, e1, e2)` with `e0_i + e1_j + e2_k = 0`
/// for every nonzero `c_ijk` (see the module docs). Cost: a nullspace of an
/// nnz x (d0 + d1 + d2) matrix over Q.
pub fn diagonal_symmetries(t: &Tensor) -> Vec<[Vec<BigInt>; 3]> {
    let d = t.dims();
    let cols = d[0] + d[1] + d[2];
    let rows: Vec<Vec<Q>> = t
        .entries()
        .map(|(i, j, k, _)| {
            let mut r = vec![Q::zero(); cols];
            r[i] += Q::one();
            r[d[0] + j] += Q::one();
            r[d[0] + d[1] + k] += Q::one();
            r
        })
        .collect();
    if rows.is_empty() {
        return Vec::new();
    }
    let ker = nullspace(&Rationals, &Matrix::from_rows(rows, cols));
    ker.into_iter()
        .map(|v| {
            let den = common_denominator(v.iter());
            let ints: Vec<BigInt> = v
                .iter()
                .map(|x| (x * Q::from_integer(den.clone())).to_integer())
                .collect();
            let g = ints.iter().fold(BigInt::zero(), |g, x| g.gcd(x));
            let ints: Vec<BigInt> = ints.into_iter().map(|x| x / &g).collect();
            [
                ints[..d[0]].to_vec(),
                ints[d[0]..d[0] + d[1]].to_vec(),
                ints[d[0] + d[1]..].to_vec(),
            ]
        })
        .collect()
}

fn power(lambda: &Q, e: &BigInt) -> Q {
    use num_traits::ToPrimitive;
    let k = e.to_i32().unwrap_or(0);
    let base = if k < 0 {
        lambda.recip()
    } else {
        lambda.clone()
    };
    (0..k.unsigned_abs()).fold(Q::one(), |acc, _| acc * &base)
}

/// The scheme `(P u_t, Q v_t, R w_t)` for the diagonal symmetry `lambda^e` (a valid scheme
/// of the same tensor when e is one of [`diagonal_symmetries`]; lambda != 0 in the field).
pub fn apply_diagonal(s: &Scheme, e: &[Vec<BigInt>; 3], lambda: &Q) -> Scheme {
    let f = s.field;
    let scales: Vec<Vec<Q>> = e
        .iter()
        .map(|ex| ex.iter().map(|x| power(lambda, x)).collect())
        .collect();
    let mut out = s.clone();
    for (axis, m) in [&mut out.u, &mut out.v, &mut out.w].into_iter().enumerate() {
        for row in m.iter_mut() {
            for (x, sc) in row.iter_mut().zip(&scales[axis]) {
                if !x.is_zero() {
                    let y = &*x * sc;
                    *x = reduce_into(f, &y).unwrap_or(y);
                }
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;

    #[test]
    fn discrete_forms_and_diagonal_symmetries_keep_schemes_valid() {
        let t = matmul(2, 2, 2);
        let s = scheme(STRASSEN, &t);
        let forms = discrete_forms(&s, &t, [2, 2, 2]);
        assert_eq!(forms.len(), 5);
        // <2,3,2>: only the transposition keeps the format
        let t232 = matmul(2, 3, 2);
        let st = Scheme::standard(&t232);
        assert_eq!(discrete_forms(&st, &t232, [2, 3, 2]).len(), 1);
        // polynomial multiplication: x -> lambda x is among the diagonal symmetries
        // (3 independent ones: scale a, scale b, substitute x)
        let p = polymul(3);
        let syms = diagonal_symmetries(&p);
        assert_eq!(syms.len(), 3);
        let k = Scheme::standard(&p);
        for e in &syms {
            for l in [crate::scalar::q(2, 1), crate::scalar::q(-1, 3)] {
                assert!(verify(&apply_diagonal(&k, e, &l), &p).is_ok());
            }
        }
    }
}
