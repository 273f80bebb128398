//! Every invariant of one product in one call: the orchestration that `analyze`,
//! `invariants`, `identify` and the catalog share ([`compute_invariants`]).
//!
//! The parts to compute are named by [`Part`]; the laws they depend on (associative, Lie)
//! are decided once by the law engine ([`crate::laws`]); each part is a proven basis from
//! the engine of [`crate::linalg::nullspace`]. Before a part's system is solved its size is
//! compared with the memory budget, and a part that would exceed it is reported as skipped
//! with the reason, never attempted. With a work budget ([`Params::max_work`]) the same
//! holds for time: the elimination of a dense table's system of m unknowns is estimated
//! at m^3 / 3 multiply-adds (measured: about 4 s for m = 2725 on one core), and a part
//! above the budget is skipped with its estimate.

use super::bilinear::{MapInvariant, map_invariant};
use super::elements::{ElementSpace, element_space, unit};
use super::lie::{LieInvariants, lie_invariants};
use super::maps::{Centroid, adjoint_algebra, centroid, derivations, inner_derivations};
use super::radical::{Radical, radical};
use crate::error::{Error, Result};
use crate::laws::{self, Law};
use crate::linalg::nullspace::{SolveParams, Space};
use crate::scalar::Q;
use crate::tensor::{IntegralTensor, Kind, Tensor};
use std::time::Instant;

/// One part of the invariants (the names of `--only`).
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
    /// All parts with their names.
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

    /// The part's name.
    pub fn name(self) -> &'static str {
        Part::ALL
            .iter()
            .find(|(p, _)| *p == self)
            .map(|(_, n)| *n)
            .unwrap_or("")
    }

    /// Parse a comma-separated list (`center` is accepted for `centre`).
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

    /// True for the parts of an algebra, false for those of a bilinear map.
    pub fn is_algebra_part(self) -> bool {
        !matches!(
            self,
            Part::MapCentroid | Part::MapDerivations | Part::MapAdjoint | Part::MapRadicals
        )
    }

    /// The number of unknowns of the part's largest system on dimensions `[a, b, c]`.
    pub fn unknowns(self, [a, b, c]: [usize; 3]) -> usize {
        match self {
            Part::Centre | Part::Nuclei | Part::Annihilators | Part::Radical | Part::Lie => a,
            Part::Unit => a + 1,
            Part::Centroid | Part::Derivations => a * a,
            Part::Adjoint => 2 * a * a,
            Part::MapCentroid | Part::MapDerivations => a * a + b * b + c * c,
            Part::MapAdjoint => a * a + b * b,
            Part::MapRadicals => a.max(b),
        }
    }
}

/// What to compute and how.
#[derive(Clone, Debug, Default)]
pub struct Params {
    /// `None`: every part that applies to the tensor's kind.
    pub only: Option<Vec<Part>>,
    pub solve: SolveParams,
    /// Skip a part of a dense table whose elimination is estimated above this many
    /// multiply-adds (`None`: no limit). Sparse tables (generator bases) split into small
    /// components and are not limited.
    pub max_work: Option<f64>,
}

/// The derivation algebra with its inner part.
#[derive(Clone, Debug)]
pub struct Derivations {
    pub space: Space,
    /// `Some(true)`: inner derivations of a Lie algebra (`ad_x = L_x`); `Some(false)`: of
    /// an associative algebra (`ad_x = L_x - R_x`); `None`: not defined.
    pub inner_lie: Option<bool>,
    pub inner: Option<Space>,
    /// How the space was obtained when not by solving its system (a theorem).
    pub method: Option<String>,
}

/// The radical part: computed, or why not.
#[derive(Clone, Debug)]
pub enum RadicalPart {
    Computed(Radical),
    NotAvailable(String),
}

/// Everything computed; absent parts are `None`.
#[derive(Clone, Debug, Default)]
pub struct Invariants {
    pub associative: Option<bool>,
    pub lie_algebra: Option<bool>,
    pub commutative_centre: Option<Space>,
    pub centre: Option<Space>,
    pub left_nucleus: Option<Space>,
    pub middle_nucleus: Option<Space>,
    pub right_nucleus: Option<Space>,
    pub nucleus: Option<Space>,
    pub left_annihilator: Option<Space>,
    pub right_annihilator: Option<Space>,
    pub annihilator: Option<Space>,
    /// `Some(None)`: no unit.
    pub unit: Option<Option<Vec<Q>>>,
    pub centroid: Option<Centroid>,
    /// Whether the centroid is a field, with its degree and a defining polynomial.
    pub centroid_field: Option<crate::structure::FieldDecision>,
    pub derivations: Option<Derivations>,
    pub adjoint: Option<Space>,
    pub radical: Option<RadicalPart>,
    pub lie: Option<LieInvariants>,
    pub centroid_triples: Option<Space>,
    pub derivation_triples: Option<Space>,
    pub adjoint_pairs: Option<Space>,
    pub left_radical: Option<Space>,
    pub right_radical: Option<Space>,
    /// Parts not computed, with the reason (size above the memory budget).
    pub skipped: Vec<(Part, String)>,
    /// Wall-clock seconds per part (informative).
    pub seconds: Vec<(String, f64)>,
}

