//! A reduced row echelon form modulo a kernel prime, grown by batches of rows.
//!
//! The form `E` (r rows of m residues) is kept **reduced**: each row has a 1 at its pivot
//! column and every other row a 0 there. A batch `N` of new rows is then reduced in one
//! matrix product, `N <- N - N[:, pivots] E` (no pivot-by-pivot loop), the reduced batch is
//! brought to reduced form by itself, its new pivot columns are cleared from `E` by a
//! second product, `E <- E - E[:, new pivots] F`, and its rows are appended. Both products
//! run over [`crate::linalg::kernels::vec_mat_acc`] with lazy reduction, rows in parallel.
//!
//! Cost of a batch of b rows: `b r m + r f m` multiply-adds (f the rank gained) plus
//! `b^2 m` for the batch itself; for a full-rank m x m system about m^3.
//! Invariants: rows are reduced residues `< p`; `pivot_row[c]` is the row whose pivot is
//! column c, or `u32::MAX`.

use super::kernels::{KERNEL_PRIME_BITS, LazyAcc};
use super::modular::rref_mod;
use rayon::prelude::*;

/// A growing reduced echelon form modulo `p < 2^28` (see the module documentation).
#[derive(Clone, Debug)]
pub struct DenseEchelon {
    pub p: u64,
    pub m: usize,
    rows: Vec<u32>,
    /// Pivot column of each row, in row order.
    pivots: Vec<usize>,
    pivot_row: Vec<u32>,
}

impl DenseEchelon {
    /// The empty form on `m` columns.
    pub fn new(p: u64, m: usize) -> Self {
        assert!(p < 1 << KERNEL_PRIME_BITS);
        DenseEchelon {
            p,
            m,
            rows: Vec::new(),
            pivots: Vec::new(),
            pivot_row: vec![u32::MAX; m],
        }
    }

    pub fn rank(&self) -> usize {
        self.pivots.len()
    }

    /// Words held (for memory accounting).
    pub fn words(&self) -> usize {
        self.rows.len()
    }

    /// Row `i` of the form.
    pub fn row(&self, i: usize) -> &[u32] {
        &self.rows[i * self.m..(i + 1) * self.m]
    }

    /// Pivot columns, ascending.
    pub fn pivot_columns(&self) -> Vec<usize> {
        let mut p = self.pivots.clone();
        p.sort_unstable();
        p
    }

    /// Free (non-pivot) columns, ascending.
    pub fn free_columns(&self) -> Vec<usize> {
        (0..self.m)
            .filter(|&c| self.pivot_row[c] == u32::MAX)
            .collect()
    }

    /// `E[r][f]` for the pivot rows in ascending pivot order and the given free columns,
    /// row-major: the nullspace vector with 1 at free column f has `-E[r][f]` at pivot r.
    pub fn image(&self, free: &[usize]) -> Vec<u64> {
        let mut out = Vec::with_capacity(self.rank() * free.len());
        for c in self.pivot_columns() {
            let row = self.row(self.pivot_row[c] as usize);
            out.extend(free.iter().map(|&f| row[f] as u64));
        }
        out
    }

    /// Add rows (`batch.len()` a multiple of m, residues `< p`); returns the rank gained.
    /// The batch buffer is consumed (left empty).
    pub fn add_rows(&mut self, batch: &mut Vec<u32>) -> usize {
        let m = self.m;
        let p = self.p;
        if batch.is_empty() || m == 0 {
            batch.clear();
            return 0;
        }
        let b = batch.len() / m;
        // 1. reduce the batch by the form: x <- x - sum_i x[piv_i] E_i
        if self.rank() > 0 {
            let pivots = &self.pivots;
            let rows = &self.rows;
            batch.par_chunks_mut(m).for_each(|x| {
                let coefs: Vec<u32> = pivots
                    .iter()
                    .map(|&c| ((p - x[c] as u64) % p) as u32)
                    .collect();
                if coefs.iter().all(|&c| c == 0) {
                    return;
                }
                let mut acc = LazyAcc::new(m, p);
                for (v, &y) in acc.values.iter_mut().zip(x.iter()) {
                    *v = y as u64;
                }
                acc.vec_mat(&coefs, rows);
                for (y, &v) in x.iter_mut().zip(acc.finish()) {
                    *y = v as u32;
                }
            });
        }
        // 2. the reduced batch in reduced form by itself
        let mut wide: Vec<u64> = batch.iter().map(|&x| x as u64).collect();
        let new_piv = rref_mod(&mut wide, b, m, p, true);
        let f = new_piv.len();
        if f == 0 {
            batch.clear();
            return 0;
        }
        let fresh: Vec<u32> = wide[..f * m].iter().map(|&x| x as u32).collect();
        // 3. clear the new pivot columns from the old rows: e <- e - sum_j e[np_j] F_j
        if self.rank() > 0 {
            self.rows.par_chunks_mut(m).for_each(|e| {
                let coefs: Vec<u32> = new_piv
                    .iter()
                    .map(|&c| ((p - e[c] as u64) % p) as u32)
                    .collect();
                if coefs.iter().all(|&c| c == 0) {
                    return;
                }
                let mut acc = LazyAcc::new(m, p);
                for (v, &y) in acc.values.iter_mut().zip(e.iter()) {
                    *v = y as u64;
                }
                acc.vec_mat(&coefs, &fresh);
                for (y, &v) in e.iter_mut().zip(acc.finish()) {
                    *y = v as u32;
                }
            });
        }
        // 4. append
        for (k, &c) in new_piv.iter().enumerate() {
            self.pivot_row[c] = (self.pivots.len() + k) as u32;
        }
        self.pivots.extend_from_slice(&new_piv);
        self.rows.extend_from_slice(&fresh);
        batch.clear();
        f
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::modular::kernel_primes;
    use rand::{Rng, SeedableRng};

    #[test]
    fn batches_agree_with_one_elimination() {
        let p = kernel_primes(1)[0];
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(5);
        for (rows, m, rank) in [(30usize, 20usize, 12usize), (80, 70, 70), (10, 40, 10)] {
            // a rows x m matrix of the given rank: (rows x rank) (rank x m)
            let a: Vec<u64> = (0..rows * rank).map(|_| rng.gen_range(0..p)).collect();
            let b: Vec<u64> = (0..rank * m).map(|_| rng.gen_range(0..p)).collect();
            let mut mat = vec![0u64; rows * m];
            for i in 0..rows {
                for k in 0..rank {
                    for j in 0..m {
                        mat[i * m + j] = (mat[i * m + j] + a[i * rank + k] * b[k * m + j]) % p;
                    }
                }
            }
            let mut whole = mat.clone();
            let piv = rref_mod(&mut whole, rows, m, p, true);
            let mut e = DenseEchelon::new(p, m);
            for chunk in mat.chunks(7 * m) {
                let mut batch: Vec<u32> = chunk.iter().map(|&x| x as u32).collect();
                e.add_rows(&mut batch);
            }
            assert_eq!(e.rank(), piv.len());
            assert_eq!(e.pivot_columns(), piv);
            let free = e.free_columns();
            let want: Vec<u64> = (0..piv.len())
                .flat_map(|r| free.iter().map(move |&f| (r, f)))
                .map(|(r, f)| whole[r * m + f])
                .collect();
            assert_eq!(e.image(&free), want);
        }
    }
}
