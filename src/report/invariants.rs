//! The invariants report: which invariants to compute ([`InvariantParams`]), the
//! serialisable result ([`InvariantsReport`], JSON schema `bilin.invariants/1`) and its
//! text rendering. Vectors are written in the user's basis names (`e0 + 2 e3 - 1/2 e5`);
//! linear maps as matrices (`X[l][i]` = coefficient of `e_l` in `X(e_i)`), rows of strings.

use crate::error::{Error, Result};
use crate::invariants::{
    self, ElementSpace, IntTable, MapInvariant, SolveParams, Space, lie, maps::to_matrix,
};
use crate::scalar::{Q, q_to_string};

pub use super::invariants_text::render_text;
use crate::tensor::{Kind, Tensor};
use num_traits::{One, Signed, Zero};
use serde::Serialize;
use std::time::Instant;

/// JSON schema name of the report.
pub const SCHEMA: &str = "bilin.invariants/1";

/// One part of the report (the `--only` names).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Part {
    Centre,
    Nuclei,
    Annihilators,
    Unit,
    Centroid,
    Derivations,
    Adjoint,
    Radical,
    Lie,
    MapCentroid,
    MapDerivations,
    MapAdjoint,
    MapRadicals,
}

impl Part {
    /// All parts with their `--only` names.
    pub const ALL: [(Part, &'static str); 13] = [
        (Part::Centre, "centre"),
        (Part::Nuclei, "nuclei"),
        (Part::Annihilators, "annihilators"),
        (Part::Unit, "unit"),
        (Part::Centroid, "centroid"),
        (Part::Derivations, "derivations"),
        (Part::Adjoint, "adjoint"),
        (Part::Radical, "radical"),
        (Part::Lie, "lie"),
        (Part::MapCentroid, "centroid-triples"),
        (Part::MapDerivations, "derivation-triples"),
        (Part::MapAdjoint, "adjoint-pairs"),
        (Part::MapRadicals, "radicals"),
    ];

    /// Parse a comma-separated `--only` list (`center` is accepted for `centre`).
    pub fn parse_list(s: &str) -> Result<Vec<Part>> {
        s.split(',')
            .map(|w| {
                let w = w.trim().to_ascii_lowercase();
                let w = if w == "center" {
                    "centre".to_string()
                } else {
                    w
                };
                Part::ALL
                    .iter()
                    .find(|(_, n)| *n == w)
                    .map(|(p, _)| *p)
                    .ok_or_else(|| {
                        let names: Vec<&str> = Part::ALL.iter().map(|(_, n)| *n).collect();
                        Error::Invalid(format!(
                            "unknown invariant `{w}` (known: {})",
                            names.join(", ")
                        ))
                    })
            })
            .collect()
    }

    fn is_algebra_part(self) -> bool {
        !matches!(
            self,
            Part::MapCentroid | Part::MapDerivations | Part::MapAdjoint | Part::MapRadicals
        )
    }
}

/// What to compute and how.
#[derive(Clone, Debug, Default)]
pub struct InvariantParams {
    /// `None`: every part that applies to the tensor's kind.
    pub only: Option<Vec<Part>>,
    /// Leave bases out of the report (dimensions only).
    pub omit_bases: bool,
    pub solve: SolveParams,
}

/// A subspace of the algebra (or of a space of the map).
#[derive(Clone, Debug, Serialize)]
pub struct VectorSpaceReport {
    pub dim: usize,
    /// Basis vectors written in the basis names.
    pub basis: Vec<String>,
}

/// A space of linear maps (or tuples of maps).
#[derive(Clone, Debug, Serialize)]
pub struct MapSpaceReport {
    pub dim: usize,
    /// Each basis element: its maps (one for a single map, 2 for pairs, 3 for triples),
    /// each a matrix as rows of strings.
    pub basis: Vec<Vec<Vec<Vec<String>>>>,
}

#[derive(Clone, Debug, Serialize)]
pub struct CentroidReport {
    #[serde(flatten)]
    pub space: MapSpaceReport,
    pub commutative: Option<bool>,
    pub commutative_reason: String,
    pub field: Option<bool>,
}

#[derive(Clone, Debug, Serialize)]
pub struct DerivationsReport {
    #[serde(flatten)]
    pub space: MapSpaceReport,
    /// `associative` or `lie` when inner derivations are defined.
    pub inner_kind: Option<String>,
    pub inner_dim: Option<usize>,
    /// dim Der - dim Inn.
    pub outer_dim: Option<usize>,
}

#[derive(Clone, Debug, Serialize)]
pub struct RadicalReport {
    pub available: bool,
    /// Why not available (not associative, or not over Q).
    pub note: Option<String>,
    pub radical: Option<VectorSpaceReport>,
    pub semisimple: Option<bool>,
    pub quotient_dim: Option<usize>,
    pub quotient_centre_dim: Option<usize>,
}

#[derive(Clone, Debug, Serialize)]
pub struct UnitReport {
    pub exists: bool,
    pub unit: Option<String>,
}

/// The whole report. Absent parts are `null` in JSON.
#[derive(Clone, Debug, Serialize, Default)]
pub struct InvariantsReport {
    pub schema: &'static str,
    pub field: String,
    pub kind: String,
    pub dims: [usize; 3],
    pub associative: Option<bool>,
    pub lie_algebra: Option<bool>,
    pub commutative_centre: Option<VectorSpaceReport>,
    pub centre: Option<VectorSpaceReport>,
    pub left_nucleus: Option<VectorSpaceReport>,
    pub middle_nucleus: Option<VectorSpaceReport>,
    pub right_nucleus: Option<VectorSpaceReport>,
    pub nucleus: Option<VectorSpaceReport>,
    pub left_annihilator: Option<VectorSpaceReport>,
    pub right_annihilator: Option<VectorSpaceReport>,
    pub annihilator: Option<VectorSpaceReport>,
    pub unit: Option<UnitReport>,
    pub centroid: Option<CentroidReport>,
    pub derivations: Option<DerivationsReport>,
    pub adjoint: Option<MapSpaceReport>,
    pub radical: Option<RadicalReport>,
    pub lie: Option<lie::LieInvariants>,
    pub centroid_triples: Option<MapSpaceReport>,
    pub derivation_triples: Option<MapSpaceReport>,
    pub adjoint_pairs: Option<MapSpaceReport>,
    pub left_radical: Option<VectorSpaceReport>,
    pub right_radical: Option<VectorSpaceReport>,
    /// Wall-clock seconds per part (informative).
    pub seconds: Vec<(String, f64)>,
}

/// Write a coordinate vector as a combination of basis names (`0` for the zero vector).
pub fn combination(v: &[Q], names: &[String]) -> String {
    let mut s = String::new();
    for (x, name) in v.iter().zip(names) {
        if x.is_zero() {
            continue;
        }
        let neg = x.is_negative();
        let a = x.abs();
        if s.is_empty() {
            s.push_str(if neg { "-" } else { "" });
        } else {
            s.push_str(if neg { " - " } else { " + " });
        }
        if !a.is_one() {
            s.push_str(&q_to_string(&a));
            s.push(' ');
        }
        s.push_str(name);
    }
    if s.is_empty() { "0".to_string() } else { s }
}

fn vectors(sp: &Space, names: &[String], omit: bool) -> VectorSpaceReport {
    let basis = if omit {
        Vec::new()
    } else {
        sp.basis.iter().map(|v| combination(v, names)).collect()
    };
    VectorSpaceReport {
        dim: sp.dim(),
        basis,
    }
}

/// An entry as text, with a fast path for 0 and small integers.
fn entry_string(x: &Q) -> String {
    if x.is_zero() {
        "0".to_string()
    } else if x.is_integer() {
        x.numer().to_string()
    } else {
        q_to_string(x)
    }
}

/// Basis of a space of tuples of maps on spaces of the given dimensions.
fn map_space(sp: &Space, sizes: &[usize], omit: bool) -> MapSpaceReport {
    let basis = if omit {
        Vec::new()
    } else {
        sp.basis
            .iter()
            .map(|v| {
                let mut off = 0;
                sizes
                    .iter()
                    .map(|&n| {
                        let m = to_matrix(v, n, off);
                        off += n * n;
                        (0..n)
                            .map(|r| m.row(r).iter().map(entry_string).collect())
                            .collect()
                    })
                    .collect()
            })
            .collect()
    };
    MapSpaceReport {
        dim: sp.dim(),
        basis,
    }
}

/// Compute the requested invariants of a tensor. `progress` receives a short message
/// before each part (the caller decides whether to show it). Cost: the sum of the parts'
/// costs (see [`crate::invariants`]).
pub fn invariants_report(
    t: &Tensor,
    params: &InvariantParams,
    progress: &mut dyn FnMut(&str),
) -> Result<InvariantsReport> {
    let is_alg = t.kind() == Kind::Algebra;
    let parts: Vec<Part> = match &params.only {
        Some(p) => p.clone(),
        None => Part::ALL
            .iter()
            .map(|(p, _)| *p)
            .filter(|p| p.is_algebra_part() == is_alg)
            .collect(),
    };
    if !is_alg && parts.iter().any(|p| p.is_algebra_part()) {
        return Err(Error::Invalid(
            "this input is a bilinear map, not an algebra: use centroid-triples, \
             derivation-triples, adjoint-pairs or radicals"
                .to_string(),
        ));
    }
    let it = IntTable::from_tensor(t)?;
    let sp = &params.solve;
    let omit = params.omit_bases;
    let names = &t.names()[0];
    let n = t.dim();
    let mut r = InvariantsReport {
        schema: SCHEMA,
        field: t.field().name(),
        kind: if is_alg { "algebra" } else { "bilinear" }.to_string(),
        dims: t.dims(),
        ..Default::default()
    };
    let clock = |label: &str, start: Instant, r: &mut InvariantsReport| {
        r.seconds
            .push((label.to_string(), start.elapsed().as_secs_f64()));
    };
    let (mut assoc, mut lie_alg) = (None, None);
    if is_alg {
        assoc = Some(invariants::is_associative(&it)?);
        lie_alg = Some(lie::is_lie(&it));
        r.associative = assoc;
        r.lie_algebra = lie_alg;
    }
    let es = |w: ElementSpace| -> Result<VectorSpaceReport> {
        Ok(vectors(
            &invariants::element_space(&it, w, sp)?,
            names,
            omit,
        ))
    };
    for part in parts {
        let start = Instant::now();
        let label = Part::ALL
            .iter()
            .find(|(p, _)| *p == part)
            .map(|(_, n)| *n)
            .unwrap_or("");
        progress(&format!("invariants: {label} (dim {n})"));
        match part {
            Part::Centre => {
                r.commutative_centre = Some(es(ElementSpace::CommutativeCentre)?);
                r.centre = Some(es(ElementSpace::Centre)?);
            }
            Part::Nuclei => {
                r.left_nucleus = Some(es(ElementSpace::LeftNucleus)?);
                r.middle_nucleus = Some(es(ElementSpace::MiddleNucleus)?);
                r.right_nucleus = Some(es(ElementSpace::RightNucleus)?);
                r.nucleus = Some(es(ElementSpace::Nucleus)?);
            }
            Part::Annihilators => {
                r.left_annihilator = Some(es(ElementSpace::LeftAnnihilator)?);
                r.right_annihilator = Some(es(ElementSpace::RightAnnihilator)?);
                r.annihilator = Some(es(ElementSpace::Annihilator)?);
            }
            Part::Unit => {
                let u = invariants::unit(&it, sp)?;
                r.unit = Some(UnitReport {
                    exists: u.is_some(),
                    unit: u.map(|v| combination(&v, names)),
                });
            }
            Part::Centroid => {
                let c = invariants::centroid(t, &it, sp)?;
                r.centroid = Some(CentroidReport {
                    space: map_space(&c.space, &[n], omit),
                    commutative: c.commutative,
                    commutative_reason: c.commutative_reason,
                    field: c.field,
                });
            }
            Part::Derivations => {
                let d = invariants::derivations(&it, sp)?;
                let kind = if assoc == Some(true) {
                    Some(false)
                } else if lie_alg == Some(true) {
                    Some(true)
                } else {
                    None
                };
                let inner = match kind {
                    Some(l) => Some(invariants::inner_derivations(&it, l, sp)?.dim()),
                    None => None,
                };
                r.derivations = Some(DerivationsReport {
                    space: map_space(&d, &[n], omit),
                    inner_kind: kind.map(|l| if l { "lie" } else { "associative" }.to_string()),
                    inner_dim: inner,
                    outer_dim: inner.map(|i| d.dim() - i),
                });
            }
            Part::Adjoint => {
                r.adjoint = Some(map_space(
                    &invariants::adjoint_algebra(&it, sp)?,
                    &[n, n],
                    omit,
                ));
            }
            Part::Radical => r.radical = Some(radical_report(t, &it, assoc, names, params)?),
            Part::Lie => {
                if lie_alg == Some(true) {
                    r.lie = Some(lie::lie_invariants(t));
                }
            }
            Part::MapCentroid | Part::MapDerivations | Part::MapAdjoint | Part::MapRadicals => {
                let [a, b, c] = t.dims();
                let mi = |w| invariants::map_invariant(&it, w, sp);
                match part {
                    Part::MapCentroid => {
                        r.centroid_triples = Some(map_space(
                            &mi(MapInvariant::CentroidTriples)?,
                            &[a, b, c],
                            omit,
                        ))
                    }
                    Part::MapDerivations => {
                        r.derivation_triples = Some(map_space(
                            &mi(MapInvariant::DerivationTriples)?,
                            &[a, b, c],
                            omit,
                        ))
                    }
                    Part::MapAdjoint => {
                        r.adjoint_pairs =
                            Some(map_space(&mi(MapInvariant::AdjointPairs)?, &[a, b], omit))
                    }
                    _ => {
                        r.left_radical = Some(vectors(
                            &mi(MapInvariant::LeftRadical)?,
                            &t.names()[0],
                            omit,
                        ));
                        r.right_radical = Some(vectors(
                            &mi(MapInvariant::RightRadical)?,
                            &t.names()[1],
                            omit,
                        ));
                    }
                }
            }
        }
        clock(label, start, &mut r);
    }
    Ok(r)
}

fn radical_report(
    t: &Tensor,
    it: &IntTable,
    assoc: Option<bool>,
    names: &[String],
    params: &InvariantParams,
) -> Result<RadicalReport> {
    let na = |note: &str| RadicalReport {
        available: false,
        note: Some(note.to_string()),
        radical: None,
        semisimple: None,
        quotient_dim: None,
        quotient_centre_dim: None,
    };
    if assoc != Some(true) {
        return Ok(na(
            "not associative: the radical is computed for associative algebras",
        ));
    }
    match invariants::radical(t, it, &params.solve)? {
        None => Ok(na(
            "not available over GF(p): the trace-form criterion needs characteristic 0",
        )),
        Some(rad) => Ok(RadicalReport {
            available: true,
            note: None,
            radical: Some(vectors(&rad.space, names, params.omit_bases)),
            semisimple: Some(rad.semisimple),
            quotient_dim: Some(rad.quotient_dim),
            quotient_centre_dim: Some(rad.quotient_centre_dim),
        }),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::FieldSpec;

    #[test]
    fn report_on_quaternions_and_json_schema() {
        let mut t = Tensor::algebra(FieldSpec::Rational, vec!["1".into(), "i".into()]);
        t.set(0, 0, 0, Q::one());
        t.set(0, 1, 1, Q::one());
        t.set(1, 0, 1, Q::one());
        t.set(1, 1, 0, -Q::one());
        let r = invariants_report(&t, &InvariantParams::default(), &mut |_| {}).unwrap();
        assert_eq!(r.centre.as_ref().unwrap().dim, 2);
        assert_eq!(r.unit.as_ref().unwrap().unit.as_deref(), Some("1"));
        // Q(i) is a field: semisimple, centroid of dim 2 (Jacobson 1980, Basic Algebra II)
        assert_eq!(r.radical.as_ref().unwrap().semisimple, Some(true));
        assert_eq!(r.centroid.as_ref().unwrap().space.dim, 2);
        let j = serde_json::to_value(&r).unwrap();
        assert_eq!(j["schema"], SCHEMA);
        assert!(render_text(&r, &t.names()[0]).contains("centroid"));
        assert_eq!(
            combination(
                &[Q::one(), -Q::from_integer(2.into())],
                &["a".into(), "b".into()]
            ),
            "a - 2 b"
        );
    }
}
