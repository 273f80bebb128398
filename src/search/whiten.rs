//! Whitening before a numerical fit: a tensor whose flattenings are far from orthonormal
//! (written in a basis of the user's own, or planted factors scrambled by a change of
//! basis) is fitted in coordinates where each flattening has orthonormal rows, and the
//! fit's factors are mapped back to the tensor's own coordinates.
//!
//! Invariant: factors of a decomposition of [`Whitened::work`] become, through
//! [`Whitened::map_back`], factors of one of the tensor (both in the units of their
//! [`Dense`]); nothing here is exact, the caller's exact check confirms.

use super::numeric::{Dense, Factors};
use nalgebra::DMatrix;

/// A tensor in whitened coordinates and the way back.
pub struct Whitened {
    /// The tensor in whitened coordinates.
    pub work: Dense,
    /// Per axis, the matrix `B_a` that maps a factor in whitened coordinates back to the
    /// tensor's own (the result axis scaled to the units of the original [`Dense`]).
    back: [DMatrix<f64>; 3],
}

impl Whitened {
    /// Replace each factor matrix `F'_a` of a fit of [`Self::work`] by `B_a F'_a`.
    /// Cost: O(d_a^2 r) per axis.
    pub fn map_back(&self, fitted: &mut Factors) {
        for (f, b) in fitted.f.iter_mut().zip(&self.back) {
            *f = b * &*f;
        }
    }
}

/// Flattenings whose singular values spread by more than this factor are whitened
/// before a fit ([`precondition`]).
const WHITEN_ABOVE: f64 = 100.0;

/// The tensor in whitened coordinates and the way back ([`Whitened`]): with the
/// flattening along axis a written `U_a S_a V_a^T`, the coordinates are `S_a^-1 U_a^T x`,
/// in which every flattening has orthonormal rows (Tucker's compression, common practice). A fit of a
/// tensor in a basis of the user's own, whose factors are far from orthogonal, converges
/// far more often there. `None` when every flattening is within [`WHITEN_ABOVE`] of
/// orthonormal or one is singular. Cost: three SVDs of `d_a x (d_b d_c)` matrices and
/// O(d0 d1 d2 (d0 + d1 + d2)) for the change of coordinates.
pub fn precondition(t: &Dense) -> Option<Whitened> {
    let d = t.dims;
    let at = |i: usize, j: usize, k: usize| t.data[(i * d[1] + j) * d[2] + k];
    let mut forward = Vec::with_capacity(3);
    let mut back = Vec::with_capacity(3);
    let mut spread = 1.0f64;
    for axis in 0..3 {
        let (b, c) = match axis {
            0 => (1, 2),
            1 => (0, 2),
            _ => (0, 1),
        };
        let m = DMatrix::from_fn(d[axis], d[b] * d[c], |x, y| {
            let (p, q) = (y / d[c], y % d[c]);
            match axis {
                0 => at(x, p, q),
                1 => at(p, x, q),
                _ => at(p, q, x),
            }
        });
        let svd = m.svd(true, false);
        let u = svd.u?;
        let sv = &svd.singular_values;
        let (hi, lo) = (sv.max(), sv.min());
        // singular (or NaN): no whitening
        if lo.partial_cmp(&(hi * 1e-12)) != Some(std::cmp::Ordering::Greater) {
            return None;
        }
        spread = spread.max(hi / lo);
        let inv = DMatrix::from_diagonal(&sv.map(|x| 1.0 / x));
        forward.push(inv * u.transpose());
        back.push(u * DMatrix::from_diagonal(sv));
    }
    if spread <= WHITEN_ABOVE {
        return None;
    }
    // T' = T x_0 W_0 x_1 W_1 x_2 W_2, one axis at a time
    let mut data = t.data.clone();
    for axis in 0..3 {
        let w = &forward[axis];
        let mut next = vec![0.0; data.len()];
        for i in 0..d[0] {
            for j in 0..d[1] {
                for k in 0..d[2] {
                    let x = data[(i * d[1] + j) * d[2] + k];
                    if x == 0.0 {
                        continue;
                    }
                    let idx = [i, j, k];
                    for a in 0..d[axis] {
                        let mut to = idx;
                        to[axis] = a;
                        next[(to[0] * d[1] + to[1]) * d[2] + to[2]] += w[(a, idx[axis])] * x;
                    }
                }
            }
        }
        data = next;
    }
    let big = data.iter().fold(0.0f64, |m, x| m.max(x.abs()));
    if big == 0.0 || !big.is_finite() {
        return None;
    }
    data.iter_mut().for_each(|x| *x /= big);
    let entries = (0..data.len())
        .filter(|&n| data[n] != 0.0)
        .map(|n| ([n / (d[1] * d[2]), (n / d[2]) % d[1], n % d[2]], data[n]))
        .collect();
    let norm = data.iter().map(|x| x * x).sum::<f64>().sqrt().max(1e-300);
    // the fit approximates T' / big: its factors map back to T / t.scale with the
    // result factors scaled by big
    back[2] *= big;
    let back: [DMatrix<f64>; 3] = back.try_into().ok()?;
    let work = Dense {
        dims: d,
        data,
        entries,
        norm,
        scale: t.scale * big,
    };
    Some(Whitened { work, back })
}
