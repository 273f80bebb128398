//! Vector helpers of the block decomposition: field elements to Q, solution spaces as
//! vectors, coordinates through a set of columns, primitive scalings.

use super::*;

pub(super) fn to_q<F: Field>(f: &F, v: &[F::Elem]) -> Vec<Q> {
    v.iter().map(|x| f.to_rational(x)).collect()
}

pub(super) fn from_space<F: Field>(f: &F, sp: &Space) -> Vec<Vec<F::Elem>> {
    (0..sp.dim())
        .map(|i| {
            sp.dense(i)
                .iter()
                .map(|x| f.from_rational(x).expect("in the field"))
                .collect()
        })
        .collect()
}

/// A square matrix over Q whose columns are the given vectors.
pub(super) fn columns_matrix<F: Field>(f: &F, cols: &[Vec<F::Elem>], n: usize) -> Matrix<Q> {
    let mut m = Matrix::filled(n, n, Q::default());
    for (j, c) in cols.iter().enumerate() {
        for (i, x) in c.iter().enumerate() {
            m[(i, j)] = f.to_rational(x);
        }
    }
    m
}

/// `sum_i c_i cols_i` in the old coordinates.
pub(super) fn through<F: Field>(
    f: &F,
    v: &[F::Elem],
    cols: &[Vec<F::Elem>],
    n: usize,
) -> Vec<F::Elem> {
    let mut out = vec![f.zero(); n];
    for (c, col) in v.iter().zip(cols) {
        if f.is_zero(c) {
            continue;
        }
        for (o, x) in out.iter_mut().zip(col) {
            f.add_mul_assign(o, c, x);
        }
    }
    out
}

/// Over Q, the primitive integer vector on the line of v (a nicer basis vector); over
/// GF(p), v itself.
pub(super) fn primitive_vector<F: Field>(f: &F, v: &[F::Elem]) -> Vec<F::Elem> {
    if f.characteristic() != 0 {
        return v.to_vec();
    }
    let z = crate::poly::integer::primitive(&to_q(f, v));
    if z.is_empty() {
        return v.to_vec();
    }
    // `primitive` makes the last nonzero entry positive; keep the sign of the first
    // nonzero entry of v instead
    let first = v.iter().position(|x| !f.is_zero(x)).expect("nonzero");
    let flip =
        (f.to_rational(&v[first]) < Q::default()) != (z[first] < num_bigint::BigInt::default());
    (0..v.len())
        .map(|i| {
            let x = z.get(i).cloned().unwrap_or_default();
            let x = if flip { -x } else { x };
            f.from_rational(&Q::from_integer(x)).expect("an integer")
        })
        .collect()
}
