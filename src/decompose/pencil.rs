//! The pencil bound: an exact decomposition over Q that pairs the slices of a tensor.
//!
//! Two m x n slices A, B along one axis, with coefficient vectors z_A, z_B on that axis,
//! contribute `A (x) z_A + B (x) z_B`, a tensor of format m x n x 2 (the matrix pencil
//! `sA + tB`). Its rank can lie far below rank A + rank B: a pencil whose Kronecker
//! canonical form has only the rectangular blocks L_e (the generic m x n pencil with
//! m < n) has rank n, and the generic n x n pencil has rank n + 1 over Q when its
//! characteristic polynomial does not split into distinct rational factors (Ja'Ja' 1979,
//! "Optimal evaluation of pairs of bilinear forms", SIAM J. Comput. 8, from memory).
//!
//! Construction (m <= n, else on the transposes). Let n' = n when m < n and n' = n + 1
//! when m = n: the pencil is widened by a random integer column in both A and B, and the
//! extra coordinate dropped at the end (a decomposition of the wider pencil restricts to
//! one of the pencil). For n' distinct rational points l_k the m x n' matrix B - l_k A has
//! a nonzero kernel (m < n'); take w_k in it (a random integer combination of an exact
//! kernel basis). When W = [w_1 .. w_n'] is invertible, with x_k = A w_k and y_k the k-th
//! row of W^-1 (restricted to the first n coordinates):
//!
//! ```text
//! A = A W W^-1 = sum_k x_k y_k^T,    B = B W W^-1 = sum_k l_k x_k y_k^T,
//! A (x) z_A + B (x) z_B = sum_k x_k (x) y_k (x) (z_A + l_k z_B)        (n' terms)
//! ```
//!
//! This is evaluation at n' points and interpolation (Toom 1963): for a single block L_e
//! the kernel vectors are (1, l, ..., l^e). W is singular when the pencil has a regular
//! part that needs more terms; then one or two more random columns are tried, and the
//! pair keeps the rank-one split of its two slices when none gives fewer terms.
//!
//! The whole tensor: along each axis the slices (or the independent combinations of the
//! echelon basis of the flattening, when their ranks sum lower), ordered by rank, are
//! paired; each pair takes the pencil's terms when fewer than the sum of the two slice
//! ranks, an odd slice its rank-one split. The best axis wins. For s slices of format
//! m x n with general entries (m < n) this gives floor(s / 2) n terms, plus m for an odd
//! slice, against the slice bound s m: a 10 x 12 x 7 array of random counts gets
//! 3 * 12 + 10 = 46, not 70. The result is a scheme over Q; the caller
//! verifies it exactly (invariant of every upper bound).

use super::simultaneous::primitive;
use super::slices::{echelon_basis, push_placed, rank_one_terms, unit};
use crate::linalg::Matrix;
use crate::linalg::modular::{inverse_q, nullspace_q, rank_q};
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::scheme::Scheme;
use crate::tensor::{Tensor, slices};
use num_traits::Zero;
use rand::{Rng, SeedableRng};

/// Parameters of [`pencil_decomposition`].
#[derive(Clone, Debug)]
pub struct PencilParams {
    /// Seed of the random kernel combinations and widening columns.
    pub seed: u64,
    /// Random tries per widening of a pencil before it falls back to the slices.
    pub attempts: usize,
    /// Tensors with more entries (d0 d1 d2) are left out: the entries of the kernel
    /// vectors grow with the dimension, and the cost about as its fifth power (0.1 s for
    /// 10 x 11 x 8, 1.5 s for 18 x 19 x 16 on a loaded 2-core machine).
    pub max_cells: usize,
}

impl Default for PencilParams {
    fn default() -> Self {
        PencilParams {
            seed: 1,
            attempts: 2,
            max_cells: 8_000,
        }
    }
}

/// One term of a pencil split: `A = sum x y^T`, `B = sum lambda x y^T` over the terms.
#[derive(Clone, Debug)]
pub struct PencilTerm {
    pub x: Vec<Q>,
    pub y: Vec<Q>,
    pub lambda: Q,
}

