//! Search for an explicit isomorphism between two small algebras, verified exactly.
//!
//! Method: pick generators of the input algebra X among its basis vectors (greedily, after
//! its unit if it has one). A homomorphism psi: X -> E is fixed by the images of the
//! generators; candidate images are the vectors of E with integer coordinates in
//! `-b..=b` that satisfy the same power relation as the generator (its first linear
//! dependency among 1, g, g^2, g^3, ...). Backtracking over the generators, after each
//! choice the subalgebra generated so far is rebuilt word by word in X and in E: every
//! product of words must satisfy in E the linear relation it satisfies in X, and the images
//! of independent words must stay independent. A complete assignment gives a candidate
//! matrix, which is accepted only after [`crate::tensor::change_basis_algebra`] reproduces
//! X's structure constants exactly. The search is bounded by a node budget; "not found"
//! means not found with these coordinates and budget, not "not isomorphic".

use super::{express, same_constants};
use crate::linalg::Matrix;
use crate::scalar::{Field, FieldSpec, Q};
use crate::tensor::{IntegralTensor, Kind, Tensor, change_basis_algebra, rank_over};
use num_traits::Zero;

/// An algebra with the few exact operations the search needs (products of coordinate
/// vectors and spans, in the algebra's field).
struct Alg<'a> {
    t: &'a Tensor,
    field: FieldSpec,
    n: usize,
}

impl Alg<'_> {
    fn mul(&self, x: &[Q], y: &[Q]) -> Vec<Q> {
        self.t.multiply(x, y)
    }

    /// Reduce a vector into the field's representatives (identity over Q).
    fn reduce(&self, v: Vec<Q>) -> Vec<Q> {
        match self.field {
            FieldSpec::Rational => v,
            FieldSpec::Prime(p) => {
                let f = crate::scalar::PrimeField::new(p).expect("a prime field");
                v.iter()
                    .map(|x| f.to_rational(&f.from_rational(x).unwrap_or(0)))
                    .collect()
            }
        }
    }

    fn rank(&self, vectors: &[Vec<Q>]) -> usize {
        if vectors.is_empty() {
            return 0;
        }
        rank_over(self.field, &Matrix::from_rows(vectors.to_vec(), self.n))
    }

    fn full_basis(&self) -> Vec<Vec<Q>> {
        (0..self.n)
            .map(|i| {
                let mut v = vec![Q::zero(); self.n];
                v[i] = Q::from_integer(1.into());
                v
            })
            .collect()
    }

    fn unit(&self) -> Option<Vec<Q>> {
        crate::laws::find_unit(&IntegralTensor::from_tensor(self.t), &Default::default())
            .ok()
            .flatten()
    }
}

/// Parameters of [`find_isomorphism`].
#[derive(Clone, Debug)]
pub struct IsoParams {
    /// Candidate images have integer coordinates in `-coord_bound..=coord_bound`.
    pub coord_bound: i64,
    /// Give up after this many candidate checks.
    pub max_nodes: usize,
    /// Do not attempt algebras of larger dimension.
    pub max_dim: usize,
}

impl Default for IsoParams {
    fn default() -> Self {
        IsoParams {
            coord_bound: 1,
            max_nodes: 200_000,
            max_dim: 4,
        }
    }
}

fn combine(d: &Alg, coeffs: &[Q], vecs: &[Vec<Q>]) -> Vec<Q> {
    let mut out = vec![Q::zero(); d.n];
    for (c, v) in coeffs.iter().zip(vecs) {
        for (o, x) in out.iter_mut().zip(v) {
            *o += c * x;
        }
    }
    d.reduce(out)
}

fn same(d: &Alg, a: &[Q], b: &[Q]) -> bool {
    d.reduce(a.iter().zip(b).map(|(x, y)| x - y).collect())
        .iter()
        .all(Zero::is_zero)
}

/// Words of the generated subalgebra: their vectors in X and their images in E.
#[derive(Clone)]
struct Words {
    xs: Vec<Vec<Q>>,
    es: Vec<Vec<Q>>,
}

