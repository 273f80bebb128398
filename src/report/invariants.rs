//! The invariants report: which invariants to compute ([`InvariantParams`]), the
//! serialisable result ([`InvariantsReport`], JSON schema `bilin.invariants/1`) and its
//! text rendering. Vectors are written in the user's basis names (`e0 + 2 e3 - 1/2 e5`);
//! linear maps as matrices (`X[l][i]` = coefficient of `e_l` in `X(e_i)`), rows of strings.

use crate::error::Result;
use crate::invariants::all::{self, Invariants, RadicalPart};
use crate::invariants::{SolveParams, Space, lie, maps::to_matrix};
use crate::scalar::{Q, q_to_string};

pub use super::invariants_text::render_text;
use crate::tensor::{Kind, Tensor};
use num_traits::{One, Signed, Zero};
use serde::Serialize;

/// JSON schema name of the report.
pub const SCHEMA: &str = "bilin.invariants/1";

pub use crate::invariants::all::Part;

/// What to compute and how.
#[derive(Clone, Debug, Default)]
pub struct InvariantParams {
    /// `None`: every part that applies to the tensor's kind.
    pub only: Option<Vec<Part>>,
    /// Leave bases out of the report (dimensions only).
    pub omit_bases: bool,
    pub solve: SolveParams,
    /// The work budget of a part (see [`all::Params::max_work`]); `None`: no limit.
    pub max_work: Option<f64>,
}

/// Bases with more entries than this (vectors x coordinates) are not written out.
pub const MAX_WRITTEN_ENTRIES: usize = 1 << 21;

/// A subspace of the algebra (or of a space of the map).
#[derive(Clone, Debug, Serialize)]
pub struct VectorSpaceReport {
    pub dim: usize,
    /// Basis vectors written in the basis names.
    pub basis: Vec<String>,
    /// Why the basis is not written out (too large), if so.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub basis_omitted: Option<String>,
}

/// A space of linear maps (or tuples of maps).
#[derive(Clone, Debug, Serialize)]
pub struct MapSpaceReport {
    pub dim: usize,
    /// Each basis element: its maps (one for a single map, 2 for pairs, 3 for triples),
    /// each a matrix as rows of strings.
    pub basis: Vec<Vec<Vec<Vec<String>>>>,
    /// Why the basis is not written out (too large), if so.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub basis_omitted: Option<String>,
}

/// A part that was not computed, and why.
#[derive(Clone, Debug, Serialize)]
pub struct SkippedPart {
    pub part: String,
    pub reason: String,
}

#[derive(Clone, Debug, Serialize)]
pub struct CentroidReport {
    #[serde(flatten)]
    pub space: MapSpaceReport,
    pub commutative: Option<bool>,
    pub commutative_reason: String,
    pub field: Option<bool>,
    /// When a field: its degree over the ground field and a defining polynomial.
    pub field_degree: Option<usize>,
    pub field_polynomial: Option<String>,
    /// When not a field: why.
    pub field_reason: Option<String>,
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
    /// The theorem that gave the space, when it was not solved for (absent otherwise).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub method: Option<String>,
}

