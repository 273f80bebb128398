//! Univariate polynomials over an exact field, and their factorisation into irreducibles.
//!
//! A polynomial is a vector of coefficients, the constant term first
//! (`[1, 0, 1]` is `x^2 + 1`), always *trimmed*: no zero leading coefficient, the zero
//! polynomial is the empty vector. The arithmetic here is generic over any
//! [`Field`] (the rationals or GF(p)): sums, products, division with remainder, monic gcd,
//! the extended Euclidean algorithm, derivatives and powers modulo a polynomial.
//!
//! Factorisation:
//! - over GF(p) ([`finite`]): squarefree factorisation (with p-th roots), distinct-degree
//!   factorisation and Cantor and Zassenhaus's equal-degree splitting (1981);
//! - over Q ([`rational`]): Yun's squarefree factorisation, then Zassenhaus's method
//!   (1969): factor modulo a prime, Hensel-lift the factors ([`hensel`]) beyond the Mignotte
//!   bound, and recombine them by trial division in Z[x] ([`integer`]); the rational
//!   roots of a polynomial are the roots of its linear factors ([`rational::rational_roots`]).
//!
//! [`factor`] dispatches on the field. Every factor returned is monic (over Q: monic, with
//! rational coefficients; [`integer::primitive`] gives the integer form), sorted by degree
//! then coefficients, with its multiplicity.

pub mod finite;
pub mod hensel;
pub mod integer;
pub mod rational;

use crate::error::Result;
use crate::scalar::{Field, FieldSpec, PrimeField, Q, Rationals, q_to_string};
use num_traits::{One, Signed, Zero};

/// Remove zero leading coefficients.
pub fn trim<F: Field>(f: &F, a: &mut Vec<F::Elem>) {
    while a.last().is_some_and(|c| f.is_zero(c)) {
        a.pop();
    }
}

/// `a` trimmed (a new vector).
pub fn trimmed<F: Field>(f: &F, a: &[F::Elem]) -> Vec<F::Elem> {
    let mut v = a.to_vec();
    trim(f, &mut v);
    v
}

/// The degree, `None` for the zero polynomial (of a trimmed polynomial).
pub fn degree<E>(a: &[E]) -> Option<usize> {
    a.len().checked_sub(1)
}

/// The constant polynomial 1.
pub fn one<F: Field>(f: &F) -> Vec<F::Elem> {
    vec![f.one()]
}

/// The polynomial `x`.
pub fn x<F: Field>(f: &F) -> Vec<F::Elem> {
    vec![f.zero(), f.one()]
}

/// `a + b`.
pub fn add<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    let mut out: Vec<F::Elem> = (0..a.len().max(b.len()))
        .map(|i| match (a.get(i), b.get(i)) {
            (Some(x), Some(y)) => f.add(x, y),
            (Some(x), None) => x.clone(),
            (None, Some(y)) => y.clone(),
            (None, None) => f.zero(),
        })
        .collect();
    trim(f, &mut out);
    out
}

/// `a - b`.
pub fn sub<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    let nb: Vec<F::Elem> = b.iter().map(|c| f.neg(c)).collect();
    add(f, a, &nb)
}

/// `c a` for a scalar c.
pub fn scale<F: Field>(f: &F, c: &F::Elem, a: &[F::Elem]) -> Vec<F::Elem> {
    let mut out: Vec<F::Elem> = a.iter().map(|x| f.mul(c, x)).collect();
    trim(f, &mut out);
    out
}

/// `a b`. Cost: deg a * deg b multiply-adds.
pub fn mul<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![f.zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if f.is_zero(x) {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            f.add_mul_assign(&mut out[i + j], x, y);
        }
    }
    trim(f, &mut out);
    out
}

/// Quotient and remainder of `a` by a nonzero `b`: `a = q b + r`, `deg r < deg b`.
/// Panics if b is zero (a programming error). Cost: deg b * (deg a - deg b + 1).
pub fn divrem<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> (Vec<F::Elem>, Vec<F::Elem>) {
    let db = degree(b).expect("division by the zero polynomial");
    let inv = f.inv(&b[db]).expect("a nonzero leading coefficient");
    let mut r = trimmed(f, a);
    if r.len() < b.len() {
        return (Vec::new(), r);
    }
    let mut q = vec![f.zero(); r.len() - db];
    while r.len() > db && !r.is_empty() {
        let dr = r.len() - 1;
        let c = f.mul(&r[dr], &inv);
        for (i, bi) in b.iter().enumerate() {
            f.sub_mul_assign(&mut r[dr - db + i], &c, bi);
        }
        q[dr - db] = c;
        r.pop();
        trim(f, &mut r);
    }
    trim(f, &mut q);
    (q, r)
}

