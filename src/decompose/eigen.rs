//! Rational eigenvalues of a rational matrix, found numerically and confirmed exactly.
//!
//! Method: the eigenvalues of the f64 image are computed (nalgebra's Schur form); each
//! real one, mu, is sharpened by exact inverse iteration over Q with the fixed shift mu
//! (each step multiplies the error by about |lambda - mu| / gap), the eigenvalue estimate
//! `(X y)_i / y_i` is expanded in a continued fraction, and each convergent lambda is
//! accepted only when `X - lambda I` is singular exactly over Q (its nullspace, computed
//! by the exact engine, is the eigenspace returned). A floating-point step only proposes;
//! every returned pair satisfies `X v = lambda v` exactly.

use crate::linalg::Matrix;
use crate::linalg::modular::{inverse_q, kernel_primes, nullspace_q, rank_mod};
use crate::scalar::{Field, PrimeField, Q, Rationals, q_to_f64};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// One exact eigenvalue and a basis of its eigenspace.
#[derive(Clone, Debug)]
pub struct Eigen {
    pub value: Q,
    pub vectors: Vec<Vec<Q>>,
}

/// Why the rational eigenvalues could not all be found.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum EigenFailure {
    /// A numerical eigenvalue has a clear imaginary part: no rational eigenvalue there.
    NotReal,
    /// An eigenvalue near a real number is not confirmed as a rational with a moderate
    /// denominator (it may be irrational), or the numerical step did not converge.
    NotRational,
}

/// Inverse-iteration steps per eigenvalue.
const STEPS: usize = 3;
/// Convergents tried per eigenvalue.
const CONVERGENTS: usize = 60;

/// The distinct rational eigenvalues of the square matrix `x` with their eigenspaces,
/// when every eigenvalue is rational; otherwise the reason. Cost: one f64 Schur form,
/// then per eigenvalue an exact inverse and a few exact nullspaces of n x n matrices.
pub fn rational_eigen(x: &Matrix<Q>) -> Result<Vec<Eigen>, EigenFailure> {
    let n = x.rows;
    let scale = x
        .data
        .iter()
        .map(|v| q_to_f64(v).abs())
        .fold(0.0f64, f64::max)
        .max(f64::MIN_POSITIVE);
    let m = nalgebra::DMatrix::from_fn(n, n, |i, j| q_to_f64(&x[(i, j)]) / scale);
    let Some(approx) = float_eigenvalues(m) else {
        return Err(EigenFailure::NotRational);
    };
    // every value is checked to be real before any is confirmed (the exact step is costly)
    if classify(approx.as_slice()) == FloatSpectrum::NotReal {
        return Err(EigenFailure::NotReal);
    }
    let mut found: Vec<Eigen> = Vec::new();
    let mut total = 0;
    for z in approx.iter() {
        let mu = z.re * scale;
        if found
            .iter()
            .any(|e| (q_to_f64(&e.value) - mu).abs() <= 1e-9 * (1.0 + mu.abs()))
        {
            continue;
        }
        let Some(e) = confirm_near(x, mu) else {
            return Err(EigenFailure::NotRational);
        };
        if found.iter().any(|f| f.value == e.value) {
            continue;
        }
        total += e.vectors.len();
        found.push(e);
    }
    if total < n {
        // an eigenvalue was missed (e.g. two numerical values merged): not all confirmed
        return Err(EigenFailure::NotRational);
    }
    Ok(found)
}

/// What the floating-point eigenvalues say before any exact work (a filter only: nothing
/// is concluded from it but which exact step is worth trying).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum FloatSpectrum {
    /// Real and pairwise distinct.
    Distinct,
    /// One has a clear imaginary part: no rational eigenvalue there.
    NotReal,
    /// Real, but two agree to about nine digits.
    Repeated,
    /// The floating-point step failed (overflow, a singular solve, no convergence).
    Unknown,
}

