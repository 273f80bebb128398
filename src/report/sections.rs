//! Extra sections of the `analyze` report contributed by other analyses: the invariant
//! algebras ([`invariants_section`]), the proven lower bounds for the tensor rank
//! ([`bounds_section`]) and the structure: blocks, radical, simple components, Lie
//! structure ([`structure_section`]). Each section carries text lines and the same content
//! as JSON.

use super::Section;
use super::invariants::{InvariantParams, invariants_report};
use super::invariants_text;
use crate::error::Result;
use crate::scheme::bounds::{Bounds, BoundsParams, lower_bounds};
use crate::structure::StructureParams;
use crate::tensor::Tensor;

/// The invariants of `t` (all parts that apply to its kind unless `params.only` says
/// otherwise) as a report section. Cost: that of [`invariants_report`].
pub fn invariants_section(
    t: &Tensor,
    source: &str,
    params: &InvariantParams,
    progress: &mut dyn FnMut(&str),
) -> Result<Section> {
    let r = invariants_report(t, params, progress)?;
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
    Ok(Section {
        id: "invariants".into(),
        title: "Invariants".into(),
        lines,
        data: serde_json::to_value(&r).unwrap_or_default(),
    })
}

/// Text lines of a set of lower bounds, each with its theorem.
pub fn bounds_lines(b: &Bounds) -> Vec<String> {
    let mut lines = Vec::new();
    for x in &b.bounds {
        lines.push(format!("R >= {:<4} {}: {}", x.value, x.name, x.detail));
        lines.push(format!("          theorem: {}", x.theorem));
    }
    for n in &b.notes {
        lines.push(format!("note: {n}"));
    }
    lines.push(format!("best lower bound: {}", b.best()));
    lines
}

/// The proven lower bounds for the tensor rank of `t` as a report section.
/// Cost: that of [`lower_bounds`].
pub fn bounds_section(t: &Tensor, params: &BoundsParams) -> Section {
    let b = lower_bounds(t, params);
    Section {
        id: "lower-bounds".into(),
        title: "Lower bounds for the tensor rank".into(),
        lines: bounds_lines(&b),
        data: serde_json::json!({ "best": b.best(), "bounds": b.bounds, "notes": b.notes }),
    }
}

/// The structure of `t` (blocks, radical and simple components, Lie structure: the parts
/// that apply) as a report section, the content of `bilin split`. Cost: that of
/// [`super::structure::split_report`].
pub fn structure_section(
    t: &Tensor,
    params: &StructureParams,
    progress: &mut dyn FnMut(&str),
) -> Result<Section> {
    let (r, _) = super::structure::split_report(t, params, progress)?;
    let text = super::structure::render_text(&r);
    Ok(Section {
        id: "structure".into(),
        title: "Structure: blocks, radical, simple components".into(),
        lines: text.lines().skip(1).map(str::to_string).collect(),
        data: serde_json::to_value(&r).unwrap_or_default(),
    })
}
