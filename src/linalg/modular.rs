//! Fast exact linear algebra through word-size primes.
//!
//! - [`rref_mod`]: Gauss-Jordan elimination modulo a prime p < 2^28 on `u64` words with
//!   *delayed reduction*: a row update `x += f * y` adds less than 2^56, so up to 127
//!   updates can accumulate before the words must be reduced mod p. The inner loop is a
//!   plain multiply-add the compiler vectorises.
//! - [`rank_q`] and [`nullspace_q`]: rank and nullspace over Q. Rows are scaled to
//!   integers, reduced modulo several primes, the reduced echelon forms combined by the
//!   Chinese remainder theorem, the nullspace entries recovered by rational reconstruction,
//!   and the candidate basis is then **checked exactly over Q** (M N = 0). A rank mod p is
//!   a lower bound for the rank over Q; a checked nullspace of dimension c - r proves the
//!   rank is at most r. Only a proven answer is returned; after too many primes the method
//!   falls back to exact elimination over Q.

use super::{Matrix, echelon};
use crate::scalar::{Q, Rationals, rational_reconstruct};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};

/// Primes used by the fast kernel: below 2^28, so that 127 delayed updates fit in a u64.
pub const KERNEL_PRIME_BITS: u32 = 28;
const LAZY_STEPS: usize = 127;

/// The first `count` primes below 2^28, descending.
pub fn kernel_primes(count: usize) -> Vec<u64> {
    let mut out = Vec::with_capacity(count);
    let mut c = (1u64 << KERNEL_PRIME_BITS) - 1;
    while out.len() < count {
        if crate::scalar::is_prime(c) {
            out.push(c);
        }
        c -= 2;
    }
    out
}

fn inv_mod(a: u64, p: u64) -> u64 {
    let (mut r0, mut r1) = (p as i64, a as i64);
    let (mut t0, mut t1) = (0i64, 1i64);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    t0.rem_euclid(p as i64) as u64
}

/// Reduced row echelon form modulo a prime `p < 2^28`, in place, on a row-major
/// `rows x cols` array of residues (each `< p` on entry, each `< p` on exit).
/// Returns the pivot columns. When `full` is false only the rows below each pivot are
/// cleared (an echelon form, enough for the rank, about a third of the work).
/// Cost: O(rows cols rank) word operations.
pub fn rref_mod(data: &mut [u64], rows: usize, cols: usize, p: u64, full: bool) -> Vec<usize> {
    assert!(p < (1 << KERNEL_PRIME_BITS), "kernel prime too large");
    assert_eq!(data.len(), rows * cols);
    let mut pivots = Vec::new();
    let mut r = 0;
    let mut pending = 0usize; // updates since the last full reduction
    for c in 0..cols {
        if r == rows {
            break;
        }
        // find a pivot in column c at or below row r
        let mut found = None;
        for i in r..rows {
            let v = &mut data[i * cols + c];
            *v %= p;
            if *v != 0 {
                found = Some(i);
                break;
            }
        }
        let Some(piv) = found else { continue };
        if piv != r {
            let (a, b) = data.split_at_mut(piv * cols);
            a[r * cols..(r + 1) * cols].swap_with_slice(&mut b[..cols]);
        }
        // normalise the pivot row (fully reduced)
        let inv = inv_mod(data[r * cols + c] % p, p);
        for x in &mut data[r * cols + c..(r + 1) * cols] {
            *x = (*x % p) * inv % p;
        }
        if pending >= LAZY_STEPS {
            for x in data.iter_mut() {
                *x %= p;
            }
            pending = 0;
        }
        let (before, rest) = data.split_at_mut(r * cols);
        let (prow, after) = rest.split_at_mut(cols);
        let prow = &prow[c..];
        let update = |row: &mut [u64]| {
            let f = row[c] % p;
            if f != 0 {
                let f = p - f;
                for (x, y) in row[c..].iter_mut().zip(prow) {
                    *x += f * y;
                }
                row[c] = 0;
            }
        };
        after.chunks_exact_mut(cols).for_each(update);
        if full {
            before.chunks_exact_mut(cols).for_each(update);
        }
        pending += 1;
        pivots.push(c);
        r += 1;
    }
    for x in data.iter_mut() {
        *x %= p;
    }
    pivots
}

/// Rank modulo a prime p < 2^28 of a residue matrix (consumed). Cost: O(r c rank).
pub fn rank_mod(mut m: Matrix<u64>, p: u64) -> usize {
    rref_mod(&mut m.data, m.rows, m.cols, p, false).len()
}