/// `a mod b`.
pub fn rem<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    divrem(f, a, b).1
}

/// `a` divided by its leading coefficient (the zero polynomial stays zero).
pub fn monic<F: Field>(f: &F, a: &[F::Elem]) -> Vec<F::Elem> {
    match a.last() {
        None => Vec::new(),
        Some(l) => scale(f, &f.inv(l).expect("nonzero leading coefficient"), a),
    }
}

/// The monic greatest common divisor (0 when both are 0).
pub fn gcd<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    let (mut a, mut b) = (trimmed(f, a), trimmed(f, b));
    while !b.is_empty() {
        let r = rem(f, &a, &b);
        a = b;
        b = r;
    }
    monic(f, &a)
}

/// Three polynomials `(g, s, t)`.
pub type GcdTriple<E> = (Vec<E>, Vec<E>, Vec<E>);

/// Extended Euclid: `(g, s, t)` with `s a + t b = g = gcd(a, b)` monic.
pub fn ext_gcd<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem]) -> GcdTriple<F::Elem> {
    let (mut r0, mut r1) = (trimmed(f, a), trimmed(f, b));
    let (mut s0, mut s1) = (one(f), Vec::new());
    let (mut t0, mut t1) = (Vec::new(), one(f));
    while !r1.is_empty() {
        let (q, r) = divrem(f, &r0, &r1);
        r0 = std::mem::replace(&mut r1, r);
        let s = sub(f, &s0, &mul(f, &q, &s1));
        s0 = std::mem::replace(&mut s1, s);
        let t = sub(f, &t0, &mul(f, &q, &t1));
        t0 = std::mem::replace(&mut t1, t);
    }
    match r0.last() {
        None => (r0, s0, t0),
        Some(l) => {
            let inv = f.inv(l).expect("nonzero");
            (
                scale(f, &inv, &r0),
                scale(f, &inv, &s0),
                scale(f, &inv, &t0),
            )
        }
    }
}

/// The derivative.
pub fn derivative<F: Field>(f: &F, a: &[F::Elem]) -> Vec<F::Elem> {
    let mut out: Vec<F::Elem> = a
        .iter()
        .enumerate()
        .skip(1)
        .map(|(i, c)| f.mul(&f.from_i64(i as i64), c))
        .collect();
    trim(f, &mut out);
    out
}

/// `a b mod m`.
pub fn mulmod<F: Field>(f: &F, a: &[F::Elem], b: &[F::Elem], m: &[F::Elem]) -> Vec<F::Elem> {
    rem(f, &mul(f, a, b), m)
}

/// `a^e mod m` for an exponent given by its binary digits, most significant first.
/// Cost: one squaring and at most one product modulo m per digit.
pub fn powmod_bits<F: Field>(
    f: &F,
    a: &[F::Elem],
    bits: impl Iterator<Item = bool>,
    m: &[F::Elem],
) -> Vec<F::Elem> {
    let base = rem(f, a, m);
    let mut r = rem(f, &one(f), m);
    for bit in bits {
        r = mulmod(f, &r, &r, m);
        if bit {
            r = mulmod(f, &r, &base, m);
        }
    }
    r
}

/// `a^e mod m`.
pub fn powmod<F: Field>(f: &F, a: &[F::Elem], e: u64, m: &[F::Elem]) -> Vec<F::Elem> {
    let bits = (0..64 - e.leading_zeros())
        .rev()
        .map(move |i| (e >> i) & 1 == 1);
    powmod_bits(f, a, bits, m)
}

/// `a(x)` evaluated at a field element (Horner).
pub fn eval<F: Field>(f: &F, a: &[F::Elem], x: &F::Elem) -> F::Elem {
    a.iter()
        .rev()
        .fold(f.zero(), |acc, c| f.add(&f.mul(&acc, x), c))
}

/// A polynomial with rational coefficients as text in the variable `var`, highest degree
/// first: `x^3 - 1/2 x + 2`, `0` for the zero polynomial.
pub fn to_text(a: &[Q], var: &str) -> String {
    let mut s = String::new();
    for (i, c) in a.iter().enumerate().rev() {
        if c.is_zero() {
            continue;
        }
        let neg = c.is_negative();
        let abs = c.abs();
        if s.is_empty() {
            if neg {
                s.push('-');
            }
        } else {
            s.push_str(if neg { " - " } else { " + " });
        }
        let mono = match i {
            0 => String::new(),
            1 => var.to_string(),
            _ => format!("{var}^{i}"),
        };
        if mono.is_empty() || !abs.is_one() {
            s.push_str(&q_to_string(&abs));
            if !mono.is_empty() {
                s.push(' ');
            }
        }
        s.push_str(&mono);
    }
    if s.is_empty() { "0".into() } else { s }
}

