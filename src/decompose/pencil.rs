//! The pencil bound: an exact decomposition over Q that groups the slices of a tensor,
//! most often in pairs (matrix pencils).
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
//! Groups of k slices A_1 .. A_k ([`split_slices`]) follow the same pattern with
//! n' = max(n, (k - 1) m + 1) terms: at points c_j (c_j[0] = 1) a vector w_j in the kernel
//! of the stacked `A_i - c_j[i] A_1` ((k - 1) m rows), x_j = A_1 w_j, y_j the rows of
//! W^-1, so `A_i = sum_j c_j[i] x_j y_j^T`. Three 10 x 12 slices take 21 terms, not 30.
//!
//! The whole tensor: along each axis the slices (or the independent combinations of the
//! echelon basis of the flattening, when their ranks sum lower), ordered by rank, are cut
//! into consecutive groups by a dynamic programme on the predicted terms (a group of k
//! takes min(sum of ranks, n')); each group is split as above, or keeps the rank-one
//! splits of its slices when that fails. The best axis wins. A 10 x 12 x 7 array of
//! random counts gets 12 + 12 + 21 = 45 terms (two pairs and a triple of 10 x 12 slices)
//! where the slice bound is 70. The result is a scheme over Q; the caller verifies it
//! exactly (invariant of every upper bound).

use super::simultaneous::primitive;
use super::slices::{echelon_basis, push_placed, rank_one_terms, unit};
use crate::linalg::Matrix;
use crate::linalg::modular::{inverse_q, nullspace_q, rank_q};
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::scheme::Scheme;
use crate::tensor::{Tensor, slices};
use num_traits::{One, Zero};
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
    /// Tensors whose entries, scaled to integers by the common denominator, exceed this
    /// many bits are left out: the exact kernels and inverses grow with them (3 s for a
    /// 16 x 16 x 16 table in a random basis, 34 s with basis entries up to 10^6).
    pub max_entry_bits: u64,
}

impl Default for PencilParams {
    fn default() -> Self {
        PencilParams {
            seed: 1,
            attempts: 2,
            max_cells: 8_000,
            max_entry_bits: 32,
        }
    }
}

/// One term of a split of k slices: `A_i = sum c[i] x y^T` over the terms (c[0] = 1).
#[derive(Clone, Debug)]
pub struct GroupTerm {
    pub x: Vec<Q>,
    pub y: Vec<Q>,
    pub c: Vec<Q>,
}

/// The number of terms [`split_slices`] aims at for k general m x n slices without
/// transposing: max(n, (k - 1) m + 1) (for k = 2: n, one more when square).
fn group_width(m: usize, n: usize, k: usize) -> usize {
    n.max((k - 1) * m + 1)
}

/// The terms [`split_slices`] gives k general m x n slices, in the better orientation.
pub fn slices_width(m: usize, n: usize, k: usize) -> usize {
    group_width(m, n, k).min(group_width(n, m, k))
}