/// Close the words under products, checking every relation in E. `None` on a conflict.
fn close(dx: &Alg, de: &Alg, mut w: Words) -> Option<Words> {
    loop {
        let mut grown = false;
        let len = w.xs.len();
        for a in 0..len {
            for b in 0..len {
                let px = dx.mul(&w.xs[a], &w.xs[b]);
                let pe = de.mul(&w.es[a], &w.es[b]);
                match express(dx.field, &w.xs, &px) {
                    Some(l) => {
                        if !same(de, &combine(de, &l, &w.es), &pe) {
                            return None;
                        }
                    }
                    None => {
                        w.xs.push(px);
                        w.es.push(pe);
                        grown = true;
                    }
                }
            }
        }
        if de.rank(&w.es) != w.es.len() {
            return None;
        }
        if !grown {
            return Some(w);
        }
    }
}

/// The first linear relation among `start, g, g^2, ...` (right powers), as coefficients
/// over `[start.., g, .., g^k]` with the last power last; `None` if none up to degree n+1.
fn power_relation(d: &Alg, start: &[Vec<Q>], g: &[Q]) -> Option<(usize, Vec<Q>)> {
    let mut vecs: Vec<Vec<Q>> = start.to_vec();
    let mut p = g.to_vec();
    for k in 1..=d.n + 1 {
        if let Some(l) = express(d.field, &vecs, &p) {
            return Some((k, l));
        }
        vecs.push(p.clone());
        p = d.mul(&p, g);
    }
    None
}

fn satisfies_relation(d: &Alg, start: &[Vec<Q>], h: &[Q], rel: &(usize, Vec<Q>)) -> bool {
    let (k, l) = rel;
    let mut vecs: Vec<Vec<Q>> = start.to_vec();
    let mut p = h.to_vec();
    for _ in 1..*k {
        vecs.push(p.clone());
        p = d.mul(&p, h);
    }
    same(d, &combine(d, l, &vecs), &p)
}

/// Find an invertible M (columns: the images in E of X's basis vectors, in E's
/// coordinates) with `change_basis_algebra(e, M)` equal to `x` coefficient by coefficient.
/// Returns `None` when none is found within the parameters (or the shapes differ).
/// Cost: at most `max_nodes` candidate checks, each O(n^4) exact operations.
pub fn find_isomorphism(x: &Tensor, e: &Tensor, params: &IsoParams) -> Option<Matrix<Q>> {
    let n = x.dim();
    if x.kind() != Kind::Algebra
        || e.kind() != Kind::Algebra
        || e.dim() != n
        || x.field() != e.field()
    {
        return None;
    }
    if n > params.max_dim {
        return None;
    }
    let dx = Alg {
        t: x,
        field: x.field(),
        n,
    };
    let de = Alg {
        t: e,
        field: e.field(),
        n,
    };
    if x.nnz() == 0 || e.nnz() == 0 {
        let id = Matrix::identity(&crate::scalar::Rationals, n);
        return (x.nnz() == 0 && e.nnz() == 0).then_some(id);
    }
    let (ux, ue) = (dx.unit(), de.unit());
    if ux.is_some() != ue.is_some() {
        return None;
    }
    let start = Words {
        xs: ux.clone().into_iter().collect(),
        es: ue.clone().into_iter().collect(),
    };
    let start = close(&dx, &de, start)?;
    // generators of X among its basis vectors
    let basis = dx.full_basis();
    let mut gens = Vec::new();
    let mut span = start.xs.clone();
    for (i, b) in basis.iter().enumerate() {
        if express(dx.field, &span, b).is_none() {
            gens.push(i);
            let w = Words {
                xs: span.clone(),
                es: span.clone(),
            };
            let mut w = w;
            w.xs.push(b.clone());
            w.es.push(b.clone());
            span = close(&dx, &dx, w).map(|w| w.xs).unwrap_or(span);
        }
    }
    // candidate images per generator
    let b = params.coord_bound.max(1);
    let width = (2 * b + 1) as usize;
    let total = width.checked_pow(n as u32)?;
    let unit_start: Vec<Vec<Q>> = ue.into_iter().collect();
    let unit_start_x: Vec<Vec<Q>> = ux.into_iter().collect();
    let mut cands: Vec<Vec<Vec<Q>>> = Vec::new();
    let mut budget = params.max_nodes;
    for &g in &gens {
        let rel = power_relation(&dx, &unit_start_x, &basis[g]);
        let mut list = Vec::new();
        for code in 0..total {
            if budget == 0 {
                return None;
            }
            budget -= 1;
            let mut c = code;
            let v: Vec<Q> = (0..n)
                .map(|_| {
                    let digit = (c % width) as i64 - b;
                    c /= width;
                    Q::from_integer(digit.into())
                })
                .collect();
            if v.iter().all(|x| x.is_zero()) {
                continue;
            }
            let v = de.reduce(v);
            if rel
                .as_ref()
                .is_none_or(|r| satisfies_relation(&de, &unit_start, &v, r))
            {
                list.push(v);
            }
        }
        cands.push(list);
    }
    let m = backtrack(&dx, &de, &gens, &cands, 0, start, &mut budget)?;
    // psi(x_j) from the word basis
    let mut cols = Vec::with_capacity(n);
    for bj in &basis {
        let l = express(dx.field, &m.xs, bj)?;
        cols.push(combine(&de, &l, &m.es));
    }
    let mat = Matrix {
        rows: n,
        cols: n,
        data: (0..n)
            .flat_map(|r| cols.iter().map(move |c| c[r].clone()))
            .collect::<Vec<_>>(),
    };
    let y = change_basis_algebra(e, &mat)?;
    same_constants(&y, x).then_some(mat)
}

