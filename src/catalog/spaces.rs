//! Dimensions of the linear invariant subspaces of an algebra, each the kernel of an exact
//! linear system built from the structure constants: annihilator, commutant (commutative
//! centre), nucleus, centre, derivations, and the unit element.
//!
//! All are invariant under change of basis, so their dimensions are isomorphism invariants.

use super::dense::Dense;
use crate::linalg::{Matrix, solve};
use crate::scalar::{Field, Q};
use num_traits::Zero;

/// dim {x : x A = A x = 0}. Linear system of 2 n^2 equations in n unknowns.
pub fn annihilator_dim(d: &Dense) -> usize {
    let n = d.n;
    let mut rows = Vec::new();
    for j in 0..n {
        for k in 0..n {
            rows.push((0..n).map(|i| d.at(i, j, k).clone()).collect());
            rows.push((0..n).map(|i| d.at(j, i, k).clone()).collect());
        }
    }
    n - d.rank_rows(rows, n)
}

fn commutant_rows(d: &Dense) -> Vec<Vec<Q>> {
    let n = d.n;
    let mut rows = Vec::new();
    for j in 0..n {
        for k in 0..n {
            rows.push((0..n).map(|i| d.at(i, j, k) - d.at(j, i, k)).collect());
        }
    }
    rows
}

fn nucleus_rows(d: &Dense, assoc: &[Vec<Q>]) -> Vec<Vec<Q>> {
    let n = d.n;
    let a = |i: usize, j: usize, k: usize| &assoc[(i * n + j) * n + k];
    let mut rows = Vec::new();
    for p in 0..n {
        for q in 0..n {
            for l in 0..n {
                rows.push((0..n).map(|i| a(i, p, q)[l].clone()).collect());
                rows.push((0..n).map(|i| a(p, i, q)[l].clone()).collect());
                rows.push((0..n).map(|i| a(p, q, i)[l].clone()).collect());
            }
        }
    }
    rows
}

/// dim of the commutant {x : x y = y x for all y}.
pub fn commutant_dim(d: &Dense) -> usize {
    d.n - d.rank_rows(commutant_rows(d), d.n)
}

/// dim of the nucleus {x : (x,A,A) = (A,x,A) = (A,A,x) = 0}.
pub fn nucleus_dim(d: &Dense, assoc: &[Vec<Q>]) -> usize {
    d.n - d.rank_rows(nucleus_rows(d, assoc), d.n)
}

/// dim of the centre = commutant intersected with the nucleus (Schafer 1966, An
/// Introduction to Nonassociative Algebras, ch. II). For a Lie algebra over a field of
/// characteristic not 2 this is the usual centre (the annihilator).
pub fn centre_dim(d: &Dense, assoc: &[Vec<Q>]) -> usize {
    let mut rows = commutant_rows(d);
    rows.extend(nucleus_rows(d, assoc));
    d.n - d.rank_rows(rows, d.n)
}

/// dim Der(A): linear maps D with D(xy) = D(x) y + x D(y). Unknowns d[r][s] (D e_s has
/// coordinate d[r][s] on e_r); n^3 equations in n^2 unknowns. Cost: one exact rank of an
/// n^3 x n^2 matrix (multi-modular over Q).
pub fn derivations_dim(d: &Dense) -> usize {
    let n = d.n;
    let mut rows = Vec::with_capacity(n * n * n);
    for i in 0..n {
        for j in 0..n {
            for l in 0..n {
                let mut row = vec![Q::zero(); n * n];
                // D(e_i e_j)_l = sum_m c[i][j][m] d[l][m]
                for m in 0..n {
                    row[l * n + m] += d.at(i, j, m);
                }
                // - (D e_i) e_j: sum_k d[k][i] c[k][j][l]
                for k in 0..n {
                    row[k * n + i] -= d.at(k, j, l);
                    row[k * n + j] -= d.at(i, k, l);
                }
                rows.push(row);
            }
        }
    }
    n * n - d.rank_rows(rows, n * n)
}

/// The two-sided unit, if any: the solution u of `u e_j = e_j = e_j u` for all j
/// (unique when it exists). Cost: one solve of 2 n^2 equations in n unknowns.
pub fn unit_element(d: &Dense) -> Option<Vec<Q>> {
    let n = d.n;
    crate::with_field!(d.field, f => {
        let mut data = Vec::with_capacity(2 * n * n * n);
        let mut rhs = Vec::with_capacity(2 * n * n);
        for j in 0..n {
            for k in 0..n {
                for i in 0..n {
                    data.push(f.from_rational(d.at(i, j, k)).expect("in field"));
                }
                rhs.push(if j == k { f.one() } else { f.zero() });
                for i in 0..n {
                    data.push(f.from_rational(d.at(j, i, k)).expect("in field"));
                }
                rhs.push(if j == k { f.one() } else { f.zero() });
            }
        }
        let m = Matrix { rows: 2 * n * n, cols: n, data };
        solve(f, &m, &rhs).map(|x| x.iter().map(|v| f.to_rational(v)).collect::<Vec<Q>>())
    })
}

/// The sequence of dimensions of a chain of subspaces A = S_0 ⊇ S_1 ⊇ ... computed by
/// `next` until it stabilises (at most n + 1 steps).
fn chain_dims(d: &Dense, next: impl Fn(&[Vec<Q>]) -> Vec<Vec<Q>>) -> Vec<usize> {
    let mut cur = d.full_basis();
    let mut dims = vec![cur.len()];
    for _ in 0..=d.n {
        let nx = next(&cur);
        let stop = nx.len() == cur.len();
        cur = nx;
        if stop {
            break;
        }
        dims.push(cur.len());
    }
    dims
}

/// Dimensions of the derived series A, A^2 = AA, (A^2)(A^2), ... until it stabilises.
pub fn derived_series(d: &Dense) -> Vec<usize> {
    chain_dims(d, |s| d.product_space(s, s))
}

/// Dimensions of the lower central series A, A^2, A^3 = A A^2 + A^2 A, ... until stable.
pub fn lower_central_series(d: &Dense) -> Vec<usize> {
    let all = d.full_basis();
    chain_dims(d, |s| {
        let mut v = d.product_space(&all, s);
        v.extend(d.product_space(s, &all));
        d.span_basis(&v)
    })
}

/// dim of the span of all squares x x: spanned by `e_i e_i` and `e_i e_j + e_j e_i`.
pub fn squares_dim(d: &Dense) -> usize {
    let n = d.n;
    let mut rows = Vec::new();
    for i in 0..n {
        for j in i..n {
            let mut v = d.basis_product(i, j);
            if i != j {
                for (x, y) in v.iter_mut().zip(d.basis_product(j, i)) {
                    *x += y;
                }
            }
            rows.push(v);
        }
    }
    d.rank_rows(rows, n)
}
