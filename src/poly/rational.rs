//! Factorisation of polynomials over Q into monic irreducibles.
//!
//! 1. *Squarefree factorisation* by Yun's algorithm (Yun 1976, "On square-free
//!    decomposition algorithms"): `a = lc prod g_i^i` with `g_i` squarefree and coprime.
//! 2. *Zassenhaus's method* (Zassenhaus 1969, "On Hensel factorization I") for each
//!    squarefree part, as a primitive integer polynomial g of degree d: choose a prime p
//!    not dividing `lc(g)` with g squarefree mod p (among the first candidates, the one
//!    with the fewest factors mod p), factor g mod p ([`super::finite`]), lift the factors
//!    to a modulus M above twice `|lc(g)|` times the Mignotte bound ([`super::hensel`]),
//!    then try products of s of the lifted factors, s = 1, 2, ...: `lc(g) prod` reduced
//!    into `(-M/2, M/2]` has the coefficients of `lc(g) / lc(h)` times a true factor h if
//!    there is one, which trial division in Z[x] confirms. When fewer than 2s lifted
//!    factors remain, what remains is irreducible. (von zur Gathen and Gerhard 2013,
//!    Modern Computer Algebra, Algorithm 15.19.)
//!
//! Every factor is exact; the product of the factors is checked against the input.
//! Recombination can take exponentially many trials on rare inputs; it stops with an
//! error after [`MAX_TRIALS`] trial products.

use super::finite::{factor_mod_p, is_squarefree_mod_p};
use super::hensel::{lift_factors, lifting_modulus};
use super::integer::{ZPoly, exact_div, mignotte_bound, primitive, symmetric_mod, to_q};
use super::{Factorisation, QQ, degree, derivative, divrem, gcd, monic, mul, sort_factors, sub};
use crate::error::{Error, Result};
use crate::scalar::{PrimeField, Q};
use itertools::Itertools;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{Signed, Zero};

/// The most subset products tried in one recombination.
pub const MAX_TRIALS: usize = 1 << 22;

/// Primes tried for the modular factorisation, and how many qualifying ones are compared.
const CANDIDATE_PRIMES: usize = 60;
const COMPARED_PRIMES: usize = 5;

/// Factor a nonzero polynomial over Q (see the module documentation).
pub fn factor_rational(a: &[Q]) -> Result<Factorisation> {
    let a = super::trimmed(&QQ, a);
    let Some(lc) = a.last().cloned() else {
        return Err(Error::Invalid("cannot factor the zero polynomial".into()));
    };
    let mut factors = Vec::new();
    for (g, m) in squarefree_rational(&monic(&QQ, &a)) {
        for h in factor_squarefree(&primitive(&g))? {
            factors.push((monic(&QQ, &to_q(&h)), m));
        }
    }
    sort_factors(&mut factors);
    let mut prod = vec![lc.clone()];
    for (g, m) in &factors {
        for _ in 0..*m {
            prod = mul(&QQ, &prod, g);
        }
    }
    if prod != a {
        return Err(Error::Invalid(
            "internal error: a factorisation over Q failed its check".into(),
        ));
    }
    Ok(Factorisation { unit: lc, factors })
}

/// Yun's squarefree factorisation of a monic polynomial over Q: `(g_i, i)`, g_i monic of
/// positive degree.
pub fn squarefree_rational(a: &[Q]) -> Vec<(Vec<Q>, usize)> {
    let mut out = Vec::new();
    if degree(a).unwrap_or(0) == 0 {
        return out;
    }
    let da = derivative(&QQ, a);
    let b = gcd(&QQ, a, &da);
    let mut c = divrem(&QQ, a, &b).0;
    let mut d = sub(&QQ, &divrem(&QQ, &da, &b).0, &derivative(&QQ, &c));
    let mut i = 1;
    while degree(&c).unwrap_or(0) > 0 {
        let g = gcd(&QQ, &c, &d);
        c = divrem(&QQ, &c, &g).0;
        d = sub(&QQ, &divrem(&QQ, &d, &g).0, &derivative(&QQ, &c));
        if degree(&g).unwrap_or(0) > 0 {
            out.push((monic(&QQ, &g), i));
        }
        i += 1;
    }
    out
}

