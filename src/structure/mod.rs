//! What a product is made of: its indecomposable blocks, the radical and the simple
//! components of an associative algebra, and the radical, Levi factor and Cartan
//! subalgebra of a Lie algebra. Every result is exact and checked against its definition.
//!
//! - [`blocks`]: the decomposition of any algebra or bilinear map into indecomposable
//!   blocks, from the primitive idempotents of the centroid (of the triple, for a map),
//!   with the change of basis, the block-diagonal tensor (checked) and a certificate that
//!   no block splits further;
//! - [`wedderburn`]: the simple components `M_n(D)` of `A / rad A`, with the primitive
//!   central idempotents and each centre as a field (degree, defining polynomial);
//! - [`lie`]: solvable radical, nilradical, Levi factor and Cartan subalgebra over Q;
//! - [`fields`]: commutative semisimple algebras split into fields, and the decision
//!   whether an algebra is a field (used for "is the centroid a field?");
//! - [`centre`]: the field degrees and trace form of a semisimple centre over Q (catalog
//!   fingerprints);
//! - [`algebra`]: element arithmetic in algebras given by structure constants;
//! - [`quaternion`]: quaternion algebras over Q by Hilbert symbols.
//! - [`matrix_units`]: matrix units of a full matrix algebra given by structure constants;
//! - [`matrix_frame`]: a matrix product `<n,m,p>` written in three bases of the user's
//!   own, its standard bases found exactly; [`frame_module`]: which kernels cut out the
//!   simple module the frame starts from.
//!
//! [`compute_structure`] runs the parts that apply to a tensor.

pub mod algebra;
pub mod blocks;
pub mod centre;
pub mod fields;
pub mod frame_module;
pub mod lie;
pub mod matrix_frame;
pub mod matrix_units;
pub mod quaternion;
pub mod wedderburn;

use crate::error::{Error, Result};
use crate::laws::{self, Law};
use crate::linalg::nullspace::{SolveParams, Space};
use crate::tensor::{Kind, Tensor};
use std::time::Instant;

pub use blocks::{Block, BlockKind, BlockParams, Certificate, Decomposition, decompose};
pub use fields::{FieldDecision, field_decision};
pub use lie::{LieParams, LieStructure, lie_structure};
pub use wedderburn::{Component, Wedderburn, WedderburnParams, wedderburn};

/// Whether the centroid of an algebra, given by its proven basis (maps on A as vectors of
/// n^2 entries), is a field ([`field_decision`] on the centroid as an algebra of maps).
/// Cost: k^3 n for the structure constants of a k-dimensional centroid, then its radical
/// and its field components.
pub fn centroid_is_field(
    t: &Tensor,
    space: &crate::linalg::nullspace::Space,
    params: &SolveParams,
) -> Result<FieldDecision> {
    let n = t.dim();
    crate::with_field!(t.field(), f => {
        use crate::scalar::Field;
        let basis: Vec<Vec<_>> = (0..space.dim())
            .map(|i| space.dense(i).iter().map(|x| f.from_rational(x).expect("in the field")).collect())
            .collect();
        let sub = crate::linalg::subspace::reduce(f, n * n, basis);
        let c = algebra::map_algebra(f, &sub, &[n]);
        let one = sub.coords(&algebra::identity_maps(f, &[n]));
        field_decision(&c, &one, params)
    })
}

/// A part of the structure report (the names of `--only`).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Part {
    Blocks,
    Components,
    Lie,
}

impl Part {
    pub const ALL: [(Part, &'static str); 3] = [
        (Part::Blocks, "blocks"),
        (Part::Components, "components"),
        (Part::Lie, "lie"),
    ];

    pub fn name(self) -> &'static str {
        Part::ALL
            .iter()
            .find(|(p, _)| *p == self)
            .map_or("", |(_, n)| n)
    }

    /// Parse a comma-separated list.
    pub fn parse_list(s: &str) -> Result<Vec<Part>> {
        s.split(',')
            .map(|w| {
                let w = w.trim().to_ascii_lowercase();
                Part::ALL
                    .iter()
                    .find(|(_, n)| *n == w)
                    .map(|(p, _)| *p)
                    .ok_or_else(|| {
                        let names: Vec<&str> = Part::ALL.iter().map(|(_, n)| *n).collect();
                        Error::Invalid(format!("unknown part `{w}` (known: {})", names.join(", ")))
                    })
            })
            .collect()
    }
}

/// What to compute.
#[derive(Clone, Debug)]
pub struct StructureParams {
    /// `None`: every part that applies.
    pub only: Option<Vec<Part>>,
    pub solve: SolveParams,
    pub seed: u64,
    /// Recompute each block's centroid to certify that it does not split further.
    pub certify_blocks: bool,
    /// Verdicts on laws of the whole algebra already decided by the caller (laws are
    /// invariant under a change of basis): used for the associativity and Lie tests and for
    /// a block that is the whole algebra instead of deciding them again.
    pub known_laws: Vec<(Law, bool)>,
    /// The centroid of the whole algebra already computed by the caller (a proven basis of
    /// maps), reused by the block decomposition.
    pub known_centroid: Option<Space>,
}

impl Default for StructureParams {
    fn default() -> Self {
        StructureParams {
            only: None,
            solve: SolveParams::default(),
            seed: 1,
            certify_blocks: true,
            known_laws: Vec::new(),
            known_centroid: None,
        }
    }
}

