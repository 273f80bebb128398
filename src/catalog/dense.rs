//! A dense copy of an algebra's structure constants with the exact helpers the fingerprint
//! needs: products of coordinate vectors, associators, subspace products and ranks.
//!
//! Coefficients are kept as rationals. Over GF(p) they are integer representatives and every
//! vector that is fed back into further products is reduced into `0..p` first, so all
//! results are exact in the tensor's field. Invariant: `c.len() == n^3`.

use crate::linalg::{Matrix, rref};
use crate::scalar::{Field, FieldSpec, Q};
use crate::tensor::{Tensor, rank_over};
use num_traits::Zero;

/// Dense structure constants of an algebra of dimension `n`:
/// `c[(i * n + j) * n + k]` = coefficient of `e_k` in `e_i e_j`.
pub struct Dense {
    pub field: FieldSpec,
    pub n: usize,
    pub c: Vec<Q>,
    /// The sparse products `e_i e_j` (nonzero `(k, c)`), copied from the tensor.
    pub prods: Vec<Vec<(usize, Q)>>,
}

impl Dense {
    /// The dense form of a square tensor (an algebra, or a map with three equal dimensions
    /// read as an algebra). Cost: O(n^3).
    pub fn new(t: &Tensor) -> Dense {
        let n = t.dims()[0];
        let mut c = vec![Q::zero(); n * n * n];
        for (i, j, k, v) in t.entries() {
            c[(i * n + j) * n + k] = v.clone();
        }
        let prods = (0..n * n)
            .map(|ij| t.product(ij / n, ij % n).to_vec())
            .collect();
        Dense {
            field: t.field(),
            n,
            c,
            prods,
        }
    }

    /// The dense form of the algebra with its product multiplied by the least common
    /// denominator of the coefficients (over Q), so that all constants are integers. The
    /// scaled algebra is isomorphic to the original (x -> l x maps one onto the other), so
    /// every isomorphism invariant is unchanged, and integer arithmetic is much cheaper.
    pub fn new_integral(t: &Tensor) -> Dense {
        let mut d = Dense::new(t);
        if d.field != FieldSpec::Rational {
            return d;
        }
        let mut l = num_bigint::BigInt::from(1);
        for x in &d.c {
            if !x.is_integer() {
                l = num_integer::Integer::lcm(&l, x.denom());
            }
        }
        if l != num_bigint::BigInt::from(1) {
            let lq = Q::from_integer(l);
            for x in d.c.iter_mut() {
                *x *= &lq;
            }
            for row in d.prods.iter_mut() {
                for (_, x) in row.iter_mut() {
                    *x *= &lq;
                }
            }
        }
        d
    }

    /// The coefficient of `e_k` in `e_i e_j`.
    pub fn at(&self, i: usize, j: usize, k: usize) -> &Q {
        &self.c[(i * self.n + j) * self.n + k]
    }

    /// True if `q` is zero in the field.
    pub fn is_zero(&self, q: &Q) -> bool {
        match self.field {
            FieldSpec::Rational => q.is_zero(),
            FieldSpec::Prime(p) => {
                let f = crate::scalar::PrimeField::new(p).expect("a prime field");
                f.from_rational(q).is_none_or(|x| x == 0)
            }
        }
    }

    /// True if every coordinate of `v` is zero in the field.
    pub fn is_zero_vec(&self, v: &[Q]) -> bool {
        v.iter().all(|x| self.is_zero(x))
    }

