//! Are two schemes of one tensor the same algorithm up to the tensor's symmetries?
//!
//! The symmetry group used is the isotropy group of the tensor: triples (P, Q, R) of
//! invertible maps of the three spaces with `(P (x) Q (x) R) T = T` (for matrix
//! multiplication <n,m,p> this is the sandwich `(X^T U Y^-T, Y^T V Z^-T, X^-1 W Z)`, de
//! Groote 1978, "On varieties of optimal algorithms for the computation of bilinear
//! mappings I"), together with the cyclic and transposed forms that keep the format.
//! Two schemes are *equivalent* when a group element maps the rank-one terms of the first
//! onto those of the second (`P u_t (x) Q v_t (x) R w_t = u'_s (x) v'_s (x) w'_s` for a
//! bijection t -> s). de Groote (1978) proved that all rank-7 schemes for 2 x 2 matrices
//! are equivalent in this sense.
//!
//! The decision:
//! 1. *Invariants* of a scheme under the group (the rank; the dimension of the span of the
//!    left, right and result factors; how often a factor line repeats; zero factors; for
//!    matrix multiplication the multiset of the ranks of the factors read as matrices)
//!    are compared for every discrete form of the first scheme. If every form differs
//!    from the second scheme on some invariant, the schemes are *not equivalent*, and the
//!    separating invariant is reported. Nothing else ever leads to that verdict.
//! 2. Otherwise a term matching is searched ([`matching`]) modulo a prime; each complete
//!    matching is checked exactly over the scheme's field: the conditions are solved
//!    exactly, an invertible (P, Q, R) is chosen, the three factors of every term must map
//!    onto the matched term with scalars whose product is one, and `(P (x) Q (x) R) T = T`
//!    is checked. For matrix multiplication P, Q, R are also written as the sandwich
//!    X, Y, Z, and the sandwich is checked by applying it to the scheme.
//! 3. When neither happens (the search budget ran out, or the search found no
//!    transformation although no invariant separates the schemes) the verdict is
//!    *undecided*, with the reason.

mod confirm;
mod matching;

use confirm::confirm;

use super::symmetry::discrete_forms;
use super::{Scheme, red};
use crate::linalg::{Matrix, rank};
use crate::scalar::{Field, FieldSpec, PrimeField, Q, q_to_string};
use crate::tensor::Tensor;
use num_traits::Zero;
use std::collections::BTreeMap;

/// Parameters of [`equivalence`].
#[derive(Clone, Debug)]
pub struct EquivParams {
    /// The format <n,m,p> when the tensor is matrix multiplication.
    pub matmul: Option<[usize; 3]>,
    /// Most search nodes per discrete form.
    pub max_nodes: usize,
    pub seed: u64,
}

impl Default for EquivParams {
    fn default() -> Self {
        EquivParams {
            matmul: None,
            max_nodes: 200_000,
            seed: 0,
        }
    }
}

/// A verified transformation from the first scheme to the second.
#[derive(Clone, Debug)]
pub struct Transformation {
    /// The discrete form of the first scheme the map starts from (`input`, `cyclic`, ...).
    pub form: String,
    /// Term t of the first scheme goes to term `matching[t]` of the second.
    pub matching: Vec<usize>,
    /// P, Q, R on the left, right and result spaces (d x d, acting on coordinate columns).
    pub maps: [Matrix<Q>; 3],
    /// Matrix multiplication: X, Y, Z of the sandwich, checked by applying it.
    pub sandwich: Option<[Matrix<Q>; 3]>,
}

/// The answer.
#[derive(Clone, Debug)]
pub enum Verdict {
    Equivalent(Box<Transformation>),
    /// The named invariant differs for every discrete form of the first scheme.
    NotEquivalent {
        invariant: String,
        first: String,
        second: String,
    },
    Undecided(String),
}

/// The verdict with the invariants of both schemes and the search effort.
#[derive(Clone, Debug)]
pub struct Equivalence {
    pub verdict: Verdict,
    /// (name, value for the first scheme, value for the second).
    pub invariants: Vec<(String, String, String)>,
    pub nodes: usize,
    /// The forms of the first scheme compared (`input`, and for matrix formats the cyclic
    /// and transposed forms that keep the format).
    pub forms: Vec<String>,
}

