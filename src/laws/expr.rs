//! Product expressions in variables, evaluated exactly on basis elements.
//!
//! An [`Identity`] is a signed sum of product trees (`(x*y)*z - x*(y*z)`); the law it
//! states is "this sum is zero". Expressions are evaluated on sparse coordinate vectors
//! (`(index, coefficient)` sorted by index, no zeros) through a structure [`Table`], so a
//! product of two basis elements costs the size of their product, not the dimension.
//!
//! Invariant: every sparse vector produced here is sorted by index with no zero entries.

use crate::scalar::Field;
use crate::tensor::Table;
use num_traits::ToPrimitive;
use std::borrow::Cow;

/// A product tree whose leaves are variables `0, 1, ...`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Expr {
    Var(usize),
    Mul(Box<Expr>, Box<Expr>),
}

/// Leaf `i`.
pub fn var(i: usize) -> Expr {
    Expr::Var(i)
}

/// The product `a * b`.
pub fn mul(a: Expr, b: Expr) -> Expr {
    Expr::Mul(Box::new(a), Box::new(b))
}

/// A signed sum of product trees in `nvars` variables; the law is "the sum vanishes".
#[derive(Clone, Debug)]
pub struct Identity {
    pub terms: Vec<(i64, Expr)>,
    pub nvars: usize,
}

/// How a product is written in witnesses.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Notation {
    /// `x*y`, with parentheses around nested products.
    Product,
    /// `[x,y]` = xy - yx.
    Commutator,
    /// `{x,y}` = xy + yx.
    Anticommutator,
}

/// Sparse coordinate vector: `(index, coefficient)`, sorted, no zeros.
pub type Sparse<E> = Vec<(usize, E)>;

/// Sort by index, add up repeated indices and drop zeros.
pub fn normalise<F: Field>(f: &F, mut v: Vec<(usize, F::Elem)>) -> Sparse<F::Elem> {
    v.sort_by_key(|e| e.0);
    let mut out: Sparse<F::Elem> = Vec::with_capacity(v.len());
    for (k, c) in v {
        match out.last_mut() {
            Some((k0, c0)) if *k0 == k => *c0 = f.add(c0, &c),
            _ => out.push((k, c)),
        }
    }
    out.retain(|(_, c)| !f.is_zero(c));
    out
}

/// The product of two sparse vectors through the table. Cost: sum over the support pairs
/// of the size of the basis products.
pub fn mul_sparse<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    x: &[(usize, F::Elem)],
    y: &[(usize, F::Elem)],
) -> Sparse<F::Elem> {
    // fast path: basis times basis with coefficient one
    if x.len() == 1 && y.len() == 1 && f.is_one(&x[0].1) && f.is_one(&y[0].1) {
        return t.product(x[0].0, y[0].0).to_vec();
    }
    let mut acc = Vec::new();
    for (a, xa) in x {
        for (b, yb) in y {
            let s = f.mul(xa, yb);
            for (k, c) in t.product(*a, *b) {
                acc.push((*k, f.mul(&s, c)));
            }
        }
    }
    normalise(f, acc)
}

/// Evaluate a tree with variable `v` set to the sparse vector `values[v]` (leaves are
/// borrowed, not copied).
pub fn eval<'a, F: Field>(
    f: &F,
    t: &'a Table<F::Elem>,
    e: &Expr,
    values: &[&'a [(usize, F::Elem)]],
) -> Cow<'a, [(usize, F::Elem)]> {
    match e {
        Expr::Var(v) => Cow::Borrowed(values[*v]),
        Expr::Mul(a, b) => {
            if let (Expr::Var(i), Expr::Var(j)) = (a.as_ref(), b.as_ref()) {
                let (x, y) = (values[*i], values[*j]);
                if x.len() == 1 && y.len() == 1 && f.is_one(&x[0].1) && f.is_one(&y[0].1) {
                    return Cow::Borrowed(t.product(x[0].0, y[0].0));
                }
            }
            let x = eval(f, t, a, values);
            if x.is_empty() {
                return Cow::Owned(Vec::new());
            }
            let y = eval(f, t, b, values);
            if y.is_empty() {
                return Cow::Owned(Vec::new());
            }
            Cow::Owned(mul_sparse(f, t, &x, &y))
        }
    }
}

/// Write a tree with variable names `names[v]`.
pub fn render(e: &Expr, names: &[&str], notation: Notation) -> String {
    match e {
        Expr::Var(v) => names[*v].to_string(),
        Expr::Mul(a, b) => {
            let (l, r) = (render(a, names, notation), render(b, names, notation));
            match notation {
                Notation::Commutator => format!("[{l},{r}]"),
                Notation::Anticommutator => format!("{{{l},{r}}}"),
                Notation::Product => {
                    let wrap = |x: &Expr, s: String| {
                        if matches!(x, Expr::Mul(..)) {
                            format!("({s})")
                        } else {
                            s
                        }
                    };
                    format!("{}*{}", wrap(a, l), wrap(b, r))
                }
            }
        }
    }
}

/// Write a signed sum of rendered terms: `a - b + 2 c`.
pub fn render_sum(terms: &[(i64, String)]) -> String {
    let mut s = String::new();
    for (idx, (c, t)) in terms.iter().enumerate() {
        let (neg, a) = (*c < 0, c.unsigned_abs());
        if idx == 0 {
            if neg {
                s.push('-');
            }
        } else {
            s.push_str(if neg { " - " } else { " + " });
        }
        if a != 1 {
            s.push_str(&format!("{a} "));
        }
        s.push_str(t);
    }
    if s.is_empty() { "0".into() } else { s }
}

/// A field element as a signed text: over GF(p) the representative in `(-p/2, p/2]`.
pub fn signed_text<F: Field>(f: &F, c: &F::Elem) -> String {
    let r = f.to_rational(c);
    let p = f.characteristic();
    if p > 0
        && let Some(v) = r.numer().to_u64()
        && v > p / 2
    {
        return format!("-{}", p - v);
    }
    crate::scalar::q_to_string(&r)
}

/// A sparse vector as a combination of basis names: `-2 e + 1/2 i`, or `0`.
pub fn format_combination<F: Field>(f: &F, v: &[(usize, F::Elem)], names: &[String]) -> String {
    let mut s = String::new();
    for (idx, (k, c)) in v.iter().enumerate() {
        let t = signed_text(f, c);
        let (neg, a) = match t.strip_prefix('-') {
            Some(rest) => (true, rest.to_string()),
            None => (false, t.clone()),
        };
        if idx == 0 {
            if neg {
                s.push('-');
            }
        } else {
            s.push_str(if neg { " - " } else { " + " });
        }
        if a != "1" {
            s.push_str(&a);
            s.push(' ');
        }
        s.push_str(&names[*k]);
    }
    if s.is_empty() { "0".into() } else { s }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn render_forms() {
        let e = mul(mul(var(0), var(1)), var(2));
        assert_eq!(render(&e, &["i", "j", "k"], Notation::Product), "(i*j)*k");
        assert_eq!(
            render(&e, &["i", "j", "k"], Notation::Commutator),
            "[[i,j],k]"
        );
        let s = render_sum(&[(1, "a".into()), (-2, "b".into()), (1, "c".into())]);
        assert_eq!(s, "a - 2 b + c");
    }
}
