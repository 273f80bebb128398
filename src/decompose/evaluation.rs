//! Polynomial products by evaluation and interpolation: a scheme of rank `m + n - 1` for
//! the product of a polynomial of degree below m by one of degree below n, the exact rank
//! (the flattening onto the result has rank `m + n - 1`).
//!
//! Construction (Toom 1963, "The complexity of a scheme of functional elements realizing
//! the multiplication of integers", Soviet Math. Doklady 3; Cook 1966, "On the minimum
//! computation time of functions", thesis, Harvard; from memory). With `N = m + n - 1`,
//! take N distinct points `(a_r : b_r)` of the projective line, of small height in the
//! order 0, infinity, 1, -1, 2, -2, 1/2, -1/2, 3, ... (the points 1/2 and -1/2 keep the
//! interpolation small: Bodrato and Zanoni 2007, "Integer and polynomial multiplication:
//! towards optimal Toom-Cook matrices", ISSAC; from memory). Term r multiplies the
//! homogeneous values `x(a_r, b_r) = sum_i x_i a_r^i b_r^(m-1-i)` and `y(a_r, b_r)`; the
//! product z of degree below N is the combination of these N values given by the inverse
//! of the transposed evaluation matrix `E[r][l] = a_r^l b_r^(N-1-l)` (a Vandermonde
//! matrix of distinct projective points, invertible).
//!
//! Which tensors: those that are such a product in the given bases up to the order of the
//! axes (any of the six: the transposed products, such as correlations, included), the
//! order of each basis (ascending or descending degree) and a scaling of each basis
//! vector: `T[i][j][k] = α_i β_j δ_k` when `k = i + j`, zero elsewhere (divided powers
//! `x^i / i!` give `binom(i + j, i)`). The scalings are read off the table with the gauge
//! `α_0 = β_0 = α_1 = 1`. Over GF(p) the N points must be distinct modulo p: `N <= p + 1`.
//!
//! Invariant: a scheme is returned only after the exact check against the tensor
//! ([`crate::scheme::verify`]).

use crate::linalg::modular::inverse_q;
use crate::linalg::{Matrix, inverse};
use crate::scalar::{Field, FieldSpec, PrimeField, Rationals};
use crate::scheme::construct::permute_axes;
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;

/// Parameters of [`evaluation_scheme`].
#[derive(Clone, Debug)]
pub struct EvaluationParams {
    /// Products with more result coefficients are left out (the evaluation matrix is
    /// inverted exactly; its entries grow like `h^N` for points of height h).
    pub max_terms: usize,
}

impl Default for EvaluationParams {
    fn default() -> Self {
        EvaluationParams { max_terms: 96 }
    }
}

/// The scheme and the product it was read as.
#[derive(Clone, Debug)]
pub struct Evaluation {
    /// Verified exactly against the tensor; rank `m + n - 1`.
    pub scheme: Scheme,
    /// The degrees bounds `(m, n)` of the two factors.
    pub factors: (usize, usize),
    /// The evaluation points `(a, b)`, standing for `a / b` (`(1, 0)`: infinity).
    pub points: Vec<(i64, i64)>,
}

/// The six orders of the three axes (`perm[a]` = the old axis that becomes axis a).
const AXIS_ORDERS: [[usize; 3]; 6] = [
    [0, 1, 2],
    [1, 0, 2],
    [0, 2, 1],
    [2, 0, 1],
    [1, 2, 0],
    [2, 1, 0],
];

/// A scheme of rank `m + n - 1` when `t` is a polynomial product (see the module
/// documentation), else `None` (also when the field has too few points or the product has
/// more than `max_terms` result coefficients). Cost: O(nnz) per axis order and basis
/// order (24 of them) to recognise the product; then one exact N x N inverse and one exact
/// verification, O(N^3) field operations.
pub fn evaluation_scheme(t: &Tensor, params: &EvaluationParams) -> Option<Evaluation> {
    let d = t.dims();
    for perm in AXIS_ORDERS {
        let [m, n, c] = perm.map(|a| d[a]);
        if m < 2 || n < 2 || c != m + n - 1 || c > params.max_terms || t.nnz() != m * n {
            continue;
        }
        let p = t.permute_axes(perm);
        let mut back = [0; 3];
        for (a, &old) in perm.iter().enumerate() {
            back[old] = a;
        }
        // reversing all three bases keeps the pattern: the result's order is fixed
        for rev in [[false, false], [true, false], [false, true], [true, true]] {
            let s = match t.field() {
                // the modular inverse: exact elimination over Q is slow on Vandermonde
                // matrices of large entries
                FieldSpec::Rational => product_scheme(&Rationals, &p, rev, |_, m| inverse_q(m)),
                FieldSpec::Prime(q) => product_scheme(&PrimeField::new(q)?, &p, rev, inverse),
            };
            let Some(s) = s else { continue };
            let scheme = permute_axes(&s.scheme, back).ok()?;
            if verify(&scheme, t).is_ok() {
                return Some(Evaluation { scheme, ..s });
            }
        }
    }
    None
}

