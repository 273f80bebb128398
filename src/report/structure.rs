//! The structure report (`bilin split`, and the structure section of `analyze`): blocks,
//! radical and simple components, Lie structure, as data ([`SplitReport`], JSON schema
//! `bilin.split/1`) with a text rendering in [`super::structure_text`]. Vectors are written
//! in the user's basis names; polynomials in the variable x.

use super::invariants::{VectorSpaceReport, combination};
use crate::error::Result;
use crate::laws::Law;
use crate::poly::to_text;
use crate::scalar::{FieldSpec, Q, q_to_string};
use crate::structure::{
    Block, BlockKind, Certificate, Decomposition, LieStructure, Outcome, Structure,
    StructureParams, Wedderburn, compute_structure,
};
use crate::tensor::{Kind, Tensor, flattening_ranks};
use serde::Serialize;

pub use super::structure_text::render_text;

/// JSON schema name of the report.
pub const SCHEMA: &str = "bilin.split/1";

/// Bases with more entries than this are left out of the report.
const MAX_ENTRIES: usize = 1 << 20;

/// Why a block does not split further.
#[derive(Clone, Debug, Serialize)]
pub struct IndecomposableReport {
    pub reason: String,
    pub centroid_dim: Option<usize>,
    pub centroid_radical_dim: Option<usize>,
    /// `C / rad C` as a field: `Q`, `GF(p)`, `Q[x]/(f)`, `GF(p^d)`.
    pub residue_field: Option<String>,
    pub residue_degree: Option<usize>,
    pub residue_polynomial: Option<String>,
}

/// One block.
#[derive(Clone, Debug, Serialize)]
pub struct BlockReport {
    /// 1-based.
    pub index: usize,
    pub kind: BlockKind,
    pub dims: [usize; 3],
    /// The new basis names of the block, per axis (one list for an algebra).
    pub names: Vec<Vec<String>>,
    /// The new basis vectors in the old basis names, per axis (one list for an algebra).
    pub basis: Vec<Vec<String>>,
    /// Laws that hold in the block (algebra blocks).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub laws: Option<Vec<String>>,
    /// Flattening ranks (blocks of a bilinear map).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub flattening_ranks: Option<[usize; 3]>,
    pub indecomposable: IndecomposableReport,
}

/// The decomposition into blocks.
#[derive(Clone, Debug, Serialize)]
pub struct BlocksReport {
    pub count: usize,
    /// Classes of basis indices joined by nonzero coefficients (a first split).
    pub support_components: usize,
    /// The tensor in the new basis was checked to be block diagonal.
    pub block_diagonal_checked: bool,
    pub coefficients_outside: usize,
    pub blocks: Vec<BlockReport>,
}

/// The centre of a simple component.
#[derive(Clone, Debug, Serialize)]
pub struct CentreReport {
    pub degree: usize,
    /// `Q`, `Q[x]/(f)`, `GF(p)`, `GF(p^d)`.
    pub field: String,
    /// A defining polynomial (monic, irreducible).
    pub polynomial: String,
    /// The generator whose minimal polynomial it is (in the basis of A / rad A).
    pub generator: String,
}

/// One simple component `M_n(D)`.
#[derive(Clone, Debug, Serialize)]
pub struct ComponentReport {
    pub dim: usize,
    /// `M_2(Q)`, `Q[x]/(x^2 + x + 1)`, `GF(2^2)`, ...
    pub shape: String,
    /// The primitive central idempotent in the basis of A / rad A.
    pub idempotent: String,
    pub centre: CentreReport,
    /// `n m` with `dim = [K:F] (n m)^2`.
    pub n_times_index: usize,
    pub n: Option<usize>,
    /// `dim_F D`.
    pub division_dim: Option<usize>,
    pub reason: String,
}

/// Radical and simple components of an associative algebra.
#[derive(Clone, Debug, Serialize)]
pub struct ComponentsReport {
    pub available: bool,
    pub note: Option<String>,
    pub radical: Option<VectorSpaceReport>,
    pub radical_method: Option<String>,
    pub semisimple: Option<bool>,
    pub quotient_dim: Option<usize>,
    /// Names of the basis of A / rad A (kept basis vectors of A).
    pub quotient_basis: Vec<String>,
    pub components: Vec<ComponentReport>,
}

/// A Cartan subalgebra.
#[derive(Clone, Debug, Serialize)]
pub struct CartanReport {
    pub dim: usize,
    /// x with the Cartan subalgebra `L_0(ad x)`.
    pub element: String,
    pub basis: Vec<String>,
}

/// The Lie structure.
#[derive(Clone, Debug, Serialize)]
pub struct LieReport {
    pub available: bool,
    pub note: Option<String>,
    pub solvable_radical: Option<VectorSpaceReport>,
    pub nilradical: Option<VectorSpaceReport>,
    pub levi_dim: Option<usize>,
    pub semisimple: Option<bool>,
    pub cartan: Option<CartanReport>,
}

