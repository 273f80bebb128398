//! Exact decomposition by simultaneous diagonalisation (Harshman 1970, "Foundations of the
//! PARAFAC procedure", UCLA Working Papers in Phonetics 16; Leurgans, Ross and Abel 1993,
//! "A decomposition for three-way arrays", SIAM J. Matrix Anal. Appl. 14), carried out
//! over Q.
//!
//! Suppose `T = sum_{r=1}^R a_r (x) b_r (x) c_r` where the a_r and the b_r are linearly
//! independent (so R is at most the dimensions of those two axes) and no two c_r are
//! proportional. Then R is the rank of the flattenings along the first two axes (a lower
//! bound for the tensor rank), and after restricting the first two axes to R independent
//! rows of their flattenings, two combinations of the slices along the third axis are
//! `T_x = A' diag(C^T x) B'^T` and `T_y = A' diag(C^T y) B'^T` with A', B' invertible. So
//! `T_x T_y^-1 = A' diag(<x, c_r> / <y, c_r>) A'^-1`: its eigenvectors are the columns of
//! A'. When the decomposition is rational so are the eigenvalues; [`super::eigen`] finds
//! them exactly. Then `A'^-1` applied to the restricted first axis leaves the R rank-one
//! matrices `b_r c_r^T`, and A follows by solving a linear system. The scheme is verified
//! exactly before it is returned, so a returned decomposition proves `R(T) = R`.
//!
//! Uniqueness: A and B have k-rank R and C has k-rank >= 2, so Kruskal's condition
//! `k_A + k_B + k_C >= 2R + 2` holds ([`super::kruskal`]); the k-ranks are reported.

use super::eigen::{EigenFailure, FloatSpectrum, pencil_spectrum, rational_eigen};
use super::kruskal::{Uniqueness, kruskal_uniqueness};
use crate::linalg::Matrix;
use crate::linalg::modular::{inverse_q, product_q, skeleton_q};
use crate::scalar::{FieldSpec, Q, Rationals, common_denominator};
use crate::scheme::{Scheme, verify};
use crate::tensor::{Tensor, flattening, flattening_ranks, slice};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};
use rand::{Rng, SeedableRng};

/// Parameters of [`simultaneous_diagonalisation`].
#[derive(Clone, Debug)]
pub struct SimultaneousParams {
    /// Seed of the random slice combinations.
    pub seed: u64,
    /// Pairs of random combinations tried per choice of axes.
    pub tries: usize,
    /// Largest R attempted (the eigenproblem is R x R over Q).
    pub max_terms: usize,
}

impl Default for SimultaneousParams {
    fn default() -> Self {
        SimultaneousParams {
            seed: 1,
            tries: 3,
            max_terms: 64,
        }
    }
}

/// A decomposition found and verified, with the axes it used and its uniqueness.
#[derive(Clone, Debug)]
pub struct Simultaneous {
    pub scheme: Scheme,
    /// The two axes whose factors are independent, then the axis of the slices combined.
    pub axes: [usize; 3],
    pub uniqueness: Uniqueness,
}

/// The exact decomposition of `t` with as many terms as its largest flattening rank, when
/// the method applies (see the module documentation); otherwise why not.
/// Cost: per try, an exact R x R inverse and eigenproblem, and O(R d^3) rational
/// operations to read the factors; then one exact verification.
pub fn simultaneous_diagonalisation(
    t: &Tensor,
    params: &SimultaneousParams,
) -> Result<Simultaneous, String> {
    if t.field() != FieldSpec::Rational {
        return Err("simultaneous diagonalisation is carried out over Q only".into());
    }
    let d = t.dims();
    let fr = flattening_ranks(t);
    let r = *fr.iter().max().unwrap_or(&0);
    if r == 0 {
        return Err("the zero tensor has rank 0".into());
    }
    if r > params.max_terms {
        return Err(format!(
            "{r} terms exceed the limit of {}",
            params.max_terms
        ));
    }
    let choices: Vec<[usize; 3]> = [[0, 1, 2], [0, 2, 1], [1, 2, 0]]
        .into_iter()
        .filter(|&[a, b, c]| fr[a] == r && fr[b] == r && (r == 1 || d[c] >= 2))
        .collect();
    if choices.is_empty() {
        return Err(format!(
            "needs two axes whose flattening ranks equal the largest one, {r} (flattening \
             ranks {}, {}, {}): the rank may exceed two of the dimensions",
            fr[0], fr[1], fr[2]
        ));
    }
    let mut why = String::new();
    for axes in choices {
        match along(t, axes, r, params) {
            Ok(s) => return Ok(s),
            Err(e) => why = e,
        }
    }
    Err(why)
}

