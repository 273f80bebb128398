//! The writer of the text form: combinations, product and output lines, whole schemes,
//! with the scheme's own product labels where they are usable names.

use super::{is_name_char, is_name_start};
use crate::scalar::{FieldSpec, Q, q_to_string};
use crate::scheme::Scheme;
use crate::tensor::Tensor;
use num_traits::{One, Signed, Zero};

/// The symmetric representative of a coefficient for display (over GF(p): in (-p/2, p/2]).
pub(crate) fn display_coef(field: FieldSpec, c: &Q) -> Q {
    match field {
        FieldSpec::Prime(p) if c.is_integer() => {
            let pq = Q::from_integer(p.into());
            if c > &(&pq / Q::from_integer(2.into())) {
                c - pq
            } else {
                c.clone()
            }
        }
        _ => c.clone(),
    }
}

/// Write a combination `sum c_i name_i` as `a11 - 1/2 a22`; `0` when empty.
pub fn write_combination(field: FieldSpec, terms: &[(Q, &str)]) -> String {
    let mut s = String::new();
    for (c, n) in terms {
        let c = display_coef(field, c);
        if c.is_zero() {
            continue;
        }
        let neg = c.is_negative();
        let a = c.abs();
        if s.is_empty() {
            if neg {
                s.push('-');
            }
        } else {
            s.push_str(if neg { " - " } else { " + " });
        }
        if !a.is_one() {
            s.push_str(&q_to_string(&a));
            s.push(' ');
        }
        s.push_str(n);
    }
    if s.is_empty() { "0".into() } else { s }
}

/// A label prefix for the products that clashes with no result name.
pub fn product_prefix(t: &Tensor) -> &'static str {
    let r = t.names()[2].iter();
    ["m", "p", "q", "mult", "t_"]
        .into_iter()
        .find(|p| {
            !r.clone().any(|n| {
                n.strip_prefix(p)
                    .is_some_and(|d| d.chars().all(|c| c.is_ascii_digit()))
            })
        })
        .unwrap_or("mult_")
}

/// The names the text form gives the products: the scheme's labels when they are usable
/// (one per product, distinct names that are no result name), else `{prefix}1..`.
pub fn product_labels(s: &Scheme, t: &Tensor) -> Vec<String> {
    let results: std::collections::HashSet<&str> =
        t.names()[2].iter().map(|n| n.as_str()).collect();
    let mut seen = std::collections::HashSet::new();
    let usable = s.labels.len() == s.rank()
        && s.labels.iter().all(|l| {
            let mut cs = l.chars();
            cs.next().is_some_and(is_name_start)
                && cs.all(is_name_char)
                && !results.contains(l.as_str())
                && seen.insert(l.as_str())
        });
    let pre = product_prefix(t);
    (0..s.rank())
        .map(|i| {
            if usable {
                s.labels[i].clone()
            } else {
                format!("{pre}{}", i + 1)
            }
        })
        .collect()
}

/// The product line of term `tt`: `label = (left combination)*(right combination)`.
pub fn product_line(s: &Scheme, t: &Tensor, tt: usize, labels: &[String]) -> String {
    let names = t.names();
    let factor = |vec: &[Q], axis: usize| -> String {
        let terms: Vec<(Q, &str)> = vec
            .iter()
            .enumerate()
            .filter(|(_, c)| !c.is_zero())
            .map(|(i, c)| (c.clone(), names[axis][i].as_str()))
            .collect();
        if terms.len() == 1 && display_coef(s.field, &terms[0].0).is_one() {
            terms[0].1.to_string()
        } else {
            format!("({})", write_combination(s.field, &terms))
        }
    };
    format!(
        "{} = {}*{}",
        labels[tt],
        factor(&s.u[tt], 0),
        factor(&s.v[tt], 1)
    )
}

/// The output line of result coordinate k (`c12 = m3 + m5`); `None` when it is zero.
pub fn output_line(s: &Scheme, t: &Tensor, k: usize, labels: &[String]) -> Option<String> {
    let terms: Vec<(Q, &str)> = (0..s.rank())
        .filter(|&tt| !s.w[tt][k].is_zero())
        .map(|tt| (s.w[tt][k].clone(), labels[tt].as_str()))
        .collect();
    (!terms.is_empty())
        .then(|| format!("{} = {}", t.name(2, k), write_combination(s.field, &terms)))
}

/// Write a scheme in the text form, with the tensor's basis names. Lines: a comment, the
/// field, one product line per multiplication, one output line per nonzero result
/// coordinate. `parse_text(write_text(s, t), _, t) == s`. Cost: O(r (d0 + d1 + d2)).
pub fn write_text(s: &Scheme, t: &Tensor, title: &str) -> String {
    let labels = product_labels(s, t);
    let mut out = String::new();
    if !title.is_empty() {
        for l in title.lines() {
            out.push_str(&format!("# {l}\n"));
        }
    }
    out.push_str(&format!("field {}\n", s.field.name()));
    out.push_str(&format!("dims {} {} {}\n", s.dims[0], s.dims[1], s.dims[2]));
    out.push_str(&format!("rank {}\n", s.rank()));
    for tt in 0..s.rank() {
        out.push_str(&product_line(s, t, tt, &labels));
        out.push('\n');
    }
    for k in 0..s.dims[2] {
        if let Some(l) = output_line(s, t, k, &labels) {
            out.push_str(&l);
            out.push('\n');
        }
    }
    out
}