fn matrix_rank(field: FieldSpec, rows: Vec<Vec<Q>>, cols: usize) -> usize {
    if rows.is_empty() || cols == 0 {
        return 0;
    }
    crate::with_field!(field, f => {
        let m = Matrix::from_rows(
            rows.iter()
                .map(|r| r.iter().map(|x| f.from_rational(x).expect("reduced")).collect())
                .collect(),
            cols,
        );
        rank(f, &m)
    })
}

/// Canonical lines: two vectors get the same key when they are proportional.
fn line_key(field: FieldSpec, x: &[Q]) -> Vec<Q> {
    match x.iter().find(|c| !c.is_zero()) {
        None => x.to_vec(),
        Some(c) => {
            let inv = red(field, c.recip());
            x.iter().map(|y| red(field, y * &inv)).collect()
        }
    }
}

/// Local invariants of every term (equal for matched terms): for each axis whether the
/// factor is zero and how many terms share its line; for matmul the factor ranks.
fn term_signatures(s: &Scheme, nmp: Option<[usize; 3]>) -> Vec<Vec<usize>> {
    let f = s.field;
    let facs = [&s.u, &s.v, &s.w];
    let mut counts: [BTreeMap<Vec<Q>, usize>; 3] = Default::default();
    for a in 0..3 {
        for x in facs[a].iter() {
            *counts[a].entry(line_key(f, x)).or_default() += 1;
        }
    }
    (0..s.rank())
        .map(|t| {
            let mut sig = Vec::new();
            for a in 0..3 {
                let x = &facs[a][t];
                sig.push(x.iter().all(|c| c.is_zero()) as usize);
                sig.push(counts[a][&line_key(f, x)]);
            }
            if let Some([n, m, p]) = nmp {
                for (a, (r, c)) in [(n, m), (m, p), (n, p)].into_iter().enumerate() {
                    let x = &facs[a][t];
                    let rows = (0..r).map(|i| x[i * c..(i + 1) * c].to_vec()).collect();
                    sig.push(matrix_rank(f, rows, c));
                }
            }
            sig
        })
        .collect()
}

/// The invariants of a scheme under the group (see the module docs), as (name, value).
pub fn invariants(s: &Scheme, nmp: Option<[usize; 3]>) -> Vec<(String, String)> {
    let mut out = vec![("rank".to_string(), s.rank().to_string())];
    let names = ["left", "right", "result"];
    for (a, m) in [&s.u, &s.v, &s.w].into_iter().enumerate() {
        out.push((
            format!("dimension of the span of the {} factors", names[a]),
            matrix_rank(s.field, m.clone(), s.dims[a]).to_string(),
        ));
    }
    let sigs = term_signatures(s, nmp);
    for (a, name) in names.iter().enumerate() {
        let mut reps: Vec<usize> = sigs.iter().map(|g| g[2 * a + 1]).collect();
        reps.sort_unstable();
        out.push((
            format!("repetitions of each {name} factor line, over the terms"),
            format!("{reps:?}"),
        ));
    }
    let zeros = sigs.iter().filter(|g| g[0] + g[2] + g[4] > 0).count();
    out.push(("terms with a zero factor".into(), zeros.to_string()));
    if nmp.is_some() {
        let mut ranks: BTreeMap<(usize, usize, usize), usize> = BTreeMap::new();
        for g in &sigs {
            *ranks.entry((g[6], g[7], g[8])).or_default() += 1;
        }
        let list: Vec<String> = ranks
            .iter()
            .map(|((a, b, c), k)| format!("({a},{b},{c}) x{k}"))
            .collect();
        out.push((
            "ranks of the factors as matrices (left, right, result)".into(),
            list.join(", "),
        ));
    }
    out
}