/// A part that applies or not.
#[derive(Clone, Debug)]
pub enum Outcome<T> {
    Computed(T),
    /// Why the part does not apply (not associative, not a Lie algebra, over GF(p)).
    NotApplicable(String),
}

/// Everything computed; absent parts were not requested.
#[derive(Clone, Debug, Default)]
pub struct Structure {
    pub associative: Option<bool>,
    pub lie_algebra: Option<bool>,
    pub blocks: Option<Decomposition>,
    pub components: Option<Outcome<Wedderburn>>,
    pub lie: Option<Outcome<LieStructure>>,
    /// For each block of [`Structure::blocks`], in order: the laws of [`Law::ALL`] that
    /// hold in it, for a product block of an algebra (`None` otherwise).
    pub block_laws: Vec<Option<Vec<Law>>>,
    /// Wall-clock seconds per part (informative).
    pub seconds: Vec<(String, f64)>,
}

/// Compute the requested parts. `progress` receives a short message before each part.
/// Cost: the blocks need the centroid (n^2 unknowns, or a^2 + b^2 + c^2 for a map); the
/// components the radical and the centre; the Lie part a few n-dimensional systems.
pub fn compute_structure(
    t: &Tensor,
    params: &StructureParams,
    progress: &mut dyn FnMut(&str),
) -> Result<Structure> {
    let parts = params
        .only
        .clone()
        .unwrap_or_else(|| Part::ALL.iter().map(|(p, _)| *p).collect());
    let mut out = Structure::default();
    let is_alg = t.kind() == Kind::Algebra;
    if is_alg {
        let verdicts = decide_laws(t, &[Law::Associative, Law::Lie], &params.known_laws)?;
        let verdict = |law| verdicts.iter().find(|(l, _)| *l == law).map(|(_, v)| *v);
        out.associative = verdict(Law::Associative);
        out.lie_algebra = verdict(Law::Lie);
    }
    for part in parts {
        let start = Instant::now();
        progress(&format!("structure: {}", part.name()));
        match part {
            Part::Blocks => {
                let bp = BlockParams {
                    solve: params.solve.clone(),
                    seed: params.seed,
                    certify: params.certify_blocks,
                    known_centroid: params
                        .known_centroid
                        .clone()
                        .map(|c| std::sync::Arc::new((t.clone(), c))),
                };
                let d = decompose(t, &bp)?;
                out.block_laws = block_laws(t, &d, &params.known_laws)?;
                out.blocks = Some(d);
            }
            Part::Components => {
                out.components = Some(if !is_alg {
                    Outcome::NotApplicable("a bilinear map, not an algebra".into())
                } else if out.associative != Some(true) {
                    Outcome::NotApplicable(
                        "not associative: simple components are computed for associative \
                         algebras"
                            .into(),
                    )
                } else {
                    let wp = WedderburnParams {
                        solve: params.solve.clone(),
                        seed: params.seed,
                        ..Default::default()
                    };
                    Outcome::Computed(wedderburn(t, &wp)?)
                });
            }
            Part::Lie => {
                out.lie = Some(if !is_alg || out.lie_algebra != Some(true) {
                    Outcome::NotApplicable("not a Lie algebra".into())
                } else if t.field() != crate::scalar::FieldSpec::Rational {
                    Outcome::NotApplicable(
                        "over GF(p): the Killing-form methods need characteristic 0".into(),
                    )
                } else {
                    let lp = LieParams {
                        solve: params.solve.clone(),
                        seed: params.seed,
                        ..Default::default()
                    };
                    Outcome::Computed(lie_structure(t, &lp)?)
                });
            }
        }
        out.seconds
            .push((part.name().to_string(), start.elapsed().as_secs_f64()));
    }
    Ok(out)
}

/// The verdicts on `wanted` for the algebra `t`: those in `known` as given, the others
/// decided by [`laws::check_laws`] (stopping at the first failure: only the verdict is
/// needed). Undecided laws (work budget) are left out. Cost: that of the laws not known.
fn decide_laws(t: &Tensor, wanted: &[Law], known: &[(Law, bool)]) -> Result<Vec<(Law, bool)>> {
    let mut out: Vec<(Law, bool)> = Vec::new();
    let mut missing = Vec::new();
    for &law in wanted {
        match known.iter().find(|(l, _)| *l == law) {
            Some(&(_, v)) => out.push((law, v)),
            None => missing.push(law),
        }
    }
    if !missing.is_empty() {
        let lp = laws::Params {
            laws: missing,
            stop_first: true,
            ..Default::default()
        };
        out.extend(laws::check_laws(t, &lp)?.verdicts());
    }
    Ok(out)
}

/// The laws holding in each product block of an algebra's decomposition `d` (see
/// [`Structure::block_laws`]). A block that is the whole algebra (in another basis) has
/// the verdicts `known` of the whole algebra. Cost: the laws of each other block.
fn block_laws(
    t: &Tensor,
    d: &Decomposition,
    known: &[(Law, bool)],
) -> Result<Vec<Option<Vec<Law>>>> {
    let whole = d.blocks.len() == 1;
    d.blocks
        .iter()
        .map(|b| {
            if t.kind() != Kind::Algebra || b.kind != BlockKind::Product {
                return Ok(None);
            }
            let known = if whole { known } else { &[] };
            let verdicts = decide_laws(&b.tensor, &Law::ALL, known)?;
            Ok(Some(
                Law::ALL
                    .iter()
                    .copied()
                    .filter(|l| verdicts.contains(&(*l, true)))
                    .collect(),
            ))
        })
        .collect()
}
