//! Classified ranges: published lists that are complete up to isomorphism in a range of
//! dimensions (nilpotent Lie algebras of dimension at most 6, solvable Lie algebras of
//! dimension at most 4, the group algebras of the groups of order at most 16). An entry
//! belongs to a range through a `#: class RANGE LABEL` line, the label being the paper's.
//!
//! [`separate_pairs`] decides, for every pair of entries of one range and one dimension,
//! whether a fingerprint key separates them (the first such key is reported) or, when the
//! fingerprints agree, whether an explicit isomorphism is found
//! ([`super::identify::search_isomorphism`]); a pair
//! with neither is reported as undecided.

use super::identify::{IdentifyParams, IsoOutcome, entry_fingerprint, search_isomorphism};
use super::store::{Entry, all_entries};
use crate::error::Error;
use crate::linalg::Matrix;
use crate::scalar::Q;
use std::collections::BTreeMap;

/// What a published count counts.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Counted {
    /// Isomorphism classes over Q (for groups: groups up to isomorphism).
    Classes,
    /// Labels of the list, a one-parameter family counting once.
    Labels,
}

/// One classified range.
#[derive(Clone, Debug)]
pub struct Range {
    pub id: &'static str,
    pub title: &'static str,
    pub source: &'static str,
    /// Published counts per dimension: (dimension, count, what is counted, source).
    pub published: &'static [(usize, usize, Counted, &'static str)],
    /// How the catalog covers the range (families, parameters, what is left out).
    pub note: &'static str,
}

const NIL: &str = "de Graaf 2007, Classification of 6-dimensional nilpotent Lie algebras over fields of characteristic not 2, J. Algebra 309";
const NIL_MEMORY: &str = "de Graaf 2007, Classification of 6-dimensional nilpotent Lie algebras over fields of characteristic not 2, J. Algebra 309 (from memory)";
const SOL: &str =
    "de Graaf 2005, Classification of solvable Lie algebras, Experimental Mathematics 14";
const SOL_MEMORY: &str = "de Graaf 2005, Classification of solvable Lie algebras, Experimental Mathematics 14 (from memory)";
const GROUPS: &str = "common practice (the numbers of groups of order 1 to 16)";
const GROUPS16: &str = "Hall and Senior 1964, The groups of order 2^n (n <= 6) (from memory)";

/// The classified ranges.
pub const RANGES: &[Range] = &[
    Range {
        id: "nilpotent-lie",
        title: "Nilpotent Lie algebras of dimension at most 6 over Q",
        source: NIL,
        published: &[
            (1, 1, Counted::Classes, NIL_MEMORY),
            (2, 1, Counted::Classes, NIL_MEMORY),
            (3, 2, Counted::Classes, NIL_MEMORY),
            (4, 3, Counted::Classes, NIL_MEMORY),
            (5, 9, Counted::Classes, NIL_MEMORY),
            (6, 26, Counted::Labels, NIL_MEMORY),
        ],
        note: "Every label of the list is an entry, with the paper's label as an alias (`L_{5,6}`, \
               `L5,6`). In dimension 6 four labels are one-parameter families, L_{6,19}(e), \
               L_{6,21}(e), L_{6,22}(e) and L_{6,24}(e), whose members are isomorphic exactly when \
               the parameters differ by a nonzero square factor, so over Q there are infinitely \
               many classes; the catalog keeps e = 0, 1, -1, 2 for each (`L_{6,19}(-1)`).",
    },
    Range {
        id: "solvable-lie",
        title: "Solvable Lie algebras of dimension 2 to 4 over Q",
        source: SOL,
        published: &[
            (2, 2, Counted::Classes, SOL_MEMORY),
            (3, 4, Counted::Labels, SOL_MEMORY),
            (4, 12, Counted::Labels, SOL_MEMORY),
        ],
        note: "The list's labels are L^1 to L^4 in dimension 3 and M^1 to M^14 in dimension 4; M^10 \
               and M^11 occur in characteristic 2 only, so 12 labels remain over Q. The nilpotent \
               members are the entries of the nilpotent range (L^4_0 is L_{3,2}, M^7_{0,0} is \
               L_{4,3}). The families are kept at representative parameters: L^3_a at a = 0, 1, \
               -1, -1/4; L^4_a at a = 0, 1, -1, 2; M^3_a at a = 0, 1, -1, 2; M^6_{a,b} at (0,0), \
               (1,0), (1,1); M^7_{a,b} at (0,0), (1,0), (0,1), (0,-1), (1,1); M^9_a at a = 1, -1 \
               (T^2 - T - a without rational roots); M^13_a at a = 0, 1, -1; M^14_a at a = 1, -1.",
    },
    Range {
        id: "group-algebra",
        title: "Group algebras Q[G] of the groups of order at most 16",
        source: GROUPS,
        published: &[
            (1, 1, Counted::Classes, GROUPS),
            (2, 1, Counted::Classes, GROUPS),
            (3, 1, Counted::Classes, GROUPS),
            (4, 2, Counted::Classes, GROUPS),
            (5, 1, Counted::Classes, GROUPS),
            (6, 2, Counted::Classes, GROUPS),
            (7, 1, Counted::Classes, GROUPS),
            (8, 5, Counted::Classes, GROUPS),
            (9, 2, Counted::Classes, GROUPS),
            (10, 2, Counted::Classes, GROUPS),
            (11, 1, Counted::Classes, GROUPS),
            (12, 5, Counted::Classes, GROUPS),
            (13, 1, Counted::Classes, GROUPS),
            (14, 2, Counted::Classes, GROUPS),
            (15, 1, Counted::Classes, GROUPS),
            (16, 14, Counted::Classes, GROUPS16),
        ],
        note: "One entry per group (42 in all), built from permutation generators (`perm:`) or a \
               table, named as usual (C8, C4xC2, D10, A4, Dic3, Q16, SD16, M16, C4oD4, ...). \
               Non-isomorphic groups of these orders have non-isomorphic rational group algebras, \
               which the separation of the entries confirms.",
    },
];

