//! The `analyze` report: everything bilin computes about one product, as data.
//! ([`structure`] is the report of `bilin split`, also a section of `analyze`.)
//!
//! [`analyze`] gathers the input summary, the laws (for an algebra or a square map) and
//! the ranks into an [`AnalyzeReport`]. It renders as aligned text ([`render_text`]) or
//! as JSON (`serde_json`, schema `bilin.analyze/2`, documented in docs/report-json.md).
//!
//! Extensibility: other analyses append [`Section`]s to `extra` (each with an id, a title,
//! text lines and a JSON value); the text renderer prints them after the built-in ones and
//! the JSON carries them under `"extra"`. Adding a section never changes existing fields.

pub mod identify;
pub mod interval;
pub mod invariants;
mod invariants_text;
pub mod sections;
pub mod structure;
mod structure_text;
mod text;

pub use text::{render_head, render_notes, render_properties, render_section, render_text};

use crate::error::Result;
use crate::invariants::structure::{KnownLaws, Property, PropertyResult, decide_properties};
use crate::laws::{self, Law, LawReport};
use crate::ranks::{self, RankReport};
use crate::structure::StructureParams;
use crate::tensor::{Kind, Tensor};
use serde::Serialize;

/// The schema identifier written into every JSON report.
pub const SCHEMA: &str = "bilin.analyze/2";

/// Options of [`analyze`].
#[derive(Clone, Debug)]
pub struct Params {
    pub laws: laws::Params,
    /// The structural properties to decide (solvable, nilpotent, semisimple).
    pub properties: Vec<Property>,
    /// Decide the laws and properties of a bilinear map too (a square map is then read as
    /// an algebra on its left basis); by default a map gets none.
    pub laws_of_maps: bool,
    pub ranks: ranks::Params,
    /// The invariants section; `None` leaves it out.
    pub invariants: Option<invariants::InvariantParams>,
    /// The lower-bounds section; `None` leaves it out.
    pub bounds: Option<crate::ranks::BoundsParams>,
    /// The upper bounds of the rank interval shown after the lower bounds.
    pub upper: crate::interval::UpperParams,
    /// The structure section (solvable, nilpotent, semisimple; blocks, radical and simple
    /// components, Lie structure); `None` leaves out its costly part (the properties stay).
    pub structure: Option<StructureParams>,
}

impl Default for Params {
    fn default() -> Self {
        Params {
            laws: laws::Params::default(),
            properties: Property::ALL.to_vec(),
            laws_of_maps: false,
            ranks: ranks::Params::default(),
            invariants: None,
            bounds: None,
            upper: crate::interval::UpperParams::default(),
            structure: None,
        }
    }
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
    /// `None` for a bilinear map (unless asked) and when no law is asked.
    pub laws: Option<LawReport>,
    /// Solvable, nilpotent, semisimple (those asked for). In JSON they are part of the
    /// structure section (`extra`, id `structure`, field `properties`).
    #[serde(skip)]
    pub properties: Vec<PropertyResult>,
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
    analyze_streaming(t, source, params, progress, &mut |_| {})
}

/// A part of the report, handed out as soon as it is computed.
pub enum Piece<'a> {
    /// The input, laws and ranks (the report without its extra sections).
    Head(&'a AnalyzeReport),
    /// One extra section.
    Section(&'a Section),
}

/// [`analyze_with_progress`], handing each part of the report to `emit` as soon as it is
/// computed: first the cheap head (input, laws, ranks), then the lower bounds, then the
/// invariants, then the structure section (the properties decided with the laws, then the
/// blocks, radical and components), so that a caller can print them at once.
pub fn analyze_streaming(
    t: &Tensor,
    source: &str,
    params: &Params,
    progress: &mut dyn FnMut(&str),
    emit: &mut dyn FnMut(Piece),
) -> Result<AnalyzeReport> {
    let mut notes = Vec::new();
    let is_map = t.kind() == Kind::Bilinear;
    let wanted = !params.laws.laws.is_empty() || !params.properties.is_empty();
    let mut laws = None;
    let mut known_laws = Vec::new();
    let mut properties = Vec::new();
    if is_map && !params.laws_of_maps {
        notes.push(
            "laws are not checked for a bilinear map (U x V -> W); to read a square map as an \
             algebra (the i-th basis vectors of U, V and W identified) ask with --laws"
                .into(),
        );
    } else if !t.is_square() {
        if wanted {
            notes.push("laws are not checked: the map is not square (U, V, W differ)".into());
        }
    } else if wanted {
        if is_map {
            notes.push(
                "the square bilinear map is read as an algebra for the laws: the i-th basis \
                 vectors of U, V and W are identified and named by the left basis"
                    .to_string(),
            );
        }
        let alg = t.as_algebra().expect("square");
        progress("laws");
        let lr = laws::check_laws(&alg, &params.laws)?;
        if !is_map {
            known_laws = lr.verdicts();
        }
        if !params.properties.is_empty() {
            progress("solvable, nilpotent, semisimple");
            let mut known = KnownLaws {
                lie: lr.holds(Law::Lie),
                associative: lr.holds(Law::Associative),
            };
            if params.properties.contains(&Property::Semisimple)
                && (known.lie.is_none() || known.associative.is_none())
            {
                let lp = laws::Params {
                    laws: vec![Law::Associative, Law::Lie],
                    stop_first: true,
                    ..params.laws.clone()
                };
                let more = laws::check_laws(&alg, &lp)?;
                known.lie = known.lie.or(more.holds(Law::Lie));
                known.associative = known.associative.or(more.holds(Law::Associative));
            }
            let solve = params
                .invariants
                .as_ref()
                .map(|ip| ip.solve.clone())
                .unwrap_or_default();
            properties = decide_properties(&alg, &params.properties, known, &solve)?;
        }
        if !params.laws.laws.is_empty() {
            laws = Some(lr);
        }
    }
    progress("ranks");
    let ranks = ranks::compute_ranks(t, &params.ranks);
    if laws.is_some() {
        notes.push(
            "laws of degree 2-4 in one variable are decided through their linearization, \
             exactly, as polynomial identities"
                .into(),
        );
    }
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
    let mut report = AnalyzeReport {
        schema: SCHEMA.into(),
        input: summarize_input(t, source),
        laws,
        properties,
        ranks,
        extra: Vec::new(),
        notes,
    };
    emit(Piece::Head(&report));
    if let Some(bp) = &params.bounds {
        progress("lower bounds");
        let lower = crate::ranks::lower_bounds(t, bp);
        let sec = sections::bounds_section(&lower);
        emit(Piece::Section(&sec));
        report.extra.push(sec);
        progress("rank interval");
        let iv = interval::interval_of(t, &lower, &params.upper, &[]);
        let sec = interval::interval_section(&iv);
        emit(Piece::Section(&sec));
        report.extra.push(sec);
    }
    let mut centroid = None;
    if let Some(ip) = &params.invariants {
        let (sec, c) = sections::invariants_section(t, source, ip, progress)?;
        emit(Piece::Section(&sec));
        report.extra.push(sec);
        centroid = c;
    }
    if !report.properties.is_empty() || params.structure.is_some() {
        let structure = params.structure.clone().map(|sp| StructureParams {
            known_laws: known_laws.clone(),
            known_centroid: centroid.clone(),
            ..sp
        });
        let sec = sections::structure_section(t, &report.properties, structure.as_ref(), progress)?;
        emit(Piece::Section(&sec));
        report.extra.push(sec);
    }
    Ok(report)
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
