//! The slice decomposition: every tensor is the sum over one axis of its slices, and each
//! slice (a matrix) of rank r is a sum of r rank-one matrices, so
//! `R(T) <= sum of the ranks of the slices along any axis` (common practice; Buergisser,
//! Clausen and Shokrollahi 1997, "Algebraic Complexity Theory", ch. 14).
//!
//! Two bases of the slice span are tried along each axis: the slices themselves, and the
//! reduced row echelon basis of the flattening (fewer matrices when the slices are
//! dependent). Each matrix M of rank r is split exactly as `M = M[:, pivots] * E`, E its
//! reduced row echelon form, one term per pivot. The result is a scheme over the tensor's
//! field; the caller verifies it (invariant of every upper bound in [`super`]).

use crate::linalg::modular::{rank_q, skeleton_q};
use crate::linalg::{Matrix, rref};
use crate::scalar::{Field, FieldSpec, Q};
use crate::scheme::Scheme;
use crate::tensor::{Tensor, flattening, others, slices};
use num_traits::Zero;

/// The slice scheme with the fewest terms over the three axes (ties: the lowest axis), and
/// that axis. Cost: O(sum over axes of d_a * rref of a d_b x d_c matrix), plus one rref of
/// each flattening.
pub fn slice_decomposition(t: &Tensor) -> (Scheme, usize) {
    if t.field() == FieldSpec::Rational {
        // over Q the terms are built along the best axis only: the echelon basis is a
        // subset of the slices (independent rows of the flattening), so the count of an
        // axis is the sum of the ranks of those slices, read before any split
        let (axis, pairs) = (0..3)
            .map(|axis| {
                let pairs = echelon_basis(t, axis);
                let count: usize = pairs.iter().map(|(m, _)| rank_q(m)).sum();
                (count, axis, pairs)
            })
            .min_by_key(|(count, axis, _)| (*count, *axis))
            .map(|(_, axis, pairs)| (axis, pairs))
            .expect("three axes");
        return (terms_of(t.field(), axis, t.dims(), &pairs), axis);
    }
    let mut best: Option<(Scheme, usize)> = None;
    for axis in 0..3 {
        let s = slice_scheme(t, axis);
        if best.as_ref().is_none_or(|(b, _)| s.rank() < b.rank()) {
            best = Some((s, axis));
        }
    }
    best.expect("three axes")
}

/// Row `r` of the flattening along `axis`, reshaped to its slice matrix.
fn slice_matrix(t: &Tensor, f: &Matrix<Q>, axis: usize, r: usize) -> Matrix<Q> {
    let d = t.dims();
    let (o1, o2) = others(axis);
    Matrix::from_rows(reshape(f.row(r), d[o1], d[o2]), d[o2])
}

/// The sum of the slice ranks along `axis`, split into rank-one terms: the better of the
/// slices themselves and the echelon basis of their span.
pub fn slice_scheme(t: &Tensor, axis: usize) -> Scheme {
    let field = t.field();
    let d = t.dims();
    if field == FieldSpec::Rational {
        // over Q the echelon basis is a subset of the slices: never more terms
        return terms_of(field, axis, d, &echelon_basis(t, axis));
    }
    // (matrix, coefficient vector along the axis) pairs whose sum of products is T
    let plain: Vec<(Matrix<Q>, Vec<Q>)> = slices(t, axis)
        .into_iter()
        .enumerate()
        .map(|(s, m)| (m, unit(d[axis], s)))
        .collect();
    let a = terms_of(field, axis, d, &plain);
    let echelon = echelon_basis(t, axis);
    let b = terms_of(field, axis, d, &echelon);
    if b.rank() < a.rank() { b } else { a }
}

pub(super) fn unit(n: usize, i: usize) -> Vec<Q> {
    let mut v = vec![Q::zero(); n];
    v[i] = Q::from_integer(1.into());
    v
}

/// The slice span as `sum_m B_m (x) z_m`: B_m the nonzero rows of the reduced flattening
/// (reshaped), z_m the pivot columns of the flattening.
pub(super) fn echelon_basis(t: &Tensor, axis: usize) -> Vec<(Matrix<Q>, Vec<Q>)> {
    let d = t.dims();
    let (o1, o2) = others(axis);
    let f = flattening(t, axis);
    if t.field() == FieldSpec::Rational {
        // f = left f[R, :]: the independent rows of the flattening, no elimination over Q
        let sk = skeleton_q(&f);
        return sk
            .rows
            .iter()
            .enumerate()
            .map(|(m, &r)| (slice_matrix(t, &f, axis, r), sk.left.column(m)))
            .collect();
    }
    let (e, piv) = reduce(t.field(), &f);
    piv.iter()
        .enumerate()
        .map(|(m, &c)| {
            let data = e.row(m).to_vec();
            (
                Matrix::from_rows(reshape(&data, d[o1], d[o2]), d[o2]),
                f.column(c),
            )
        })
        .collect()
}

