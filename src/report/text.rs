//! Plain-text rendering of an [`AnalyzeReport`]: aligned sections meant for a terminal.

use super::{AnalyzeReport, Section};
use crate::invariants::structure::PropertyResult;
use crate::laws::LawReport;
use crate::ranks::RankReport;
use crate::tensor::Kind;
use std::fmt::Write;

/// Lines are wrapped near this width where lists are long.
const WIDTH: usize = 88;
/// Longer name lists are abbreviated.
const MAX_NAMES: usize = 40;
/// More slices than this along an axis are summarised by rank.
const MAX_LISTED_SLICES: usize = 48;

/// Render the whole report.
pub fn render_text(r: &AnalyzeReport) -> String {
    let mut s = render_head(r);
    for sec in &r.extra {
        s.push_str(&render_section(sec));
    }
    s.push_str(&render_notes(r));
    s
}

/// The head of the report: the input, the laws and the ranks (the solvable, nilpotent and
/// semisimple verdicts open the structure section, [`render_properties`]).
pub fn render_head(r: &AnalyzeReport) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "bilin analyze: {}", r.input.source);
    input(&mut s, r);
    if let Some(l) = &r.laws {
        laws(&mut s, l);
    }
    ranks(&mut s, &r.ranks);
    s
}

/// One extra section.
pub fn render_section(sec: &Section) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "\n== {} ==", sec.title);
    for l in &sec.lines {
        if l.is_empty() {
            s.push('\n');
        } else {
            let _ = writeln!(s, "  {l}");
        }
    }
    s
}

/// The closing notes.
pub fn render_notes(r: &AnalyzeReport) -> String {
    let mut s = String::new();
    if !r.notes.is_empty() {
        let _ = writeln!(s, "\n== Notes ==");
        for n in &r.notes {
            wrap(&mut s, "  - ", "    ", n);
        }
    }
    s
}

/// The solvable, nilpotent and semisimple verdicts with their witnesses, as text without a
/// heading (the structure section opens with them).
pub fn render_properties(props: &[PropertyResult]) -> String {
    let mut s = String::new();
    properties(&mut s, props);
    s
}

fn properties(s: &mut String, props: &[PropertyResult]) {
    let w = props
        .iter()
        .map(|p| p.property.name().len())
        .max()
        .unwrap_or(4);
    for p in props {
        let verdict = match p.holds {
            Some(true) => "yes",
            Some(false) => "no",
            None => "undecided",
        };
        let head = format!("{:<w$}  {:<9}  ", p.property.name(), verdict);
        let indent = " ".repeat(head.len());
        wrap(s, &head, &indent, &p.detail);
        if let Some(wi) = &p.witness {
            wrap(
                s,
                &indent,
                &indent,
                &format!("witness: {}:", wi.description),
            );
            for (i, v) in wi.vectors.iter().enumerate().take(12) {
                wrap(
                    s,
                    &format!("{indent}  [{i}] "),
                    &format!("{indent}      "),
                    v,
                );
            }
            if wi.vectors.len() > 12 {
                let _ = writeln!(
                    s,
                    "{indent}  ... {} more (see --json)",
                    wi.vectors.len() - 12
                );
            }
        }
        if !p.method.is_empty() {
            wrap(s, &indent, &indent, &format!("[{}]", p.method));
        }
        for n in &p.notes {
            wrap(s, &format!("{indent}note: "), &format!("{indent}      "), n);
        }
    }
}

/// Append `text` word-wrapped, the first line after `first`, the others after `rest`.
fn wrap(s: &mut String, first: &str, rest: &str, text: &str) {
    let mut line = first.to_string();
    let mut empty = true;
    for w in text.split(' ') {
        if !empty && line.len() + 1 + w.len() > WIDTH {
            let _ = writeln!(s, "{line}");
            line = rest.to_string();
            empty = true;
        }
        if !empty {
            line.push(' ');
        }
        line.push_str(w);
        empty = false;
    }
    let _ = writeln!(s, "{line}");
}

fn names_text(names: &[String]) -> String {
    if names.len() <= MAX_NAMES {
        names.join(" ")
    } else {
        format!(
            "{} ... {} ({} names)",
            names[..MAX_NAMES - 4].join(" "),
            names[names.len() - 2..].join(" "),
            names.len()
        )
    }
}

