//! Polishing a verified scheme: a search over the tensor's symmetry group for a scheme
//! that is better on a chosen [`Objective`], never worse.
//!
//! Every candidate is a scheme of the same tensor, obtained by exact moves:
//! - *Simplify* ([`super::terms`]): drop terms with a zero factor; merge two terms whose left factors and right
//!   factors are proportional (`u_s = a u_t`, `v_s = b v_t` gives
//!   `u_t (x) v_t (x) (w_t + a b w_s)`), and likewise for the pairs (u, w) and (v, w). This
//!   can lower the rank.
//! - *Rescale* ([`super::terms`], applied to every candidate): the symmetry
//!   `(u_t, v_t, w_t) -> (l u_t, m v_t, w_t / (l m))`; term by term the (l, m) among the
//!   inverses of the coefficients that minimise the number of coefficients other than +-1,
//!   then their size; the first nonzero entries of u_t and v_t are made positive.
//! - *Sandwich* (matrix multiplication <n,m,p>): elementary X, Y, Z of
//!   [`super::sandwich`] — transvections `I +- E_ab` and scalings of one row or column by
//!   -1, 2, 3, their inverses and the coefficients of the input — and, as starting
//!   points, the cyclic and transposed forms that keep the format
//!   ([`super::symmetry::discrete_forms`]).
//! - *Diagonal symmetries* (any other tensor): `lambda^e` for an integer basis e of the
//!   diagonal symmetries ([`super::symmetry::diagonal_symmetries`]) and the same lambdas.
//!
//! From each starting point a greedy descent takes the move with the smallest key while
//! it improves, first along the objective's [`Objective::key`], then along the keys of the
//! other objectives (such a descent often passes through schemes that are better on the
//! objective), all within a deterministic budget of evaluated candidates. The result is the
//! best scheme seen on the objective's key if that key is smaller than the input's, else
//! the input itself: polish never returns a scheme worse on the objective (nor, on
//! ties of the objective, on the measures after it in the key). Every returned scheme is
//! re-verified exactly. All measures come from [`super::cost::count_cost`].

use super::cost::{Cost, Objective, QKey, count_cost, is_unit};
use super::sandwich::{apply_move, elementary_moves};
use super::symmetry::{apply_diagonal, diagonal_symmetries, discrete_forms};
use super::terms::rescale_term;
pub use super::terms::{count_nonunit, rescale, simplify};
use super::{Scheme, verify};
use crate::error::Error;
use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_traits::{One, Signed, Zero};
use std::collections::HashMap;

/// Parameters of [`polish`].
#[derive(Clone, Debug)]
pub struct PolishParams {
    /// What to lower.
    pub objective: Objective,
    /// The format <n,m,p> when the tensor is matrix multiplication (enables the sandwich
    /// moves and the cyclic and transposed forms).
    pub matmul: Option<[usize; 3]>,
    /// Most improving moves from one starting point.
    pub steps: usize,
    /// Most candidate schemes evaluated in all (bounds the work deterministically).
    pub evaluations: usize,
}

impl Default for PolishParams {
    fn default() -> Self {
        PolishParams {
            objective: Objective::Additions,
            matmul: None,
            steps: 60,
            evaluations: 3000,
        }
    }
}

/// A polished scheme with its measures before and after.
#[derive(Clone, Debug)]
pub struct Polished {
    pub scheme: Scheme,
    pub objective: Objective,
    pub before: Cost,
    pub after: Cost,
    /// The starting point of the best scheme (`input`, `cyclic`, `transposed`, ...).
    pub start: String,
    /// Candidate schemes evaluated.
    pub evaluations: usize,
}

impl Polished {
    /// True when the result differs from the input (it is then strictly better on the
    /// objective's key).
    pub fn improved(&self) -> bool {
        self.objective.key(&self.after) < self.objective.key(&self.before)
    }
}

/// A move of the search: one symmetry applied to the current scheme.
enum Step {
    Sandwich(super::sandwich::Move),
    Diagonal(usize, Q),
    Simplify,
}

