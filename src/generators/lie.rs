//! Matrix Lie algebras and the Heisenberg algebra, as algebras with the Lie bracket.
//!
//! - `gl(n)`: n x n matrices, `[x, y] = xy - yx`, basis the matrix units `E_ij`
//!   (row-major, names `e11, e12, ...`): `[E_ij, E_kl] = delta_jk E_il - delta_li E_kj`.
//! - `sl(n)`: trace-zero matrices, basis `E_ij` (i != j, row-major, names `e12, ...`) followed
//!   by `H_i = E_ii - E_{i+1,i+1}` (i = 1..n-1, names `h1, ...`). Dimension n^2 - 1.
//! - `so(n)`: antisymmetric matrices, basis `L_ij = E_ij - E_ji` (i < j, lexicographic,
//!   names `l12, l13, ...`). Dimension n(n-1)/2.
//! - `heisenberg(k)`: basis `x1..xk, y1..yk, z`, `[x_i, y_i] = z = -[y_i, x_i]`, all other
//!   brackets zero. Dimension 2k+1.
//!
//! Names use `_` separators (`e1_12`) when n >= 10.

use super::{check_dim, check_positive, index_name};
use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;
use num_traits::{One, Zero};
use std::collections::BTreeMap;

/// A sparse n x n matrix: `(row, col) -> value`, no zeros.
type Sparse = BTreeMap<(usize, usize), Q>;

fn commutator(x: &Sparse, y: &Sparse) -> Sparse {
    let mut out = Sparse::new();
    for (&(i, j), a) in x {
        for (&(k, l), b) in y {
            if j == k {
                *out.entry((i, l)).or_insert_with(Q::zero) += a * b;
            }
            if l == i {
                *out.entry((k, j)).or_insert_with(Q::zero) -= a * b;
            }
        }
    }
    out.retain(|_, v| !v.is_zero());
    out
}

/// A Lie algebra given by basis matrices and the coordinate map of the span.
fn lie_from_matrices(
    names: Vec<String>,
    basis: &[Sparse],
    coords: impl Fn(&Sparse) -> Vec<(usize, Q)>,
) -> Tensor {
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for (a, x) in basis.iter().enumerate() {
        for (b, y) in basis.iter().enumerate() {
            for (c, v) in coords(&commutator(x, y)) {
                t.add(a, b, c, &v);
            }
        }
    }
    t
}

fn unit(i: usize, j: usize) -> Sparse {
    Sparse::from([((i, j), Q::one())])
}

/// gl(n) with the commutator bracket. Dimension n^2 (n <= 64). Cost: O(n^4).
pub fn gl(n: usize) -> Result<Tensor> {
    let what = format!("the Lie algebra gl({n})");
    check_positive(&what, "n", n)?;
    check_dim(&what, n.checked_mul(n))?;
    let sep = n >= 10;
    let mut names = Vec::new();
    for i in 0..n {
        for j in 0..n {
            names.push(index_name("e", &[i + 1, j + 1], sep));
        }
    }
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for i in 0..n {
        for j in 0..n {
            for l in 0..n {
                // The matrix product E_ij E_jl = E_il gives +E_il in [E_ij, E_jl] and
                // -E_il in [E_jl, E_ij]; every nonzero product of units arises once here.
                t.add(i * n + j, j * n + l, i * n + l, &Q::one());
                t.add(j * n + l, i * n + j, i * n + l, &-Q::one());
            }
        }
    }
    Ok(t)
}

/// sl(n) with the commutator bracket. Dimension n^2 - 1 (2 <= n <= 64). Cost: O(n^4).
pub fn sl(n: usize) -> Result<Tensor> {
    let what = format!("the Lie algebra sl({n})");
    if n < 2 {
        return Err(Error::Invalid(format!("{what}: n must be at least 2")));
    }
    check_dim(&what, n.checked_mul(n).map(|d| d - 1))?;
    let sep = n >= 10;
    let mut names = Vec::new();
    let mut basis = Vec::new();
    let mut off: BTreeMap<(usize, usize), usize> = BTreeMap::new();
    for i in 0..n {
        for j in 0..n {
            if i != j {
                off.insert((i, j), basis.len());
                names.push(index_name("e", &[i + 1, j + 1], sep));
                basis.push(unit(i, j));
            }
        }
    }
    let h0 = basis.len();
    for i in 0..n - 1 {
        names.push(format!("h{}", i + 1));
        let mut h = unit(i, i);
        h.insert((i + 1, i + 1), -Q::one());
        basis.push(h);
    }
    let coords = |m: &Sparse| {
        let mut out = Vec::new();
        // diagonal d (trace zero) = sum_k c_k H_k with c_k = d_1 + ... + d_k.
        let mut acc = Q::zero();
        for k in 0..n - 1 {
            if let Some(v) = m.get(&(k, k)) {
                acc += v;
            }
            if !acc.is_zero() {
                out.push((h0 + k, acc.clone()));
            }
        }
        for (&(i, j), v) in m {
            if i != j {
                out.push((off[&(i, j)], v.clone()));
            }
        }
        out
    };
    Ok(lie_from_matrices(names, &basis, coords))
}

