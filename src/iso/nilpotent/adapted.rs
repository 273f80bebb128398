//! The input X in a basis adapted to its lower central series, with the coordinates of a
//! vector by layer (the layer-1 part of a generator image is its class modulo X^2).

use super::Vector;
use super::space::Lie;
use crate::linalg::Matrix;
use crate::linalg::modular::inverse_q;
use crate::scalar::{Q, Rationals};
use num_traits::Zero;

/// X in a basis adapted to its lower central series: `basis[j]` lies in X^layer[j] and
/// the vectors of layer >= k span X^k.
pub(super) struct Adapted {
    pub(super) basis: Vec<Vector>,
    pub(super) layer: Vec<usize>,
    /// Coordinates in `basis` of a vector: `inverse * v`.
    inverse: Matrix<Q>,
}

impl Adapted {
    pub(super) fn new(x: &Lie) -> Option<Adapted> {
        let terms = x.lower_central();
        let mut basis: Vec<Vector> = Vec::new();
        let mut layer = Vec::new();
        for (k, term) in terms.iter().enumerate().rev() {
            for v in term {
                if !x.contains(&basis, v) {
                    basis.push(v.clone());
                    layer.push(k + 1);
                }
            }
        }
        basis.reverse();
        layer.reverse();
        let m = Matrix {
            rows: x.n,
            cols: x.n,
            data: (0..x.n)
                .flat_map(|r| basis.iter().map(move |c| c[r].clone()))
                .collect(),
        };
        let inverse = inverse_q(&m)?;
        Some(Adapted {
            basis,
            layer,
            inverse,
        })
    }

    pub(super) fn coordinates(&self, v: &[Q]) -> Vector {
        self.inverse.mul_vec(&Rationals, v)
    }

    pub(super) fn vector(&self, c: &[Q]) -> Vector {
        let n = c.len();
        let mut v = vec![Q::zero(); n];
        for (x, b) in c.iter().zip(&self.basis) {
            if !x.is_zero() {
                for (o, y) in v.iter_mut().zip(b) {
                    *o += x * y;
                }
            }
        }
        v
    }

    /// The coordinates of layer `k` of a vector.
    pub(super) fn layer_part(&self, v: &[Q], k: usize) -> Vector {
        self.coordinates(v)
            .into_iter()
            .zip(&self.layer)
            .filter(|(_, l)| **l == k)
            .map(|(c, _)| c)
            .collect()
    }
}
