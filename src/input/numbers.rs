//! Numbers as data tools write them: integers of any size, and floating-point values,
//! read exactly.
//!
//! A float is accepted when it is exactly the number it says: its shortest decimal form
//! (the one numpy, Python and JSON writers print, or the decimal text of a JSON number or
//! a CSV cell) is exactly its binary64 value. So `3.0` is 3, `0.5` is 1/2, `1e3` is 1000
//! and `0.375` is 3/8, while `0.1` (binary value 3602879701896397/2^55) is refused with a
//! message that says so. With [`Rationalize`] such a float is replaced instead by the
//! simplest fraction (smallest denominator) within a stated tolerance, when its
//! denominator is within a stated bound; otherwise it is refused.
//!
//! Cost: linear in the digits; the simplest fraction by the continued-fraction expansion of
//! the interval's ends (at most about 1100 steps for a binary64 value).

use crate::scalar::{Q, q_to_string};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};

/// Round inexact floats to the simplest fraction `p/q` with `|x - p/q| <= tolerance` and
/// `q <= max_denominator`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Rationalize {
    pub tolerance: Q,
    pub max_denominator: BigInt,
}

impl Rationalize {
    /// Parse `TOL,MAXDEN` (`1e-9,1000`): a tolerance (a decimal, possibly with an
    /// exponent, or a fraction; at least 0) and a positive integer.
    pub fn parse(s: &str) -> Result<Rationalize, String> {
        let (tol, den) = s.split_once(',').ok_or_else(|| {
            format!("expected TOLERANCE,MAX_DENOMINATOR such as `1e-9,1000`, found `{s}`")
        })?;
        let tolerance = decimal_value(tol.trim())
            .filter(|t| !t.is_negative())
            .ok_or_else(|| {
                format!(
                    "expected a tolerance such as `1e-9` or `0.001` (at least 0), found `{}`",
                    tol.trim()
                )
            })?;
        let max_denominator = den
            .trim()
            .parse::<BigInt>()
            .ok()
            .filter(|d| d.is_positive() && d.bits() <= 4096)
            .ok_or_else(|| {
                format!(
                    "expected a positive integer bound for the denominators, found `{}`",
                    den.trim()
                )
            })?;
        Ok(Rationalize {
            tolerance,
            max_denominator,
        })
    }
}

/// The exact value of a decimal text `[-]digits[.digits][(e|E)[+-]digits]` or a
/// fraction `[-]p/q`; `None` when it is not one (or its exponent is above 1000 in size).
pub fn decimal_value(text: &str) -> Option<Q> {
    if let Some((p, q)) = text.split_once('/') {
        if p.len() > super::MAX_DIGITS + 1 || q.len() > super::MAX_DIGITS {
            return None;
        }
        let p: BigInt = p.parse().ok()?;
        let q: BigInt = q.parse().ok()?;
        if q.is_zero() || !q.is_positive() {
            return None;
        }
        return Some(Q::new(p, q));
    }
    let (neg, body) = match text.strip_prefix('-') {
        Some(r) => (true, r),
        None => (false, text.strip_prefix('+').unwrap_or(text)),
    };
    let (mant, exp) = match body.find(['e', 'E']) {
        Some(p) => (&body[..p], body[p + 1..].parse::<i64>().ok()?),
        None => (body, 0),
    };
    let (int, frac) = mant.split_once('.').unwrap_or((mant, ""));
    if int.is_empty() && frac.is_empty()
        || !int.bytes().all(|b| b.is_ascii_digit())
        || !frac.bytes().all(|b| b.is_ascii_digit())
        || exp.abs() > 1000
        || int.len() + frac.len() > super::MAX_DIGITS
    {
        return None;
    }
    let digits: BigInt = format!("{int}{frac}").parse().unwrap_or_default();
    let e = exp - frac.len() as i64;
    let ten = BigInt::from(10);
    let v = if e >= 0 {
        Q::from_integer(digits * num_traits::pow(ten, e as usize))
    } else {
        Q::new(digits, num_traits::pow(ten, (-e) as usize))
    };
    Some(if neg { -v } else { v })
}