/// A factorisation: the leading coefficient and the monic irreducible factors with their
/// multiplicities, sorted by degree, then coefficients.
#[derive(Clone, Debug, PartialEq)]
pub struct Factorisation {
    pub unit: Q,
    pub factors: Vec<(Vec<Q>, usize)>,
}

impl Factorisation {
    /// Number of irreducible factors counted with multiplicity.
    pub fn count(&self) -> usize {
        self.factors.iter().map(|f| f.1).sum()
    }

    /// True when the polynomial is irreducible (one factor of multiplicity 1).
    pub fn is_irreducible(&self) -> bool {
        self.factors.len() == 1 && self.factors[0].1 == 1
    }
}

/// Factor a nonzero polynomial with coefficients in the field `field` (over GF(p) given by
/// representatives). Errors: the zero polynomial; over Q a recombination above the work
/// limit of [`rational::factor_rational`].
pub fn factor(field: FieldSpec, a: &[Q]) -> Result<Factorisation> {
    match field {
        FieldSpec::Rational => rational::factor_rational(a),
        FieldSpec::Prime(p) => {
            let fp = PrimeField::new(p).expect("a prime field");
            let v: Vec<u64> = a
                .iter()
                .map(|c| fp.from_rational(c).expect("a coefficient in the field"))
                .collect();
            let (lc, fs) = finite::factor_mod_p(&fp, &v)?;
            Ok(Factorisation {
                unit: Q::from_integer(lc.into()),
                factors: fs
                    .into_iter()
                    .map(|(g, m)| (g.iter().map(|c| Q::from_integer((*c).into())).collect(), m))
                    .collect(),
            })
        }
    }
}

/// Map a polynomial of the field context `f` to rationals (representatives over GF(p)).
pub fn to_rationals<F: Field>(f: &F, a: &[F::Elem]) -> Vec<Q> {
    a.iter().map(|c| f.to_rational(c)).collect()
}

/// The reverse of [`to_rationals`]; `None` when a denominator vanishes in the field.
pub fn from_rationals<F: Field>(f: &F, a: &[Q]) -> Option<Vec<F::Elem>> {
    let mut v: Vec<F::Elem> = a
        .iter()
        .map(|c| f.from_rational(c))
        .collect::<Option<_>>()?;
    trim(f, &mut v);
    Some(v)
}

/// Sort factors by degree, then by their coefficients as text (a fixed order).
pub(crate) fn sort_factors(v: &mut [(Vec<Q>, usize)]) {
    v.sort_by(|a, b| {
        a.0.len()
            .cmp(&b.0.len())
            .then_with(|| a.0.cmp(&b.0))
            .then(a.1.cmp(&b.1))
    });
}

/// The rationals, for callers that only need the field context.
pub const QQ: Rationals = Rationals;

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    fn p(v: &[i64]) -> Vec<Q> {
        v.iter().map(|&c| q(c, 1)).collect()
    }

    #[test]
    fn arithmetic_and_gcd() {
        // (x - 1)(x + 2) and (x - 1)(x - 3): gcd x - 1 (common practice)
        let a = mul(&QQ, &p(&[-1, 1]), &p(&[2, 1]));
        let b = mul(&QQ, &p(&[-1, 1]), &p(&[-3, 1]));
        assert_eq!(gcd(&QQ, &a, &b), p(&[-1, 1]));
        let (g, s, t) = ext_gcd(&QQ, &a, &b);
        assert_eq!(add(&QQ, &mul(&QQ, &s, &a), &mul(&QQ, &t, &b)), g);
        let (qq, r) = divrem(&QQ, &p(&[1, 0, 0, 1]), &p(&[1, 1]));
        assert_eq!((qq, r), (p(&[1, -1, 1]), Vec::new()));
        assert_eq!(derivative(&QQ, &p(&[5, 3, 0, 2])), p(&[3, 0, 6]));
        assert_eq!(
            to_text(&[q(2, 1), q(-1, 2), q(0, 1), q(1, 1)], "x"),
            "x^3 - 1/2 x + 2"
        );
        let f7 = PrimeField::new(7).unwrap();
        // x^7 = x mod (x^2 + 1) over GF(7)? x^2 = -1, x^7 = x (x^2)^3 = -x
        assert_eq!(powmod(&f7, &[0, 1], 7, &[1, 0, 1]), vec![0, 6]);
    }
}
