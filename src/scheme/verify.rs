//! Exact verification of a scheme against a tensor (the Brent equations): the first
//! mismatch with a count ([`verify`]) or every wrong coefficient ([`wrong_coefficients`]).

use super::Scheme;
use crate::scalar::common_denominator;
use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};

/// The first coefficient where a scheme and a tensor disagree.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Mismatch {
    /// The basis triple (left, right, result).
    pub index: [usize; 3],
    /// The tensor's coefficient.
    pub expected: Q,
    /// The scheme's coefficient `sum_t u_t[i] v_t[j] w_t[k]`.
    pub got: Q,
    /// How many coefficients disagree in all.
    pub count: usize,
}

/// One coefficient where a scheme and a tensor disagree.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Wrong {
    /// The basis triple (left i, right j, result k): the coefficient of result k in the
    /// product of left basis vector i and right basis vector j.
    pub index: [usize; 3],
    /// The tensor's coefficient.
    pub expected: Q,
    /// The scheme's coefficient `sum_t u_t[i] v_t[j] w_t[k]`.
    pub got: Q,
}

/// The tensor a scheme computes, `sum_t u_t (x) v_t (x) w_t`, reduced into `field`
/// (normally the scheme's own), dense with index `(i * d1 + j) * d2 + k`.
///
/// Each term is written as integer vectors over one denominator `D_t` (the product of
/// the least common denominators of its three factors); when the least common multiple L
/// of the `D_t` stays within 32 times the size of the largest `D_t`, the terms are summed
/// as integers over L (no gcd per operation) and each entry is reduced once at the end;
/// otherwise term by term in exact rationals.
/// Cost: O(r * d0 * d1 * d2) exact operations, skipping zeros.
pub fn scheme_tensor(s: &Scheme, field: FieldSpec) -> Vec<Q> {
    let d = s.dims;
    let ints: Vec<[(Vec<BigInt>, BigInt); 3]> = (0..s.rank())
        .map(|t_| [&s.u[t_], &s.v[t_], &s.w[t_]].map(|x| integer_over(x)))
        .collect();
    let dens: Vec<BigInt> = ints.iter().map(|[a, b, c]| &a.1 * &b.1 * &c.1).collect();
    let lcm = dens.iter().fold(BigInt::one(), |l, x| l.lcm(x));
    let widest = dens.iter().map(|x| x.bits()).max().unwrap_or(0).max(64);
    let mut acc = if lcm.bits() <= 32 * widest {
        let mut num = vec![BigInt::zero(); d[0] * d[1] * d[2]];
        for ([(u, _), (v, _), (w, _)], den) in ints.iter().zip(&dens) {
            let scale = &lcm / den;
            let v: Vec<BigInt> = v.iter().map(|x| x * &scale).collect();
            for (i, ui) in u.iter().enumerate().filter(|(_, x)| !x.is_zero()) {
                for (j, vj) in v.iter().enumerate().filter(|(_, x)| !x.is_zero()) {
                    let uv = ui * vj;
                    for (k, wk) in w.iter().enumerate().filter(|(_, x)| !x.is_zero()) {
                        num[(i * d[1] + j) * d[2] + k] += &uv * wk;
                    }
                }
            }
        }
        num.into_iter()
            .map(|x| Q::new(x, lcm.clone()))
            .collect::<Vec<Q>>()
    } else {
        let mut acc = vec![Q::zero(); d[0] * d[1] * d[2]];
        for t_ in 0..s.rank() {
            for (i, ui) in s.u[t_].iter().enumerate().filter(|(_, x)| !x.is_zero()) {
                for (j, vj) in s.v[t_].iter().enumerate().filter(|(_, x)| !x.is_zero()) {
                    let uv = ui * vj;
                    for (k, wk) in s.w[t_].iter().enumerate().filter(|(_, x)| !x.is_zero()) {
                        acc[(i * d[1] + j) * d[2] + k] += &uv * wk;
                    }
                }
            }
        }
        acc
    };
    if let FieldSpec::Prime(_) = field {
        for x in acc.iter_mut() {
            *x = super::reduce_into(field, x).unwrap_or_else(|_| x.clone());
        }
    }
    acc
}

