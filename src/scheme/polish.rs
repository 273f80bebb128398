//! Polishing a verified scheme: moves that keep it valid and make it cheaper or nicer.
//!
//! - *Simplify*: drop terms with a zero factor; merge two terms whose left factors and right
//!   factors are proportional (`u_s = a u_t`, `v_s = b v_t` gives
//!   `u_t (x) v_t (x) (w_t + a b w_s)`), and likewise for the pairs (u, w) and (v, w). This
//!   can lower the rank.
//! - *Rescale*: the symmetry `(u_t, v_t, w_t) -> (l u_t, m v_t, w_t / (l m))` keeps every
//!   scheme valid. A greedy pass chooses, term by term, the (l, m) among the inverses of
//!   the coefficients that minimise the number of coefficients other than +-1, then the
//!   size of the coefficients; the first nonzero entries of u_t and v_t are made positive.
//! - *Sandwich* (matrix multiplication only, when the format is given): the greedy
//!   descent of [`super::sandwich`] with elementary matrices, lowering the number of
//!   nonzeros and then of non-(+-1) coefficients.
//!
//! The number of nonzeros is invariant under rescaling; simplification and the sandwich
//! search can only lower it.
//! Every polished scheme is re-verified exactly before it is returned.

use super::cost::{Cost, count_cost};
use super::{Scheme, reduce_into, verify};
use crate::error::Error;
use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;
use num_traits::{One, Signed, Zero};

/// Parameters of [`polish`].
#[derive(Clone, Debug)]
pub struct PolishParams {
    /// Rounds of simplify + rescale (each round is deterministic).
    pub rounds: usize,
    /// The format <n,m,p> when the tensor is matrix multiplication (enables sandwiching).
    pub matmul: Option<[usize; 3]>,
    /// Most elementary sandwich moves per round.
    pub sandwich_steps: usize,
}

impl Default for PolishParams {
    fn default() -> Self {
        PolishParams {
            rounds: 3,
            matmul: None,
            sandwich_steps: 200,
        }
    }
}

/// A polished scheme with its measures before and after.
#[derive(Clone, Debug)]
pub struct Polished {
    pub scheme: Scheme,
    pub rank_before: usize,
    pub nnz_before: usize,
    pub nonunit_before: usize,
    pub cost_before: Cost,
    pub nnz_after: usize,
    pub nonunit_after: usize,
    pub cost_after: Cost,
}

fn is_unit(field: FieldSpec, c: &Q) -> bool {
    c.is_one()
        || (-c).is_one()
        || matches!(field, FieldSpec::Prime(p) if *c == Q::from_integer((p - 1).into()))
}

/// Number of coefficients other than 0, +1, -1.
pub fn count_nonunit(s: &Scheme) -> usize {
    [&s.u, &s.v, &s.w]
        .iter()
        .flat_map(|m| m.iter().flatten())
        .filter(|c| !c.is_zero() && !is_unit(s.field, c))
        .count()
}

fn red(field: FieldSpec, x: Q) -> Q {
    reduce_into(field, &x).unwrap_or(x)
}

fn scale(field: FieldSpec, x: &[Q], l: &Q) -> Vec<Q> {
    x.iter().map(|c| red(field, c * l)).collect()
}

