//! `bilin verify INPUT SCHEME_FILE [--json]`: exact verification of a scheme; on failure
//! every wrong coefficient (JSON) and the scheme line most likely at fault.

use super::scheme_io::{fail, read_scheme_file};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::scalar::q_to_string;
use bilin::scheme::diagnose::{Fault, Site, locate_fault};
use bilin::scheme::text::{LineMap, output_line, product_labels, product_line};
use bilin::scheme::{Scheme, Wrong, wrong_coefficients};
use bilin::tensor::Tensor;
use serde_json::json;

#[derive(clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// The scheme file (text or JSON form, see docs/schemes.md), or the name of a scheme
    /// stored with the catalog (`matmul222.strassen`; see `bilin catalog show`).
    pub scheme: String,
    /// Also write a picture of the scheme (U, V, W side by side, SVG) to this file.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<String>,
    /// Print a JSON report: every wrong coefficient and the likely faulty line.
    #[arg(long)]
    pub json: bool,
}

/// The likely fault in words and as JSON.
fn describe_fault(
    f: &Fault,
    s: &Scheme,
    t: &Tensor,
    lines: Option<&LineMap>,
    text: &str,
) -> (String, serde_json::Value) {
    let labels = product_labels(s, t);
    let source_line = |ln: usize| text.lines().nth(ln - 1).unwrap_or("").trim().to_string();
    let (kind, name, line, what) = match f.site {
        Site::Product(tt) => (
            "product",
            labels[tt].clone(),
            lines.map(|l| l.products[tt]),
            format!("the product {}", labels[tt]),
        ),
        Site::Output(k) => (
            "output",
            t.name(2, k).to_string(),
            lines.and_then(|l| l.outputs[k]),
            format!("the output line of {}", t.name(2, k)),
        ),
    };
    let fix = f.fix.as_ref().map(|fx| match f.site {
        Site::Product(tt) => product_line(fx, t, tt, &labels),
        Site::Output(k) => output_line(fx, t, k, &labels).unwrap_or_else(|| format!("{name} = 0")),
    });
    let mut msg = match (line, lines) {
        (Some(ln), _) => format!(
            "most likely at fault: line {ln} `{}` ({what})",
            source_line(ln)
        ),
        (None, Some(_)) => format!("most likely at fault: {what}, which has no line in the file"),
        (None, None) => match f.site {
            Site::Product(tt) => format!("most likely at fault: {what} (row {} of u and v)", tt),
            Site::Output(k) => format!("most likely at fault: {what} (column {k} of w)"),
        },
    };
    match &fix {
        Some(x) => msg.push_str(&format!("; with `{x}` the scheme verifies")),
        None => msg.push_str(&format!(
            "; it touches {} of the wrong coefficients, and no change of one line alone repairs the scheme",
            f.touches
        )),
    }
    let v = json!({
        "kind": kind,
        "name": name,
        "line": line,
        "text": line.map(source_line),
        "touches": f.touches,
        "fix": fix,
    });
    (msg, v)
}

fn wrong_json(w: &Wrong, t: &Tensor) -> serde_json::Value {
    let [i, j, k] = w.index;
    json!({
        "left": t.name(0, i),
        "right": t.name(1, j),
        "output": t.name(2, k),
        "index": w.index,
        "expected": q_to_string(&w.expected),
        "got": q_to_string(&w.got),
    })
}

pub fn run(a: &Args) -> i32 {
    let t = match a.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let (s, lines, text) = match read_scheme_file(&a.scheme, &t) {
        Ok(x) => x,
        Err(e) => return fail(&e),
    };
    if let Some(path) = &a.svg
        && let Err(code) = super::draw::write_scheme_picture(&s, &t, &a.scheme, path)
    {
        return code;
    }
    let d = t.dims();
    let wrong = wrong_coefficients(&s, &t);
    let fault = locate_fault(&s, &t, &wrong);
    let described = fault
        .as_ref()
        .map(|f| describe_fault(f, &s, &t, lines.as_ref(), &text));
    if a.json {
        let v = json!({
            "schema": "bilin.verify/1",
            "input": a.source.input,
            "scheme": a.scheme,
            "field": t.field().name(),
            "dims": d,
            "rank": s.rank(),
            "verified": wrong.is_empty(),
            "wrong_count": wrong.len(),
            "wrong": wrong.iter().map(|w| wrong_json(w, &t)).collect::<Vec<_>>(),
            "likely_fault": described.as_ref().map(|x| x.1.clone()),
        });
        println!("{}", serde_json::to_string_pretty(&v).unwrap_or_default());
        return if wrong.is_empty() {
            EXIT_OK
        } else {
            EXIT_FALSE
        };
    }
    match wrong.first() {
        None => {
            println!(
                "verified: rank {} scheme for {} ({}x{}x{}, over {})",
                s.rank(),
                a.source.input,
                d[0],
                d[1],
                d[2],
                t.field().name()
            );
            EXIT_OK
        }
        Some(m) => {
            let [i, j, k] = m.index;
            println!(
                "NOT verified: the coefficient of {} in {}*{} is {} but the scheme gives {}; {} coefficient{} wrong",
                t.name(2, k),
                t.name(0, i),
                t.name(1, j),
                q_to_string(&m.expected),
                q_to_string(&m.got),
                wrong.len(),
                if wrong.len() == 1 { " is" } else { "s are" }
            );
            if let Some((msg, _)) = described {
                println!("{msg}");
            }
            println!("(`bilin verify --json` lists every wrong coefficient)");
            EXIT_FALSE
        }
    }
}
