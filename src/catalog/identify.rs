//! Identification of an input against the catalog: compare invariant fingerprints, list
//! the entries that match, the ones that nearly match and the invariants that separate
//! them, and for small algebras (and matrix products in bases of their own) look for an
//! explicit isomorphism, verified exactly.
//!
//! A matching fingerprint is evidence of isomorphism, never a proof; only an isomorphism
//! that has been found and checked proves it.

use super::fingerprint::{Fingerprint, FingerprintParams, compute_fingerprint};
use super::store::{Entry, all_entries};
use crate::error::Error;
use crate::iso::product::find_product_isomorphism;
use crate::iso::{
    IsoParams, LieIsoParams, find_isomorphism, find_nilpotent_isomorphism, find_split_isomorphism,
};
use crate::linalg::Matrix;
use crate::scalar::Q;
use crate::structure::matrix_frame::{FrameParams, candidate_permutations};
use crate::structure::matrix_units::SplitParams;
use crate::tensor::Tensor;
use std::collections::HashMap;
use std::sync::{Mutex, OnceLock};

/// Parameters of [`identify`].
#[derive(Clone, Debug)]
pub struct IdentifyParams {
    pub fingerprint: FingerprintParams,
    pub iso: IsoParams,
    /// The isomorphism solver for nilpotent Lie algebras.
    pub lie: LieIsoParams,
    /// Look for explicit isomorphisms with the matching entries.
    pub search_isomorphism: bool,
    /// A near match differs in at most this many fingerprint keys.
    pub max_near_differences: usize,
}

impl Default for IdentifyParams {
    fn default() -> Self {
        IdentifyParams {
            fingerprint: FingerprintParams::default(),
            iso: IsoParams::default(),
            lie: LieIsoParams::default(),
            search_isomorphism: true,
            max_near_differences: 3,
        }
    }
}

/// The outcome of the isomorphism search for one matching entry.
#[derive(Clone, Debug)]
pub enum IsoOutcome {
    /// M: the columns are the images of the input's basis vectors in the entry's basis;
    /// `change_basis_algebra(entry, M)` equals the input exactly.
    Found(Matrix<Q>),
    /// Searched within the parameters and found none (not a proof of non-isomorphism).
    NotFound,
    /// For a bilinear map: `[M_0, M_1, M_2]`, the columns of `M_a` the images of the
    /// input's basis vectors on axis a in the entry's bases; `change_basis(entry, M_0, M_1,
    /// M_2)` equals the input exactly.
    FoundMaps(Box<[Matrix<Q>; 3]>),
    /// Not attempted (the reason is given).
    NotAttempted(String),
}

/// A catalog entry whose fingerprint equals the input's.
#[derive(Clone, Debug)]
pub struct Match {
    pub name: String,
    pub iso: IsoOutcome,
}

/// A catalog entry of the same kind, field and dimensions that differs in a few keys.
#[derive(Clone, Debug)]
pub struct NearMatch {
    pub name: String,
    /// (key, the input's value, the entry's value).
    pub differences: Vec<(String, String, String)>,
}

/// The result of [`identify`].
#[derive(Clone, Debug)]
pub struct Identification {
    pub fingerprint: Fingerprint,
    pub matches: Vec<Match>,
    pub near: Vec<NearMatch>,
    /// A bilinear map with no entry of its shape proven to be a matrix product by its
    /// frame (a format whose sides are not in increasing order has no entry of its own).
    pub matrix_product: Option<ProductMatch>,
}

/// A bilinear map proven to be the matrix product `<n,m,p>` in bases of its own, with the
/// isomorphism onto the generator `matmul:n,m,p` (verified exactly), and the catalog
/// entry of the same sides in increasing order, if any: it holds the rank facts of every
/// order of the sides (the rank is invariant under permuting n, m, p).
#[derive(Clone, Debug, PartialEq)]
pub struct ProductMatch {
    pub format: [usize; 3],
    pub entry: Option<String>,
    /// Columns: the images of the input's basis vectors in the generator's bases, axis by
    /// axis ([`find_product_isomorphism`]).
    pub maps: Box<[crate::linalg::Matrix<crate::scalar::Q>; 3]>,
}

/// The matrix product a bilinear map is, with the maps onto its generator
/// ([`ProductMatch`]). Cost: that of [`find_product_isomorphism`].
pub fn match_matrix_product(t: &Tensor) -> Option<ProductMatch> {
    if t.kind() == crate::tensor::Kind::Algebra {
        return None;
    }
    let format = crate::structure::matrix_frame::format_of_dims(t.dims())?;
    let [n, m, p] = format;
    let model = crate::generators::generate(&format!("matmul:{n},{m},{p}"))
        .ok()?
        .with_field(t.field())
        .ok()?;
    let maps = find_product_isomorphism(t, &model, &FrameParams::default())?;
    Some(ProductMatch {
        format,
        entry: super::matmul_entry(format).map(|e| e.meta.name.clone()),
        maps: Box::new(maps),
    })
}

