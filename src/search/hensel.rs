//! Hensel lifting of a scheme over GF(p) to the p-adic integers, and recovery of a scheme
//! over Z or Q (Kauers and Moosbauer 2022, "Flip graphs for matrix multiplication", lift
//! their GF(2) schemes the same way). Any prime p works: a scheme found over GF(3), GF(5),
//! GF(17), ... lifts to a rational scheme whose denominators are prime to p.
//!
//! The Brent equations `B(x) = sum_t u_t (x) v_t (x) w_t - T = 0` are polynomial in the
//! factor entries x. Given `x_k` with `B(x_k) = 0 mod p^k`, write `x_{k+1} = x_k + p^k d`;
//! then `B(x_{k+1}) = B(x_k) + p^k J(x_0) d (mod p^{k+1})` where J is the Jacobian, which
//! mod p only depends on `x_0`. So each step solves the *same* linear system
//! `J(x_0) d = -B(x_k) / p^k (mod p)`; J is eliminated once and each step replays the
//! elimination on the right-hand side (over GF(2) with bit-packed rows and the recorded row
//! transform, over GF(p) with the recorded row operations: [`super::hensel_step`]). Free
//! variables are set to zero, and the start values are the symmetric representatives in
//! `(-p/2, p/2]`, so the entries left free stay small integers; which entries are free
//! depends on the order of the pivots, taken axis by axis, seven orders in turn until a
//! candidate verifies. Arithmetic is modulo `M = p^K < 2^63`.
//!
//! After each step candidates are formed: the symmetric representatives mod p^k (small
//! integers); at a few precisions, entrywise rational reconstruction; and at the last
//! precision, the left and right factors reconstructed and the result factors solved for
//! exactly over Q (they may have large denominators, as in evaluation-interpolation
//! schemes). A candidate is screened mod M and then **verified exactly over Q** with
//! [`crate::scheme::verify`]; only a verified scheme is returned.

use super::bits::BitScheme;
use super::hensel_step::{Kernel, inv_mod, jacobian};
use super::sign_lift::{SignLiftParams, lift_signs};
use crate::scalar::{FieldSpec, Q, rational_reconstruct};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};

/// Settings of a lift.
#[derive(Clone, Debug)]
pub struct HenselParams {
    /// Highest precision to lift to, in bits of `p^k`; at most 63.
    pub max_bits: u32,
    /// Odd p: the largest elimination (equations x unknowns x min of both) attempted; a
    /// larger system is not lifted (the GF(2) elimination is bit-packed and has no cap).
    pub max_work: u64,
    /// Give up (return `None`) once this is reached, polled between pivots of the
    /// elimination, digits of the lift and candidates.
    pub halt: super::halt::Halt,
    /// p = 2 and an integer tensor: the sign lift tried first ([`super::sign_lift`]).
    pub signs: SignLiftParams,
    /// Only a scheme with integer coefficients is a result: a candidate with fractions is
    /// passed over, and the lift goes on with the next order of pivots.
    pub integral: bool,
}

impl Default for HenselParams {
    fn default() -> Self {
        HenselParams {
            max_bits: 63,
            max_work: 4_000_000_000,
            halt: super::halt::Halt::default(),
            signs: SignLiftParams::default(),
            integral: false,
        }
    }
}

/// Arithmetic modulo `M = p^K`.
#[derive(Clone, Copy, Debug)]
struct Ring {
    p: u64,
    /// digits K and the modulus p^K
    digits: u32,
    m: u64,
}

