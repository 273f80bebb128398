//! bilin: exact analysis of bilinear products.
//!
//! Layers, each importing only from the ones before it:
//! 1. [`scalar`]: the fields Q and GF(p); [`poly`]: univariate polynomials and their
//!    factorisation over GF(p) and Q;
//! 2. [`linalg`]: exact dense linear algebra, with a multi-modular fast path over Q;
//! 3. [`tensor`]: structure tensors, flattenings, slices, change of basis;
//! 4. [`laws`], [`invariants`], [`structure`] (blocks, radicals, simple components, Lie
//!    structure), [`ranks`]; [`scheme`]: bilinear algorithms and their exact verification;
//!    [`search`]: searches for low-rank schemes, every result verified exactly.
//!
//! 5. reports over those: [`report`] (text and JSON), [`picture`] (SVG pictures),
//!    [`site`] (the catalog as HTML pages).
//!
//! [`error`] holds the typed errors shared by all layers; [`output`] writes result files
//! safely (atomic replacement under a lock, devices written through, links kept).

pub mod catalog;
pub mod error;
pub mod generators;
pub mod input;
pub mod invariants;
pub mod laws;
pub mod linalg;
pub mod output;
pub mod picture;
pub mod poly;
pub mod ranks;
pub mod report;
pub mod scalar;
pub mod scheme;
pub mod search;
pub mod site;
pub mod structure;
pub mod tensor;

pub use error::{Error, Result};