/// `x = X / D` with X an integer vector and D the least common denominator of `x`.
fn integer_over(x: &[Q]) -> (Vec<BigInt>, BigInt) {
    let den = common_denominator(x.iter());
    let num = x.iter().map(|c| c.numer() * (&den / c.denom())).collect();
    (num, den)
}

/// Every coefficient where `s` and `t` disagree, in lexicographic (i, j, k) order; empty
/// exactly when the scheme is correct. The shapes must agree (checked by [`verify`]).
/// Cost: that of [`scheme_tensor`].
pub fn wrong_coefficients(s: &Scheme, t: &Tensor) -> Vec<Wrong> {
    let d = t.dims();
    if d[0].saturating_mul(d[1]).saturating_mul(d[2]) > DENSE_LIMIT {
        return wrong_coefficients_sparse(s, t);
    }
    let acc = scheme_tensor(s, t.field());
    let mut out = Vec::new();
    for i in 0..d[0] {
        for j in 0..d[1] {
            for k in 0..d[2] {
                let got = &acc[(i * d[1] + j) * d[2] + k];
                let expected = t.get(i, j, k);
                if *got != expected {
                    out.push(Wrong {
                        index: [i, j, k],
                        expected,
                        got: got.clone(),
                    });
                }
            }
        }
    }
    out
}

/// Above this many coefficients `d0 d1 d2` the check accumulates the scheme's tensor
/// sparsely (a dense table of exact rationals would take gigabytes).
const DENSE_LIMIT: usize = 1 << 21;

/// [`wrong_coefficients`] with the scheme's tensor accumulated in a hash map of its
/// nonzero positions. Cost: O(sum_t nnz(u_t) nnz(v_t) nnz(w_t) + nnz(T)) exact operations.
fn wrong_coefficients_sparse(s: &Scheme, t: &Tensor) -> Vec<Wrong> {
    let d = t.dims();
    let nz = |x: &[Q]| -> Vec<(usize, Q)> {
        x.iter()
            .enumerate()
            .filter(|(_, c)| !c.is_zero())
            .map(|(i, c)| (i, c.clone()))
            .collect()
    };
    let mut acc: std::collections::HashMap<[usize; 3], Q> = std::collections::HashMap::new();
    for t_ in 0..s.rank() {
        let (u, v, w) = (nz(&s.u[t_]), nz(&s.v[t_]), nz(&s.w[t_]));
        for (i, ui) in &u {
            for (j, vj) in &v {
                let uv = ui * vj;
                for (k, wk) in &w {
                    *acc.entry([*i, *j, *k]).or_insert_with(Q::zero) += &uv * wk;
                }
            }
        }
    }
    let red = |x: Q| match t.field() {
        FieldSpec::Prime(_) => super::reduce_into(t.field(), &x).unwrap_or(x),
        FieldSpec::Rational => x,
    };
    let mut out = Vec::new();
    for (i, j, k, c) in t.entries() {
        let got = red(acc.remove(&[i, j, k]).unwrap_or_else(Q::zero));
        if got != *c {
            out.push(Wrong {
                index: [i, j, k],
                expected: c.clone(),
                got,
            });
        }
    }
    for (index, got) in acc {
        let got = red(got);
        if !got.is_zero() && index.iter().zip(d).all(|(x, n)| *x < n) {
            out.push(Wrong {
                index,
                expected: Q::zero(),
                got,
            });
        }
    }
    out.sort_by_key(|w| w.index);
    out
}

