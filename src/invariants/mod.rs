//! Invariant algebras of a product, exact.
//!
//! Every invariant is the solution space of a homogeneous linear system built from the
//! structure tensor ([`equations`], one place for all of them, as sparse rows over the
//! integers: [`system`]); one engine ([`solve`]) finds a basis modulo word-size primes,
//! lifts it to Q and checks it exactly against every equation, so each reported basis is
//! proven (dimension and span). Over GF(p) the computation is exact in GF(p).
//!
//! - [`elements`]: centre, commutative centre, nuclei, annihilators, unit;
//! - [`maps`]: centroid, derivations, inner derivations, adjoint algebra;
//! - [`radical`]: radical of an associative algebra over Q (trace form), semisimple quotient;
//! - [`lie`]: Lie-algebra series, Killing form, Cartan's criterion;
//! - [`bilinear`]: centroid / derivation triples, adjoint pairs and radicals of a map.

pub mod bilinear;
pub mod elements;
pub mod equations;
pub mod lie;
pub mod maps;
#[cfg(test)]
mod properties;
pub mod radical;
pub mod solve;
pub mod sparse_echelon;
pub mod system;
#[cfg(test)]
pub(crate) mod testing;

pub use bilinear::{MapInvariant, map_invariant};
pub use elements::{ElementSpace, element_space, unit};
pub use maps::{Centroid, adjoint_algebra, centroid, derivations, inner_derivations};
pub use radical::{Radical, radical};
pub use solve::{SolveParams, Space, solve_nullspace};
pub use system::{IntTable, SparseSystem};

/// True when the algebra is associative: the associator system has no nonzero equation
/// (every coefficient of `(e_i e_j) e_k - e_i (e_j e_k)` vanishes exactly).
/// Cost: O(n^3 + nnz^2 / n).
pub fn is_associative(it: &IntTable) -> crate::Result<bool> {
    Ok(equations::associator(it, equations::Slot::Left)?.rows() == 0)
}
