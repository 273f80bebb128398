//! Moves on the terms of a scheme that keep it a scheme of the same tensor:
//!
//! - [`simplify`]: drop terms with a zero factor; merge two terms whose left factors and
//!   right factors are proportional (`u_s = a u_t`, `v_s = b v_t` gives
//!   `u_t (x) v_t (x) (w_t + a b w_s)`), and likewise for the pairs (u, w) and (v, w). This
//!   can lower the rank. Labels of the kept terms are kept.
//! - [`rescale`]: the symmetry `(u_t, v_t, w_t) -> (l u_t, m v_t, w_t / (l m))`, term by term
//!   with the (l, m) among the inverses of the coefficients that minimise the number of
//!   coefficients other than +-1, then their size; the first nonzero entries of u_t and
//!   v_t are made positive.

use super::cost::is_unit;
use super::{Scheme, red};
use crate::scalar::{FieldSpec, Q};
use num_traits::{One, Signed, Zero};

/// Number of coefficients other than 0, +1, -1 (the multiplications by constants before
/// common-subexpression elimination).
pub fn count_nonunit(s: &Scheme) -> usize {
    [&s.u, &s.v, &s.w]
        .iter()
        .flat_map(|m| m.iter().flatten())
        .filter(|c| !c.is_zero() && !is_unit(s.field, c))
        .count()
}

pub(crate) fn scale(field: FieldSpec, x: &[Q], l: &Q) -> Vec<Q> {
    x.iter().map(|c| red(field, c * l)).collect()
}

/// `Some(a)` with `y = a x` (x nonzero), else `None`.
pub(crate) fn proportional(field: FieldSpec, x: &[Q], y: &[Q]) -> Option<Q> {
    let i = x.iter().position(|c| !c.is_zero())?;
    let a = red(field, &y[i] / &x[i]);
    if a.is_zero() {
        return None;
    }
    (x.iter().zip(y).all(|(xi, yi)| red(field, xi * &a) == *yi)).then_some(a)
}

/// Drop zero terms and merge terms with two proportional factors (see module docs).
/// Cost: O(r^2 (d0 + d1 + d2)) per merge.
pub fn simplify(s: &Scheme) -> Scheme {
    let f = s.field;
    let mut terms: Vec<[Vec<Q>; 3]> = (0..s.rank())
        .map(|t| [s.u[t].clone(), s.v[t].clone(), s.w[t].clone()])
        .collect();
    let mut labels: Vec<Option<String>> = (0..s.rank())
        .map(|t| (s.labels.len() == s.rank()).then(|| s.labels[t].clone()))
        .collect();
    let nonzero = |x: &[Q]| x.iter().any(|c| !c.is_zero());
    loop {
        let keep: Vec<bool> = terms
            .iter()
            .map(|tr| tr.iter().all(|x| nonzero(x)))
            .collect();
        let mut it = keep.iter();
        terms.retain(|_| *it.next().unwrap_or(&true));
        let mut it = keep.iter();
        labels.retain(|_| *it.next().unwrap_or(&true));
        let mut merged = false;
        'outer: for a in 0..terms.len() {
            for b in a + 1..terms.len() {
                for free in [2usize, 1, 0] {
                    let (p, q) = match free {
                        2 => (0, 1),
                        1 => (0, 2),
                        _ => (1, 2),
                    };
                    let (Some(x), Some(y)) = (
                        proportional(f, &terms[a][p], &terms[b][p]),
                        proportional(f, &terms[a][q], &terms[b][q]),
                    ) else {
                        continue;
                    };
                    let xy = red(f, x * y);
                    let add: Vec<Q> = terms[a][free]
                        .iter()
                        .zip(&terms[b][free])
                        .map(|(c, d)| red(f, c + &xy * d))
                        .collect();
                    terms[a][free] = add;
                    terms.remove(b);
                    labels.remove(b);
                    merged = true;
                    break 'outer;
                }
            }
        }
        if !merged {
            break;
        }
    }
    let mut out = Scheme::empty(f, s.dims);
    for ([u, v, w], l) in terms.into_iter().zip(labels) {
        out.push_labelled(u, v, w, l);
    }
    out
}

fn size(c: &Q) -> usize {
    (c.numer().bits() + c.denom().bits()) as usize
}

/// Cost of a term for rescaling: (non-unit coefficients, total bit size).
fn term_cost(field: FieldSpec, vs: [&[Q]; 3]) -> (usize, usize) {
    let shown = |c: &Q| super::text::display_coef(field, c);
    let mut n = 0;
    let mut b = 0;
    for x in vs {
        for c in x.iter().filter(|c| !c.is_zero()) {
            if !is_unit(field, c) {
                n += 1;
            }
            b += size(&shown(c));
        }
    }
    (n, b)
}

/// Scalings that make some coefficient of x equal to +-1: 1 and the inverses of the
/// distinct magnitudes (over GF(p): of the distinct values) of its coefficients.
fn candidates(field: FieldSpec, x: &[Q]) -> Vec<Q> {
    let mut out = vec![Q::one()];
    for c in x.iter().filter(|c| !c.is_zero() && !is_unit(field, c)) {
        let c = if field == FieldSpec::Rational {
            c.abs()
        } else {
            c.clone()
        };
        let l = red(field, c.recip());
        if !out.contains(&l) {
            out.push(l);
        }
    }
    out
}

/// Greedy rescaling of every term (see module docs). Keeps validity exactly.
pub fn rescale(s: &Scheme) -> Scheme {
    let mut out = s.clone();
    for t in 0..s.rank() {
        let [u, v, w] = rescale_term(s.field, &s.u[t], &s.v[t], &s.w[t]);
        out.u[t] = u;
        out.v[t] = v;
        out.w[t] = w;
    }
    out
}

/// The rescaling of one term (see module docs).
pub(crate) fn rescale_term(f: FieldSpec, u: &[Q], v: &[Q], w: &[Q]) -> [Vec<Q>; 3] {
    {
        let mut best = (term_cost(f, [u, v, w]), u.to_vec(), v.to_vec(), w.to_vec());
        // a term whose coefficients are all +-1 only needs its signs normalised
        let ls = if best.0.0 == 0 {
            Vec::new()
        } else {
            candidates(f, u)
        };
        let ms = candidates(f, v);
        for l in &ls {
            let mut mus = ms.clone();
            for c in w.iter().filter(|c| !c.is_zero()) {
                let m = red(f, c / l); // makes that entry of w equal to 1
                if !mus.contains(&m) {
                    mus.push(m);
                }
            }
            for m in &mus {
                let lm = red(f, l * m);
                if lm.is_zero() {
                    continue;
                }
                let (u2, v2, w2) = (
                    scale(f, u, l),
                    scale(f, v, m),
                    scale(f, w, &red(f, lm.recip())),
                );
                let c = term_cost(f, [&u2, &v2, &w2]);
                if c < best.0 {
                    best = (c, u2, v2, w2);
                }
            }
        }
        let (_, mut u2, mut v2, mut w2) = best;
        // sign normalisation: first nonzero of u and of v positive (as displayed)
        for x in [&mut u2, &mut v2] {
            if let Some(c) = x.iter().find(|c| !c.is_zero())
                && super::text::display_coef(f, c).is_negative()
            {
                let m1 = red(f, -Q::one());
                *x = scale(f, x, &m1);
                w2 = scale(f, &w2, &m1);
            }
        }
        [u2, v2, w2]
    }
}