/// Check `sum_t u_t (x) v_t (x) w_t == T` exactly, over the tensor's field.
/// Returns `Ok(())` or the first mismatch (lexicographic in (i, j, k)) with the total count.
/// Shapes must agree (a shape mismatch is reported at index [0, 0, 0] with count = usize::MAX).
/// Cost: O(r * d0 * d1 * d2) exact operations, skipping zero factors.
#[allow(clippy::result_large_err)] // a failed check is rare and reported once
pub fn verify(s: &Scheme, t: &Tensor) -> Result<(), Mismatch> {
    let d = t.dims();
    if s.dims != d || s.v.len() != s.u.len() || s.w.len() != s.u.len() {
        return Err(Mismatch {
            index: [0, 0, 0],
            expected: Q::zero(),
            got: Q::zero(),
            count: usize::MAX,
        });
    }
    let wrong = wrong_coefficients(s, t);
    match wrong.first() {
        None => Ok(()),
        Some(w) => Err(Mismatch {
            index: w.index,
            expected: w.expected.clone(),
            got: w.got.clone(),
            count: wrong.len(),
        }),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use proptest::prelude::*;

    #[test]
    fn classical_schemes_verify() {
        let t = matmul(2, 2, 2);
        // Strassen 1969, "Gaussian elimination is not optimal" (from memory)
        assert!(verify(&scheme(STRASSEN, &t), &t).is_ok());
        // Winograd's variant (Probert 1976) (from memory)
        assert!(verify(&scheme(WINOGRAD, &t), &t).is_ok());
        // Karatsuba and Ofman 1962: 3 multiplications for two 2-term polynomials
        let p = polymul(2);
        let k = scheme(KARATSUBA, &p);
        assert_eq!(k.rank(), 3);
        assert!(verify(&k, &p).is_ok());
        // Gauss's complex product with 3 real multiplications (common practice)
        let c = complex();
        let g = scheme(GAUSS, &c);
        assert_eq!(g.rank(), 3);
        assert!(verify(&g, &c).is_ok());
        // the standard scheme verifies
        assert!(verify(&Scheme::standard(&matmul(2, 3, 2)), &matmul(2, 3, 2)).is_ok());
    }

    #[test]
    fn mismatch_report() {
        let t = matmul(2, 2, 2);
        let mut s = scheme(STRASSEN, &t);
        s.w[1][2] = Q::zero(); // c21 loses m2 = (a21 + a22) b11
        let m = verify(&s, &t).unwrap_err();
        assert_eq!(m.index, [2, 0, 2]); // a21 * b11 -> c21
        assert_eq!(m.count, 2);
    }

    /// The sparse accumulation used for large shapes finds the same wrong coefficients,
    /// in the same order, as the dense one.
    #[test]
    fn sparse_check_agrees_with_dense() {
        let t = matmul(2, 2, 2);
        let good = scheme(STRASSEN, &t);
        assert!(wrong_coefficients_sparse(&good, &t).is_empty());
        let mut bad = good.clone();
        bad.w[1][2] = Q::zero();
        bad.u[6][0] += Q::from_integer(3.into());
        let dense = wrong_coefficients(&bad, &t);
        assert!(!dense.is_empty());
        assert_eq!(wrong_coefficients_sparse(&bad, &t), dense);
        let t5 = t.with_field(FieldSpec::Prime(5)).unwrap();
        let b5 = bad.with_field(FieldSpec::Prime(5)).unwrap();
        assert_eq!(
            wrong_coefficients_sparse(&b5, &t5),
            wrong_coefficients(&b5, &t5)
        );
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 64, ..ProptestConfig::default() })]
        /// Changing one coefficient u_t[i] by delta changes the tensor by
        /// delta e_i (x) v_t (x) w_t, which is nonzero because no factor of Strassen's scheme
        /// is zero; so every tampered scheme must fail verification.
        #[test]
        fn tampered_scheme_fails(side in 0usize..3, t in 0usize..7, i in 0usize..4, delta in 1i64..5) {
            let tt = matmul(2, 2, 2);
            let mut s = scheme(STRASSEN, &tt);
            let m = match side { 0 => &mut s.u, 1 => &mut s.v, _ => &mut s.w };
            m[t][i] += Q::from_integer(delta.into());
            prop_assert!(verify(&s, &tt).is_err());
        }
    }
}