/// The scheme of `p` over the field `f`, read as `x_i y_j -> z_(i+j)` with the first two
/// bases reversed as `rev` says, scaled; `None` when `p` is not of that form (checked only
/// by the caller's exact verification, except for the pattern of nonzero entries).
/// `invert` is the exact matrix inverse over `f`.
fn product_scheme<F: Field>(
    f: &F,
    p: &Tensor,
    rev: [bool; 2],
    invert: impl Fn(&F, &Matrix<F::Elem>) -> Option<Matrix<F::Elem>>,
) -> Option<Evaluation> {
    let [m, n, c] = p.dims();
    let ri = |i: usize| if rev[0] { m - 1 - i } else { i };
    let rj = |j: usize| if rev[1] { n - 1 - j } else { j };
    // the pattern: one nonzero entry per pair, at k = i + j (in degrees)
    let mut coef = vec![f.zero(); m * n];
    for (i, j, k, x) in p.entries() {
        let (di, dj) = (ri(i), rj(j));
        if k != di + dj {
            return None;
        }
        coef[di * n + dj] = f.from_rational(x)?;
    }
    let at = |i: usize, j: usize| &coef[i * n + j];
    let div = |a: &F::Elem, b: &F::Elem| Some(f.mul(a, &f.inv(b)?));
    // scalings with α_0 = β_0 = α_1 = 1; δ_k from the pair (max(1, k - n + 1), ...)
    let (mut alpha, mut beta, mut delta) = (vec![f.one(); m], vec![f.one(); n], vec![]);
    for k in 0..c {
        let i = if k == 0 {
            0
        } else {
            1.max((k + 1).saturating_sub(n))
        };
        let j = k - i;
        delta.push(div(at(i, j), &f.mul(&alpha[i], &beta[j]))?);
        if k >= 2 && k < m {
            alpha[k] = div(at(k, 0), &delta[k])?;
        }
        if k >= 1 && k < n {
            beta[k] = div(at(0, k), &delta[k])?;
        }
    }
    let points = projective_points(f, c)?;
    // a^l b^(deg-l) for the point (a, b)
    let power = |(a, b): (i64, i64), l: usize, deg: usize| -> F::Elem {
        let (a, b) = (f.from_i64(a), f.from_i64(b));
        let mut x = f.one();
        for s in 0..deg {
            x = f.mul(&x, if s < l { &a } else { &b });
        }
        x
    };
    // E[r][l] = a^l b^(c-1-l); the result factors are the rows of (E^T)^-1
    let mut et = Matrix::zeros(f, c, c);
    for (r, &pt) in points.iter().enumerate() {
        for l in 0..c {
            et[(l, r)] = power(pt, l, c - 1);
        }
    }
    let w = invert(f, &et)?;
    let mut scheme = Scheme::empty(p.field(), [m, n, c]);
    for (r, &pt) in points.iter().enumerate() {
        let u = (0..m).map(|i| f.mul(&alpha[ri(i)], &power(pt, ri(i), m - 1)));
        let v = (0..n).map(|j| f.mul(&beta[rj(j)], &power(pt, rj(j), n - 1)));
        let z = (0..c).map(|k| f.mul(&delta[k], &w[(r, k)]));
        let q = |x: F::Elem| f.to_rational(&x);
        scheme.push(u.map(q).collect(), v.map(q).collect(), z.map(q).collect());
    }
    Some(Evaluation {
        scheme,
        factors: (m, n),
        points,
    })
}

