//! The linear system of one Hensel step: the Jacobian `J` of the Brent equations at a
//! scheme over GF(p) ([`jacobian`]), eliminated once ([`Kernel`]), so that each digit of a
//! lift solves `J d = e (mod p)` by replaying the elimination on its right-hand side.
//!
//! Invariant: a solution returned by [`Kernel::solve`] satisfies `J d = e (mod p)` with
//! every free unknown (non-pivot column) at zero; which unknowns are pivots is decided by
//! the column order given to [`Kernel::new`].

use super::bits::{words, xor_words};
use super::halt::Halt;

/// The inverse of a mod m (`None` unless coprime).
pub(crate) fn inv_mod(a: u64, m: u64) -> Option<u64> {
    let (mut r0, mut r1) = (m as i128, (a % m) as i128);
    let (mut t0, mut t1) = (0i128, 1i128);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    if r0 != 1 {
        return None;
    }
    Some(t0.rem_euclid(m as i128) as u64)
}

/// The linear system `J d = e (mod p)`, eliminated once.
pub(crate) enum Kernel {
    /// GF(2): rows of the transform P (m bits each) with P J in reduced echelon form;
    /// `rows` holds the nonzero rows of P J (n bits each, row r with its pivot
    /// `pivots[r]`).
    Bits {
        trans: Vec<Vec<u64>>,
        rows: Vec<Vec<u64>>,
        pivots: Vec<usize>,
        /// The unknown of each column of the elimination (`None`: column c is unknown c).
        unknowns: Option<Vec<usize>>,
    },
    /// GF(p): the recorded row operations of a Gauss-Jordan elimination of J; `pivots`
    /// pairs a pivot row (an equation) with its column (an unknown).
    Prime {
        p: u64,
        ops: Vec<RowOp>,
        pivots: Vec<(usize, usize)>,
    },
}

pub(crate) enum RowOp {
    /// e[r] *= s
    Scale(usize, u64),
    /// e[i] -= f e[r] for each (i, f)
    Eliminate(usize, Vec<(usize, u64)>),
}

/// The Jacobian entries of the Brent equations at x0 (entries mod p), row by row:
/// `rows[(i d1 + j) d2 + k]` lists `(unknown, value)`.
pub(crate) fn jacobian(
    x0: &[u64],
    dims: [usize; 3],
    rank: usize,
    p: u64,
) -> Vec<Vec<(usize, u64)>> {
    let d = dims;
    let len = d[0] + d[1] + d[2];
    let mut rows = vec![Vec::new(); d[0] * d[1] * d[2]];
    for t in 0..rank {
        let b = &x0[t * len..(t + 1) * len];
        let (u, rest) = b.split_at(d[0]);
        let (v, w) = rest.split_at(d[1]);
        for i in 0..d[0] {
            for j in 0..d[1] {
                for k in 0..d[2] {
                    let row = &mut rows[(i * d[1] + j) * d[2] + k];
                    let vw = v[j] * w[k] % p;
                    let uw = u[i] * w[k] % p;
                    let uv = u[i] * v[j] % p;
                    if vw != 0 {
                        row.push((t * len + i, vw));
                    }
                    if uw != 0 {
                        row.push((t * len + d[0] + j, uw));
                    }
                    if uv != 0 {
                        row.push((t * len + d[0] + d[1] + k, uv));
                    }
                }
            }
        }
    }
    rows
}

impl Kernel {
    /// Eliminate `jac` (n unknowns), the pivot columns taken in the order `order` (every
    /// unknown once; over GF(2) the columns are renumbered by it).
    pub(crate) fn new(
        jac: Vec<Vec<(usize, u64)>>,
        n: usize,
        order: &[usize],
        p: u64,
        max_work: u64,
        halt: &Halt,
    ) -> Option<Kernel> {
        let m = jac.len();
        if p == 2 {
            return Self::bits(jac, n, Some(order), halt);
        }
        if (m as u64) * (n as u64) * (m.min(n) as u64) > max_work {
            return None;
        }
        let mut rows: Vec<Vec<u64>> = jac
            .into_iter()
            .map(|r| {
                let mut d = vec![0u64; n];
                for (c, v) in r {
                    d[c] = (d[c] + v) % p;
                }
                d
            })
            .collect();
        let mut used = vec![false; m];
        let mut ops = Vec::new();
        let mut pivots = Vec::new();
        for &c in order {
            if halt.reached() {
                return None;
            }
            let Some(r) = (0..m).find(|&i| !used[i] && rows[i][c] != 0) else {
                continue;
            };
            used[r] = true;
            let s = inv_mod(rows[r][c], p).expect("prime");
            for x in rows[r].iter_mut() {
                *x = *x * s % p;
            }
            ops.push(RowOp::Scale(r, s));
            let pr = rows[r].clone();
            let mut elim = Vec::new();
            for (i, row) in rows.iter_mut().enumerate() {
                let f = row[c];
                if i == r || f == 0 {
                    continue;
                }
                for (x, y) in row.iter_mut().zip(&pr) {
                    if *y != 0 {
                        *x = (*x + (p - f) * y) % p;
                    }
                }
                elim.push((i, f));
            }
            ops.push(RowOp::Eliminate(r, elim));
            pivots.push((r, c));
            if pivots.len() == m {
                break;
            }
        }
        Some(Kernel::Prime { p, ops, pivots })
    }