/// The scalings tried: -1, 2, 1/2, 3, 1/3 and the non-unit coefficients of `s` and their
/// inverses (at most 8 more), all nonzero in the field.
fn scalings(s: &Scheme) -> Vec<Q> {
    let f = s.field;
    let mut out: Vec<Q> = Vec::new();
    let add = |out: &mut Vec<Q>, x: Q| {
        // 1/2 has no value over GF(2): such a scaling is no candidate
        let Ok(x) = super::reduce_into(f, &x) else {
            return;
        };
        if !x.is_zero() && !x.is_one() && !out.contains(&x) {
            out.push(x);
        }
    };
    for (a, b) in [(-1, 1), (2, 1), (1, 2), (3, 1), (1, 3)] {
        add(&mut out, crate::scalar::q(a, b));
    }
    let base = out.len();
    for c in [&s.u, &s.v, &s.w]
        .into_iter()
        .flat_map(|m| m.iter().flatten())
    {
        if c.is_zero() || is_unit(f, c) {
            continue;
        }
        add(&mut out, c.abs());
        add(&mut out, c.abs().recip());
        if out.len() >= base + 8 {
            break;
        }
    }
    out
}

/// The search state: a cache of rescaled terms, the evaluation budget and the best
/// scheme seen under the objective.
struct Search {
    objective: Objective,
    budget: usize,
    evaluations: usize,
    rescaled: HashMap<QKey, [Vec<Q>; 3]>,
    field: FieldSpec,
    best: Option<(Vec<BigInt>, Scheme, Cost, String)>,
}

impl Search {
    /// Rescale every term (memoised), measure, and remember the scheme if it is the best
    /// seen under the objective. `None` when the budget is used up.
    fn evaluate(&mut self, s: &Scheme, start: &str) -> Option<(Scheme, Cost)> {
        if self.evaluations >= self.budget {
            return None;
        }
        self.evaluations += 1;
        if self.rescaled.len() > 50_000 {
            self.rescaled.clear(); // bounds the memory of the cache
        }
        let mut out = s.clone();
        for t in 0..s.rank() {
            let key = QKey([&s.u[t][..], &s.v[t], &s.w[t]].concat());
            let field = self.field;
            let [u, v, w] = self
                .rescaled
                .entry(key)
                .or_insert_with(|| rescale_term(field, &s.u[t], &s.v[t], &s.w[t]))
                .clone();
            out.u[t] = u;
            out.v[t] = v;
            out.w[t] = w;
        }
        let c = count_cost(&out);
        let k = self.objective.key(&c);
        if self.best.as_ref().is_none_or(|b| k < b.0) {
            self.best = Some((k, out.clone(), c.clone(), start.to_string()));
        }
        Some((out, c))
    }

    /// Greedy descent from `start` along the order of `guide`.
    fn descend(&mut self, start: &Scheme, name: &str, guide: Objective, moves: &Moves) {
        let Some((mut cur, c)) = self.evaluate(start, name) else {
            return;
        };
        let mut key = guide.key(&c);
        for _ in 0..moves.steps {
            let mut next: Option<(Vec<BigInt>, Scheme)> = None;
            for step in &moves.steps_list {
                let cand = moves.apply(step, &cur);
                let Some((sc, c)) = self.evaluate(&cand, name) else {
                    return;
                };
                let k = guide.key(&c);
                if k < next.as_ref().map_or_else(|| key.clone(), |n| n.0.clone()) {
                    next = Some((k, sc));
                }
            }
            match next {
                Some((k, sc)) => (key, cur) = (k, sc),
                None => return,
            }
        }
    }
}

/// The moves of a search and how to apply them.
struct Moves {
    steps_list: Vec<Step>,
    steps: usize,
    nmp: Option<[usize; 3]>,
    diagonal: Vec<[Vec<BigInt>; 3]>,
}

