//! Flattenings and slices of a structure tensor, and their ranks.
//!
//! Flattening along axis a: the matrix whose rows are indexed by axis a and whose columns
//! are indexed by the pairs of the two other axes (in their order). Its rank is the rank
//! of the linear map U -> Hom(V, W) (axis 0), and so on. Slice `s` along axis a: the matrix
//! of the coefficients with index s on axis a, rows and columns indexed by the other two
//! axes in their order.

use super::Tensor;
use crate::linalg::{self, Matrix};
use crate::scalar::{FieldSpec, Q};
use num_traits::Zero;

/// The flattening along `axis` (0, 1 or 2), a `dims[axis] x (product of the others)`
/// matrix over Q (over GF(p), the integer representatives).
pub fn flattening(t: &Tensor, axis: usize) -> Matrix<Q> {
    let d = t.dims();
    let (o1, o2) = others(axis);
    let mut m = Matrix::filled(d[axis], d[o1] * d[o2], Q::zero());
    for (i, j, k, v) in t.entries() {
        let idx = [i, j, k];
        m[(idx[axis], idx[o1] * d[o2] + idx[o2])] = v.clone();
    }
    m
}

/// The two other axes of `axis`, in increasing order.
pub fn others(axis: usize) -> (usize, usize) {
    match axis {
        0 => (1, 2),
        1 => (0, 2),
        _ => (0, 1),
    }
}

/// Slice `s` along `axis`: rows indexed by the first other axis, columns by the second.
pub fn slice(t: &Tensor, axis: usize, s: usize) -> Matrix<Q> {
    let d = t.dims();
    let (o1, o2) = others(axis);
    let mut m = Matrix::filled(d[o1], d[o2], Q::zero());
    for (i, j, k, v) in t.entries() {
        let idx = [i, j, k];
        if idx[axis] == s {
            m[(idx[o1], idx[o2])] = v.clone();
        }
    }
    m
}

/// All slices along `axis`.
pub fn slices(t: &Tensor, axis: usize) -> Vec<Matrix<Q>> {
    (0..t.dims()[axis]).map(|s| slice(t, axis, s)).collect()
}

/// Exact rank of a matrix of tensor coefficients over the tensor's field.
pub fn rank_over(field: FieldSpec, m: &Matrix<Q>) -> usize {
    match field {
        FieldSpec::Rational => linalg::rank_q(m),
        FieldSpec::Prime(_) => crate::with_field!(field, f => {
            let mm = m.map(|x| crate::scalar::Field::from_rational(f, x).expect("in field"));
            linalg::rank(f, &mm)
        }),
    }
}

/// The three flattening ranks, exact over the tensor's field.
pub fn flattening_ranks(t: &Tensor) -> [usize; 3] {
    [0, 1, 2].map(|a| rank_over(t.field(), &flattening(t, a)))
}