/// Scale each row by the lcm of its denominators: an integer matrix with the same row space.
fn integer_rows(m: &Matrix<Q>) -> Vec<Vec<BigInt>> {
    (0..m.rows)
        .map(|i| {
            let row = m.row(i);
            let l = row.iter().fold(BigInt::one(), |acc, x| acc.lcm(x.denom()));
            row.iter().map(|x| x.numer() * (&l / x.denom())).collect()
        })
        .collect()
}

fn reduce_rows(rows: &[Vec<BigInt>], cols: usize, p: u64) -> Matrix<u64> {
    let pb = BigInt::from(p);
    let mut data = Vec::with_capacity(rows.len() * cols);
    for row in rows {
        for x in row {
            let v = match x.to_i64() {
                Some(s) => s.rem_euclid(p as i64) as u64,
                None => x.mod_floor(&pb).to_u64().unwrap_or(0),
            };
            data.push(v);
        }
    }
    Matrix {
        rows: rows.len(),
        cols,
        data,
    }
}

/// Rank over Q, proven. Fast path: rank modulo a 28-bit prime (a lower bound); when it is
/// not already maximal, the nullspace is computed and checked (see [`nullspace_q`]).
/// Cost: one modular elimination for full-rank input; otherwise that of [`nullspace_q`].
pub fn rank_q(m: &Matrix<Q>) -> usize {
    if m.rows == 0 || m.cols == 0 {
        return 0;
    }
    let ints = integer_rows(m);
    let p = kernel_primes(1)[0];
    let r = rank_mod(reduce_rows(&ints, m.cols, p), p);
    if r == m.rows.min(m.cols) {
        return r;
    }
    m.cols - nullspace_q(m).len()
}

/// A basis of the right nullspace {x in Q^c : m x = 0}, in reduced form (one vector per
/// free column: 1 there, 0 at the other free columns), proven exactly over Q.
///
/// Method: reduced echelon forms modulo successive 28-bit primes (in parallel batches;
/// keeping those with the largest rank and the first pivot pattern), Chinese remaindering,
/// rational reconstruction, and an exact check m N = 0 over the integers. Reconstruction is
/// tried after 1, 2, 4, ... primes and is guaranteed to succeed once the modulus exceeds
/// twice the square of the Hadamard bound of the matrix; after twice that many primes the
/// method falls back to elimination over Q. Cost per prime: O(r c rank) word operations,
/// plus the final check O(r c (c - rank)) big-integer operations.
pub fn nullspace_q(m: &Matrix<Q>) -> Vec<Vec<Q>> {
    use rayon::prelude::*;
    if m.cols == 0 {
        return Vec::new();
    }
    if m.rows == 0 {
        return echelon::nullspace(&Rationals, m);
    }
    let ints = integer_rows(m);
    let needed = primes_needed(&ints, m.rows.min(m.cols));
    let batch = rayon::current_num_threads().max(1);
    let primes = kernel_primes(2 * needed + batch + 2);
    let mut best: Option<Vec<usize>> = None;
    let mut residues: Vec<BigInt> = Vec::new(); // CRT image of the entries rref[r][free]
    let mut modulus = BigInt::one();
    let mut used = 0usize; // primes combined into `residues`
    let mut next_try = 1usize;
    for chunk in primes.chunks(batch) {
        let images: Vec<(u64, Vec<usize>, Vec<u64>)> = chunk
            .par_iter()
            .map(|&p| {
                let mut red = reduce_rows(&ints, m.cols, p);
                let pivots = rref_mod(&mut red.data, red.rows, red.cols, p, true);
                let free = free_columns(m.cols, &pivots);
                let img: Vec<u64> = (0..pivots.len())
                    .flat_map(|r| free.iter().map(move |&f| (r, f)))
                    .map(|(r, f)| red.data[r * red.cols + f])
                    .collect();
                (p, pivots, img)
            })
            .collect();
        for (p, pivots, img) in images {
            let better = match &best {
                None => true,
                Some(b) => pivots.len() > b.len() || (pivots.len() == b.len() && pivots < *b),
            };
            if better {
                best = Some(pivots);
                residues = img.iter().map(|&x| BigInt::from(x)).collect();
                modulus = BigInt::from(p);
                used = 1;
                next_try = 1;
            } else if best.as_ref() == Some(&pivots) {
                crt_combine(&mut residues, &modulus, &img, p);
                modulus *= p;
                used += 1;
            }
        }
        if used >= next_try || used >= needed {
            next_try = 2 * used;
            let pivots = best.as_ref().expect("at least one prime");
            let free = free_columns(m.cols, pivots);
            if let Some(basis) = reconstruct_nullspace(&residues, &modulus, pivots, &free, m.cols)
                && check_nullspace(&ints, &basis)
            {
                return basis;
            }
        }
    }
    echelon::nullspace(&Rationals, m)
}

