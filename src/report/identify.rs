//! The `identify` report as data: the invariant fingerprint of an input, the catalog
//! entries with the same fingerprint (with an explicit isomorphism, verified exactly,
//! where one was found), and the near matches with the invariants that separate them.
//!
//! JSON schema `bilin.identify/2`, documented in docs/identify-json.md. The types both
//! serialize and deserialize (unknown fields are refused), so a reader can load the JSON
//! back into them; adding a field bumps nothing only if readers ignore it, so new fields
//! come with a new schema version.

use crate::catalog::fingerprint::Value;
use crate::catalog::{Identification, IsoOutcome};
use crate::linalg::Matrix;
use crate::scalar::{Q, q_to_string};
use crate::tensor::{Kind, Tensor};
use serde::{Deserialize, Serialize};

/// The schema identifier of the identify report.
pub const IDENTIFY_SCHEMA: &str = "bilin.identify/2";

/// The whole report.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct IdentifyReport {
    /// Always [`IDENTIFY_SCHEMA`].
    pub schema: String,
    /// How the user named the input.
    pub input: String,
    pub kind: Kind,
    /// `Q` or `GF(p)`.
    pub field: String,
    pub dims: [usize; 3],
    /// The input's left basis names (the order of the columns of an isomorphism).
    pub basis: Vec<String>,
    pub fingerprint: Vec<FingerprintItem>,
    pub matches: Vec<MatchItem>,
    pub near: Vec<NearItem>,
    /// A bilinear map with no entry of its shape, proven to be a matrix product.
    pub matrix_product: Option<ProductItem>,
}

/// The matrix product a bilinear map was proven to be by its frame, the catalog entry of
/// its sides in increasing order (null when there is none), and the isomorphism onto the
/// generator `matmul:n,m,p`: `left[j]` is basis vector j of the input's left space in the
/// generator's basis, likewise `right` and `result`.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ProductItem {
    pub format: [usize; 3],
    pub entry: Option<String>,
    pub left: Vec<Vec<String>>,
    pub right: Vec<Vec<String>>,
    pub result: Vec<Vec<String>>,
}

/// One invariant: its key, its typed value and its text as printed by `identify`.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case", deny_unknown_fields)]
pub enum FingerprintItem {
    Bool {
        key: String,
        value: bool,
        text: String,
    },
    Int {
        key: String,
        value: usize,
        text: String,
    },
    Ints {
        key: String,
        value: Vec<usize>,
        text: String,
    },
    Text {
        key: String,
        value: String,
        text: String,
    },
    /// A rational number up to squares: `value` is its squarefree integer representative.
    SquareClass {
        key: String,
        value: String,
        text: String,
    },
}

impl FingerprintItem {
    /// The invariant's key.
    pub fn key(&self) -> &str {
        match self {
            FingerprintItem::Bool { key, .. }
            | FingerprintItem::Int { key, .. }
            | FingerprintItem::Ints { key, .. }
            | FingerprintItem::Text { key, .. }
            | FingerprintItem::SquareClass { key, .. } => key,
        }
    }
}

/// A catalog entry with the same fingerprint.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MatchItem {
    pub name: String,
    pub isomorphism: Isomorphism,
}

/// The outcome of the search for an explicit isomorphism.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(tag = "status", rename_all = "kebab-case", deny_unknown_fields)]
pub enum Isomorphism {
    /// `images[j]`: basis vector j of the input written in the entry's basis (exact
    /// rationals as text); verified exactly.
    Found { images: Vec<Vec<String>> },
    /// For a bilinear map: `left[j]`, `right[j]`, `result[j]`: basis vector j of the
    /// input's axis written in the entry's basis of that axis; verified exactly.
    FoundMaps {
        left: Vec<Vec<String>>,
        right: Vec<Vec<String>>,
        result: Vec<Vec<String>>,
    },
    /// None with integer coordinates in `-bound..=bound` (not a proof either way).
    NotFound { bound: i64 },
    /// Not attempted, for the reason given.
    NotAttempted { reason: String },
}

/// A catalog entry of the same kind, field and dimensions that differs in a few invariants.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NearItem {
    pub name: String,
    pub differences: Vec<Difference>,
}

/// One separating invariant.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Difference {
    pub key: String,
    /// The input's value, as text.
    pub input: String,
    /// The entry's value, as text.
    pub entry: String,
}

fn item(key: &str, v: &Value) -> FingerprintItem {
    let key = key.to_string();
    let text = v.to_string();
    match v {
        Value::Bool(b) => FingerprintItem::Bool {
            key,
            value: *b,
            text,
        },
        Value::Int(n) => FingerprintItem::Int {
            key,
            value: *n,
            text,
        },
        Value::Ints(x) => FingerprintItem::Ints {
            key,
            value: x.clone(),
            text,
        },
        Value::Text(s) => FingerprintItem::Text {
            key,
            value: s.clone(),
            text,
        },
        Value::SquareClass(_) => FingerprintItem::SquareClass {
            key,
            value: text.clone(),
            text,
        },
    }
}

/// The report of an identification of `t` (named `input` by the user); `bound` is the
/// coordinate bound the isomorphism search used.
pub fn identify_report(input: &str, t: &Tensor, id: &Identification, bound: i64) -> IdentifyReport {
    IdentifyReport {
        schema: IDENTIFY_SCHEMA.to_string(),
        input: input.to_string(),
        kind: t.kind(),
        field: t.field().name(),
        dims: t.dims(),
        basis: t.names()[0].clone(),
        fingerprint: id
            .fingerprint
            .entries
            .iter()
            .map(|(k, v)| item(k, v))
            .collect(),
        matches: id
            .matches
            .iter()
            .map(|m| MatchItem {
                name: m.name.clone(),
                isomorphism: match &m.iso {
                    IsoOutcome::Found(mat) => Isomorphism::Found {
                        images: images(mat),
                    },
                    IsoOutcome::FoundMaps(maps) => Isomorphism::FoundMaps {
                        left: images(&maps[0]),
                        right: images(&maps[1]),
                        result: images(&maps[2]),
                    },
                    IsoOutcome::NotFound => Isomorphism::NotFound { bound },
                    IsoOutcome::NotAttempted(why) => Isomorphism::NotAttempted {
                        reason: why.clone(),
                    },
                },
            })
            .collect(),
        near: id
            .near
            .iter()
            .map(|n| NearItem {
                name: n.name.clone(),
                differences: n
                    .differences
                    .iter()
                    .map(|(key, a, b)| Difference {
                        key: key.clone(),
                        input: a.clone(),
                        entry: b.clone(),
                    })
                    .collect(),
            })
            .collect(),
        matrix_product: id.matrix_product.as_ref().map(|p| ProductItem {
            format: p.format,
            entry: p.entry.clone(),
            left: images(&p.maps[0]),
            right: images(&p.maps[1]),
            result: images(&p.maps[2]),
        }),
    }
}

/// The report as pretty-printed JSON.
pub fn render_identify_json(r: &IdentifyReport) -> String {
    serde_json::to_string_pretty(r).expect("the report serializes")
}

/// The columns of a change of basis as exact rationals in text: column j is the image of
/// basis vector j.
fn images(m: &Matrix<Q>) -> Vec<Vec<String>> {
    (0..m.cols)
        .map(|j| (0..m.rows).map(|i| q_to_string(&m[(i, j)])).collect())
        .collect()
}
