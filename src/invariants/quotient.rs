//! Quotients `A / I` of an algebra by an ideal, over the algebra's own field.
//!
//! Convention: with the basis of I in reduced echelon form (pivot columns P), the quotient
//! has the basis of the images of the `e_s` for s outside P, in increasing order. The image
//! of a vector x is x minus the combination of ideal rows that clears its pivot entries,
//! read at the kept coordinates ([`QuotientMap::project`]); [`QuotientMap::lift`] puts
//! quotient coordinates back at the kept positions (a linear section of the projection,
//! not an algebra map). The caller guarantees that I is an ideal; the structure constants
//! of the quotient are then well defined.
//!
//! Cost: one Gauss-Jordan elimination of the ideal basis, then for each of the
//! `(n - dim I)^2` products one reduction (O(dim I * n)).

use crate::linalg::{Matrix, rref};
use crate::scalar::{Field, Q};
use crate::tensor::Tensor;

/// The projection onto `A / I` and its section (see the module documentation).
#[derive(Clone, Debug)]
pub struct QuotientMap<E> {
    pub n: usize,
    /// The ideal's basis in reduced echelon form, one row per pivot.
    pub rows: Vec<Vec<E>>,
    pub pivots: Vec<usize>,
    /// The kept coordinates: the basis of the quotient.
    pub keep: Vec<usize>,
}

impl<E: Clone> QuotientMap<E> {
    /// The map for the ideal spanned by `ideal` (vectors of length n).
    pub fn new<F: Field<Elem = E>>(f: &F, n: usize, ideal: &[Vec<E>]) -> Self {
        let mut m = Matrix::from_rows(ideal.to_vec(), n);
        let pivots = rref(f, &mut m);
        let rows: Vec<Vec<E>> = (0..pivots.len()).map(|i| m.row(i).to_vec()).collect();
        let mut is_p = vec![false; n];
        for &p in &pivots {
            is_p[p] = true;
        }
        let keep = (0..n).filter(|&c| !is_p[c]).collect();
        QuotientMap {
            n,
            rows,
            pivots,
            keep,
        }
    }

    /// The dimension of the quotient.
    pub fn dim(&self) -> usize {
        self.keep.len()
    }

    /// The image of x in `A / I`, in the quotient's coordinates.
    pub fn project<F: Field<Elem = E>>(&self, f: &F, x: &[E]) -> Vec<E> {
        let mut w = x.to_vec();
        for (row, &p) in self.rows.iter().zip(&self.pivots) {
            if f.is_zero(&w[p]) {
                continue;
            }
            let c = w[p].clone();
            for (a, b) in w.iter_mut().zip(row) {
                if !f.is_zero(b) {
                    f.sub_mul_assign(a, &c, b);
                }
            }
        }
        self.keep.iter().map(|&s| w[s].clone()).collect()
    }

    /// A preimage of quotient coordinates y: y at the kept positions, 0 elsewhere.
    pub fn lift<F: Field<Elem = E>>(&self, f: &F, y: &[E]) -> Vec<E> {
        let mut x = vec![f.zero(); self.n];
        for (v, &s) in y.iter().zip(&self.keep) {
            x[s] = v.clone();
        }
        x
    }
}

/// The quotient algebra `A / I` for an ideal I with the given basis (rationals, or
/// representatives over GF(p)); basis names are those of the kept basis vectors.
pub fn quotient(t: &Tensor, ideal: &[Vec<Q>]) -> Tensor {
    crate::with_field!(t.field(), f => {
        let rows: Vec<Vec<_>> = ideal
            .iter()
            .map(|v| v.iter().map(|x| f.from_rational(x).expect("in the field")).collect())
            .collect();
        quotient_in(f, t, &QuotientMap::new(f, t.dim(), &rows))
    })
}

/// The quotient algebra for a prepared [`QuotientMap`], in the field context f.
pub fn quotient_in<F: Field>(f: &F, t: &Tensor, q: &QuotientMap<F::Elem>) -> Tensor {
    let n = t.dim();
    let tab = t.table(f);
    let names: Vec<String> = q.keep.iter().map(|&s| t.name(0, s).to_string()).collect();
    let mut out = Tensor::algebra(t.field(), names);
    for (a, &i) in q.keep.iter().enumerate() {
        for (b, &j) in q.keep.iter().enumerate() {
            let mut w = vec![f.zero(); n];
            for (k, c) in tab.product(i, j) {
                w[*k] = c.clone();
            }
            let row: Vec<(usize, Q)> = q
                .project(f, &w)
                .iter()
                .enumerate()
                .filter(|(_, c)| !f.is_zero(c))
                .map(|(c, x)| (c, f.to_rational(x)))
                .collect();
            out.set_product(a, b, row);
        }
    }
    out
}
