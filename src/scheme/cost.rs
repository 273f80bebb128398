//! The one cost model of a scheme, shared by `scheme cost`, `polish` and the headers of
//! emitted code.
//!
//! Measures ([`Cost`]): multiplications (the rank); additions of the three linear maps
//! (left forms `u_t . a`, right forms `v_t . b`, outputs `c_k = sum_t w_t[k] m_t`) before
//! and after common-subexpression elimination (CSE); multiplications by constants other
//! than +1 and -1, before and after CSE; the number of nonzero coefficients; the largest
//! numerator and the largest denominator of a coefficient (over GF(p): of the symmetric
//! representative).
//!
//! Naive count: a form with s nonzero terms costs s - 1 additions; every coefficient other
//! than +1 and -1 costs one multiplication by a constant. Signs are free (a subtraction is
//! an addition). CSE: a greedy pairwise scheme as in the usual practice — repeatedly take
//! the most frequent pair of terms `x + r y` (the same ratio r up to an overall factor)
//! occurring in at least two forms of one side, compute it once into a temporary and
//! substitute. Ties go to the smallest (x, y, r). The result is a straight-line
//! [`LinearProgram`] per side, which the emitters print, so emitted code performs exactly
//! the counted additions.
//!
//! [`Objective`] names one measure for `polish`; its [`Objective::key`] orders schemes by
//! that measure first and the others after it.

use super::{Scheme, reduce_into};
use crate::error::Error;
use crate::scalar::{FieldSpec, Q};
use num_bigint::BigInt;
use num_traits::{One, Signed, Zero};
use std::collections::HashMap;

/// A sparse linear form: (variable, coefficient), variables ascending, no zeros.
pub type Form = Vec<(usize, Q)>;

/// Straight-line code for a list of linear forms. Variables `0..inputs` are the inputs;
/// variable `inputs + k` is temporary k, the two-term form `temps[k]` over earlier
/// variables.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LinearProgram {
    pub inputs: usize,
    pub temps: Vec<Form>,
    /// The final forms over inputs and temporaries.
    pub forms: Vec<Form>,
}

/// True for the coefficients that cost no multiplication: +1 and -1 (over GF(p): 1, p - 1).
pub fn is_unit(field: FieldSpec, c: &Q) -> bool {
    if c.denom().is_one() && c.numer().magnitude().is_one() {
        return true;
    }
    match field {
        FieldSpec::Prime(p) => *c == Q::from_integer((p - 1).into()),
        FieldSpec::Rational => false,
    }
}

impl LinearProgram {
    /// Additions: s - 1 per temporary or final form with s terms.
    pub fn additions(&self) -> usize {
        self.temps
            .iter()
            .chain(&self.forms)
            .map(|f| f.len().saturating_sub(1))
            .sum()
    }
    /// Multiplications by constants other than +-1 (in temporaries and forms).
    pub fn scalings(&self, field: FieldSpec) -> usize {
        self.temps
            .iter()
            .chain(&self.forms)
            .flatten()
            .filter(|(_, c)| !is_unit(field, c))
            .count()
    }
}

/// Every measure of a scheme (see the module docs). Arrays are [left, right, output].
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Cost {
    pub multiplications: usize,
    pub naive_additions: [usize; 3],
    pub additions: [usize; 3],
    pub naive_scalings: [usize; 3],
    pub scalings: [usize; 3],
    pub nonzeros: usize,
    /// Coefficients that are not integers (over GF(p): none).
    pub fractions: usize,
    pub max_numerator: BigInt,
    pub max_denominator: BigInt,
}

impl Cost {
    /// Additions before CSE.
    pub fn naive_total(&self) -> usize {
        self.naive_additions.iter().sum()
    }
    /// Additions after CSE.
    pub fn total(&self) -> usize {
        self.additions.iter().sum()
    }
    /// Multiplications by constants other than +-1 before CSE (the number of such
    /// coefficients in the three factor matrices).
    pub fn naive_scalings_total(&self) -> usize {
        self.naive_scalings.iter().sum()
    }
    /// Multiplications by constants other than +-1 after CSE.
    pub fn scalings_total(&self) -> usize {
        self.scalings.iter().sum()
    }

