//! The common form of a lower bound, and [`lower_bounds`], which runs every bound that
//! applies to a tensor.
//!
//! A [`Bound`] states `R(T) >= value` or `border rank >= value` (which implies the same
//! for the rank), over which field it holds (the tensor's field, and whether also over
//! every extension field), the theorem it rests on, whether it is proven (every result of
//! [`lower_bounds`] is; a certificate that fails its re-check would be reported as
//! evidence), how the value was obtained, and, for the bounds that have one, a
//! certificate a separate check confirms.
//!
//! Invariant: every bound in a [`Bounds`] holds for the tensor over its own field.

use super::exhaustive::{self, ExhaustiveParams};
use super::rank_proof::Certificate;
use super::{alder_strassen, flattening, isotope, koszul_young, slice_span, strassen};
use crate::scalar::FieldSpec;
use crate::tensor::{Kind, Tensor};
use serde::Serialize;

/// What a bound bounds.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Measure {
    /// The tensor rank R(T).
    Rank,
    /// The border rank (a lower bound for it is also one for the rank).
    BorderRank,
}

/// How much a bound is worth.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Status {
    /// Proven: exact arithmetic, and the certificate (if any) passed its separate check.
    Proven,
    /// Evidence only: the computation suggests the bound but its proof did not go through.
    Evidence,
}

/// The theorem behind a bound.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Method {
    Flattening,
    SliceSpan,
    AlderStrassen,
    KoszulYoung,
    StrassenCommutator,
    Exhaustive,
}

impl Method {
    /// The short name shown in reports.
    pub fn name(self) -> &'static str {
        match self {
            Method::Flattening => "flattening",
            Method::SliceSpan => "slice span",
            Method::AlderStrassen => "Alder-Strassen",
            Method::KoszulYoung => "Koszul-Young",
            Method::StrassenCommutator => "Strassen commutator",
            Method::Exhaustive => "exhaustive search",
        }
    }

    /// The theorem and its source.
    pub fn theorem(self) -> &'static str {
        match self {
            Method::Flattening => flattening::THEOREM,
            Method::SliceSpan => slice_span::THEOREM,
            Method::AlderStrassen => alder_strassen::THEOREM,
            Method::KoszulYoung => koszul_young::THEOREM,
            Method::StrassenCommutator => strassen::THEOREM,
            Method::Exhaustive => exhaustive::THEOREM,
        }
    }
}

/// One lower bound (see the module documentation).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Bound {
    /// The rank (or border rank) is at least this.
    pub value: usize,
    pub measure: Measure,
    /// The field the statement holds over (the tensor's field).
    #[serde(serialize_with = "field_name")]
    pub field: FieldSpec,
    /// The statement also holds over every extension field.
    pub extensions: bool,
    pub status: Status,
    pub method: Method,
    /// Short name: `flattening`, `Koszul-Young`, ...
    pub name: String,
    /// The theorem and its source.
    pub theorem: String,
    /// How the value was obtained.
    pub detail: String,
    /// A certificate that [`super::certificate`] or [`super::minor`] re-checks, when the
    /// method has one.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub certificate: Option<serde_json::Value>,
}

fn field_name<S: serde::Serializer>(f: &FieldSpec, s: S) -> Result<S::Ok, S::Error> {
    s.serialize_str(&f.name())
}

impl Bound {
    /// A proven bound by `method` over `field` (its name and theorem filled in).
    pub fn proven(
        method: Method,
        value: usize,
        measure: Measure,
        field: FieldSpec,
        extensions: bool,
        detail: String,
    ) -> Bound {
        Bound {
            value,
            measure,
            field,
            extensions,
            status: Status::Proven,
            method,
            name: method.name().into(),
            theorem: method.theorem().into(),
            detail,
            certificate: None,
        }
    }

    /// The scope in words: `rank over GF(2)`, `border rank over Q and its extensions`.
    pub fn scope(&self) -> String {
        let what = match self.measure {
            Measure::Rank => "rank",
            Measure::BorderRank => "border rank",
        };
        let ext = if self.extensions {
            " and every extension"
        } else {
            ""
        };
        format!("{what} over {}{ext}", self.field.name())
    }
}

