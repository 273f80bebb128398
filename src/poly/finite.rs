//! Factorisation of polynomials over a prime field GF(p), any prime p < 2^63.
//!
//! 1. *Squarefree factorisation*: `f = prod g_i^i` with each `g_i` squarefree and the
//!    `g_i` pairwise coprime, through `gcd(f, f')` and, when `f' = 0`, the p-th root
//!    (`f(x) = g(x^p) = g(x)^p` over GF(p)); Knuth 1969 / Yun 1976, in the form of
//!    von zur Gathen and Gerhard 2013, Modern Computer Algebra, Exercise 14.30.
//! 2. *Distinct-degree factorisation*: `gcd(x^(p^i) - x, f)` is the product of the
//!    irreducible factors of degree i (MCA, Algorithm 14.3).
//! 3. *Equal-degree splitting* (Cantor and Zassenhaus 1981): for a product g of
//!    irreducibles of degree d and a random a, `gcd(a^((p^d - 1)/2) - 1, g)` (p odd) or
//!    `gcd(a + a^2 + ... + a^(2^(d-1)), g)` (p = 2) is a proper factor with probability
//!    at least about 1/2 (MCA, Algorithms 14.8 and Exercise 14.16). The random choices
//!    come from a fixed seed, so the result is deterministic; the factors are exact
//!    either way (each split is a gcd, and the end result is checked by multiplication).
//!
//! Cost: O(d^3 log p) field operations for degree d (schoolbook arithmetic).

use super::{degree, derivative, divrem, gcd, monic, mul, one, powmod, powmod_bits, rem, sub, x};
use crate::error::{Error, Result};
use crate::scalar::PrimeField;
use num_bigint::BigUint;
use rand::{Rng, SeedableRng};

/// Monic polynomials over GF(p) with multiplicities.
pub type FactorsModP = Vec<(Vec<u64>, usize)>;

/// The factorisation of a nonzero `a` over GF(p): its leading coefficient and the monic
/// irreducible factors with multiplicities, sorted by (degree, coefficients).
/// Errors: `a` is zero. The product of the factors is checked against `a`.
pub fn factor_mod_p(fp: &PrimeField, a: &[u64]) -> Result<(u64, FactorsModP)> {
    let a = super::trimmed(fp, a);
    let Some(&lc) = a.last() else {
        return Err(Error::Invalid("cannot factor the zero polynomial".into()));
    };
    let mut out = Vec::new();
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(0xfac7);
    for (g, m) in squarefree_mod_p(fp, &monic(fp, &a)) {
        for (h, d) in distinct_degree(fp, &g) {
            for irr in equal_degree(fp, &h, d, &mut rng) {
                out.push((irr, m));
            }
        }
    }
    out.sort_by(|a, b| (a.0.len(), &a.0, a.1).cmp(&(b.0.len(), &b.0, b.1)));
    // exact check: lc * prod f_i^m_i = a
    let mut prod = vec![lc];
    for (g, m) in &out {
        for _ in 0..*m {
            prod = mul(fp, &prod, g);
        }
    }
    if prod != a {
        return Err(Error::Invalid(
            "internal error: a factorisation over GF(p) failed its check".into(),
        ));
    }
    Ok((lc, out))
}

/// Squarefree factorisation of a monic polynomial: `(g_i, i)` with `a = prod g_i^i`, each
/// `g_i` monic, squarefree, of positive degree, pairwise coprime.
pub fn squarefree_mod_p(fp: &PrimeField, a: &[u64]) -> Vec<(Vec<u64>, usize)> {
    let p = fp.modulus() as usize;
    let mut out = Vec::new();
    if degree(a).unwrap_or(0) == 0 {
        return out;
    }
    let d = derivative(fp, a);
    if d.is_empty() {
        // a(x) = b(x^p) = b(x)^p
        for (g, m) in squarefree_mod_p(fp, &pth_root(fp, a)) {
            out.push((g, m * p));
        }
        return out;
    }
    let mut c = gcd(fp, a, &d);
    let mut w = divrem(fp, a, &c).0;
    let mut i = 1;
    while degree(&w).unwrap_or(0) > 0 {
        let y = gcd(fp, &w, &c);
        let z = divrem(fp, &w, &y).0;
        if degree(&z).unwrap_or(0) > 0 {
            out.push((monic(fp, &z), i));
        }
        i += 1;
        w = y;
        c = divrem(fp, &c, &w).0;
    }
    if degree(&c).unwrap_or(0) > 0 {
        for (g, m) in squarefree_mod_p(fp, &pth_root(fp, &c)) {
            out.push((g, m * p));
        }
    }
    out
}

/// `b` with `b(x)^p = a(x)` when `a' = 0` (a has only exponents divisible by p; over GF(p)
/// every coefficient is its own p-th root).
fn pth_root(fp: &PrimeField, a: &[u64]) -> Vec<u64> {
    let p = fp.modulus() as usize;
    a.iter().step_by(p).copied().collect()
}