/// Number of 28-bit primes whose product exceeds 2 H^2, with H the Hadamard bound of the
/// largest square minor (product of the `r` largest row norms): enough for rational
/// reconstruction of every entry of the reduced echelon form.
fn primes_needed(rows: &[Vec<BigInt>], r: usize) -> usize {
    let mut logs: Vec<f64> = rows
        .iter()
        .map(|row| {
            let s: f64 = row
                .iter()
                .map(|x| x.to_f64().unwrap_or(f64::MAX).powi(2))
                .sum();
            0.5 * s.max(1.0).log2()
        })
        .collect();
    logs.sort_by(|a, b| b.total_cmp(a));
    let log_h: f64 = logs.iter().take(r).sum();
    ((2.0 * log_h + 2.0) / (KERNEL_PRIME_BITS as f64 - 1.0)).ceil() as usize + 1
}

fn free_columns(cols: usize, pivots: &[usize]) -> Vec<usize> {
    let mut is_pivot = vec![false; cols];
    for &c in pivots {
        is_pivot[c] = true;
    }
    (0..cols).filter(|&c| !is_pivot[c]).collect()
}

/// x = a (mod m) and x = b (mod p) -> x mod (m p), entry by entry.
fn crt_combine(res: &mut [BigInt], m: &BigInt, img: &[u64], p: u64) {
    let m_mod_p = (m % p).to_u64().unwrap_or(0);
    let minv = inv_mod(m_mod_p, p);
    for (a, &b) in res.iter_mut().zip(img) {
        let a_mod_p = (&*a % p).to_u64().unwrap_or(0);
        let t = ((b + p - a_mod_p) % p) * minv % p;
        *a += m * t;
    }
}

fn reconstruct_nullspace(
    res: &[BigInt],
    modulus: &BigInt,
    pivots: &[usize],
    free: &[usize],
    cols: usize,
) -> Option<Vec<Vec<Q>>> {
    let nf = free.len();
    let mut basis: Vec<Vec<Q>> = free
        .iter()
        .map(|&f| {
            let mut v = vec![Q::zero(); cols];
            v[f] = Q::one();
            v
        })
        .collect();
    for (r, &pc) in pivots.iter().enumerate() {
        for (k, v) in basis.iter_mut().enumerate() {
            let x = &res[r * nf + k];
            if x.is_zero() {
                continue;
            }
            v[pc] = -rational_reconstruct(x, modulus)?;
        }
    }
    Some(basis)
}

/// Exact check that every basis vector lies in the nullspace of the integer rows.
fn check_nullspace(rows: &[Vec<BigInt>], basis: &[Vec<Q>]) -> bool {
    use rayon::prelude::*;
    basis.par_iter().all(|v| {
        let l = v.iter().fold(BigInt::one(), |acc, x| acc.lcm(x.denom()));
        let iv: Vec<(usize, BigInt)> = v
            .iter()
            .enumerate()
            .filter(|(_, x)| !x.is_zero())
            .map(|(j, x)| (j, x.numer() * (&l / x.denom())))
            .collect();
        rows.iter().all(|row| {
            let mut s = BigInt::zero();
            for (j, x) in &iv {
                if !row[*j].is_zero() {
                    s += &row[*j] * x;
                }
            }
            s.is_zero()
        })
    })
}

/// Rank and nullspace of a matrix with small integer entries given as i64, over Q.
/// Convenience for callers that build integer systems.
pub fn rank_q_i64(rows: usize, cols: usize, data: &[i64]) -> usize {
    let m = Matrix {
        rows,
        cols,
        data: data.iter().map(|&x| Q::from_integer(x.into())).collect(),
    };
    rank_q(&m)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn rank_and_nullspace_agree_with_generic() {
        let rows: Vec<Vec<Q>> = vec![
            vec![q(1, 2), q(2, 1), q(3, 1), q(4, 1)],
            vec![q(2, 1), q(4, 1), q(6, 1), q(8, 1)],
            vec![q(1, 3), q(-1, 1), q(0, 1), q(5, 7)],
        ];
        let m = Matrix::from_rows(rows, 4);
        assert_eq!(rank_q(&m), echelon::rank(&Rationals, &m));
        let ns = nullspace_q(&m);
        assert_eq!(ns, echelon::nullspace(&Rationals, &m));
    }

    #[test]
    fn kernel_rank_mod() {
        let p = kernel_primes(1)[0];
        let m = Matrix {
            rows: 3,
            cols: 3,
            data: vec![1, 2, 3, 4, 5, 6, 7, 8, 9],
        };
        assert_eq!(rank_mod(m, p), 2);
    }
}