fn classify(values: &[nalgebra::Complex<f64>]) -> FloatSpectrum {
    if values
        .iter()
        .any(|z| !z.re.is_finite() || !z.im.is_finite())
    {
        return FloatSpectrum::Unknown;
    }
    if values
        .iter()
        .any(|z| z.im.abs() > 1e-6 * (1.0 + z.re.abs()))
    {
        return FloatSpectrum::NotReal;
    }
    let mut re: Vec<f64> = values.iter().map(|z| z.re).collect();
    re.sort_by(f64::total_cmp);
    if re
        .windows(2)
        .any(|w| (w[1] - w[0]).abs() <= 1e-9 * (1.0 + w[0].abs().max(w[1].abs())))
    {
        return FloatSpectrum::Repeated;
    }
    FloatSpectrum::Distinct
}

/// The eigenvalues of a square f64 matrix from its Schur form, by a bounded number of QR
/// iterations; `None` when they do not converge. A subdiagonal entry counts as zero below
/// 1e-14 of its neighbours, then 1e-12: at machine epsilon the iteration often fails to
/// converge on clustered eigenvalues, a common case (the tensors of algebras).
/// Cost: O(n^3) flops per try.
fn float_eigenvalues(
    m: nalgebra::DMatrix<f64>,
) -> Option<nalgebra::DVector<nalgebra::Complex<f64>>> {
    let n = m.nrows();
    [1e-14, 1e-12].into_iter().find_map(|eps| {
        nalgebra::linalg::Schur::try_new(m.clone(), eps, 200 * n.max(1))
            .map(|schur| schur.complex_eigenvalues())
    })
}

/// The kind of the eigenvalues of `X = tx ty^-1` (ty square, invertible), read in f64
/// from the Schur form of `ty^-T`-solved `tx^T` after scaling both to entries of size at
/// most 1 (scaling multiplies X by a constant and leaves the kind unchanged).
/// Cost: one LU solve and one Schur form of n x n f64 matrices, O(n^3) flops.
pub fn pencil_spectrum(tx: &Matrix<Q>, ty: &Matrix<Q>) -> FloatSpectrum {
    let n = tx.rows;
    let to_f64 = |m: &Matrix<Q>| {
        let scale = m
            .data
            .iter()
            .map(|v| q_to_f64(v).abs())
            .fold(0.0f64, f64::max)
            .max(f64::MIN_POSITIVE);
        nalgebra::DMatrix::from_fn(n, n, |i, j| q_to_f64(&m[(i, j)]) / scale)
    };
    let (fx, fy) = (to_f64(tx), to_f64(ty));
    if fx.iter().chain(fy.iter()).any(|v| !v.is_finite()) {
        return FloatSpectrum::Unknown;
    }
    // X^T = ty^-T tx^T
    let Some(xt) = fy.transpose().lu().solve(&fx.transpose()) else {
        return FloatSpectrum::Unknown;
    };
    match float_eigenvalues(xt) {
        Some(values) => classify(values.as_slice()),
        None => FloatSpectrum::Unknown,
    }
}

/// The rational eigenvalue of `x` nearest the real number `mu`, confirmed exactly.
fn confirm_near(x: &Matrix<Q>, mu: f64) -> Option<Eigen> {
    let n = x.rows;
    let shift = Q::from_float(mu)?;
    // the convergents of the floating-point value with small denominators first: an
    // eigenvalue found to near machine precision is one of them (each refused at once by
    // a rank modulo a prime unless it is an eigenvalue)
    for c in convergents(&shift)
        .into_iter()
        .take_while(|c| c.denom().bits() <= 20)
    {
        if (q_to_f64(&c) - mu).abs() <= 1e-9 * (1.0 + mu.abs())
            && let Some(e) = eigen_at(x, &c)
        {
            return Some(e);
        }
    }
    let inv = inverse_q(&shifted(x, &shift))?;
    let f = Rationals;
    let mut y: Vec<Q> = (0..n)
        .map(|i| Q::from_integer(BigInt::from(1 + (i % 3) as i64)))
        .collect();
    for _ in 0..STEPS {
        y = inv.mul_vec(&f, &y);
        let big = y.iter().map(|v| v.abs()).max()?;
        if big.is_zero() {
            return None;
        }
        y.iter_mut().for_each(|v| *v /= &big);
    }
    let i = (0..n).max_by(|&a, &b| y[a].abs().cmp(&y[b].abs()))?;
    let xy = x.mul_vec(&f, &y);
    let estimate = &xy[i] / &y[i];
    for c in convergents(&estimate).into_iter().take(CONVERGENTS) {
        if let Some(e) = eigen_at(x, &c) {
            return Some(e);
        }
    }
    None
}