/// Distinct-degree factorisation of a monic squarefree polynomial: `(h_d, d)` where `h_d`
/// is the product of its irreducible factors of degree d.
pub fn distinct_degree(fp: &PrimeField, a: &[u64]) -> Vec<(Vec<u64>, usize)> {
    let mut out = Vec::new();
    let mut rest = a.to_vec();
    let mut h = x(fp);
    let mut i = 1;
    while degree(&rest).unwrap_or(0) >= 2 * i {
        h = powmod(fp, &h, fp.modulus(), &rest);
        let g = gcd(fp, &sub(fp, &h, &x(fp)), &rest);
        if degree(&g).unwrap_or(0) > 0 {
            rest = divrem(fp, &rest, &g).0;
            h = rem(fp, &h, &rest);
            out.push((g, i));
        }
        i += 1;
    }
    if let Some(d) = degree(&rest)
        && d > 0
    {
        out.push((rest, d));
    }
    out
}

/// Split a monic product of distinct irreducibles of degree d into its factors.
pub fn equal_degree(
    fp: &PrimeField,
    g: &[u64],
    d: usize,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Vec<Vec<u64>> {
    let n = degree(g).unwrap_or(0);
    if n <= d {
        return vec![g.to_vec()];
    }
    let p = fp.modulus();
    loop {
        let mut a: Vec<u64> = (0..n).map(|_| rng.gen_range(0..p)).collect();
        super::trim(fp, &mut a);
        if degree(&a).unwrap_or(0) == 0 {
            continue;
        }
        let b = if p == 2 {
            // the trace a + a^2 + ... + a^(2^(d-1)) mod g
            let mut t = a.clone();
            let mut s = a.clone();
            for _ in 1..d {
                t = super::mulmod(fp, &t, &t, g);
                s = super::add(fp, &s, &t);
            }
            s
        } else {
            let e: BigUint = (BigUint::from(p).pow(d as u32) - 1u32) / 2u32;
            let bits = (0..e.bits()).rev().map(move |i| e.bit(i));
            sub(fp, &powmod_bits(fp, &a, bits, g), &one(fp))
        };
        let h = gcd(fp, &b, g);
        let dh = degree(&h).unwrap_or(0);
        if dh > 0 && dh < n {
            let other = divrem(fp, g, &h).0;
            let mut out = equal_degree(fp, &h, d, rng);
            out.extend(equal_degree(fp, &monic(fp, &other), d, rng));
            return out;
        }
    }
}

/// True when a nonzero polynomial is squarefree over GF(p) (`gcd(a, a') = 1`).
pub fn is_squarefree_mod_p(fp: &PrimeField, a: &[u64]) -> bool {
    let d = derivative(fp, a);
    !d.is_empty() && degree(&gcd(fp, a, &d)) == Some(0)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn factors(p: u64, a: &[u64]) -> Vec<(Vec<u64>, usize)> {
        factor_mod_p(&PrimeField::new(p).unwrap(), a).unwrap().1
    }

    #[test]
    fn small_factorisations() {
        // x^4 - 1 over GF(5) = (x-1)(x-2)(x-3)(x-4): Fermat (common practice)
        assert_eq!(
            factors(5, &[4, 0, 0, 0, 1]),
            vec![
                (vec![1, 1], 1),
                (vec![2, 1], 1),
                (vec![3, 1], 1),
                (vec![4, 1], 1)
            ]
        );
        // x^4 + 1 over GF(2) = (x + 1)^4 (Frobenius, common practice)
        assert_eq!(factors(2, &[1, 0, 0, 0, 1]), vec![(vec![1, 1], 4)]);
        // x^2 + 1 irreducible over GF(3) (-1 is not a square mod 3)
        assert_eq!(factors(3, &[1, 0, 1]), vec![(vec![1, 0, 1], 1)]);
        // x^8 - x over GF(2): the irreducibles of degree 1 and 3 (Lidl and Niederreiter
        // 1997, Finite Fields, Thm. 3.20): x, x+1, x^3+x+1, x^3+x^2+1
        assert_eq!(
            factors(2, &[0, 1, 0, 0, 0, 0, 0, 0, 1]),
            vec![
                (vec![0, 1], 1),
                (vec![1, 1], 1),
                (vec![1, 0, 1, 1], 1),
                (vec![1, 1, 0, 1], 1)
            ]
        );
        // (x^2 + x + 1)^3 (x + 2)^2 over GF(3): multiplicities divisible by p
        let f3 = PrimeField::new(3).unwrap();
        let g = vec![1u64, 1, 1];
        let mut a = vec![1u64];
        for _ in 0..3 {
            a = mul(&f3, &a, &g);
        }
        a = mul(&f3, &a, &[2, 1]);
        a = mul(&f3, &a, &[2, 1]);
        let fs = factors(3, &a);
        assert_eq!(fs.iter().map(|f| f.1).sum::<usize>(), 8, "{fs:?}");
        // x^4 + 1 splits modulo every prime though irreducible over Q (common practice):
        // into 4 linear factors mod 17 (17 = 1 mod 8), into two quadratics mod 3
        assert_eq!(factors(17, &[1, 0, 0, 0, 1]).len(), 4);
        let two: Vec<usize> = factors(3, &[1, 0, 0, 0, 1])
            .iter()
            .map(|f| f.0.len() - 1)
            .collect();
        assert_eq!(two, vec![2, 2]);
        // a big prime
        let big = (1u64 << 61) - 1;
        let fb = PrimeField::new(big).unwrap();
        let a = mul(&fb, &[3, 1], &[5, 0, 1]);
        assert_eq!(factor_mod_p(&fb, &a).unwrap().1.len(), 2);
    }
}
