//! Sparse row echelon form modulo a prime, for the short equations of structured algebras
//! (matrix, group, Clifford algebras: 2-3 terms an equation).
//!
//! Each pivot row is stored sparsely with leading coefficient 1; an incoming row is reduced
//! by leading-column elimination (a dense scatter array and a min-heap of live columns).
//! The form is not reduced above pivots; the nullspace basis is obtained by
//! back-substitution and is the reduced one (1 at its own free column, 0 at the others').
//! Invariant: `pivot_of[c]` is the index of the row whose leading column is c.
//! Cost per incoming row: the total length of the pivot rows it meets; the caller bounds
//! fill-in with [`SparseEchelon::nnz`] and falls back to dense elimination.

use std::cmp::Reverse;
use std::collections::BinaryHeap;

pub struct SparseEchelon {
    pub p: u64,
    pub m: usize,
    pivot_of: Vec<u32>,
    rows: Vec<Vec<(u32, u64)>>,
    nnz: usize,
    acc: Vec<u64>,
    live: Vec<bool>,
}

#[inline]
fn mulm(a: u64, b: u64, p: u64) -> u64 {
    if p < (1 << 32) {
        a * b % p
    } else {
        ((a as u128 * b as u128) % p as u128) as u64
    }
}

fn inv(a: u64, p: u64) -> u64 {
    let (mut r0, mut r1) = (p as i128, a as i128);
    let (mut t0, mut t1) = (0i128, 1i128);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    t0.rem_euclid(p as i128) as u64
}

impl SparseEchelon {
    pub fn new(p: u64, m: usize) -> Self {
        SparseEchelon {
            p,
            m,
            pivot_of: vec![u32::MAX; m],
            rows: Vec::new(),
            nnz: 0,
            acc: vec![0; m],
            live: vec![false; m],
        }
    }

    pub fn rank(&self) -> usize {
        self.rows.len()
    }

    /// Stored coefficients (a measure of fill-in).
    pub fn nnz(&self) -> usize {
        self.nnz
    }

    /// The stored rows (each with leading coefficient 1), for conversion to dense form.
    pub fn rows(&self) -> &[Vec<(u32, u64)>] {
        &self.rows
    }

    /// Reduce a row (entries `< p`, distinct columns) and keep it if independent.
    /// Returns true when the rank grew.
    pub fn add(&mut self, row: &[(u32, u64)]) -> bool {
        let p = self.p;
        let mut heap: BinaryHeap<Reverse<u32>> = BinaryHeap::with_capacity(row.len() * 2);
        for &(c, v) in row {
            if v != 0 {
                self.acc[c as usize] = v;
                self.live[c as usize] = true;
                heap.push(Reverse(c));
            }
        }
        while let Some(Reverse(c)) = heap.pop() {
            let cu = c as usize;
            self.live[cu] = false;
            let f = self.acc[cu];
            if f == 0 {
                continue;
            }
            let pr = self.pivot_of[cu];
            if pr == u32::MAX {
                // new pivot: collect the remaining live columns
                let mut out = vec![(c, 1u64)];
                let fi = inv(f, p);
                self.acc[cu] = 0;
                let mut rest: Vec<u32> = heap.drain().map(|Reverse(x)| x).collect();
                rest.sort_unstable();
                rest.dedup();
                for x in rest {
                    let xu = x as usize;
                    self.live[xu] = false;
                    let v = self.acc[xu];
                    self.acc[xu] = 0;
                    if v != 0 {
                        out.push((x, mulm(v, fi, p)));
                    }
                }
                self.nnz += out.len();
                self.pivot_of[cu] = self.rows.len() as u32;
                self.rows.push(out);
                return true;
            }
            // eliminate column c with its pivot row: acc -= f * row
            self.acc[cu] = 0;
            let prow = &self.rows[pr as usize];
            for &(x, v) in &prow[1..] {
                let xu = x as usize;
                let cur = self.acc[xu];
                let sub = mulm(f, v, p);
                self.acc[xu] = if cur >= sub { cur - sub } else { cur + p - sub };
                if !self.live[xu] {
                    self.live[xu] = true;
                    heap.push(Reverse(x));
                }
            }
        }
        false
    }

