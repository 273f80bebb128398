//! Word-size vector kernels modulo a prime: the inner loops of every modular computation
//! (law evaluation, elimination, exact checks by the Chinese remainder theorem).
//!
//! Residues modulo a *kernel prime* p < 2^28 are stored as `u32`. Sums of products are
//! accumulated in `u64` **lazily**: a reduced accumulator (< p) plus at most
//! [`LAZY_ADDS`] products of two residues stays below 2^64, since
//! `255 (2^28 - 1)^2 + 2^28 < 2^64`. Callers count the products they add and call
//! [`reduce`] before the budget is exceeded.
//!
//! The loops multiply two zero-extended 32-bit words into 64 bits, which the compiler maps
//! to the packed unsigned 32x32 -> 64-bit multiply of the vector units. The kernels are
//! compiled three times (plain, AVX2, AVX-512) and the best one the processor supports is
//! chosen once at run time; all three compute the same exact results.

use std::sync::OnceLock;

/// Kernel primes are below `2^KERNEL_PRIME_BITS`.
pub const KERNEL_PRIME_BITS: u32 = 28;

/// Products of two residues that may be added to a reduced accumulator before it must be
/// reduced again.
pub const LAZY_ADDS: usize = 255;

/// Columns handled per register block of [`vec_mat_acc`].
const BLOCK: usize = 64;

#[inline(always)]
fn block_acc<const B: usize>(
    acc: &mut [u64],
    coefs: &[u32],
    mat: &[u32],
    cols: usize,
    start: usize,
) {
    let mut a = [0u64; B];
    a.copy_from_slice(&acc[start..start + B]);
    for (r, &c) in coefs.iter().enumerate() {
        if c == 0 {
            continue;
        }
        let row: &[u32; B] = mat[r * cols + start..r * cols + start + B]
            .try_into()
            .expect("block");
        for (x, &y) in a.iter_mut().zip(row) {
            *x += c as u64 * y as u64;
        }
    }
    acc[start..start + B].copy_from_slice(&a);
}

#[inline(always)]
fn vec_mat_acc_body(acc: &mut [u64], coefs: &[u32], mat: &[u32], cols: usize) {
    debug_assert!(coefs.len() <= LAZY_ADDS);
    debug_assert_eq!(mat.len(), coefs.len() * cols);
    debug_assert!(acc.len() >= cols);
    let mut start = 0;
    while start + BLOCK <= cols {
        block_acc::<BLOCK>(acc, coefs, mat, cols, start);
        start += BLOCK;
    }
    while start + 16 <= cols {
        block_acc::<16>(acc, coefs, mat, cols, start);
        start += 16;
    }
    if start < cols {
        let a = &mut acc[start..cols];
        for (r, &c) in coefs.iter().enumerate() {
            if c == 0 {
                continue;
            }
            let row = &mat[r * cols + start..r * cols + cols];
            for (x, &y) in a.iter_mut().zip(row) {
                *x += c as u64 * y as u64;
            }
        }
    }
}

#[inline(always)]
fn dot_body(a: &[u32], b: &[u32]) -> u64 {
    debug_assert!(a.len() <= LAZY_ADDS + 1);
    let mut lanes = [0u64; 16];
    let mut ca = a.chunks_exact(16);
    let mut cb = b.chunks_exact(16);
    for (x, y) in (&mut ca).zip(&mut cb) {
        for i in 0..16 {
            lanes[i] += x[i] as u64 * y[i] as u64;
        }
    }
    let mut s: u64 = lanes.iter().sum();
    for (x, y) in ca.remainder().iter().zip(cb.remainder()) {
        s += *x as u64 * *y as u64;
    }
    s
}

type VecMatFn = unsafe fn(&mut [u64], &[u32], &[u32], usize);
type DotFn = unsafe fn(&[u32], &[u32]) -> u64;

macro_rules! versions {
    ($vm:ident, $dot:ident, $feat:literal) => {
        #[cfg(target_arch = "x86_64")]
        #[target_feature(enable = $feat)]
        unsafe fn $vm(acc: &mut [u64], coefs: &[u32], mat: &[u32], cols: usize) {
            vec_mat_acc_body(acc, coefs, mat, cols)
        }
        #[cfg(target_arch = "x86_64")]
        #[target_feature(enable = $feat)]
        unsafe fn $dot(a: &[u32], b: &[u32]) -> u64 {
            dot_body(a, b)
        }
    };
}

