//! The first simple module of a matrix product's frame ([`super::matrix_frame`]): which
//! kernels, sums and intersections of kernels cut it out for a format `<n,m,p>`, and that
//! module computed exactly for a tensor.
//!
//! For `T(A, B) = A B` and a seeded random `B_t` (m x p, p < m, of rank p), the kernel
//! `{A : A B_t = 0}` is `F^n (x) Y_t`: the matrices whose rows lie in `Y_t`, the left null
//! space of `B_t`, a random subspace of `F^m` of dimension `m - p`. Kernels, their sums
//! and their intersections are again of the form `F^n (x) Y` with `Y` the sum or the
//! intersection of the `Y`s (both are linear in the rows). A word in them whose `Y` has
//! dimension 1 gives `{x y0^T}`, the simple module.
//!
//! Dimensions: random subspaces drawn independently are in general position, so a sum
//! has dimension `min(m, a + b)` and an intersection `max(0, a + b - m)` (Harris 1992,
//! Algebraic Geometry: A First Course, general position of linear spaces; from memory; common
//! practice).
//! Starting from `m - p`, these reach exactly the multiples of `gcd(m, p)`, so a word for
//! dimension 1 exists if and only if `gcd(m, p) = 1` and `p < m`. The common kernel of k
//! vectors (an intersection of k kernels, in one system) has dimension `m - k p`; when
//! `m = s p + 1` the plan is that one system.
//!
//! The plan only predicts: the caller checks the dimension of what it computes (a draw
//! that is not in general position, or a tensor that is not a matrix product, gives
//! another dimension and is refused) and verifies the whole frame exactly.

use crate::linalg::nullspace::SolveParams;
use crate::linalg::subspace::{Subspace, intersect, kernel, sum};
use crate::scalar::Field;
use crate::tensor::Tensor;
use rand::Rng;

/// A word in kernels of random vectors: what [`plan_module`] returns.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ModuleWord {
    /// The common kernel `{u : T(u, v_t) = 0}` of this many fresh random `v_t`.
    Kernel(usize),
    /// The intersection of the two modules.
    Meet(Box<ModuleWord>, Box<ModuleWord>),
    /// The sum of the two modules.
    Join(Box<ModuleWord>, Box<ModuleWord>),
}

impl ModuleWord {
    /// The number of random vectors the word draws.
    pub fn leaves(&self) -> usize {
        match self {
            ModuleWord::Kernel(k) => *k,
            ModuleWord::Meet(x, y) | ModuleWord::Join(x, y) => x.leaves() + y.leaves(),
        }
    }

    /// The dimension of `Y` predicted for subspaces in general position, in `F^m` with
    /// kernels of rows in `m - p` dimensions.
    pub fn dimension(&self, m: usize, p: usize) -> usize {
        match self {
            ModuleWord::Kernel(k) => m.saturating_sub(k * p),
            ModuleWord::Meet(x, y) => (x.dimension(m, p) + y.dimension(m, p)).saturating_sub(m),
            ModuleWord::Join(x, y) => (x.dimension(m, p) + y.dimension(m, p)).min(m),
        }
    }
}

/// The word with the fewest random vectors whose `Y` has dimension 1 (the simple module
/// `{x y0^T}`), for the sides m (the columns of A) and p (the columns of B); `None` when
/// no word reaches it (`gcd(m, p) > 1` or `p >= m`). Among words with equally many
/// vectors, one common kernel is preferred. Cost: `O(m^3)` steps on word sizes.
pub fn plan_module(m: usize, p: usize) -> Option<ModuleWord> {
    if p == 0 || p >= m {
        return None;
    }
    // best[y] = (vectors drawn, word) for the dimension y of Y, 1 <= y < m
    let mut best: Vec<Option<(usize, ModuleWord)>> = vec![None; m];
    for k in 1..=m {
        if k * p < m {
            best[m - k * p] = Some((k, ModuleWord::Kernel(k)));
        }
    }
    loop {
        let mut changed = false;
        for x in 1..m {
            for y in 1..m {
                let (Some((cx, wx)), Some((cy, wy))) = (best[x].clone(), best[y].clone()) else {
                    continue;
                };
                let cost = cx + cy;
                let mut offer = |z: usize, word: ModuleWord| {
                    if best[z].as_ref().is_none_or(|(c, _)| cost < *c) {
                        best[z] = Some((cost, word));
                        changed = true;
                    }
                };
                if x + y > m {
                    offer(
                        x + y - m,
                        ModuleWord::Meet(Box::new(wx.clone()), Box::new(wy.clone())),
                    );
                }
                if x + y < m {
                    offer(x + y, ModuleWord::Join(Box::new(wx), Box::new(wy)));
                }
            }
        }
        if !changed {
            break;
        }
    }
    best[1].take().map(|(_, w)| w)
}