impl Ring {
    fn new(p: u64, max_bits: u32) -> Ring {
        let (mut m, mut digits) = (1u64, 0u32);
        while (m as u128) * (p as u128) < (1u128 << max_bits.clamp(2, 63)) {
            m *= p;
            digits += 1;
        }
        Ring { p, digits, m }
    }
    #[inline]
    fn mul(&self, a: u64, b: u64) -> u64 {
        ((a as u128 * b as u128) % self.m as u128) as u64
    }
    #[inline]
    fn sub(&self, a: u64, b: u64) -> u64 {
        if a >= b { a - b } else { a + (self.m - b) }
    }
    fn of_int(&self, n: &BigInt) -> u64 {
        n.mod_floor(&BigInt::from(self.m)).to_u64().unwrap_or(0)
    }
    /// A rational whose denominator is prime to p, mod M.
    fn of_q(&self, x: &Q) -> Option<u64> {
        let d = self.of_int(x.denom());
        Some(self.mul(self.of_int(x.numer()), inv_mod(d, self.m)?))
    }
    /// p^k (k <= digits).
    fn pow(&self, k: u32) -> u64 {
        (0..k).fold(1u64, |a, _| a * self.p)
    }
}

/// The representative of `v mod n` in `(-n/2, n/2]`.
fn symmetric(v: u64, n: u64) -> i64 {
    let r = v % n;
    if r > n / 2 {
        -((n - r) as i64)
    } else {
        r as i64
    }
}

/// The Brent system of a fixed shape and rank, modulo `M = p^K`.
struct Brent {
    dims: [usize; 3],
    rank: usize,
    ring: Ring,
    /// Only candidates with integer coefficients are accepted.
    integral: bool,
    /// The tensor mod M, dense (i, j, k) order.
    target: Vec<u64>,
}

impl Brent {
    /// `T - sum_t u_t (x) v_t (x) w_t` mod M for unknowns `x` (layout: per term u, v, w).
    fn residual(&self, x: &[u64]) -> Vec<u64> {
        let d = self.dims;
        let len = d[0] + d[1] + d[2];
        let ring = self.ring;
        let mut out = self.target.clone();
        for t in 0..self.rank {
            let b = &x[t * len..(t + 1) * len];
            let (u, rest) = b.split_at(d[0]);
            let (v, w) = rest.split_at(d[1]);
            for (i, &ui) in u.iter().enumerate().filter(|e| *e.1 != 0) {
                for (j, &vj) in v.iter().enumerate().filter(|e| *e.1 != 0) {
                    let uv = ring.mul(ui, vj);
                    let row = &mut out[(i * d[1] + j) * d[2]..(i * d[1] + j + 1) * d[2]];
                    for (o, &wk) in row.iter_mut().zip(w) {
                        if wk != 0 {
                            *o = ring.sub(*o, ring.mul(uv, wk));
                        }
                    }
                }
            }
        }
        out
    }

    fn to_scheme(&self, vals: Vec<Q>) -> Scheme {
        let d = self.dims;
        let len = d[0] + d[1] + d[2];
        let mut s = Scheme::empty(FieldSpec::Rational, d);
        for t in 0..self.rank {
            let b = &vals[t * len..(t + 1) * len];
            s.push(
                b[..d[0]].to_vec(),
                b[d[0]..d[0] + d[1]].to_vec(),
                b[d[0] + d[1]..].to_vec(),
            );
        }
        s
    }

    /// Entrywise rational reconstruction mod `n` (`None` if an entry has none).
    fn reconstruct(&self, x: &[u64], n: u64) -> Option<Vec<Q>> {
        let nb = BigInt::from(n);
        x.iter()
            .map(|&v| rational_reconstruct(&BigInt::from(v % n), &nb))
            .collect()
    }

    /// Exact check of candidate values: screened mod M, then verified over Q.
    fn accept(&self, vals: Vec<Q>, t: &Tensor) -> Option<Scheme> {
        let screen: Option<Vec<u64>> = vals.iter().map(|v| self.ring.of_q(v)).collect();
        if let Some(sc) = screen
            && self.residual(&sc).iter().any(|&v| v != 0)
        {
            return None;
        }
        let cand = self.to_scheme(vals);
        ((!self.integral || is_integral(&cand)) && verify(&cand, t).is_ok()).then_some(cand)
    }