versions!(vec_mat_avx2, dot_avx2, "avx2");
versions!(vec_mat_avx512, dot_avx512, "avx512f");

unsafe fn vec_mat_plain(acc: &mut [u64], coefs: &[u32], mat: &[u32], cols: usize) {
    vec_mat_acc_body(acc, coefs, mat, cols)
}

unsafe fn dot_plain(a: &[u32], b: &[u32]) -> u64 {
    dot_body(a, b)
}

struct Kernels {
    vec_mat: VecMatFn,
    dot: DotFn,
    name: &'static str,
}

fn kernels() -> &'static Kernels {
    static K: OnceLock<Kernels> = OnceLock::new();
    K.get_or_init(|| {
        #[cfg(target_arch = "x86_64")]
        {
            if std::is_x86_feature_detected!("avx512f") {
                return Kernels {
                    vec_mat: vec_mat_avx512,
                    dot: dot_avx512,
                    name: "avx512",
                };
            }
            if std::is_x86_feature_detected!("avx2") {
                return Kernels {
                    vec_mat: vec_mat_avx2,
                    dot: dot_avx2,
                    name: "avx2",
                };
            }
        }
        Kernels {
            vec_mat: vec_mat_plain,
            dot: dot_plain,
            name: "plain",
        }
    })
}

/// The instruction set the kernels run with (`avx512`, `avx2` or `plain`).
pub fn kernel_name() -> &'static str {
    kernels().name
}

/// `acc[0..cols] += sum_r coefs[r] * mat[r * cols .. (r + 1) * cols]`, unreduced.
///
/// Requires `coefs.len() <= LAZY_ADDS`, every word below 2^28 and `acc` reduced (or with
/// room for `coefs.len()` more products). Cost: `coefs.len() * cols` multiply-adds.
#[inline]
pub fn vec_mat_acc(acc: &mut [u64], coefs: &[u32], mat: &[u32], cols: usize) {
    assert!(coefs.len() <= LAZY_ADDS && mat.len() == coefs.len() * cols && acc.len() >= cols);
    // SAFETY: the function was chosen for a processor feature detected at run time, and
    // the slice bounds were checked above.
    unsafe { (kernels().vec_mat)(acc, coefs, mat, cols) }
}

/// `acc += c * x` element-wise, unreduced (one product per entry).
#[inline]
pub fn axpy(acc: &mut [u64], c: u32, x: &[u32]) {
    vec_mat_acc(acc, &[c], x, x.len())
}

/// `sum_i a[i] b[i]`, unreduced; requires `a.len() == b.len() <= LAZY_ADDS + 1` and words
/// below 2^28. Cost: `a.len()` multiply-adds.
#[inline]
pub fn dot_acc(a: &[u32], b: &[u32]) -> u64 {
    assert!(a.len() == b.len() && a.len() <= LAZY_ADDS + 1);
    // SAFETY: as in `vec_mat_acc`.
    unsafe { (kernels().dot)(a, b) }
}

/// `sum_i a[i] b[i] mod p` for any length (reduced every [`LAZY_ADDS`] terms).
pub fn dot_mod(a: &[u32], b: &[u32], p: u64) -> u64 {
    assert_eq!(a.len(), b.len());
    let mut s = 0u64;
    for (x, y) in a.chunks(LAZY_ADDS).zip(b.chunks(LAZY_ADDS)) {
        s = (s + dot_acc(x, y)) % p;
    }
    s
}

/// Reduction modulo a fixed p by multiplication (Barrett): `inv = floor(2^64 / p)` gives a
/// quotient estimate at most 1 too small, so one correction makes any `u64` exact.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Modulus {
    pub p: u64,
    inv: u64,
}

impl Modulus {
    /// The modulus p (2 <= p < 2^63).
    pub fn new(p: u64) -> Self {
        debug_assert!(p >= 2);
        Modulus {
            p,
            inv: ((1u128 << 64) / p as u128) as u64,
        }
    }

    /// `x mod p` for any `x`.
    #[inline(always)]
    pub fn reduce(&self, x: u64) -> u64 {
        let q = ((x as u128 * self.inv as u128) >> 64) as u64;
        let r = x.wrapping_sub(q.wrapping_mul(self.p));
        if r >= self.p { r - self.p } else { r }
    }

