//! Dense polynomials over GF(p) for an odd prime p below 2^31 (so that a product of two
//! residues fits in a u64): arithmetic, gcd, powers modulo a polynomial, and the
//! factorization of a squarefree polynomial into monic irreducible factors.
//!
//! Invariant: coefficients are residues in `0..p`, stored from the constant term up, with no
//! trailing zeros. Costs are for degree d: products O(d^2), a power modulo f of exponent e
//! O(d^2 log e), the factorization O(d^3 log p) expected (the splitting is randomized with
//! an explicit seed; the result does not depend on it).

use rand::{Rng, SeedableRng};

/// A polynomial over GF(p): coefficients from the constant term up.
pub type PolyP = Vec<u64>;

/// Drop trailing zeros.
pub fn trim(mut a: PolyP) -> PolyP {
    while a.last() == Some(&0) {
        a.pop();
    }
    a
}

/// The degree (`None` for the zero polynomial).
pub fn degree(a: &[u64]) -> Option<usize> {
    a.len().checked_sub(1)
}

/// `x^e mod p` for a residue x.
pub fn pow_mod(mut x: u64, mut e: u64, p: u64) -> u64 {
    let mut r = 1 % p;
    x %= p;
    while e > 0 {
        if e & 1 == 1 {
            r = r * x % p;
        }
        x = x * x % p;
        e >>= 1;
    }
    r
}

/// The inverse of a nonzero residue (Fermat).
pub fn inv_mod(x: u64, p: u64) -> u64 {
    pow_mod(x, p - 2, p)
}

/// `a - b`.
pub fn sub(a: &[u64], b: &[u64], p: u64) -> PolyP {
    let n = a.len().max(b.len());
    trim(
        (0..n)
            .map(|i| {
                let x = a.get(i).copied().unwrap_or(0);
                let y = b.get(i).copied().unwrap_or(0);
                (x + p - y) % p
            })
            .collect(),
    )
}

/// `a b`.
pub fn mul(a: &[u64], b: &[u64], p: u64) -> PolyP {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![0u64; a.len() + b.len() - 1];
    for (i, &x) in a.iter().enumerate() {
        if x == 0 {
            continue;
        }
        for (j, &y) in b.iter().enumerate() {
            out[i + j] = (out[i + j] + x * y) % p;
        }
    }
    trim(out)
}

/// Quotient and remainder of `a` by a nonzero `b`.
pub fn divrem(a: &[u64], b: &[u64], p: u64) -> (PolyP, PolyP) {
    let db = degree(b).expect("division by the zero polynomial");
    let mut r = a.to_vec();
    if r.len() <= db {
        return (Vec::new(), trim(r));
    }
    let inv = inv_mod(b[db], p);
    let mut q = vec![0u64; r.len() - db];
    for k in (0..q.len()).rev() {
        let c = r[k + db] * inv % p;
        q[k] = c;
        if c != 0 {
            for (j, &y) in b.iter().enumerate() {
                r[k + j] = (r[k + j] + p - c * y % p) % p;
            }
        }
    }
    r.truncate(db);
    (trim(q), trim(r))
}

/// The monic multiple of a nonzero polynomial.
pub fn monic(a: &[u64], p: u64) -> PolyP {
    match a.last() {
        None => Vec::new(),
        Some(&lc) => {
            let inv = inv_mod(lc, p);
            a.iter().map(|&x| x * inv % p).collect()
        }
    }
}

/// The monic greatest common divisor (empty if both are zero).
pub fn gcd(a: &[u64], b: &[u64], p: u64) -> PolyP {
    let (mut a, mut b) = (trim(a.to_vec()), trim(b.to_vec()));
    while !b.is_empty() {
        let r = divrem(&a, &b, p).1;
        a = b;
        b = r;
    }
    monic(&a, p)
}

/// `(g, s, t)` with `s a + t b = g`, g the monic gcd of nonzero a, b; `deg s < deg b` and
/// `deg t < deg a` when g = 1 (extended Euclid).
pub fn ext_gcd(a: &[u64], b: &[u64], p: u64) -> (PolyP, PolyP, PolyP) {
    let (mut r0, mut r1) = (trim(a.to_vec()), trim(b.to_vec()));
    let (mut s0, mut s1): (PolyP, PolyP) = (vec![1], Vec::new());
    let (mut t0, mut t1): (PolyP, PolyP) = (Vec::new(), vec![1]);
    while !r1.is_empty() {
        let (q, r) = divrem(&r0, &r1, p);
        let s2 = sub(&s0, &mul(&q, &s1, p), p);
        let t2 = sub(&t0, &mul(&q, &t1, p), p);
        (r0, r1) = (r1, r);
        (s0, s1) = (s1, s2);
        (t0, t1) = (t1, t2);
    }
    let inv = inv_mod(*r0.last().expect("a nonzero input"), p);
    let scale = |v: PolyP| trim(v.iter().map(|&x| x * inv % p).collect());
    (scale(r0), scale(s0), scale(t0))
}

