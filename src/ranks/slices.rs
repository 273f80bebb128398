//! Ranks of a structure tensor: flattenings, slices, and the largest rank in each slice
//! span.
//!
//! - Flattening ranks (exact): the ranks of the three maps U -> Hom(V, W), V -> Hom(U, W),
//!   W* -> Hom(U, V) (see [`crate::tensor::flattening`]).
//! - Slices along an axis (exact): the matrices with a fixed index on that axis.
//! - Slice span: the largest rank of a combination `sum_s r_s M_s` of the slices along an
//!   axis. Two lower bounds are given, both exact statements about explicit elements:
//!   1. a random element with coefficients drawn modulo a large prime p (seeded): its rank
//!      over GF(p) is at most the rank of the integer combination over Q, hence a lower
//!      bound, and equal to the generic rank with probability at least `1 - r/p`
//!      (Schwartz-Zippel);
//!   2. a certificate: explicit small integer coefficients, whose combination has the
//!      stated rank (over Q, or over GF(q) for a tensor over GF(q)).
//!
//!   The upper bound `min(rank of the flattenings of the two other axes)` holds because
//!   the column (row) space of every combination lies in the span of all the slices'
//!   columns (rows). When a lower bound meets it, the maximum is proven.
//!   Otherwise, when the span has few slices, the grid argument proves the lower bound
//!   `r` is the generic rank: every `(r+1)`-minor of `sum_s t_s M_s` has degree at most
//!   `r + 1` in each `t_s`, so if all the points of `{0..r+1}^k` give rank `<= r`, the
//!   minors vanish identically (Alon 1999, Combinatorial Nullstellensatz). A grid point
//!   of larger rank becomes the new certificate.
//!
//! Over GF(q) the "largest rank in the span" means over GF(q) itself; both lower bounds
//! are then computed in GF(q).

use crate::linalg::kernels::KERNEL_PRIME_BITS;
use crate::linalg::nullspace::{cached_primes, rank_modulo};
use crate::linalg::{self, Matrix};
use crate::scalar::{Field, FieldSpec, PrimeField, Q};
use crate::tensor::flatten::{Unfolding, flattening_ranks_of, unfolding_rank};
use crate::tensor::{AXES, IntegralTensor, Tensor, flattening_ranks, others, rank_over, slices};
use num_traits::Zero;
use rand::{Rng, SeedableRng};
use serde::Serialize;

/// Options of [`compute_ranks`].
#[derive(Clone, Debug)]
pub struct Params {
    /// Seed of the random coefficients.
    pub seed: u64,
    /// Number of random elements tried per axis (the best is kept).
    pub trials: usize,
    /// The small integer coefficients of the certificate lie in `-bound..=bound`.
    pub bound: i64,
    /// The grid argument is used when it needs at most this many exact ranks.
    pub max_grid_points: u64,
}

impl Default for Params {
    fn default() -> Self {
        Params {
            seed: 1,
            trials: 2,
            bound: 3,
            max_grid_points: 4096,
        }
    }
}

/// The slices along one axis.
#[derive(Clone, Debug, Serialize)]
pub struct AxisSlices {
    /// `left`, `right` or `result`.
    pub axis: String,
    /// Rows x columns of each slice (indexed by the two other axes in order).
    pub shape: [usize; 2],
    /// `(basis name, rank)` per slice.
    pub ranks: Vec<(String, usize)>,
}

/// The largest rank in the span of the slices along one axis.
#[derive(Clone, Debug, Serialize)]
pub struct SpanRank {
    pub axis: String,
    /// Rank of a random element modulo `prime` (lower bound; the generic rank w.h.p.).
    pub random_rank: usize,
    /// The prime used for the random element.
    pub prime: u64,
    /// Explicit small integer coefficients, one per slice.
    pub certificate: Vec<i64>,
    /// Exact rank of the certificate combination (a proven lower bound).
    pub certificate_rank: usize,
    /// A proven upper bound: `min` of the flattening ranks of the two other axes, or the
    /// lower bound itself when the grid argument (see [`compute_ranks`]) proves it.
    pub upper_bound: usize,
    /// `flattening`, or `grid {0..m}^k` when the grid argument gave the bound.
    pub upper_bound_method: String,
    /// True when a lower bound equals the upper bound (the maximum is then proven).
    pub proven: bool,
}