fn input(s: &mut String, r: &AnalyzeReport) {
    let i = &r.input;
    let _ = writeln!(s, "\n== Input ==");
    let _ = writeln!(s, "  {:<12}{}", "field", i.field);
    let (kind, dims) = match i.kind {
        Kind::Algebra => ("algebra", format!("{}", i.dims[0])),
        Kind::Bilinear => (
            "bilinear map",
            format!("{} x {} -> {}", i.dims[0], i.dims[1], i.dims[2]),
        ),
    };
    let _ = writeln!(s, "  {:<12}{}", "kind", kind);
    let _ = writeln!(s, "  {:<12}{}", "dimension", dims);
    if i.names.len() == 1 {
        wrap(
            s,
            &format!("  {:<12}", "basis"),
            &" ".repeat(14),
            &names_text(&i.names[0]),
        );
    } else {
        for (label, n) in ["left", "right", "result"].iter().zip(&i.names) {
            wrap(
                s,
                &format!("  {label:<12}"),
                &" ".repeat(14),
                &names_text(n),
            );
        }
    }
    let _ = writeln!(s, "  {:<12}{}", "nonzero", i.nnz);
}

fn verdict(h: Option<bool>) -> &'static str {
    match h {
        Some(true) => "yes",
        Some(false) => "no",
        None => "skipped",
    }
}

fn laws(s: &mut String, l: &LawReport) {
    let _ = writeln!(
        s,
        "\n== Laws (over {}, dimension {}) ==",
        l.field, l.dimension
    );
    let w = l
        .results
        .iter()
        .map(|r| r.law.name().len())
        .max()
        .unwrap_or(4)
        .max(3);
    let _ = writeln!(
        s,
        "  {:<w$}  {:<7}  {:>15}  witness",
        "law", "holds", "failing/checked"
    );
    for r in &l.results {
        let counts = format!("{}/{}", r.failures, r.checked);
        let detail = match (&r.witness, &r.unit) {
            (Some(wi), _) => format!("{} = {}", wi.expression, wi.value),
            (None, Some(u)) => format!("unit: {u}"),
            _ => String::new(),
        };
        let head = format!(
            "  {:<w$}  {:<7}  {:>15}  ",
            r.law.name(),
            verdict(r.holds),
            counts
        );
        let indent = " ".repeat(head.len());
        wrap(s, &head, &indent, &detail);
    }
    let _ = writeln!(s, "\n  identities and method:");
    for r in &l.results {
        wrap(
            s,
            &format!("  {:<w$}  ", r.law.name()),
            &" ".repeat(w + 4),
            &r.identity,
        );
        wrap(
            s,
            &" ".repeat(w + 4),
            &" ".repeat(w + 4),
            &format!("[{}]", r.method),
        );
        for n in &r.notes {
            wrap(
                s,
                &format!("{}note: ", " ".repeat(w + 4)),
                &" ".repeat(w + 10),
                n,
            );
        }
    }
    for n in &l.notes {
        wrap(s, "  note: ", "        ", n);
    }
}

fn ranks(s: &mut String, r: &RankReport) {
    let _ = writeln!(s, "\n== Ranks ==");
    let _ = writeln!(
        s,
        "  flattening ranks: left {}, right {}, result {}",
        r.flattening[0], r.flattening[1], r.flattening[2]
    );
    let _ = writeln!(
        s,
        "\n  slice ranks (slices along an axis; shape rows x columns):"
    );
    for a in &r.slices {
        let head = format!("  {:<7} {:>4} x {:<4} ", a.axis, a.shape[0], a.shape[1]);
        let body = if a.ranks.len() <= MAX_LISTED_SLICES {
            a.ranks
                .iter()
                .map(|(n, k)| format!("{n}:{k}"))
                .collect::<Vec<_>>()
                .join(" ")
        } else {
            let mut hist: Vec<(usize, usize)> = Vec::new();
            for (_, k) in &a.ranks {
                match hist.iter_mut().find(|h| h.0 == *k) {
                    Some(h) => h.1 += 1,
                    None => hist.push((*k, 1)),
                }
            }
            hist.sort();
            hist.iter()
                .map(|(k, c)| format!("rank {k}: {c} slices"))
                .collect::<Vec<_>>()
                .join(", ")
        };
        wrap(s, &head, &" ".repeat(head.len()), &body);
    }
    let _ = writeln!(s, "\n  largest rank in the slice span:");
    let _ = writeln!(
        s,
        "  {:<7}  {:>14}  {:>11}  {:>5}  status",
        "axis", "random (mod p)", "certificate", "upper"
    );
    for x in &r.span {
        let status = match (x.proven, x.upper_bound_method.starts_with("grid")) {
            (true, true) => "proven maximum (grid argument)",
            (true, false) => "proven maximum",
            _ => "lower bounds only",
        };
        let _ = writeln!(
            s,
            "  {:<7}  {:>14}  {:>11}  {:>5}  {}",
            x.axis, x.random_rank, x.certificate_rank, x.upper_bound, status
        );
    }
    for x in &r.span {
        let c = x
            .certificate
            .iter()
            .map(|v| v.to_string())
            .collect::<Vec<_>>()
            .join(", ");
        wrap(
            s,
            &format!(
                "  certificate {:<7} (p = {}): coefficients ",
                x.axis, x.prime
            ),
            "      ",
            &format!("({c})"),
        );
    }
}
