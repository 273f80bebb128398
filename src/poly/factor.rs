//! Factorization of integer polynomials over Q (the method of Zassenhaus).
//!
//! For a squarefree primitive f of degree d with leading coefficient l:
//! 1. a small odd prime p not dividing l with f squarefree modulo p is chosen (among the
//!    first few such primes, the one giving the fewest modular factors);
//! 2. f is factored modulo p into monic irreducibles ([`super::modp`]);
//! 3. the factorization is lifted to modulo M = p^(2^j) > 2 l B by quadratic Hensel steps
//!    (von zur Gathen and Gerhard 2013, Modern Computer Algebra, Algorithm 15.10), B the
//!    Mignotte bound 2^d |f|_2 on the coefficients of any factor of f;
//! 4. subsets of the lifted factors, by increasing size, give candidates `l prod g_j mod M`
//!    (symmetric residues, primitive part), kept when they divide f exactly.
//!
//! A candidate is accepted only after an exact division, and every true factor of f over Z
//! is `l prod g_j mod M` for some subset (the bound), so the result is exact.
//! Cost: polynomial in d and the size of f for the lifting; the recombination tries up to
//! 2^r subsets for r modular factors (r is small for the degrees used here, d <= 64).

use super::modp::{self, PolyP};
use crate::scalar::Q;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// An integer polynomial: coefficients from the constant term up, no trailing zeros.
pub type IntPoly = Vec<BigInt>;

fn trim(mut a: IntPoly) -> IntPoly {
    while a.last().is_some_and(Zero::is_zero) {
        a.pop();
    }
    a
}

/// The primitive part with a positive leading coefficient (the zero polynomial stays zero).
pub fn primitive_part(f: &[BigInt]) -> IntPoly {
    let f = trim(f.to_vec());
    let g = f.iter().fold(BigInt::zero(), |g, c| g.gcd(c));
    if g.is_zero() {
        return f;
    }
    let sign = if f.last().is_some_and(Signed::is_negative) {
        -BigInt::one()
    } else {
        BigInt::one()
    };
    f.iter().map(|c| c / &g * &sign).collect()
}

/// The integer polynomial proportional to a rational one (denominators cleared), primitive.
pub fn from_rationals(f: &[Q]) -> IntPoly {
    let den = f.iter().fold(BigInt::one(), |d, c| d.lcm(c.denom()));
    primitive_part(
        &f.iter()
            .map(|c| c.numer() * (&den / c.denom()))
            .collect::<Vec<_>>(),
    )
}

fn reduce(f: &[BigInt], p: u64) -> PolyP {
    let pb = BigInt::from(p);
    modp::trim(
        f.iter()
            .map(|c| c.mod_floor(&pb).to_u64().expect("reduced"))
            .collect(),
    )
}

fn lift(f: &[u64]) -> IntPoly {
    f.iter().map(|&c| BigInt::from(c)).collect()
}

/// Exact quotient `f / g` over Z, if g divides f (g nonzero).
fn div_exact(f: &[BigInt], g: &[BigInt]) -> Option<IntPoly> {
    let dg = g.len() - 1;
    let mut r = f.to_vec();
    if r.len() < g.len() {
        return r.iter().all(Zero::is_zero).then(Vec::new);
    }
    let mut q = vec![BigInt::zero(); r.len() - dg];
    for k in (0..q.len()).rev() {
        let (c, rem) = r[k + dg].div_rem(&g[dg]);
        if !rem.is_zero() {
            return None;
        }
        if !c.is_zero() {
            for (j, y) in g.iter().enumerate() {
                r[k + j] -= &c * y;
            }
        }
        q[k] = c;
    }
    r.iter().all(Zero::is_zero).then(|| trim(q))
}

/// The derivative.
fn derivative(f: &[BigInt]) -> IntPoly {
    trim(
        f.iter()
            .enumerate()
            .skip(1)
            .map(|(i, c)| c * BigInt::from(i))
            .collect(),
    )
}

/// Whether f (degree >= 1) has no repeated factor over Q: gcd(f, f') = 1, decided by a
/// prime for which f stays of the same degree and squarefree, else by the exact gcd over Q.
pub fn is_squarefree(f: &[BigInt]) -> bool {
    let f = trim(f.to_vec());
    if f.len() <= 2 {
        return true;
    }
    let lc = f.last().expect("nonzero").clone();
    for p in small_primes().take(20) {
        if (&lc % BigInt::from(p)).is_zero() {
            continue;
        }
        let fp = reduce(&f, p);
        if modp::gcd(&fp, &modp::derivative(&fp, p), p).len() == 1 {
            return true;
        }
    }
    // exact: gcd over Q by the Euclidean algorithm on rationals
    let a: Vec<Q> = f.iter().map(|c| Q::from_integer(c.clone())).collect();
    let b: Vec<Q> = derivative(&f)
        .iter()
        .map(|c| Q::from_integer(c.clone()))
        .collect();
    gcd_q(&a, &b).len() == 1
}