/// An exact split of the pencil (A, B) (both m x n over Q) into fewer than `below` terms
/// (see the module text), or `None` when the construction does not give one.
/// Cost: per try n' exact kernels of m x n' integer matrices and one exact n' x n' inverse
/// (n' = max(m, n), plus one when square).
pub fn split_pencil(
    a: &Matrix<Q>,
    b: &Matrix<Q>,
    below: usize,
    params: &PencilParams,
) -> Option<Vec<PencilTerm>> {
    if a.rows > a.cols {
        let t = split_pencil(&a.transpose(), &b.transpose(), below, params)?;
        return Some(
            t.into_iter()
                .map(|p| PencilTerm {
                    x: p.y,
                    y: p.x,
                    lambda: p.lambda,
                })
                .collect(),
        );
    }
    let (m, n) = (a.rows, a.cols);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    let first = usize::from(m == n);
    for extra in first..=first + 1 {
        let wide = n + extra;
        if wide >= below {
            return None;
        }
        for _ in 0..params.attempts {
            let cols: Vec<[i64; 2]> = (0..m * extra)
                .map(|_| [rng.gen_range(-9..=9), rng.gen_range(-9..=9)])
                .collect();
            let widen = |mat: &Matrix<Q>, side: usize| {
                let rows = (0..m)
                    .map(|i| {
                        let mut r = mat.row(i).to_vec();
                        r.extend((0..extra).map(|e| Q::from_integer(cols[i * extra + e][side].into())));
                        r
                    })
                    .collect();
                Matrix::from_rows(rows, wide)
            };
            let (wa, wb) = (widen(a, 0), widen(b, 1));
            if let Some(t) = split_wide(&wa, &wb, n, &mut rng) {
                return Some(t);
            }
        }
    }
    None
}

/// The k-th evaluation point: 0, 1, -1, 2, -2, ...
fn point(k: usize) -> Q {
    let h = k.div_ceil(2) as i64;
    Q::from_integer(if k % 2 == 1 { h } else { -h }.into())
}

