//! Quaternion algebras over Q: whether `(a, b)_Q` (basis 1, i, j, ij with `i^2 = a`,
//! `j^2 = b`, `ij = -ji`) is a division algebra or the matrix algebra M_2(Q).
//!
//! `(a, b)_Q` splits exactly when the Hilbert symbol `(a, b)_v` is 1 at every place v of Q
//! (Hasse-Minkowski; Serre 1973, A Course in Arithmetic, ch. III and IV). At the real place
//! `(a, b)_inf = -1` iff a < 0 and b < 0; at a prime p, with `a = p^alpha u`, `b = p^beta v`
//! (u, v units): `(a, b)_p = (-1)^(alpha beta e(p)) (u/p)^beta (v/p)^alpha` for p odd and
//! `(a, b)_2 = (-1)^(e(u) e(v) + alpha w(v) + beta w(u))`, with `e(x) = (x - 1)/2`,
//! `w(x) = (x^2 - 1)/8` mod 2 (Serre, ch. III, Theorem 1). Only primes dividing `2ab` can
//! give -1. The primes are found by trial division and Pollard's rho method below 2^63;
//! when a number does not factor within those limits the question stays open (`None`).

use crate::scalar::{Q, is_prime};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// `Some(true)` when `(a, b)_Q` is a division algebra, `Some(false)` when it is M_2(Q),
/// `None` when a number could not be factored. a and b are nonzero.
pub fn quaternion_is_division(a: &Q, b: &Q) -> Option<bool> {
    if a.is_negative() && b.is_negative() {
        return Some(true); // ramified at the real place
    }
    // squarefree integers in the same square classes
    let (Some((a, _)), Some((b, _))) = (
        square_decomposition(&(a.numer() * a.denom())),
        square_decomposition(&(b.numer() * b.denom())),
    ) else {
        return None;
    };
    let mut primes: Vec<BigInt> = vec![BigInt::from(2)];
    for x in [&a, &b] {
        for (p, _) in factor_integer(&x.abs())? {
            if !primes.contains(&p) {
                primes.push(p);
            }
        }
    }
    for p in primes {
        if hilbert_symbol(&a, &b, &p) == -1 {
            return Some(true);
        }
    }
    Some(false)
}

/// `(a, b)_p` for nonzero integers a, b and a prime p (see the module documentation).
pub fn hilbert_symbol(a: &BigInt, b: &BigInt, p: &BigInt) -> i32 {
    let split = |x: &BigInt| {
        let mut u = x.clone();
        let mut e = 0u32;
        while (&u % p).is_zero() {
            u /= p;
            e += 1;
        }
        (e, u)
    };
    let (alpha, u) = split(a);
    let (beta, v) = split(b);
    if p == &BigInt::from(2) {
        let eps = |x: &BigInt| {
            ((x - 1u32) / 2u32)
                .mod_floor(&BigInt::from(2))
                .to_u32()
                .unwrap_or(0)
        };
        let omega = |x: &BigInt| {
            ((x * x - 1u32) / 8u32)
                .mod_floor(&BigInt::from(2))
                .to_u32()
                .unwrap_or(0)
        };
        let s = eps(&u) * eps(&v) + alpha * omega(&v) + beta * omega(&u);
        return if s % 2 == 0 { 1 } else { -1 };
    }
    let leg = |x: &BigInt| legendre(x, p);
    let ep = ((p - 1u32) / 2u32)
        .mod_floor(&BigInt::from(2))
        .to_u32()
        .unwrap_or(0);
    let mut s = if (alpha * beta * ep) % 2 == 0 { 1 } else { -1 };
    if beta % 2 == 1 {
        s *= leg(&u);
    }
    if alpha % 2 == 1 {
        s *= leg(&v);
    }
    s
}

/// The Legendre symbol `(x / p)` for x prime to the odd prime p (Euler's criterion).
fn legendre(x: &BigInt, p: &BigInt) -> i32 {
    let e: BigInt = (p - 1u32) / 2u32;
    let r = x.mod_floor(p).modpow(&e, p);
    if r.is_one() { 1 } else { -1 }
}

