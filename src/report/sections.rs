//! Extra sections of the `analyze` report contributed by other analyses: the invariant
//! algebras ([`invariants_section`]), the proven lower bounds for the tensor rank
//! ([`bounds_section`]) and the structure: blocks, radical, simple components, Lie
//! structure ([`structure_section`]). Each section carries text lines and the same content
//! as JSON.

use super::Section;
use super::invariants::{InvariantParams, invariants_with_report};
use super::invariants_text;
use crate::error::Result;
use crate::invariants::structure::PropertyResult;
use crate::linalg::nullspace::Space;
use crate::ranks::{Bounds, Measure, Status};
use crate::structure::StructureParams;
use crate::tensor::Tensor;

/// The invariants of `t` (all parts that apply to its kind unless `params.only` says
/// otherwise) as a report section, with the centroid's proven basis when it was
/// computed (for the structure section). Cost: that of
/// [`super::invariants::invariants_report`].
pub fn invariants_section(
    t: &Tensor,
    source: &str,
    params: &InvariantParams,
    progress: &mut dyn FnMut(&str),
) -> Result<(Section, Option<Space>)> {
    let (r, inv) = invariants_with_report(t, params, progress)?;
    let text = invariants_text::render_text(&r, &t.names()[0]);
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    if !r.skipped.is_empty() {
        let names: Vec<&str> = r.skipped.iter().map(|s| s.part.as_str()).collect();
        lines.push(String::new());
        let input = if source
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || "._-/:,+=@".contains(c))
        {
            source.to_string()
        } else {
            format!("'{}'", source.replace('\'', "'\\''"))
        };
        lines.push(format!(
            "skipped parts are computed when asked for by name, whatever their cost: add \
             `--invariants {0}` to this command, or run `bilin invariants {input} --only {0}` \
             (with the same input options)",
            names.join(",")
        ));
    }
    let section = Section {
        id: "invariants".into(),
        title: "Invariants".into(),
        lines,
        data: serde_json::to_value(&r).unwrap_or_default(),
    };
    Ok((section, inv.centroid.map(|c| c.space)))
}

/// Text lines of a set of lower bounds, each with what it bounds, over which field,
/// whether it is proven, and its theorem.
pub fn bounds_lines(b: &Bounds) -> Vec<String> {
    let mut lines = Vec::new();
    for x in &b.bounds {
        let what = match x.measure {
            Measure::Rank => "R",
            Measure::BorderRank => "border R",
        };
        let status = match x.status {
            Status::Proven => "proven",
            Status::Evidence => "evidence only",
        };
        lines.push(format!(
            "{what} >= {:<4} {} ({}; {status}): {}",
            x.value,
            x.name,
            x.scope(),
            x.detail
        ));
        lines.push(format!("          theorem: {}", x.theorem));
    }
    for n in &b.notes {
        lines.push(format!("note: {n}"));
    }
    let field = b.bounds.first().map(|x| x.field.name()).unwrap_or_default();
    lines.push(format!(
        "best lower bound: {} (rank over {field}); for the border rank: {}",
        b.best(),
        b.best_border()
    ));
    if let Some(u) = b.exhaustive_upper {
        let exact = if u == b.best() {
            format!(", so R = {u} over GF(2) exactly")
        } else {
            String::new()
        };
        lines.push(format!(
            "upper bound: R <= {u} over GF(2) (a decomposition the exhaustive search found, checked){exact}"
        ));
    }
    lines
}

/// The proven lower bounds for the tensor rank (as computed by [`crate::ranks::lower_bounds`]) as a
/// report section.
pub fn bounds_section(b: &Bounds) -> Section {
    Section {
        id: "lower-bounds".into(),
        title: "Lower bounds for the tensor rank".into(),
        lines: bounds_lines(b),
        data: serde_json::json!({
            "best": b.best(),
            "best_border": b.best_border(),
            "exhaustive_upper": b.exhaustive_upper,
            "bounds": b.bounds,
            "notes": b.notes,
        }),
    }
}

/// The one structure section of `analyze`: the solvable, nilpotent and semisimple verdicts
/// `properties` (already decided with the laws), then, when `params` is given, the
/// structure of `t` (blocks, radical and simple components, Lie structure: the parts that
/// apply), the content of `bilin split`. JSON data: `{"properties": [...], "split": the
/// split report or null}`. Cost: that of [`super::structure::split_report`].
pub fn structure_section(
    t: &Tensor,
    properties: &[PropertyResult],
    params: Option<&StructureParams>,
    progress: &mut dyn FnMut(&str),
) -> Result<Section> {
    let mut lines: Vec<String> = super::render_properties(properties)
        .lines()
        .map(str::to_string)
        .collect();
    let split = match params {
        Some(sp) => {
            let (r, _) = super::structure::split_report(t, sp, progress)?;
            let text = super::structure::render_text(&r);
            let body = text.lines().skip(1).skip_while(|l| l.is_empty());
            if !lines.is_empty() {
                lines.push(String::new());
            }
            lines.extend(body.map(str::to_string));
            Some(r)
        }
        None => None,
    };
    Ok(Section {
        id: "structure".into(),
        title: "Structure".into(),
        lines,
        data: serde_json::json!({ "properties": properties, "split": split }),
    })
}
