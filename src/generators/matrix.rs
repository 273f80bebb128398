//! Matrix multiplication tensors `<n,m,p>` and full matrix algebras `M_n`.
//!
//! Conventions: `<n,m,p>` is the bilinear map `(A, B) -> AB` with A an n x m and B an m x p
//! matrix. Basis orders are row-major: `A_ik` has index `i*m + k`, `B_kj` index `k*p + j`,
//! `C_ij` index `i*p + j` (0-based). Names are 1-based: `a11, a12, ..`, `b11, ..`, `c11, ..`,
//! written `a1_12` with a separator when a dimension of that matrix reaches 10.
//! `M_n` is the algebra of n x n matrices with basis the matrix units `E_ij` (names `e11`,
//! `e12`, ...; row-major order) and `E_ij E_kl = delta_jk E_il`.

use super::{check_dim, check_map_dims, check_positive, index_name};
use crate::error::Result;
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{Kind, Tensor};
use num_traits::One;

fn matrix_names(prefix: &str, rows: usize, cols: usize) -> Vec<String> {
    let sep = rows >= 10 || cols >= 10;
    let mut v = Vec::with_capacity(rows * cols);
    for i in 0..rows {
        for j in 0..cols {
            v.push(index_name(prefix, &[i + 1, j + 1], sep));
        }
    }
    v
}

/// The matrix multiplication tensor `<n,m,p>`: `c[(i,k)][(k,j)][(i,j)] = 1`.
/// Dimensions `[nm, mp, np]`, `nmp` nonzero coefficients. Cost: O(nmp).
pub fn matmul(n: usize, m: usize, p: usize) -> Result<Tensor> {
    let what = format!("the matrix multiplication tensor <{n},{m},{p}>");
    for (v, name) in [(n, "n"), (m, "m"), (p, "p")] {
        check_positive(&what, name, v)?;
    }
    let [da, db, dc] = check_map_dims(
        &what,
        [n.checked_mul(m), m.checked_mul(p), n.checked_mul(p)],
    )?;
    let names = [
        matrix_names("a", n, m),
        matrix_names("b", m, p),
        matrix_names("c", n, p),
    ];
    let mut t = Tensor::zero(
        FieldSpec::Rational,
        Kind::Bilinear,
        [da, db, dc],
        Some(names),
    );
    for i in 0..n {
        for k in 0..m {
            for j in 0..p {
                t.set(i * m + k, k * p + j, i * p + j, Q::one());
            }
        }
    }
    Ok(t)
}

/// The full matrix algebra `M_n` over Q: basis `E_ij` (row-major), `E_ij E_jl = E_il`.
/// Dimension n^2. Cost: O(n^3).
pub fn matrix_algebra(n: usize) -> Result<Tensor> {
    let what = format!("the matrix algebra M_{n}");
    check_positive(&what, "n", n)?;
    check_dim(&what, n.checked_mul(n))?;
    let mut t = Tensor::algebra(FieldSpec::Rational, matrix_names("e", n, n));
    for i in 0..n {
        for j in 0..n {
            for l in 0..n {
                t.set(i * n + j, j * n + l, i * n + l, Q::one());
            }
        }
    }
    Ok(t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn matmul_shape_and_names() {
        let t = matmul(2, 3, 4).unwrap();
        assert_eq!(t.dims(), [6, 12, 8]);
        assert_eq!(t.nnz(), 24);
        assert_eq!(t.name(0, 0), "a11");
        assert_eq!(t.name(1, 11), "b34");
        assert_eq!(t.name(2, 7), "c24");
        // a12 * b23 = c13: A_(0,1) index 1, B_(1,2) index 1*4+2, C_(0,2) index 2.
        assert_eq!(t.get(1, 6, 2), q(1, 1));
        assert_eq!(t.get(0, 6, 2), q(0, 1));
        let big = matmul(10, 1, 1).unwrap();
        assert_eq!(big.name(0, 9), "a10_1");
    }

    #[test]
    fn matmul_limits() {
        assert!(matmul(0, 2, 2).is_err());
        assert!(matmul(65, 65, 1).is_err());
        assert!(matmul(usize::MAX, 2, 1).is_err());
    }

    #[test]
    fn matrix_units() {
        let t = matrix_algebra(2).unwrap();
        assert_eq!(t.dim(), 4);
        assert_eq!(t.names()[0], vec!["e11", "e12", "e21", "e22"]);
        // E_12 E_21 = E_11, E_21 E_12 = E_22, E_12 E_12 = 0.
        assert_eq!(t.product(1, 2), &[(0, q(1, 1))]);
        assert_eq!(t.product(2, 1), &[(3, q(1, 1))]);
        assert!(t.product(1, 1).is_empty());
    }
}
