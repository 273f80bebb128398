//! Deciding one identity exactly on basis elements.
//!
//! An identity `P(x, ..., x, y_1, ..., y_m) = 0` of degree `d` in a repeated variable `x`
//! and linear in further variables `y_1..y_m` is checked as follows. Writing
//! `x = sum_i a_i e_i`, the left side is a polynomial in the coordinates `a_i`; the
//! coefficient of the monomial `a_{i_1} ... a_{i_d}` (a *multiset* `{i_1..i_d}`) is the sum
//! of `P` over the **distinct orderings** of the multiset. So the identity holds as a
//! polynomial identity exactly when, for every multiset of `d` basis indices and every
//! basis tuple for the `y`'s, that sum vanishes. No division is involved, so the test is
//! exact in every characteristic. A polynomial identity holds in every extension of the
//! field; when the field is infinite or GF(p) with `p >= d`, this is the same as holding for
//! every element (a polynomial of degree `< p` in each variable that vanishes on GF(p)^n is
//! zero, and for `p = d` the reduced monomials of a homogeneous form stay distinct).
//! Multilinear identities (`d = 0`) are simply checked on all basis tuples.
//!
//! Cost: `C(n+d-1, d) * n^m` instances, each at most `d!` orderings times the terms.

use super::expr::{Identity, Notation, Sparse, eval, normalise, render, render_sum};
use crate::scalar::Field;
use crate::tensor::Table;
use serde::Serialize;

/// A failing instance, written with the basis names.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Witness {
    /// The basis elements substituted: first the multiset for the repeated variable, then
    /// one element per linear variable.
    pub tuple: Vec<String>,
    /// The substituted left side (or a summary when it has many terms).
    pub expression: String,
    /// Its exact nonzero value as a combination of basis names.
    pub value: String,
}

/// The outcome of checking one identity.
#[derive(Clone, Debug, Default)]
pub struct Check {
    /// Instances examined (multisets times tuples).
    pub checked: u64,
    /// Instances whose value is nonzero.
    pub failures: u64,
    /// The first failing instance in lexicographic order.
    pub witness: Option<Witness>,
    /// That instance as indices: the sorted multiset and the linear variables' tuple.
    pub first: Option<(Vec<usize>, Vec<usize>)>,
    /// Why the failing instances were not all counted (the identity stopped at its first
    /// failure), if so.
    pub partial: Option<String>,
}

/// `C(n+d-1, d) * n^m`: the number of instances (saturating).
pub fn instance_count(n: usize, d: usize, m: usize) -> u128 {
    let mut c: u128 = 1;
    for i in 0..d {
        c = c.saturating_mul((n + i) as u128) / (i as u128 + 1);
    }
    for _ in 0..m {
        c = c.saturating_mul(n as u128);
    }
    c
}

/// An upper estimate of the term evaluations needed (instances x orderings x terms).
pub fn work_estimate(n: usize, id: &Identity, d: usize) -> u128 {
    let orderings: u128 = (1..=d as u128).product::<u128>().max(1);
    let per = orderings.min(instance_count(n, d, 0).max(1));
    instance_count(n, d, id.nvars - d)
        .saturating_mul(per)
        .saturating_mul(id.terms.len() as u128)
}

/// Advance a sorted array to its next permutation in lexicographic order; false at the end.
fn next_permutation(a: &mut [usize]) -> bool {
    if a.len() < 2 {
        return false;
    }
    let mut i = a.len() - 1;
    while i > 0 && a[i - 1] >= a[i] {
        i -= 1;
    }
    if i == 0 {
        return false;
    }
    let mut j = a.len() - 1;
    while a[j] <= a[i - 1] {
        j -= 1;
    }
    a.swap(i - 1, j);
    a[i..].reverse();
    true
}

/// The distinct orderings of a sorted multiset.
fn distinct_orderings(sorted: &[usize]) -> Vec<Vec<usize>> {
    let mut cur = sorted.to_vec();
    let mut out = vec![cur.clone()];
    while next_permutation(&mut cur) {
        out.push(cur.clone());
    }
    out
}

/// Advance `a` (entries in `0..n`) to the next non-decreasing sequence; false at the end.
pub(crate) fn next_multiset(a: &mut [usize], n: usize) -> bool {
    let mut i = a.len();
    while i > 0 {
        i -= 1;
        if a[i] + 1 < n {
            let v = a[i] + 1;
            for x in &mut a[i..] {
                *x = v;
            }
            return true;
        }
    }
    false
}

/// Advance `a` (entries in `0..n`) to the next tuple; false at the end.
pub(crate) fn next_tuple(a: &mut [usize], n: usize) -> bool {
    let mut i = a.len();
    while i > 0 {
        i -= 1;
        if a[i] + 1 < n {
            a[i] += 1;
            return true;
        }
        a[i] = 0;
    }
    false
}

/// Check `id` (the first `d` variables are the repeated one, the rest linear) on the
/// algebra with structure table `t` and basis `names`. With `stop_first` the check stops
/// at the first failure (then `failures` is 1 and `checked` counts up to it).
pub fn check_identity<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    id: &Identity,
    d: usize,
    notation: Notation,
    stop_first: bool,
) -> Check {
    use rayon::prelude::*;
    let n = t.dims[0];
    if n == 0 || id.nvars == 0 {
        return Check::default();
    }
    // the instances split by their first index; the parts run in parallel and are
    // combined in order, so the result is the same as a sequential scan
    let parts: Vec<Check> = (0..n)
        .into_par_iter()
        .map(|a| check_part(f, t, names, id, d, notation, stop_first, a))
        .collect();
    let mut out = Check::default();
    for part in parts {
        out.checked += part.checked;
        out.failures += part.failures;
        if out.witness.is_none() && part.witness.is_some() {
            out.witness = part.witness;
            out.first = part.first;
            if stop_first {
                break;
            }
        }
    }
    out
}