/// A seeded random vector: entries in -3..3 over Q, uniform over a small prime field.
fn random_vector<F: Field>(f: &F, len: usize, rng: &mut impl Rng) -> Vec<F::Elem> {
    let q = f.characteristic();
    (0..len)
        .map(|_| match q {
            // over GF(q) uniform, so that each condition of general position fails with
            // probability about 1 / q only
            2..=1_000_000 => f.from_i64(rng.gen_range(0..q as i64)),
            _ => f.from_i64(rng.gen_range(-3..=3)),
        })
        .collect()
}

/// The bilinear map of `t` over the field context, as its nonzero coefficients.
pub(crate) type Coefficients<E> = Vec<(usize, usize, usize, E)>;

pub(crate) fn coefficients<F: Field>(f: &F, t: &Tensor) -> Option<Coefficients<F::Elem>> {
    t.entries()
        .map(|(i, j, k, v)| Some((i, j, k, f.from_rational(v)?)))
        .collect()
}

/// The common kernel `{x : T(x, y_t) = 0 for every given y_t}`. Cost: a kernel of
/// `c * given.len()` equations in a unknowns.
fn common_kernel<F: Field>(
    f: &F,
    c: &Coefficients<F::Elem>,
    dims: [usize; 3],
    given: &[Vec<F::Elem>],
    sp: &SolveParams,
) -> Option<Subspace<F::Elem>> {
    let mut rows = vec![vec![f.zero(); dims[0]]; given.len() * dims[2]];
    for (t, y) in given.iter().enumerate() {
        for (i, j, k, v) in c {
            if !f.is_zero(&y[*j]) {
                f.add_mul_assign(&mut rows[t * dims[2] + k][*i], v, &y[*j]);
            }
        }
    }
    kernel(f, &rows, dims[0], sp).ok()
}

/// The module of a word ([`ModuleWord`]) of kernels `{u : T(u, v) = 0}` of fresh seeded
/// random v (drawn in the order the word lists them), for the tensor with coefficients
/// `coef` and dimensions `dims`. Cost: one kernel per [`ModuleWord::Kernel`], one
/// intersection or sum per other node.
pub(crate) fn module_of<F: Field>(
    f: &F,
    coef: &Coefficients<F::Elem>,
    dims: [usize; 3],
    word: &ModuleWord,
    sp: &SolveParams,
    rng: &mut impl Rng,
) -> Option<Subspace<F::Elem>> {
    match word {
        ModuleWord::Kernel(k) => {
            let vs: Vec<_> = (0..*k).map(|_| random_vector(f, dims[1], rng)).collect();
            common_kernel(f, coef, dims, &vs, sp)
        }
        ModuleWord::Meet(x, y) => {
            let (x, y) = (
                module_of(f, coef, dims, x, sp, rng)?,
                module_of(f, coef, dims, y, sp, rng)?,
            );
            intersect(f, &x, &y, sp).ok()
        }
        ModuleWord::Join(x, y) => {
            let (x, y) = (
                module_of(f, coef, dims, x, sp, rng)?,
                module_of(f, coef, dims, y, sp, rng)?,
            );
            sum(f, &x, &y, sp).ok()
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn gcd(a: usize, b: usize) -> usize {
        if b == 0 { a } else { gcd(b, a % b) }
    }

    #[test]
    fn plans_exist_exactly_for_coprime_sides() {
        for m in 1..=12 {
            for p in 1..=12 {
                let plan = plan_module(m, p);
                assert_eq!(plan.is_some(), p < m && gcd(m, p) == 1, "m {m} p {p}");
                if let Some(w) = plan {
                    assert_eq!(w.dimension(m, p), 1, "m {m} p {p}: {w:?}");
                }
            }
        }
    }

    #[test]
    fn one_common_kernel_when_m_is_s_p_plus_one() {
        assert_eq!(plan_module(3, 2), Some(ModuleWord::Kernel(1)));
        assert_eq!(plan_module(5, 2), Some(ModuleWord::Kernel(2)));
        assert_eq!(plan_module(4, 1), Some(ModuleWord::Kernel(3)));
        // 5 = 3 + 2: (Y1 + Y2) meets Y3, dimensions 2 + 2 = 4, then 4 + 2 - 5 = 1
        let w = plan_module(5, 3).unwrap();
        assert_eq!(w.leaves(), 3);
        assert!(matches!(w, ModuleWord::Meet(..)));
    }
}
