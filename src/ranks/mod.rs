//! Rank theory of a structure tensor: its slice and flattening ranks, and proven lower
//! bounds for its tensor rank R(T) and border rank.
//!
//! - [`slices`]: exact ranks of the flattenings and slices, and the largest rank in each
//!   slice span ([`compute_ranks`]).
//! - [`bound`]: the common form of a lower bound ([`Bound`]: which theorem, over which
//!   field, rank or border rank, proven or evidence) and [`lower_bounds`], which runs
//!   every bound that applies.
//! - One file per bound, each opening with its theorem: [`flattening`], [`slice_span`],
//!   [`alder_strassen`] (with [`isotope`] for bilinear maps), [`koszul_young`],
//!   [`strassen`] (the commutator bound).
//! - [`exhaustive`]: exhaustive proofs of `R > r` over GF(2) on the slice spaces, with
//!   certificates that [`rank_proof`] re-checks; [`gf2`] holds their packed matrices.
//! - [`minor`]: a nonzero minor modulo a prime, the certificate of a rank lower bound for
//!   a matrix of integers.

pub mod alder_strassen;
pub mod bound;
pub mod exhaustive;
pub mod flattening;
pub mod gf2;
pub mod isotope;
pub mod koszul_young;
pub mod minor;
pub mod rank_proof;
pub mod slice_span;
mod slices;
pub mod strassen;

pub use bound::{Bound, Bounds, BoundsParams, Measure, Method, Status, lower_bounds};
pub use slices::{AxisSlices, Params, RankReport, SpanRank, combination_rank, compute_ranks};
