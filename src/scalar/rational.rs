//! The rational field Q: exact fractions over arbitrary-precision integers, plus the
//! helpers every exact method needs (parsing, printing, rational reconstruction).

use super::Field;
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// An exact rational number, always in lowest terms with a positive denominator.
pub type Q = BigRational;

/// Shorthand: the rational `n/d` (d != 0).
pub fn q(n: i64, d: i64) -> Q {
    Q::new(BigInt::from(n), BigInt::from(d))
}

/// `5`, `-1/3`: integers without a denominator.
pub fn q_to_string(a: &Q) -> String {
    if a.denom().is_one() {
        a.numer().to_string()
    } else {
        format!("{}/{}", a.numer(), a.denom())
    }
}

/// Parse `5`, `-7`, `1/3`, `-22/7`, `0.25`, `1e3` (decimals are exact). Errors say what was
/// expected.
pub fn parse_rational(s: &str) -> Result<Q, String> {
    let t = s.trim();
    if t.is_empty() {
        return Err("expected a number, found nothing".into());
    }
    if let Some((n, d)) = t.split_once('/') {
        let n: BigInt = parse_int(n)?;
        let d: BigInt = parse_int(d)?;
        if d.is_zero() {
            return Err(format!("division by zero in `{t}`"));
        }
        return Ok(Q::new(n, d));
    }
    if t.contains(['.', 'e', 'E']) {
        return parse_decimal(t);
    }
    Ok(Q::from_integer(parse_int(t)?))
}

fn parse_int(s: &str) -> Result<BigInt, String> {
    let t = s.trim();
    let digits = t.strip_prefix(['-', '+']).unwrap_or(t);
    if digits.is_empty() || !digits.bytes().all(|b| b.is_ascii_digit()) {
        return Err(format!("expected an integer, found `{t}`"));
    }
    t.parse::<BigInt>()
        .map_err(|_| format!("expected an integer, found `{t}`"))
}

fn parse_decimal(t: &str) -> Result<Q, String> {
    let (mant, exp) = match t.find(['e', 'E']) {
        Some(i) => (&t[..i], &t[i + 1..]),
        None => (t, "0"),
    };
    let exp: i64 = exp
        .parse()
        .map_err(|_| format!("expected a decimal exponent, found `{t}`"))?;
    if exp.abs() > 4096 {
        return Err(format!("exponent too large in `{t}` (at most 4096)"));
    }
    let neg = mant.starts_with('-');
    let m = mant.trim_start_matches(['-', '+']);
    let (ip, fp) = m.split_once('.').unwrap_or((m, ""));
    if ip.is_empty() && fp.is_empty() || !ip.bytes().chain(fp.bytes()).all(|b| b.is_ascii_digit()) {
        return Err(format!("expected a number, found `{t}`"));
    }
    let digits: BigInt = format!("{ip}{fp}0").parse::<BigInt>().unwrap_or_default() / 10;
    let scale = exp - fp.len() as i64;
    let ten = BigInt::from(10);
    let mut v = Q::from_integer(digits);
    if scale >= 0 {
        v *= Q::from_integer(num_traits::pow(ten, scale as usize));
    } else {
        v /= Q::from_integer(num_traits::pow(ten, (-scale) as usize));
    }
    Ok(if neg { -v } else { v })
}

/// The field of rational numbers.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Rationals;

impl Field for Rationals {
    type Elem = Q;
    fn characteristic(&self) -> u64 {
        0
    }
    fn name(&self) -> String {
        "Q".into()
    }
    fn zero(&self) -> Q {
        Q::zero()
    }
    fn one(&self) -> Q {
        Q::one()
    }
    fn is_zero(&self, a: &Q) -> bool {
        a.is_zero()
    }
    fn add(&self, a: &Q, b: &Q) -> Q {
        a + b
    }
    fn sub(&self, a: &Q, b: &Q) -> Q {
        a - b
    }
    fn mul(&self, a: &Q, b: &Q) -> Q {
        a * b
    }
    fn neg(&self, a: &Q) -> Q {
        -a
    }
    fn inv(&self, a: &Q) -> Option<Q> {
        if a.is_zero() { None } else { Some(a.recip()) }
    }
    fn from_rational(&self, a: &Q) -> Option<Q> {
        Some(a.clone())
    }
    fn to_rational(&self, a: &Q) -> Q {
        a.clone()
    }
    fn from_i64(&self, a: i64) -> Q {
        Q::from_integer(BigInt::from(a))
    }
    fn add_mul_assign(&self, a: &mut Q, b: &Q, c: &Q) {
        if !b.is_zero() && !c.is_zero() {
            *a += b * c;
        }
    }
    fn sub_mul_assign(&self, a: &mut Q, b: &Q, c: &Q) {
        if !b.is_zero() && !c.is_zero() {
            *a -= b * c;
        }
    }
    fn is_one(&self, a: &Q) -> bool {
        a.is_one()
    }
}

