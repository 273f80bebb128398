//! Strassen's commutator bound (Strassen 1983, "Rank and optimal computation of generic
//! tensors", Linear Algebra Appl. 52/53).
//!
//! Theorem. Let the slices of T along one axis be n x n matrices and X_a, X_b, X_c three
//! matrices in their span with X_b invertible. Then
//!
//! ```text
//! border rank(T) >= n + rank(X_a X_b^-1 X_c X_b^-1 - X_c X_b^-1 X_a X_b^-1) / 2
//! ```
//!
//! (Strassen's equations; it is the Koszul-Young flattening with p = 1 on the span of the
//! three matrices, Landsberg and Ottaviani 2015, so it holds over every field). The
//! commutator has the rank of `X_a X_b^-1 X_c - X_c X_b^-1 X_a` (multiply by X_b).
//!
//! Computation. X_a, X_b, X_c are seeded random integer combinations of the slices (of the
//! constants scaled by their common denominator D, which does not change ranks), taken
//! modulo a 28-bit prime p. When `det X_b` is nonzero modulo p it is a nonzero integer, so
//! X_b is invertible over Q, the entries of the product lie in the rationals whose
//! denominator is prime to p, and the rank of its image modulo p is a lower bound for its
//! rank over Q. The certificate (coefficients, prime, a nonzero minor) is re-checked from
//! the exact constants. Over GF(q) everything runs in GF(q).

use super::bound::{Bound, BoundsParams, Measure, Method, Status};
use super::minor::{Minor, check_minor, find_minor};
use crate::linalg::kernels::KERNEL_PRIME_BITS;
use crate::linalg::nullspace::cached_primes;
use crate::linalg::system::{RowBuf, RowSource};
use crate::linalg::{Matrix, inverse};
use crate::scalar::{Field, FieldSpec, PrimeField};
use crate::tensor::{AXES, Tensor, others};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive};
use rand::{Rng, SeedableRng};

/// The theorem, for reports.
pub const THEOREM: &str = "border rank (hence rank) >= n + rank([X_a X_b^-1, X_c X_b^-1]) / 2 \
     for n x n matrices X_a, X_b, X_c in the span of the slices along one axis, X_b \
     invertible (Strassen 1983, Rank and optimal computation of generic tensors, Linear \
     Algebra Appl. 52/53)";

/// A dense matrix of residues modulo one prime as a linear system over GF(p): unknowns its
/// columns (or its rows when `transposed`), one equation per row (column).
pub struct ResidueMatrix<'a> {
    pub m: &'a Matrix<u64>,
    pub p: u64,
    pub transposed: bool,
}

impl RowSource for ResidueMatrix<'_> {
    fn unknowns(&self) -> usize {
        if self.transposed {
            self.m.rows
        } else {
            self.m.cols
        }
    }
    fn blocks(&self) -> usize {
        if self.transposed {
            self.m.cols
        } else {
            self.m.rows
        }
    }
    fn modulus(&self) -> Option<u64> {
        Some(self.p)
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        debug_assert_eq!(p, self.p, "a matrix over GF(p)");
        for x in 0..self.unknowns() {
            let v = if self.transposed {
                self.m[(x, b)]
            } else {
                self.m[(b, x)]
            };
            if v != 0 {
                out.add(0, x, v);
            }
        }
        out.end_block(1);
    }
    fn term_bits(&self) -> u64 {
        64 - self.p.leading_zeros() as u64
    }
    fn estimated_terms(&self) -> usize {
        self.m.rows * self.m.cols
    }
}

/// The three combinations and where they live.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Choice {
    pub axis: usize,
    /// Coefficients of X_a, X_b (the invertible one) and X_c on the slices.
    pub coefficients: [Vec<i64>; 3],
}

/// `sum_s c_s M_s` modulo p for the slices of `t` along `axis` (constants scaled by D).
fn combination(t: &Tensor, axis: usize, c: &[i64], scale: &BigInt, p: u64) -> Matrix<u64> {
    let d = t.dims();
    let (o1, o2) = others(axis);
    let pb = BigInt::from(p);
    let mut m = Matrix::filled(d[o1], d[o2], 0u64);
    for (i, j, k, v) in t.entries() {
        let idx = [i, j, k];
        let cs = c[idx[axis]];
        if cs == 0 {
            continue;
        }
        let x = (v.numer() * (scale / v.denom()) * cs)
            .mod_floor(&pb)
            .to_u64()
            .expect("reduced");
        let e = &mut m[(idx[o1], idx[o2])];
        *e = (*e + x) % p;
    }
    m
}

fn mul(fp: &PrimeField, a: &Matrix<u64>, b: &Matrix<u64>) -> Matrix<u64> {
    let mut out = Matrix::filled(a.rows, b.cols, 0u64);
    for i in 0..a.rows {
        for l in 0..a.cols {
            let x = a[(i, l)];
            if x == 0 {
                continue;
            }
            for j in 0..b.cols {
                let e = &mut out[(i, j)];
                *e = fp.add(e, &fp.mul(&x, &b[(l, j)]));
            }
        }
    }
    out
}