/// The instances whose first index (first multiset element, or first tuple entry when
/// `d = 0`) is `a`.
#[allow(clippy::too_many_arguments)]
fn check_part<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    id: &Identity,
    d: usize,
    notation: Notation,
    stop_first: bool,
    a: usize,
) -> Check {
    let n = t.dims[0];
    let mut out = Check::default();
    let m = id.nvars - d;
    let units: Vec<Sparse<F::Elem>> = (0..n).map(|i| vec![(i, f.one())]).collect();
    let coefs: Vec<F::Elem> = id.terms.iter().map(|(c, _)| f.from_i64(*c)).collect();
    let mut ms = vec![a; d];
    loop {
        let orderings = distinct_orderings(&ms);
        let mut free = vec![0usize; m];
        if d == 0 {
            free[0] = a;
        }
        loop {
            out.checked += 1;
            let value = eval_instance(f, t, id, &coefs, &units, &orderings, &free);
            if !value.is_empty() {
                out.failures += 1;
                if out.witness.is_none() {
                    out.witness = Some(witness(f, names, id, &orderings, &free, &value, notation));
                    out.first = Some((ms.clone(), free.clone()));
                }
                if stop_first {
                    return out;
                }
            }
            if !next_tuple(&mut free, n) || (d == 0 && free[0] != a) {
                break;
            }
        }
        if d == 0 || !next_multiset(&mut ms, n) || ms[0] != a {
            break;
        }
    }
    out
}

/// The value of one instance: the sum over the orderings of the identity's terms.
fn eval_instance<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    id: &Identity,
    coefs: &[F::Elem],
    units: &[Sparse<F::Elem>],
    orderings: &[Vec<usize>],
    free: &[usize],
) -> Sparse<F::Elem> {
    let mut acc = Vec::new();
    let mut values: Vec<&[(usize, F::Elem)]> = Vec::with_capacity(id.nvars);
    for ord in orderings {
        values.clear();
        values.extend(ord.iter().chain(free.iter()).map(|&i| units[i].as_slice()));
        for ((_, e), c) in id.terms.iter().zip(coefs) {
            for (k, v) in eval(f, t, e, &values).iter() {
                acc.push((*k, f.mul(v, c)));
            }
        }
    }
    normalise(f, acc)
}

/// The witness of one instance (multiset `ms`, linear tuple `free`) whose exact nonzero
/// value is already known.
pub fn witness_with_value<F: Field>(
    f: &F,
    names: &[String],
    id: &Identity,
    instance: &(Vec<usize>, Vec<usize>),
    value: &[(usize, F::Elem)],
    notation: Notation,
) -> Witness {
    let orderings = distinct_orderings(&instance.0);
    witness(f, names, id, &orderings, &instance.1, value, notation)
}

/// Most terms written out in a witness before it is summarised.
const MAX_WRITTEN_TERMS: usize = 8;

fn witness<F: Field>(
    f: &F,
    names: &[String],
    id: &Identity,
    orderings: &[Vec<usize>],
    free: &[usize],
    value: &[(usize, F::Elem)],
    notation: Notation,
) -> Witness {
    let ms = &orderings[0];
    let tuple: Vec<String> = ms.iter().chain(free).map(|&i| names[i].clone()).collect();
    let mut terms: Vec<(i64, String)> = Vec::new();
    for ord in orderings {
        let vn: Vec<&str> = ord.iter().chain(free).map(|&i| names[i].as_str()).collect();
        for (c, e) in &id.terms {
            let s = render(e, &vn, notation);
            match terms.iter_mut().find(|(_, t)| *t == s) {
                Some(x) => x.0 += c,
                None => terms.push((*c, s)),
            }
        }
    }
    terms.retain(|(c, _)| *c != 0);
    let expression = if terms.len() <= MAX_WRITTEN_TERMS {
        render_sum(&terms)
    } else {
        let letters = ["a", "b", "c", "d", "e", "f"];
        let mut vn: Vec<&str> = letters[..ms.len()].to_vec();
        vn.extend(free.iter().map(|&i| names[i].as_str()));
        let pattern: Vec<(i64, String)> = id
            .terms
            .iter()
            .map(|(c, e)| (*c, render(e, &vn, notation)))
            .collect();
        format!(
            "sum over the {} distinct orderings ({}) of ({}) of [{}]",
            orderings.len(),
            letters[..ms.len()].join(","),
            ms.iter()
                .map(|&i| names[i].as_str())
                .collect::<Vec<_>>()
                .join(","),
            render_sum(&pattern)
        )
    };
    let value = super::expr::format_combination(f, value, names);
    Witness {
        tuple,
        expression,
        value,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn enumerations() {
        assert_eq!(distinct_orderings(&[0, 0, 1]).len(), 3);
        assert_eq!(distinct_orderings(&[0, 1, 2]).len(), 6);
        assert_eq!(distinct_orderings(&[]).len(), 1);
        let mut a = vec![0, 0];
        let mut c = 1;
        while next_multiset(&mut a, 3) {
            c += 1;
        }
        assert_eq!(c as u128, instance_count(3, 2, 0));
        assert_eq!(instance_count(8, 4, 0), 330);
        assert_eq!(instance_count(4, 0, 3), 64);
    }
}