/// The whole report. Absent parts are `null`.
#[derive(Clone, Debug, Serialize)]
pub struct SplitReport {
    pub schema: &'static str,
    pub field: String,
    pub kind: String,
    pub dims: [usize; 3],
    pub associative: Option<bool>,
    pub lie_algebra: Option<bool>,
    pub blocks: Option<BlocksReport>,
    pub components: Option<ComponentsReport>,
    pub lie: Option<LieReport>,
    pub seconds: Vec<(String, f64)>,
}

/// Compute the structure ([`compute_structure`]) and write it as a report; also returns
/// the decomposition (for `--basis-out` and pictures). Cost: that of the parts, plus the
/// laws of each block.
pub fn split_report(
    t: &Tensor,
    params: &StructureParams,
    progress: &mut dyn FnMut(&str),
) -> Result<(SplitReport, Structure)> {
    let s = compute_structure(t, params, progress)?;
    let r = render_report(t, &s)?;
    Ok((r, s))
}

/// A field given by a degree and a defining polynomial, by name.
pub fn field_name(field: FieldSpec, degree: usize, poly: &[Q]) -> String {
    match (field, degree) {
        (FieldSpec::Rational, 1) => "Q".into(),
        (FieldSpec::Rational, _) => format!("Q[x]/({})", to_text(poly, "x")),
        (FieldSpec::Prime(p), 1) => format!("GF({p})"),
        (FieldSpec::Prime(p), d) => format!("GF({p}^{d})"),
    }
}

fn vectors(vs: &[Vec<Q>], names: &[String]) -> VectorSpaceReport {
    let entries = vs.len().saturating_mul(names.len());
    let omitted = (entries > MAX_ENTRIES).then(|| {
        format!(
            "{} vectors of {} coordinates: more than {MAX_ENTRIES} entries",
            vs.len(),
            names.len()
        )
    });
    VectorSpaceReport {
        dim: vs.len(),
        basis: if omitted.is_some() {
            Vec::new()
        } else {
            vs.iter().map(|v| combination(v, names)).collect()
        },
        basis_omitted: omitted,
    }
}

fn indecomposable(field: FieldSpec, b: &Block) -> IndecomposableReport {
    match &b.certificate {
        Some(Certificate {
            centroid_dim,
            centroid_radical_dim,
            residue_degree,
            residue_poly,
        }) => IndecomposableReport {
            reason: if *centroid_dim == 1 {
                "its centroid is the ground field".into()
            } else {
                "its centroid is local: modulo its radical it is a field".into()
            },
            centroid_dim: Some(*centroid_dim),
            centroid_radical_dim: Some(*centroid_radical_dim),
            residue_field: Some(field_name(field, *residue_degree, residue_poly)),
            residue_degree: Some(*residue_degree),
            residue_polynomial: Some(to_text(residue_poly, "x")),
        },
        None => IndecomposableReport {
            reason: if b.kind == BlockKind::Product {
                "not certified (--no-certify)".into()
            } else {
                "dimension 1".into()
            },
            centroid_dim: None,
            centroid_radical_dim: None,
            residue_field: None,
            residue_degree: None,
            residue_polynomial: None,
        },
    }
}

fn block_report(t: &Tensor, i: usize, b: &Block, laws: Option<&[Law]>) -> BlockReport {
    let alg = t.kind() == Kind::Algebra;
    let axes = if alg { 1 } else { 3 };
    let names = (0..axes).map(|a| b.tensor.names()[a].clone()).collect();
    let basis = (0..axes)
        .map(|a| {
            b.basis[a]
                .iter()
                .map(|v| combination(v, &t.names()[a]))
                .collect()
        })
        .collect();
    let laws = laws.map(|ls| ls.iter().map(|l| l.name().to_string()).collect());
    let flattening = (!alg && b.kind == BlockKind::Product).then(|| flattening_ranks(&b.tensor));
    BlockReport {
        index: i + 1,
        kind: b.kind,
        dims: b.dims,
        names,
        basis,
        laws,
        flattening_ranks: flattening,
        indecomposable: indecomposable(t.field(), b),
    }
}

/// `block_laws`: the laws holding in each block ([`Structure::block_laws`]).
fn blocks_report(t: &Tensor, d: &Decomposition, block_laws: &[Option<Vec<Law>>]) -> BlocksReport {
    BlocksReport {
        count: d.blocks.len(),
        support_components: d.support_components,
        block_diagonal_checked: true,
        coefficients_outside: d.outside,
        blocks: d
            .blocks
            .iter()
            .enumerate()
            .map(|(i, b)| {
                let laws = block_laws.get(i).and_then(|l| l.as_deref());
                block_report(t, i, b, laws)
            })
            .collect(),
    }
}