    /// Left and right factors reconstructed mod `n`, result factors solved exactly.
    fn accept_solving_results(&self, x: &[u64], n: u64, t: &Tensor) -> Option<Scheme> {
        let d = self.dims;
        let len = d[0] + d[1] + d[2];
        let nb = BigInt::from(n);
        let rec = |v: &[u64]| -> Option<Vec<Q>> {
            v.iter()
                .map(|&a| rational_reconstruct(&BigInt::from(a % n), &nb))
                .collect()
        };
        let mut us = Vec::with_capacity(self.rank);
        let mut vs = Vec::with_capacity(self.rank);
        for tt in 0..self.rank {
            let b = &x[tt * len..(tt + 1) * len];
            us.push(rec(&b[..d[0]])?);
            vs.push(rec(&b[d[0]..d[0] + d[1]])?);
        }
        super::numeric::scheme_from_left_right(t, us, vs)
            .filter(|s| !self.integral || is_integral(s))
    }
}

/// Lift a scheme over GF(p) (entries in `0..p`) of the tensor reduced mod p to a scheme
/// over Q of the same rank. From GF(2) the sign lift ([`lift_signs`]: coefficients in
/// {-1, 0, 1}) is tried first, the p-adic lift below after it. Returns a scheme verified exactly against `t` (a tensor over Q
/// whose denominators are prime to p), or `None` when a linear step is inconsistent, the
/// system is beyond `params.max_work`, or no candidate verifies.
/// Cost: one elimination of the `d0 d1 d2 x r (d0 + d1 + d2)` Jacobian mod p (bit-packed
/// for p = 2), then per digit O(r d0 d1 d2) products mod p^K and one replay.
pub fn lift_scheme(s: &Scheme, t: &Tensor, params: &HenselParams) -> Option<Scheme> {
    let FieldSpec::Prime(p) = s.field else {
        return None;
    };
    if t.field() != FieldSpec::Rational || s.dims != t.dims() || p >= 1 << 31 {
        return None;
    }
    // from GF(2), a scheme with coefficients in {-1, 0, 1} first
    if p == 2
        && let Some(z) = lift_signs(s, t, &params.signs)
    {
        return Some(z);
    }
    let ring = Ring::new(p, params.max_bits);
    let d = s.dims;
    let len = d[0] + d[1] + d[2];
    let rank = s.rank();
    let n = rank * len;
    let mut target = vec![0u64; d[0] * d[1] * d[2]];
    for (i, j, k, c) in t.entries() {
        target[(i * d[1] + j) * d[2] + k] = ring.of_q(c)?;
    }
    let brent = Brent {
        dims: d,
        rank,
        ring,
        integral: params.integral,
        target,
    };
    // start values: symmetric representatives of the GF(p) entries
    let mut x0 = Vec::with_capacity(n);
    let mut x = Vec::with_capacity(n);
    for tt in 0..rank {
        for v in [&s.u[tt], &s.v[tt], &s.w[tt]] {
            for e in v {
                let r = ring_of_p(e, p)?;
                x0.push(r);
                let sy = symmetric(r, p);
                x.push(if sy < 0 {
                    ring.m - (-sy) as u64
                } else {
                    sy as u64
                });
            }
        }
    }
    // the order of the pivots decides where the lift goes (the free unknowns stay at zero).
    // Axis by axis, the factors pivoted last keep their small start values wherever the
    // system allows, and the Brent equations are linear in each axis, so the point tends
    // to stay rational (a point lifted through every axis at once is in general an
    // algebraic p-adic number with no rational reconstruction). No one order lifts every
    // scheme: the right factors, then the results, then the left lift the most; the other
    // axis orders and the column order (per term: left, right, result) follow when no
    // candidate verifies (docs/benchmarks.md, "Lifts from GF(2)")
    let axes = [0..d[0], d[0]..d[0] + d[1], d[0] + d[1]..len];
    let axis_major = |a: [usize; 3]| -> Vec<usize> {
        a.iter()
            .flat_map(|&k| {
                let r = axes[k].clone();
                (0..rank).flat_map(move |tt| r.clone().map(move |e| tt * len + e))
            })
            .collect()
    };
    let orders = [
        [1, 2, 0],
        [2, 1, 0],
        [1, 0, 2],
        [2, 0, 1],
        [0, 2, 1],
        [0, 1, 2],
    ]
    .into_iter()
    .map(axis_major)
    .chain(std::iter::once((0..n).collect::<Vec<usize>>()));
    let jac = jacobian(&x0, d, rank, p);
    for order in orders {
        let kernel = Kernel::new(jac.clone(), n, &order, p, params.max_work, &params.halt)?;
        match lift_digits(&brent, &kernel, x.clone(), t, params) {
            Digits::Lifted(s) => return Some(s),
            Digits::NoCandidate => {}
            // the first digit's system does not depend on the order: no lift at all
            Digits::NoLift => return None,
        }
    }
    None
}