/// The split of an m x n' pencil (m < n') into n' terms when the kernel vectors at n'
/// points are independent; the `y` factors cut to their first `n` coordinates.
fn split_wide(
    a: &Matrix<Q>,
    b: &Matrix<Q>,
    n: usize,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Option<Vec<PencilTerm>> {
    let wide = a.cols;
    let mut ws: Vec<Vec<Q>> = Vec::with_capacity(wide);
    let mut lambdas = Vec::with_capacity(wide);
    for k in 0..wide {
        let l = point(k);
        let mut pencil = b.clone();
        for (x, y) in pencil.data.iter_mut().zip(&a.data) {
            *x -= &l * y;
        }
        let basis = nullspace_q(&pencil);
        let mut w = vec![Q::zero(); wide];
        for v in &basis {
            let c = Q::from_integer(
                (rng.gen_range(1..=9i64) * if rng.gen_bool(0.5) { 1 } else { -1 }).into(),
            );
            for (x, y) in w.iter_mut().zip(v) {
                *x += &c * y;
            }
        }
        if w.iter().all(Zero::is_zero) {
            return None;
        }
        ws.push(primitive(&w).0);
        lambdas.push(l);
    }
    let wmat = Matrix::from_rows(ws.clone(), wide).transpose();
    let inv = inverse_q(&wmat)?;
    let f = Rationals;
    Some(
        ws.iter()
            .zip(lambdas)
            .enumerate()
            .filter_map(|(k, (w, lambda))| {
                let x = a.mul_vec(&f, w);
                let y = inv.row(k)[..n].to_vec();
                let nonzero = |v: &[Q]| v.iter().any(|c| !c.is_zero());
                (nonzero(&x) && nonzero(&y)).then_some(PencilTerm { x, y, lambda })
            })
            .collect(),
    )
}

/// A slice (or basis combination) along an axis: its rank, the matrix, its coefficient
/// vector on the axis.
type Ranked = (usize, Matrix<Q>, Vec<Q>);

/// The matrices along `axis` in the basis of the slice bound there (the slices or the
/// echelon basis of the flattening, whichever has the lower sum of ranks), nonzero ones,
/// highest rank first. Cost: one exact rank per matrix and one skeleton of the flattening.
fn ranked_slices(t: &Tensor, axis: usize) -> Vec<Ranked> {
    let d = t.dims();
    let plain: Vec<(Matrix<Q>, Vec<Q>)> = slices(t, axis)
        .into_iter()
        .enumerate()
        .map(|(s, m)| (m, unit(d[axis], s)))
        .collect();
    let ranked_of = |mats: Vec<(Matrix<Q>, Vec<Q>)>| -> Vec<Ranked> {
        mats.into_iter()
            .map(|(m, z)| (rank_q(&m), m, z))
            .filter(|(r, _, _)| *r > 0)
            .collect()
    };
    let sum = |v: &[Ranked]| v.iter().map(|x| x.0).sum::<usize>();
    let (a, b) = (ranked_of(plain), ranked_of(echelon_basis(t, axis)));
    let mut ranked = if sum(&b) < sum(&a) { b } else { a };
    ranked.sort_by_key(|(r, _, _)| std::cmp::Reverse(*r));
    ranked
}

/// The terms [`split_pencil`] gives a general m x n pencil: max(m, n), one more when
/// square.
fn pencil_width(m: usize, n: usize) -> usize {
    m.max(n) + usize::from(m == n)
}

/// The number of terms of the pencil scheme on `ranked` when every pair that can gain
/// splits as a general pencil of format `m x n`.
fn predicted_terms(ranked: &[Ranked], m: usize, n: usize) -> usize {
    ranked
        .chunks(2)
        .map(|c| match c {
            [(ra, ..), (rb, ..)] => (ra + rb).min(pencil_width(m, n)),
            _ => c.iter().map(|x| x.0).sum(),
        })
        .sum()
}

/// The pencil scheme along `axis` (see the module text) and the number of pairs split as
/// pencils; never more terms than the slice bound along `axis`. Cost: one exact rank per
/// slice and [`split_pencil`] per pair.
pub fn pencil_scheme(t: &Tensor, axis: usize, params: &PencilParams) -> (Scheme, usize) {
    pencil_scheme_of(t, axis, &ranked_slices(t, axis), params)
}

fn pencil_scheme_of(
    t: &Tensor,
    axis: usize,
    ranked: &[Ranked],
    params: &PencilParams,
) -> (Scheme, usize) {
    let mut s = Scheme::empty(FieldSpec::Rational, t.dims());
    let mut split = 0;
    for (i, chunk) in ranked.chunks(2).enumerate() {
        if let [(ra, a, za), (rb, b, zb)] = chunk {
            let p = PencilParams {
                seed: params.seed.wrapping_add(i as u64),
                ..params.clone()
            };
            if let Some(terms) = split_pencil(a, b, ra + rb, &p) {
                for term in terms {
                    let z = za.iter().zip(zb).map(|(x, y)| x + &term.lambda * y).collect();
                    push_placed(&mut s, axis, term.x, term.y, z);
                }
                split += 1;
                continue;
            }
        }
        for (_, m, z) in chunk {
            for (col, row) in rank_one_terms(FieldSpec::Rational, m) {
                push_placed(&mut s, axis, col, row, z.clone());
            }
        }
    }
    (s, split)
}

/// The pencil scheme with the fewest terms over the three axes, its axis and number of
/// pencils, when the tensor is over Q, has at most `max_cells` entries and some pair of
/// slices splits as a pencil. The axes are built in the order of the terms their slice
/// ranks predict, and an axis whose prediction cannot beat the best built one is skipped.
/// Cost: three times the slice ranks, and [`split_pencil`] per pair of the axes built
/// (usually one).
pub fn pencil_decomposition(t: &Tensor, params: &PencilParams) -> Option<(Scheme, usize, usize)> {
    let d = t.dims();
    if t.field() != FieldSpec::Rational || d.iter().product::<usize>() > params.max_cells {
        return None;
    }
    let mut axes: Vec<(usize, usize, Vec<Ranked>)> = (0..3)
        .map(|axis| {
            let (o1, o2) = crate::tensor::others(axis);
            let ranked = ranked_slices(t, axis);
            (predicted_terms(&ranked, d[o1], d[o2]), axis, ranked)
        })
        .filter(|(p, _, r)| *p < r.iter().map(|x| x.0).sum::<usize>())
        .collect();
    axes.sort_by_key(|(p, axis, _)| (*p, *axis));
    let mut best: Option<(Scheme, usize, usize)> = None;
    for (predicted, axis, ranked) in &axes {
        if best.as_ref().is_some_and(|b| b.0.rank() <= *predicted) {
            break;
        }
        let (s, split) = pencil_scheme_of(t, *axis, ranked, params);
        if split > 0 && best.as_ref().is_none_or(|b| s.rank() < b.0.rank()) {
            best = Some((s, *axis, split));
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::verify;
    use crate::tensor::Kind;

    #[test]
    fn a_random_pencil_splits_into_its_width() {
        // 3 x 5 and 4 x 4 pencils of small random integers: 5 and 5 terms
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(3);
        for (m, n, want) in [(3, 5, 5), (4, 4, 5), (5, 3, 5)] {
            let mut r = |_| {
                let rows = (0..m)
                    .map(|_| {
                        (0..n)
                            .map(|_| Q::from_integer(rng.gen_range(-20i64..=20).into()))
                            .collect()
                    })
                    .collect();
                Matrix::from_rows(rows, n)
            };
            let (a, b) = (r(0), r(1));
            let terms = split_pencil(&a, &b, 99, &PencilParams::default()).unwrap();
            assert_eq!(terms.len(), want);
            let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [m, n, 2], None);
            for i in 0..m {
                for j in 0..n {
                    t.set(i, j, 0, a[(i, j)].clone());
                    t.set(i, j, 1, b[(i, j)].clone());
                }
            }
            let mut s = Scheme::empty(FieldSpec::Rational, [m, n, 2]);
            for p in terms {
                s.push(p.x, p.y, vec![Q::from_integer(1.into()), p.lambda]);
            }
            assert!(verify(&s, &t).is_ok());
        }
    }
}