    /// The JSON object of every measure (numbers; the largest numerator and denominator
    /// as decimal strings, since they may exceed 64 bits).
    pub fn to_json(&self) -> serde_json::Value {
        serde_json::json!({
            "multiplications": self.multiplications,
            "additions_naive": self.naive_total(),
            "additions": self.total(),
            "additions_naive_by_side": self.naive_additions,
            "additions_by_side": self.additions,
            "scalings_naive": self.naive_scalings_total(),
            "scalings": self.scalings_total(),
            "scalings_naive_by_side": self.naive_scalings,
            "scalings_by_side": self.scalings,
            "nonzeros": self.nonzeros,
            "fractions": self.fractions,
            "max_numerator": self.max_numerator.to_string(),
            "max_denominator": self.max_denominator.to_string(),
        })
    }

    /// The measures as (name, value) rows, the same for every command.
    pub fn rows(&self) -> Vec<(String, String)> {
        let side = |a: &[usize; 3]| format!("(left {}, right {}, output {})", a[0], a[1], a[2]);
        vec![
            ("multiplications".into(), self.multiplications.to_string()),
            (
                "additions before CSE".into(),
                format!("{} {}", self.naive_total(), side(&self.naive_additions)),
            ),
            (
                "additions after CSE".into(),
                format!("{} {}", self.total(), side(&self.additions)),
            ),
            (
                "multiplications by constants other than +-1, before CSE".into(),
                self.naive_scalings_total().to_string(),
            ),
            (
                "multiplications by constants other than +-1, after CSE".into(),
                self.scalings_total().to_string(),
            ),
            ("nonzero coefficients".into(), self.nonzeros.to_string()),
            (
                "coefficients that are not integers".into(),
                self.fractions.to_string(),
            ),
            ("largest numerator".into(), self.max_numerator.to_string()),
            (
                "largest denominator".into(),
                self.max_denominator.to_string(),
            ),
        ]
    }

    /// The measures as text lines `name: value`.
    pub fn lines(&self) -> Vec<String> {
        self.rows()
            .into_iter()
            .map(|(n, v)| format!("{n}: {v}"))
            .collect()
    }

    /// Before and after, one line per measure: `name: before -> after`.
    pub fn compare_lines(&self, after: &Cost) -> Vec<String> {
        self.rows()
            .into_iter()
            .zip(after.rows())
            .map(|((n, a), (_, b))| format!("{n}: {a} -> {b}"))
            .collect()
    }
}

/// What `polish` lowers. Every objective is a measure of [`Cost`].
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Objective {
    /// The rank.
    Multiplications,
    /// Additions after CSE.
    Additions,
    /// Multiplications by constants other than +-1 after CSE.
    Scalings,
    /// Nonzero coefficients.
    Nonzeros,
    /// The largest denominator, then the largest numerator, then the number of
    /// coefficients that are not integers (small integer coefficients).
    Coefficients,
}

impl Objective {
    /// All objectives, in the order of their names.
    pub const ALL: [Objective; 5] = [
        Objective::Multiplications,
        Objective::Additions,
        Objective::Scalings,
        Objective::Nonzeros,
        Objective::Coefficients,
    ];