/// The exact value of a finite binary64 number. Cost: O(1) big-integer operations.
pub fn f64_exact(x: f64) -> Q {
    let bits = x.to_bits();
    let sign = if bits >> 63 == 1 { -1 } else { 1 };
    let exp = ((bits >> 52) & 0x7ff) as i64;
    let frac = bits & ((1u64 << 52) - 1);
    let (m, e) = if exp == 0 {
        (frac, -1074)
    } else {
        (frac | 1 << 52, exp - 1075)
    };
    let m = BigInt::from(m) * sign;
    if e >= 0 {
        Q::from_integer(m << e as usize)
    } else {
        Q::new(m, BigInt::one() << (-e) as usize)
    }
}

/// Why a float is not taken as it is, with the way out.
fn inexact_message(said: &str, value: &Q, exact: &Q) -> String {
    format!(
        "the floating-point number {said} is not exactly {}: its binary value is {}; \
         give exact values (integers, fractions such as \"1/10\" in a string), or round \
         every such float to the simplest fraction within a tolerance with \
         --rationalize TOLERANCE,MAX_DENOMINATOR (e.g. --rationalize 1e-9,1000)",
        clip_q(value),
        clip_q(exact)
    )
}

/// A rational for a message: in full when short, else its first and last digits with
/// the number of digits of its numerator and denominator.
fn clip_q(v: &Q) -> String {
    let full = q_to_string(v);
    if full.len() <= 60 {
        return full;
    }
    let digits = |x: &BigInt| x.magnitude().to_string().len();
    format!(
        "{}...{} (a fraction of {} over {} digits)",
        &full[..20],
        &full[full.len() - 10..],
        digits(v.numer()),
        digits(v.denom())
    )
}

/// The value of a float read from binary data (its shortest decimal form is what it
/// says). Infinite and NaN values are refused.
pub fn float_value(x: f64, round: Option<&Rationalize>) -> Result<Q, String> {
    if !x.is_finite() {
        return Err(format!(
            "the floating-point value {x} is not a number bilin can use"
        ));
    }
    let said = format!("{x:e}");
    let exact = f64_exact(x);
    checked(&said, exact, round)
}

/// The value of a float of 32 bits (its shortest decimal form as a 32-bit float).
pub fn f32_value(x: f32, round: Option<&Rationalize>) -> Result<Q, String> {
    if !x.is_finite() {
        return Err(format!(
            "the floating-point value {x} is not a number bilin can use"
        ));
    }
    checked(&format!("{x:e}"), f64_exact(f64::from(x)), round)
}

/// The value of a decimal text from a JSON number or a CSV cell: an integer is exact at
/// any size; a decimal or exponent form is accepted when it is exactly its binary64 value.
pub fn text_value(text: &str, round: Option<&Rationalize>) -> Result<Q, String> {
    let v = text_value_unchecked(text, round)?;
    super::check_digits(&v).map_err(|_| {
        format!(
            "the number `{}` has more than {} digits (the limit of docs/formats.md)",
            clip(text),
            super::MAX_DIGITS
        )
    })?;
    Ok(v)
}

fn clip(s: &str) -> String {
    if s.chars().count() > 40 {
        format!("{}...", s.chars().take(40).collect::<String>())
    } else {
        s.to_string()
    }
}

fn text_value_unchecked(text: &str, round: Option<&Rationalize>) -> Result<Q, String> {
    let said = decimal_value(text).ok_or_else(|| {
        format!(
            "expected a number such as 3, -1/2, 0.25 or 1e3, found `{}`",
            clip(text)
        )
    })?;
    let integer = text
        .trim_start_matches(['-', '+'])
        .bytes()
        .all(|b| b.is_ascii_digit());
    if integer || text.contains('/') {
        return Ok(said);
    }
    let x: f64 = text
        .parse()
        .map_err(|_| format!("expected a number, found `{}`", clip(text)))?;
    if !x.is_finite() {
        return Err(format!(
            "the number {text} is outside the range of floating-point numbers"
        ));
    }
    let exact = f64_exact(x);
    if exact == said {
        return Ok(said);
    }
    match round {
        Some(r) => rounded(text, &said, r),
        None => Err(inexact_message(text, &said, &exact)),
    }
}

fn checked(said: &str, exact: Q, round: Option<&Rationalize>) -> Result<Q, String> {
    let shown = decimal_value(said).unwrap_or_else(|| exact.clone());
    if shown == exact {
        return Ok(exact);
    }
    let plain = q_to_decimal_text(said);
    match round {
        Some(r) => rounded(&plain, &exact, r),
        None => Err(inexact_message(&plain, &shown, &exact)),
    }
}