/// How the digits of one lift ended.
enum Digits {
    /// A candidate verified.
    Lifted(Scheme),
    /// Every digit solved, or a later digit inconsistent, and no candidate verified.
    NoCandidate,
    /// The first digit's system `J d = e (mod p)` is inconsistent (or the lift was halted):
    /// the scheme has no lift, whatever the order of the pivots.
    NoLift,
}

/// The digits of a lift: from `x`, a solution of the Brent system mod p, Newton steps
/// `x += p^k d` with `J d = e (mod p)` solved by `kernel` (its free unknowns at zero),
/// each precision's candidates checked exactly against `t`. Cost: per digit one residual,
/// O(r d0 d1 d2) products mod p^K, and one solve.
fn lift_digits(
    brent: &Brent,
    kernel: &Kernel,
    mut x: Vec<u64>,
    t: &Tensor,
    params: &HenselParams,
) -> Digits {
    let (ring, p, n) = (brent.ring, brent.ring.p, x.len());
    let mut prec = 1u32; // x is a solution mod p^prec
    loop {
        if params.halt.reached() {
            return Digits::NoLift;
        }
        let res = brent.residual(&x);
        let exact = res.iter().all(|&v| v == 0);
        let modulus = if exact { ring.m } else { ring.pow(prec) };
        // candidate 1: symmetric representatives (small integers)
        if prec >= 2 || exact {
            let vals: Vec<Q> = x
                .iter()
                .map(|&v| Q::from_integer(BigInt::from(symmetric(v, modulus))))
                .collect();
            if let Some(s) = brent.accept(vals, t) {
                return Digits::Lifted(s);
            }
        }
        let last = exact || prec >= ring.digits;
        // candidate 2: rational reconstruction of every entry, at a few precisions
        if (last || (prec >= 4 && prec.is_multiple_of(4)))
            && let Some(vals) = brent.reconstruct(&x, modulus)
            && let Some(s) = brent.accept(vals, t)
        {
            return Digits::Lifted(s);
        }
        if last {
            // candidate 3: left and right factors reconstructed, result factors solved
            return match brent.accept_solving_results(&x, modulus, t) {
                Some(s) => Digits::Lifted(s),
                None => Digits::NoCandidate,
            };
        }
        let pk = ring.pow(prec);
        let e: Vec<u64> = res.iter().map(|&v| (v / pk) % p).collect();
        let Some(dx) = kernel.solve(&e, n) else {
            return if prec == 1 {
                Digits::NoLift
            } else {
                Digits::NoCandidate
            };
        };
        for (xi, di) in x.iter_mut().zip(dx) {
            if di != 0 {
                *xi = (*xi + ring.mul(di, pk)) % ring.m;
            }
        }
        prec += 1;
    }
}

/// An entry of a GF(p) scheme (an integer in `0..p`, or a rational reduced mod p).
fn ring_of_p(e: &Q, p: u64) -> Option<u64> {
    let pb = BigInt::from(p);
    let n = e.numer().mod_floor(&pb).to_u64()?;
    let dd = e.denom().mod_floor(&pb).to_u64()?;
    Some(n * inv_mod(dd, p)? % p)
}

/// Lift a GF(2) scheme of the tensor reduced mod 2 (see [`lift_scheme`]).
pub fn lift_bits(s: &BitScheme, t: &Tensor, params: &HenselParams) -> Option<Scheme> {
    lift_scheme(&s.to_scheme(FieldSpec::Prime(2)), t, params)
}

