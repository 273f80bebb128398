//! Text rendering of the structure report ([`SplitReport`]): the blocks with their bases
//! and certificates, the radical and simple components, the Lie structure.

use super::invariants::VectorSpaceReport;
use super::structure::{BlockReport, ComponentsReport, LieReport, SplitReport};
use crate::structure::BlockKind;
use std::fmt::Write;

/// Basis vectors listed per block or space before `... (see --json)`.
const LISTED: usize = 8;

fn yes_no(b: Option<bool>) -> &'static str {
    match b {
        Some(true) => "yes",
        Some(false) => "no",
        None => "not decided",
    }
}

fn dims_text(kind: &str, d: [usize; 3]) -> String {
    if kind == "algebra" {
        format!("{}", d[0])
    } else {
        format!("{} x {} -> {}", d[0], d[1], d[2])
    }
}

fn list(s: &mut String, indent: &str, items: &[String]) {
    for x in items.iter().take(LISTED) {
        let _ = writeln!(s, "{indent}{x}");
    }
    if items.len() > LISTED {
        let _ = writeln!(s, "{indent}... {} more (see --json)", items.len() - LISTED);
    }
}

fn space(s: &mut String, title: &str, v: &VectorSpaceReport) {
    let _ = writeln!(s, "{title}: dim {}", v.dim);
    let items: Vec<String> = v
        .basis
        .iter()
        .enumerate()
        .map(|(i, b)| format!("[{i}] {b}"))
        .collect();
    list(s, "  ", &items);
    if let Some(why) = &v.basis_omitted {
        let _ = writeln!(s, "  (basis not written: {why})");
    }
}

fn block(s: &mut String, kind: &str, b: &BlockReport) {
    let what = match b.kind {
        BlockKind::Product => "",
        BlockKind::ZeroAlgebra => ", zero product",
        BlockKind::LeftRadical => ", a left vector with zero products",
        BlockKind::RightRadical => ", a right vector with zero products",
        BlockKind::Cokernel => ", a result vector outside the span of the products",
    };
    let _ = writeln!(
        s,
        "\nblock {}: dim {}{what}",
        b.index,
        dims_text(kind, b.dims)
    );
    let ind = &b.indecomposable;
    match (&ind.residue_field, ind.centroid_dim) {
        (Some(fld), Some(cd)) => {
            let _ = writeln!(
                s,
                "  indecomposable: centroid of dim {cd} (radical {}), modulo its radical the \
                 field {fld}",
                ind.centroid_radical_dim.unwrap_or(0)
            );
        }
        _ => {
            let _ = writeln!(s, "  indecomposable: {}", ind.reason);
        }
    }
    if let Some(l) = &b.laws {
        let _ = writeln!(
            s,
            "  laws: {}",
            if l.is_empty() {
                "none of the listed laws".to_string()
            } else {
                l.join(", ")
            }
        );
    }
    if let Some(r) = b.flattening_ranks {
        let _ = writeln!(s, "  flattening ranks: {} {} {}", r[0], r[1], r[2]);
    }
    let axes = ["left", "right", "result"];
    for (a, (names, vecs)) in b.names.iter().zip(&b.basis).enumerate() {
        if names.is_empty() {
            continue;
        }
        let label = if b.names.len() == 1 { "basis" } else { axes[a] };
        let items: Vec<String> = names
            .iter()
            .zip(vecs)
            .map(|(n, v)| {
                if n == v {
                    n.clone()
                } else {
                    format!("{n} = {v}")
                }
            })
            .collect();
        let _ = writeln!(s, "  {label}:");
        list(s, "    ", &items);
    }
}

