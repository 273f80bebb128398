//! Exact dense linear algebra over any [`Field`](crate::scalar::Field).
//!
//! - [`Matrix`]: row-major dense storage, no field attached (the field is passed to each
//!   operation).
//! - [`echelon`]: reduced row echelon form, rank, nullspace, solve, inverse, determinant over
//!   any field (Gauss-Jordan, O(r c min(r, c)) field operations).
//! - [`modular`]: a fast word-size kernel mod p < 2^31, and the rational fast path:
//!   rank and nullspace over Q through several primes, rational reconstruction and a final
//!   exact check over Q. The dispatchers [`rank_q`] and [`nullspace_q`] choose the method.
//! - [`subspace`]: subspaces in reduced form (kernels, spans, coordinates), proven by the
//!   engine of [`nullspace`]; [`charpoly`]: characteristic polynomials (Hessenberg form).

pub mod charpoly;
mod components;
pub mod dense_echelon;
pub mod echelon;
mod exact_check;
pub mod integer_rows;
pub mod kernels;
mod matrix;
pub mod modular;
pub mod nullspace;
mod primes;
pub mod sparse_echelon;
pub mod subspace;
pub mod system;

pub use charpoly::charpoly;
pub use echelon::{determinant, inverse, nullspace, rank, rref, solve};
pub use matrix::Matrix;
pub use modular::{nullspace_q, rank_q};
