//! The additive cost of a scheme: additions and scalar multiplications of its three linear
//! maps (left forms `u_t . a`, right forms `v_t . b`, outputs `c_k = sum_t w_t[k] m_t`).
//!
//! Naive count: a form with s nonzero terms costs s - 1 additions; every coefficient other
//! than +1 and -1 costs one scalar multiplication (counted separately). Signs are free
//! (a subtraction is an addition). After common-subexpression elimination (CSE): a greedy
//! pairwise scheme as in the usual practice — repeatedly take the most frequent pair of
//! terms `x + r y` (the same ratio r up to an overall factor) occurring in at least two
//! forms of one side, compute it once into a temporary and substitute. Ties go to the
//! smallest (x, y, r). The result is a straight-line [`LinearProgram`] per side, which the
//! emitters print.

use super::{Scheme, reduce_into};
use crate::scalar::{FieldSpec, Q};
use num_traits::{One, Zero};
use std::collections::BTreeMap;

/// A sparse linear form: (variable, coefficient), variables ascending, no zeros.
pub type Form = Vec<(usize, Q)>;

/// Straight-line code for a list of linear forms. Variables `0..inputs` are the inputs;
/// variable `inputs + k` is temporary k, defined as `x + r y` by `temps[k] = (x, r, y)`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LinearProgram {
    pub inputs: usize,
    pub temps: Vec<(usize, Q, usize)>,
    /// The final forms over inputs and temporaries.
    pub forms: Vec<Form>,
}

fn is_unit(field: FieldSpec, c: &Q) -> bool {
    if c.is_one() || (-c).is_one() {
        return true;
    }
    match field {
        FieldSpec::Prime(p) => *c == Q::from_integer((p - 1).into()),
        FieldSpec::Rational => false,
    }
}

impl LinearProgram {
    /// Additions: one per temporary, plus s - 1 per final form with s terms.
    pub fn additions(&self) -> usize {
        self.temps.len()
            + self
                .forms
                .iter()
                .map(|f| f.len().saturating_sub(1))
                .sum::<usize>()
    }
    /// Scalar multiplications: coefficients other than +-1 (in temporaries and forms).
    pub fn scalings(&self, field: FieldSpec) -> usize {
        self.temps.iter().filter(|t| !is_unit(field, &t.1)).count()
            + self
                .forms
                .iter()
                .flatten()
                .filter(|(_, c)| !is_unit(field, c))
                .count()
    }
}

/// Additions and scalings of the three sides, before and after CSE.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct Cost {
    /// [left, right, output] additions, naive.
    pub naive_additions: [usize; 3],
    /// [left, right, output] scalar multiplications, naive.
    pub naive_scalings: [usize; 3],
    /// [left, right, output] additions after greedy CSE.
    pub additions: [usize; 3],
    /// [left, right, output] scalar multiplications after greedy CSE.
    pub scalings: [usize; 3],
}

impl Cost {
    pub fn naive_total(&self) -> usize {
        self.naive_additions.iter().sum()
    }
    pub fn total(&self) -> usize {
        self.additions.iter().sum()
    }
    pub fn scalings_total(&self) -> usize {
        self.scalings.iter().sum()
    }
}

fn sparse(x: &[Q]) -> Form {
    x.iter()
        .enumerate()
        .filter(|(_, c)| !c.is_zero())
        .map(|(i, c)| (i, c.clone()))
        .collect()
}

/// The three lists of forms of a scheme: rows of U (over a), rows of V (over b), and for
/// each result coordinate k the column `(w_t[k])_t` (over the products m_t).
pub fn side_forms(s: &Scheme) -> [Vec<Form>; 3] {
    let left = s.u.iter().map(|x| sparse(x)).collect();
    let right = s.v.iter().map(|x| sparse(x)).collect();
    let out = (0..s.dims[2])
        .map(|k| {
            (0..s.rank())
                .filter(|&t| !s.w[t][k].is_zero())
                .map(|t| (t, s.w[t][k].clone()))
                .collect()
        })
        .collect();
    [left, right, out]
}

