//! Element-wise check of an identity over a tiny finite field.
//!
//! Over GF(p) with `p < d` (the degree in the repeated variable), a polynomial identity can
//! fail while every element of the algebra over GF(p) itself satisfies the law (e.g.
//! `a^3 = a` for all a in GF(2)). When `p^n` is small, this module settles the element-wise
//! question exactly by substituting every element `x` of GF(p)^n for the repeated variable
//! (the identity stays linear in the other variables, so basis elements suffice there).
//!
//! Cost: `p^n * n^m` evaluations of the identity.

use super::check::Witness;
use super::expr::{Identity, Notation, Sparse, eval, format_combination, normalise, render};
use crate::scalar::Field;
use crate::tensor::Table;

/// The outcome of an element-wise check.
pub enum Pointwise {
    /// Every element satisfies the law; the number of elements tried.
    Holds(u64),
    /// A failing element.
    Fails(Witness),
}

/// Check `id` (first `d` variables repeated) on every element of GF(p)^n, provided
/// `p^n <= max_elements`; `None` when the field is not finite or too many elements.
pub fn check_pointwise<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    id: &Identity,
    d: usize,
    notation: Notation,
    max_elements: u64,
) -> Option<Pointwise> {
    let p = f.characteristic();
    let n = t.dims[0];
    if p == 0 {
        return None;
    }
    let total = p.checked_pow(u32::try_from(n).ok()?)?;
    if total > max_elements {
        return None;
    }
    let m = id.nvars - d;
    let coefs: Vec<F::Elem> = id.terms.iter().map(|(c, _)| f.from_i64(*c)).collect();
    let mut digits = vec![0u64; n];
    for _ in 0..total {
        let x: Sparse<F::Elem> = digits
            .iter()
            .enumerate()
            .filter(|(_, v)| **v != 0)
            .map(|(i, v)| (i, f.from_i64(*v as i64)))
            .collect();
        let mut free = vec![0usize; m];
        loop {
            let units: Vec<Sparse<F::Elem>> = free.iter().map(|&i| vec![(i, f.one())]).collect();
            let mut values: Vec<&[(usize, F::Elem)]> = vec![x.as_slice(); d];
            values.extend(units.iter().map(|u| u.as_slice()));
            let mut acc = Vec::new();
            for ((_, e), c) in id.terms.iter().zip(&coefs) {
                for (k, v) in eval(f, t, e, &values).iter() {
                    acc.push((*k, f.mul(v, c)));
                }
            }
            let value = normalise(f, acc);
            if !value.is_empty() {
                let xs = format_combination(f, &x, names);
                let mut vn = vec!["x"; d];
                vn.extend(free.iter().map(|&i| names[i].as_str()));
                let terms: Vec<(i64, String)> = id
                    .terms
                    .iter()
                    .map(|(c, e)| (*c, render(e, &vn, notation)))
                    .collect();
                let mut tuple = vec![xs.clone()];
                tuple.extend(free.iter().map(|&i| names[i].clone()));
                return Some(Pointwise::Fails(Witness {
                    tuple,
                    expression: format!("{} with x = {xs}", super::expr::render_sum(&terms)),
                    value: format_combination(f, &value, names),
                }));
            }
            let mut i = m;
            let mut advanced = false;
            while i > 0 {
                i -= 1;
                if free[i] + 1 < n {
                    free[i] += 1;
                    advanced = true;
                    break;
                }
                free[i] = 0;
            }
            if !advanced {
                break;
            }
        }
        for dgt in digits.iter_mut() {
            *dgt += 1;
            if *dgt < p {
                break;
            }
            *dgt = 0;
        }
    }
    Some(Pointwise::Holds(total))
}
