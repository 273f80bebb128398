//! Polynomials with integer coefficients (constant term first, trimmed): content and
//! primitive part, products, exact division, reduction modulo an integer, and the
//! Mignotte bound on the coefficients of a factor.

use crate::scalar::Q;
use crate::scalar::common_denominator;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{Signed, Zero};

/// An integer polynomial, constant term first, no zero leading coefficient.
pub type ZPoly = Vec<BigInt>;

fn trim(a: &mut ZPoly) {
    while a.last().is_some_and(Zero::is_zero) {
        a.pop();
    }
}

/// The gcd of the coefficients (0 for the zero polynomial).
pub fn content(a: &[BigInt]) -> BigInt {
    a.iter().fold(BigInt::zero(), |g, c| g.gcd(c))
}

/// The primitive integer polynomial proportional to a nonzero rational polynomial, with a
/// positive leading coefficient.
pub fn primitive(a: &[Q]) -> ZPoly {
    let l = common_denominator(a.iter());
    let mut v: ZPoly = a.iter().map(|c| c.numer() * (&l / c.denom())).collect();
    trim(&mut v);
    let mut g = content(&v);
    if v.last().is_some_and(Signed::is_negative) {
        g = -g;
    }
    if !g.is_zero() {
        for c in v.iter_mut() {
            *c /= &g;
        }
    }
    v
}

/// As rationals.
pub fn to_q(a: &[BigInt]) -> Vec<Q> {
    a.iter().map(|c| Q::from_integer(c.clone())).collect()
}

/// `a b`.
pub fn mul(a: &[BigInt], b: &[BigInt]) -> ZPoly {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![BigInt::zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if x.is_zero() {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    trim(&mut out);
    out
}

/// The exact quotient `a / b` when b divides a in Z[x], else `None` (b nonzero).
/// Cost: deg b * (deg a - deg b + 1) big-integer operations.
pub fn exact_div(a: &[BigInt], b: &[BigInt]) -> Option<ZPoly> {
    let db = b.len().checked_sub(1)?;
    let lb = &b[db];
    let mut r: ZPoly = a.to_vec();
    trim(&mut r);
    if r.is_empty() {
        return Some(Vec::new());
    }
    if r.len() < b.len() {
        return None;
    }
    let mut q = vec![BigInt::zero(); r.len() - db];
    while r.len() > db && !r.is_empty() {
        let dr = r.len() - 1;
        let (c, m) = r[dr].div_rem(lb);
        if !m.is_zero() {
            return None;
        }
        for (i, bi) in b.iter().enumerate() {
            r[dr - db + i] -= &c * bi;
        }
        q[dr - db] = c;
        r.pop();
        trim(&mut r);
    }
    if !r.is_empty() {
        return None;
    }
    trim(&mut q);
    Some(q)
}

/// Reduce every coefficient into the symmetric range `(-m/2, m/2]`.
pub fn symmetric_mod(a: &[BigInt], m: &BigInt) -> ZPoly {
    let half = m >> 1u32;
    let mut v: ZPoly = a
        .iter()
        .map(|c| {
            let r = c.mod_floor(m);
            if r > half { r - m } else { r }
        })
        .collect();
    trim(&mut v);
    v
}

/// Reduce every coefficient into `[0, m)`.
pub fn nonneg_mod(a: &[BigInt], m: &BigInt) -> ZPoly {
    let mut v: ZPoly = a.iter().map(|c| c.mod_floor(m)).collect();
    trim(&mut v);
    v
}

/// A bound B such that every coefficient of every factor in Z[x] of `a` (degree d) is at
/// most B in absolute value: `B = 2^d ||a||_2` (Mignotte 1974, "An inequality about
/// factors of polynomials"; von zur Gathen and Gerhard 2013, Modern Computer Algebra,
/// Corollary 6.33), with the square root rounded up.
pub fn mignotte_bound(a: &[BigInt]) -> BigInt {
    let d = a.len().saturating_sub(1);
    let norm2: BigInt = a.iter().map(|c| c * c).sum();
    let mut r = norm2.sqrt();
    if &r * &r < norm2 {
        r += 1;
    }
    r << d
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z(v: &[i64]) -> ZPoly {
        v.iter().map(|&c| BigInt::from(c)).collect()
    }

    #[test]
    fn division_and_content() {
        let a = mul(&z(&[1, 1]), &z(&[-2, 0, 3]));
        assert_eq!(exact_div(&a, &z(&[1, 1])), Some(z(&[-2, 0, 3])));
        assert_eq!(exact_div(&a, &z(&[1, 2])), None);
        assert_eq!(
            primitive(&[Q::new(2.into(), 3.into()), Q::new((-4).into(), 3.into())]),
            z(&[-1, 2])
        );
        assert_eq!(symmetric_mod(&z(&[4, 6]), &BigInt::from(7)), z(&[-3, -1]));
        assert_eq!(mignotte_bound(&z(&[1, 0, 1])), BigInt::from(8));
    }
}
