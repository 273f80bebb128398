//! The characteristic polynomial `det(x I - M)` of a square matrix over any field, by
//! reduction to upper Hessenberg form through similarity transformations and the
//! Hessenberg recurrence (Cohen 1993, A Course in Computational Algebraic Number Theory,
//! Algorithm 2.2.9). Exact; O(n^3) field operations. Coefficients constant term first.

use super::Matrix;
use crate::scalar::Field;

/// `det(x I - m)`, constant term first, monic of degree n.
pub fn charpoly<F: Field>(f: &F, m: &Matrix<F::Elem>) -> Vec<F::Elem> {
    let n = m.rows;
    assert_eq!(n, m.cols, "a square matrix");
    let mut h = m.clone();
    // Hessenberg form: clear column j below the subdiagonal, keeping the similarity class
    for j in 0..n.saturating_sub(2) {
        let Some(piv) = (j + 1..n).find(|&i| !f.is_zero(&h[(i, j)])) else {
            continue;
        };
        if piv != j + 1 {
            for c in 0..n {
                h.data.swap(piv * n + c, (j + 1) * n + c);
            }
            for r in 0..n {
                h.data.swap(r * n + piv, r * n + j + 1);
            }
        }
        let inv = f.inv(&h[(j + 1, j)]).expect("nonzero pivot");
        for i in j + 2..n {
            if f.is_zero(&h[(i, j)]) {
                continue;
            }
            let u = f.mul(&h[(i, j)], &inv);
            // row_i -= u row_{j+1}
            for c in 0..n {
                let v = h[(j + 1, c)].clone();
                f.sub_mul_assign(&mut h[(i, c)], &u, &v);
            }
            // col_{j+1} += u col_i
            for r in 0..n {
                let v = h[(r, i)].clone();
                f.add_mul_assign(&mut h[(r, j + 1)], &u, &v);
            }
        }
    }
    // p_k = (x - h_kk) p_{k-1} - sum_{i<k} h_ik (prod_{j=i+1..k} h_{j,j-1}) p_{i-1}
    let mut p: Vec<Vec<F::Elem>> = vec![vec![f.one()]];
    for k in 0..n {
        let prev = &p[k];
        let mut next = vec![f.zero(); k + 2];
        for (d, c) in prev.iter().enumerate() {
            next[d + 1] = f.add(&next[d + 1], c);
            f.sub_mul_assign(&mut next[d], &h[(k, k)], c);
        }
        let mut t = f.one();
        for i in (0..k).rev() {
            t = f.mul(&t, &h[(i + 1, i)]);
            if f.is_zero(&t) {
                break;
            }
            let coef = f.mul(&h[(i, k)], &t);
            for (d, c) in p[i].iter().enumerate() {
                f.sub_mul_assign(&mut next[d], &coef, c);
            }
        }
        p.push(next);
    }
    p.pop().expect("p_n")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{PrimeField, Rationals, q};

    #[test]
    fn small_matrices() {
        // [[1,2],[3,4]]: x^2 - 5x - 2 (common practice)
        let m = Matrix::from_rows(vec![vec![q(1, 1), q(2, 1)], vec![q(3, 1), q(4, 1)]], 2);
        assert_eq!(charpoly(&Rationals, &m), vec![q(-2, 1), q(-5, 1), q(1, 1)]);
        // a 4x4 permutation matrix of a 4-cycle: x^4 - 1, here over GF(5)
        let f = PrimeField::new(5).unwrap();
        let mut c = Matrix::filled(4, 4, 0u64);
        for i in 0..4 {
            c[((i + 1) % 4, i)] = 1;
        }
        assert_eq!(charpoly(&f, &c), vec![4, 0, 0, 0, 1]);
        // lower triangular with a zero subdiagonal entry (the reduction swaps rows and
        // columns): (x-1)(x-2)(x-3) = x^3 - 6x^2 + 11x - 6
        let m = Matrix::from_rows(
            vec![
                vec![q(1, 1), q(0, 1), q(0, 1)],
                vec![q(0, 1), q(2, 1), q(0, 1)],
                vec![q(1, 1), q(5, 1), q(3, 1)],
            ],
            3,
        );
        assert_eq!(
            charpoly(&Rationals, &m),
            vec![q(-6, 1), q(11, 1), q(-6, 1), q(1, 1)]
        );
    }
}