const NOT_REAL: &str =
    "the eigenvalues are not real: no decomposition over Q with this many terms along this route";
const REPEATED: &str = "repeated eigenvalues: two third-axis factors may be proportional";

fn along(
    t: &Tensor,
    [a, b, c]: [usize; 3],
    r: usize,
    params: &SimultaneousParams,
) -> Result<Simultaneous, String> {
    let d = t.dims();
    let pa = independent_rows(t, a, r);
    let pb = independent_rows(t, b, r);
    // the core: the entries on the rows pa (axis a) and pb (axis b), as (row, column,
    // slice, value); a common scale makes it integral, so the combinations below are sums
    // of integers, and X = T_x T_y^-1 does not change. O(nnz), no dense slices.
    let position = |rows: &[usize], len: usize| {
        let mut at = vec![usize::MAX; len];
        for (p, &i) in rows.iter().enumerate() {
            at[i] = p;
        }
        at
    };
    let (at_a, at_b) = (position(&pa, d[a]), position(&pb, d[b]));
    let mut core: Vec<(usize, usize, usize, Q)> = t
        .entries()
        .filter_map(|(i, j, k, v)| {
            let idx = [i, j, k];
            let (p, q) = (at_a[idx[a]], at_b[idx[b]]);
            (p != usize::MAX && q != usize::MAX).then(|| (p, q, idx[c], v.clone()))
        })
        .collect();
    let scale = common_denominator(core.iter().map(|e| &e.3));
    if !scale.is_one() {
        let s = Q::from_integer(scale);
        core.iter_mut().for_each(|e| e.3 *= &s);
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed ^ (a * 9 + b * 3 + c) as u64);
    let mut why = "no pair of slice combinations was invertible".to_string();
    for _ in 0..params.tries.max(1) {
        let x: Vec<i64> = (0..d[c]).map(|_| rng.gen_range(-9..=9)).collect();
        let y: Vec<i64> = (0..d[c]).map(|_| rng.gen_range(-9..=9)).collect();
        let (tx, ty) = (combine(&core, &x, r), combine(&core, &y, r));
        // the floating-point spectrum first: the exact product and eigenproblem are
        // the costly part, and most tensors fail here
        match pencil_spectrum(&tx, &ty) {
            FloatSpectrum::NotReal => return Err(NOT_REAL.into()),
            // eigenvalues equal to nine digits for a random pair are a property of the
            // tensor (two proportional third-axis factors), not of the pair
            FloatSpectrum::Repeated => return Err(REPEATED.into()),
            FloatSpectrum::Distinct | FloatSpectrum::Unknown => {}
        }
        let Some(ty_inv) = inverse_q(&ty) else {
            continue;
        };
        let eig = match rational_eigen(&product_q(&tx, &ty_inv)) {
            Ok(e) => e,
            // for a decomposition of this kind every pair of generic combinations has
            // the same kind of eigenvalues: no use trying another pair
            Err(EigenFailure::NotReal) => return Err(NOT_REAL.into()),
            Err(EigenFailure::NotRational) => {
                return Err("the eigenvalues are not all rational (or repeated): no \
                            decomposition over Q found along this route"
                    .into());
            }
        };
        if eig.len() != r || eig.iter().any(|e| e.vectors.len() != 1) {
            why = REPEATED.into();
            continue;
        }
        match read_factors(
            t,
            [a, b, c],
            &pa,
            &eig.iter().map(|e| e.vectors[0].clone()).collect::<Vec<_>>(),
        ) {
            Some(s) => return Ok(s),
            None => why = "the factors read from the eigenvectors do not verify".into(),
        }
    }
    Err(why)
}

