//! Gauss-Jordan elimination over any field: reduced row echelon form and everything built
//! on it. All results are exact. Cost of [`rref`]: O(r c min(r, c)) field operations.

use super::Matrix;
use crate::scalar::Field;

/// Bring `m` to reduced row echelon form in place; returns the pivot columns (ascending).
/// Rows below `pivots.len()` are zero afterwards.
pub fn rref<F: Field>(f: &F, m: &mut Matrix<F::Elem>) -> Vec<usize> {
    let (rows, cols) = (m.rows, m.cols);
    let mut pivots = Vec::new();
    let mut r = 0;
    for c in 0..cols {
        if r == rows {
            break;
        }
        let Some(p) = (r..rows).find(|&i| !f.is_zero(&m[(i, c)])) else {
            continue;
        };
        if p != r {
            for j in 0..cols {
                m.data.swap(p * cols + j, r * cols + j);
            }
        }
        let inv = f.inv(&m[(r, c)]).expect("pivot is nonzero");
        for j in c..cols {
            let v = f.mul(&m[(r, j)], &inv);
            m[(r, j)] = v;
        }
        let pivot_row: Vec<F::Elem> = m.row(r)[c..].to_vec();
        for i in 0..rows {
            if i == r || f.is_zero(&m[(i, c)]) {
                continue;
            }
            let factor = m[(i, c)].clone();
            let row = &mut m.data[i * cols + c..(i + 1) * cols];
            for (x, y) in row.iter_mut().zip(&pivot_row) {
                f.sub_mul_assign(x, &factor, y);
            }
        }
        pivots.push(c);
        r += 1;
    }
    pivots
}

/// The rank: the dimension of the row space. Cost: one [`rref`] of a copy.
pub fn rank<F: Field>(f: &F, m: &Matrix<F::Elem>) -> usize {
    let mut a = m.clone();
    rref(f, &mut a).len()
}

/// A basis of the right nullspace {x : m x = 0}, one vector per free column, in the
/// standard form read off the reduced echelon form (the free coordinate is 1, the other
/// free coordinates are 0). Cost: one [`rref`].
pub fn nullspace<F: Field>(f: &F, m: &Matrix<F::Elem>) -> Vec<Vec<F::Elem>> {
    let mut a = m.clone();
    let pivots = rref(f, &mut a);
    nullspace_from_rref(f, &a, &pivots)
}

/// The nullspace basis read off a matrix already in reduced row echelon form.
pub fn nullspace_from_rref<F: Field>(
    f: &F,
    a: &Matrix<F::Elem>,
    pivots: &[usize],
) -> Vec<Vec<F::Elem>> {
    let mut is_pivot = vec![false; a.cols];
    for &p in pivots {
        is_pivot[p] = true;
    }
    let mut out = Vec::new();
    for free in (0..a.cols).filter(|&c| !is_pivot[c]) {
        let mut v = vec![f.zero(); a.cols];
        v[free] = f.one();
        for (r, &p) in pivots.iter().enumerate() {
            v[p] = f.neg(&a[(r, free)]);
        }
        out.push(v);
    }
    out
}

/// One solution x of m x = b, or `None` when the system is inconsistent.
/// Cost: one [`rref`] of the augmented matrix.
pub fn solve<F: Field>(f: &F, m: &Matrix<F::Elem>, b: &[F::Elem]) -> Option<Vec<F::Elem>> {
    assert_eq!(m.rows, b.len());
    let mut aug = Matrix::zeros(f, m.rows, m.cols + 1);
    for i in 0..m.rows {
        aug.row_mut(i)[..m.cols].clone_from_slice(m.row(i));
        aug[(i, m.cols)] = b[i].clone();
    }
    let pivots = rref(f, &mut aug);
    if pivots.last() == Some(&m.cols) {
        return None;
    }
    let mut x = vec![f.zero(); m.cols];
    for (r, &p) in pivots.iter().enumerate() {
        x[p] = aug[(r, m.cols)].clone();
    }
    Some(x)
}

/// The inverse of a square matrix, or `None` when it is singular. Cost: one [`rref`] of
/// the n x 2n matrix [m | I].
pub fn inverse<F: Field>(f: &F, m: &Matrix<F::Elem>) -> Option<Matrix<F::Elem>> {
    assert_eq!(m.rows, m.cols, "inverse of a non-square matrix");
    let n = m.rows;
    let mut aug = Matrix::zeros(f, n, 2 * n);
    for i in 0..n {
        aug.row_mut(i)[..n].clone_from_slice(m.row(i));
        aug[(i, n + i)] = f.one();
    }
    let pivots = rref(f, &mut aug);
    if pivots.len() < n || pivots[n - 1] != n - 1 {
        return None;
    }
    let mut inv = Matrix::zeros(f, n, n);
    for i in 0..n {
        inv.row_mut(i).clone_from_slice(&aug.row(i)[n..]);
    }
    Some(inv)
}

/// The determinant of a square matrix by Gaussian elimination. Cost: O(n^3).
pub fn determinant<F: Field>(f: &F, m: &Matrix<F::Elem>) -> F::Elem {
    assert_eq!(m.rows, m.cols, "determinant of a non-square matrix");
    let n = m.rows;
    let mut a = m.clone();
    let mut det = f.one();
    for c in 0..n {
        let Some(p) = (c..n).find(|&i| !f.is_zero(&a[(i, c)])) else {
            return f.zero();
        };
        if p != c {
            for j in 0..n {
                a.data.swap(p * n + j, c * n + j);
            }
            det = f.neg(&det);
        }
        let piv = a[(c, c)].clone();
        det = f.mul(&det, &piv);
        let inv = f.inv(&piv).expect("nonzero pivot");
        for i in c + 1..n {
            if f.is_zero(&a[(i, c)]) {
                continue;
            }
            let factor = f.mul(&a[(i, c)], &inv);
            for j in c..n {
                let y = a[(c, j)].clone();
                f.sub_mul_assign(&mut a[(i, j)], &factor, &y);
            }
        }
    }
    det
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{PrimeField, Rationals, q};

    fn qm(rows: &[&[i64]]) -> Matrix<crate::scalar::Q> {
        Matrix::from_rows(
            rows.iter()
                .map(|r| r.iter().map(|&x| q(x, 1)).collect())
                .collect(),
            0,
        )
    }

    #[test]
    fn rank_det_inverse() {
        let f = Rationals;
        let m = qm(&[&[1, 2, 3], &[4, 5, 6], &[7, 8, 9]]);
        assert_eq!(rank(&f, &m), 2);
        assert_eq!(determinant(&f, &m), q(0, 1));
        let ns = nullspace(&f, &m);
        assert_eq!(ns.len(), 1);
        assert!(m.mul_vec(&f, &ns[0]).iter().all(|x| x == &q(0, 1)));
        let a = qm(&[&[2, 1], &[1, 1]]);
        let inv = inverse(&f, &a).unwrap();
        assert_eq!(a.mul(&f, &inv), Matrix::identity(&f, 2));
        assert_eq!(determinant(&f, &a), q(1, 1));
        let x = solve(&f, &a, &[q(3, 1), q(2, 1)]).unwrap();
        assert_eq!(x, vec![q(1, 1), q(1, 1)]);
    }

    #[test]
    fn over_gf2() {
        let f = PrimeField::new(2).unwrap();
        let m = Matrix::from_rows(vec![vec![1, 1], vec![1, 1]], 2);
        assert_eq!(rank(&f, &m), 1);
        assert_eq!(determinant(&f, &m), 0);
    }
}