/// The parts that apply to a tensor when none are named.
pub fn default_parts(t: &Tensor) -> Vec<Part> {
    let is_alg = t.kind() == Kind::Algebra;
    Part::ALL
        .iter()
        .map(|(p, _)| *p)
        .filter(|p| p.is_algebra_part() == is_alg)
        .collect()
}

/// Compute the requested invariants of a tensor. `progress` receives a short message
/// before each part. Cost: the sum of the parts' costs (see [`crate::invariants`]); the
/// associative and Lie verdicts come from the law engine (stopping at a first failure).
pub fn compute_invariants(
    t: &Tensor,
    params: &Params,
    progress: &mut dyn FnMut(&str),
) -> Result<Invariants> {
    let is_alg = t.kind() == Kind::Algebra;
    let parts = params.only.clone().unwrap_or_else(|| default_parts(t));
    if !is_alg && parts.iter().any(|p| p.is_algebra_part()) {
        return Err(Error::Invalid(
            "this input is a bilinear map, not an algebra: use centroid-triples, \
             derivation-triples, adjoint-pairs or radicals"
                .to_string(),
        ));
    }
    let it = IntegralTensor::from_tensor(t);
    let sp = &params.solve;
    let n = t.dim();
    let mut r = Invariants::default();
    if is_alg {
        let lp = laws::Params {
            laws: vec![Law::Associative, Law::Lie],
            stop_first: true,
            ..Default::default()
        };
        let lr = laws::check_laws(t, &lp)?;
        r.associative = lr.holds(Law::Associative);
        r.lie_algebra = lr.holds(Law::Lie);
    }
    let es = |w: ElementSpace| element_space(&it, w, sp);
    let nuclei = |once: &mut Option<[Space; 3]>| -> Result<[Space; 3]> {
        if once.is_none() {
            *once = Some([
                es(ElementSpace::LeftNucleus)?,
                es(ElementSpace::MiddleNucleus)?,
                es(ElementSpace::RightNucleus)?,
            ]);
        }
        Ok(once.clone().expect("computed"))
    };
    let dense = crate::tensor::prefers_dense(t.dims(), t.nnz());
    // the radical, once: asked for itself, and by the derivations of an associative algebra
    let mut radical_once: Option<Option<Radical>> = None;
    // the left, middle and right nuclei, once: asked for themselves, and by the centre
    let mut nuclei_once: Option<[Space; 3]> = None;
    let modulus = it.modulus();
    for part in parts {
        let start = Instant::now();
        let m = part.unknowns(t.dims());
        let work = (m as f64).powi(3) / 3.0;
        if let Some(budget) = params.max_work
            && dense
            && work > budget
        {
            r.skipped.push((
                part,
                format!(
                    "its linear system has {m} unknowns and the table is dense: eliminating \
                     it is estimated at about {work:.1e} multiply-adds, above the budget of \
                     {budget:.0e} for a quick report"
                ),
            ));
            continue;
        }
        progress(&format!("invariants: {} (dim {n})", part.name()));
        // a part whose elimination would pass the memory limit is skipped, with the reason
        let mut compute = || -> Result<()> {
            match part {
                Part::Centre => {
                    let comm = es(ElementSpace::CommutativeCentre)?;
                    // in an associative algebra (proven by the law engine) every element
                    // associates with everything, so Z(A) = Comm(A); otherwise Z(A) is
                    // Comm(A) intersected with the three nuclei
                    r.centre = Some(if r.associative == Some(true) {
                        comm.clone()
                    } else {
                        let [left, middle, right] = nuclei(&mut nuclei_once)?;
                        comm.intersection(&left, modulus)?
                            .intersection(&middle, modulus)?
                            .intersection(&right, modulus)?
                    });
                    r.commutative_centre = Some(comm);
                }
                Part::Nuclei if r.associative == Some(true) => {
                    // every associator vanishes: each nucleus is A itself
                    let whole = Space::whole(n);
                    r.left_nucleus = Some(whole.clone());
                    r.middle_nucleus = Some(whole.clone());
                    r.right_nucleus = Some(whole.clone());
                    r.nucleus = Some(whole);
                }
                Part::Nuclei => {
                    // the nucleus is the intersection of the three (no second system)
                    let [left, middle, right] = nuclei(&mut nuclei_once)?;
                    r.nucleus = Some(
                        left.intersection(&middle, modulus)?
                            .intersection(&right, modulus)?,
                    );
                    r.left_nucleus = Some(left);
                    r.middle_nucleus = Some(middle);
                    r.right_nucleus = Some(right);
                }
                Part::Annihilators => {
                    r.left_annihilator = Some(es(ElementSpace::LeftAnnihilator)?);
                    r.right_annihilator = Some(es(ElementSpace::RightAnnihilator)?);
                    r.annihilator = Some(es(ElementSpace::Annihilator)?);
                }
                Part::Unit => r.unit = Some(unit(&it, sp)?),
                Part::Centroid => {
                    let mut c = centroid(t, &it, sp, r.associative)?;
                    let decision = crate::structure::centroid_is_field(t, &c.space, sp)?;
                    c.field = Some(matches!(
                        decision,
                        crate::structure::FieldDecision::Field { .. }
                    ));
                    r.centroid_field = Some(decision);
                    r.centroid = Some(c);
                }
                Part::Derivations => {
                    let inner_lie = if r.associative == Some(true) {
                        Some(false)
                    } else if r.lie_algebra == Some(true) {
                        Some(true)
                    } else {
                        None
                    };
                    let inner = match inner_lie {
                        Some(l) => Some(inner_derivations(&it, l, sp)?),
                        None => None,
                    };
                    // a semisimple associative algebra over Q is separable, and every
                    // derivation of a separable algebra is inner (Hochschild 1945, On the
                    // cohomology groups of an associative algebra, Ann. of Math. 46:
                    // H^1(A, A) = 0), so Der(A) = Inn(A) without the n^2-unknown system
                    let over_q_assoc = r.associative == Some(true)
                        && t.field() == crate::scalar::FieldSpec::Rational;
                    if over_q_assoc && radical_once.is_none() {
                        radical_once = Some(radical(t, &it, sp)?);
                    }
                    let semisimple = over_q_assoc
                        && radical_once
                            .as_ref()
                            .and_then(Option::as_ref)
                            .is_some_and(|rad| rad.space.dim() == 0);
                    let (space, method) = match (&inner, semisimple) {
                        (Some(inn), true) => (
                            inn.clone(),
                            Some(
                                "every derivation is inner: A is associative and semisimple \
                                 over Q (Hochschild 1945, Ann. of Math. 46)"
                                    .to_string(),
                            ),
                        ),
                        _ => (derivations(&it, sp)?, None),
                    };
                    r.derivations = Some(Derivations {
                        space,
                        inner_lie,
                        inner,
                        method,
                    });
                }
                Part::Adjoint => r.adjoint = Some(adjoint_algebra(t, &it, sp, r.associative)?),
                Part::Radical => {
                    r.radical = Some(if r.associative != Some(true) {
                        RadicalPart::NotAvailable(
                            "not associative: the radical is computed for associative algebras"
                                .into(),
                        )
                    } else {
                        let rad = match radical_once.take() {
                            Some(known) => known,
                            None => radical(t, &it, sp)?,
                        };
                        match rad {
                            Some(rad) => RadicalPart::Computed(rad),
                            None => {
                                RadicalPart::NotAvailable("not available over this field".into())
                            }
                        }
                    })
                }
                Part::Lie => {
                    if r.lie_algebra == Some(true) {
                        r.lie = Some(lie_invariants(&it, sp)?);
                    }
                }
                Part::MapCentroid => {
                    r.centroid_triples =
                        Some(map_invariant(&it, MapInvariant::CentroidTriples, sp)?)
                }
                Part::MapDerivations => {
                    r.derivation_triples =
                        Some(map_invariant(&it, MapInvariant::DerivationTriples, sp)?)
                }
                Part::MapAdjoint => {
                    r.adjoint_pairs = Some(map_invariant(&it, MapInvariant::AdjointPairs, sp)?)
                }
                Part::MapRadicals => {
                    r.left_radical = Some(map_invariant(&it, MapInvariant::LeftRadical, sp)?);
                    r.right_radical = Some(map_invariant(&it, MapInvariant::RightRadical, sp)?);
                }
            }
            Ok(())
        };
        match compute() {
            Ok(()) => {}
            Err(Error::TooLarge(reason)) => {
                r.skipped.push((part, reason));
                continue;
            }
            Err(e) => return Err(e),
        }
        r.seconds
            .push((part.name().to_string(), start.elapsed().as_secs_f64()));
    }
    Ok(r)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::*;

    #[test]
    fn derivations_by_the_theorem_agree_with_the_system() {
        // differential: Der(A) read as Inn(A) for semisimple associative algebras over Q
        // (Hochschild 1945) against the derivation system itself, also in a basis with
        // entries up to 10^6; the non-semisimple ones go through the system
        let m = crate::tensor::random_invertible(4, 1_000_000, 3);
        let cases = [
            (matrix_algebra(2), true),
            (quaternions(), true),
            (group_algebra_s3(), true),
            (quadratic_field(5), true),
            (
                crate::tensor::change_basis_algebra(&quaternions(), &m).unwrap(),
                true,
            ),
            (truncated_polynomials(3), false),
            (upper_triangular_2(), false),
        ];
        for (t, semisimple) in cases {
            let params = Params {
                only: Some(vec![Part::Derivations]),
                ..Default::default()
            };
            let d = compute_invariants(&t, &params, &mut |_| {})
                .unwrap()
                .derivations
                .unwrap();
            assert_eq!(d.method.is_some(), semisimple);
            let it = IntegralTensor::from_tensor(&t);
            let system = derivations(&it, &params.solve).unwrap();
            assert_eq!(d.space.dim(), system.dim());
            let eqs = super::super::equations::System::new(
                &it,
                &[super::super::equations::Eq::Derivations],
            );
            assert!(crate::linalg::nullspace::check_solutions(&eqs, &d.space.basis).unwrap());
        }
    }
}