/// All rank data of a tensor.
#[derive(Clone, Debug, Serialize)]
pub struct RankReport {
    /// Exact ranks of the flattenings along left, right, result.
    pub flattening: [usize; 3],
    pub slices: Vec<AxisSlices>,
    pub span: Vec<SpanRank>,
}

/// Exact and modular ranks of slice combinations of one tensor: through the integer-scaled
/// constants and the engine of [`crate::linalg::nullspace`], or, over GF(q) with
/// q >= 2^28 (beyond the word kernels), by elimination in GF(q) itself.
enum Ranker<'a> {
    Integral(&'a IntegralTensor),
    Field(FieldSpec, &'a Tensor),
}

impl Ranker<'_> {
    /// The prime the random elements live modulo.
    fn prime(&self) -> u64 {
        match self {
            Ranker::Integral(it) => it.modulus().unwrap_or(cached_primes()[0]),
            Ranker::Field(f, _) => f.characteristic(),
        }
    }

    fn unfolding<'b>(it: &'b IntegralTensor, axis: usize, c: &'b [i64]) -> Unfolding<'b> {
        let d = it.dims;
        let (o1, o2) = others(axis);
        Unfolding {
            it,
            axis,
            coefs: Some(c),
            transposed: d[o1] < d[o2],
        }
    }

    /// Exact rank of `sum_s c_s M_s` along `axis`.
    fn exact(&self, axis: usize, c: &[i64]) -> usize {
        match self {
            Ranker::Integral(it) => unfolding_rank(&Self::unfolding(it, axis, c)),
            Ranker::Field(f, t) => {
                let ms = slices(t, axis);
                let shape = [ms[0].rows, ms[0].cols];
                rank_over(*f, &combine(&ms, shape, c))
            }
        }
    }

    /// Rank of `sum_s c_s M_s` modulo the prime, the `c_s` given modulo it.
    fn modular(&self, axis: usize, c: &[u64]) -> usize {
        match self {
            Ranker::Integral(it) => {
                let ci: Vec<i64> = c.iter().map(|&x| x as i64).collect();
                rank_modulo(&Self::unfolding(it, axis, &ci), self.prime())
            }
            Ranker::Field(f, t) => {
                let p = f.characteristic();
                let fp = PrimeField::new(p).expect("prime");
                let ms = slices(t, axis);
                let mut acc = vec![0u64; ms[0].rows * ms[0].cols];
                for (m, cs) in ms.iter().zip(c) {
                    for (o, x) in acc.iter_mut().zip(&m.data) {
                        if !x.is_zero() {
                            let v = fp.from_rational(x).unwrap_or(0);
                            fp.add_mul_assign(o, &v, cs);
                        }
                    }
                }
                let mm = Matrix {
                    rows: ms[0].rows,
                    cols: ms[0].cols,
                    data: acc,
                };
                linalg::rank(&fp, &mm)
            }
        }
    }
}

/// The exact rank of the slice combination `sum_s c_s M_s` along `axis` (over the
/// tensor's field). Cost: one elimination modulo a prime, plus an exact nullspace when the
/// rank is not full.
pub fn combination_rank(t: &Tensor, axis: usize, c: &[i64]) -> usize {
    if matches!(t.field(), FieldSpec::Prime(q) if q >= 1 << KERNEL_PRIME_BITS) {
        return Ranker::Field(t.field(), t).exact(axis, c);
    }
    Ranker::Integral(&IntegralTensor::from_tensor(t)).exact(axis, c)
}

