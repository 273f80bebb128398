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

mod matching;

use super::symmetry::discrete_forms;
use super::{Scheme, reduce_into};
use crate::linalg::{Matrix, determinant, inverse, nullspace, rank};
use crate::scalar::{Field, FieldSpec, PrimeField, Q, q_to_string};
use crate::tensor::Tensor;
use num_traits::{One, Zero};
use rand::{Rng, SeedableRng};
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
}

fn red(f: FieldSpec, x: Q) -> Q {
    reduce_into(f, &x).unwrap_or(x)
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

/// The exact conditions of a matching on one side, solved: a basis of the maps P with
/// `P x_t` on the line of `y_{sigma(t)}` for every t.
fn exact_maps(field: FieldSpec, xs: &[Vec<Q>], ys: &[Vec<Q>], sigma: &[usize]) -> Vec<Vec<Q>> {
    let d = xs.first().map_or(0, |x| x.len());
    let mut rows: Vec<Vec<Q>> = Vec::new();
    for (t, &s) in sigma.iter().enumerate() {
        let (u, u2) = (&xs[t], &ys[s]);
        let Some(q) = u2.iter().position(|c| !c.is_zero()) else {
            continue;
        };
        for x in (0..d).filter(|&x| x != q) {
            let mut row = vec![Q::zero(); d * d];
            for y in 0..d {
                row[x * d + y] = red(field, &u2[q] * &u[y]);
                row[q * d + y] = red(field, -(&u2[x] * &u[y]));
            }
            rows.push(row);
        }
    }
    if rows.is_empty() {
        let mut id = Vec::new();
        for k in 0..d * d {
            let mut e = vec![Q::zero(); d * d];
            e[k] = Q::one();
            id.push(e);
        }
        return id;
    }
    crate::with_field!(field, f => {
        let m = Matrix::from_rows(
            rows.iter()
                .map(|r| r.iter().map(|x| f.from_rational(x).expect("reduced")).collect())
                .collect(),
            d * d,
        );
        nullspace(f, &m)
            .iter()
            .map(|v| v.iter().map(|e| f.to_rational(e)).collect())
            .collect()
    })
}

fn mat_vec(field: FieldSpec, m: &Matrix<Q>, x: &[Q]) -> Vec<Q> {
    (0..m.rows)
        .map(|i| {
            red(
                field,
                m.row(i)
                    .iter()
                    .zip(x)
                    .map(|(a, b)| a * b)
                    .fold(Q::zero(), |s, y| s + y),
            )
        })
        .collect()
}

fn det_nonzero(field: FieldSpec, m: &Matrix<Q>) -> bool {
    crate::with_field!(field, f => {
        let e = m.map(|x| f.from_rational(x).expect("reduced"));
        !f.is_zero(&determinant(f, &e))
    })
}

/// `y = a x` with a nonzero: `Some(a)`; both zero: `Some(1)`.
fn ratio(field: FieldSpec, x: &[Q], y: &[Q]) -> Option<Q> {
    match x.iter().position(|c| !c.is_zero()) {
        None => y.iter().all(|c| c.is_zero()).then(Q::one),
        Some(i) => {
            let a = red(field, &y[i] / &x[i]);
            (!a.is_zero() && x.iter().zip(y).all(|(p, q)| red(field, p * &a) == *q)).then_some(a)
        }
    }
}

/// Solve `M x_t = y_t` for every t exactly (M is d x d, row-major): a particular
/// solution and a basis of the solutions of the homogeneous system.
fn solve_images(field: FieldSpec, xs: &[&Vec<Q>], ys: &[Vec<Q>]) -> Option<(Vec<Q>, Vec<Vec<Q>>)> {
    let d = xs.first().map_or(0, |x| x.len());
    let mut rows = Vec::new();
    let mut rhs = Vec::new();
    for (x, y) in xs.iter().zip(ys) {
        for r in 0..d {
            let mut row = vec![Q::zero(); d * d];
            row[r * d..(r + 1) * d].clone_from_slice(x);
            rows.push(row);
            rhs.push(y[r].clone());
        }
    }
    crate::with_field!(field, f => {
        let conv = |v: &Q| f.from_rational(v).expect("reduced");
        let m = Matrix::from_rows(
            rows.iter().map(|r| r.iter().map(conv).collect()).collect(),
            d * d,
        );
        let b: Vec<_> = rhs.iter().map(conv).collect();
        let back = |v: &[_]| -> Vec<Q> { v.iter().map(|e| f.to_rational(e)).collect() };
        let x = crate::linalg::solve(f, &m, &b)?;
        let null = nullspace(f, &m);
        Some((back(&x), null.iter().map(|v| back(v)).collect()))
    })
}

fn square(v: &[Q], n: usize) -> Matrix<Q> {
    Matrix::from_rows((0..n).map(|i| v[i * n..(i + 1) * n].to_vec()).collect(), n)
}

/// Check a complete matching exactly (see the module docs, step 2). Two sides take an
/// invertible member of their solution space (the one-dimensional spaces are fixed up to
/// a scalar, others are tried with random members); the third side is then solved
/// exactly so that every term maps onto its match with product of scalars one.
fn confirm(
    name: &str,
    s1: &Scheme,
    s2: &Scheme,
    t: &Tensor,
    nmp: Option<[usize; 3]>,
    sigma: &[usize],
    seed: u64,
) -> Option<Transformation> {
    let field = s1.field;
    let d = s1.dims;
    let facs1 = [&s1.u, &s1.v, &s1.w];
    let facs2 = [&s2.u, &s2.v, &s2.w];
    let bases: Vec<Vec<Vec<Q>>> = (0..3)
        .map(|a| exact_maps(field, facs1[a], facs2[a], sigma))
        .collect();
    if bases.iter().any(|b| b.is_empty()) {
        return None;
    }
    // solve the side with the largest solution space exactly
    let solved = (0..3).rev().max_by_key(|&a| bases[a].len()).unwrap_or(2);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed ^ 0x5eed);
    for attempt in 0..12 {
        let mut maps: Vec<Option<Matrix<Q>>> = vec![None, None, None];
        for a in (0..3).filter(|&a| a != solved) {
            let n = d[a];
            let mut v = vec![Q::zero(); n * n];
            for b in &bases[a] {
                let c = if attempt == 0 {
                    Q::one()
                } else {
                    Q::from_integer(rng.gen_range(-3i64..=3).into())
                };
                for (x, y) in v.iter_mut().zip(b) {
                    *x = red(field, &*x + &c * y);
                }
            }
            maps[a] = Some(square(&v, n));
        }
        if !maps.iter().flatten().all(|m| det_nonzero(field, m)) {
            continue;
        }
        let mut xs = Vec::new();
        let mut ys = Vec::new();
        let mut ok = true;
        for (tt, &s) in sigma.iter().enumerate() {
            let mut prod = Q::one();
            for a in (0..3).filter(|&a| a != solved) {
                let img = mat_vec(field, maps[a].as_ref().expect("set"), &facs1[a][tt]);
                match ratio(field, &img, &facs2[a][s]) {
                    Some(r) => prod = red(field, prod * r),
                    None => ok = false,
                }
            }
            if !ok {
                break;
            }
            // y = prod * (image of x) on the other sides, so the solved side must send
            // its factor to prod * y
            xs.push(&facs1[solved][tt]);
            ys.push(
                facs2[solved][s]
                    .iter()
                    .map(|y| red(field, y * &prod))
                    .collect(),
            );
        }
        if !ok {
            continue;
        }
        let Some((part, null)) = solve_images(field, &xs, &ys) else {
            continue;
        };
        let n = d[solved];
        for tries in 0..4 {
            let mut v = part.clone();
            if tries > 0 {
                for b in &null {
                    let c = Q::from_integer(rng.gen_range(-3i64..=3).into());
                    for (x, y) in v.iter_mut().zip(b) {
                        *x = red(field, &*x + &c * y);
                    }
                }
            }
            let m = square(&v, n);
            if !det_nonzero(field, &m) {
                if null.is_empty() {
                    break;
                }
                continue;
            }
            let mut all = maps.clone();
            all[solved] = Some(m);
            let maps: [Matrix<Q>; 3] = [
                all[0].clone().expect("set"),
                all[1].clone().expect("set"),
                all[2].clone().expect("set"),
            ];
            if !terms_map(field, s1, s2, &maps, sigma) || !fixes_tensor(t, &maps) {
                continue;
            }
            let sandwich = nmp.and_then(|f| sandwich_of(field, &maps, f, s1, s2, sigma));
            return Some(Transformation {
                form: name.to_string(),
                matching: sigma.to_vec(),
                maps,
                sandwich,
            });
        }
    }
    None
}