    /// The GF(2) elimination of `jac` (n unknowns; entries taken mod 2), pivots in the
    /// order `order` (every unknown once; `None`: unknown order); `None` once `halt` is
    /// reached. Cost: O(m n min(m, n) / 64) word operations
    /// for m equations.
    pub(crate) fn bits(
        jac: Vec<Vec<(usize, u64)>>,
        n: usize,
        order: Option<&[usize]>,
        halt: &Halt,
    ) -> Option<Kernel> {
        let m = jac.len();
        let (wn, wm) = (words(n), words(m));
        // the elimination takes its pivots in column order: with `order`, unknown
        // `order[c]` sits in column c, and the solutions map columns back to unknowns
        let mut column: Vec<usize> = (0..n).collect();
        if let Some(o) = order {
            for (c, &u) in o.iter().enumerate() {
                column[u] = c;
            }
        }
        let mut rows: Vec<Vec<u64>> = jac
            .into_iter()
            .map(|r| {
                let mut b = vec![0u64; wn];
                for (u, v) in r {
                    if v & 1 == 1 {
                        let c = column[u];
                        b[c / 64] ^= 1 << (c % 64);
                    }
                }
                b
            })
            .collect();
        let mut trans = vec![vec![0u64; wm]; m];
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
            if c % 64 == 0 && halt.reached() {
                return None;
            }
            let (w, b) = (c / 64, 1u64 << (c % 64));
            let Some(p) = (r..m).find(|&i| rows[i][w] & b != 0) else {
                continue;
            };
            rows.swap(r, p);
            trans.swap(r, p);
            let (pj, pt) = (rows[r].clone(), trans[r].clone());
            for i in 0..m {
                if i != r && rows[i][w] & b != 0 {
                    xor_words(&mut rows[i], &pj);
                    xor_words(&mut trans[i], &pt);
                }
            }
            pivots.push(c);
            r += 1;
        }
        rows.truncate(r);
        Some(Kernel::Bits {
            trans,
            rows,
            pivots,
            unknowns: order.map(<[usize]>::to_vec),
        })
    }

    /// GF(2): a basis of the solutions of `J d = 0` (n bits each, indexed by unknown), one
    /// vector per free column f (1 at f and at the pivots of the rows holding f); empty
    /// over GF(p).
    pub(crate) fn null_basis_bits(&self, n: usize) -> Vec<Vec<u64>> {
        let Kernel::Bits {
            rows,
            pivots,
            unknowns,
            ..
        } = self
        else {
            return Vec::new();
        };
        let unknown = |c: usize| unknowns.as_ref().map_or(c, |o| o[c]);
        let mut is_pivot = vec![false; n];
        for &c in pivots {
            is_pivot[c] = true;
        }
        (0..n)
            .filter(|&f| !is_pivot[f])
            .map(|f| {
                let mut v = vec![0u64; words(n)];
                let mut set = |c: usize| {
                    let u = unknown(c);
                    v[u / 64] |= 1 << (u % 64);
                };
                set(f);
                for (row, &c) in rows.iter().zip(pivots) {
                    if row[f / 64] >> (f % 64) & 1 == 1 {
                        set(c);
                    }
                }
                v
            })
            .collect()
    }

    /// Solve `J d = e (mod p)` (e in `0..p`); `None` if inconsistent.
    pub(crate) fn solve(&self, e: &[u64], n: usize) -> Option<Vec<u64>> {
        match self {
            Kernel::Bits {
                trans,
                pivots,
                unknowns,
                ..
            } => {
                let mut eb = vec![0u64; words(e.len())];
                for (i, &v) in e.iter().enumerate() {
                    if v & 1 == 1 {
                        eb[i / 64] |= 1 << (i % 64);
                    }
                }
                let parity = |row: &[u64]| {
                    row.iter()
                        .zip(&eb)
                        .map(|(a, b)| (a & b).count_ones())
                        .sum::<u32>()
                        & 1
                };
                if trans[pivots.len()..].iter().any(|row| parity(row) == 1) {
                    return None;
                }
                let mut d = vec![0u64; n];
                for (r, &c) in pivots.iter().enumerate() {
                    let u = unknowns.as_ref().map_or(c, |o| o[c]);
                    d[u] = parity(&trans[r]) as u64;
                }
                Some(d)
            }
            Kernel::Prime { p, ops, pivots } => {
                let p = *p;
                let mut e = e.to_vec();
                for op in ops {
                    match op {
                        RowOp::Scale(r, s) => e[*r] = e[*r] * s % p,
                        RowOp::Eliminate(r, list) => {
                            let er = e[*r];
                            for &(i, f) in list {
                                e[i] = (e[i] + (p - f) * er) % p;
                            }
                        }
                    }
                }
                let mut is_pivot = vec![false; e.len()];
                let mut d = vec![0u64; n];
                for &(r, c) in pivots {
                    is_pivot[r] = true;
                    d[c] = e[r];
                }
                if e.iter().zip(&is_pivot).any(|(&v, &pv)| !pv && v != 0) {
                    return None;
                }
                Some(d)
            }
        }
    }
}
