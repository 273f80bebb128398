//! Invariant algebras of a product, exact.
//!
//! Every invariant is the solution space of a homogeneous linear system built from the
//! integer-scaled structure tensor ([`equations`], one place for all of them, written
//! modulo any prime on demand); one engine ([`crate::linalg::nullspace`]) finds a basis
//! modulo word-size primes, lifts it to Q and checks it exactly against every equation, so
//! each reported basis is proven (dimension and span). Over GF(p) the computation is exact
//! in GF(p).
//!
//! - [`elements`]: centre, commutative centre, nuclei, annihilators, unit;
//! - [`maps`]: centroid, derivations, inner derivations, adjoint algebra;
//! - [`radical`]: radical of an associative algebra over Q (trace form) and over GF(p)
//!   ([`radical_modp`]), semisimple quotient ([`quotient`]);
//! - [`lie`]: Lie-algebra series, Killing form, Cartan's criterion;
//! - [`central`]: the upper central series;
//! - [`bilinear`]: centroid / derivation triples, adjoint pairs and radicals of a map;
//! - [`structure`]: solvable, nilpotent (with class) and semisimple, with witnesses.

pub mod all;
pub mod bilinear;
pub mod central;
pub mod elements;
pub mod equations;
pub mod forms;
pub mod generated;
pub mod lie;
pub mod maps;
#[cfg(test)]
mod properties;
pub mod quotient;
pub mod radical;
pub mod radical_modp;
pub mod spans;
pub mod structure;
#[cfg(test)]
pub(crate) mod testing;

pub use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
pub use all::{Invariants, Params, Part, compute_invariants};
pub use bilinear::{MapInvariant, map_invariant};
pub use elements::{ElementSpace, element_space, unit};
pub use maps::{Centroid, adjoint_algebra, centroid, derivations, inner_derivations};
pub use radical::{Radical, radical};