/// `X_a X_b^-1 X_c - X_c X_b^-1 X_a` modulo p, or `None` when X_b is singular modulo p.
fn commutator(t: &Tensor, choice: &Choice, p: u64) -> Option<Matrix<u64>> {
    let scale = t
        .entries()
        .fold(BigInt::one(), |acc, (_, _, _, v)| acc.lcm(v.denom()));
    let fp = PrimeField::new(p)?;
    let [a, b, c] =
        [0, 1, 2].map(|i| combination(t, choice.axis, &choice.coefficients[i], &scale, p));
    let binv = inverse(&fp, &b)?;
    let left = mul(&fp, &mul(&fp, &a, &binv), &c);
    let right = mul(&fp, &mul(&fp, &c, &binv), &a);
    let mut out = left;
    for (o, r) in out.data.iter_mut().zip(&right.data) {
        *o = fp.sub(o, r);
    }
    Some(out)
}

/// The best commutator bound over the axes with square slices (two seeded trials each).
/// Cost: O(n^3) per trial modulo a prime, plus the re-check of the certificate.
pub fn bound(t: &Tensor, params: &BoundsParams) -> Result<Bound, String> {
    let p = match t.field() {
        FieldSpec::Rational => cached_primes()[0],
        FieldSpec::Prime(q) if q < 1 << KERNEL_PRIME_BITS => q,
        FieldSpec::Prime(q) => return Err(format!("over GF({q}) it needs a prime below 2^28")),
    };
    let d = t.dims();
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed ^ 0x5354);
    let mut best: Option<(usize, Choice, Minor)> = None;
    let mut square = false;
    for axis in 0..3 {
        let (o1, o2) = others(axis);
        if d[o1] != d[o2] || d[axis] < 3 {
            continue;
        }
        square = true;
        let n = d[o1];
        for _ in 0..2 {
            let coefficients = [0, 1, 2].map(|_| {
                (0..d[axis])
                    .map(|_| match t.field() {
                        FieldSpec::Rational => rng.gen_range(-(1i64 << 20)..=1 << 20),
                        FieldSpec::Prime(q) => rng.gen_range(0..q as i64),
                    })
                    .collect()
            });
            let choice = Choice { axis, coefficients };
            let Some(m) = commutator(t, &choice, p) else {
                continue;
            };
            let minor = find_minor(
                &ResidueMatrix {
                    m: &m,
                    p,
                    transposed: false,
                },
                &ResidueMatrix {
                    m: &m,
                    p,
                    transposed: true,
                },
                p,
            );
            let value = n + minor.size().div_ceil(2);
            if best.as_ref().is_none_or(|b| value > b.0) {
                best = Some((value, choice, minor));
            }
        }
    }
    let Some((value, choice, minor)) = best else {
        return Err(if square {
            "no invertible combination of the slices was found".into()
        } else {
            "no axis has square slices and at least three of them".into()
        });
    };
    let (o1, _) = others(choice.axis);
    let n = d[o1];
    if minor.size() == 0 {
        return Err(format!(
            "the commutator vanishes (the slices along the {} axis commute after the change), \
             so it gives only n = {n}",
            AXES[choice.axis]
        ));
    }
    let mut b = Bound::proven(
        Method::StrassenCommutator,
        value,
        Measure::BorderRank,
        t.field(),
        true,
        format!(
            "slices along the {} axis ({n} x {n}): seeded combinations X_a, X_b, X_c with det X_b \
             nonzero modulo {p}; the commutator has rank >= {} (a nonzero minor, re-checked), \
             so n + ceil({} / 2) = {value}",
            AXES[choice.axis],
            minor.size(),
            minor.size()
        ),
    );
    b.status = match check_certificate(t, &choice, &minor) {
        Ok(()) => Status::Proven,
        Err(_) => Status::Evidence,
    };
    b.certificate = Some(serde_json::json!({
        "axis": AXES[choice.axis],
        "coefficients": choice.coefficients,
        "minor": minor.to_json(),
    }));
    Ok(b)
}

/// Re-check a commutator certificate: X_b invertible modulo the prime (so over the
/// tensor's field), and the minor of the commutator nonzero modulo it. Every matrix is
/// recomputed from the exact constants. Cost: O(n^3) modulo the prime.
pub fn check_certificate(t: &Tensor, choice: &Choice, minor: &Minor) -> Result<(), String> {
    let d = t.dims();
    if choice.axis > 2
        || choice
            .coefficients
            .iter()
            .any(|c| c.len() != d[choice.axis])
    {
        return Err("the coefficients do not match the slices".into());
    }
    if let FieldSpec::Prime(q) = t.field()
        && minor.prime != q
    {
        return Err(format!("over GF({q}) the minor must be taken modulo {q}"));
    }
    if !crate::scalar::is_prime(minor.prime) || minor.prime >= 1 << 62 {
        return Err(format!("{} is not a usable prime", minor.prime));
    }
    let m = commutator(t, choice, minor.prime)
        .ok_or("X_b is singular modulo the prime: no proof that it is invertible")?;
    check_minor(minor, [m.rows, m.cols], |i, j| m[(i, j)])
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::matmul;

    #[test]
    fn strassen_bound_of_matrix_multiplication() {
        // Strassen 1983: the commutator bound gives 3n^2/2 for <n,n,n>: 6 for n = 2
        // (from memory)
        let b = bound(&matmul(2, 2, 2), &BoundsParams::default()).unwrap();
        assert_eq!((b.value, b.status), (6, Status::Proven), "{}", b.detail);
    }
}
