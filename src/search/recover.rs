//! Exact factors read directly off a numerical fit, for tensors whose decomposition at the
//! fitted rank is unique up to the scale and order of its terms (Kruskal 1977, "Three-way
//! arrays: rank and uniqueness of trilinear decompositions") and made of rational vectors:
//! the case of data built from integer factors and seen in a user's basis, even at ranks
//! above the dimensions, where simultaneous diagonalisation does not apply. The fit is then
//! the decomposition itself, up to round-off, and each left and right factor is a rational
//! direction: scaled so that its largest entry is 1, its entries share one denominator q,
//! found one entry at a time (the simplest rational near `q x_i`, by continued fractions,
//! multiplies q by its denominator). `q x` is then an integer vector. The result factors are
//! solved for exactly over Q and the scheme is verified exactly.
//!
//! Where the decompositions of the fitted rank form a family (matrix products, polynomial
//! products), a fit is a generic point of the family, its directions are not rational, and
//! the reading fails at the first entries (microseconds); the freezing of
//! [`super::numeric::round_factors`] is the way there.
//!
//! Invariant: [`read_exact_scheme`] returns only schemes verified exactly against the tensor.

use super::numeric::{Factors, scheme_from_left_right, simplest_rational};
use crate::scalar::Q;
use crate::scheme::Scheme;
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;

/// Relative accuracies at which the directions are read, tightest first: a fit converged
/// to a relative error of 1e-11 usually holds its factors to 1e-9 or better (common
/// practice: the error of the factors is that of the fit times a condition number).
const ACCURACIES: [f64; 3] = [1e-10, 1e-8, 1e-6];

/// Largest common denominator read (after scaling the largest entry to 1).
const MAX_DENOMINATOR: i64 = 10_000_000;

/// The primitive integer vector (entries without a common factor, largest entry in
/// absolute value positive) whose direction is that of `x` within relative accuracy
/// `eps`, with a common denominator of the scaled entries at most `max_den`; `None` when
/// there is none (or `x` is zero). The denominator is bounded by `0.05 / eps` as well, so
/// that `q x_i` is read to within a twentieth of an integer.
/// Cost: O(n) continued fractions.
pub fn integral_direction(x: &[f64], eps: f64, max_den: i64) -> Option<Vec<i64>> {
    let (lead, big) = x
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.abs().total_cmp(&b.1.abs()))?;
    if !(big.abs() > 1e-300 && big.is_finite()) {
        return None;
    }
    let max_den = max_den.min((0.05 / eps) as i64).max(1);
    let y: Vec<f64> = x.iter().map(|v| v / big).collect();
    let mut q: i64 = 1;
    for &yi in &y {
        let v = yi * q as f64;
        let rad = eps * q as f64;
        let (_, d) = simplest_rational(v - rad, v + rad, max_den / q)?;
        q = q.checked_mul(d)?;
    }
    let qf = q as f64;
    let ints: Vec<i64> = y.iter().map(|v| (v * qf).round() as i64).collect();
    if y.iter()
        .zip(&ints)
        .any(|(v, &n)| (v * qf - n as f64).abs() > eps * qf)
        || ints[lead] == 0
    {
        return None;
    }
    let g = ints.iter().fold(0i64, |g, &n| g.gcd(&n)).max(1);
    Some(ints.iter().map(|n| n / g).collect())
}

/// The exact scheme read off the fit `f` of `t` (see the module notes): every left and
/// right factor read as an integer direction, the result factors solved exactly, the
/// scheme verified exactly. `None` when a factor has no such direction at any of the
/// accuracies tried or the scheme does not verify.
/// Cost: O(r (d0 + d1)) continued fractions per accuracy; when they all succeed, one exact
/// solve of the result factors (d2 eliminations of a `d0 d1 x r` system) and one check.
pub fn read_exact_scheme(t: &Tensor, f: &Factors) -> Option<Scheme> {
    let r = f.rank();
    let directions = |a: usize, eps: f64| -> Option<Vec<Vec<Q>>> {
        (0..r)
            .map(|x| {
                let col: Vec<f64> = f.f[a].column(x).iter().copied().collect();
                integral_direction(&col, eps, MAX_DENOMINATOR).map(|v| {
                    v.into_iter()
                        .map(|n| Q::from_integer(BigInt::from(n)))
                        .collect()
                })
            })
            .collect()
    };
    ACCURACIES.iter().find_map(|&eps| {
        let us = directions(0, eps)?;
        let vs = directions(1, eps)?;
        scheme_from_left_right(t, us, vs)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn directions_of_integer_vectors() {
        // (3, -7, 12, 0, 5) seen through a scale and round-off
        let x: Vec<f64> = [3.0, -7.0, 12.0, 0.0, 5.0]
            .iter()
            .map(|v| v * -0.297_531_104 + v * 1e-13)
            .collect();
        assert_eq!(
            integral_direction(&x, 1e-10, MAX_DENOMINATOR),
            Some(vec![3, -7, 12, 0, 5])
        );
        // entries of a common denominator 2 * 3 * 1013 spread over several entries
        let x = [2026.0, 3.0 * 1013.0, 6078.0, 1.0, 2.0];
        assert_eq!(
            integral_direction(&x, 1e-12, MAX_DENOMINATOR),
            Some(vec![2026, 3039, 6078, 1, 2])
        );
        // an irrational direction is not read
        assert_eq!(
            integral_direction(&[1.0, std::f64::consts::SQRT_2, 0.5], 1e-10, 1000),
            None
        );
    }
}