/// `Some(a)` with `y = a x` (x nonzero), else `None`.
fn proportional(field: FieldSpec, x: &[Q], y: &[Q]) -> Option<Q> {
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
    let nonzero = |x: &[Q]| x.iter().any(|c| !c.is_zero());
    loop {
        terms.retain(|tr| tr.iter().all(|x| nonzero(x)));
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
    for [u, v, w] in terms {
        out.push(u, v, w);
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

fn candidates(field: FieldSpec, x: &[Q]) -> Vec<Q> {
    let mut out = vec![Q::one()];
    for c in x.iter().filter(|c| !c.is_zero()) {
        let l = red(field, c.recip());
        if !out.contains(&l) {
            out.push(l);
        }
    }
    out
}

/// Greedy rescaling of every term (see module docs). Keeps validity exactly.
pub fn rescale(s: &Scheme) -> Scheme {
    let f = s.field;
    let mut out = Scheme::empty(f, s.dims);
    for t in 0..s.rank() {
        let (u, v, w) = (&s.u[t], &s.v[t], &s.w[t]);
        let mut best = (term_cost(f, [u, v, w]), u.clone(), v.clone(), w.clone());
        let ls = candidates(f, u);
        let ms = candidates(f, v);
        for l in &ls {
            let mut mus = ms.clone();
            for c in w.iter().filter(|c| !c.is_zero()) {
                mus.push(red(f, c / l)); // makes that entry of w equal to 1
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
        out.push(u2, v2, w2);
    }
    out
}

/// Polish a scheme for `t`: check it, simplify and rescale for `rounds` rounds, re-verify.
/// Errors if the input does not verify (or, which would be a bug, the output).
pub fn polish(s: &Scheme, t: &Tensor, params: &PolishParams) -> Result<Polished, Error> {
    if let Err(m) = verify(s, t) {
        return Err(Error::Invalid(format!(
            "the scheme does not verify ({} wrong coefficients); nothing to polish",
            m.count
        )));
    }
    let mut cur = s.clone();
    for _ in 0..params.rounds.max(1) {
        let mut next = simplify(&cur);
        if let Some(nmp) = params.matmul
            && next.dims == [nmp[0] * nmp[1], nmp[1] * nmp[2], nmp[0] * nmp[2]]
        {
            next = super::sandwich::sandwich_greedy(&next, nmp, params.sandwich_steps).0;
        }
        let next = rescale(&next);
        if next == cur {
            break;
        }
        cur = next;
    }
    if verify(&cur, t).is_err() {
        return Err(Error::Invalid(
            "internal error: the polished scheme does not verify".into(),
        ));
    }
    Ok(Polished {
        rank_before: s.rank(),
        nnz_before: s.nnz(),
        nonunit_before: count_nonunit(s),
        cost_before: count_cost(s),
        nnz_after: cur.nnz(),
        nonunit_after: count_nonunit(&cur),
        cost_after: count_cost(&cur),
        scheme: cur,
    })
}

/// The exponent `3 log r / log(n m p)` of a rank-r scheme for <n,m,p> (recursive use
/// gives O(N^e) for N x N matrices; Strassen: 3 log 7 / log 8 = log2 7 ~ 2.807).
pub fn exponent(rank: usize, nmp: [usize; 3]) -> f64 {
    let v = (nmp[0] * nmp[1] * nmp[2]) as f64;
    3.0 * (rank as f64).ln() / v.ln()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use crate::scheme::testkit::*;

    #[test]
    fn rescaling_removes_needless_fractions() {
        let t = matmul(2, 2, 2);
        let s = scheme(STRASSEN, &t);
        // scramble: term t gets (2u, -1/3 v, -3/2 w)
        let mut bad = s.clone();
        for tt in 0..bad.rank() {
            bad.u[tt] = scale(bad.field, &bad.u[tt], &q(2, 1));
            bad.v[tt] = scale(bad.field, &bad.v[tt], &q(-1, 3));
            bad.w[tt] = scale(bad.field, &bad.w[tt], &q(-3, 2));
        }
        assert!(verify(&bad, &t).is_ok());
        assert!(count_nonunit(&bad) > 0);
        let p = polish(&bad, &t, &PolishParams::default()).unwrap();
        assert_eq!(p.nonunit_after, 0);
        assert_eq!(p.scheme.rank(), 7);
        assert_eq!(p.cost_after.total(), 18);
        assert!(verify(&p.scheme, &t).is_ok());
    }

    #[test]
    fn simplify_merges_and_drops() {
        let t = matmul(2, 2, 2);
        let mut s = Scheme::standard(&t);
        // split the first term into two halves and add a zero term
        let (u, v, w) = (s.u[0].clone(), s.v[0].clone(), s.w[0].clone());
        s.w[0] = scale(s.field, &w, &q(1, 2));
        s.push(
            scale(s.field, &u, &q(3, 1)),
            v.clone(),
            scale(s.field, &w, &q(1, 6)),
        );
        s.push(u.clone(), vec![Q::zero(); 4], w.clone());
        assert!(verify(&s, &t).is_ok());
        let p = polish(&s, &t, &PolishParams::default()).unwrap();
        assert_eq!(p.scheme.rank(), 8);
        assert_eq!(p.nonunit_after, 0);
        // GF(p) too
        let t7 = t.with_field(FieldSpec::Prime(7)).unwrap();
        let s7 = s.with_field(FieldSpec::Prime(7)).unwrap();
        let p7 = polish(&s7, &t7, &PolishParams::default()).unwrap();
        assert_eq!(p7.scheme.rank(), 8);
        assert_eq!(p7.nonunit_after, 0);
    }

    #[test]
    fn sandwich_polish_lowers_nonzeros() {
        let t = matmul(2, 2, 2);
        let s = scheme(STRASSEN, &t);
        let mv = crate::scheme::sandwich::Move {
            side: crate::scheme::sandwich::Side::X,
            a: 0,
            b: 1,
            c: Q::one(),
        };
        let scr = crate::scheme::sandwich::apply_move(&s, [2, 2, 2], &mv);
        assert!(scr.nnz() > s.nnz());
        let params = PolishParams {
            matmul: Some([2, 2, 2]),
            ..PolishParams::default()
        };
        let p = polish(&scr, &t, &params).unwrap();
        assert!(p.nnz_after < p.nnz_before);
        assert!(p.nnz_after <= s.nnz());
    }

    #[test]
    fn exponents() {
        // Strassen 1969: log2 7
        assert!((exponent(7, [2, 2, 2]) - 7f64.log2()).abs() < 1e-12);
        assert!((exponent(49, [4, 4, 4]) - 7f64.log2()).abs() < 1e-12);
    }
}