/// `x - s I`.
fn shifted(x: &Matrix<Q>, s: &Q) -> Matrix<Q> {
    let mut m = x.clone();
    for i in 0..x.rows {
        m[(i, i)] -= s;
    }
    m
}

/// The eigenspace of `x` at `lambda` when it is not zero (exact). A quick filter first:
/// `x - lambda I` must be singular modulo a word prime (a necessary condition when both
/// reduce).
fn eigen_at(x: &Matrix<Q>, lambda: &Q) -> Option<Eigen> {
    let m = shifted(x, lambda);
    let p = kernel_primes(1)[0];
    let gf = PrimeField::new(p)?;
    let reduced: Option<Vec<u64>> = m.data.iter().map(|v| gf.from_rational(v)).collect();
    if let Some(data) = reduced
        && rank_mod(
            Matrix {
                rows: m.rows,
                cols: m.cols,
                data,
            },
            p,
        ) == m.rows
    {
        return None;
    }
    let vectors = nullspace_q(&m);
    (!vectors.is_empty()).then(|| Eigen {
        value: lambda.clone(),
        vectors,
    })
}

/// The continued-fraction convergents of a rational number, in order.
pub fn convergents(x: &Q) -> Vec<Q> {
    let (mut num, mut den) = (x.numer().clone(), x.denom().clone());
    let (mut h0, mut h1) = (BigInt::zero(), BigInt::one());
    let (mut k0, mut k1) = (BigInt::one(), BigInt::zero());
    let mut out = Vec::new();
    while !den.is_zero() && out.len() < 4 * CONVERGENTS {
        let (a, r) = num.div_mod_floor(&den);
        let h2 = &a * &h1 + &h0;
        let k2 = &a * &k1 + &k0;
        out.push(Q::new(h2.clone(), k2.clone()));
        (h0, h1, k0, k1) = (h1, h2, k1, k2);
        (num, den) = (den, r);
        if out.len() > 1 && k1.to_f64().is_some_and(|k| k > 1e30) {
            break;
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn finds_rational_eigenvalues_exactly() {
        // P diag(1/3, -7, 22/5) P^-1 with an integer P of determinant 1
        let p = Matrix::from_rows(
            vec![
                vec![q(1, 1), q(2, 1), q(3, 1)],
                vec![q(0, 1), q(1, 1), q(4, 1)],
                vec![q(0, 1), q(0, 1), q(1, 1)],
            ],
            3,
        );
        let d = Matrix::from_rows(
            vec![
                vec![q(1, 3), q(0, 1), q(0, 1)],
                vec![q(0, 1), q(-7, 1), q(0, 1)],
                vec![q(0, 1), q(0, 1), q(22, 5)],
            ],
            3,
        );
        let f = Rationals;
        let x = p.mul(&f, &d).mul(&f, &inverse_q(&p).unwrap());
        let mut vals: Vec<Q> = rational_eigen(&x)
            .unwrap()
            .into_iter()
            .map(|e| e.value)
            .collect();
        vals.sort();
        assert_eq!(vals, vec![q(-7, 1), q(1, 3), q(22, 5)]);
        // rotation by 90 degrees: no real eigenvalue
        let r = Matrix::from_rows(vec![vec![q(0, 1), q(-1, 1)], vec![q(1, 1), q(0, 1)]], 2);
        assert_eq!(rational_eigen(&r).unwrap_err(), EigenFailure::NotReal);
        // eigenvalues +-sqrt(2): real, not rational
        let s = Matrix::from_rows(vec![vec![q(0, 1), q(2, 1)], vec![q(1, 1), q(0, 1)]], 2);
        assert_eq!(rational_eigen(&s).unwrap_err(), EigenFailure::NotRational);
    }
}
