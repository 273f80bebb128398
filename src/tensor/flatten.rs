//! Flattenings and slices of a structure tensor, and their ranks.
//!
//! Flattening along axis a: the matrix whose rows are indexed by axis a and whose columns
//! are indexed by the pairs of the two other axes (in their order). Its rank is the rank
//! of the linear map U -> Hom(V, W) (axis 0), and so on. Slice `s` along axis a: the matrix
//! of the coefficients with index s on axis a, rows and columns indexed by the other two
//! axes in their order.

use super::{IntegralTensor, Tensor};
use crate::linalg::nullspace::rank_of_system;
use crate::linalg::system::{RowBuf, RowSource};
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
/// Cost: three eliminations modulo a prime of matrices with `dims[axis]` columns (plus an
/// exact nullspace when a rank is not full).
pub fn flattening_ranks(t: &Tensor) -> [usize; 3] {
    if let FieldSpec::Prime(q) = t.field()
        && q >= 1 << crate::linalg::kernels::KERNEL_PRIME_BITS
    {
        return [0, 1, 2].map(|a| rank_over(t.field(), &flattening(t, a)));
    }
    flattening_ranks_of(&IntegralTensor::from_tensor(t))
}

/// A matrix made of the integer-scaled constants, as a linear system whose unknowns index
/// one side of the matrix (its rank is `unknowns - nullity`, the same for the matrix and
/// its transpose):
/// - `Flattening(axis)`: unknowns the basis of `axis`, one equation per pair of indices
///   of the two other axes;
/// - `Combination(axis, c, transposed)`: the slice combination `sum_s c_s M_s` along
///   `axis` (rows, columns: the other axes in order), with unknowns its columns, or its
///   rows when transposed.
///
/// Entries are at most `sum |c_s| C` in absolute value (C the largest constant).
pub struct Unfolding<'a> {
    pub it: &'a IntegralTensor,
    pub axis: usize,
    /// `None`: the flattening; `Some(c)`: a slice combination.
    pub coefs: Option<&'a [i64]>,
    pub transposed: bool,
}

impl Unfolding<'_> {
    /// Rows and unknowns: (number of equations, number of unknowns).
    fn shape(&self) -> (usize, usize) {
        let d = self.it.dims;
        let (o1, o2) = others(self.axis);
        match self.coefs {
            None => (d[o1] * d[o2], d[self.axis]),
            Some(_) if self.transposed => (d[o2], d[o1]),
            Some(_) => (d[o1], d[o2]),
        }
    }
}

impl RowSource for Unfolding<'_> {
    fn unknowns(&self) -> usize {
        self.shape().1
    }
    fn blocks(&self) -> usize {
        self.shape().0
    }
    fn modulus(&self) -> Option<u64> {
        self.it.modulus()
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        let residues = self.it.residues(p);
        let t = &*residues;
        let d = self.it.dims;
        let (o1, o2) = others(self.axis);
        // the coefficient at index triple idx, accumulated
        let at = |idx: [usize; 3]| -> u64 {
            let (ks, vs) = t.row(idx[0], idx[1]);
            ks.binary_search(&(idx[2] as u32))
                .map(|x| vs[x] as u64)
                .unwrap_or(0)
        };
        match self.coefs {
            None => {
                let (u, v) = (b / d[o2], b % d[o2]);
                for x in 0..d[self.axis] {
                    let mut idx = [0; 3];
                    idx[self.axis] = x;
                    idx[o1] = u;
                    idx[o2] = v;
                    let c = at(idx);
                    if c != 0 {
                        out.add(0, x, c);
                    }
                }
            }
            Some(coefs) => {
                let (len, other) = if self.transposed {
                    (d[o1], o2)
                } else {
                    (d[o2], o1)
                };
                let nonzero: Vec<(usize, i64)> = coefs
                    .iter()
                    .copied()
                    .enumerate()
                    .filter(|(_, c)| *c != 0)
                    .collect();
                for x in 0..len {
                    let mut acc: u128 = 0;
                    for &(s, cs) in &nonzero {
                        let mut idx = [0; 3];
                        idx[self.axis] = s;
                        idx[other] = b;
                        idx[if self.transposed { o1 } else { o2 }] = x;
                        let c = at(idx);
                        if c != 0 {
                            acc += cs.rem_euclid(p as i64) as u128 * c as u128;
                        }
                    }
                    let v = (acc % p as u128) as u64;
                    if v != 0 {
                        out.add(0, x, v);
                    }
                }
            }
        }
        out.end_block(1);
    }
    fn term_bits(&self) -> u64 {
        let s: u64 = self
            .coefs
            .map(|c| c.iter().map(|x| x.unsigned_abs()).sum())
            .unwrap_or(1);
        (64 - s.max(1).leading_zeros() as u64) + self.it.constant_bits()
    }
    fn estimated_terms(&self) -> usize {
        let (r, c) = self.shape();
        r * c
    }
}

/// The exact rank of an unfolding over the tensor's field (see [`Unfolding`]).
/// Cost: one elimination modulo a prime, and the exact nullspace when the rank is not
/// full.
pub fn unfolding_rank(u: &Unfolding) -> usize {
    rank_of_system(u).unwrap_or_else(|_| u.unknowns())
}

/// The three flattening ranks of an integer-scaled tensor.
pub fn flattening_ranks_of(it: &IntegralTensor) -> [usize; 3] {
    [0, 1, 2].map(|axis| {
        unfolding_rank(&Unfolding {
            it,
            axis,
            coefs: None,
            transposed: false,
        })
    })
}