    /// Reduce a vector into the field's representatives (identity over Q).
    pub fn reduce(&self, v: Vec<Q>) -> Vec<Q> {
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

    /// `x * y` for coordinate vectors, reduced into the field. Cost: O(|x| |y| n).
    pub fn mul(&self, x: &[Q], y: &[Q]) -> Vec<Q> {
        let n = self.n;
        let mut out = vec![Q::zero(); n];
        for (i, xi) in x.iter().enumerate().filter(|(_, v)| !v.is_zero()) {
            for (j, yj) in y.iter().enumerate().filter(|(_, v)| !v.is_zero()) {
                let s = xi * yj;
                for (k, c) in &self.prods[i * n + j] {
                    out[k.to_owned()] += &s * c;
                }
            }
        }
        self.reduce(out)
    }

    /// `e_i e_j` as a dense vector.
    pub fn basis_product(&self, i: usize, j: usize) -> Vec<Q> {
        let n = self.n;
        self.c[(i * n + j) * n..(i * n + j + 1) * n].to_vec()
    }

    /// `(e_a e_b) v` where `v` is sparse: the product of the basis product with `e_c`.
    fn prod_then(&self, ab: &[(usize, Q)], c: usize, left: bool) -> Vec<Q> {
        let n = self.n;
        let mut out = vec![Q::zero(); n];
        for (m, x) in ab {
            let row = if left {
                &self.prods[m * n + c]
            } else {
                &self.prods[c * n + m]
            };
            for (k, y) in row {
                out[*k] += x * y;
            }
        }
        out
    }

    /// All associators `(e_a, e_b, e_c) = (e_a e_b) e_c - e_a (e_b e_c)`, indexed
    /// `(a * n + b) * n + c`, reduced into the field. Cost: O(n^3 * nnz-per-product^2).
    pub fn associators(&self) -> Vec<Vec<Q>> {
        let n = self.n;
        let mut out = Vec::with_capacity(n * n * n);
        for a in 0..n {
            for b in 0..n {
                for c in 0..n {
                    let l = self.prod_then(&self.prods[a * n + b], c, true);
                    let r = self.prod_then(&self.prods[b * n + c], a, false);
                    out.push(self.reduce(l.into_iter().zip(r).map(|(x, y)| x - y).collect()));
                }
            }
        }
        out
    }

    /// The rank over the field of the matrix with the given rows of length `cols`.
    pub fn rank_rows(&self, rows: Vec<Vec<Q>>, cols: usize) -> usize {
        if rows.is_empty() || cols == 0 {
            return 0;
        }
        let r = rows.len();
        let m = Matrix {
            rows: r,
            cols,
            data: rows.into_iter().flatten().collect(),
        };
        rank_over(self.field, &m)
    }

    /// A basis (reduced rows) of the span of `vectors` over the field. Cost: one elimination.
    pub fn span_basis(&self, vectors: &[Vec<Q>]) -> Vec<Vec<Q>> {
        if vectors.is_empty() {
            return Vec::new();
        }
        let n = vectors[0].len();
        crate::with_field!(self.field, f => {
            let data = vectors.iter().flatten().map(|x| f.from_rational(x).expect("in field")).collect();
            let mut m = Matrix { rows: vectors.len(), cols: n, data };
            let piv = rref(f, &mut m);
            (0..piv.len()).map(|i| m.row(i).iter().map(|x| f.to_rational(x)).collect()).collect()
        })
    }

    /// A basis of the span of all products `u v` (u in U, v in V) for subspaces given by
    /// bases. Cost: O(|U| |V| n^2) plus one elimination.
    pub fn product_space(&self, u: &[Vec<Q>], v: &[Vec<Q>]) -> Vec<Vec<Q>> {
        let mut prods = Vec::new();
        for x in u {
            for y in v {
                let p = self.mul(x, y);
                if !self.is_zero_vec(&p) {
                    prods.push(p);
                }
            }
        }
        self.span_basis(&prods)
    }

    /// The standard basis of the whole algebra.
    pub fn full_basis(&self) -> Vec<Vec<Q>> {
        (0..self.n)
            .map(|i| {
                (0..self.n)
                    .map(|j| {
                        if i == j {
                            Q::from_integer(1.into())
                        } else {
                            Q::zero()
                        }
                    })
                    .collect()
            })
            .collect()
    }
}