type Cache = Mutex<HashMap<(String, u64), Fingerprint>>;
static CACHE: OnceLock<Cache> = OnceLock::new();

/// The fingerprint of a catalog entry (cached per process and seed).
pub fn entry_fingerprint(e: &Entry, params: &FingerprintParams) -> Result<Fingerprint, Error> {
    let cache = CACHE.get_or_init(Default::default);
    let key = (e.meta.name.clone(), params.seed);
    if let Some(fp) = cache.lock().ok().and_then(|c| c.get(&key).cloned()) {
        return Ok(fp);
    }
    let fp = compute_fingerprint(&e.tensor()?, params);
    if let Ok(mut c) = cache.lock() {
        c.insert(key, fp.clone());
    }
    Ok(fp)
}

fn same_shape(t: &Tensor, u: &Tensor) -> bool {
    t.kind() == u.kind() && t.field() == u.field() && t.dims() == u.dims()
}

/// Look for an explicit isomorphism from `t` to the entry `et` (whose fingerprint is
/// `efp`): nilpotent Lie algebras over Q by [`find_nilpotent_isomorphism`] (solved along
/// the lower central series, any coefficients), other algebras by the bounded search of
/// [`find_isomorphism`], then, for semisimple algebras split into matrix algebras over
/// their field and copies of it, through matrix units ([`find_split_isomorphism`]); a
/// bilinear map, when both are matrix products whose frames are found
/// ([`find_product_isomorphism`]). Every isomorphism found has been verified exactly.
pub fn search_isomorphism(
    t: &Tensor,
    et: &Tensor,
    efp: &Fingerprint,
    params: &IdentifyParams,
) -> IsoOutcome {
    let nilpotent_lie = efp.get("lie").is_some_and(|v| v.to_string() == "yes")
        && efp.get("nilpotency.class").is_some()
        && t.field() == crate::scalar::FieldSpec::Rational;
    let limit = if nilpotent_lie {
        params.lie.max_dim
    } else {
        params.iso.max_dim
    };
    if !params.search_isomorphism {
        IsoOutcome::NotAttempted("the search was switched off".into())
    } else if t.kind() != crate::tensor::Kind::Algebra {
        if candidate_permutations(t.dims()).is_empty() {
            return IsoOutcome::NotAttempted(
                "for bilinear maps the search handles matrix products with two distinct \
                 coprime sides only"
                    .into(),
            );
        }
        match find_product_isomorphism(t, et, &FrameParams::default()) {
            Some(maps) => IsoOutcome::FoundMaps(Box::new(maps)),
            None => IsoOutcome::NotAttempted(
                "no standard frame of a matrix product found for both (the search for bilinear \
                 maps handles matrix products only)"
                    .into(),
            ),
        }
    } else if t.dim() > limit {
        IsoOutcome::NotAttempted(format!(
            "dimension {} is above the search limit {limit}",
            t.dim()
        ))
    } else {
        let found = if nilpotent_lie {
            find_nilpotent_isomorphism(t, et, &params.lie)
        } else {
            find_isomorphism(t, et, &params.iso)
                .or_else(|| find_split_isomorphism(t, et, &SplitParams::default()))
        };
        match found {
            Some(m) => IsoOutcome::Found(m),
            None => IsoOutcome::NotFound,
        }
    }
}

/// Identify a tensor against the catalog. Only entries with the same kind, field and
/// dimensions are compared (their fingerprints are computed on demand). Cost: one
/// fingerprint per such entry plus, per match, one bounded isomorphism search.
pub fn identify(t: &Tensor, params: &IdentifyParams) -> Result<Identification, Error> {
    let fp = compute_fingerprint(t, &params.fingerprint);
    let mut matches = Vec::new();
    let mut near = Vec::new();
    for e in all_entries()? {
        let et = e.tensor()?;
        if !same_shape(t, &et) {
            continue;
        }
        let efp = entry_fingerprint(e, &params.fingerprint)?;
        let diff = fp.differences(&efp);
        if diff.is_empty() {
            let iso = search_isomorphism(t, &et, &efp, params);
            matches.push(Match {
                name: e.meta.name.clone(),
                iso,
            });
        } else if diff.len() <= params.max_near_differences {
            let differences = diff
                .into_iter()
                .map(|k| {
                    let a = fp.get(&k).map(|v| v.to_string()).unwrap_or_default();
                    let b = efp.get(&k).map(|v| v.to_string()).unwrap_or_default();
                    (k, a, b)
                })
                .collect();
            near.push(NearMatch {
                name: e.meta.name.clone(),
                differences,
            });
        }
    }
    near.sort_by_key(|n| n.differences.len());
    // no entry of its shape: a matrix product of a format with sides out of order
    let matrix_product = (matches.is_empty() && params.search_isomorphism)
        .then(|| match_matrix_product(t))
        .flatten();
    Ok(Identification {
        fingerprint: fp,
        matches,
        near,
        matrix_product,
    })
}
