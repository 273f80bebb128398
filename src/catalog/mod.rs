//! The catalog: known algebras and bilinear maps with their published sources and facts,
//! embedded in the binary (`catalog/*.bilin`), plus an invariant fingerprint and the
//! identification of an input against the catalog.
//!
//! - [`meta`]: the `#:` metadata lines of an entry (name, aliases, family, sources, facts);
//! - [`classes`]: the classified ranges (published complete lists) and the separation of
//!   their entries;
//! - [`store`]: the embedded entries, lookup by name, each entry's tensor;
//! - [`fingerprint`]: invariant (key, value) lists, computed exactly;
//! - [`facts`]: recomputing the stored facts;
//! - [`identify`]: matching fingerprints and explicit isomorphisms ([`crate::iso`]);
//! - [`schemes`]: known schemes stored with the entries, verified exactly;
//! - [`doc`]: the reference page docs/catalog.md, generated from the entries.

pub mod classes;
pub mod doc;
mod entries;
pub mod facts;
pub mod fingerprint;
pub mod identify;
pub mod meta;
pub mod rank_facts;
pub mod schemes;
pub mod store;

pub use crate::iso::{IsoParams, LieIsoParams, find_isomorphism, find_nilpotent_isomorphism};
pub use facts::{FactCheck, check_fact};
pub use fingerprint::{Fingerprint, FingerprintParams, Value, compute_fingerprint};
pub use identify::{Identification, IdentifyParams, IsoOutcome, ProductMatch, identify};
pub use meta::{Fact, Meta, parse_meta};
pub use schemes::{STORED_SCHEMES, StoredScheme, find_stored, stored_schemes};
pub use store::{
    Entry, all_entries, catalog_tensor, find_entry, matmul_entry, register_input_resolver,
    resolve_catalog_name,
};

/// The embedded file names, for the test that compares them with the directory.
pub fn embedded_files() -> Vec<&'static str> {
    entries::ENTRIES.iter().map(|(f, _)| *f).collect()
}