/// Decide whether `s1` and `s2` (both schemes of `t`) are equivalent (see the module docs).
/// Cost: the invariants (ranks of small matrices) plus a search of at most
/// `params.max_nodes` nodes per discrete form, each O(d^4) modular operations.
pub fn equivalence(s1: &Scheme, s2: &Scheme, t: &Tensor, params: &EquivParams) -> Equivalence {
    let nmp = params
        .matmul
        .filter(|f| t.dims() == [f[0] * f[1], f[1] * f[2], f[0] * f[2]]);
    let inv2 = invariants(s2, nmp);
    let inv1 = invariants(s1, nmp);
    let table: Vec<(String, String, String)> = inv1
        .iter()
        .zip(&inv2)
        .map(|(a, b)| (a.0.clone(), a.1.clone(), b.1.clone()))
        .collect();
    let mut forms = vec![("input".to_string(), s1.clone())];
    if let Some(f) = nmp {
        forms.extend(discrete_forms(s1, t, f));
    }
    let mut nodes = 0;
    let mut searched = false;
    let mut budget_hit = false;
    for (name, form) in &forms {
        if invariants(form, nmp) != inv2 {
            continue;
        }
        searched = true;
        match search_form(name, form, s2, t, nmp, params) {
            (Some(tr), n) => {
                return Equivalence {
                    verdict: Verdict::Equivalent(Box::new(tr)),
                    invariants: table,
                    nodes: nodes + n,
                    forms: forms.iter().map(|f| f.0.clone()).collect(),
                };
            }
            (None, n) => {
                nodes += n;
                budget_hit |= n > params.max_nodes;
            }
        }
    }
    let verdict = if !searched {
        let (name, a, b) = table
            .iter()
            .find(|(_, a, b)| a != b)
            .cloned()
            .unwrap_or_else(|| {
                // only the cyclic/transposed forms could have matched; name the first
                // invariant that separates each of them (the input form matched none)
                (
                    "invariants of every cyclic and transposed form".into(),
                    String::new(),
                    String::new(),
                )
            });
        Verdict::NotEquivalent {
            invariant: name,
            first: a,
            second: b,
        }
    } else if budget_hit {
        Verdict::Undecided(format!(
            "the search for a transformation stopped at its budget of {} nodes",
            params.max_nodes
        ))
    } else {
        Verdict::Undecided(
            "every invariant agrees and the search over term matchings found no transformation; no invariant separates the schemes"
                .into(),
        )
    };
    Equivalence {
        verdict,
        invariants: table,
        nodes,
        forms: forms.iter().map(|f| f.0.clone()).collect(),
    }
}

/// A prime for the modular search: the scheme's own p, or 2^31 - 1 over Q.
fn search_field(field: FieldSpec) -> PrimeField {
    match field {
        FieldSpec::Prime(p) => PrimeField::new(p).expect("prime"),
        FieldSpec::Rational => PrimeField::new((1 << 31) - 1).expect("prime"),
    }
}

fn search_form(
    name: &str,
    s1: &Scheme,
    s2: &Scheme,
    t: &Tensor,
    nmp: Option<[usize; 3]>,
    params: &EquivParams,
) -> (Option<Transformation>, usize) {
    let pf = search_field(s1.field);
    let residues = |s: &Scheme| -> Option<[Vec<Vec<u64>>; 3]> {
        let conv = |m: &Vec<Vec<Q>>| -> Option<Vec<Vec<u64>>> {
            m.iter()
                .map(|r| r.iter().map(|x| pf.from_rational(x)).collect())
                .collect()
        };
        Some([conv(&s.u)?, conv(&s.v)?, conv(&s.w)?])
    };
    let (Some(first), Some(second)) = (residues(s1), residues(s2)) else {
        return (None, 0);
    };
    let g1 = term_signatures(s1, nmp);
    let g2 = term_signatures(s2, nmp);
    let allowed: Vec<Vec<usize>> = g1
        .iter()
        .map(|a| (0..s2.rank()).filter(|&s| g2[s] == *a).collect())
        .collect();
    let mut found: Option<Transformation> = None;
    let mut leaf = |sigma: &[usize]| -> bool {
        found = confirm(name, s1, s2, t, nmp, sigma, params.seed);
        found.is_some()
    };
    let mut pb = matching::Problem {
        field: pf,
        first,
        second,
        allowed,
        max_nodes: params.max_nodes,
        seed: params.seed,
        leaf: &mut leaf,
    };
    let (ending, nodes) = matching::search(&mut pb);
    let nodes = if ending == matching::Ending::Budget {
        params.max_nodes + 1
    } else {
        nodes
    };
    (found, nodes)
}

/// A matrix as text rows `[1, 0; -1, 1]`.
pub fn matrix_text(m: &Matrix<Q>) -> String {
    let rows: Vec<String> = (0..m.rows)
        .map(|i| {
            m.row(i)
                .iter()
                .map(q_to_string)
                .collect::<Vec<_>>()
                .join(", ")
        })
        .collect();
    format!("[{}]", rows.join("; "))
}

#[cfg(test)]
mod tests;