/// The irreducible factors in Z[x] of a primitive squarefree integer polynomial of
/// positive degree (each primitive with a positive leading coefficient).
pub fn factor_squarefree(g: &[BigInt]) -> Result<Vec<ZPoly>> {
    let d = degree(g).unwrap_or(0);
    if d <= 1 {
        return Ok(vec![g.to_vec()]);
    }
    let Some((p, modular)) = choose_prime(g) else {
        return Err(Error::Invalid(
            "no prime among the first candidates keeps the polynomial squarefree".into(),
        ));
    };
    if modular.len() == 1 {
        return Ok(vec![g.to_vec()]);
    }
    let lc = g[d].clone();
    let bound = mignotte_bound(g) * lc.abs() * 2u32;
    let m = lifting_modulus(p, &bound);
    let lifted = lift_factors(g, &modular, p, &m);
    recombine(g, lifted, &m)
}

/// A prime for the modular step: among the first qualifying primes (lc not divisible,
/// squarefree mod p), the one with the fewest factors; with its monic factors.
fn choose_prime(g: &[BigInt]) -> Option<(u64, Vec<Vec<u64>>)> {
    let lc = g.last()?;
    let mut best: Option<(u64, Vec<Vec<u64>>)> = None;
    let mut compared = 0;
    for p in (3u64..)
        .filter(|&p| crate::scalar::is_prime(p))
        .take(CANDIDATE_PRIMES)
    {
        if (lc % p).is_zero() {
            continue;
        }
        let fp = PrimeField::new(p).expect("prime");
        let v: Vec<u64> = g.iter().map(|c| fp.reduce_big(c)).collect();
        if !is_squarefree_mod_p(&fp, &v) {
            continue;
        }
        let Ok((_, fs)) = factor_mod_p(&fp, &v) else {
            continue;
        };
        let fs: Vec<Vec<u64>> = fs.into_iter().map(|(h, _)| h).collect();
        if best.as_ref().is_none_or(|b| fs.len() < b.1.len()) {
            best = Some((p, fs));
        }
        compared += 1;
        if compared >= COMPARED_PRIMES || best.as_ref().is_some_and(|b| b.1.len() == 1) {
            break;
        }
    }
    best
}

/// Zassenhaus recombination of the lifted monic factors (see the module documentation).
fn recombine(g: &[BigInt], lifted: Vec<ZPoly>, m: &BigInt) -> Result<Vec<ZPoly>> {
    let mut rest: ZPoly = g.to_vec();
    let mut pool: Vec<ZPoly> = lifted;
    let mut found = Vec::new();
    let mut s = 1;
    let mut trials = 0usize;
    while 2 * s <= pool.len() {
        let lc = rest.last().expect("nonzero").clone();
        let mut hit: Option<(Vec<usize>, ZPoly, ZPoly)> = None;
        for subset in (0..pool.len()).combinations(s) {
            trials += 1;
            if trials > MAX_TRIALS {
                return Err(Error::Invalid(format!(
                    "factoring a polynomial of degree {} needs more than {MAX_TRIALS} \
                     recombination trials",
                    g.len() - 1
                )));
            }
            // constant terms first: a cheap necessary condition
            let c0 = subset.iter().fold(lc.clone(), |acc, &i| {
                (acc * pool[i].first().cloned().unwrap_or_default()).mod_floor(m)
            });
            let c0 = symmetric_mod(&[c0], m).first().cloned().unwrap_or_default();
            let r0 = rest.first().cloned().unwrap_or_default();
            if !c0.is_zero() && !(&lc * &r0).is_multiple_of(&c0) {
                continue;
            }
            let prod = subset.iter().fold(vec![lc.clone()], |acc, &i| {
                symmetric_mod(&super::integer::mul(&acc, &pool[i]), m)
            });
            let cand = primitive(&to_q(&prod));
            if let Some(q) = exact_div(&rest, &cand) {
                hit = Some((subset, cand, q));
                break;
            }
        }
        match hit {
            Some((subset, cand, q)) => {
                found.push(cand);
                rest = q;
                pool = pool
                    .into_iter()
                    .enumerate()
                    .filter(|(i, _)| !subset.contains(i))
                    .map(|(_, h)| h)
                    .collect();
            }
            None => s += 1,
        }
    }
    if degree(&rest).unwrap_or(0) > 0 {
        let neg = rest.last().is_some_and(Signed::is_negative);
        found.push(if neg {
            rest.iter().map(|c| -c).collect()
        } else {
            rest
        });
    }
    Ok(found)
}

/// The distinct rational roots of a polynomial over Q, ascending: the roots of its monic
/// linear factors ([`factor_rational`]). Empty for a constant (and for the zero
/// polynomial) and when the factorisation stops at its work limit. Exact.
pub fn rational_roots(a: &[Q]) -> Vec<Q> {
    let a = super::trimmed(&QQ, a);
    if degree(&a).unwrap_or(0) == 0 {
        return Vec::new();
    }
    let Ok(fac) = factor_rational(&a) else {
        return Vec::new();
    };
    let mut roots: Vec<Q> = fac
        .factors
        .iter()
        .filter(|(g, _)| g.len() == 2)
        .map(|(g, _)| -g[0].clone())
        .collect();
    roots.sort();
    roots
}