fn backtrack(
    dx: &Alg,
    de: &Alg,
    gens: &[usize],
    cands: &[Vec<Vec<Q>>],
    level: usize,
    words: Words,
    budget: &mut usize,
) -> Option<Words> {
    if level == gens.len() {
        return (words.xs.len() == dx.n).then_some(words);
    }
    let g = &dx.full_basis()[gens[level]];
    if express(dx.field, &words.xs, g).is_some() {
        return backtrack(dx, de, gens, cands, level + 1, words, budget);
    }
    for h in &cands[level] {
        if *budget == 0 {
            return None;
        }
        *budget -= 1;
        let mut w = words.clone();
        w.xs.push(g.clone());
        w.es.push(h.clone());
        if let Some(w) = close(dx, de, w)
            && let Some(done) = backtrack(dx, de, gens, cands, level + 1, w, budget)
        {
            return Some(done);
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{FieldSpec, q};
    use crate::tensor::random_invertible;

    /// Q[x]/(x^2 - d) with basis 1, s (s^2 = d): Lang 2002, Algebra.
    fn quadratic(d: i64) -> Tensor {
        let mut t = Tensor::algebra(FieldSpec::Rational, vec!["one".into(), "s".into()]);
        t.set(0, 0, 0, q(1, 1));
        t.set(0, 1, 1, q(1, 1));
        t.set(1, 0, 1, q(1, 1));
        t.set(1, 1, 0, q(d, 1));
        t
    }

    #[test]
    fn finds_and_verifies_an_isomorphism() {
        let t = quadratic(-1);
        let x = change_basis_algebra(&t, &random_invertible(2, 1, 3)).unwrap();
        let m = find_isomorphism(&x, &t, &IsoParams::default()).expect("isomorphic");
        let y = change_basis_algebra(&t, &m).unwrap();
        assert!(y.entries().eq(x.entries()));
    }

    #[test]
    fn non_isomorphic_fields_give_none() {
        // Q(sqrt 2) and Q(sqrt 3) are different fields (Lang 2002): no map exists at all.
        assert!(find_isomorphism(&quadratic(2), &quadratic(3), &IsoParams::default()).is_none());
    }
}