/// The formal derivative.
pub fn derivative(a: &[u64], p: u64) -> PolyP {
    trim(
        a.iter()
            .enumerate()
            .skip(1)
            .map(|(i, &x)| (i as u64 % p) * x % p)
            .collect(),
    )
}

/// `base^e mod f`, the exponent given by its little-endian 64-bit words.
pub fn pow_poly(base: &[u64], e: &[u64], f: &[u64], p: u64) -> PolyP {
    let mut result: PolyP = divrem(&[1], f, p).1;
    let mut b = divrem(base, f, p).1;
    let bits = e
        .iter()
        .rposition(|&w| w != 0)
        .map_or(0, |i| 64 * i + 64 - e[i].leading_zeros() as usize);
    for i in 0..bits {
        if (e[i / 64] >> (i % 64)) & 1 == 1 {
            result = divrem(&mul(&result, &b, p), f, p).1;
        }
        if i + 1 < bits {
            b = divrem(&mul(&b, &b, p), f, p).1;
        }
    }
    result
}

/// `(p^d - 1) / 2` as little-endian words.
fn half_power_minus_one(p: u64, d: usize) -> Vec<u64> {
    use num_bigint::BigUint;
    let e: BigUint = (BigUint::from(p).pow(d as u32) - 1u32) >> 1u32;
    e.to_u64_digits()
}

/// Distinct-degree factorization of a monic squarefree f: pairs (g, d) with g the product
/// of the irreducible factors of degree d.
fn distinct_degree(f: &[u64], p: u64) -> Vec<(PolyP, usize)> {
    let mut out = Vec::new();
    let mut f = f.to_vec();
    let x: PolyP = vec![0, 1];
    let mut h = x.clone();
    let mut d = 0;
    while degree(&f).unwrap_or(0) >= 2 * (d + 1) {
        d += 1;
        h = pow_poly(&h, &[p], &f, p);
        let g = gcd(&sub(&h, &x, p), &f, p);
        if g.len() > 1 {
            f = divrem(&f, &g, p).0;
            h = divrem(&h, &f, p).1;
            out.push((g, d));
        }
    }
    if f.len() > 1 {
        let d = degree(&f).unwrap_or(0);
        out.push((f, d));
    }
    out
}

/// Split a monic product of irreducible factors of degree d into them (Cantor-Zassenhaus).
fn equal_degree(g: &[u64], d: usize, p: u64, rng: &mut impl Rng, out: &mut Vec<PolyP>) {
    let n = degree(g).unwrap_or(0);
    if n <= d {
        out.push(g.to_vec());
        return;
    }
    let e = half_power_minus_one(p, d);
    loop {
        let a: PolyP = trim((0..n).map(|_| rng.gen_range(0..p)).collect());
        if a.len() < 2 {
            continue;
        }
        let b = sub(&pow_poly(&a, &e, g, p), &[1], p);
        let c = gcd(&b, g, p);
        let dc = degree(&c).unwrap_or(0);
        if dc > 0 && dc < n {
            equal_degree(&c, d, p, rng, out);
            equal_degree(&divrem(g, &c, p).0, d, p, rng, out);
            return;
        }
    }
}

/// The monic irreducible factors of a squarefree polynomial of degree >= 1 over GF(p)
/// (p odd), sorted by degree and then coefficients.
pub fn factor_squarefree(f: &[u64], p: u64, seed: u64) -> Vec<PolyP> {
    let f = monic(f, p);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let mut out = Vec::new();
    for (g, d) in distinct_degree(&f, p) {
        equal_degree(&g, d, p, &mut rng, &mut out);
    }
    out.sort_by(|a, b| a.len().cmp(&b.len()).then_with(|| a.cmp(b)));
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn factors_x4_plus_1_mod_small_primes() {
        // x^4 + 1 is irreducible over Q but splits modulo every prime (common practice):
        // mod 17 into 4 linear factors (17 = 1 mod 8), mod 3 into two quadratics.
        let f = vec![1, 0, 0, 0, 1];
        assert_eq!(factor_squarefree(&f, 17, 1).len(), 4);
        let g = factor_squarefree(&f, 3, 1);
        assert_eq!(
            g.iter().map(|x| x.len() - 1).collect::<Vec<_>>(),
            vec![2, 2]
        );
        let prod = g.iter().fold(vec![1], |a, b| mul(&a, b, 3));
        assert_eq!(prod, f);
    }
}