/// Rational reconstruction (Wang's algorithm, via the extended Euclidean algorithm): given
/// `a mod m`, find `n/d` with `n = a d (mod m)`, `|n|, d <= sqrt(m/2)`. Returns `None` if no
/// such fraction exists. Cost: O(log m) big-integer steps.
pub fn rational_reconstruct(a: &BigInt, m: &BigInt) -> Option<Q> {
    Reconstructor::new(m).reconstruct(a)
}

/// [`rational_reconstruct`] for many residues modulo one `m` (the bound `sqrt(m/2)` is
/// computed once).
pub struct Reconstructor {
    m: BigInt,
    bound: BigInt,
}

impl Reconstructor {
    pub fn new(m: &BigInt) -> Self {
        Reconstructor {
            m: m.clone(),
            bound: (m >> 1u32).sqrt(),
        }
    }

    /// [`Self::reconstruct`] of many residues that share denominators (as the entries of a
    /// reduced echelon form do): a running common denominator D is kept, and an entry x is
    /// first tried as `(x D mod m) / D` with the symmetric residue below the bound; only
    /// otherwise is the extended Euclidean algorithm run (on `x D`) and D enlarged.
    /// Each fraction returned is congruent to its residue modulo m. `None` if an entry
    /// has no reconstruction.
    pub fn reconstruct_many(&self, xs: &[BigInt]) -> Option<Vec<Q>> {
        let (m, bound) = (&self.m, &self.bound);
        let mut den = BigInt::one();
        let mut out = Vec::with_capacity(xs.len());
        let half = m >> 1u32;
        for x in xs {
            let mut y = (x * &den).mod_floor(m);
            if y > half {
                y -= m;
            }
            if &y.abs() <= bound {
                out.push(Q::new(y, den.clone()));
                continue;
            }
            let q = self.reconstruct(&(x * &den))?;
            let d = &den * q.denom();
            if &d > bound {
                // the running denominator is no longer unique: this entry alone
                let q = self.reconstruct(x)?;
                den = q.denom().clone();
                out.push(q);
                continue;
            }
            den = d;
            out.push(Q::new(q.numer().clone(), den.clone()));
        }
        Some(out)
    }

    /// The fraction `n/d` congruent to `a` modulo m with `|n|, d <= sqrt(m/2)`, if any.
    pub fn reconstruct(&self, a: &BigInt) -> Option<Q> {
        let (m, bound) = (&self.m, &self.bound);
        let a = a.mod_floor(m);
        if &a <= bound {
            return Some(Q::from_integer(a));
        }
        let (mut r0, mut r1) = (m.clone(), a);
        let (mut t0, mut t1) = (BigInt::zero(), BigInt::one());
        while &r1 > bound {
            let (qq, r) = r0.div_rem(&r1);
            r0 = std::mem::replace(&mut r1, r);
            let t = &t0 - &qq * &t1;
            t0 = std::mem::replace(&mut t1, t);
        }
        if t1.is_zero() || &t1.abs() > bound {
            return None;
        }
        if !r1.gcd(&t1).is_one() {
            return None;
        }
        Some(Q::new(r1, t1))
    }
}

/// `a` as f64 (nearest), for numerical methods that only *find*, never confirm.
pub fn q_to_f64(a: &Q) -> f64 {
    a.to_f64().unwrap_or(f64::NAN)
}

/// The lcm of the denominators of some rationals (1 for none); integer entries cost no
/// gcd. Cost: one lcm per entry with a denominator other than 1.
pub fn common_denominator<'a>(xs: impl IntoIterator<Item = &'a Q>) -> BigInt {
    xs.into_iter()
        .filter(|x| !x.denom().is_one())
        .fold(BigInt::one(), |acc, x| acc.lcm(x.denom()))
}

/// Chinese remaindering, in place: given `res[i] = x_i mod m` (in `0..m`) and
/// `img[i] = x_i mod p` for a prime p coprime to m, sets `res[i] = x_i mod m p` (in
/// `0..m p`). Cost: one modular inverse, then one residue ([`residue`]) and one
/// multiply-add of size `log m` per entry; large combinations run on every core.
pub fn crt_combine<T: Copy + Into<u64> + Sync>(res: &mut [BigInt], m: &BigInt, img: &[T], p: u64) {
    let m_mod_p = residue(m, p);
    let minv = BigInt::from(m_mod_p)
        .extended_gcd(&BigInt::from(p))
        .x
        .mod_floor(&BigInt::from(p))
        .to_u64()
        .expect("below p") as u128;
    let step = |a: &mut BigInt, b: u64| {
        let a_mod_p = residue(a, p);
        let t = ((b % p + p - a_mod_p) % p) as u128 * minv % p as u128;
        if t != 0 {
            *a += m * t as u64;
        }
    };
    // large combinations on every core: each entry is independent
    if res.len() * m.bits() as usize >= 1 << 20 {
        use rayon::prelude::*;
        res.par_chunks_mut(64)
            .zip(img.par_chunks(64))
            .for_each(|(rs, is)| rs.iter_mut().zip(is).for_each(|(a, &b)| step(a, b.into())));
    } else {
        res.iter_mut()
            .zip(img)
            .for_each(|(a, &b)| step(a, b.into()));
    }
}