/// Quotient and remainder of a by b (b nonzero) over Q, coefficients from the constant
/// term up, without trailing zeros.
fn divrem_q(a: &[Q], b: &[Q]) -> (Vec<Q>, Vec<Q>) {
    let mut r = a.to_vec();
    let mut quotient = vec![Q::zero(); a.len().saturating_sub(b.len()) + 1];
    while r.len() >= b.len() && !r.is_empty() {
        let c = r.last().expect("nonempty") / b.last().expect("nonempty");
        let off = r.len() - b.len();
        for (j, y) in b.iter().enumerate() {
            r[off + j] -= &c * y;
        }
        quotient[off] = c;
        r.pop();
        while r.last().is_some_and(Zero::is_zero) {
            r.pop();
        }
    }
    while quotient.last().is_some_and(Zero::is_zero) {
        quotient.pop();
    }
    (quotient, r)
}

/// A greatest common divisor over Q (Euclidean algorithm on rationals; not normalised).
pub fn gcd_q(a: &[Q], b: &[Q]) -> Vec<Q> {
    let (mut a, mut b) = (a.to_vec(), b.to_vec());
    while a.last().is_some_and(Zero::is_zero) {
        a.pop();
    }
    while b.last().is_some_and(Zero::is_zero) {
        b.pop();
    }
    while !b.is_empty() {
        let (_, r) = divrem_q(&a, &b);
        a = b;
        b = r;
    }
    a
}

/// The distinct rational roots of a nonzero polynomial over Q: the linear factors over Q
/// of its squarefree part `f / gcd(f, f')` ([`factor_over_q`]). Empty for a nonzero
/// constant; exact.
pub fn rational_roots(f: &[Q]) -> Vec<Q> {
    let mut f = f.to_vec();
    while f.last().is_some_and(Zero::is_zero) {
        f.pop();
    }
    if f.len() < 2 {
        return Vec::new();
    }
    let df: Vec<Q> = f
        .iter()
        .enumerate()
        .skip(1)
        .map(|(i, c)| c * Q::from_integer(BigInt::from(i)))
        .collect();
    let (square_free, _) = divrem_q(&f, &gcd_q(&f, &df));
    let ints = from_rationals(&square_free);
    if ints.len() < 2 {
        return Vec::new();
    }
    let factors = if ints.len() == 2 {
        vec![ints]
    } else {
        factor_over_q(&ints).unwrap_or_default()
    };
    factors
        .iter()
        .filter(|g| g.len() == 2)
        .map(|g| Q::new(-g[0].clone(), g[1].clone()))
        .collect()
}

/// Odd primes 3, 5, 7, ...
fn small_primes() -> impl Iterator<Item = u64> {
    (3u64..).step_by(2).filter(|&n| crate::scalar::is_prime(n))
}

/// Coefficients reduced into `0..m`.
fn mods(f: &[BigInt], m: &BigInt) -> IntPoly {
    trim(f.iter().map(|c| c.mod_floor(m)).collect())
}

