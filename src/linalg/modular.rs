//! Fast exact linear algebra through word-size primes.
//!
//! - [`rref_mod`]: Gauss-Jordan elimination modulo a prime p < 2^28 on `u64` words with
//!   *delayed reduction*: a row update `x += f * y` adds less than 2^56, so up to 127
//!   updates can accumulate before the words must be reduced mod p. The inner loop is a
//!   plain multiply-add the compiler vectorises.
//! - [`rank_q`] and [`nullspace_q`]: rank and nullspace of a rational matrix, through the
//!   one engine of [`super::nullspace`] (rows scaled to integers, modular elimination,
//!   lifting, exact check). A rank mod p is a lower bound for the rank over Q; a checked
//!   nullspace of dimension c - r proves the rank is at most r.

use super::{Matrix, echelon};
use crate::scalar::residue;
use crate::scalar::{Field, Q, Rationals, common_denominator, crt_combine};
use num_bigint::BigInt;
use num_traits::{One, Zero};

pub use super::kernels::KERNEL_PRIME_BITS;
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
/// Each row scaled to integers: `(l_i, l_i * row_i)` with `l_i` the lcm of the row's
/// denominators.
fn scaled_rows(m: &Matrix<Q>) -> Vec<(BigInt, Vec<BigInt>)> {
    (0..m.rows)
        .map(|i| {
            let row = m.row(i);
            // integer entries (the common case) need no gcd
            let l = common_denominator(row);
            let ints = if l.is_one() {
                row.iter().map(|x| x.numer().clone()).collect()
            } else {
                row.iter().map(|x| x.numer() * (&l / x.denom())).collect()
            };
            (l, ints)
        })
        .collect()
}

fn integer_rows(m: &Matrix<Q>) -> Vec<Vec<BigInt>> {
    scaled_rows(m).into_iter().map(|(_, r)| r).collect()
}

/// The inverse of a square matrix over the field context `f`: over Q by [`inverse_q`]
/// (exact; elimination in fractions is slow on large entries), over GF(p) by elimination.
/// `None` when singular. Cost: that of [`inverse_q`], or O(n^3) field operations.
pub fn inverse_exact<F: Field>(f: &F, m: &Matrix<F::Elem>) -> Option<Matrix<F::Elem>> {
    if f.characteristic() != 0 {
        return crate::linalg::inverse(f, m);
    }
    let q = Matrix {
        rows: m.rows,
        cols: m.cols,
        data: m.data.iter().map(|x| f.to_rational(x)).collect(),
    };
    let inv = inverse_q(&q)?;
    let data = inv
        .data
        .iter()
        .map(|x| f.from_rational(x))
        .collect::<Option<_>>()?;
    Some(Matrix {
        rows: inv.rows,
        cols: inv.cols,
        data,
    })
}

/// The inverse of a square rational matrix, exactly, or `None` when it is singular.
///
/// Method: the rows are scaled to integers (`M = D^-1 A`, D diagonal); `A^-1` is computed
/// modulo successive 28-bit primes (Gauss-Jordan on `[A | I]`), combined by the Chinese
/// remainder theorem and read back by rational reconstruction (with shared denominators),
/// and accepted only when `A X = I` holds exactly over the integers; then
/// `M^-1 = X D`. A matrix singular modulo the first prime is checked by an exact rank.
/// Cost per prime: O(n^3) word operations; the check O(n^3) big-integer operations.
pub fn inverse_q(m: &Matrix<Q>) -> Option<Matrix<Q>> {
    let n = m.rows;
    if m.cols != n {
        return None;
    }
    if n == 0 {
        return Some(m.clone());
    }
    // row scales: M[i] = A[i] / d_i
    let (scales, ints): (Vec<BigInt>, Vec<Vec<BigInt>>) = scaled_rows(m).into_iter().unzip();
    // enough primes for the Hadamard bound of the adjugate (Cramer's rule)
    let bits = ints.iter().flatten().map(|x| x.bits()).max().unwrap_or(1);
    let count = (super::nullspace::hadamard_bits(n, bits, n) as f64 / 27.0).ceil() as usize + 4;
    let primes = super::nullspace::primes_prefix(count);
    let mut residues: Vec<BigInt> = Vec::new();
    let mut modulus = BigInt::one();
    let mut previous: Option<Vec<Q>> = None;
    let mut combined = 0usize;
    for (k, &p) in primes.iter().enumerate() {
        let pb = BigInt::from(p);
        let mut aug = vec![0u64; n * 2 * n];
        for i in 0..n {
            for j in 0..n {
                let x = &ints[i][j];
                aug[i * 2 * n + j] = residue(x, p);
            }
            aug[i * 2 * n + n + i] = 1;
        }
        let piv = rref_mod(&mut aug, n, 2 * n, p, true);
        if piv.len() < n || piv[n - 1] != n - 1 {
            if k == 0 && rank_q(m) < n {
                return None;
            }
            continue;
        }
        let img: Vec<u64> = (0..n)
            .flat_map(|i| (0..n).map(move |j| (i, j)))
            .map(|(i, j)| aug[i * 2 * n + n + j])
            .collect();
        if residues.is_empty() {
            residues = img.iter().map(|&x| BigInt::from(x)).collect();
            modulus = pb;
        } else {
            crt_combine(&mut residues, &modulus, &img, p);
            modulus *= p;
        }
        combined += 1;
        // reconstruct at 1, 2, 4, 8, ... primes and at the last one
        if !combined.is_power_of_two() && k + 1 < primes.len() {
            continue;
        }
        let rec = crate::scalar::Reconstructor::new(&modulus);
        let Some(x) = rec.reconstruct_many(&residues) else {
            continue;
        };
        // two agreeing reconstructions before the exact check; at the last prime (past the
        // Hadamard bound) the check decides at once
        if previous.as_ref() != Some(&x) && k + 1 < primes.len() {
            previous = Some(x);
            continue;
        }
        // exact check: A X = I
        let den = common_denominator(x.iter());
        let xi: Vec<BigInt> = x.iter().map(|q| q.numer() * (&den / q.denom())).collect();
        let ok = (0..n).all(|i| {
            (0..n).all(|j| {
                let mut s = BigInt::zero();
                for (l, a) in ints[i].iter().enumerate() {
                    if !a.is_zero() {
                        s += a * &xi[l * n + j];
                    }
                }
                if i == j { s == den } else { s.is_zero() }
            })
        });
        if ok {
            // M^-1 = A^-1 D: column j scaled by d_j
            let data = (0..n)
                .flat_map(|i| (0..n).map(move |j| (i, j)))
                .map(|(i, j)| &x[i * n + j] * Q::from_integer(scales[j].clone()))
                .collect();
            return Some(Matrix {
                rows: n,
                cols: n,
                data,
            });
        }
    }
    echelon::inverse(&Rationals, m)
}