    /// Pivot columns, ascending.
    pub fn pivots(&self) -> Vec<usize> {
        (0..self.m)
            .filter(|&c| self.pivot_of[c] != u32::MAX)
            .collect()
    }

    /// Free columns, ascending.
    pub fn free(&self) -> Vec<usize> {
        (0..self.m)
            .filter(|&c| self.pivot_of[c] == u32::MAX)
            .collect()
    }

    /// The reduced echelon entries `E[r][f]` (pivot rows r in ascending pivot order, free
    /// columns f), row-major: `E[r][f] = -x_f[pivot r]` for the nullspace vector x_f with
    /// x_f[f] = 1 and 0 at the other free columns. Cost: O(|free| nnz).
    pub fn image(&self, free: &[usize]) -> Vec<u64> {
        let p = self.p;
        let piv = self.pivots();
        let nf = free.len();
        let mut out = vec![0u64; piv.len() * nf];
        let mut x = vec![0u64; self.m];
        for (k, &f) in free.iter().enumerate() {
            x.iter_mut().for_each(|v| *v = 0);
            x[f] = 1;
            for (ri, &pc) in piv.iter().enumerate().rev() {
                let row = &self.rows[self.pivot_of[pc] as usize];
                let mut s = 0u64;
                for &(c, v) in &row[1..] {
                    let xc = x[c as usize];
                    if xc != 0 {
                        s = (s + mulm(v, xc, p)) % p;
                    }
                }
                // x[pc] = -s ; E[r][f] = -x[pc] = s
                x[pc] = (p - s) % p;
                out[ri * nf + k] = s;
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_sparse_echelon() {
        let p = 101;
        let mut e = SparseEchelon::new(p, 4);
        assert!(e.add(&[(0, 1), (1, 100)])); // x0 - x1
        assert!(e.add(&[(1, 1), (2, 100)])); // x1 - x2
        assert!(!e.add(&[(0, 1), (2, 100)])); // x0 - x2: dependent
        assert_eq!(e.free(), vec![2, 3]);
        // x2 = 1 -> x1 = 1, x0 = 1 ; E[r][f] = -x = p - 1
        assert_eq!(e.image(&[2, 3]), vec![100, 0, 100, 0]);
    }

    #[test]
    fn agrees_with_dense_elimination() {
        use crate::linalg::modular::{kernel_primes, rref_mod};
        use rand::{Rng, SeedableRng};
        let p = kernel_primes(1)[0];
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(3);
        for m in [5usize, 20, 70] {
            let rows: Vec<Vec<(u32, u64)>> = (0..m - 3)
                .map(|_| {
                    let mut cols: Vec<u32> = (0..3).map(|_| rng.gen_range(0..m as u32)).collect();
                    cols.sort_unstable();
                    cols.dedup();
                    cols.into_iter()
                        .map(|c| (c, rng.gen_range(0..3u64)))
                        .collect()
                })
                .collect();
            let mut e = SparseEchelon::new(p, m);
            let mut dense = vec![0u64; rows.len() * m];
            for (i, r) in rows.iter().enumerate() {
                e.add(r);
                for &(c, v) in r {
                    dense[i * m + c as usize] = v;
                }
            }
            let piv = rref_mod(&mut dense, rows.len(), m, p, true);
            assert_eq!(e.pivots(), piv);
            let free = e.free();
            let img: Vec<u64> = (0..piv.len())
                .flat_map(|r| free.iter().map(move |&f| (r, f)))
                .map(|(r, f)| dense[r * m + f])
                .collect();
            assert_eq!(e.image(&free), img);
        }
    }
}