/// True when every entry of the scheme is an integer.
pub fn is_integral(s: &Scheme) -> bool {
    s.u.iter()
        .chain(&s.v)
        .chain(&s.w)
        .flatten()
        .all(|x| x.denom().is_one() || x.is_zero())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use crate::search::tests::{matmul, poly};

    /// Strassen's algorithm (Strassen 1969, "Gaussian elimination is not optimal"), written
    /// by hand; basis order a11 a12 a21 a22 (same for b, c).
    fn strassen() -> Scheme {
        let v = |xs: [i64; 4]| xs.iter().map(|&a| q(a, 1)).collect::<Vec<_>>();
        let mut s = Scheme::empty(FieldSpec::Rational, [4, 4, 4]);
        s.push(v([1, 0, 0, 1]), v([1, 0, 0, 1]), v([1, 0, 0, 1])); // M1
        s.push(v([0, 0, 1, 1]), v([1, 0, 0, 0]), v([0, 0, 1, -1])); // M2
        s.push(v([1, 0, 0, 0]), v([0, 1, 0, -1]), v([0, 1, 0, 1])); // M3
        s.push(v([0, 0, 0, 1]), v([-1, 0, 1, 0]), v([1, 0, 1, 0])); // M4
        s.push(v([1, 1, 0, 0]), v([0, 0, 0, 1]), v([-1, 1, 0, 0])); // M5
        s.push(v([-1, 0, 1, 0]), v([1, 1, 0, 0]), v([0, 0, 0, 1])); // M6
        s.push(v([0, 1, 0, -1]), v([0, 0, 1, 1]), v([1, 0, 0, 0])); // M7
        s
    }

    #[test]
    fn strassen_reduced_mod_2_lifts_back() {
        let t = matmul(2, 2, 2);
        let s = strassen();
        assert!(verify(&s, &t).is_ok(), "hand-written Strassen scheme");
        let b = BitScheme::from_scheme(&s).unwrap();
        assert_eq!(b.rank(), 7);
        let lifted = lift_bits(&b, &t, &HenselParams::default()).expect("lift");
        assert_eq!(lifted.rank(), 7);
        assert!(verify(&lifted, &t).is_ok());
    }

    /// The rank-77 scheme of <4,5,5> over GF(2) in the catalog (found by bilin's walks)
    /// has no lift with coefficients in {-1, 0, 1} (the sign system is inconsistent) but
    /// lifts 2-adically; with the pivots taken axis by axis its point is rational (with
    /// the pivots in column order alone, as over GF(2) before, no candidate verified); over
    /// Z it lifts to integers. The lifted schemes reduce mod 2 to the stored one.
    #[test]
    #[cfg_attr(debug_assertions, ignore)]
    fn stored_gf2_scheme_of_455_lifts_to_q() {
        let t = crate::input::load_input("matmul:4,5,5", None).unwrap();
        let stored = crate::catalog::find_stored("matmul455.gf2").expect("stored");
        let gf2 = FieldSpec::Prime(2);
        let s = crate::scheme::parse_scheme(stored.text, stored.file, &t.with_field(gf2).unwrap())
            .unwrap();
        assert_eq!(s.rank(), 77);
        assert!(crate::search::sign_lift::lift_signs(&s, &t, &Default::default()).is_none());
        let lifted = lift_scheme(&s, &t, &HenselParams::default()).expect("lift");
        assert_eq!(lifted.field, FieldSpec::Rational);
        assert!(verify(&lifted, &t).is_ok());
        assert_eq!(lifted.with_field(gf2).unwrap(), s);
        // over Z: an integer scheme, in another of the pivot orders
        let z = HenselParams {
            integral: true,
            ..HenselParams::default()
        };
        let lifted = lift_scheme(&s, &t, &z).expect("lift to Z");
        assert!(is_integral(&lifted) && verify(&lifted, &t).is_ok());
        assert_eq!(lifted.with_field(gf2).unwrap(), s);
    }

    /// Over Z: the stored integer schemes of <2,2,3>, <3,3,3>, <3,3,4> and <3,4,4> (ranks
    /// 11, 23, 29, 38: Hopcroft and Kerr 1971, Laderman 1976, Smirnov 2013), reduced mod 2,
    /// lift back to schemes with integer coefficients when only those count.
    #[test]
    #[cfg_attr(debug_assertions, ignore)]
    fn stored_integer_schemes_lift_back_to_integers() {
        let gf2 = FieldSpec::Prime(2);
        let params = HenselParams {
            integral: true,
            ..HenselParams::default()
        };
        for (spec, name, rank) in [
            ("matmul:2,2,3", "matmul223.found", 11),
            ("matmul:3,3,3", "matmul333.found", 23),
            ("matmul:3,3,4", "matmul334.found", 29),
            ("matmul:3,4,4", "matmul344.found", 38),
        ] {
            let t = crate::input::load_input(spec, None).unwrap();
            let stored = crate::catalog::find_stored(name).expect("stored");
            let s = crate::scheme::parse_scheme(stored.text, stored.file, &t).unwrap();
            assert!(is_integral(&s) && s.rank() == rank, "{name}");
            let reduced = s.with_field(gf2).unwrap();
            let lifted = lift_scheme(&reduced, &t, &params).expect(name);
            assert!(
                is_integral(&lifted) && verify(&lifted, &t).is_ok(),
                "{name}"
            );
            assert_eq!(lifted.with_field(gf2).unwrap(), reduced, "{name}");
        }
    }

    /// Scale every term of a scheme by `(a, b, 1/(a b))`: still a scheme of the tensor,
    /// now with the denominators of `1/(a b)`.
    fn scaled(s: &Scheme, a: Q, b: Q) -> Scheme {
        let mut out = Scheme::empty(s.field, s.dims);
        let c = (&a * &b).recip();
        for t in 0..s.rank() {
            out.push(
                s.u[t].iter().map(|x| x * &a).collect(),
                s.v[t].iter().map(|x| x * &b).collect(),
                s.w[t].iter().map(|x| x * &c).collect(),
            );
        }
        out
    }

    /// Planted schemes with denominators 2, 3 and 5 are recovered from their reductions
    /// mod a prime that does not divide them: Strassen's scheme scaled term by term
    /// (Strassen 1969) and the Toom-Cook scheme with evaluation points 0, 1, -1, 2 and
    /// infinity, whose interpolation has denominators 2, 3 and 6 (Toom 1963; Cook 1966).
    #[test]
    fn planted_denominators_lift_from_odd_primes() {
        let t = matmul(2, 2, 2);
        for (a, b, p) in [(2, 1, 3u64), (3, 1, 5), (5, 2, 3), (5, 3, 7)] {
            let planted = scaled(&strassen(), q(a, 1), q(b, 1));
            assert!(verify(&planted, &t).is_ok());
            let red = planted.with_field(FieldSpec::Prime(p)).unwrap();
            let lifted = lift_scheme(&red, &t, &HenselParams::default())
                .unwrap_or_else(|| panic!("lift of 1/{} mod {p}", a * b));
            assert_eq!(lifted.rank(), 7);
            assert!(verify(&lifted, &t).is_ok());
        }
        let toom = crate::catalog::stored_schemes("polymul3")[0]
            .read()
            .unwrap();
        let tp = poly(3, 3);
        for p in [5u64, 7, 11] {
            let red = toom.with_field(FieldSpec::Prime(p)).unwrap();
            let lifted = lift_scheme(&red, &tp, &HenselParams::default()).expect("Toom lift");
            assert_eq!(lifted.rank(), 5);
            assert!(verify(&lifted, &tp).is_ok());
        }
    }

    #[test]
    fn ring_arithmetic() {
        let r = Ring::new(3, 63);
        assert!(r.m > 1 << 61 && r.m.is_multiple_of(3));
        assert_eq!(r.of_q(&q(1, 2)).map(|x| r.mul(x, 2)), Some(1));
        assert_eq!(inv_mod(2, 9), Some(5));
        assert_eq!(inv_mod(3, 9), None);
        assert_eq!(symmetric(8, 9), -1);
        assert_eq!(symmetric(4, 9), 4);
        assert_eq!(symmetric(5, 9), -4);
    }
}