/// All bounds that apply, plus notes on those that do not (and why).
#[derive(Clone, Debug, Serialize)]
pub struct Bounds {
    pub bounds: Vec<Bound>,
    pub notes: Vec<String>,
    /// The certificate of the exhaustive proof, when one ran (written on request).
    #[serde(skip)]
    pub rank_proof: Option<Certificate>,
    /// `R(T) <= r` over GF(2) from a checked decomposition the exhaustive search found.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub exhaustive_upper: Option<usize>,
}

impl Bounds {
    /// The best proven lower bound for the rank over the tensor's field (border-rank
    /// bounds count: R(T) >= border rank).
    pub fn best(&self) -> usize {
        self.proven().map(|b| b.value).max().unwrap_or(0)
    }

    /// The best proven lower bound for the border rank.
    pub fn best_border(&self) -> usize {
        self.proven()
            .filter(|b| b.measure == Measure::BorderRank)
            .map(|b| b.value)
            .max()
            .unwrap_or(0)
    }

    /// The bound that gives [`Bounds::best`] (the first one on ties).
    pub fn best_bound(&self) -> Option<&Bound> {
        let best = self.best();
        self.proven().find(|b| b.value == best)
    }

    fn proven(&self) -> impl Iterator<Item = &Bound> {
        self.bounds.iter().filter(|b| b.status == Status::Proven)
    }
}

/// Parameters of [`lower_bounds`].
#[derive(Clone, Debug)]
pub struct BoundsParams {
    /// Seed of every random choice (slice combinations, projections, primitive elements).
    pub seed: u64,
    /// Random slice combinations tried per axis.
    pub slice_trials: usize,
    /// Algebras above this dimension skip the Alder-Strassen computation (cost O(n^4)).
    pub max_algebra_dim: usize,
    /// Bilinear maps above this dimension skip the search for a unital isotope.
    pub max_isotope_dim: usize,
    /// Koszul-Young flattenings are computed when their smaller side has at most this many
    /// rows (cost about its cube in word operations).
    pub max_koszul_young_size: usize,
    /// Budget of the exhaustive proofs over GF(2); `None` leaves them out.
    pub exhaustive: Option<ExhaustiveParams>,
}

impl Default for BoundsParams {
    fn default() -> Self {
        BoundsParams {
            seed: 1,
            slice_trials: 3,
            max_algebra_dim: 64,
            max_isotope_dim: 32,
            max_koszul_young_size: 400,
            exhaustive: Some(ExhaustiveParams::default()),
        }
    }
}

/// Compute every applicable lower bound. Cost: three exact flattening ranks, a few slice
/// ranks, the Alder-Strassen computation for algebras (O(n^4)), Koszul-Young flattenings
/// up to `max_koszul_young_size` rows (cube of the size each), and the commutator bound
/// (cube of the slice size).
pub fn lower_bounds(t: &Tensor, params: &BoundsParams) -> Bounds {
    let mut bounds = vec![flattening::bound(t)];
    let mut notes = Vec::new();
    bounds.push(slice_span::bound(t, params));
    let direct = if t.kind() == Kind::Algebra {
        alder_strassen::alder_strassen(t, params)
    } else {
        Err("the input is a bilinear map, not an algebra".into())
    };
    match direct {
        Ok(b) => bounds.push(b),
        Err(why) => match isotope::alder_strassen_of_isotope(t, params) {
            Ok(b) => bounds.push(b),
            Err(iso) => notes.push(format!("Alder-Strassen bound not applied: {why}; {iso}")),
        },
    }
    match koszul_young::bound(t, params) {
        Ok(Some(b)) => bounds.push(b),
        Ok(None) => {}
        Err(why) => notes.push(format!("Koszul-Young bound not applied: {why}")),
    }
    match strassen::bound(t, params) {
        Ok(b) => bounds.push(b),
        Err(why) => notes.push(format!("Strassen commutator bound not applied: {why}")),
    }
    let mut out = Bounds {
        bounds,
        notes,
        rank_proof: None,
        exhaustive_upper: None,
    };
    if let Some(ep) = &params.exhaustive
        && t.field() == FieldSpec::Prime(2)
    {
        match exhaustive::bound(t, out.best(), ep) {
            Ok(found) => {
                if let Some((b, cert)) = found.proof {
                    out.bounds.push(b);
                    out.rank_proof = Some(cert);
                }
                out.exhaustive_upper = found.upper;
                out.notes
                    .extend(found.note.map(|n| format!("exhaustive search: {n}")));
            }
            Err(why) => out
                .notes
                .push(format!("exhaustive search not applied: {why}")),
        }
    }
    out
}