/// The range with this id.
pub fn find_range(id: &str) -> Option<&'static Range> {
    RANGES.iter().find(|r| r.id.eq_ignore_ascii_case(id))
}

/// The entries of a range with their labels, in catalog order.
pub fn members(range: &str) -> Result<Vec<(&'static Entry, &'static str)>, Error> {
    Ok(all_entries()?
        .iter()
        .filter_map(|e| e.meta.label_in(range).map(|l| (e, l)))
        .collect())
}

/// The label without its parameters: `L_{6,19}(-1)` -> `L_{6,19}`, `M^6_{1,0}` -> `M^6`.
pub fn base_label(label: &str) -> &str {
    if let Some(i) = label.find('^') {
        return label[i..].find('_').map_or(label, |j| &label[..i + j]);
    }
    label.find('(').map_or(label, |i| &label[..i])
}

/// The number of distinct base labels per dimension among the members of a range.
pub fn labels_per_dimension(range: &str) -> Result<BTreeMap<usize, usize>, Error> {
    let mut seen: BTreeMap<usize, std::collections::BTreeSet<String>> = BTreeMap::new();
    for (e, l) in members(range)? {
        let d = e.tensor()?.dims()[0];
        seen.entry(d).or_default().insert(base_label(l).to_string());
    }
    Ok(seen.into_iter().map(|(d, s)| (d, s.len())).collect())
}

/// How a pair of entries of one range was decided.
#[derive(Clone, Debug)]
pub enum PairDecision {
    /// A fingerprint key separates them (the first such key, and the two values).
    Separated(String, String, String),
    /// An explicit isomorphism (verified exactly): the columns are the images of the first
    /// entry's basis vectors in the second's basis.
    Isomorphic(Matrix<Q>),
    /// Equal fingerprints and no isomorphism found.
    Undecided,
}

/// One pair of entries of a range, of the same dimension.
#[derive(Clone, Debug)]
pub struct PairOutcome {
    pub first: String,
    pub second: String,
    pub dim: usize,
    pub decision: PairDecision,
}

/// Decide every pair of entries of one range and one dimension (see the module
/// documentation). Cost: one (cached) fingerprint per entry, plus one isomorphism search
/// per pair with equal fingerprints.
pub fn separate_pairs(range: &str, params: &IdentifyParams) -> Result<Vec<PairOutcome>, Error> {
    let mut by_dim: BTreeMap<usize, Vec<&Entry>> = BTreeMap::new();
    for (e, _) in members(range)? {
        by_dim.entry(e.tensor()?.dims()[0]).or_default().push(e);
    }
    let mut out = Vec::new();
    for (dim, es) in by_dim {
        let fps = es
            .iter()
            .map(|e| entry_fingerprint(e, &params.fingerprint))
            .collect::<Result<Vec<_>, _>>()?;
        for a in 0..es.len() {
            for b in a + 1..es.len() {
                let diff = fps[a].differences(&fps[b]);
                let decision = match diff.first() {
                    Some(k) => {
                        let v = |i: usize| fps[i].get(k).map(|v| v.to_string()).unwrap_or_default();
                        PairDecision::Separated(k.clone(), v(a), v(b))
                    }
                    None => {
                        let (ta, tb) = (es[a].tensor()?, es[b].tensor()?);
                        match search_isomorphism(&ta, &tb, &fps[b], params) {
                            IsoOutcome::Found(m) => PairDecision::Isomorphic(m),
                            _ => PairDecision::Undecided,
                        }
                    }
                };
                out.push(PairOutcome {
                    first: es[a].meta.name.clone(),
                    second: es[b].meta.name.clone(),
                    dim,
                    decision,
                });
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn base_labels() {
        assert_eq!(base_label("L_{6,19}(-1)"), "L_{6,19}");
        assert_eq!(base_label("L_{5,4}"), "L_{5,4}");
        assert_eq!(base_label("M^6_{1,0}"), "M^6");
        assert_eq!(base_label("L^3_{-1/4}"), "L^3");
        assert_eq!(base_label("M^12"), "M^12");
        assert_eq!(base_label("C4xC2"), "C4xC2");
    }
}
