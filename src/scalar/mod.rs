//! Scalars: the exact fields bilin computes over.
//!
//! Two fields are provided behind one [`Field`] trait: the rationals Q ([`Rationals`],
//! elements [`Q`] = arbitrary-precision fractions in lowest terms) and the prime fields
//! GF(p) for word-size primes ([`PrimeField`], elements `u64` in `0..p`).
//!
//! A field is a *context* value: the operations are methods of the field, and the elements
//! are plain data. This lets the modulus of GF(p) be chosen at run time while all linear
//! algebra stays generic (`fn rank<F: Field>(f: &F, m: &Matrix<F::Elem>)`).

mod prime;
mod primes;
mod rational;

pub use prime::PrimeField;
pub use primes::{is_prime, word_primes};
pub use rational::{
    Q, Rationals, Reconstructor, common_denominator, crt, crt_combine, parse_rational, q, q_to_f64,
    q_to_string, rational_reconstruct, residue,
};

use std::fmt::Debug;

/// A field given as a context: every operation is exact.
///
/// Invariant: elements handed to a field's operations were produced by that same field
/// (for GF(p), they lie in `0..p`).
#[allow(clippy::wrong_self_convention)] // `from_*` here are conversions *into* this field
pub trait Field: Clone + Debug + Send + Sync {
    /// The element type.
    type Elem: Clone + PartialEq + Debug + Send + Sync;

    /// 0 for Q, p for GF(p).
    fn characteristic(&self) -> u64;
    /// Human-readable name: `Q` or `GF(p)`.
    fn name(&self) -> String;
    fn zero(&self) -> Self::Elem;
    fn one(&self) -> Self::Elem;
    fn is_zero(&self, a: &Self::Elem) -> bool;
    fn add(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    fn sub(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    fn mul(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    fn neg(&self, a: &Self::Elem) -> Self::Elem;
    /// Multiplicative inverse; `None` for zero.
    fn inv(&self, a: &Self::Elem) -> Option<Self::Elem>;
    /// Image of a rational number; `None` when its denominator vanishes in the field.
    fn from_rational(&self, a: &Q) -> Option<Self::Elem>;
    /// A rational representative: the element itself over Q, the integer in `0..p` over GF(p).
    fn to_rational(&self, a: &Self::Elem) -> Q;
    /// Image of a (small) integer.
    fn from_i64(&self, a: i64) -> Self::Elem;

    /// `a += b * c`, the kernel of elimination. Fields may override it for speed.
    fn add_mul_assign(&self, a: &mut Self::Elem, b: &Self::Elem, c: &Self::Elem) {
        let t = self.mul(b, c);
        *a = self.add(a, &t);
    }
    /// `a -= b * c`.
    fn sub_mul_assign(&self, a: &mut Self::Elem, b: &Self::Elem, c: &Self::Elem) {
        let t = self.mul(b, c);
        *a = self.sub(a, &t);
    }
    fn is_one(&self, a: &Self::Elem) -> bool {
        *a == self.one()
    }
    /// Text form of an element (`-1/3`, `5`).
    fn format(&self, a: &Self::Elem) -> String {
        q_to_string(&self.to_rational(a))
    }
}

/// The field a tensor is defined over, as data (what a file declares).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
pub enum FieldSpec {
    /// The rational numbers.
    Rational,
    /// The prime field GF(p); `p` is prime (checked on construction by parsers).
    Prime(u64),
}

impl FieldSpec {
    /// `Q` or `GF(p)`.
    pub fn name(&self) -> String {
        match self {
            FieldSpec::Rational => "Q".to_string(),
            FieldSpec::Prime(p) => format!("GF({p})"),
        }
    }

    /// 0 for Q, p for GF(p).
    pub fn characteristic(&self) -> u64 {
        match self {
            FieldSpec::Rational => 0,
            FieldSpec::Prime(p) => *p,
        }
    }

    /// Parse `Q` or `GF(p)` in any case (`q`, `gf(7)`; p in decimal digits, no spaces).
    /// Checks that p is a prime below 2^63.
    pub fn parse(s: &str) -> Result<FieldSpec, String> {
        let t = s;
        if t.eq_ignore_ascii_case("Q") {
            return Ok(FieldSpec::Rational);
        }
        let expected = || format!("expected a field `Q` or `GF(p)` (p a prime), found `{t}`");
        let inner = t
            .get(..3)
            .filter(|h| h.eq_ignore_ascii_case("GF("))
            .and_then(|_| t[3..].strip_suffix(')'))
            .ok_or_else(expected)?;
        if inner.is_empty() || !inner.bytes().all(|b| b.is_ascii_digit()) {
            return Err(format!(
                "expected a prime number inside GF(...), found `{inner}`"
            ));
        }
        let p: u64 = inner
            .parse()
            .map_err(|_| format!("the prime {inner} is too large: bilin supports p < 2^63"))?;
        if p >= 1 << 63 {
            return Err(format!(
                "the prime {p} is too large: bilin supports p < 2^63"
            ));
        }
        if !is_prime(p) {
            return Err(format!("{p} is not a prime, so GF({p}) is not a field"));
        }
        Ok(FieldSpec::Prime(p))
    }
}

impl std::fmt::Display for FieldSpec {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.name())
    }
}
