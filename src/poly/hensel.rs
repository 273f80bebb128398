//! Hensel lifting of a factorisation modulo p to a factorisation modulo `M = p^(2^j)`.
//!
//! Given `f` in Z[x] with leading coefficient prime to p and `f = lc(f) g_1 ... g_r mod p`
//! (g_i monic, pairwise coprime mod p), [`lift_factors`] returns monic `G_i` with
//! `G_i = g_i mod p` and `f = lc(f) G_1 ... G_r mod M`. The factors are split in two halves
//! recursively; each split `f = g h` is lifted by quadratic Hensel steps together with its
//! Bezout coefficients `s g + t h = 1` (von zur Gathen and Gerhard 2013, Modern Computer
//! Algebra, Algorithms 15.10 and 15.17). The lifted factorisation is unique, so it does not
//! depend on the order of the steps.
//!
//! Cost: O(log log M) steps per level of the recursion, each a few products of
//! polynomials of degree at most deg f with coefficients below M^2.

use super::integer::{ZPoly, nonneg_mod};
use crate::scalar::PrimeField;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};

/// Polynomial arithmetic modulo an integer m (coefficients kept in `[0, m)`).
struct ModRing<'a> {
    m: &'a BigInt,
}

impl ModRing<'_> {
    fn norm(&self, a: ZPoly) -> ZPoly {
        nonneg_mod(&a, self.m)
    }
    fn add(&self, a: &[BigInt], b: &[BigInt]) -> ZPoly {
        let n = a.len().max(b.len());
        let z = BigInt::zero();
        self.norm(
            (0..n)
                .map(|i| a.get(i).unwrap_or(&z) + b.get(i).unwrap_or(&z))
                .collect(),
        )
    }
    fn sub(&self, a: &[BigInt], b: &[BigInt]) -> ZPoly {
        let n = a.len().max(b.len());
        let z = BigInt::zero();
        self.norm(
            (0..n)
                .map(|i| a.get(i).unwrap_or(&z) - b.get(i).unwrap_or(&z))
                .collect(),
        )
    }
    fn mul(&self, a: &[BigInt], b: &[BigInt]) -> ZPoly {
        self.norm(super::integer::mul(a, b))
    }
    /// Division by a monic polynomial b: `a = q b + r`, `deg r < deg b`.
    fn divrem_monic(&self, a: &[BigInt], b: &[BigInt]) -> (ZPoly, ZPoly) {
        let db = b.len() - 1;
        let mut r = self.norm(a.to_vec());
        if r.len() < b.len() {
            return (Vec::new(), r);
        }
        let mut q = vec![BigInt::zero(); r.len() - db];
        while r.len() > db {
            let dr = r.len() - 1;
            let c = r[dr].clone();
            if !c.is_zero() {
                for (i, bi) in b.iter().enumerate() {
                    r[dr - db + i] = (&r[dr - db + i] - &c * bi).mod_floor(self.m);
                }
            }
            q[dr - db] = c;
            r.pop();
        }
        (self.norm(q), self.norm(r))
    }
}

fn to_z(a: &[u64]) -> ZPoly {
    a.iter().map(|&c| BigInt::from(c)).collect()
}

/// One quadratic Hensel step (MCA, Algorithm 15.10): from `f = g h`, `s g + t h = 1`
/// modulo m (h monic) to the same modulo `m^2`.
fn hensel_step(
    f: &[BigInt],
    g: &[BigInt],
    h: &[BigInt],
    s: &[BigInt],
    t: &[BigInt],
    m: &BigInt,
) -> (ZPoly, ZPoly, ZPoly, ZPoly) {
    let m2 = m * m;
    let r = ModRing { m: &m2 };
    let e = r.sub(f, &r.mul(g, h));
    let (q, rr) = r.divrem_monic(&r.mul(s, &e), h);
    let g2 = r.add(g, &r.add(&r.mul(t, &e), &r.mul(&q, g)));
    let h2 = r.add(h, &rr);
    let b = r.sub(&r.add(&r.mul(s, &g2), &r.mul(t, &h2)), &[BigInt::one()]);
    let (c, d) = r.divrem_monic(&r.mul(s, &b), &h2);
    let s2 = r.sub(s, &d);
    let t2 = r.sub(&r.sub(t, &r.mul(t, &b)), &r.mul(&c, &g2));
    (g2, h2, s2, t2)
}

/// The smallest `M = p^(2^j)` with `M > bound`.
pub fn lifting_modulus(p: u64, bound: &BigInt) -> BigInt {
    let mut m = BigInt::from(p);
    while &m <= bound {
        m = &m * &m;
    }
    m
}

/// Lift `f = lc(f) prod g_i mod p` to modulus M (a power `p^(2^j)`, see
/// [`lifting_modulus`]). Returns the monic lifted factors, coefficients in `[0, M)`, in the
/// order of `factors`.
pub fn lift_factors(f: &[BigInt], factors: &[Vec<u64>], p: u64, big_m: &BigInt) -> Vec<ZPoly> {
    let fp = PrimeField::new(p).expect("a prime");
    if factors.len() == 1 {
        // f / lc(f) modulo M
        let lc = f.last().expect("nonzero").mod_floor(big_m);
        let inv = lc.extended_gcd(big_m).x.mod_floor(big_m);
        return vec![nonneg_mod(
            &f.iter().map(|c| c * &inv).collect::<Vec<_>>(),
            big_m,
        )];
    }
    let half = factors.len() / 2;
    let (left, right) = factors.split_at(half);
    let prod = |fs: &[Vec<u64>]| {
        fs.iter()
            .fold(super::one(&fp), |acc, g| super::mul(&fp, &acc, g))
    };
    let lc = fp.reduce_big(f.last().expect("nonzero"));
    let g0 = super::scale(&fp, &lc, &prod(left));
    let h0 = prod(right);
    let (_, s0, t0) = super::ext_gcd(&fp, &g0, &h0);
    let (mut g, mut h, mut s, mut t) = (to_z(&g0), to_z(&h0), to_z(&s0), to_z(&t0));
    let mut m = BigInt::from(p);
    while &m < big_m {
        (g, h, s, t) = hensel_step(f, &g, &h, &s, &t, &m);
        m = &m * &m;
    }
    let mut out = lift_factors(&g, left, p, big_m);
    out.extend(lift_factors(&h, right, p, big_m));
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lifts_a_quadratic() {
        // x^2 - 2 = (x - 3)(x + 3) mod 7; the 7-adic square roots of 2 (common practice):
        // the lifted factors multiply back to x^2 - 2 modulo M
        let f: ZPoly = vec![BigInt::from(-2), BigInt::zero(), BigInt::one()];
        let m = lifting_modulus(7, &BigInt::from(10u64.pow(12)));
        let fs = lift_factors(&f, &[vec![4, 1], vec![3, 1]], 7, &m);
        let prod = nonneg_mod(&super::super::integer::mul(&fs[0], &fs[1]), &m);
        assert_eq!(prod, nonneg_mod(&f, &m));
        assert_eq!(fs[0][0].mod_floor(&BigInt::from(7)), BigInt::from(4));
    }
}