    /// `a b mod p` for residues below 2^32.
    #[inline(always)]
    pub fn mul(&self, a: u32, b: u32) -> u32 {
        match a {
            0 => 0,
            1 => b,
            _ => self.reduce(a as u64 * b as u64) as u32,
        }
    }
}

/// Reduce every accumulator modulo p.
#[inline]
pub fn reduce(acc: &mut [u64], p: u64) {
    let m = Modulus::new(p);
    for x in acc.iter_mut() {
        *x = m.reduce(*x);
    }
}

/// Lazy accumulation of `u64` sums of residue products: counts the products added and
/// reduces before the budget of [`LAZY_ADDS`] is exceeded.
#[derive(Clone, Debug)]
pub struct LazyAcc {
    pub values: Vec<u64>,
    pending: usize,
    p: u64,
}

impl LazyAcc {
    /// `len` zero accumulators modulo p (p < 2^28).
    pub fn new(len: usize, p: u64) -> Self {
        debug_assert!(p < 1 << KERNEL_PRIME_BITS);
        LazyAcc {
            values: vec![0; len],
            pending: 0,
            p,
        }
    }

    /// Set every accumulator to zero.
    pub fn clear(&mut self) {
        self.values.iter_mut().for_each(|x| *x = 0);
        self.pending = 0;
    }

    /// Make room for `k` more products per entry.
    #[inline]
    pub fn room(&mut self, k: usize) {
        if self.pending + k > LAZY_ADDS {
            reduce(&mut self.values, self.p);
            self.pending = 0;
        }
        self.pending += k;
    }

    /// `self += c * x`.
    #[inline]
    pub fn axpy(&mut self, c: u32, x: &[u32]) {
        self.room(1);
        axpy(&mut self.values, c, x);
    }

    /// `self += sum_r coefs[r] * mat[r]` (rows of `values.len()` words), any number of rows.
    pub fn vec_mat(&mut self, coefs: &[u32], mat: &[u32]) {
        let cols = self.values.len();
        for (cs, block) in coefs.chunks(LAZY_ADDS).zip(mat.chunks(LAZY_ADDS * cols)) {
            self.room(cs.len());
            vec_mat_acc(&mut self.values, cs, block, cols);
        }
    }

    /// `self[k] += c * v` for a single entry (sparse scatter).
    #[inline]
    pub fn add_at(&mut self, k: usize, c: u32, v: u32) {
        self.values[k] += c as u64 * v as u64;
    }

    /// The reduced values.
    pub fn finish(&mut self) -> &[u64] {
        reduce(&mut self.values, self.p);
        self.pending = 0;
        &self.values
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::{Rng, SeedableRng};

    #[test]
    fn kernels_agree_with_scalar_arithmetic() {
        let p = 268_435_399u64; // a prime below 2^28
        let m = Modulus::new(p);
        for x in [0u64, 1, p - 1, p, p + 1, u64::MAX, u64::MAX - 7, 1 << 63] {
            assert_eq!(m.reduce(x), x % p);
        }
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(11);
        for cols in [1usize, 5, 63, 64, 65, 130, 200] {
            let rows = 255;
            let coefs: Vec<u32> = (0..rows).map(|_| rng.gen_range(0..p as u32)).collect();
            let mat: Vec<u32> = (0..rows * cols)
                .map(|_| rng.gen_range(0..p as u32))
                .collect();
            let mut acc: Vec<u64> = (0..cols).map(|_| rng.gen_range(0..p)).collect();
            let mut want: Vec<u128> = acc.iter().map(|&x| x as u128).collect();
            for r in 0..rows {
                for c in 0..cols {
                    want[c] += coefs[r] as u128 * mat[r * cols + c] as u128;
                }
            }
            vec_mat_acc(&mut acc, &coefs, &mat, cols);
            for c in 0..cols {
                assert_eq!(acc[c] as u128, want[c], "no overflow at the lazy budget");
            }
            let col0: Vec<u32> = (0..rows).map(|r| mat[r * cols]).collect();
            let d = dot_mod(&coefs, &col0, p);
            let w: u128 = coefs
                .iter()
                .zip(&col0)
                .map(|(&a, &b)| a as u128 * b as u128)
                .sum();
            assert_eq!(d as u128, w % p as u128);
        }
        assert!(["avx512", "avx2", "plain"].contains(&kernel_name()));
    }
}
