//! Exact decompositions of a tensor into rank-one terms (a scheme of rank r is an exact CP
//! decomposition with r terms), one file per method:
//! - [`slices`]: the sum of the slice ranks along the best axis (any tensor, any field);
//! - [`simultaneous`]: simultaneous diagonalisation over Q when the rank is at most two of
//!   the three dimensions, with Kruskal's uniqueness ([`kruskal`]);
//! - [`pencil`]: slices grouped (most often in pairs, matrix pencils), each group split
//!   by evaluation at rational points (over Q; fewer terms than the slice ranks for
//!   general data);
//! - [`eigen`]: rational eigenvalues, found numerically and confirmed exactly;
//! - [`monogenic`]: a commutative algebra with one generator, by the Chinese remainder
//!   theorem and interpolation (rank 2n - t, the exact rank);
//! - [`evaluation`]: a product of polynomials, by evaluation at m + n - 1 points of the
//!   projective line and interpolation (rank m + n - 1, the exact rank).
//!
//! Invariant: every scheme returned here has passed the exact verification against the
//! tensor over its field.

pub mod eigen;
pub mod evaluation;
pub mod kruskal;
pub mod matrix_product;
pub mod monogenic;
pub mod pencil;
pub mod planted;
pub mod semisimple;
pub mod simultaneous;
pub mod slices;
pub mod transport;

pub use kruskal::Uniqueness;
pub use pencil::{PencilParams, pencil_decomposition};
pub use simultaneous::{Simultaneous, SimultaneousParams, simultaneous_diagonalisation};
pub use slices::{slice_decomposition, slice_scheme};

use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;

/// A verified decomposition and how it was obtained.
#[derive(Clone, Debug)]
pub struct Decomposition {
    pub scheme: Scheme,
    /// `simultaneous diagonalisation` or `slices`.
    pub method: &'static str,
    /// What the method proves or assumes, in words.
    pub detail: String,
    /// For simultaneous diagonalisation: Kruskal's condition (then the rank is exact).
    pub uniqueness: Option<Uniqueness>,
    /// Why simultaneous diagonalisation did not apply, when it did not.
    pub note: Option<String>,
}

/// The best exact decomposition available without search: simultaneous diagonalisation
/// when it applies, else the slice decomposition. Cost: that of the two methods.
pub fn decompose(t: &Tensor, params: &SimultaneousParams) -> Decomposition {
    let fallback = |why: String| {
        let (s, axis) = slice_decomposition(t);
        Decomposition {
            detail: format!(
                "sum of the slice ranks along the {} axis",
                crate::tensor::AXES[axis]
            ),
            scheme: s,
            method: "slices",
            uniqueness: None,
            note: Some(format!("simultaneous diagonalisation not applied: {why}")),
        }
    };
    let d = match simultaneous_diagonalisation(t, params) {
        Ok(s) => Decomposition {
            detail: format!(
                "simultaneous diagonalisation of two combinations of the {} slices",
                crate::tensor::AXES[s.axes[2]]
            ),
            scheme: s.scheme,
            method: "simultaneous diagonalisation",
            uniqueness: Some(s.uniqueness),
            note: None,
        },
        Err(why) => fallback(why),
    };
    debug_assert!(verify(&d.scheme, t).is_ok());
    d
}