/// Greedy pairwise CSE (see the module docs). Cost: O(iterations * sum_f |f|^2 log).
pub fn cse(field: FieldSpec, inputs: usize, forms: Vec<Form>) -> LinearProgram {
    let mut forms = forms;
    let mut temps: Vec<(usize, Q, usize)> = Vec::new();
    let ratio = |a: &Q, b: &Q| -> Q {
        let r = b / a;
        reduce_into(field, &r).unwrap_or(r)
    };
    loop {
        let mut counts: BTreeMap<(usize, usize, Q), usize> = BTreeMap::new();
        for f in &forms {
            for a in 0..f.len() {
                for b in a + 1..f.len() {
                    *counts
                        .entry((f[a].0, f[b].0, ratio(&f[a].1, &f[b].1)))
                        .or_default() += 1;
                }
            }
        }
        let Some(((x, y, r), n)) =
            counts
                .into_iter()
                .fold(
                    None,
                    |best: Option<((usize, usize, Q), usize)>, (k, n)| match &best {
                        Some((_, bn)) if *bn >= n => best,
                        _ => Some((k, n)),
                    },
                )
        else {
            break;
        };
        if n < 2 {
            break;
        }
        let z = inputs + temps.len();
        temps.push((x, r.clone(), y));
        for f in forms.iter_mut() {
            let px = f.iter().position(|e| e.0 == x);
            let py = f.iter().position(|e| e.0 == y);
            if let (Some(px), Some(py)) = (px, py)
                && ratio(&f[px].1, &f[py].1) == r
            {
                let cx = f[px].1.clone();
                f.retain(|e| e.0 != x && e.0 != y);
                f.push((z, cx));
                f.sort_by_key(|e| e.0);
            }
        }
    }
    LinearProgram {
        inputs,
        temps,
        forms,
    }
}

/// The straight-line programs of the three sides after CSE (inputs: a's, b's, m's).
pub fn programs(s: &Scheme) -> [LinearProgram; 3] {
    let [l, r, o] = side_forms(s);
    [
        cse(s.field, s.dims[0], l),
        cse(s.field, s.dims[1], r),
        cse(s.field, s.rank(), o),
    ]
}

/// Count additions and scalings, naive and after CSE. Cost: that of three [`cse`] runs.
pub fn count_cost(s: &Scheme) -> Cost {
    let forms = side_forms(s);
    let ins = [s.dims[0], s.dims[1], s.rank()];
    let naive: Vec<LinearProgram> = forms
        .iter()
        .zip(ins)
        .map(|(f, i)| LinearProgram {
            inputs: i,
            temps: Vec::new(),
            forms: f.clone(),
        })
        .collect();
    let opt = programs(s);
    Cost {
        naive_additions: [0, 1, 2].map(|a| naive[a].additions()),
        naive_scalings: [0, 1, 2].map(|a| naive[a].scalings(s.field)),
        additions: [0, 1, 2].map(|a| opt[a].additions()),
        scalings: [0, 1, 2].map(|a| opt[a].scalings(s.field)),
    }
}

/// The value of a program's forms at inputs `x` (exact; for tests and emit checks).
pub fn evaluate(p: &LinearProgram, x: &[Q]) -> Vec<Q> {
    let mut vals = x.to_vec();
    for (a, r, b) in &p.temps {
        let v = &vals[*a] + r * &vals[*b];
        vals.push(v);
    }
    p.forms
        .iter()
        .map(|f| {
            f.iter()
                .map(|(i, c)| c * &vals[*i])
                .fold(Q::zero(), |s, t| s + t)
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;

    #[test]
    fn strassen_18_winograd_15() {
        // Strassen 1969: 18 additions; Winograd's variant: 15 (Probert 1976; Bshouty 1989,
        // both from memory).
        let t = matmul(2, 2, 2);
        let c = count_cost(&scheme(STRASSEN, &t));
        assert_eq!(c.naive_total(), 18);
        assert_eq!(c.total(), 18);
        assert_eq!(c.scalings_total(), 0);
        let c = count_cost(&scheme(WINOGRAD, &t));
        assert_eq!(c.total(), 15, "{c:?}");
        assert_eq!(c.additions, [4, 4, 7]);
        assert!(c.naive_total() > 15);
    }

    #[test]
    fn cse_programs_compute_the_same_forms() {
        let t = matmul(2, 2, 2);
        let s = scheme(WINOGRAD, &t);
        let forms = side_forms(&s);
        let progs = programs(&s);
        let x: Vec<Q> = (0..7)
            .map(|i| crate::scalar::q(3 * i - 5, 1 + i % 3))
            .collect();
        for a in 0..3 {
            let n = progs[a].inputs;
            let naive = LinearProgram {
                inputs: n,
                temps: vec![],
                forms: forms[a].clone(),
            };
            assert_eq!(evaluate(&progs[a], &x[..n]), evaluate(&naive, &x[..n]));
        }
    }
}