/// Slice `i` along `axis` with rows on the lower other axis when `in_order`, else
/// transposed.
fn oriented(t: &Tensor, axis: usize, i: usize, in_order: bool) -> Matrix<Q> {
    let s = slice(t, axis, i);
    if in_order { s } else { s.transpose() }
}

/// `v = s * w` with w a primitive integer vector (coprime entries, first nonzero one
/// positive) and s rational; the zero vector gives (v, 1).
pub(super) fn primitive(v: &[Q]) -> (Vec<Q>, Q) {
    let lcm = common_denominator(v.iter());
    let ints: Vec<BigInt> = v.iter().map(|x| (x * &lcm).to_integer()).collect();
    let mut g = ints.iter().fold(BigInt::from(0), |g, x| g.gcd(x));
    if g == BigInt::from(0) {
        return (v.to_vec(), Q::from_integer(1.into()));
    }
    if ints
        .iter()
        .find(|x| **x != BigInt::from(0))
        .is_some_and(|x| *x < BigInt::from(0))
    {
        g = -g;
    }
    let w = ints.iter().map(|x| Q::from_integer(x / &g)).collect();
    (w, Q::new(g, lcm))
}

/// `sum_k x_k S_k`.
/// `sum_k x_k core_k` as an r x r matrix, from the core's entries.
fn combine(core: &[(usize, usize, usize, Q)], x: &[i64], r: usize) -> Matrix<Q> {
    let mut m = Matrix::filled(r, r, Q::zero());
    for (p, q, k, v) in core {
        if x[*k] != 0 {
            m[(*p, *q)] += v * Q::from_integer(x[*k].into());
        }
    }
    m
}

/// Indices of a maximal set of linearly independent rows of `m` (exact).
/// `r` independent rows of the flattening along `axis` (of rank r): all of them when r is
/// the dimension.
fn independent_rows(t: &Tensor, axis: usize, r: usize) -> Vec<usize> {
    if r == t.dims()[axis] {
        return (0..r).collect();
    }
    skeleton_q(&flattening(t, axis)).rows
}

