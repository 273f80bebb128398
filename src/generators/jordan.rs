//! The Jordan algebra of symmetric n x n matrices over Q.
//!
//! Product `a . b = (ab + ba)/2`. Basis: the diagonal units `E_ii` (names `s11, s22, ...`)
//! followed by `E_ij + E_ji` for i < j in lexicographic order (names `s12, s13, ...`; with
//! `_` separators when n >= 10). Dimension n(n+1)/2. `E_11` ... `E_nn` sum to the unit.

use super::{check_dim, check_positive, index_name};
use crate::error::Result;
use crate::scalar::{FieldSpec, Q, q};
use crate::tensor::Tensor;
use num_traits::{One, Zero};
use std::collections::BTreeMap;

type Sparse = BTreeMap<(usize, usize), Q>;

/// Sym_n with the Jordan product. Dimension n(n+1)/2 (at most 2048, the algebra limit). Cost: O(n^4).
pub fn jordan_symmetric(n: usize) -> Result<Tensor> {
    let what = format!("the Jordan algebra of symmetric {n}x{n} matrices");
    check_positive(&what, "n", n)?;
    check_dim(&what, n.checked_mul(n + 1).map(|d| d / 2))?;
    let sep = n >= 10;
    let mut names = Vec::new();
    let mut basis: Vec<Sparse> = Vec::new();
    let mut idx: BTreeMap<(usize, usize), usize> = BTreeMap::new();
    for i in 0..n {
        idx.insert((i, i), basis.len());
        names.push(index_name("s", &[i + 1, i + 1], sep));
        basis.push(Sparse::from([((i, i), Q::one())]));
    }
    for i in 0..n {
        for j in i + 1..n {
            idx.insert((i, j), basis.len());
            names.push(index_name("s", &[i + 1, j + 1], sep));
            basis.push(Sparse::from([((i, j), Q::one()), ((j, i), Q::one())]));
        }
    }
    let half = q(1, 2);
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for (a, x) in basis.iter().enumerate() {
        for (b, y) in basis.iter().enumerate() {
            let mut prod = Sparse::new();
            for (&(i, j), u) in x {
                for (&(k, l), v) in y {
                    if j == k {
                        *prod.entry((i, l)).or_insert_with(Q::zero) += u * v;
                    }
                    if l == i {
                        *prod.entry((k, j)).or_insert_with(Q::zero) += u * v;
                    }
                }
            }
            // The result is symmetric: read the coordinates from the upper triangle.
            for (&(i, j), v) in &prod {
                if i <= j && !v.is_zero() {
                    t.add(a, b, idx[&(i, j)], &(v * &half));
                }
            }
        }
    }
    Ok(t)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sym2() {
        let t = jordan_symmetric(2).unwrap();
        assert_eq!(t.names()[0], vec!["s11", "s22", "s12"]);
        // E11 . E11 = E11; E11 . (E12+E21) = (E12+E21)/2; (E12+E21)^2 = E11 + E22.
        assert_eq!(t.product(0, 0), &[(0, q(1, 1))]);
        assert_eq!(t.product(0, 2), &[(2, q(1, 2))]);
        assert_eq!(t.product(2, 2), &[(0, q(1, 1)), (1, q(1, 1))]);
        assert!(t.product(0, 1).is_empty());
        assert_eq!(jordan_symmetric(4).unwrap().dim(), 10);
    }
}