fn reshape(data: &[Q], rows: usize, cols: usize) -> Vec<Vec<Q>> {
    (0..rows)
        .map(|i| data[i * cols..(i + 1) * cols].to_vec())
        .collect()
}

/// The reduced row echelon form of `m` over `field` (rational representatives) and its
/// pivot columns.
pub fn reduce(field: FieldSpec, m: &Matrix<Q>) -> (Matrix<Q>, Vec<usize>) {
    crate::with_field!(field, f => {
        let mut a = m.map(|x| f.from_rational(x).expect("tensor entries lie in its field"));
        let piv = rref(f, &mut a);
        (a.map(|x| f.to_rational(x)), piv)
    })
}

/// The exact rank-one split of a matrix: `M = sum_l col_l row_l^T` with
/// `col_l = M[:, pivot_l]`, `row_l` the l-th row of the reduced echelon form; over Q,
/// `row_l` the l-th of r independent rows and `col_l` the l-th column of `M[:, P] B^-1`
/// ([`skeleton_q`]).
pub fn rank_one_terms(field: FieldSpec, m: &Matrix<Q>) -> Vec<(Vec<Q>, Vec<Q>)> {
    if field == FieldSpec::Rational {
        // when the nonzero rows (or columns) are as many as the rank, they are the split
        let nonzero_rows: Vec<usize> = (0..m.rows)
            .filter(|&i| m.row(i).iter().any(|x| !x.is_zero()))
            .collect();
        let nonzero_cols: Vec<usize> = (0..m.cols)
            .filter(|&j| (0..m.rows).any(|i| !m[(i, j)].is_zero()))
            .collect();
        if nonzero_rows.len().min(nonzero_cols.len()) == 0 {
            return Vec::new();
        }
        let r = rank_q(m);
        if nonzero_rows.len() == r {
            return nonzero_rows
                .into_iter()
                .map(|i| (unit(m.rows, i), m.row(i).to_vec()))
                .collect();
        }
        if nonzero_cols.len() == r {
            return nonzero_cols
                .into_iter()
                .map(|j| (m.column(j), unit(m.cols, j)))
                .collect();
        }
        // M = left M[R, :] (see `skeleton_q`): the same number of terms, without the
        // growth of an elimination over Q
        let sk = skeleton_q(m);
        return sk
            .rows
            .iter()
            .enumerate()
            .map(|(l, &r)| (sk.left.column(l), m.row(r).to_vec()))
            .collect();
    }
    let (e, piv) = reduce(field, m);
    piv.iter()
        .enumerate()
        .map(|(l, &c)| (m.column(c), e.row(l).to_vec()))
        .collect()
}

/// The scheme `sum over pairs (M, z) of sum_l col_l (x) row_l (x) z`, placed on the axes
/// (rows of M on the first other axis, columns on the second, z on `axis`).
fn terms_of(field: FieldSpec, axis: usize, d: [usize; 3], pairs: &[(Matrix<Q>, Vec<Q>)]) -> Scheme {
    let mut s = Scheme::empty(field, d);
    for (m, z) in pairs {
        for (col, row) in rank_one_terms(field, m) {
            push_placed(&mut s, axis, col, row, z.clone());
        }
    }
    s
}

/// Push the term `col (x) row (x) z` with `col` on the first other axis of `axis`, `row`
/// on the second and `z` on `axis` (the placement of a slice's rank-one terms).
pub(super) fn push_placed(s: &mut Scheme, axis: usize, col: Vec<Q>, row: Vec<Q>, z: Vec<Q>) {
    let (o1, o2) = others(axis);
    let mut f: [Vec<Q>; 3] = Default::default();
    f[o1] = col;
    f[o2] = row;
    f[axis] = z;
    let [u, v, w] = f;
    s.push(u, v, w);
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::verify;

    fn tensor(dims: [usize; 3], vals: &[i64]) -> Tensor {
        let mut t = Tensor::zero(
            FieldSpec::Rational,
            crate::tensor::Kind::Bilinear,
            dims,
            None,
        );
        let mut n = 0;
        for i in 0..dims[0] {
            for j in 0..dims[1] {
                for k in 0..dims[2] {
                    t.set(i, j, k, Q::from_integer(vals[n].into()));
                    n += 1;
                }
            }
        }
        t
    }

    #[test]
    fn slice_scheme_verifies_and_counts_slice_ranks() {
        // slices [[3,5],[7,1]] and [[1,3],[5,9]] along the last axis, both of rank 2
        let t = tensor([2, 2, 2], &[3, 1, 5, 3, 7, 5, 1, 9]);
        let (s, _) = slice_decomposition(&t);
        assert!(verify(&s, &t).is_ok());
        assert!(s.rank() <= 4);
        let t2 = t.with_field(FieldSpec::Prime(7)).unwrap();
        let (s2, _) = slice_decomposition(&t2);
        assert!(verify(&s2, &t2).is_ok());
    }
}
