//! Hensel lifting of a scheme over GF(2) to the 2-adic integers, and recovery of a scheme
//! over Z or Q (Kauers and Moosbauer 2022, "Flip graphs for matrix multiplication", use the
//! same lifting for their GF(2) schemes).
//!
//! The Brent equations `B(x) = sum_t u_t (x) v_t (x) w_t - T = 0` are polynomial in the
//! factor entries x. Given `x_k` with `B(x_k) = 0 mod 2^k`, write `x_{k+1} = x_k + 2^k d`;
//! then `B(x_{k+1}) = B(x_k) + 2^k J(x_0) d (mod 2^{k+1})` where J is the Jacobian, which
//! mod 2 only depends on `x_0`. So each step solves the *same* linear system
//! `J(x_0) d = -B(x_k) / 2^k (mod 2)`; J is eliminated once (with its row transform
//! recorded), each step then costs one transform-vector product. Free variables are set to
//! zero. All arithmetic is in `Z / 2^64` (wrapping u64), exact for precisions up to 2^63.
//!
//! After each step two candidates are formed: the symmetric representatives mod 2^k (small
//! integers) and, at a few precisions, entrywise rational reconstruction. A candidate is
//! screened mod 2^64 and then **verified exactly over Q** with [`crate::scheme::verify`];
//! only a verified scheme is returned.

use super::flip::BitScheme;
use crate::scalar::{FieldSpec, Q, rational_reconstruct};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};

/// Settings of a lift.
#[derive(Clone, Debug)]
pub struct HenselParams {
    /// Highest 2-adic precision (bits) to lift to; at most 63.
    pub max_bits: u32,
}

impl Default for HenselParams {
    fn default() -> Self {
        HenselParams { max_bits: 63 }
    }
}

/// The inverse of an odd number mod 2^64 (Newton iteration).
fn inv_odd(d: u64) -> u64 {
    let mut x = d;
    for _ in 0..6 {
        x = x.wrapping_mul(2u64.wrapping_sub(d.wrapping_mul(x)));
    }
    x
}

fn mod64(n: &BigInt) -> u64 {
    let m = BigInt::one() << 64u32;
    n.mod_floor(&m).to_u64().unwrap_or(0)
}

/// A rational with odd denominator as an element of Z / 2^64.
fn q_mod64(x: &Q) -> Option<u64> {
    if x.denom().is_even() {
        return None;
    }
    Some(mod64(x.numer()).wrapping_mul(inv_odd(mod64(x.denom()))))
}

/// The Brent system mod 2 at a GF(2) scheme, eliminated once.
struct Lifter {
    dims: [usize; 3],
    rank: usize,
    /// Number of unknowns r (d0 + d1 + d2), number of equations d0 d1 d2.
    n: usize,
    m: usize,
    /// Rows of the row transform P (m bits each) with P J in reduced echelon form.
    trans: Vec<Vec<u64>>,
    /// pivot column of row i for i < pivots.len()
    pivots: Vec<usize>,
    /// The tensor mod 2^64, dense (i, j, k) order.
    target: Vec<u64>,
}

fn words(bits: usize) -> usize {
    bits.div_ceil(64)
}