/// so(n) with the commutator bracket. Dimension n(n-1)/2 (n >= 2). Cost: O(n^4).
pub fn so(n: usize) -> Result<Tensor> {
    let what = format!("the Lie algebra so({n})");
    if n < 2 {
        return Err(Error::Invalid(format!("{what}: n must be at least 2")));
    }
    check_dim(&what, n.checked_mul(n - 1).map(|d| d / 2))?;
    let sep = n >= 10;
    let mut names = Vec::new();
    let mut basis = Vec::new();
    let mut idx: BTreeMap<(usize, usize), usize> = BTreeMap::new();
    for i in 0..n {
        for j in i + 1..n {
            idx.insert((i, j), basis.len());
            names.push(index_name("l", &[i + 1, j + 1], sep));
            let mut m = unit(i, j);
            m.insert((j, i), -Q::one());
            basis.push(m);
        }
    }
    let coords = |m: &Sparse| {
        m.iter()
            .filter(|((i, j), _)| i < j)
            .map(|(&(i, j), v)| (idx[&(i, j)], v.clone()))
            .collect()
    };
    Ok(lie_from_matrices(names, &basis, coords))
}

/// The Heisenberg Lie algebra of dimension 2k+1 (k >= 1). Cost: O(k^2).
pub fn heisenberg(k: usize) -> Result<Tensor> {
    let what = format!("the Heisenberg algebra h_{k}");
    check_positive(&what, "k", k)?;
    let dim = check_dim(&what, k.checked_mul(2).map(|d| d + 1))?;
    let mut names: Vec<String> = (1..=k).map(|i| format!("x{i}")).collect();
    names.extend((1..=k).map(|i| format!("y{i}")));
    names.push("z".into());
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for i in 0..k {
        t.set(i, k + i, dim - 1, Q::one());
        t.set(k + i, i, dim - 1, -Q::one());
    }
    Ok(t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn sl2_relations() {
        // sl(2): e = E_12, f = E_21, h = H_1; [e,f] = h, [h,e] = 2e, [h,f] = -2f
        // (common practice).
        let t = sl(2).unwrap();
        assert_eq!(t.names()[0], vec!["e12", "e21", "h1"]);
        assert_eq!(t.product(0, 1), &[(2, q(1, 1))]);
        assert_eq!(t.product(2, 0), &[(0, q(2, 1))]);
        assert_eq!(t.product(2, 1), &[(1, q(-2, 1))]);
        assert!(t.product(2, 2).is_empty());
        assert_eq!(sl(4).unwrap().dim(), 15);
    }

    #[test]
    fn gl_and_so() {
        let g = gl(2).unwrap();
        // [E_12, E_21] = E_11 - E_22.
        assert_eq!(g.product(1, 2), &[(0, q(1, 1)), (3, q(-1, 1))]);
        assert!(g.product(0, 0).is_empty());
        // so(3): [L12, L23] = L13 in the basis L12, L13, L23.
        let s = so(3).unwrap();
        assert_eq!(s.dim(), 3);
        assert_eq!(s.product(0, 2), &[(1, q(1, 1))]);
        assert_eq!(s.product(2, 0), &[(1, q(-1, 1))]);
        assert!(sl(1).is_err());
        assert!(gl(65).is_err());
    }

    #[test]
    fn heisenberg_bracket() {
        let t = heisenberg(2).unwrap();
        assert_eq!(t.dim(), 5);
        assert_eq!(t.product(1, 3), &[(4, q(1, 1))]);
        assert_eq!(t.product(3, 1), &[(4, q(-1, 1))]);
        assert!(t.product(0, 3).is_empty());
        assert_eq!(t.nnz(), 4);
    }
}
