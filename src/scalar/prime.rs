//! Prime fields GF(p) for word-size primes p < 2^63, elements `u64` in `0..p`.
//!
//! Products use a 64-bit multiply when p < 2^32 and a 128-bit one otherwise; both are exact.

use super::{Field, Q};
use num_bigint::BigInt;
use num_traits::Zero;

/// The prime field GF(p). Invariant: `p` is prime and `2 <= p < 2^63`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct PrimeField {
    p: u64,
}

impl PrimeField {
    /// GF(p). The caller guarantees that p is a prime below 2^63 (see [`super::is_prime`]);
    /// returns `None` otherwise.
    pub fn new(p: u64) -> Option<Self> {
        if p < (1 << 63) && super::is_prime(p) {
            Some(PrimeField { p })
        } else {
            None
        }
    }

    /// The modulus.
    pub fn modulus(&self) -> u64 {
        self.p
    }

    /// `a * b mod p`.
    #[inline(always)]
    pub fn mul_mod(&self, a: u64, b: u64) -> u64 {
        if self.p < (1 << 32) {
            (a * b) % self.p
        } else {
            ((a as u128 * b as u128) % self.p as u128) as u64
        }
    }

    /// `a^e mod p`.
    pub fn pow(&self, mut a: u64, mut e: u64) -> u64 {
        let mut r = 1 % self.p;
        while e > 0 {
            if e & 1 == 1 {
                r = self.mul_mod(r, a);
            }
            a = self.mul_mod(a, a);
            e >>= 1;
        }
        r
    }

    /// Reduce a big integer into `0..p`.
    pub fn reduce_big(&self, a: &BigInt) -> u64 {
        super::residue(a, self.p)
    }

    /// The symmetric representative in `(-p/2, p/2]` as i64.
    pub fn symmetric(&self, a: u64) -> i64 {
        if a > self.p / 2 {
            a as i64 - self.p as i64
        } else {
            a as i64
        }
    }
}

impl Field for PrimeField {
    type Elem = u64;
    fn characteristic(&self) -> u64 {
        self.p
    }
    fn name(&self) -> String {
        format!("GF({})", self.p)
    }
    fn zero(&self) -> u64 {
        0
    }
    fn one(&self) -> u64 {
        1 % self.p
    }
    fn is_zero(&self, a: &u64) -> bool {
        *a == 0
    }
    #[inline(always)]
    fn add(&self, a: &u64, b: &u64) -> u64 {
        let s = a + b;
        if s >= self.p { s - self.p } else { s }
    }
    #[inline(always)]
    fn sub(&self, a: &u64, b: &u64) -> u64 {
        if a >= b { a - b } else { a + self.p - b }
    }
    #[inline(always)]
    fn mul(&self, a: &u64, b: &u64) -> u64 {
        self.mul_mod(*a, *b)
    }
    fn neg(&self, a: &u64) -> u64 {
        if *a == 0 { 0 } else { self.p - a }
    }
    fn inv(&self, a: &u64) -> Option<u64> {
        if *a == 0 {
            return None;
        }
        // extended Euclid on i128
        let (mut r0, mut r1) = (self.p as i128, *a as i128);
        let (mut t0, mut t1) = (0i128, 1i128);
        while r1 != 0 {
            let qq = r0 / r1;
            (r0, r1) = (r1, r0 - qq * r1);
            (t0, t1) = (t1, t0 - qq * t1);
        }
        Some(t0.rem_euclid(self.p as i128) as u64)
    }
    fn from_rational(&self, a: &Q) -> Option<u64> {
        let d = self.reduce_big(a.denom());
        let n = self.reduce_big(a.numer());
        Some(self.mul_mod(n, self.inv(&d)?))
    }
    fn to_rational(&self, a: &u64) -> Q {
        Q::from_integer(BigInt::from(*a))
    }
    fn from_i64(&self, a: i64) -> u64 {
        (a as i128).rem_euclid(self.p as i128) as u64
    }
    #[inline(always)]
    fn add_mul_assign(&self, a: &mut u64, b: &u64, c: &u64) {
        let t = self.mul_mod(*b, *c);
        *a = self.add(a, &t);
    }
    #[inline(always)]
    fn sub_mul_assign(&self, a: &mut u64, b: &u64, c: &u64) {
        let t = self.mul_mod(*b, *c);
        *a = self.sub(a, &t);
    }
    fn format(&self, a: &u64) -> String {
        a.to_string()
    }
}

impl PrimeField {
    /// True when a rational's denominator is divisible by p (it has no image in GF(p)).
    pub fn denominator_vanishes(&self, a: &Q) -> bool {
        self.reduce_big(a.denom()).is_zero()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn inverse_and_arith() {
        let f = PrimeField::new(7).unwrap();
        for a in 1..7 {
            let i = f.inv(&a).unwrap();
            assert_eq!(f.mul(&a, &i), 1);
        }
        let g = PrimeField::new((1u64 << 61) - 1).unwrap();
        let a = g.from_i64(-5);
        assert_eq!(g.add(&a, &5), 0);
        assert_eq!(g.mul(&g.inv(&a).unwrap(), &a), 1);
        assert!(PrimeField::new(15).is_none());
    }
}