fn mul_z(a: &[BigInt], b: &[BigInt], m: &BigInt) -> IntPoly {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![BigInt::zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    mods(&out, m)
}

fn add_z(a: &[BigInt], b: &[BigInt], m: &BigInt, minus: bool) -> IntPoly {
    let n = a.len().max(b.len());
    let z = BigInt::zero();
    let v: Vec<BigInt> = (0..n)
        .map(|i| {
            let x = a.get(i).unwrap_or(&z);
            let y = b.get(i).unwrap_or(&z);
            if minus { x - y } else { x + y }
        })
        .collect();
    mods(&v, m)
}

/// Quotient and remainder by h, monic modulo m.
fn divrem_monic(a: &[BigInt], h: &[BigInt], m: &BigInt) -> (IntPoly, IntPoly) {
    let dh = h.len() - 1;
    let mut r = mods(a, m);
    if r.len() <= dh {
        return (Vec::new(), r);
    }
    let mut q = vec![BigInt::zero(); r.len() - dh];
    for k in (0..q.len()).rev() {
        let c = r[k + dh].mod_floor(m);
        if !c.is_zero() {
            for (j, y) in h.iter().enumerate() {
                r[k + j] -= &c * y;
            }
        }
        q[k] = c;
    }
    r.truncate(dh);
    (mods(&q, m), mods(&r, m))
}

/// One quadratic Hensel step: from f = g h, s g + t h = 1 modulo m (h monic) to the same
/// modulo m^2 (von zur Gathen and Gerhard 2013, Algorithm 15.10).
#[allow(clippy::type_complexity)]
fn hensel_step(
    f: &[BigInt],
    g: &[BigInt],
    h: &[BigInt],
    s: &[BigInt],
    t: &[BigInt],
    m2: &BigInt,
) -> (IntPoly, IntPoly, IntPoly, IntPoly) {
    let e = add_z(f, &mul_z(g, h, m2), m2, true);
    let (q, r) = divrem_monic(&mul_z(s, &e, m2), h, m2);
    let g2 = add_z(
        &add_z(g, &mul_z(t, &e, m2), m2, false),
        &mul_z(&q, g, m2),
        m2,
        false,
    );
    let h2 = add_z(h, &r, m2, false);
    let b = add_z(
        &add_z(&mul_z(s, &g2, m2), &mul_z(t, &h2, m2), m2, false),
        &[BigInt::one()],
        m2,
        true,
    );
    let (c, d) = divrem_monic(&mul_z(s, &b, m2), &h2, m2);
    let s2 = add_z(s, &d, m2, true);
    let t2 = add_z(
        &add_z(t, &mul_z(t, &b, m2), m2, true),
        &mul_z(&c, &g2, m2),
        m2,
        true,
    );
    (g2, h2, s2, t2)
}

/// Lift `f = lc prod g_j (mod p)` (g_j monic) to modulo p^(2^j) >= `target`; returns the
/// lifted monic factors and the modulus.
fn hensel_lift(f: &[BigInt], factors: &[PolyP], p: u64, target: &BigInt) -> (Vec<IntPoly>, BigInt) {
    let mut modulus = BigInt::from(p);
    let mut steps = 0;
    while &modulus < target {
        modulus = &modulus * &modulus;
        steps += 1;
    }
    let mut out = Vec::new();
    let mut rest_f: IntPoly = f.to_vec();
    let lc_p = reduce(&[f.last().expect("nonzero").clone()], p);
    for (i, h0) in factors.iter().enumerate() {
        if i + 1 == factors.len() {
            // the last factor is the monic multiple of what is left
            let lc = rest_f.last().expect("nonzero").clone();
            let inv = lc.modinv(&modulus).expect("lc is a unit mod p");
            out.push(mods(
                &rest_f.iter().map(|c| c * &inv).collect::<Vec<_>>(),
                &modulus,
            ));
            break;
        }
        let g0 = factors[i + 1..]
            .iter()
            .fold(lc_p.clone(), |a, b| modp::mul(&a, b, p));
        let (_, s0, t0) = modp::ext_gcd(&g0, h0, p);
        let (mut g, mut h, mut s, mut t) = (lift(&g0), lift(h0), lift(&s0), lift(&t0));
        let mut m = BigInt::from(p);
        for _ in 0..steps {
            m = &m * &m;
            (g, h, s, t) = hensel_step(&rest_f, &g, &h, &s, &t, &m);
        }
        out.push(h);
        rest_f = g;
    }
    (out, modulus)
}

fn symmetric(f: &[BigInt], m: &BigInt) -> IntPoly {
    let half = m >> 1u32;
    trim(
        f.iter()
            .map(|c| {
                let c = c.mod_floor(m);
                if c > half { c - m } else { c }
            })
            .collect(),
    )
}

/// The irreducible factors over Q of a squarefree integer polynomial of degree >= 1, as
/// primitive integer polynomials with positive leading coefficients, sorted by degree.
/// Errors: the zero polynomial, a constant, or a polynomial with a repeated factor.
pub fn factor_over_q(f: &[BigInt]) -> Result<Vec<IntPoly>, String> {
    let f = primitive_part(f);
    if f.len() < 2 {
        return Err("a polynomial of degree at least 1 is needed".into());
    }
    if !is_squarefree(&f) {
        return Err("the polynomial has a repeated factor".into());
    }
    if f.len() == 2 {
        return Ok(vec![f]);
    }
    let d = f.len() - 1;
    let lc = f.last().expect("nonzero").clone();
    // the prime with the fewest modular factors among the first five suitable ones
    let mut best: Option<(u64, Vec<PolyP>)> = None;
    let mut tried = 0;
    for p in small_primes() {
        if tried == 5 || p > 1 << 30 {
            break;
        }
        if (&lc % BigInt::from(p)).is_zero() {
            continue;
        }
        let fp = reduce(&f, p);
        if fp.len() != f.len() || modp::gcd(&fp, &modp::derivative(&fp, p), p).len() != 1 {
            continue;
        }
        tried += 1;
        let fac = modp::factor_squarefree(&fp, p, p);
        if best.as_ref().is_none_or(|(_, b)| fac.len() < b.len()) {
            best = Some((p, fac));
        }
    }
    let (p, modular) = best.ok_or("no suitable prime found")?;
    if modular.len() == 1 {
        return Ok(vec![f]);
    }
    // Mignotte: |coefficients of a factor| <= 2^d |f|_2; target 2 |lc| bound + 1
    let norm2: BigInt = f.iter().map(|c| c * c).sum();
    let bound = (norm2.sqrt() + 1) << d;
    let target = (bound * lc.abs()) * 2 + 1;
    let (mut lifted, m) = hensel_lift(&f, &modular, p, &target);
    let mut rest = f.clone();
    let mut out = Vec::new();
    let mut size = 1;
    'sizes: while 2 * size <= lifted.len() {
        let r = lifted.len();
        let mut idx: Vec<usize> = (0..size).collect();
        loop {
            let lc = rest.last().expect("nonzero").clone();
            let cand = idx.iter().fold(vec![lc], |a, &j| mul_z(&a, &lifted[j], &m));
            let cand = primitive_part(&symmetric(&cand, &m));
            if let Some(q) = div_exact(&rest, &cand) {
                out.push(cand);
                rest = q;
                for &j in idx.iter().rev() {
                    lifted.remove(j);
                }
                continue 'sizes;
            }
            // next subset of `size` indices out of r
            let mut k = size;
            loop {
                if k == 0 {
                    size += 1;
                    continue 'sizes;
                }
                k -= 1;
                if idx[k] < r - size + k {
                    idx[k] += 1;
                    for j in k + 1..size {
                        idx[j] = idx[j - 1] + 1;
                    }
                    break;
                }
            }
        }
    }
    if rest.len() > 1 {
        out.push(primitive_part(&rest));
    }
    out.sort_by(|a, b| a.len().cmp(&b.len()).then_with(|| a.cmp(b)));
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn poly(c: &[i64]) -> IntPoly {
        c.iter().map(|&x| BigInt::from(x)).collect()
    }

    fn degrees(f: &[i64]) -> Vec<usize> {
        factor_over_q(&poly(f))
            .unwrap()
            .iter()
            .map(|g| g.len() - 1)
            .collect()
    }

    #[test]
    fn rational_roots_of_a_polynomial_with_repeated_factors() {
        // x^2 (2x - 3)^2 (x^2 - 2): roots 0 and 3/2 (sqrt 2 is irrational, Euclid)
        let f: Vec<Q> = [0, 0, -18, 24, 1, -12, 4]
            .iter()
            .map(|&c| Q::from_integer(BigInt::from(c)))
            .collect();
        let mut r = rational_roots(&f);
        r.sort();
        assert_eq!(r, vec![Q::zero(), Q::new(3.into(), 2.into())]);
        assert!(rational_roots(&[Q::one()]).is_empty());
    }

    #[test]
    fn cyclotomic_factorizations() {
        // x^n - 1 = prod over d | n of the cyclotomic polynomials, of degrees phi(d)
        // (Lang 2002, Algebra, VI.3): x^8 - 1 -> 1, 1, 2, 4; x^9 - 1 -> 1, 2, 6.
        assert_eq!(degrees(&[-1, 0, 0, 0, 0, 0, 0, 0, 1]), vec![1, 1, 2, 4]);
        assert_eq!(degrees(&[-1, 0, 0, 0, 0, 0, 0, 0, 0, 1]), vec![1, 2, 6]);
        // x^4 + 1 is irreducible over Q although it splits modulo every prime.
        assert_eq!(degrees(&[1, 0, 0, 0, 1]), vec![4]);
        // (2x + 3)(x^2 - 2)(3x^3 + x + 5): leading coefficients other than 1
        let f = [poly(&[3, 2]), poly(&[-2, 0, 1]), poly(&[5, 1, 0, 3])]
            .iter()
            .fold(poly(&[1]), |a, b| {
                let mut out = vec![BigInt::zero(); a.len() + b.len() - 1];
                for (i, x) in a.iter().enumerate() {
                    for (j, y) in b.iter().enumerate() {
                        out[i + j] += x * y;
                    }
                }
                out
            });
        let fac = factor_over_q(&f).unwrap();
        assert_eq!(
            fac,
            vec![poly(&[3, 2]), poly(&[-2, 0, 1]), poly(&[5, 1, 0, 3])]
        );
        assert!(factor_over_q(&poly(&[1, 2, 1])).is_err());
    }
}
