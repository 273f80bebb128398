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
    // integers in the same square classes
    let a: BigInt = a.numer() * a.denom();
    let b: BigInt = b.numer() * b.denom();
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
        let eps = |x: &BigInt| ((x - 1u32) / 2u32).mod_floor(&BigInt::from(2)).to_u32().unwrap_or(0);
        let omega =
            |x: &BigInt| ((x * x - 1u32) / 8u32).mod_floor(&BigInt::from(2)).to_u32().unwrap_or(0);
        let s = eps(&u) * eps(&v) + alpha * omega(&v) + beta * omega(&u);
        return if s % 2 == 0 { 1 } else { -1 };
    }
    let leg = |x: &BigInt| legendre(x, p);
    let ep = ((p - 1u32) / 2u32).mod_floor(&BigInt::from(2)).to_u32().unwrap_or(0);
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

/// The prime factorisation of a positive integer, or `None` when a cofactor above 2^63
/// is left after trial division by the primes below 2^16.
pub fn factor_integer(n: &BigInt) -> Option<Vec<(BigInt, u32)>> {
    let mut out: Vec<(BigInt, u32)> = Vec::new();
    let mut m = n.clone();
    let push = |p: BigInt, out: &mut Vec<(BigInt, u32)>| match out.iter_mut().find(|x| x.0 == p)
    {
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
    if m.is_one() {
        return Some(out);
    }
    let small = m.to_u64().filter(|&x| x < 1 << 63)?;
    let mut stack = vec![small];
    while let Some(x) = stack.pop() {
        if x == 1 {
            continue;
        }
        if is_prime(x) {
            push(BigInt::from(x), &mut out);
            continue;
        }
        let d = pollard_rho(x)?;
        stack.push(d);
        stack.push(x / d);
    }
    Some(out)
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
    }
}