/// True when the polynomial (nonzero) is irreducible over Q.
pub fn is_irreducible_rational(a: &[Q]) -> Result<bool> {
    Ok(factor_rational(a)?.is_irreducible())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    fn pq(v: &[i64]) -> Vec<Q> {
        v.iter().map(|&c| q(c, 1)).collect()
    }

    fn degrees(a: &[i64]) -> Vec<(usize, usize)> {
        factor_rational(&pq(a))
            .unwrap()
            .factors
            .iter()
            .map(|(g, m)| (g.len() - 1, *m))
            .collect()
    }

    #[test]
    fn rational_roots_of_a_polynomial_with_repeated_factors() {
        // x^2 (2x - 3)^2 (x^2 - 2): roots 0 and 3/2 (sqrt 2 is irrational, Euclid)
        assert_eq!(
            rational_roots(&pq(&[0, 0, -18, 24, 1, -12, 4])),
            vec![q(0, 1), q(3, 2)]
        );
        assert!(rational_roots(&pq(&[1])).is_empty());
        assert!(rational_roots(&[]).is_empty());
    }

    #[test]
    fn products_of_known_factors() {
        // x^8 - 1 and x^9 - 1: the cyclotomic polynomials of the divisors, of degrees
        // phi(d) (Lang 2002, Algebra, VI.3)
        let mut x8 = vec![0i64; 9];
        (x8[0], x8[8]) = (-1, 1);
        let d8: Vec<usize> = degrees(&x8).iter().map(|f| f.0).collect();
        assert_eq!(d8, vec![1, 1, 2, 4]);
        let mut x9 = vec![0i64; 10];
        (x9[0], x9[9]) = (-1, 1);
        let d9: Vec<usize> = degrees(&x9).iter().map(|f| f.0).collect();
        assert_eq!(d9, vec![1, 2, 6]);
        // (2x + 3)(x^2 - 2)(3x^3 + x + 5): leading coefficients other than 1
        let a = mul(
            &QQ,
            &mul(&QQ, &pq(&[3, 2]), &pq(&[-2, 0, 1])),
            &pq(&[5, 1, 0, 3]),
        );
        let f = factor_rational(&a).unwrap();
        assert_eq!(f.unit, q(6, 1));
        let ints: Vec<ZPoly> = f.factors.iter().map(|(g, _)| primitive(g)).collect();
        assert_eq!(
            ints,
            vec![
                vec![3.into(), 2.into()],
                vec![(-2).into(), 0.into(), 1.into()],
                vec![5.into(), 1.into(), 0.into(), 3.into()]
            ]
        );
    }

    #[test]
    fn cyclotomic_and_classical_cases() {
        // x^n - 1 = prod over d | n of the cyclotomic polynomials, each irreducible over Q
        // of degree phi(d) (Gauss; common practice): x^12 - 1 has 6 factors of degrees
        // 1, 1, 2, 2, 2, 4.
        let mut x12 = vec![0i64; 13];
        x12[0] = -1;
        x12[12] = 1;
        assert_eq!(
            degrees(&x12),
            vec![(1, 1), (1, 1), (2, 1), (2, 1), (2, 1), (4, 1)]
        );
        // x^4 + 1 is irreducible over Q but splits modulo every prime (common practice):
        // the recombination must find no proper factor.
        assert_eq!(degrees(&[1, 0, 0, 0, 1]), vec![(4, 1)]);
        // the minimal polynomial of sqrt 2 + sqrt 3, x^4 - 10 x^2 + 1: irreducible over Q,
        // reducible modulo every prime (von zur Gathen and Gerhard 2013, Modern Computer
        // Algebra, sect. 15.3; from memory)
        assert_eq!(degrees(&[1, 0, -10, 0, 1]), vec![(4, 1)]);
        // (2x + 1)^2 (x^2 - 2): squarefree parts and a non-monic factor
        let a = mul(&QQ, &mul(&QQ, &pq(&[1, 2]), &pq(&[1, 2])), &pq(&[-2, 0, 1]));
        let f = factor_rational(&a).unwrap();
        assert_eq!(f.unit, q(4, 1));
        assert_eq!(
            f.factors,
            vec![(vec![q(1, 2), q(1, 1)], 2), (pq(&[-2, 0, 1]), 1)]
        );
    }
}