#[derive(Clone, Debug, Serialize)]
pub struct RadicalReport {
    pub available: bool,
    /// Why not available (not associative).
    pub note: Option<String>,
    /// How the radical was computed (`null` when not available).
    pub method: Option<String>,
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
    /// Parts not computed (above the memory budget), with the reason.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub skipped: Vec<SkippedPart>,
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

/// Why a basis is not written out, if it is too large.
fn too_large(sp: &Space, omit: bool) -> Option<String> {
    let entries = sp.dim().saturating_mul(sp.unknowns);
    (!omit && entries > MAX_WRITTEN_ENTRIES).then(|| {
        format!(
            "{} vectors of {} coordinates: more than {MAX_WRITTEN_ENTRIES} entries",
            sp.dim(),
            sp.unknowns
        )
    })
}

fn vectors(sp: &Space, names: &[String], omit: bool) -> VectorSpaceReport {
    let basis_omitted = too_large(sp, omit);
    let basis = if omit || basis_omitted.is_some() {
        Vec::new()
    } else {
        (0..sp.dim())
            .map(|i| combination(&sp.dense(i), names))
            .collect()
    };
    VectorSpaceReport {
        dim: sp.dim(),
        basis,
        basis_omitted,
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
    let basis_omitted = too_large(sp, omit);
    let basis = if omit || basis_omitted.is_some() {
        Vec::new()
    } else {
        (0..sp.dim())
            .map(|i| {
                let v = sp.dense(i);
                let mut off = 0;
                sizes
                    .iter()
                    .map(|&n| {
                        let m = to_matrix(&v, n, off);
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
        basis_omitted,
    }
}

/// Compute the requested invariants of a tensor ([`crate::invariants::all`]) and write
/// them as a report. `progress` receives a short message before each part.
/// Cost: that of [`all::compute_invariants`].
pub fn invariants_report(
    t: &Tensor,
    params: &InvariantParams,
    progress: &mut dyn FnMut(&str),
) -> Result<InvariantsReport> {
    Ok(invariants_with_report(t, params, progress)?.0)
}

/// The report with the computed invariants themselves (for callers that reuse them).
pub fn invariants_with_report(
    t: &Tensor,
    params: &InvariantParams,
    progress: &mut dyn FnMut(&str),
) -> Result<(InvariantsReport, Invariants)> {
    let inv = all::compute_invariants(
        t,
        &all::Params {
            only: params.only.clone(),
            solve: params.solve.clone(),
            max_work: params.max_work,
        },
        progress,
    )?;
    Ok((render_report(t, &inv, params.omit_bases), inv))
}

/// The report of computed invariants (bases written in the basis names).
pub fn render_report(t: &Tensor, inv: &Invariants, omit: bool) -> InvariantsReport {
    let is_alg = t.kind() == Kind::Algebra;
    let names = &t.names()[0];
    let n = t.dim();
    let [a, b, c] = t.dims();
    let vs = |s: &Option<Space>| s.as_ref().map(|s| vectors(s, names, omit));
    InvariantsReport {
        schema: SCHEMA,
        field: t.field().name(),
        kind: if is_alg { "algebra" } else { "bilinear" }.to_string(),
        dims: t.dims(),
        associative: inv.associative,
        lie_algebra: inv.lie_algebra,
        commutative_centre: vs(&inv.commutative_centre),
        centre: vs(&inv.centre),
        left_nucleus: vs(&inv.left_nucleus),
        middle_nucleus: vs(&inv.middle_nucleus),
        right_nucleus: vs(&inv.right_nucleus),
        nucleus: vs(&inv.nucleus),
        left_annihilator: vs(&inv.left_annihilator),
        right_annihilator: vs(&inv.right_annihilator),
        annihilator: vs(&inv.annihilator),
        unit: inv.unit.as_ref().map(|u| UnitReport {
            exists: u.is_some(),
            unit: u.as_ref().map(|v| combination(v, names)),
        }),
        centroid: inv.centroid.as_ref().map(|c| {
            use crate::structure::FieldDecision;
            let (degree, poly, reason) = match &inv.centroid_field {
                Some(FieldDecision::Field { degree, poly }) => {
                    (Some(*degree), Some(crate::poly::to_text(poly, "x")), None)
                }
                Some(FieldDecision::NotField(why)) => (None, None, Some(why.clone())),
                None => (None, None, None),
            };
            CentroidReport {
                space: map_space(&c.space, &[n], omit),
                commutative: c.commutative,
                commutative_reason: c.commutative_reason.clone(),
                field: c.field,
                field_degree: degree,
                field_polynomial: poly,
                field_reason: reason,
            }
        }),
        derivations: inv.derivations.as_ref().map(|d| {
            let inner = d.inner.as_ref().map(Space::dim);
            DerivationsReport {
                space: map_space(&d.space, &[n], omit),
                inner_kind: d
                    .inner_lie
                    .map(|l| if l { "lie" } else { "associative" }.to_string()),
                inner_dim: inner,
                outer_dim: inner.map(|i| d.space.dim() - i),
                method: d.method.clone(),
            }
        }),
        adjoint: inv.adjoint.as_ref().map(|s| map_space(s, &[n, n], omit)),
        radical: inv.radical.as_ref().map(|r| match r {
            RadicalPart::NotAvailable(note) => RadicalReport {
                available: false,
                note: Some(note.clone()),
                method: None,
                radical: None,
                semisimple: None,
                quotient_dim: None,
                quotient_centre_dim: None,
            },
            RadicalPart::Computed(rad) => RadicalReport {
                available: true,
                note: None,
                method: Some(rad.method.clone()),
                radical: Some(vectors(&rad.space, names, omit)),
                semisimple: Some(rad.semisimple),
                quotient_dim: Some(rad.quotient_dim),
                quotient_centre_dim: Some(rad.quotient_centre_dim),
            },
        }),
        lie: inv.lie.clone(),
        centroid_triples: inv
            .centroid_triples
            .as_ref()
            .map(|s| map_space(s, &[a, b, c], omit)),
        derivation_triples: inv
            .derivation_triples
            .as_ref()
            .map(|s| map_space(s, &[a, b, c], omit)),
        adjoint_pairs: inv
            .adjoint_pairs
            .as_ref()
            .map(|s| map_space(s, &[a, b], omit)),
        left_radical: inv
            .left_radical
            .as_ref()
            .map(|s| vectors(s, &t.names()[0], omit)),
        right_radical: inv
            .right_radical
            .as_ref()
            .map(|s| vectors(s, &t.names()[1], omit)),
        skipped: inv
            .skipped
            .iter()
            .map(|(p, why)| SkippedPart {
                part: p.name().to_string(),
                reason: why.clone(),
            })
            .collect(),
        seconds: inv.seconds.clone(),
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
