//! Characteristic subspaces from the derivation algebra. Let N be the kernel of the trace
//! form `tr(ab)` on Der(L) (for a Lie algebra of matrices in characteristic 0 it holds
//! the nilpotent ideal that the split torus of Der(L) does not see). An isomorphism
//! g: L -> L' conjugates Der(L) onto Der(L') and keeps traces, so it maps N onto N', and
//! the subspaces `D L`, `N L ⊇ N(N L) ⊇ ...` and the kernels `ker N ⊆ ...` of L onto
//! those of L'. They see what the series and centralisers miss: in L_{5,8}
//! ([x1,x2] = x4, [x1,x3] = x5) the span of x2, x3 and L^2 is `N L`.

use super::space::{Lie, span_of};
use super::{Subspace, Vector};
use crate::invariants::maps::to_matrix;
use crate::invariants::{SolveParams, derivations};
use crate::linalg::{Matrix, nullspace};
use crate::scalar::{Q, Rationals};
use crate::tensor::IntegralTensor;
use num_traits::Zero;

fn matrix(v: &[Q], n: usize) -> Matrix<Q> {
    to_matrix(v, n, 0)
}

/// The subspaces `D L` (the span of the images of the derivations), `N^k L` and
/// `ker N^k` (module documentation), in a fixed order; `None` when the derivations cannot
/// be computed within the engine's limits. Cost: Der(L) by the shared engine, then the
/// trace form (O(n^2) per pair of derivations).
pub(super) fn derivation_subspaces(lie: &Lie) -> Option<Vec<Subspace>> {
    let n = lie.n;
    let space = derivations(&IntegralTensor::from_tensor(lie.t), &SolveParams::default()).ok()?;
    let gens: Vec<Matrix<Q>> = (0..space.dim())
        .map(|i| matrix(&space.dense(i), n))
        .collect();
    // N: the kernel of the trace form tr(ab) on Der(L), tr(ab) = sum_ij a_ij b_ji
    let m = gens.len();
    let form: Vec<Vector> = (0..m)
        .map(|i| {
            (0..m)
                .map(|j| {
                    let (a, b) = (&gens[i].data, &gens[j].data);
                    let mut t = Q::zero();
                    for r in 0..n {
                        for c in 0..n {
                            if !a[r * n + c].is_zero() && !b[c * n + r].is_zero() {
                                t += &a[r * n + c] * &b[c * n + r];
                            }
                        }
                    }
                    t
                })
                .collect()
        })
        .collect();
    let radical: Vec<Matrix<Q>> = if m == 0 {
        Vec::new()
    } else {
        nullspace(&Rationals, &Matrix::from_rows(form, m))
            .iter()
            .map(|c| {
                let mut d = vec![Q::zero(); n * n];
                for (x, b) in c.iter().zip(&gens) {
                    if !x.is_zero() {
                        for (o, y) in d.iter_mut().zip(&b.data) {
                            *o += x * y;
                        }
                    }
                }
                matrix(&d, n)
            })
            .collect()
    };
    let image = |maps: &[Matrix<Q>], s: &Subspace| -> Subspace {
        let v: Vec<Vector> = maps
            .iter()
            .flat_map(|a| s.iter().map(move |x| a.mul_vec(&Rationals, x)))
            .collect();
        span_of(v, n)
    };
    let mut out = vec![image(&gens, &lie.whole())];
    let mut power = lie.whole();
    while !power.is_empty() {
        power = image(&radical, &power);
        out.push(power.clone());
    }
    // ker N^(k+1) = {v : N v ⊆ ker N^k}
    let mut kernel: Subspace = Vec::new();
    loop {
        let perp = lie.solutions(kernel.clone());
        let rows: Vec<Vector> = radical
            .iter()
            .flat_map(|a| {
                perp.iter()
                    .map(|p| {
                        (0..n)
                            .map(|j| (0..n).map(|i| &p[i] * &a.data[i * n + j]).sum())
                            .collect::<Vector>()
                    })
                    .collect::<Vec<_>>()
            })
            .collect();
        let next = lie.solutions(rows);
        let done = next.len() == kernel.len() || next.len() == n;
        out.push(next.clone());
        kernel = next;
        if done {
            return Some(out);
        }
    }
}