/// `M_n(D)` in words.
fn shape(field: FieldSpec, c: &crate::structure::Component) -> String {
    let k = field_name(field, c.centre_degree, &c.centre_poly);
    let base = match field {
        FieldSpec::Rational => "Q".to_string(),
        FieldSpec::Prime(p) => format!("GF({p})"),
    };
    match (c.matrix_size, c.division_dim) {
        (Some(1), Some(d)) if d == c.centre_degree => k,
        (Some(n), Some(d)) if d == c.centre_degree => format!("M_{n}({k})"),
        (Some(1), Some(d)) => {
            format!("a division algebra of dimension {d} over {base} with centre {k}")
        }
        (Some(n), Some(d)) => {
            format!("M_{n}(D), D a division algebra of dimension {d} over {base} with centre {k}")
        }
        _ => format!(
            "a central simple algebra of dimension {} over {k}",
            c.dim / c.centre_degree.max(1)
        ),
    }
}

fn components_report(t: &Tensor, o: &Outcome<Wedderburn>) -> ComponentsReport {
    match o {
        Outcome::NotApplicable(why) => ComponentsReport {
            available: false,
            note: Some(why.clone()),
            radical: None,
            radical_method: None,
            semisimple: None,
            quotient_dim: None,
            quotient_basis: Vec::new(),
            components: Vec::new(),
        },
        Outcome::Computed(w) => ComponentsReport {
            available: true,
            note: None,
            radical: Some(vectors(&w.radical, &t.names()[0])),
            radical_method: Some(w.radical_method.clone()),
            semisimple: Some(w.radical_dim == 0),
            quotient_dim: Some(t.dim() - w.radical_dim),
            quotient_basis: w.quotient_names.clone(),
            components: w
                .components
                .iter()
                .map(|c| ComponentReport {
                    dim: c.dim,
                    shape: shape(t.field(), c),
                    idempotent: combination(&c.idempotent, &w.quotient_names),
                    centre: CentreReport {
                        degree: c.centre_degree,
                        field: field_name(t.field(), c.centre_degree, &c.centre_poly),
                        polynomial: to_text(&c.centre_poly, "x"),
                        generator: combination(&c.centre_generator, &w.quotient_names),
                    },
                    n_times_index: c.n_times_index,
                    n: c.matrix_size,
                    division_dim: c.division_dim,
                    reason: c.reason.clone(),
                })
                .collect(),
        },
    }
}

fn lie_report(t: &Tensor, o: &Outcome<LieStructure>) -> LieReport {
    let names = &t.names()[0];
    match o {
        Outcome::NotApplicable(why) => LieReport {
            available: false,
            note: Some(why.clone()),
            solvable_radical: None,
            nilradical: None,
            levi_dim: None,
            semisimple: None,
            cartan: None,
        },
        Outcome::Computed(l) => LieReport {
            available: true,
            note: None,
            solvable_radical: Some(vectors(&l.radical, names)),
            nilradical: Some(vectors(&l.nilradical, names)),
            levi_dim: Some(l.levi_dim),
            semisimple: Some(l.radical.is_empty()),
            cartan: l.cartan_dim.map(|d| CartanReport {
                dim: d,
                element: combination(l.cartan_element.as_deref().unwrap_or(&[]), names),
                basis: vectors(&l.cartan_basis, names).basis,
            }),
        },
    }
}

/// The report of a computed structure.
pub fn render_report(t: &Tensor, s: &Structure) -> Result<SplitReport> {
    Ok(SplitReport {
        schema: SCHEMA,
        field: t.field().name(),
        kind: if t.kind() == Kind::Algebra {
            "algebra"
        } else {
            "bilinear"
        }
        .into(),
        dims: t.dims(),
        associative: s.associative,
        lie_algebra: s.lie_algebra,
        blocks: s
            .blocks
            .as_ref()
            .map(|d| blocks_report(t, d, &s.block_laws)),
        components: s.components.as_ref().map(|c| components_report(t, c)),
        lie: s.lie.as_ref().map(|l| lie_report(t, l)),
        seconds: s.seconds.clone(),
    })
}

/// The change of basis of a decomposition as a change-of-basis file (docs/formats.md):
/// `bilin transform INPUT --basis FILE` then gives the block-diagonal tensor.
pub fn basis_file(t: &Tensor, d: &Decomposition) -> String {
    let mut s = String::from(
        "# the change of basis into indecomposable blocks (columns: new basis vectors)\n",
    );
    let write = |s: &mut String, head: &str, a: usize| {
        s.push_str(head);
        s.push('\n');
        let m = &d.change[a];
        for r in 0..m.rows {
            let row: Vec<String> = m.row(r).iter().map(q_to_string).collect();
            s.push_str(&row.join(" "));
            s.push('\n');
        }
        s.push_str("end\n");
    };
    if t.kind() == Kind::Algebra {
        write(&mut s, "matrix", 0);
        s.push_str(&format!("names {}\n", d.tensor.names()[0].join(" ")));
    } else {
        for (a, w) in ["left", "right", "result"].iter().enumerate() {
            write(&mut s, &format!("matrix {w}"), a);
        }
        for (a, w) in ["left", "right", "result"].iter().enumerate() {
            if !d.tensor.names()[a].is_empty() {
                s.push_str(&format!("names {w} {}\n", d.tensor.names()[a].join(" ")));
            }
        }
    }
    s
}