/// `1e-1` as `0.1` where that is short (for messages).
fn q_to_decimal_text(said: &str) -> String {
    match said.parse::<f64>() {
        Ok(x) if x != 0.0 && (x.abs() >= 1e-5 && x.abs() < 1e16) => format!("{x}"),
        _ => said.to_string(),
    }
}

fn rounded(said: &str, x: &Q, r: &Rationalize) -> Result<Q, String> {
    let s = simplest_between(&(x - &r.tolerance), &(x + &r.tolerance));
    if s.denom() <= &r.max_denominator {
        Ok(s)
    } else {
        Err(format!(
            "--rationalize: no fraction with denominator at most {} lies within {} of {said} \
             (the simplest is {})",
            r.max_denominator,
            clip_q(&r.tolerance),
            clip_q(&s)
        ))
    }
}

/// The simplest rational in `[lo, hi]` (smallest denominator, then smallest absolute
/// numerator), by continued fractions.
pub fn simplest_between(lo: &Q, hi: &Q) -> Q {
    if lo > hi {
        return simplest_between(hi, lo);
    }
    if !lo.is_positive() && !hi.is_negative() {
        return Q::zero();
    }
    if hi.is_negative() {
        return -simplest_between(&-hi, &-lo);
    }
    // 0 < lo <= hi
    let fl = lo.numer().div_floor(lo.denom());
    let flq = Q::from_integer(fl.clone());
    if flq == *lo {
        return flq;
    }
    let next = Q::from_integer(fl + 1);
    if next <= *hi {
        return next;
    }
    // lo and hi share the integer part: recurse on the reciprocals of the fractional parts
    let inner = simplest_between(&(hi - &flq).recip(), &(lo - &flq).recip());
    flq + inner.recip()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn exact_floats_and_refusals() {
        assert_eq!(float_value(3.0, None).unwrap(), q(3, 1));
        assert_eq!(float_value(0.5, None).unwrap(), q(1, 2));
        assert_eq!(float_value(-0.375, None).unwrap(), q(-3, 8));
        assert_eq!(float_value(1e3, None).unwrap(), q(1000, 1));
        let e = float_value(0.1, None).unwrap_err();
        assert!(e.contains("0.1 is not exactly 1/10"), "{e}");
        assert!(e.contains("--rationalize"), "{e}");
        assert!(float_value(f64::NAN, None).is_err());
        assert_eq!(f32_value(0.25, None).unwrap(), q(1, 4));
        assert!(f32_value(0.1, None).is_err());
        assert_eq!(text_value("3.0", None).unwrap(), q(3, 1));
        assert_eq!(text_value("1e3", None).unwrap(), q(1000, 1));
        assert_eq!(text_value("-2.5E-1", None).unwrap(), q(-1, 4));
        let big = "18446744073709551616";
        assert_eq!(text_value(big, None).unwrap().numer().to_string(), big);
        assert!(text_value("0.1", None).unwrap_err().contains("not exactly"));
        assert!(text_value("1e999", None).is_err());
        // long fractions are shortened in messages (1e-400 is 0 as a float, 5e-324 is
        // 1/2^1074)
        for e in [
            text_value("1e-400", None).unwrap_err(),
            float_value(5e-324, None).unwrap_err(),
        ] {
            assert!(e.len() < 500 && e.contains(" digits)"), "{e}");
        }
    }

    #[test]
    fn rationalize() {
        let r = Rationalize::parse("1e-9,1000").unwrap();
        assert_eq!(float_value(0.1, Some(&r)).unwrap(), q(1, 10));
        assert_eq!(float_value(1.0 / 3.0, Some(&r)).unwrap(), q(1, 3));
        assert_eq!(float_value(-2.0 / 7.0, Some(&r)).unwrap(), q(-2, 7));
        assert_eq!(text_value("0.3333333333", Some(&r)).unwrap(), q(1, 3));
        let e = float_value(std::f64::consts::PI, Some(&r)).unwrap_err();
        assert!(
            e.contains("no fraction with denominator at most 1000"),
            "{e}"
        );
        assert!(Rationalize::parse("x,3").is_err());
        assert!(Rationalize::parse("1e-9,0").is_err());
        assert!(Rationalize::parse("1e-9").is_err());
        assert_eq!(simplest_between(&q(3, 10), &q(4, 10)), q(1, 3));
        assert_eq!(simplest_between(&q(-1, 2), &q(1, 3)), q(0, 1));
        assert_eq!(simplest_between(&q(7, 2), &q(7, 2)), q(7, 2));
    }
}
