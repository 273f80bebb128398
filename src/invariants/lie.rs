//! Invariants of a Lie algebra L (checked to be one: `x x = 0` and the Jacobi identity on
//! basis triples, exactly): derived series `L^(k+1) = [L^(k), L^(k)]`, lower central series
//! `L^{k+1} = [L, L^k]`, solvable / nilpotent (the series reach 0), the Killing form
//! `κ(x, y) = Tr(ad_x ad_y)` with its rank, and semisimplicity by Cartan's criterion
//! (κ nondegenerate; characteristic 0 only: Jacobson 1962, Lie Algebras, ch. III).
//!
//! Cost: the Jacobi check O(n^3) basis triples; each series step O(d^2) or O(n d) products
//! and one elimination of at most n^2 vectors of length n; the Killing form O(n^2 nnz).

use super::equations::coeff;
use super::system::IntTable;
use crate::linalg::{Matrix, echelon};
use crate::scalar::{Field, FieldSpec};
use crate::tensor::Tensor;

/// Lie-algebra invariants.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct LieInvariants {
    /// dims of L^(0) = L, L^(1), ... until it stabilises.
    pub derived_series: Vec<usize>,
    /// dims of L^1 = L, L^2, ... until it stabilises.
    pub lower_central_series: Vec<usize>,
    pub solvable: bool,
    pub nilpotent: bool,
    pub killing_rank: usize,
    /// Cartan's criterion; `None` over GF(p).
    pub semisimple: Option<bool>,
}

/// True when the (integer-scaled) product is alternating and satisfies Jacobi.
pub fn is_lie(it: &IntTable) -> bool {
    let n = it.dims[0];
    let red = |x: i128| match it.modulus {
        Some(p) => x.rem_euclid(p as i128),
        None => x,
    };
    for i in 0..n {
        for j in 0..n {
            for k in 0..n {
                let a = coeff(it, i, j, k) as i128;
                let b = coeff(it, j, i, k) as i128;
                if red(a + b) != 0 || (i == j && red(a) != 0) {
                    return false;
                }
            }
        }
    }
    let mut acc = vec![0i128; n];
    for i in 0..n {
        for j in i + 1..n {
            for k in j + 1..n {
                acc.iter_mut().for_each(|x| *x = 0);
                for (x, y, z) in [(i, j, k), (j, k, i), (k, i, j)] {
                    for &(u, c1) in it.product(x, y) {
                        for &(m, c2) in it.product(u, z) {
                            acc[m] += it.mul(c1, c2 as i128);
                        }
                    }
                }
                if acc.iter().any(|&x| red(x) != 0) {
                    return false;
                }
            }
        }
    }
    true
}

/// The invariants of a Lie algebra (the caller checks [`is_lie`]).
pub fn lie_invariants(t: &Tensor) -> LieInvariants {
    let n = t.dim();
    crate::with_field!(t.field(), f => {
        let tab = t.table(f);
        let span = |vecs: Vec<Vec<_>>| -> Vec<Vec<_>> {
            if vecs.is_empty() {
                return Vec::new();
            }
            let mut m = Matrix::from_rows(vecs, n);
            let piv = echelon::rref(f, &mut m);
            (0..piv.len()).map(|r| m.row(r).to_vec()).collect()
        };
        let whole: Vec<Vec<_>> = (0..n).map(|i| crate::tensor::Table::unit_vector(f, n, i)).collect();
        // derived series
        let mut derived = vec![n];
        let mut cur = whole.clone();
        loop {
            let mut prods = Vec::new();
            for a in 0..cur.len() {
                for b in a + 1..cur.len() {
                    prods.push(tab.mul(f, &cur[a], &cur[b]));
                }
            }
            let next = span(prods);
            if next.len() == cur.len() {
                break;
            }
            derived.push(next.len());
            cur = next;
            if cur.is_empty() {
                break;
            }
        }
        let mut lower = vec![n];
        let mut cur = whole.clone();
        loop {
            let mut prods = Vec::new();
            for x in &cur {
                for i in 0..n {
                    prods.push(tab.mul_basis_left(f, i, x));
                }
            }
            let next = span(prods);
            if next.len() == cur.len() {
                break;
            }
            lower.push(next.len());
            cur = next;
            if cur.is_empty() {
                break;
            }
        }
        // Killing form K[i][j] = sum_{a,b} c[i][b][a] c[j][a][b]
        let mut k = Matrix::zeros(f, n, n);
        for i in 0..n {
            for b in 0..n {
                for (a, c1) in tab.product(i, b) {
                    for j in 0..n {
                        for (bb, c2) in tab.product(j, *a) {
                            if *bb == b {
                                f.add_mul_assign(&mut k[(i, j)], c1, c2);
                            }
                        }
                    }
                }
            }
        }
        let killing_rank = echelon::rank(f, &k);
        let solvable = derived.last() == Some(&0);
        let nilpotent = lower.last() == Some(&0);
        let semisimple = match t.field() {
            FieldSpec::Rational => Some(killing_rank == n),
            FieldSpec::Prime(_) => None,
        };
        LieInvariants {
            derived_series: derived,
            lower_central_series: lower,
            solvable,
            nilpotent,
            killing_rank,
            semisimple,
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::*;

    #[test]
    fn sl2_and_heisenberg() {
        // sl_2 is simple: Killing form nondegenerate (Cartan's criterion), [L,L] = L:
        // Jacobson 1962, Lie Algebras, ch. I-III.
        let t = sl2();
        assert!(is_lie(&IntTable::from_tensor(&t).unwrap()));
        let l = lie_invariants(&t);
        assert_eq!(
            (l.killing_rank, l.semisimple, l.solvable),
            (3, Some(true), false)
        );
        assert_eq!(l.derived_series, vec![3]);
        // Heisenberg: [L,L] = Q z, [L,[L,L]] = 0: nilpotent of class 2, Killing form 0
        // (Jacobson 1962, ch. I; common practice).
        let h = lie_invariants(&heisenberg3());
        assert_eq!(h.lower_central_series, vec![3, 1, 0]);
        assert_eq!(h.derived_series, vec![3, 1, 0]);
        assert!(h.nilpotent && h.solvable);
        assert_eq!(h.killing_rank, 0);
        assert!(!is_lie(&IntTable::from_tensor(&octonions()).unwrap()));
    }
}