/// Flattening ranks, slice ranks and slice-span ranks of a tensor.
/// Cost: three flattening ranks, `a + b + c` slice ranks and `3 (trials + 1)` ranks of
/// combinations; each rank is one elimination modulo a prime (plus an exact nullspace
/// when it is not full).
pub fn compute_ranks(t: &Tensor, params: &Params) -> RankReport {
    let it = IntegralTensor::from_tensor(t);
    let large = matches!(t.field(), FieldSpec::Prime(q) if q >= 1 << KERNEL_PRIME_BITS);
    let ranker = if large {
        Ranker::Field(t.field(), t)
    } else {
        Ranker::Integral(&it)
    };
    let flattening = if large {
        flattening_ranks(t)
    } else {
        flattening_ranks_of(&it)
    };
    let d = t.dims();
    let mut out_slices = Vec::new();
    let mut span = Vec::new();
    for (axis, axis_name) in AXES.iter().enumerate() {
        let (o1, o2) = others(axis);
        let ranks = (0..d[axis])
            .map(|s| {
                let mut c = vec![0i64; d[axis]];
                c[s] = 1;
                (t.name(axis, s).to_string(), ranker.exact(axis, &c))
            })
            .collect();
        out_slices.push(AxisSlices {
            axis: axis_name.to_string(),
            shape: [d[o1], d[o2]],
            ranks,
        });
        let seed = params
            .seed
            .wrapping_mul(0x9E37_79B9_7F4A_7C15)
            .wrapping_add(axis as u64);
        let upper = flattening[o1].min(flattening[o2]);
        span.push(span_rank(&ranker, t.field(), axis, upper, seed, params));
    }
    RankReport {
        flattening,
        slices: out_slices,
        span,
    }
}

/// `sum_s c_s M_s` over Q.
fn combine(ms: &[Matrix<Q>], shape: [usize; 2], c: &[i64]) -> Matrix<Q> {
    let mut out = Matrix::filled(shape[0], shape[1], Q::zero());
    for (m, &cs) in ms.iter().zip(c) {
        if cs == 0 {
            continue;
        }
        let cq = Q::from_integer(cs.into());
        for (o, x) in out.data.iter_mut().zip(&m.data) {
            if !x.is_zero() {
                *o += x * &cq;
            }
        }
    }
    out
}

fn span_rank(
    ranker: &Ranker,
    field: FieldSpec,
    axis: usize,
    upper: usize,
    seed: u64,
    params: &Params,
) -> SpanRank {
    let axis_name = AXES[axis];
    let (k, shape) = match ranker {
        Ranker::Integral(it) => {
            let (o1, o2) = others(axis);
            (it.dims[axis], [it.dims[o1], it.dims[o2]])
        }
        Ranker::Field(_, t) => {
            let (o1, o2) = others(axis);
            (t.dims()[axis], [t.dims()[o1], t.dims()[o2]])
        }
    };
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let p = ranker.prime();
    let mut random_rank = 0;
    let mut certificate = vec![0i64; k];
    let mut certificate_rank = 0;
    if k > 0 && shape[0] > 0 && shape[1] > 0 {
        for _ in 0..params.trials.max(1) {
            let c: Vec<u64> = (0..k).map(|_| rng.gen_range(0..p)).collect();
            random_rank = random_rank.max(ranker.modular(axis, &c));
            if random_rank == upper {
                break;
            }
        }
        for _ in 0..params.trials.max(1) {
            let c: Vec<i64> = (0..k)
                .map(|_| rng.gen_range(-params.bound..=params.bound))
                .collect();
            let r = ranker.exact(axis, &c);
            if r > certificate_rank || certificate.iter().all(|&x| x == 0) {
                certificate_rank = r;
                certificate = c;
            }
            if certificate_rank == upper {
                break;
            }
        }
    }
    let mut upper_bound = upper;
    let mut upper_bound_method = "flattening".to_string();
    let mut lower = random_rank.max(certificate_rank);
    // the grid argument: rescan with a larger candidate whenever a grid point beats it
    while lower < upper_bound {
        match grid_scan(ranker, field, axis, k, lower, params.max_grid_points) {
            GridScan::TooLarge => break,
            GridScan::AllAtMost => {
                upper_bound = lower;
                upper_bound_method = format!("grid {{0..{}}}^{}", lower + 1, k);
            }
            GridScan::Found(c, r) => {
                certificate = c;
                certificate_rank = r;
                lower = r;
            }
        }
    }
    SpanRank {
        axis: axis_name.into(),
        random_rank,
        prime: p,
        certificate,
        certificate_rank,
        upper_bound,
        upper_bound_method,
        proven: lower == upper_bound,
    }
}

