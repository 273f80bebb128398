//! Bilinear algorithms (schemes) for a structure tensor.
//!
//! A scheme of rank r is r rank-one terms `u_t (x) v_t (x) w_t` with
//! `sum_t u_t[i] v_t[j] w_t[k] = c[i][j][k]` for all (i, j, k) (the Brent equations).
//! Read as an algorithm: `m_t = (sum_i u_t[i] a_i)(sum_j v_t[j] b_j)`,
//! `c_k = sum_t w_t[k] m_t`.
//!
//! Invariants: every factor vector has the length of its axis; over GF(p) the entries are
//! integers in `0..p`.

mod verify;

pub use verify::{Mismatch, verify};

use crate::scalar::{FieldSpec, Q};

/// A bilinear algorithm: the three factor matrices, one row per multiplication.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Scheme {
    /// The field the coefficients live in.
    pub field: FieldSpec,
    /// Dimensions of the left, right and result spaces.
    pub dims: [usize; 3],
    /// `u[t]` has length `dims[0]`: the left linear form of multiplication t.
    pub u: Vec<Vec<Q>>,
    /// `v[t]` has length `dims[1]`.
    pub v: Vec<Vec<Q>>,
    /// `w[t]` has length `dims[2]`: where product t is added into the result.
    pub w: Vec<Vec<Q>>,
}

impl Scheme {
    /// The empty scheme (rank 0) for a shape.
    pub fn empty(field: FieldSpec, dims: [usize; 3]) -> Self {
        Scheme {
            field,
            dims,
            u: Vec::new(),
            v: Vec::new(),
            w: Vec::new(),
        }
    }

    /// The number of multiplications.
    pub fn rank(&self) -> usize {
        self.u.len()
    }

    /// Append a rank-one term.
    pub fn push(&mut self, u: Vec<Q>, v: Vec<Q>, w: Vec<Q>) {
        assert_eq!(u.len(), self.dims[0]);
        assert_eq!(v.len(), self.dims[1]);
        assert_eq!(w.len(), self.dims[2]);
        self.u.push(u);
        self.v.push(v);
        self.w.push(w);
    }

    /// The standard scheme: one multiplication per nonzero structure constant
    /// (`u = e_i`, `v = e_j`, `w = c[i][j][k] e_k`); for matrix multiplication this is the
    /// schoolbook algorithm.
    pub fn standard(t: &crate::tensor::Tensor) -> Self {
        use num_traits::{One, Zero};
        let d = t.dims();
        let mut s = Scheme::empty(t.field(), d);
        let unit = |n: usize, i: usize| {
            let mut e = vec![Q::zero(); n];
            e[i] = Q::one();
            e
        };
        for (i, j, k, c) in t.entries() {
            let mut w = vec![Q::zero(); d[2]];
            w[k] = c.clone();
            s.push(unit(d[0], i), unit(d[1], j), w);
        }
        s
    }
}
