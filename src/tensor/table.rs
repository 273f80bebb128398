//! The structure constants of a tensor mapped into a field context: the form the generic
//! kernels (laws, invariants, search) compute with.

use super::Tensor;
use crate::scalar::Field;

/// Sparse structure constants over a field's element type.
/// Invariant: `products[i * dims[1] + j]` lists nonzero `(k, c)` sorted by k.
#[derive(Clone, Debug, PartialEq)]
pub struct Table<E> {
    pub dims: [usize; 3],
    pub products: Vec<Vec<(usize, E)>>,
}

impl<E: Clone> Table<E> {
    /// Map a tensor's coefficients into `f`. Panics if a coefficient has no image (the
    /// tensor's own field always works).
    pub fn from_tensor<F: Field<Elem = E>>(t: &Tensor, f: &F) -> Self {
        let dims = t.dims();
        let mut products = vec![Vec::new(); dims[0] * dims[1]];
        for (i, j, k, v) in t.entries() {
            let e = f
                .from_rational(v)
                .expect("coefficient has an image in the field");
            if !f.is_zero(&e) {
                products[i * dims[1] + j].push((k, e));
            }
        }
        Table { dims, products }
    }

    /// The product of basis vectors `i * j`.
    pub fn product(&self, i: usize, j: usize) -> &[(usize, E)] {
        &self.products[i * self.dims[1] + j]
    }

    /// `x * y` for coordinate vectors. Cost: O(|supp x| |supp y| + nnz touched).
    pub fn mul<F: Field<Elem = E>>(&self, f: &F, x: &[E], y: &[E]) -> Vec<E> {
        let mut out = vec![f.zero(); self.dims[2]];
        for (i, xi) in x.iter().enumerate() {
            if f.is_zero(xi) {
                continue;
            }
            for (j, yj) in y.iter().enumerate() {
                if f.is_zero(yj) {
                    continue;
                }
                let s = f.mul(xi, yj);
                for (k, c) in self.product(i, j) {
                    f.add_mul_assign(&mut out[*k], &s, c);
                }
            }
        }
        out
    }

    /// `e_i * y` for a basis vector on the left.
    pub fn mul_basis_left<F: Field<Elem = E>>(&self, f: &F, i: usize, y: &[E]) -> Vec<E> {
        let mut out = vec![f.zero(); self.dims[2]];
        for (j, yj) in y.iter().enumerate() {
            if f.is_zero(yj) {
                continue;
            }
            for (k, c) in self.product(i, j) {
                f.add_mul_assign(&mut out[*k], yj, c);
            }
        }
        out
    }

    /// `x * e_j` for a basis vector on the right.
    pub fn mul_basis_right<F: Field<Elem = E>>(&self, f: &F, x: &[E], j: usize) -> Vec<E> {
        let mut out = vec![f.zero(); self.dims[2]];
        for (i, xi) in x.iter().enumerate() {
            if f.is_zero(xi) {
                continue;
            }
            for (k, c) in self.product(i, j) {
                f.add_mul_assign(&mut out[*k], xi, c);
            }
        }
        out
    }

    /// The basis vector `e_i` of length n.
    pub fn unit_vector<F: Field<Elem = E>>(f: &F, n: usize, i: usize) -> Vec<E> {
        let mut v = vec![f.zero(); n];
        v[i] = f.one();
        v
    }
}
