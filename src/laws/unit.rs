//! The two-sided unit of an algebra, found by solving a linear system exactly.
//!
//! `u = sum_a u_a e_a` is a two-sided unit iff `u * e_j = e_j = e_j * u` for every basis
//! element, i.e. `sum_a u_a c[a][j][k] = delta_jk` and `sum_a u_a c[j][a][k] = delta_jk`:
//! `2 n^2` linear equations in `n` unknowns. A unit, when it exists, is unique.

use crate::linalg::{Matrix, solve};
use crate::scalar::Field;
use crate::tensor::Table;

/// The coordinates of the two-sided unit, or `None` when there is none.
/// Cost: one exact elimination of a `2 n^2 x (n + 1)` matrix.
pub fn find_unit<F: Field>(f: &F, t: &Table<F::Elem>) -> Option<Vec<F::Elem>> {
    let n = t.dims[0];
    let mut m = Matrix::zeros(f, 2 * n * n, n);
    let mut b = vec![f.zero(); 2 * n * n];
    for a in 0..n {
        for j in 0..n {
            for (k, c) in t.product(a, j) {
                // u * e_j: equation (j, k), unknown a
                m[(j * n + k, a)] = c.clone();
            }
            for (k, c) in t.product(j, a) {
                // e_j * u: equation (j, k), unknown a
                m[(n * n + j * n + k, a)] = c.clone();
            }
        }
    }
    for j in 0..n {
        b[j * n + j] = f.one();
        b[n * n + j * n + j] = f.one();
    }
    // drop all-zero equations with zero right side (most of them for sparse tables)
    let keep: Vec<usize> = (0..2 * n * n)
        .filter(|&r| !f.is_zero(&b[r]) || m.row(r).iter().any(|x| !f.is_zero(x)))
        .collect();
    let rows: Vec<Vec<F::Elem>> = keep.iter().map(|&r| m.row(r).to_vec()).collect();
    let bb: Vec<F::Elem> = keep.iter().map(|&r| b[r].clone()).collect();
    let mm = Matrix::from_rows(rows, n);
    solve(f, &mm, &bb)
}