/// `n = d m^2` with d squarefree (of the sign of n) and m > 0, for n != 0: the primes below
/// 2^16 by trial division, then a cofactor that is a perfect square or that factors
/// ([`factor_integer`]); `None` otherwise. The square class of n is that of d.
pub fn square_decomposition(n: &BigInt) -> Option<(BigInt, BigInt)> {
    if n.is_zero() {
        return None;
    }
    let (mut d, mut m) = (n.signum(), BigInt::one());
    let mut r = n.abs();
    let mut p = 2u64;
    while p < 1 << 16 && r > BigInt::one() {
        let bp = BigInt::from(p);
        let mut e = 0u32;
        while (&r % &bp).is_zero() {
            r /= &bp;
            e += 1;
        }
        if e % 2 == 1 {
            d *= &bp;
        }
        m *= bp.pow(e / 2);
        p += if p == 2 { 1 } else { 2 };
    }
    let root = r.sqrt();
    if &root * &root == r {
        return Some((d, m * root));
    }
    for (q, e) in factor_integer(&r)? {
        if e % 2 == 1 {
            d *= &q;
        }
        m *= q.pow(e / 2);
    }
    Some((d, m))
}

/// The prime factorisation of a positive integer, or `None` when a cofactor above 2^63
/// does not split into proven primes (trial division below 2^16, then the rho method;
/// every prime reported is below 2^63 and proven by a deterministic test, or below 2^16),
/// in increasing order of the primes.
pub fn factor_integer(n: &BigInt) -> Option<Vec<(BigInt, u32)>> {
    let mut out: Vec<(BigInt, u32)> = Vec::new();
    let mut m = n.clone();
    let push = |p: BigInt, out: &mut Vec<(BigInt, u32)>| match out.iter_mut().find(|x| x.0 == p) {
        Some(x) => x.1 += 1,
        None => out.push((p, 1)),
    };
    let mut d = 2u64;
    while d < 1 << 16 && m > BigInt::one() {
        let bd = BigInt::from(d);
        while (&m % &bd).is_zero() {
            m /= &bd;
            push(bd.clone(), &mut out);
        }
        d += if d == 2 { 1 } else { 2 };
    }
    let mut stack = vec![m];
    while let Some(x) = stack.pop() {
        if x.is_one() {
            continue;
        }
        if let Some(small) = x.to_u64().filter(|&v| v < 1 << 63) {
            if is_prime(small) {
                push(x, &mut out);
                continue;
            }
            let d = pollard_rho(small)?;
            stack.push(BigInt::from(d));
            stack.push(BigInt::from(small / d));
            continue;
        }
        // above 2^63: a factor by the big-integer rho method; a cofactor that does not
        // split within the budget (a probable prime, or a product of large primes) stays
        // unproven and the factorisation fails
        let d = pollard_rho_big(&x)?;
        stack.push(x.clone() / &d);
        stack.push(d);
    }
    out.sort();
    Some(out)
}

/// Iterations of the big-integer rho method per constant.
const RHO_BIG_STEPS: u64 = 1 << 18;

/// A nontrivial factor of an odd composite n > 2^63, by Brent's variant of the rho method
/// (Brent 1980, An improved Monte Carlo factorization algorithm) with products of 128
/// differences per gcd; `None` when none is found within [`RHO_BIG_STEPS`] steps for each
/// of a few constants (always for a prime n). Cost: O(RHO_BIG_STEPS) multiplications of
/// big integers per constant.
fn pollard_rho_big(n: &BigInt) -> Option<BigInt> {
    if n.is_even() {
        return Some(BigInt::from(2));
    }
    for c in 1..4u32 {
        let c = BigInt::from(c);
        let g = |x: &BigInt| (x * x + &c) % n;
        let (mut y, mut r, mut q) = (BigInt::from(2), 1u64, BigInt::one());
        let (mut x, mut ys) = (y.clone(), y.clone());
        let mut steps = 0u64;
        let mut d = BigInt::one();
        while d.is_one() && steps < RHO_BIG_STEPS {
            x = y.clone();
            for _ in 0..r {
                y = g(&y);
            }
            let mut k = 0;
            while k < r && d.is_one() {
                ys = y.clone();
                for _ in 0..128.min(r - k) {
                    y = g(&y);
                    q = (q * (&x - &y).abs()) % n;
                }
                d = q.gcd(n);
                k += 128;
                steps += 128;
            }
            r *= 2;
        }
        if d == *n {
            // back up one step at a time from the last saved point
            loop {
                ys = g(&ys);
                d = (&x - &ys).abs().gcd(n);
                if !d.is_one() {
                    break;
                }
            }
        }
        if !d.is_one() && d != *n {
            return Some(d);
        }
    }
    None
}

