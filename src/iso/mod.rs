//! Explicit isomorphisms between algebras (and matrix products), each verified exactly: a map is returned only
//! after the change of basis it defines reproduces the other algebra's structure constants
//! coefficient by coefficient. "Not found" never means "not isomorphic".
//!
//! - [`nilpotent`]: nilpotent Lie algebras over Q, solved along the lower central series
//!   (any coefficients);
//! - [`bounded`]: any small algebra, by a bounded search over images with small integer
//!   coordinates;
//! - [`split`]: semisimple algebras that split into matrix algebras over their field and
//!   copies of it, any coefficients, through matrix units;
//! - [`product`]: matrix products written in three bases of their own, any coefficients,
//!   through the frames of both.
//!
//! The catalog's identification calls these; they use only the layers below (scalars,
//! linear algebra, tensors, laws, and the structure theory for the matrix units).

pub mod bounded;
pub mod nilpotent;
pub mod product;
pub mod split;

pub use bounded::{IsoParams, find_isomorphism};
pub use nilpotent::{LieIsoParams, find_nilpotent_isomorphism, is_nilpotent_lie};
pub use split::find_split_isomorphism;

use crate::linalg::{Matrix, solve};
use crate::scalar::{Field, Q};
use crate::tensor::Tensor;
use num_traits::Zero;

/// Coefficients of `v` in the span of `cols`, if it lies there.
pub(crate) fn express(field: crate::scalar::FieldSpec, cols: &[Vec<Q>], v: &[Q]) -> Option<Vec<Q>> {
    let n = v.len();
    if cols.is_empty() {
        return if v.iter().all(|x| x.is_zero()) {
            Some(Vec::new())
        } else {
            None
        };
    }
    crate::with_field!(field, f => {
        let mut data = Vec::with_capacity(n * cols.len());
        for r in 0..n {
            for c in cols {
                data.push(f.from_rational(&c[r]).expect("in field"));
            }
        }
        let m = Matrix { rows: n, cols: cols.len(), data };
        let b: Vec<_> = v.iter().map(|x| f.from_rational(x).expect("in field")).collect();
        solve(f, &m, &b).map(|x| x.iter().map(|y| f.to_rational(y)).collect())
    })
}

/// Whether two tensors have the same structure constants, coefficient by coefficient.
pub fn same_constants(a: &Tensor, b: &Tensor) -> bool {
    a.entries()
        .map(|(i, j, k, v)| (i, j, k, v.clone()))
        .eq(b.entries().map(|(i, j, k, v)| (i, j, k, v.clone())))
}