fn components(s: &mut String, c: &ComponentsReport) {
    if !c.available {
        let _ = writeln!(
            s,
            "\nradical and simple components: not available ({})",
            c.note.as_deref().unwrap_or("")
        );
        return;
    }
    s.push('\n');
    if let Some(r) = &c.radical {
        space(
            s,
            &format!(
                "radical ({})",
                c.radical_method.as_deref().unwrap_or("exact")
            ),
            r,
        );
    }
    let _ = writeln!(
        s,
        "  semisimple: {}   dim A/rad A = {}",
        yes_no(c.semisimple),
        c.quotient_dim.unwrap_or(0)
    );
    let dims: Vec<String> = c.components.iter().map(|x| x.dim.to_string()).collect();
    if dims.is_empty() {
        let _ = writeln!(s, "\nsimple components of A/rad A: none (A is its radical)");
    } else {
        let _ = writeln!(
            s,
            "\nsimple components of A/rad A: {} (dimensions {})",
            c.components.len(),
            dims.join(" + ")
        );
    }
    // idempotents and generators live in A/rad A: say so when it differs from A
    let modulo = if c.radical.as_ref().is_some_and(|r| r.dim > 0) {
        " (modulo the radical)"
    } else {
        ""
    };
    for (i, x) in c.components.iter().enumerate() {
        let _ = writeln!(s, "  [{}] dim {}: {}", i + 1, x.dim, x.shape);
        let _ = writeln!(
            s,
            "      centre {} of degree {}, a root of {}",
            x.centre.field, x.centre.degree, x.centre.polynomial
        );
        let _ = writeln!(s, "      {}", x.reason);
        let _ = writeln!(s, "      central idempotent{modulo}: {}", x.idempotent);
    }
}

fn lie(s: &mut String, l: &LieReport) {
    if !l.available {
        let _ = writeln!(
            s,
            "\nLie structure: not available ({})",
            l.note.as_deref().unwrap_or("")
        );
        return;
    }
    s.push('\n');
    if let Some(r) = &l.solvable_radical {
        space(s, "solvable radical", r);
    }
    if let Some(r) = &l.nilradical {
        space(s, "nilradical", r);
    }
    let _ = writeln!(
        s,
        "Levi factor: dim {}   semisimple: {}",
        l.levi_dim.unwrap_or(0),
        yes_no(l.semisimple)
    );
    match &l.cartan {
        Some(c) => {
            let _ = writeln!(
                s,
                "Cartan subalgebra: dim {} (the generalized kernel of ad x, x = {}; nilpotent)",
                c.dim, c.element
            );
        }
        None => {
            let _ = writeln!(s, "Cartan subalgebra: not found with the elements tried");
        }
    }
}

/// Render the report as text.
pub fn render_text(r: &SplitReport) -> String {
    let mut s = String::new();
    let what = if r.kind == "algebra" {
        format!("an algebra of dimension {}", r.dims[0])
    } else {
        format!("a bilinear map {}", dims_text("bilinear", r.dims))
    };
    let _ = writeln!(s, "structure over {} of {what}", r.field);
    if r.kind == "algebra" {
        let _ = writeln!(
            s,
            "associative: {}   Lie algebra: {}",
            yes_no(r.associative),
            yes_no(r.lie_algebra)
        );
    }
    if let Some(b) = &r.blocks {
        let sizes: Vec<String> = b
            .blocks
            .iter()
            .map(|x| dims_text(&r.kind, x.dims))
            .collect();
        let _ = writeln!(
            s,
            "\nindecomposable blocks: {} ({})",
            b.count,
            if b.count <= 24 {
                sizes.join(" + ")
            } else {
                format!("{} ...", sizes[..24].join(" + "))
            }
        );
        let _ = writeln!(
            s,
            "  checked: the tensor in the new basis is block diagonal ({} coefficients \
             outside the blocks)",
            b.coefficients_outside
        );
        for x in &b.blocks {
            block(&mut s, &r.kind, x);
        }
    }
    if let Some(c) = &r.components {
        components(&mut s, c);
    }
    if let Some(l) = &r.lie {
        lie(&mut s, l);
    }
    s
}