/// Every term t maps exactly onto term sigma(t): images proportional factor by factor
/// with scalars whose product is one.
fn terms_map(
    field: FieldSpec,
    s1: &Scheme,
    s2: &Scheme,
    maps: &[Matrix<Q>; 3],
    sigma: &[usize],
) -> bool {
    let f1 = [&s1.u, &s1.v, &s1.w];
    let f2 = [&s2.u, &s2.v, &s2.w];
    sigma.iter().enumerate().all(|(tt, &s)| {
        let mut prod = Q::one();
        for a in 0..3 {
            let img = mat_vec(field, &maps[a], &f1[a][tt]);
            match ratio(field, &img, &f2[a][s]) {
                Some(r) => prod = red(field, prod * r),
                None => return false,
            }
        }
        prod.is_one()
    })
}

/// `(P (x) Q (x) R) T = T`, checked exactly.
fn fixes_tensor(t: &Tensor, maps: &[Matrix<Q>; 3]) -> bool {
    let d = t.dims();
    let field = t.field();
    let mut acc = vec![Q::zero(); d[0] * d[1] * d[2]];
    for (i, j, k, c) in t.entries() {
        for x in 0..d[0] {
            let px = &maps[0][(x, i)];
            if px.is_zero() {
                continue;
            }
            for y in 0..d[1] {
                let qy = &maps[1][(y, j)];
                if qy.is_zero() {
                    continue;
                }
                let pq = c * px * qy;
                for z in 0..d[2] {
                    let rz = &maps[2][(z, k)];
                    if !rz.is_zero() {
                        acc[(x * d[1] + y) * d[2] + z] += &pq * rz;
                    }
                }
            }
        }
    }
    (0..d[0]).all(|x| {
        (0..d[1]).all(|y| {
            (0..d[2]).all(|z| red(field, acc[(x * d[1] + y) * d[2] + z].clone()) == t.get(x, y, z))
        })
    })
}