/// Rank over Q, proven. Fast path: rank modulo a 28-bit prime (a lower bound); when it is
/// not already maximal, the nullspace is computed and checked (see [`nullspace_q`]).
/// Cost: one modular elimination for full-rank input; otherwise that of [`nullspace_q`].
pub fn rank_q(m: &Matrix<Q>) -> usize {
    if m.rows == 0 || m.cols == 0 {
        return 0;
    }
    rank_of_rows(m, integer_rows(m))
}

/// [`rank_q`] of `m` given its rows scaled to integers.
fn rank_of_rows(m: &Matrix<Q>, ints: Vec<Vec<BigInt>>) -> usize {
    let p = kernel_primes(1)[0];
    let data: Vec<u64> = ints.iter().flatten().map(|x| residue(x, p)).collect();
    let r = rank_mod(
        Matrix {
            rows: m.rows,
            cols: m.cols,
            data,
        },
        p,
    );
    if r == m.rows.min(m.cols) {
        return r;
    }
    let sys = super::system::IntegerRows::new(m.cols, ints);
    let params = super::nullspace::SolveParams {
        max_memory: usize::MAX,
        ..Default::default()
    };
    match super::nullspace::solve_nullspace(&sys, &params) {
        Ok(sp) => m.cols - sp.dim(),
        Err(_) => echelon::rank(&Rationals, m),
    }
}

/// A skeleton of a rational matrix M of rank r: r row indices R and r column indices P
/// with `B = M[R, P]` invertible, and `left = M[:, P] B^-1`, so that `M = left M[R, :]`
/// exactly (for any r independent rows and r independent columns of a rank-r matrix, B is
/// invertible and the identity holds). R and P are read modulo a prime and accepted once
/// the rank modulo it equals the rank over Q proven by [`rank_q`].
/// Cost: two modular eliminations, [`rank_q`], [`inverse_q`] of B and `rows r^2` rational
/// products; no elimination over Q.
pub struct Skeleton {
    pub rows: Vec<usize>,
    pub cols: Vec<usize>,
    pub left: Matrix<Q>,
}

/// The product `A B` of two rational matrices by one integer product: each row of A is
/// scaled to integers by the lcm `c_i` of its denominators and each column of B by the
/// lcm `e_j` of its denominators, so entry `(i, j)` is `(A' B')[i][j] / (c_i e_j)` and only
/// the m n results are reduced (no gcd inside the sums).
/// Cost: m k n big-integer multiply-adds and m n reductions, for A m x k and B k x n.
pub fn product_q(a: &Matrix<Q>, b: &Matrix<Q>) -> Matrix<Q> {
    assert_eq!(a.cols, b.rows, "product_q: inner dimensions differ");
    let (k, n) = (b.rows, b.cols);
    let col_scale: Vec<BigInt> = (0..n)
        .map(|j| common_denominator((0..k).map(|l| &b[(l, j)])))
        .collect();
    // B' transposed, so that each sum reads two contiguous rows
    let bt: Vec<Vec<BigInt>> = (0..n)
        .map(|j| {
            (0..k)
                .map(|l| b[(l, j)].numer() * (&col_scale[j] / b[(l, j)].denom()))
                .collect()
        })
        .collect();
    let rows: Vec<Vec<Q>> = scaled_rows(a)
        .into_iter()
        .map(|(c_i, ai)| {
            let nonzero: Vec<(usize, &BigInt)> = ai
                .iter()
                .enumerate()
                .filter(|(_, v)| !v.is_zero())
                .collect();
            (0..n)
                .map(|j| {
                    let mut s = BigInt::zero();
                    for &(l, v) in &nonzero {
                        if !bt[j][l].is_zero() {
                            s += v * &bt[j][l];
                        }
                    }
                    Q::new(s, &c_i * &col_scale[j])
                })
                .collect()
        })
        .collect();
    Matrix::from_rows(rows, n)
}