enum GridScan {
    /// More than the allowed number of points (or the field is too small).
    TooLarge,
    /// Every grid point has rank at most the candidate.
    AllAtMost,
    /// A point with a larger rank.
    Found(Vec<i64>, usize),
}

/// Every `(r+1)`-minor of `sum_s t_s M_s` is a polynomial of degree at most `r + 1` in
/// each `t_s`; one that vanishes on the grid `{0, ..., r+1}^k` is zero (a polynomial of
/// degree `< |S|` in each variable vanishing on `S^k` is zero; Alon 1999, Combinatorial
/// Nullstellensatz). So if every grid point has rank `<= r`, the generic rank of the span
/// is `<= r`. Needs `r + 2` distinct field elements. Cost: `(r+2)^k` exact ranks.
fn grid_scan(
    ranker: &Ranker,
    field: FieldSpec,
    axis: usize,
    k: usize,
    r: usize,
    max_points: u64,
) -> GridScan {
    let base = r as u64 + 2;
    if field.characteristic() != 0 && field.characteristic() < base {
        return GridScan::TooLarge;
    }
    let Some(points) = u32::try_from(k).ok().and_then(|k| base.checked_pow(k)) else {
        return GridScan::TooLarge;
    };
    if points > max_points {
        return GridScan::TooLarge;
    }
    let mut t = vec![0i64; k];
    for _ in 0..points {
        let rk = ranker.exact(axis, &t);
        if rk > r {
            return GridScan::Found(t, rk);
        }
        for x in t.iter_mut() {
            *x += 1;
            if (*x as u64) < base {
                break;
            }
            *x = 0;
        }
    }
    GridScan::AllAtMost
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    fn matmul(n: usize, m: usize, p: usize) -> Tensor {
        // <n,m,p>: A (n x m) times B (m x p)
        let mut t = Tensor::zero(
            FieldSpec::Rational,
            crate::tensor::Kind::Bilinear,
            [n * m, m * p, n * p],
            None,
        );
        for i in 0..n {
            for j in 0..m {
                for k in 0..p {
                    t.set(i * m + j, j * p + k, i * p + k, q(1, 1));
                }
            }
        }
        t
    }

    #[test]
    fn matmul_ranks() {
        let r = compute_ranks(&matmul(2, 3, 4), &Params::default());
        assert_eq!(r.flattening, [6, 12, 8]);
        for s in &r.span {
            assert!(s.proven, "{s:?}");
        }
        // slices along the left axis of <2,3,4> are rank p = 4 each? rank of E_ij (x) ... : 4
        assert!(r.slices[0].ranks.iter().all(|x| x.1 == 4));
    }

    #[test]
    fn over_gf() {
        let t = matmul(2, 2, 2).with_field(FieldSpec::Prime(5)).unwrap();
        let r = compute_ranks(&t, &Params::default());
        assert_eq!(r.flattening, [4, 4, 4]);
        assert!(r.span.iter().all(|s| s.random_rank == 4 && s.proven));
    }
}