impl Lifter {
    fn new(s: &BitScheme, t: &Tensor) -> Option<Lifter> {
        let d = s.dims;
        let len = d[0] + d[1] + d[2];
        let n = s.rank() * len;
        let m = d[0] * d[1] * d[2];
        let mut target = vec![0u64; m];
        for (i, j, k, c) in t.entries() {
            target[(i * d[1] + j) * d[2] + k] = q_mod64(c)?;
        }
        let (wn, wm) = (words(n), words(m));
        let mut jac = vec![vec![0u64; wn]; m];
        let mut trans = vec![vec![0u64; wm]; m];
        let set = |row: &mut Vec<u64>, c: usize| row[c / 64] ^= 1 << (c % 64);
        for (ti, tr) in s.terms.iter().enumerate() {
            let base = ti * len;
            for i in 0..d[0] {
                for j in 0..d[1] {
                    for k in 0..d[2] {
                        let (ui, vj, wk) = (tr[0] >> i & 1, tr[1] >> j & 1, tr[2] >> k & 1);
                        let row = &mut jac[(i * d[1] + j) * d[2] + k];
                        if vj & wk == 1 {
                            set(row, base + i);
                        }
                        if ui & wk == 1 {
                            set(row, base + d[0] + j);
                        }
                        if ui & vj == 1 {
                            set(row, base + d[0] + d[1] + k);
                        }
                    }
                }
            }
        }
        for (e, row) in trans.iter_mut().enumerate() {
            row[e / 64] |= 1 << (e % 64);
        }
        // Gauss-Jordan over GF(2), carrying the transform
        let mut pivots = Vec::new();
        let mut r = 0;
        for c in 0..n {
            if r == m {
                break;
            }
            let (w, b) = (c / 64, 1u64 << (c % 64));
            let Some(p) = (r..m).find(|&i| jac[i][w] & b != 0) else {
                continue;
            };
            jac.swap(r, p);
            trans.swap(r, p);
            let (pj, pt) = (jac[r].clone(), trans[r].clone());
            for i in 0..m {
                if i != r && jac[i][w] & b != 0 {
                    for (x, y) in jac[i].iter_mut().zip(&pj) {
                        *x ^= y;
                    }
                    for (x, y) in trans[i].iter_mut().zip(&pt) {
                        *x ^= y;
                    }
                }
            }
            pivots.push(c);
            r += 1;
        }
        Some(Lifter {
            dims: d,
            rank: s.rank(),
            n,
            m,
            trans,
            pivots,
            target,
        })
    }

    /// `T - sum_t u_t (x) v_t (x) w_t` mod 2^64 for unknowns `x` (layout: per term u, v, w).
    fn residual(&self, x: &[u64]) -> Vec<u64> {
        let d = self.dims;
        let len = d[0] + d[1] + d[2];
        let mut out = self.target.clone();
        for t in 0..self.rank {
            let b = &x[t * len..(t + 1) * len];
            let (u, rest) = b.split_at(d[0]);
            let (v, w) = rest.split_at(d[1]);
            for (i, &ui) in u.iter().enumerate().filter(|e| *e.1 != 0) {
                for (j, &vj) in v.iter().enumerate().filter(|e| *e.1 != 0) {
                    let uv = ui.wrapping_mul(vj);
                    let row = &mut out[(i * d[1] + j) * d[2]..(i * d[1] + j + 1) * d[2]];
                    for (o, &wk) in row.iter_mut().zip(w) {
                        *o = o.wrapping_sub(uv.wrapping_mul(wk));
                    }
                }
            }
        }
        out
    }

