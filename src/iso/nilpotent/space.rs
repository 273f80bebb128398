//! A Lie algebra over Q with the exact subspace operations the isomorphism solver needs:
//! spans, intersections, brackets of subspaces, centralisers, the lower and upper central
//! series and the family of characteristic subspaces built from them.
//!
//! Invariant: every operation is a fixed sequence of exact linear algebra over Q, so two
//! isomorphic algebras get families of the same shape, member by member (an isomorphism
//! maps each member of one family onto the member in the same position of the other).

use super::{Subspace, Vector};
use crate::iso::express;
use crate::linalg::{Matrix, nullspace, rref};
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::Tensor;
use num_traits::{One, Zero};

/// A basis of the span of vectors of length `len` (the nonzero rows of the reduced
/// echelon form).
pub(super) fn span_of(vectors: Vec<Vector>, len: usize) -> Subspace {
    if vectors.is_empty() {
        return Vec::new();
    }
    let mut m = Matrix::from_rows(vectors, len);
    let r = rref(&Rationals, &mut m).len();
    (0..r).map(|i| m.row(i).to_vec()).collect()
}

/// A Lie algebra given by its structure tensor, with the exact subspace operations.
pub(super) struct Lie<'a> {
    pub(super) t: &'a Tensor,
    pub(super) n: usize,
}

impl Lie<'_> {
    pub(super) fn bracket(&self, x: &[Q], y: &[Q]) -> Vector {
        self.t.multiply(x, y)
    }

    pub(super) fn unit(&self, i: usize) -> Vector {
        let mut v = vec![Q::zero(); self.n];
        v[i] = Q::one();
        v
    }

    pub(super) fn whole(&self) -> Subspace {
        (0..self.n).map(|i| self.unit(i)).collect()
    }

    pub(super) fn span(&self, vectors: Vec<Vector>) -> Subspace {
        span_of(vectors, self.n)
    }

    /// {x : <x, u> = 0 for u in the rows}.
    pub(super) fn solutions(&self, rows: Vec<Vector>) -> Subspace {
        if rows.is_empty() {
            return self.whole();
        }
        nullspace(&Rationals, &Matrix::from_rows(rows, self.n))
    }

    pub(super) fn intersect(&self, u: &Subspace, w: &Subspace) -> Subspace {
        let mut rows = self.solutions(u.clone());
        rows.extend(self.solutions(w.clone()));
        self.solutions(rows)
    }

    pub(super) fn contains(&self, s: &Subspace, v: &[Q]) -> bool {
        express(FieldSpec::Rational, s, v).is_some()
    }

    pub(super) fn equal(&self, u: &Subspace, w: &Subspace) -> bool {
        u.len() == w.len() && w.iter().all(|v| self.contains(u, v))
    }

    /// [S, T] as a subspace.
    pub(super) fn product(&self, s: &Subspace, t: &Subspace) -> Subspace {
        let mut v = Vec::new();
        for a in s {
            for b in t {
                v.push(self.bracket(a, b));
            }
        }
        self.span(v)
    }

    /// The centraliser of S modulo T, {x : [x, s] in T for s in S} (T = 0: the
    /// centraliser).
    pub(super) fn centraliser_modulo(&self, s: &Subspace, t: &Subspace) -> Subspace {
        // the functionals vanishing on T
        let perp = self.solutions(t.clone());
        let mut rows = Vec::new();
        for b in s {
            let cols: Vec<Vector> = (0..self.n)
                .map(|j| self.bracket(&self.unit(j), b))
                .collect();
            for p in &perp {
                rows.push(
                    cols.iter()
                        .map(|c| c.iter().zip(p).map(|(a, b)| a * b).sum())
                        .collect(),
                );
            }
        }
        self.solutions(rows)
    }

    /// The lower central series A = A^1, A^2 = [A, A], ..., down to its last term.
    pub(super) fn lower_central(&self) -> Vec<Subspace> {
        let whole = self.whole();
        let mut terms = vec![whole.clone()];
        loop {
            let next = self.product(&whole, terms.last().expect("nonempty"));
            let stop = next.len() == terms.last().map_or(0, |t| t.len());
            terms.push(next);
            if stop || terms.last().is_some_and(|t| t.is_empty()) {
                return terms;
            }
        }
    }

    /// The upper central series 0 = Z_0, Z_1 (the centre), Z_{k+1} = {x : [x, A] in Z_k}.
    pub(super) fn upper_central(&self) -> Vec<Subspace> {
        let mut terms: Vec<Subspace> = vec![Vec::new()];
        loop {
            let perp = self.solutions(terms.last().expect("nonempty").clone());
            let mut rows = Vec::new();
            for j in 0..self.n {
                let cols: Vec<Vector> = (0..self.n)
                    .map(|i| self.bracket(&self.unit(i), &self.unit(j)))
                    .collect();
                for p in &perp {
                    rows.push(
                        cols.iter()
                            .map(|c| c.iter().zip(p).map(|(a, b)| a * b).sum())
                            .collect(),
                    );
                }
            }
            let next = self.solutions(rows);
            let stop = next.len() == terms.last().map_or(0, |t| t.len());
            terms.push(next);
            if stop || terms.last().is_some_and(|t| t.len() == self.n) {
                return terms;
            }
        }
    }

    /// The characteristic subspaces used to place the generators (module documentation),
    /// built by the same sequence of operations in every algebra; equal members are kept
    /// once (equality is invariant, so both algebras keep the same positions).
    pub(super) fn characteristic_family(&self) -> Vec<Subspace> {
        let mut base = self.lower_central();
        base.extend(self.upper_central());
        base.extend(super::derivations::derivation_subspaces(self).unwrap_or_default());
        // the centralisers of the members modulo each term of the lower central series,
        // {x : [x, S] ⊆ L^k} (the plain centraliser for the last term, 0)
        let lower = self.lower_central();
        let mut cents: Vec<Subspace> = Vec::new();
        for s in &base {
            for t in &lower[1..] {
                cents.push(self.centraliser_modulo(s, t));
            }
        }
        base.extend(cents);
        let mut family: Vec<Subspace> = Vec::new();
        let add = |s: Subspace, family: &mut Vec<Subspace>| {
            if !family.iter().any(|f| self.equal(f, &s)) {
                family.push(s);
            }
        };
        for s in &base {
            add(s.clone(), &mut family);
        }
        let first = family.clone();
        for (i, a) in first.iter().enumerate() {
            for b in &first[i + 1..] {
                add(self.intersect(a, b), &mut family);
            }
        }
        family
    }
}