impl Moves {
    fn apply(&self, step: &Step, s: &Scheme) -> Scheme {
        match step {
            Step::Simplify => simplify(s),
            Step::Sandwich(mv) => apply_move(s, self.nmp.unwrap_or_default(), mv),
            Step::Diagonal(e, l) => apply_diagonal(s, &self.diagonal[*e], l),
        }
    }
}

/// Polish a scheme for `t` towards `params.objective` (see the module docs). Errors if the
/// input does not verify (or, which would be a bug, the output). Cost: at most
/// `params.evaluations` cost evaluations (each three CSE runs) plus the moves.
pub fn polish(s: &Scheme, t: &Tensor, params: &PolishParams) -> Result<Polished, Error> {
    if let Err(m) = verify(s, t) {
        return Err(Error::Invalid(format!(
            "the scheme does not verify ({} wrong coefficients); nothing to polish",
            m.count
        )));
    }
    let before = count_cost(s);
    let key0 = params.objective.key(&before);
    let mut search = Search {
        objective: params.objective,
        budget: params.evaluations.max(1),
        evaluations: 0,
        rescaled: HashMap::new(),
        field: s.field,
        best: None,
    };
    let nmp = params
        .matmul
        .filter(|f| s.dims == [f[0] * f[1], f[1] * f[2], f[0] * f[2]]);
    let scales = scalings(s);
    let mut steps_list: Vec<Step> = vec![Step::Simplify];
    let diagonal = if nmp.is_none() {
        diagonal_symmetries(t)
    } else {
        Vec::new()
    };
    match nmp {
        Some(f) => steps_list.extend(elementary_moves(f, &scales).into_iter().map(Step::Sandwich)),
        None => {
            for e in 0..diagonal.len() {
                for l in &scales {
                    steps_list.push(Step::Diagonal(e, l.clone()));
                }
            }
        }
    }
    let moves = Moves {
        steps_list,
        steps: params.steps,
        nmp,
        diagonal,
    };
    let mut starts = vec![("input".to_string(), s.clone())];
    if let Some(f) = nmp {
        starts.extend(discrete_forms(s, t, f));
    }
    // guides: the objective's own order first, then the others (a descent along another
    // order often passes through schemes that are better on the objective)
    let mut guides = vec![params.objective];
    guides.extend(
        Objective::ALL
            .iter()
            .copied()
            .filter(|o| *o != params.objective),
    );
    for guide in guides {
        for (name, start) in &starts {
            search.descend(start, name, guide, &moves);
        }
    }
    let evaluations = search.evaluations;
    let (scheme, after, start) = match search.best {
        Some((key, sc, c, name)) if key < key0 => (sc, c, name),
        _ => (s.clone(), before.clone(), "input".to_string()),
    };
    if verify(&scheme, t).is_err() {
        return Err(Error::Invalid(
            "internal error: the polished scheme does not verify".into(),
        ));
    }
    Ok(Polished {
        scheme,
        objective: params.objective,
        before,
        after,
        start,
        evaluations,
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
    use crate::scheme::terms::scale;
    use crate::scheme::testkit::*;

    fn mm(nmp: [usize; 3], objective: Objective) -> PolishParams {
        PolishParams {
            objective,
            matmul: Some(nmp),
            ..PolishParams::default()
        }
    }

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
        for obj in Objective::ALL {
            let p = polish(
                &bad,
                &t,
                &PolishParams {
                    objective: obj,
                    ..PolishParams::default()
                },
            )
            .unwrap();
            assert_eq!(count_nonunit(&p.scheme), 0, "{obj:?}");
            assert_eq!(p.scheme.rank(), 7);
            assert!(p.after.total() <= 18);
            assert!(verify(&p.scheme, &t).is_ok());
        }
    }

    /// Over GF(2) and GF(3) the scalings 1/2 and 1/3 have no value and are left out:
    /// Strassen's scheme polishes over both (with the sandwich moves) and stays verified.
    #[test]
    fn polish_over_gf2_and_gf3() {
        let t = matmul(2, 2, 2);
        let s = scheme(STRASSEN, &t);
        for p in [2, 3] {
            let tp = t.with_field(FieldSpec::Prime(p)).unwrap();
            let sp = s.with_field(FieldSpec::Prime(p)).unwrap();
            for params in [mm([2, 2, 2], Objective::Additions), PolishParams::default()] {
                let out = polish(&sp, &tp, &params).unwrap();
                assert_eq!(out.scheme.rank(), 7);
                assert!(verify(&out.scheme, &tp).is_ok());
            }
        }
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
        let params = PolishParams {
            objective: Objective::Multiplications,
            ..PolishParams::default()
        };
        let p = polish(&s, &t, &params).unwrap();
        assert_eq!(p.scheme.rank(), 8);
        assert_eq!(count_nonunit(&p.scheme), 0);
        // GF(p) too
        for p in [7, 5] {
            let tp = t.with_field(FieldSpec::Prime(p)).unwrap();
            let sp = s.with_field(FieldSpec::Prime(p)).unwrap();
            let pp = polish(&sp, &tp, &params).unwrap();
            assert_eq!(pp.scheme.rank(), 8);
            assert_eq!(count_nonunit(&pp.scheme), 0);
        }
    }

    #[test]
    fn never_worse_and_winograd_keeps_15_additions() {
        // Winograd's variant: 15 additions (Probert 1976, from memory); the additions
        // objective must keep them, the nonzeros objective may trade them
        let t = matmul(2, 2, 2);
        let w = scheme(WINOGRAD, &t);
        let p = polish(&w, &t, &mm([2, 2, 2], Objective::Additions)).unwrap();
        assert_eq!(p.after.total(), 15);
        for (s, _) in [(scheme(STRASSEN, &t), 0), (w, 1)] {
            for obj in Objective::ALL {
                let p = polish(&s, &t, &mm([2, 2, 2], obj)).unwrap();
                assert!(obj.value(&p.after) <= obj.value(&p.before), "{obj:?}");
                assert!(obj.key(&p.after) <= obj.key(&p.before), "{obj:?}");
            }
        }
    }

    #[test]
    fn sandwich_scalings_remove_fractions_of_an_equivalent_scheme() {
        // Strassen's scheme transformed by X = diag(1, 3/2), Y = diag(2/3, 1): fractions
        // that term rescaling alone cannot remove
        use crate::scheme::sandwich::Side;
        let t = matmul(2, 2, 2);
        let s = scheme(STRASSEN, &t);
        let x = moved(
            &s,
            [2, 2, 2],
            &[(Side::X, 1, 1, q(3, 2)), (Side::Y, 0, 0, q(2, 3))],
        );
        assert!(verify(&x, &t).is_ok());
        assert!(count_nonunit(&rescale(&x)) > 0);
        let p = polish(&x, &t, &mm([2, 2, 2], Objective::Coefficients)).unwrap();
        assert_eq!(count_nonunit(&p.scheme), 0);
        assert_eq!(p.after.max_denominator, BigInt::from(1));
    }

    #[test]
    fn diagonal_symmetries_polish_polynomial_schemes() {
        // Karatsuba with x -> 2x applied: coefficients 2 and 1/2 come back to +-1
        let t = polymul(2);
        let k = scheme(KARATSUBA, &t);
        let e = &crate::scheme::symmetry::diagonal_symmetries(&t);
        let mut x = k.clone();
        for sym in e {
            x = crate::scheme::symmetry::apply_diagonal(&x, sym, &q(2, 1));
        }
        assert!(verify(&x, &t).is_ok());
        let p = polish(
            &x,
            &t,
            &PolishParams {
                objective: Objective::Coefficients,
                ..PolishParams::default()
            },
        )
        .unwrap();
        assert_eq!(p.after.max_numerator, BigInt::from(1));
        assert_eq!(p.after.max_denominator, BigInt::from(1));
    }

    #[test]
    fn exponents() {
        // Strassen 1969: log2 7
        assert!((exponent(7, [2, 2, 2]) - 7f64.log2()).abs() < 1e-12);
        assert!((exponent(49, [4, 4, 4]) - 7f64.log2()).abs() < 1e-12);
    }
}