    /// Solve `J d = e (mod 2)`; `None` if inconsistent.
    fn solve(&self, e: &[u64]) -> Option<Vec<bool>> {
        let parity = |row: &[u64]| {
            row.iter()
                .zip(e)
                .map(|(a, b)| (a & b).count_ones())
                .sum::<u32>()
                & 1
                == 1
        };
        for row in &self.trans[self.pivots.len()..] {
            if parity(row) {
                return None;
            }
        }
        let mut d = vec![false; self.n];
        for (r, &c) in self.pivots.iter().enumerate() {
            d[c] = parity(&self.trans[r]);
        }
        Some(d)
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
}

/// Lift a GF(2) scheme of the tensor reduced mod 2 to a scheme over Q of the same rank.
/// Returns a scheme verified exactly against `t` (a tensor over Q whose denominators are
/// odd), or `None` when a linear step is inconsistent or no candidate verifies.
/// Cost: one GF(2) elimination of the `d0 d1 d2 x r (d0 + d1 + d2)` Jacobian, then per step
/// O(r d0 d1 d2) word operations.
pub fn lift_scheme(s: &BitScheme, t: &Tensor, params: &HenselParams) -> Option<Scheme> {
    if t.field() != FieldSpec::Rational || s.dims != t.dims() {
        return None;
    }
    let lf = Lifter::new(s, t)?;
    let d = s.dims;
    let len = d[0] + d[1] + d[2];
    let mut x = vec![0u64; lf.n];
    for (ti, tr) in s.terms.iter().enumerate() {
        for a in 0..3 {
            let off = ti * len + [0, d[0], d[0] + d[1]][a];
            for i in 0..d[a] {
                x[off + i] = tr[a] >> i & 1;
            }
        }
    }
    let max_bits = params.max_bits.clamp(2, 63);
    let mut prec = 1u32; // x is a solution mod 2^prec
    loop {
        let res = lf.residual(&x);
        let exact64 = res.iter().all(|&v| v == 0);
        // candidate 1: symmetric representatives mod 2^prec (mod 2^64 if exact there)
        let bits = if exact64 { 64 } else { prec };
        if prec >= 2 || exact64 {
            let sym: Vec<u64> = x.iter().map(|&v| symmetric(v, bits) as u64).collect();
            if lf.residual(&sym).iter().all(|&v| v == 0) {
                let vals: Vec<Q> = sym
                    .iter()
                    .map(|&v| Q::from_integer(BigInt::from(v as i64)))
                    .collect();
                let cand = lf.to_scheme(vals);
                if verify(&cand, t).is_ok() {
                    return Some(cand);
                }
            }
        }
        // candidate 2: rational reconstruction at a few precisions
        if exact64 || (prec >= 8 && prec.is_multiple_of(8)) || prec == max_bits {
            let m = BigInt::one() << bits.min(63);
            let mut vals = Vec::with_capacity(x.len());
            let mut ok = true;
            for &v in &x {
                let a = BigInt::from(v) % &m;
                match rational_reconstruct(&a, &m) {
                    Some(r) => vals.push(r),
                    None => {
                        ok = false;
                        break;
                    }
                }
            }
            if ok {
                let screen: Option<Vec<u64>> = vals.iter().map(q_mod64).collect();
                if let Some(sc) = screen
                    && lf.residual(&sc).iter().all(|&v| v == 0)
                {
                    let cand = lf.to_scheme(vals);
                    if verify(&cand, t).is_ok() {
                        return Some(cand);
                    }
                }
            }
        }
        if exact64 || prec >= max_bits {
            return None;
        }
        let mut e = vec![0u64; words(lf.m)];
        for (i, &v) in res.iter().enumerate() {
            if v >> prec & 1 == 1 {
                e[i / 64] |= 1 << (i % 64);
            }
        }
        let dx = lf.solve(&e)?;
        for (xi, di) in x.iter_mut().zip(dx) {
            if di {
                *xi = xi.wrapping_add(1u64 << prec);
            }
        }
        prec += 1;
    }
}

/// The representative of `v mod 2^bits` in `(-2^(bits-1), 2^(bits-1)]`.
fn symmetric(v: u64, bits: u32) -> i64 {
    if bits >= 64 {
        return v as i64;
    }
    let m = 1u64 << bits;
    let r = v & (m - 1);
    if r > m / 2 {
        r as i64 - m as i64
    } else {
        r as i64
    }
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

    fn matmul2() -> Tensor {
        let mut t = Tensor::zero(
            FieldSpec::Rational,
            crate::tensor::Kind::Bilinear,
            [4, 4, 4],
            None,
        );
        for i in 0..2 {
            for l in 0..2 {
                for j in 0..2 {
                    t.set(i * 2 + l, l * 2 + j, i * 2 + j, Q::one());
                }
            }
        }
        t
    }

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
        let t = matmul2();
        let s = strassen();
        assert!(verify(&s, &t).is_ok(), "hand-written Strassen scheme");
        let b = BitScheme::from_scheme(&s).unwrap();
        assert_eq!(b.rank(), 7);
        let lifted = lift_scheme(&b, &t, &HenselParams::default()).expect("lift");
        assert_eq!(lifted.rank(), 7);
        assert!(verify(&lifted, &t).is_ok());
    }

    #[test]
    fn symmetric_representatives() {
        assert_eq!(symmetric(u64::MAX, 64), -1);
        assert_eq!(symmetric(7, 3), -1);
        assert_eq!(symmetric(3, 3), 3);
        assert_eq!(symmetric(5, 3), -3);
    }
}