/// An exact split of k >= 2 slices `A_1 .. A_k` (all m x n over Q) into fewer than
/// `below` common terms `A_i = sum_j c_j[i] x_j y_j^T` (see the module text: for k = 2 a
/// pencil), or `None` when the construction does not give one. With n' the width
/// ([`slices_width`]), each A_i is widened to n' columns by random integer columns; at
/// n' points c_j (c_j[0] = 1) a vector w_j of the kernel of the stacked
/// `A_i - c_j[i] A_1` (i >= 2; (k - 1) m < n' rows, so it is not zero) is taken; when
/// W = [w_j] is invertible, x_j = A_1 w_j and y_j is the j-th row of W^-1 cut to n
/// coordinates, since `A_i W = X diag(c[i])`.
/// Cost: per try n' exact kernels of (k - 1) m x n' integer matrices and one exact
/// n' x n' inverse.
pub fn split_slices(
    mats: &[&Matrix<Q>],
    below: usize,
    params: &PencilParams,
) -> Option<Vec<GroupTerm>> {
    let k = mats.len();
    let (m, n) = (mats.first()?.rows, mats[0].cols);
    if k < 2 {
        return None;
    }
    if group_width(n, m, k) < group_width(m, n, k) {
        let tr: Vec<Matrix<Q>> = mats.iter().map(|a| a.transpose()).collect();
        let refs: Vec<&Matrix<Q>> = tr.iter().collect();
        let t = split_slices(&refs, below, params)?;
        return Some(
            t.into_iter()
                .map(|p| GroupTerm {
                    x: p.y,
                    y: p.x,
                    c: p.c,
                })
                .collect(),
        );
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    let first = group_width(m, n, k) - n;
    for extra in first..=first + 1 {
        let wide = n + extra;
        if wide >= below {
            return None;
        }
        for _ in 0..params.attempts {
            let widened: Vec<Matrix<Q>> = mats
                .iter()
                .map(|a| {
                    let rows = (0..m)
                        .map(|i| {
                            let mut r = a.row(i).to_vec();
                            r.extend(
                                (0..extra)
                                    .map(|_| Q::from_integer(rng.gen_range(-9i64..=9).into())),
                            );
                            r
                        })
                        .collect();
                    Matrix::from_rows(rows, wide)
                })
                .collect();
            if let Some(t) = split_wide(&widened, n, &mut rng) {
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

/// The split of k slices of m x n' ((k - 1) m < n') into n' terms when the kernel vectors
/// at n' points are independent; the `y` factors cut to their first `n` coordinates.
fn split_wide(
    mats: &[Matrix<Q>],
    n: usize,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Option<Vec<GroupTerm>> {
    let (k, m, wide) = (mats.len(), mats[0].rows, mats[0].cols);
    let one = Q::from_integer(1.into());
    // the kernels below do not change when every matrix is scaled by one common
    // denominator, and the combinations are then sums of integers (no gcd per entry)
    let scale = crate::scalar::common_denominator(mats.iter().flat_map(|a| a.data.iter()));
    let scaled: Vec<Matrix<Q>> = if scale.is_one() {
        mats.to_vec()
    } else {
        let s = Q::from_integer(scale);
        mats.iter().map(|a| a.map(|v| v * &s)).collect()
    };
    let mut ws: Vec<Vec<Q>> = Vec::with_capacity(wide);
    let mut points = Vec::with_capacity(wide);
    for j in 0..wide {
        // c[0] = 1, c[1] the j-th small point, further coordinates random
        let c: Vec<Q> = (0..k)
            .map(|i| match i {
                0 => one.clone(),
                1 => point(j),
                _ => Q::from_integer(rng.gen_range(-9i64..=9).into()),
            })
            .collect();
        let mut stacked = Matrix::filled((k - 1) * m, wide, Q::zero());
        for i in 1..k {
            for r in 0..m {
                for col in 0..wide {
                    stacked[((i - 1) * m + r, col)] =
                        &scaled[i][(r, col)] - &c[i] * &scaled[0][(r, col)];
                }
            }
        }
        let basis = nullspace_q(&stacked);
        let mut w = vec![Q::zero(); wide];
        for v in &basis {
            let coef = Q::from_integer(
                (rng.gen_range(1..=9i64) * if rng.gen_bool(0.5) { 1 } else { -1 }).into(),
            );
            for (x, y) in w.iter_mut().zip(v) {
                *x += &coef * y;
            }
        }
        if w.iter().all(Zero::is_zero) {
            return None;
        }
        ws.push(primitive(&w).0);
        points.push(c);
    }
    let wmat = Matrix::from_rows(ws.clone(), wide).transpose();
    let inv = inverse_q(&wmat)?;
    let f = Rationals;
    Some(
        ws.iter()
            .zip(points)
            .enumerate()
            .filter_map(|(j, (w, c))| {
                let x = mats[0].mul_vec(&f, w);
                let y = inv.row(j)[..n].to_vec();
                let nonzero = |v: &[Q]| v.iter().any(|c| !c.is_zero());
                (nonzero(&x) && nonzero(&y)).then_some(GroupTerm { x, y, c })
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

/// The groups of consecutive entries of `ranked` (highest rank first) with the fewest
/// predicted terms, each group of k >= 2 split as k general m x n slices
/// ([`slices_width`]) when that is below its sum of ranks: a dynamic programme over the
/// prefixes, groups of at most `MAX_GROUP`. Returns the predicted total and the group
/// sizes in order.
fn plan_groups(ranked: &[Ranked], m: usize, n: usize) -> (usize, Vec<usize>) {
    const MAX_GROUP: usize = 8;
    let s = ranked.len();
    let cost = |from: usize, to: usize| -> usize {
        let sum: usize = ranked[from..to].iter().map(|x| x.0).sum();
        let k = to - from;
        if k < 2 {
            sum
        } else {
            sum.min(slices_width(m, n, k))
        }
    };
    let mut best = vec![(0usize, 0usize); s + 1];
    for i in 1..=s {
        best[i] = (1..=i.min(MAX_GROUP))
            .map(|g| (best[i - g].0 + cost(i - g, i), g))
            .min()
            .expect("a group");
    }
    let mut sizes = Vec::new();
    let mut i = s;
    while i > 0 {
        sizes.push(best[i].1);
        i -= best[i].1;
    }
    sizes.reverse();
    (best[s].0, sizes)
}

/// The pencil scheme along `axis` (see the module text) and the number of groups split
/// together; never more terms than the slice bound along `axis`. Cost: one exact rank
/// per slice and [`split_slices`] per group.
pub fn pencil_scheme(t: &Tensor, axis: usize, params: &PencilParams) -> (Scheme, usize) {
    let ranked = ranked_slices(t, axis);
    let (o1, o2) = crate::tensor::others(axis);
    let d = t.dims();
    let (_, sizes) = plan_groups(&ranked, d[o1], d[o2]);
    pencil_scheme_of(t, axis, &ranked, &sizes, params)
}

fn pencil_scheme_of(
    t: &Tensor,
    axis: usize,
    ranked: &[Ranked],
    sizes: &[usize],
    params: &PencilParams,
) -> (Scheme, usize) {
    let mut s = Scheme::empty(FieldSpec::Rational, t.dims());
    let mut split = 0;
    let mut from = 0;
    for (i, &g) in sizes.iter().enumerate() {
        let group = &ranked[from..from + g];
        from += g;
        if g >= 2 {
            let p = PencilParams {
                seed: params.seed.wrapping_add(i as u64),
                ..params.clone()
            };
            let mats: Vec<&Matrix<Q>> = group.iter().map(|x| &x.1).collect();
            let sum = group.iter().map(|x| x.0).sum();
            if let Some(terms) = split_slices(&mats, sum, &p) {
                for term in terms {
                    let mut z = vec![Q::zero(); group[0].2.len()];
                    for ((_, _, zi), ci) in group.iter().zip(&term.c) {
                        for (a, b) in z.iter_mut().zip(zi) {
                            *a += ci * b;
                        }
                    }
                    push_placed(&mut s, axis, term.x, term.y, z);
                }
                split += 1;
                continue;
            }
        }
        for (_, m, z) in group {
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
/// (usually one). `Err`: not tried because the entries, scaled to integers, exceed
/// `max_entry_bits` (the reason, in words).
pub fn pencil_decomposition(
    t: &Tensor,
    params: &PencilParams,
) -> Result<Option<(Scheme, usize, usize)>, String> {
    let d = t.dims();
    if t.field() != FieldSpec::Rational || d.iter().product::<usize>() > params.max_cells {
        return Ok(None);
    }
    let bits = crate::tensor::IntegralTensor::from_tensor(t).constant_bits();
    if bits > params.max_entry_bits {
        return Err(format!(
            "pencil bound not tried: entries of {bits} bits once denominators are cleared, \
             above {} (its exact kernels grow with them)",
            params.max_entry_bits
        ));
    }
    type Axis = (usize, usize, Vec<Ranked>, Vec<usize>);
    let mut axes: Vec<Axis> = (0..3)
        .map(|axis| {
            let (o1, o2) = crate::tensor::others(axis);
            let ranked = ranked_slices(t, axis);
            let (predicted, sizes) = plan_groups(&ranked, d[o1], d[o2]);
            (predicted, axis, ranked, sizes)
        })
        .filter(|(p, _, r, _)| *p < r.iter().map(|x| x.0).sum::<usize>())
        .collect();
    axes.sort_by_key(|(p, axis, _, _)| (*p, *axis));
    let mut best: Option<(Scheme, usize, usize)> = None;
    for (predicted, axis, ranked, sizes) in &axes {
        if best.as_ref().is_some_and(|b| b.0.rank() <= *predicted) {
            break;
        }
        let (s, split) = pencil_scheme_of(t, *axis, ranked, sizes, params);
        if split > 0 && best.as_ref().is_none_or(|b| s.rank() < b.0.rank()) {
            best = Some((s, *axis, split));
        }
    }
    Ok(best)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::verify;
    use crate::tensor::Kind;

    #[test]
    fn random_slices_split_into_their_width() {
        // pencils 3 x 5 and 4 x 4 (5 terms each), three 2 x 5 slices (5 terms, not 6)
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(3);
        for (m, n, k, want) in [(3, 5, 2, 5), (4, 4, 2, 5), (5, 3, 2, 5), (2, 5, 3, 5)] {
            let mats: Vec<Matrix<Q>> = (0..k)
                .map(|_| {
                    let rows = (0..m)
                        .map(|_| {
                            (0..n)
                                .map(|_| Q::from_integer(rng.gen_range(-20i64..=20).into()))
                                .collect()
                        })
                        .collect();
                    Matrix::from_rows(rows, n)
                })
                .collect();
            let refs: Vec<&Matrix<Q>> = mats.iter().collect();
            assert_eq!(slices_width(m, n, k), want);
            let terms = split_slices(&refs, 99, &PencilParams::default()).unwrap();
            assert_eq!(terms.len(), want);
            let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [m, n, k], None);
            for (l, a) in mats.iter().enumerate() {
                for i in 0..m {
                    for j in 0..n {
                        t.set(i, j, l, a[(i, j)].clone());
                    }
                }
            }
            let mut s = Scheme::empty(FieldSpec::Rational, [m, n, k]);
            for p in terms {
                s.push(p.x, p.y, p.c);
            }
            assert!(verify(&s, &t).is_ok());
        }
    }
}