/// `M[:, cols] X` for a rational X (see [`product_q`]).
fn times_inverse(m: &Matrix<Q>, cols: &[usize], x: &Matrix<Q>) -> Matrix<Q> {
    let all: Vec<usize> = (0..m.rows).collect();
    product_q(&submatrix(m, &all, cols), x)
}

/// See [`Skeleton`].
pub fn skeleton_q(m: &Matrix<Q>) -> Skeleton {
    let ints = integer_rows(m);
    let rank = if m.rows == 0 || m.cols == 0 {
        0
    } else {
        rank_of_rows(m, ints.clone())
    };
    if rank == 0 {
        return Skeleton {
            rows: Vec::new(),
            cols: Vec::new(),
            left: Matrix::from_rows(vec![Vec::new(); m.rows], 0),
        };
    }
    let t = m.transpose();
    for &p in kernel_primes(8).iter() {
        let residues: Vec<u64> = ints.iter().flatten().map(|x| residue(x, p)).collect();
        let mut data = residues.clone();
        let cols = rref_mod(&mut data, m.rows, m.cols, p, false);
        if cols.len() != rank {
            continue;
        }
        if rank == m.rows {
            // full row rank: M = I M, no inverse needed
            let left = Matrix::identity(&Rationals, rank);
            return Skeleton {
                rows: (0..rank).collect(),
                cols,
                left,
            };
        }
        // the rows of M scaled to integers are independent where those of M are, so the
        // transposed residues serve (a prime dividing a scale only lowers the rank seen)
        let mut data: Vec<u64> = (0..m.cols)
            .flat_map(|j| residues.iter().skip(j).step_by(m.cols).copied())
            .collect();
        let rows = rref_mod(&mut data, t.rows, t.cols, p, false);
        if rows.len() != rank {
            continue;
        }
        let Some(b_inv) = inverse_q(&submatrix(m, &rows, &cols)) else {
            continue;
        };
        let left = times_inverse(m, &cols, &b_inv);
        return Skeleton { rows, cols, left };
    }
    // eight unlucky primes: exact elimination over Q
    let cols = echelon::rref(&Rationals, &mut m.clone());
    let rows = echelon::rref(&Rationals, &mut t.clone());
    let b_inv = echelon::inverse(&Rationals, &submatrix(m, &rows, &cols))
        .expect("independent rows and columns");
    let left = times_inverse(m, &cols, &b_inv);
    Skeleton { rows, cols, left }
}

/// `M[rows, cols]`.
fn submatrix(m: &Matrix<Q>, rows: &[usize], cols: &[usize]) -> Matrix<Q> {
    Matrix::from_rows(
        rows.iter()
            .map(|&i| cols.iter().map(|&j| m[(i, j)].clone()).collect())
            .collect(),
        cols.len(),
    )
}

/// A basis of the right nullspace {x in Q^c : m x = 0}, in reduced form (one vector per
/// free column: 1 there, 0 at the other free columns), proven exactly over Q by the
/// engine of [`super::nullspace`] (modular elimination, lifting, exact check).
/// Cost: that of [`super::nullspace::solve_nullspace`] on the integer-scaled rows.
pub fn nullspace_q(m: &Matrix<Q>) -> Vec<Vec<Q>> {
    if m.cols == 0 {
        return Vec::new();
    }
    nullspace_ints(m.cols, integer_rows(m))
}

fn nullspace_ints(cols: usize, rows: Vec<Vec<BigInt>>) -> Vec<Vec<Q>> {
    let sys = super::system::IntegerRows::new(cols, rows);
    let params = super::nullspace::SolveParams {
        max_memory: usize::MAX,
        ..Default::default()
    };
    match super::nullspace::solve_nullspace(&sys, &params) {
        Ok(sp) => sp.dense_basis(),
        // beyond the lifting budget: exact elimination over Q
        Err(_) => {
            let m = Matrix {
                rows: sys.rows.len(),
                cols,
                data: sys
                    .rows
                    .into_iter()
                    .flatten()
                    .map(Q::from_integer)
                    .collect(),
            };
            echelon::nullspace(&Rationals, &m)
        }
    }
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