/// A nontrivial factor of a composite n < 2^63 (Pollard 1975, with Floyd's cycle
/// search; the constant of the map `x -> x^2 + c` is tried from 1 upward).
fn pollard_rho(n: u64) -> Option<u64> {
    if n.is_multiple_of(2) {
        return Some(2);
    }
    let mulm = |a: u64, b: u64| ((a as u128 * b as u128) % n as u128) as u64;
    for c in 1..64u64 {
        let g = |x: u64| (mulm(x, x) + c) % n;
        let (mut x, mut y, mut d) = (2u64, 2u64, 1u64);
        while d == 1 {
            x = g(x);
            y = g(g(y));
            d = x.abs_diff(y).gcd(&n);
        }
        if d != n {
            return Some(d);
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn classical_quaternion_algebras() {
        // Hamilton's quaternions (-1, -1) are a division algebra; (1, 1), (-1, 1) and
        // (2, -1) split (2 - 1 = 1: a norm); (-1, 3) and (2, 3) are division algebras:
        // -x^2 + 3y^2 = z^2 and 2x^2 + 3y^2 = z^2 have no nonzero solution, by descent
        // modulo 3 (Serre 1973, ch. III; worked by hand)
        assert_eq!(quaternion_is_division(&q(-1, 1), &q(-1, 1)), Some(true));
        assert_eq!(quaternion_is_division(&q(1, 1), &q(1, 1)), Some(false));
        assert_eq!(quaternion_is_division(&q(-1, 1), &q(1, 1)), Some(false));
        assert_eq!(quaternion_is_division(&q(2, 1), &q(-1, 1)), Some(false));
        assert_eq!(quaternion_is_division(&q(-1, 1), &q(3, 1)), Some(true));
        assert_eq!(quaternion_is_division(&q(2, 1), &q(3, 1)), Some(true));
        assert_eq!(
            factor_integer(&BigInt::from(2u64 * 3 * 3 * 1_000_003 * 998_244_353)),
            Some(vec![
                (BigInt::from(2), 1),
                (BigInt::from(3), 2),
                (BigInt::from(1_000_003), 1),
                (BigInt::from(998_244_353), 1)
            ])
        );
        // above 2^63: (10^12 + 39)(10^12 + 61)(2^31 - 1) splits (primes: sympy isprime)
        let (p1, p2, p3) = (1_000_000_000_039u64, 1_000_000_000_061u64, 2_147_483_647u64);
        let n = BigInt::from(p1) * p2 * p3;
        let f = factor_integer(&n).unwrap();
        let want = vec![
            (BigInt::from(p3), 1),
            (BigInt::from(p1), 1),
            (BigInt::from(p2), 1),
        ];
        assert_eq!(f, want);
        // 12 * (10^12 + 39)^2 = 3 (2 (10^12 + 39))^2
        let p1b = BigInt::from(p1);
        assert_eq!(
            square_decomposition(&(BigInt::from(-12) * &p1b * &p1b)),
            Some((BigInt::from(-3), BigInt::from(2) * &p1b))
        );
        // 2^64 - 59, a prime (sympy isprime), cannot be proven here: no factorisation
        assert_eq!(
            factor_integer(&BigInt::from(18_446_744_073_709_551_557u64)),
            None
        );
    }
}
