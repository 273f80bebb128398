//! Kruskal's uniqueness condition. The k-rank of a list of vectors is the largest k such
//! that every k of them are linearly independent. If a decomposition
//! `T = sum_{r=1}^R a_r (x) b_r (x) c_r` has k-ranks k_A, k_B, k_C with
//! `k_A + k_B + k_C >= 2R + 2`, then it is the only decomposition of T with R terms, up
//! to the order of the terms and the scaling of their factors, over every field containing
//! the coefficients (Kruskal 1977, "Three-way arrays: rank and uniqueness of trilinear
//! decompositions, with application to arithmetic complexity and statistics", Linear
//! Algebra Appl. 18), and R is then the rank of T.

use crate::linalg::{Matrix, rank_q};
use crate::scalar::Q;
use serde::Serialize;

/// The k-ranks of the three factor lists and the verdict.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Uniqueness {
    /// k-ranks of the factors on the three axes (a lower bound where `exhaustive` is false
    /// for that axis).
    pub k_ranks: [usize; 3],
    /// Whether each k-rank was decided exactly (false: the subset count exceeded the
    /// budget and the value is a proven lower bound).
    pub exhaustive: [bool; 3],
    /// The number of terms R.
    pub terms: usize,
    /// `k_A + k_B + k_C >= 2R + 2`.
    pub unique: bool,
}

/// Subsets examined per k-rank before settling for a lower bound.
const SUBSET_BUDGET: usize = 20_000;

/// Kruskal's condition for the factors `f[axis][term]` (vectors over Q).
/// Cost: at most [`SUBSET_BUDGET`] small exact ranks per axis.
pub fn kruskal_uniqueness(f: [&[Vec<Q>]; 3]) -> Uniqueness {
    let r = f[0].len();
    let mut k = [0; 3];
    let mut ex = [true; 3];
    for a in 0..3 {
        (k[a], ex[a]) = k_rank(f[a]);
    }
    Uniqueness {
        k_ranks: k,
        exhaustive: ex,
        terms: r,
        unique: k.iter().sum::<usize>() >= 2 * r + 2,
    }
}

/// The k-rank of `vs` (exact, true) or a proven lower bound (false) when the subsets to
/// examine exceed the budget.
pub fn k_rank(vs: &[Vec<Q>]) -> (usize, bool) {
    let n = vs.len();
    if n == 0 {
        return (0, true);
    }
    if independent(vs, &(0..n).collect::<Vec<_>>()) {
        return (n, true);
    }
    let mut spent = 0usize;
    let mut k = 0;
    for size in 1..n {
        let mut idx: Vec<usize> = (0..size).collect();
        loop {
            spent += 1;
            if spent > SUBSET_BUDGET {
                return (k, false);
            }
            if !independent(vs, &idx) {
                return (k, true);
            }
            if !next_subset(&mut idx, n) {
                break;
            }
        }
        k = size;
    }
    (k, true)
}

fn independent(vs: &[Vec<Q>], idx: &[usize]) -> bool {
    let rows: Vec<Vec<Q>> = idx.iter().map(|&i| vs[i].clone()).collect();
    let cols = vs[0].len();
    idx.len() <= cols && rank_q(&Matrix::from_rows(rows, cols)) == idx.len()
}

/// The next k-subset of 0..n in lexicographic order; false after the last.
fn next_subset(idx: &mut [usize], n: usize) -> bool {
    let k = idx.len();
    for i in (0..k).rev() {
        if idx[i] < n - k + i {
            idx[i] += 1;
            for j in i + 1..k {
                idx[j] = idx[j - 1] + 1;
            }
            return true;
        }
    }
    false
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    fn v(xs: &[i64]) -> Vec<Q> {
        xs.iter().map(|&x| q(x, 1)).collect()
    }

    #[test]
    fn k_rank_of_small_lists() {
        // three vectors in the plane, pairwise independent: k-rank 2
        assert_eq!(k_rank(&[v(&[1, 0]), v(&[0, 1]), v(&[1, 1])]), (2, true));
        // a repeated direction: k-rank 1
        assert_eq!(k_rank(&[v(&[1, 2]), v(&[2, 4]), v(&[0, 1])]), (1, true));
        // a basis: full
        assert_eq!(
            k_rank(&[v(&[1, 0, 0]), v(&[0, 1, 0]), v(&[0, 0, 1])]),
            (3, true)
        );
    }
}
