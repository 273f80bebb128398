//! LaTeX output of a scheme: an `align*` environment with the products `m_t` and the
//! outputs, basis names typeset with subscripts (`a11` -> `a_{11}`, `a1_2` -> `a_{1,2}`).
//! Coefficients over GF(p) are shown as symmetric representatives with a `(mod p)` note.

use crate::scalar::FieldSpec;
use crate::scheme::Scheme;
use crate::scheme::cost::{Form, side_forms};
use crate::tensor::Tensor;
use num_traits::{One, Signed};

fn latex_name(n: &str) -> String {
    let split = n.find(|c: char| !c.is_alphabetic()).unwrap_or(n.len());
    let (p, rest) = n.split_at(split);
    let p = if p.is_empty() { "x" } else { p };
    let rest = rest.trim_start_matches('_').replace('_', ",");
    if rest.is_empty() {
        p.to_string()
    } else {
        format!("{p}_{{{rest}}}")
    }
}

fn latex_form(field: FieldSpec, f: &Form, name: &dyn Fn(usize) -> String, paren: bool) -> String {
    let mut s = String::new();
    for (i, c) in f {
        let c = crate::scheme::text::display_coef(field, c);
        let neg = c.is_negative();
        let a = c.abs();
        let coef = if a.is_one() {
            String::new()
        } else if a.is_integer() {
            format!("{} ", a.numer())
        } else {
            format!("\\tfrac{{{}}}{{{}}} ", a.numer(), a.denom())
        };
        if s.is_empty() {
            if neg {
                s.push('-');
            }
        } else {
            s.push_str(if neg { " - " } else { " + " });
        }
        s.push_str(&coef);
        s.push_str(&name(*i));
    }
    if s.is_empty() {
        return "0".into();
    }
    if paren && (f.len() > 1 || s.starts_with('-')) {
        format!("({s})")
    } else {
        s
    }
}

pub(crate) fn emit_latex(s: &Scheme, t: &Tensor, head: &[String]) -> String {
    let field = s.field;
    let [l, r, o] = side_forms(s);
    let labels = crate::scheme::text::product_labels(s, t);
    let mut out = super::syntax::header(head, super::Lang::Latex);
    out.push_str("\\begin{align*}\n");
    let name = |axis: usize| move |i: usize| latex_name(t.name(axis, i));
    let mut lines = Vec::new();
    for tt in 0..s.rank() {
        lines.push(format!(
            "{} &= {}\\,{}",
            latex_name(&labels[tt]),
            latex_form(field, &l[tt], &name(0), true),
            latex_form(field, &r[tt], &name(1), true)
        ));
    }
    let mname = |i: usize| latex_name(&labels[i]);
    for (k, f) in o.iter().enumerate() {
        lines.push(format!(
            "{} &= {}",
            latex_name(t.name(2, k)),
            latex_form(field, f, &mname, false)
        ));
    }
    out.push_str(&lines.join(" \\\\\n"));
    if let FieldSpec::Prime(p) = field {
        out.push_str(&format!(" \\qquad (\\mathrm{{mod}}\\ {p})"));
    }
    out.push_str("\n\\end{align*}\n");
    out
}
