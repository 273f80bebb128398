//! The `analyze` report: everything bilin computes about one product, as data.
//!
//! [`analyze`] gathers the input summary, the laws (for an algebra or a square map) and
//! the ranks into an [`AnalyzeReport`]. It renders as aligned text ([`render_text`]) or
//! as JSON (`serde_json`, schema `bilin.analyze/1`, documented in docs/report-json.md).
//!
//! Extensibility: other analyses append [`Section`]s to `extra` (each with an id, a title,
//! text lines and a JSON value); the text renderer prints them after the built-in ones and
//! the JSON carries them under `"extra"`. Adding a section never changes existing fields.

pub mod identify;
pub mod interval;
pub mod invariants;
mod invariants_text;
pub mod sections;
mod text;

pub use text::render_text;

use crate::error::Result;
use crate::laws::{self, LawReport};
use crate::ranks::{self, RankReport};
use crate::tensor::{Kind, Tensor};
use serde::Serialize;

/// The schema identifier written into every JSON report.
pub const SCHEMA: &str = "bilin.analyze/1";

/// Options of [`analyze`].
#[derive(Clone, Debug, Default)]
pub struct Params {
    pub laws: laws::Params,
    pub ranks: ranks::Params,
    /// The invariants section; `None` leaves it out.
    pub invariants: Option<invariants::InvariantParams>,
    /// The lower-bounds section; `None` leaves it out.
    pub bounds: Option<crate::scheme::bounds::BoundsParams>,
    /// The upper bounds of the rank interval shown beside the lower bounds.
    pub upper: crate::interval::UpperParams,
}

/// What was analysed.
#[derive(Clone, Debug, Serialize)]
pub struct InputSummary {
    /// How the user named the input (file path or generator spec).
    pub source: String,
    /// `Q` or `GF(p)`.
    pub field: String,
    /// `algebra` or `bilinear`.
    pub kind: Kind,
    pub dims: [usize; 3],
    /// Basis names: one list for an algebra, three (left, right, result) for a map.
    pub names: Vec<Vec<String>>,
    /// Number of nonzero structure constants.
    pub nnz: usize,
}

/// An additional report section contributed by another analysis.
#[derive(Clone, Debug, Serialize)]
pub struct Section {
    /// Stable machine name (`invariants`, `lower-bounds`, ...).
    pub id: String,
    /// Heading in the text report.
    pub title: String,
    /// Text lines, printed as they are.
    pub lines: Vec<String>,
    /// The same content as structured data.
    pub data: serde_json::Value,
}

/// The complete analysis of one product.
#[derive(Clone, Debug, Serialize)]
pub struct AnalyzeReport {
    /// Always [`SCHEMA`].
    pub schema: String,
    pub input: InputSummary,
    /// `None` for a non-square bilinear map (laws need an algebra).
    pub laws: Option<LawReport>,
    pub ranks: RankReport,
    /// Sections added by other analyses.
    pub extra: Vec<Section>,
    /// General remarks on how to read the report.
    pub notes: Vec<String>,
}

/// Summarise the input tensor.
pub fn summarize_input(t: &Tensor, source: &str) -> InputSummary {
    let names = match t.kind() {
        Kind::Algebra => vec![t.names()[0].clone()],
        Kind::Bilinear => t.names().to_vec(),
    };
    InputSummary {
        source: source.into(),
        field: t.field().name(),
        kind: t.kind(),
        dims: t.dims(),
        names,
        nnz: t.nnz(),
    }
}

/// Analyse a product: input summary, laws (algebras and square maps) and ranks.
/// Cost: that of [`laws::check_laws`] plus [`ranks::compute_ranks`].
pub fn analyze(t: &Tensor, source: &str, params: &Params) -> Result<AnalyzeReport> {
    analyze_with_progress(t, source, params, &mut |_| {})
}

/// [`analyze`], reporting the steps of long computations to `progress` (the command line
/// shows them on a terminal). Cost: laws and ranks, plus the invariants and bounds
/// sections when `params` asks for them.
pub fn analyze_with_progress(
    t: &Tensor,
    source: &str,
    params: &Params,
    progress: &mut dyn FnMut(&str),
) -> Result<AnalyzeReport> {
    let mut extra = Vec::new();
    if let Some(ip) = &params.invariants {
        extra.push(sections::invariants_section(t, ip, progress)?);
    }
    if let Some(bp) = &params.bounds {
        progress("lower bounds");
        let lower = sections::bounds_section(t, bp);
        progress("rank interval");
        let best = interval::lower_of_section(&lower);
        let iv = crate::interval::rank_interval(t, best, &params.upper, &[]);
        extra.push(lower);
        extra.push(interval::interval_section(&iv));
    }
    let mut notes = Vec::new();
    let laws = if t.is_square() {
        if t.kind() == Kind::Bilinear {
            notes.push(
                "the square bilinear map is read as an algebra on its left basis for the laws"
                    .to_string(),
            );
        }
        Some(laws::check_laws(t, &params.laws)?)
    } else {
        notes.push("laws are not checked: the map is not square (U, V, W differ)".into());
        None
    };
    let ranks = ranks::compute_ranks(t, &params.ranks);
    notes.push(
        "laws of degree 2-4 in one variable are decided through their linearization, \
         exactly, as polynomial identities"
            .into(),
    );
    notes.push(
        "slice span: 'random' is the rank of a random element mod a large prime (lower bound, \
         equal to the generic rank w.h.p.); 'certificate' is the exact rank of the stated \
         integer combination (proven lower bound); 'upper' is min of the two other \
         flattening ranks, or the lower bound itself when every point of a small integer \
         grid has rank at most it (Combinatorial Nullstellensatz; proven); the maximum is \
         proven when a lower bound meets it"
            .into(),
    );
    if let crate::scalar::FieldSpec::Prime(p) = t.field() {
        notes.push(format!(
            "over GF({p}) the slice-span elements are drawn from GF({p}) itself; for a small \
             prime a random element may miss the largest rank, which is then proven only \
             when it meets the upper bound"
        ));
    }
    Ok(AnalyzeReport {
        schema: SCHEMA.into(),
        input: summarize_input(t, source),
        laws,
        ranks,
        extra,
        notes,
    })
}

/// The report as pretty-printed JSON.
pub fn render_json(r: &AnalyzeReport) -> String {
    serde_json::to_string_pretty(r).expect("a report serialises")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{FieldSpec, q};

    #[test]
    fn small_report() {
        let mut t = Tensor::algebra(FieldSpec::Rational, vec!["e".into(), "n".into()]);
        t.set(0, 0, 0, q(1, 1));
        t.set(0, 1, 1, q(1, 1));
        t.set(1, 0, 1, q(1, 1));
        let r = analyze(&t, "dual numbers", &Params::default()).unwrap();
        let txt = render_text(&r);
        assert!(txt.contains("associative"), "{txt}");
        assert!(txt.contains("unit: e"), "{txt}");
        let js: serde_json::Value = serde_json::from_str(&render_json(&r)).unwrap();
        assert_eq!(js["schema"], SCHEMA);
        assert_eq!(js["ranks"]["flattening"][0], 2);
    }
}