/// From the eigenvectors (columns of A' = A restricted to the rows `pa` of axis a), the
/// full factors, verified exactly.
fn read_factors(
    t: &Tensor,
    [a, b, c]: [usize; 3],
    pa: &[usize],
    cols: &[Vec<Q>],
) -> Option<Simultaneous> {
    let d = t.dims();
    let r = cols.len();
    let f = Rationals;
    // A' with the eigenvectors as columns
    let ap = Matrix::from_rows(
        (0..r)
            .map(|i| cols.iter().map(|v| v[i].clone()).collect())
            .collect(),
        r,
    );
    let ap_inv = inverse_q(&ap)?;
    // the slices along axis a (rows: axis b, columns: axis c)
    let sa: Vec<Matrix<Q>> = pa.iter().map(|&i| oriented(t, a, i, b < c)).collect();
    let (mut bs, mut cs) = (Vec::with_capacity(r), Vec::with_capacity(r));
    for row in 0..r {
        let mut m = Matrix::filled(d[b], d[c], Q::zero());
        for (p, s) in sa.iter().enumerate() {
            let coef = &ap_inv[(row, p)];
            if coef.is_zero() {
                continue;
            }
            for (acc, v) in m.data.iter_mut().zip(&s.data) {
                if !v.is_zero() {
                    *acc += v * coef;
                }
            }
        }
        let pos = m.data.iter().position(|v| !v.is_zero())?;
        let (j0, k0) = (pos / d[c], pos % d[c]);
        let pivot = m[(j0, k0)].clone();
        bs.push(m.column(k0));
        cs.push(m.row(j0).iter().map(|v| v / &pivot).collect::<Vec<Q>>());
    }
    // A from T_(a) = A (B khatri-rao C)^T: R independent rows of the Khatri-Rao product
    let kr = Matrix::from_rows(
        (0..r)
            .map(|l| {
                (0..d[b] * d[c])
                    .map(|jk| &bs[l][jk / d[c]] * &cs[l][jk % d[c]])
                    .collect()
            })
            .collect(),
        d[b] * d[c],
    );
    let sel = skeleton_q(&kr).cols;
    if sel.len() != r {
        return None;
    }
    let sub = Matrix::from_rows(
        (0..r)
            .map(|l| sel.iter().map(|&jk| kr[(l, jk)].clone()).collect())
            .collect(),
        r,
    );
    let sub_inv = inverse_q(&sub)?;
    let mut fa = vec![vec![Q::zero(); d[a]]; r];
    for i in 0..d[a] {
        let s = oriented(t, a, i, b < c);
        let rhs: Vec<Q> = sel
            .iter()
            .map(|&jk| s[(jk / d[c], jk % d[c])].clone())
            .collect();
        // A[i, :] = rhs * sub^-1
        let row = sub_inv.transpose().mul_vec(&f, &rhs);
        for (fl, x) in fa.iter_mut().zip(row) {
            fl[i] = x;
        }
    }
    let mut scheme = Scheme::empty(FieldSpec::Rational, d);
    for l in 0..r {
        // primitive integer factors on axes a and b, the scale on axis c
        let (pa_, sa_) = primitive(&fa[l]);
        let (pb_, sb_) = primitive(&bs[l]);
        let scale = sa_ * sb_;
        let mut fs: [Vec<Q>; 3] = Default::default();
        fs[a] = pa_;
        fs[b] = pb_;
        fs[c] = cs[l].iter().map(|x| x * &scale).collect();
        let [u, v, w] = fs;
        scheme.push(u, v, w);
    }
    verify(&scheme, t).ok()?;
    let uniqueness = kruskal_uniqueness([&scheme.u, &scheme.v, &scheme.w]);
    Some(Simultaneous {
        scheme,
        axes: [a, b, c],
        uniqueness,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::decompose::planted::planted;

    #[test]
    fn recovers_planted_ranks_exactly_and_uniquely() {
        // planted rank R with generic integer factors, scrambled with entries up to 50
        for (dims, r, seed) in [
            ([6, 5, 4], 3, 1),
            ([8, 8, 8], 5, 2),
            ([10, 12, 7], 8, 3),
            ([4, 4, 4], 4, 4),
        ] {
            let (t, _) = planted(dims, r, 50, seed);
            let s = simultaneous_diagonalisation(&t, &SimultaneousParams::default())
                .unwrap_or_else(|e| panic!("{dims:?} rank {r}: {e}"));
            assert_eq!(s.scheme.rank(), r);
            assert!(verify(&s.scheme, &t).is_ok());
            assert!(s.uniqueness.unique, "{:?}", s.uniqueness);
        }
    }

    #[test]
    fn refuses_above_the_dimensions_and_over_extensions() {
        // 2x2 matrix multiplication: flattening ranks 4 but rank 7
        let t = crate::scheme::testkit::matmul(2, 2, 2);
        assert!(simultaneous_diagonalisation(&t, &SimultaneousParams::default()).is_err());
        // complex multiplication over Q: rank 2 over C, 3 over Q (eigenvalues not real)
        let c = crate::scheme::testkit::complex();
        let e = simultaneous_diagonalisation(&c, &SimultaneousParams::default()).unwrap_err();
        assert!(e.contains("not real"), "{e}");
    }
}