/// The first `count` points `(a, b)` of the projective line (`a / b`, `(1, 0)` infinity)
/// in the order 0, infinity, then by height `max(|a|, b)`: `h/1, -h/1, 1/h, -1/h, ...`,
/// distinct in the field (GF(p) has p + 1); `None` when the field has fewer.
/// Cost: O(count^2) field operations at most.
fn projective_points<F: Field>(f: &F, count: usize) -> Option<Vec<(i64, i64)>> {
    let size = (f.characteristic() > 0).then(|| f.characteristic() + 1);
    if size.is_some_and(|s| (count as u64) > s) {
        return None;
    }
    let mut out: Vec<(i64, i64)> = vec![(0, 1), (1, 0)];
    // the finite points as field elements (infinity is never among them)
    let mut seen = vec![f.zero()];
    let mut h = 1i64;
    while out.len() < count {
        if size.is_some_and(|s| h as u64 > s) {
            return None;
        }
        for b in 1..=h {
            for (a, b) in [(h, b), (-h, b), (b, h), (-b, h)] {
                if num_integer::gcd(a, b) != 1 || out.contains(&(a, b)) {
                    continue;
                }
                let x = f.mul(&f.from_i64(a), &f.inv(&f.from_i64(b))?);
                if seen.contains(&x) {
                    continue;
                }
                seen.push(x);
                out.push((a, b));
            }
        }
        h += 1;
    }
    out.truncate(count);
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::poly_mult;
    use crate::scalar::Q;
    use proptest::prelude::*;

    fn rank_of(t: &Tensor) -> Option<usize> {
        evaluation_scheme(t, &EvaluationParams::default()).map(|e| e.scheme.rank())
    }

    /// Toom 1963; Cook 1966 (from memory): the product of polynomials of degrees below m
    /// and n has rank m + n - 1 over Q, which the flattening onto the result proves.
    #[test]
    fn polynomial_products_have_rank_m_plus_n_minus_one() {
        for m in 2..=9 {
            for n in 2..=9 {
                let t = poly_mult(m, n).unwrap();
                assert_eq!(rank_of(&t), Some(m + n - 1), "poly:{m},{n}");
            }
        }
    }

    #[test]
    fn every_axis_order_and_basis_order_is_read() {
        let t = poly_mult(3, 5).unwrap();
        for perm in [[1, 0, 2], [0, 2, 1], [2, 0, 1], [1, 2, 0], [2, 1, 0]] {
            let p = t.permute_axes(perm);
            assert_eq!(rank_of(&p), Some(7), "{perm:?}");
            // the left basis in descending degree
            let mut r = Tensor::zero(p.field(), p.kind(), p.dims(), None);
            let d0 = p.dims()[0];
            for (i, j, k, x) in p.entries() {
                r.set(d0 - 1 - i, j, k, x.clone());
            }
            assert_eq!(rank_of(&r), Some(7), "{perm:?} reversed");
        }
    }

    /// Divided powers x^i / i!: x^(i) x^(j) = binom(i + j, i) x^(i+j) (common practice).
    #[test]
    fn divided_powers_are_a_scaled_product() {
        let (m, n) = (4, 5);
        let mut t = Tensor::zero(
            FieldSpec::Rational,
            crate::tensor::Kind::Bilinear,
            [m, n, m + n - 1],
            None,
        );
        let binom = |a: usize, b: usize| -> i64 {
            (0..b).fold(1i64, |acc, s| acc * (a - s) as i64 / (s as i64 + 1))
        };
        for i in 0..m {
            for j in 0..n {
                t.set(i, j, i + j, Q::from_integer(binom(i + j, i).into()));
            }
        }
        assert_eq!(rank_of(&t), Some(m + n - 1));
        // a perturbed entry is no longer a scaled product
        t.set(2, 2, 4, Q::from_integer(7.into()));
        assert_eq!(rank_of(&t), None);
    }

    #[test]
    fn over_gf_p_the_points_must_be_distinct() {
        let t = poly_mult(3, 3).unwrap();
        for (p, want) in [(2, None), (3, None), (5, Some(5)), (7, Some(5))] {
            let tp = t.with_field(FieldSpec::Prime(p)).unwrap();
            assert_eq!(rank_of(&tp), want, "GF({p})");
        }
        // GF(2) has three points: 0, 1 and infinity
        let t = poly_mult(2, 2)
            .unwrap()
            .with_field(FieldSpec::Prime(2))
            .unwrap();
        assert_eq!(rank_of(&t), Some(3), "GF(2)");
        let t = poly_mult(2, 3)
            .unwrap()
            .with_field(FieldSpec::Prime(2))
            .unwrap();
        assert_eq!(rank_of(&t), None, "GF(2), four points needed");
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(16))]
        /// The rank m + n - 1 does not depend on the scaling of the basis vectors nor on
        /// the order of the axes: every basis vector scaled by a random rational with
        /// numerator and denominator up to 10^6, the axes permuted at random.
        #[test]
        fn rank_survives_scaling_and_axis_order(
            m in 2usize..7,
            n in 2usize..7,
            perm in 0usize..6,
            seed in 0u64..1000,
        ) {
            use rand::{Rng, SeedableRng};
            let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
            let t = poly_mult(m, n).unwrap();
            let scale: Vec<Vec<Q>> = t
                .dims()
                .iter()
                .map(|&d| {
                    (0..d)
                        .map(|_| {
                            let a: i64 = rng.gen_range(1..=1_000_000);
                            let b: i64 = rng.gen_range(1..=1_000_000);
                            let sign = if rng.gen_bool(0.5) { -1 } else { 1 };
                            Q::new((sign * a).into(), b.into())
                        })
                        .collect()
                })
                .collect();
            let mut s = Tensor::zero(t.field(), t.kind(), t.dims(), None);
            for (i, j, k, x) in t.entries() {
                s.set(i, j, k, x * &scale[0][i] * &scale[1][j] * &scale[2][k]);
            }
            let s = s.permute_axes(AXIS_ORDERS[perm]);
            let e = evaluation_scheme(&s, &EvaluationParams::default());
            prop_assert_eq!(e.map(|e| e.scheme.rank()), Some(m + n - 1));
        }
    }

    #[test]
    fn other_tensors_are_refused() {
        let t = crate::generators::matmul(2, 2, 2).unwrap();
        assert_eq!(rank_of(&t), None);
        let mut t = poly_mult(3, 3).unwrap();
        t.set(0, 0, 1, Q::from_integer(1.into()));
        assert_eq!(rank_of(&t), None);
    }
}