/// `x mod p` in `0..p` for a word-size modulus `p > 0`, no allocation. Cost: O(bits of
/// x / 64): two multiplications per 64-bit limb of |x| when `p < 2^32`, one 128-bit
/// remainder per limb otherwise.
pub fn residue(x: &BigInt, p: u64) -> u64 {
    let mut r: u64 = 0;
    if p == 1 {
        return 0;
    }
    if p < 1 << 32 {
        // two Barrett reductions of 64-bit words per limb (no division): with
        // `inv = floor(2^64 / p)` the quotient estimate `(w inv) >> 64` is short by at
        // most one
        let inv = ((1u128 << 64) / p as u128) as u64;
        let reduce = |w: u64| {
            let q = ((w as u128 * inv as u128) >> 64) as u64;
            let r = w.wrapping_sub(q.wrapping_mul(p));
            if r >= p { r - p } else { r }
        };
        for d in x.magnitude().iter_u64_digits().rev() {
            r = reduce((r << 32) | (d >> 32));
            r = reduce((r << 32) | (d & 0xffff_ffff));
        }
    } else {
        for d in x.magnitude().iter_u64_digits().rev() {
            r = ((((r as u128) << 64) | d as u128) % p as u128) as u64;
        }
    }
    if x.is_negative() && r != 0 { p - r } else { r }
}

/// The integer in `0..prod(primes)` with the given residues (distinct primes).
/// Cost: O(k^2) word operations for k primes.
pub fn crt(residues: &[u64], primes: &[u64]) -> BigInt {
    let mut x = [BigInt::from(residues[0])];
    let mut m = BigInt::from(primes[0]);
    for (&r, &p) in residues.iter().zip(primes).skip(1) {
        crt_combine(&mut x, &m, &[r], p);
        m *= p;
    }
    let [x] = x;
    x
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_forms() {
        assert_eq!(parse_rational("-1/3").unwrap(), q(-1, 3));
        assert_eq!(parse_rational("0.25").unwrap(), q(1, 4));
        assert_eq!(parse_rational("2e2").unwrap(), q(200, 1));
        assert!(parse_rational("1/0").is_err());
        assert!(parse_rational("x").is_err());
        assert!(parse_rational("").is_err());
    }

    #[test]
    fn reconstructs() {
        let m = BigInt::from(1_000_000_007u64);
        // -22/7 mod m
        let inv7 = BigInt::from(7).modpow(&(&m - 2), &m);
        let a = (BigInt::from(-22) * inv7).mod_floor(&m);
        assert_eq!(rational_reconstruct(&a, &m), Some(q(-22, 7)));
    }
}

#[cfg(test)]
mod crt_tests {
    use super::*;
    use num_integer::Integer;

    #[test]
    fn residue_and_crt_agree_with_bigint_arithmetic() {
        // common practice: x mod p from BigInt division; CRT recovers x below prod(p)
        let mut xs: Vec<BigInt> = vec![(BigInt::from(3u8) << 300u32) - BigInt::from(12345u32)];
        // all-ones limbs and values just below 2^64 k stress the reduction's correction
        xs.push((BigInt::one() << 640u32) - BigInt::one());
        xs.push(BigInt::from(u64::MAX));
        let mut state = 0x9e37_79b9_7f4a_7c15u64;
        for len in 1..12u32 {
            let mut y = BigInt::zero();
            for _ in 0..len {
                state ^= state << 13;
                state ^= state >> 7;
                state ^= state << 17;
                y = (y << 64u32) + BigInt::from(state);
            }
            xs.push(y);
        }
        let moduli = [
            1u64,
            2,
            3,
            7,
            (1 << 28) - 57,
            (1 << 32) - 5,
            (1 << 32) + 15,
            (1 << 61) - 1,
        ];
        for x in &xs {
            for &p in &moduli {
                let want = x.mod_floor(&BigInt::from(p)).to_u64().unwrap();
                assert_eq!(residue(x, p), want, "{x} mod {p}");
                assert_eq!(residue(&-x.clone(), p), (p - want) % p);
            }
        }
        let primes = [268435399u64, 268435367, 268435361, 268435331];
        let y = BigInt::from(98765432123456789u64) * BigInt::from(1234567u32);
        let rs: Vec<u64> = primes.iter().map(|&p| residue(&y, p)).collect();
        assert_eq!(crt(&rs, &primes), y);
    }
}