    /// `multiplications`, `additions`, `scalings`, `nonzeros`, `coefficients`.
    pub fn name(self) -> &'static str {
        match self {
            Objective::Multiplications => "multiplications",
            Objective::Additions => "additions",
            Objective::Scalings => "scalings",
            Objective::Nonzeros => "nonzeros",
            Objective::Coefficients => "coefficients",
        }
    }

    /// Parse a name (also `rank`, `adds`, `constants`, `nnz`, `size`).
    pub fn parse(s: &str) -> Result<Objective, Error> {
        match s.to_ascii_lowercase().as_str() {
            "multiplications" | "rank" | "mults" => Ok(Objective::Multiplications),
            "additions" | "adds" => Ok(Objective::Additions),
            "scalings" | "constants" => Ok(Objective::Scalings),
            "nonzeros" | "nnz" => Ok(Objective::Nonzeros),
            "coefficients" | "size" => Ok(Objective::Coefficients),
            _ => Err(Error::Invalid(format!(
                "unknown objective `{s}` (expected multiplications, additions, scalings, nonzeros or coefficients)"
            ))),
        }
    }

    /// The value of the objective itself (three numbers for `coefficients`: the largest
    /// denominator, the largest numerator, the number of non-integers); compared
    /// lexicographically.
    pub fn value(self, c: &Cost) -> Vec<BigInt> {
        let n = |x: usize| BigInt::from(x);
        match self {
            Objective::Multiplications => vec![n(c.multiplications)],
            Objective::Additions => vec![n(c.total())],
            Objective::Scalings => vec![n(c.scalings_total())],
            Objective::Nonzeros => vec![n(c.nonzeros)],
            Objective::Coefficients => vec![
                c.max_denominator.clone(),
                c.max_numerator.clone(),
                n(c.fractions),
            ],
        }
    }

    /// The order `polish` uses: the objective's value first, then the other measures
    /// (additions, multiplications by constants, rank, coefficient size, nonzeros) as
    /// tie-breaks. A scheme with a smaller key is never worse on the objective.
    pub fn key(self, c: &Cost) -> Vec<BigInt> {
        let mut k = self.value(c);
        for o in [
            Objective::Additions,
            Objective::Scalings,
            Objective::Multiplications,
            Objective::Coefficients,
            Objective::Nonzeros,
        ] {
            if o != self {
                k.extend(o.value(c));
            }
        }
        k.push(BigInt::from(c.naive_total()));
        k
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

/// Rationals as hash keys: hashes the (always reduced) numerator and denominator, which is
/// much cheaper than the continued-fraction hash of the rational type.
#[derive(Clone, PartialEq, Eq)]
pub(crate) struct QKey(pub Vec<Q>);

impl std::hash::Hash for QKey {
    fn hash<H: std::hash::Hasher>(&self, h: &mut H) {
        for q in &self.0 {
            q.numer().hash(h);
            q.denom().hash(h);
        }
    }
}

/// Coefficient values interned as small ids, with their ratios memoised: the CSE loop
/// compares ids and does exact arithmetic once per distinct pair of values.
struct Interner {
    field: FieldSpec,
    vals: Vec<Q>,
    ids: HashMap<QKey, u32>,
    ratios: HashMap<(u32, u32), u32>,
}

impl Interner {
    fn id(&mut self, q: &Q) -> u32 {
        let key = QKey(vec![q.clone()]);
        if let Some(&i) = self.ids.get(&key) {
            return i;
        }
        let i = self.vals.len() as u32;
        self.vals.push(q.clone());
        self.ids.insert(key, i);
        i
    }
    /// The id of `b / a` (reduced into the field).
    fn ratio(&mut self, a: u32, b: u32) -> u32 {
        if let Some(&r) = self.ratios.get(&(a, b)) {
            return r;
        }
        let r = &self.vals[b as usize] / &self.vals[a as usize];
        let r = reduce_into(self.field, &r).unwrap_or(r);
        let id = self.id(&r);
        self.ratios.insert((a, b), id);
        id
    }
}

type PairKey = (usize, usize, u32);

/// Add (`sign` = 1) or remove (-1) the pairs of one form in the pair counts.
fn count_pairs(
    counts: &mut HashMap<PairKey, usize>,
    f: &[(usize, u32)],
    it: &mut Interner,
    add: bool,
) {
    for a in 0..f.len() {
        for b in a + 1..f.len() {
            let key = (f[a].0, f[b].0, it.ratio(f[a].1, f[b].1));
            if add {
                *counts.entry(key).or_default() += 1;
            } else if let Some(n) = counts.get_mut(&key) {
                *n -= 1;
                if *n == 0 {
                    counts.remove(&key);
                }
            }
        }
    }
}

/// Greedy pairwise CSE (see the module docs). A temporary is `x + r y`, stored as the
/// form `[(x, 1), (y, r)]`. Pair counts are kept up to date incrementally; exact
/// arithmetic runs once per distinct pair of coefficient values. Cost: O(iterations *
/// (distinct pairs + forms)) plus the pairs of the rewritten forms.
pub fn cse(field: FieldSpec, inputs: usize, forms: Vec<Form>) -> LinearProgram {
    let mut it = Interner {
        field,
        vals: Vec::new(),
        ids: HashMap::new(),
        ratios: HashMap::new(),
    };
    let mut fs: Vec<Vec<(usize, u32)>> = forms
        .iter()
        .map(|f| f.iter().map(|(i, c)| (*i, it.id(c))).collect())
        .collect();
    let mut counts: HashMap<PairKey, usize> = HashMap::new();
    for f in &fs {
        count_pairs(&mut counts, f, &mut it, true);
    }
    let mut temps: Vec<Form> = Vec::new();
    loop {
        // the most frequent pair; ties: the smallest (x, y, r)
        let mut best: Option<(PairKey, usize)> = None;
        for (&k, &n) in &counts {
            let better = match &best {
                None => true,
                Some((bk, bn)) => {
                    n > *bn
                        || (n == *bn
                            && (k.0, k.1)
                                .cmp(&(bk.0, bk.1))
                                .then_with(|| it.vals[k.2 as usize].cmp(&it.vals[bk.2 as usize]))
                                .is_lt())
                }
            };
            if better {
                best = Some((k, n));
            }
        }
        let Some(((x, y, r), n)) = best else {
            break;
        };
        if n < 2 {
            break;
        }
        let z = inputs + temps.len();
        temps.push(vec![(x, Q::one()), (y, it.vals[r as usize].clone())]);
        for f in fs.iter_mut() {
            let px = f.iter().position(|e| e.0 == x);
            let py = f.iter().position(|e| e.0 == y);
            if let (Some(px), Some(py)) = (px, py)
                && it.ratio(f[px].1, f[py].1) == r
            {
                count_pairs(&mut counts, f, &mut it, false);
                let cx = f[px].1;
                f.retain(|e| e.0 != x && e.0 != y);
                f.push((z, cx));
                f.sort_by_key(|e| e.0);
                count_pairs(&mut counts, f, &mut it, true);
            }
        }
    }
    LinearProgram {
        inputs,
        temps,
        forms: fs
            .into_iter()
            .map(|f| {
                f.into_iter()
                    .map(|(i, c)| (i, it.vals[c as usize].clone()))
                    .collect()
            })
            .collect(),
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

/// Every measure of a scheme (see the module docs). Cost: that of three [`cse`] runs.
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
    let mut max_numerator = BigInt::zero();
    let mut max_denominator = BigInt::zero();
    let mut nonzeros = 0;
    let mut fractions = 0;
    for c in [&s.u, &s.v, &s.w]
        .into_iter()
        .flat_map(|m| m.iter().flatten())
        .filter(|c| !c.is_zero())
    {
        nonzeros += 1;
        let c = super::text::display_coef(s.field, c);
        fractions += usize::from(!c.is_integer());
        max_numerator = max_numerator.max(c.numer().abs());
        max_denominator = max_denominator.max(c.denom().clone());
    }
    Cost {
        multiplications: s.rank(),
        naive_additions: [0, 1, 2].map(|a| naive[a].additions()),
        additions: [0, 1, 2].map(|a| opt[a].additions()),
        naive_scalings: [0, 1, 2].map(|a| naive[a].scalings(s.field)),
        scalings: [0, 1, 2].map(|a| opt[a].scalings(s.field)),
        nonzeros,
        fractions,
        max_numerator,
        max_denominator,
    }
}

/// The value of a program's forms at inputs `x` (exact; for tests and emit checks).
pub fn evaluate(p: &LinearProgram, x: &[Q]) -> Vec<Q> {
    let mut vals = x.to_vec();
    let eval = |f: &Form, vals: &[Q]| {
        f.iter()
            .map(|(i, c)| c * &vals[*i])
            .fold(Q::zero(), |s, t| s + t)
    };
    for t in &p.temps {
        let v = eval(t, &vals);
        vals.push(v);
    }
    p.forms.iter().map(|f| eval(f, &vals)).collect()
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