/// A Kronecker factorisation `M = A (x) B` (A r x r, B c x c), up to a scalar.
fn kron_factors(
    field: FieldSpec,
    m: &Matrix<Q>,
    r: usize,
    c: usize,
) -> Option<(Matrix<Q>, Matrix<Q>)> {
    // M[(i,j),(i2,j2)] = A[i][i2] B[j][j2]
    let at = |i: usize, j: usize, i2: usize, j2: usize| &m[(i * c + j, i2 * c + j2)];
    let (mut p0, mut found) = ((0, 0, 0, 0), false);
    'f: for i in 0..r {
        for i2 in 0..r {
            for j in 0..c {
                for j2 in 0..c {
                    if !at(i, j, i2, j2).is_zero() {
                        p0 = (i, j, i2, j2);
                        found = true;
                        break 'f;
                    }
                }
            }
        }
    }
    if !found {
        return None;
    }
    let (i0, j0, i20, j20) = p0;
    let a = Matrix::from_rows(
        (0..r)
            .map(|i| (0..r).map(|i2| at(i, j0, i2, j20).clone()).collect())
            .collect(),
        r,
    );
    let piv = at(i0, j0, i20, j20).clone();
    let b = Matrix::from_rows(
        (0..c)
            .map(|j| {
                (0..c)
                    .map(|j2| red(field, at(i0, j, i20, j2) / &piv))
                    .collect()
            })
            .collect(),
        c,
    );
    Some((a, b))
}

fn transpose(m: &Matrix<Q>) -> Matrix<Q> {
    m.transpose()
}

fn invert(field: FieldSpec, m: &Matrix<Q>) -> Option<Matrix<Q>> {
    crate::with_field!(field, f => {
        let e = m.map(|x| f.from_rational(x).expect("reduced"));
        inverse(f, &e).map(|i| i.map(|x| f.to_rational(x)))
    })
}

/// X, Y, Z with P = X^T (x) Y^-1, Q = Y^T (x) Z^-1, R = X^-1 (x) Z^T (up to scalars),
/// checked by applying the sandwich to `s1` and comparing with `s2` term by term.
fn sandwich_of(
    field: FieldSpec,
    maps: &[Matrix<Q>; 3],
    [n, m, p]: [usize; 3],
    s1: &Scheme,
    s2: &Scheme,
    sigma: &[usize],
) -> Option<[Matrix<Q>; 3]> {
    let (xt, yinv) = kron_factors(field, &maps[0], n, m)?;
    let (_, zinv) = kron_factors(field, &maps[1], m, p)?;
    let x = transpose(&xt);
    let y = invert(field, &yinv)?;
    let z = invert(field, &zinv)?;
    let img = super::sandwich::apply_sandwich(s1, [n, m, p], [&x, &y, &z])?;
    let id = |k: usize| {
        Matrix::from_rows(
            (0..k)
                .map(|i| {
                    (0..k)
                        .map(|j| if i == j { Q::one() } else { Q::zero() })
                        .collect()
                })
                .collect(),
            k,
        )
    };
    let ids = [id(s1.dims[0]), id(s1.dims[1]), id(s1.dims[2])];
    terms_map(field, &img, s2, &ids, sigma).then_some([x, y, z])
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
