//! Multiplication in a commutative algebra with one generator, in any basis: a scheme of
//! rank `2n - t` by the Chinese remainder theorem and interpolation, which meets the
//! Alder-Strassen bound and so gives the rank exactly.
//!
//! Theorem (Winograd 1977, "Some bilinear forms whose multiplicative complexity depends
//! on the field of constants", Math. Systems Theory 10; the construction as in Winograd
//! 1980, "Arithmetic complexity of computations", SIAM; from memory):
//! over a field with enough points, multiplication in `F[x]/(f)`, `deg f = n`, has rank
//! `2n - t`, where t is the number of distinct monic irreducible factors of f. The lower
//! bound is Alder and Strassen's `2 dim A - t(A)` (an algebra with unit, t(A) maximal
//! two-sided ideals: here one per irreducible factor).
//!
//! Construction. Let A be the table's algebra with unit 1, of dimension n, and θ an element
//! whose powers `1, θ, ..., θ^(n-1)` are a basis (θ generates A: `A = F[θ] = F[x]/(f)`, f
//! the minimal polynomial of θ). Candidates for θ: the basis vectors first (the generator
//! of a cyclic group algebra is one), then seeded random integer combinations, small
//! ones first (each screened modulo a word prime); a
//! commutative semisimple algebra over Q always has a generator (primitive element
//! theorem): an element whose values in the fields are distinct, which a random
//! combination from a wide enough range is, with probability near 1. Factor
//! `f = prod g_i` with `g_i = p_i^(e_i)` powers of distinct irreducibles, `d_i = deg g_i`.
//! By the Chinese remainder theorem `a b = sum_i E_i (a_i b_i mod g_i) mod f`, with
//! `a_i = a mod g_i` and `E_i` the idempotent `≡ 1 mod g_i`, `≡ 0 mod g_j` (j ≠ i). The
//! product `c = a_i b_i` has degree at most `2 d_i - 2`: it is interpolated from its values
//! at `2 d_i - 2` finite points x_s (0, 1, -1, 2, -2, ...) and its leading coefficient
//! (the point at infinity), `c = sum_s a_i(x_s) b_i(x_s) L_s + a_i[d-1] b_i[d-1] N` (L_s
//! the Lagrange basis of the finite points, N their monic node polynomial); for `d_i = 1`
//! the one point 0. Each term is one product of two linear forms of a and b, so the scheme
//! has `sum_i (2 d_i - 1) = 2n - t` terms; left and right factors are the evaluation forms
//! written in the table's basis (through the inverse of the power matrix), the result
//! factor of term s is `(L_s E_i mod f)(θ)` in the table's basis.
//!
//! A bilinear map `U x V -> W` of equal dimensions, written in three bases (a product of
//! this kind in bases of the user's own, no unit in the table), is read through a unital
//! isotope `x o y = T(R^-1 x, L^-1 y)` ([`crate::ranks::isotope`]: the same rank, and an
//! algebra isomorphic to A when T is isotopic to an associative algebra A with unit).
//!
//! Over GF(p) the finite points must be distinct: `2 d_i - 2 <= p` for every factor, else
//! no scheme is returned. Invariant: a scheme is returned only after the exact check
//! against the tensor ([`crate::scheme::verify`]); a table that is not commutative and
//! associative simply fails it.

use crate::laws::{find_unit, find_unit_direct};
use crate::linalg::modular::inverse_q;
use crate::linalg::nullspace::SolveParams;
use crate::linalg::{Matrix, inverse};
use crate::poly;
use crate::ranks::isotope::unital_isotope;
use crate::scalar::{Field, FieldSpec, PrimeField, Q, Rationals};
use crate::scheme::{Scheme, verify};
use crate::tensor::{IntegralTensor, Table, Tensor};
use rand::{Rng, SeedableRng};

/// Parameters of [`monogenic_scheme`].
#[derive(Clone, Debug)]
pub struct MonogenicParams {
    /// Seed of the random candidates for a generator.
    pub seed: u64,
    /// Random candidates tried after the basis vectors.
    pub random_tries: usize,
    /// Tables of larger dimension are left out (the power matrix is inverted exactly and
    /// the minimal polynomial factored: about a second at 64 over Q in a dense basis).
    pub max_dim: usize,
}

impl Default for MonogenicParams {
    fn default() -> Self {
        MonogenicParams {
            seed: 1,
            random_tries: 16,
            max_dim: 64,
        }
    }
}

/// The scheme and what it was built from.
#[derive(Clone, Debug)]
pub struct Monogenic {
    /// Verified exactly against the tensor; rank `2n - t`.
    pub scheme: Scheme,
    /// The generator θ in the table's basis.
    pub generator: Vec<Q>,
    /// The minimal polynomial of θ, monic, constant term first.
    pub minimal_polynomial: Vec<Q>,
    /// Its distinct irreducible factors (monic) with their multiplicities: t of them.
    pub factors: Vec<(Vec<Q>, usize)>,
}

/// A scheme of rank `2n - t` for the multiplication of a commutative algebra with unit
/// and one generator (see the module documentation), or `None` when the table is not
/// square, no generator is found among the candidates, the field has too few points, or
/// the result does not verify. A table without a unit (a bilinear map in three bases of
/// its own) is read through a unital isotope ([`unital_isotope`]): `T(a, b) = (R a) o
/// (L b)`, so a scheme of `o` with left forms α_t and right forms β_t gives one of T with
/// `α_t R` and `β_t L`, of the same rank. Cost: per candidate n products and one n x n
/// rank mod p; then one exact inverse, one factorisation of a degree-n polynomial and one
/// exact verification, O(n^4) field operations in all.
pub fn monogenic_scheme(t: &Tensor, params: &MonogenicParams) -> Option<Monogenic> {
    let d = t.dims();
    if d[0] != d[1] || d[1] != d[2] || d[0] == 0 || d[0] > params.max_dim {
        return None;
    }
    let (fp, tp) = t.screening()?;
    if let Some(screen) = Screen::of(fp, &tp) {
        return of_algebra(t, &screen, params);
    }
    // the isotope modulo the screening prime first: commutative, or no scheme (a general
    // bilinear map is not isotopic to a commutative algebra; the exact isotope over Q
    // costs an inverse of large entries)
    let iso_p = unital_isotope(&tp).ok()?;
    if !is_commutative(&iso_p.algebra) {
        return None;
    }
    let (iso, screened) = match t.field() {
        FieldSpec::Prime(_) => {
            let screened = iso_p.algebra.clone();
            (iso_p, screened)
        }
        FieldSpec::Rational => {
            let iso = unital_isotope(t).ok()?;
            // the same u0 and v0 give the isotope over Q reduced mod p
            let screened = if (&iso.u0, &iso.v0) == (&iso_p.u0, &iso_p.v0) {
                iso_p.algebra
            } else {
                iso.algebra
                    .with_field(FieldSpec::Prime(fp.characteristic()))
                    .ok()?
            };
            (iso, screened)
        }
    };
    let m = of_algebra(&iso.algebra, &Screen::of(fp, &screened)?, params)?;
    let scheme = iso.pull_back(t, &m.scheme)?;
    verify(&scheme, t)
        .is_ok()
        .then_some(Monogenic { scheme, ..m })
}

/// An algebra reduced to the screening field: its table there and its unit.
struct Screen {
    fp: PrimeField,
    table: Table<u64>,
    one: Vec<u64>,
}

impl Screen {
    /// `tp` (a table over GF(p), the field of `fp`) with its unit; `None` without one.
    fn of(fp: PrimeField, tp: &Tensor) -> Option<Screen> {
        let table = tp.table(&fp);
        let one = find_unit_direct(&fp, &table)?;
        Some(Screen { fp, table, one })
    }
}

/// The scheme of a commutative algebra with unit and a generator, verified; `screen` is
/// the algebra reduced to the screening field.
fn of_algebra(t: &Tensor, screen: &Screen, params: &MonogenicParams) -> Option<Monogenic> {
    // commutative, else no generator can give a scheme
    if !is_commutative(t) {
        return None;
    }
    let theta = find_generator(screen, params)?;
    let m = match t.field() {
        FieldSpec::Rational => {
            // the unit by the shared modular solver (exact elimination over Q is slow on
            // a dense table with large entries)
            let it = IntegralTensor::from_tensor(t);
            let one = find_unit(&it, &SolveParams::default()).ok()??;
            build(&Rationals, t, &theta, one, |_, m| inverse_q(m))
        }
        // over GF(p) the screening field is the table's own
        FieldSpec::Prime(_) => build(&screen.fp, t, &theta, screen.one.clone(), inverse),
    }?;
    verify(&m.scheme, t).is_ok().then_some(m)
}

/// `e_i e_j = e_j e_i` for all basis vectors. Cost: O(nnz).
fn is_commutative(t: &Tensor) -> bool {
    t.entries().all(|(i, j, k, c)| t.get(j, i, k) == *c)
}

/// A generator among the candidates, screened modulo a word prime for a table over Q
/// (independent powers mod p are independent over Q, and the powers of a dense rational
/// table grow large), over the table's field otherwise. Cost: per candidate n products
/// and one n x n rank mod p.
fn find_generator(screen: &Screen, params: &MonogenicParams) -> Option<Vec<i64>> {
    let Screen { fp, table, one } = screen;
    candidates(one.len(), params).find(|theta| {
        let v: Vec<u64> = theta.iter().map(|&x| fp.from_i64(x)).collect();
        generates(fp, table, one, &v)
    })
}

/// The construction over the field context `f` from the generator `theta` and the unit
/// `one`; `invert` inverts a square matrix over `f`.
fn build<F: Field>(
    f: &F,
    t: &Tensor,
    theta: &[i64],
    one: Vec<F::Elem>,
    invert: impl Fn(&F, &Matrix<F::Elem>) -> Option<Matrix<F::Elem>>,
) -> Option<Monogenic> {
    let n = t.dims()[0];
    let table: Table<F::Elem> = t.table(f);
    let theta: Vec<F::Elem> = theta.iter().map(|&x| f.from_i64(x)).collect();
    // the power matrix P (column j = θ^j), θ^n, and the minimal polynomial of θ:
    // θ^n = sum c_j θ^j with c = P^-1 θ^n, f = x^n - sum c_j x^j
    let (left, powers, last) = powers_of(f, &table, &one, &theta);
    let p_inv = invert(f, &powers)?;
    let mut minpoly: Vec<F::Elem> = p_inv.mul_vec(f, &last).iter().map(|x| f.neg(x)).collect();
    minpoly.push(f.one());
    let factorisation = poly::factor(t.field(), &poly::to_rationals(f, &minpoly)).ok()?;
    let mut scheme = Scheme::empty(t.field(), [n, n, n]);
    let q = |v: &[F::Elem]| -> Vec<Q> { v.iter().map(|x| f.to_rational(x)).collect() };
    for (irreducible, mult) in &factorisation.factors {
        let p_i = poly::from_rationals(f, irreducible)?;
        let mut g = poly::one(f);
        for _ in 0..*mult {
            g = poly::mul(f, &g, &p_i);
        }
        let deg = poly::degree(&g)?;
        let idem = idempotent(f, &minpoly, &g)?;
        // the table's basis vectors as polynomials in θ (the columns of P^-1), mod g
        let residues: Vec<Vec<F::Elem>> = (0..n)
            .map(|k| {
                let mut col: Vec<F::Elem> = (0..n).map(|j| p_inv[(j, k)].clone()).collect();
                poly::trim(f, &mut col);
                poly::rem(f, &col, &g)
            })
            .collect();
        // the idempotent e = E(θ) in the table's basis and θ^m e, m <= 2 deg - 2
        let mut padded = idem;
        padded.resize(n, f.zero());
        let mut shifted = vec![powers.mul_vec(f, &padded)];
        for _ in 1..2 * deg - 1 {
            let next = left.mul_vec(f, shifted.last().expect("nonempty"));
            shifted.push(next);
        }
        for (form, basis_poly) in interpolation(f, deg)? {
            // the linear form a -> form(a mod g) on the table's basis vectors
            let u: Vec<F::Elem> = residues.iter().map(|r| form.apply(f, r, deg)).collect();
            // (basis_poly E)(θ) = sum_m basis_poly[m] θ^m e
            let mut w = vec![f.zero(); n];
            for (c, y) in basis_poly.iter().zip(&shifted) {
                if !f.is_zero(c) {
                    for (wi, yi) in w.iter_mut().zip(y) {
                        f.add_mul_assign(wi, c, yi);
                    }
                }
            }
            scheme.push(q(&u), q(&u), q(&w));
        }
    }
    Some(Monogenic {
        scheme,
        generator: q(&theta),
        minimal_polynomial: poly::to_rationals(f, &minpoly),
        factors: factorisation.factors,
    })
}

/// Candidates for a generator: the basis vectors, then seeded random vectors with entries
/// in -3..=3, then in wider ranges (up to -3000..=3000).
fn candidates(n: usize, params: &MonogenicParams) -> impl Iterator<Item = Vec<i64>> {
    let basis = (0..n).map(move |i| {
        let mut v = vec![0; n];
        v[i] = 1;
        v
    });
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    let random = (0..params.random_tries).map(move |k| {
        // wider ranges as the tries go on: a product of many fields needs an element
        // whose values in the fields are distinct (-3..=3, then -30..=30, ...)
        let b = [3i64, 30, 300, 3000][(4 * k / params.random_tries.max(1)).min(3)];
        (0..n).map(|_| rng.gen_range(-b..=b)).collect::<Vec<i64>>()
    });
    basis.chain(random)
}

/// A linear form and the polynomial its product multiplies.
type FormAndPoly<E> = (Form<E>, Vec<E>);

/// Left multiplication by θ, the power matrix and θ^n.
type PowerData<E> = (Matrix<E>, Matrix<E>, Vec<E>);

/// The matrix of left multiplication by θ, the power matrix of θ (column j = θ^j, j < n)
/// and θ^n. Cost: O(n^3) field operations.
fn powers_of<F: Field>(
    f: &F,
    table: &Table<F::Elem>,
    one: &[F::Elem],
    theta: &[F::Elem],
) -> PowerData<F::Elem> {
    let n = one.len();
    // left multiplication: (θ y)_k = sum_j L[k][j] y_j, L[k][j] = sum_i θ_i c_ijk
    let mut left = Matrix::zeros(f, n, n);
    for (i, ti) in theta.iter().enumerate() {
        if f.is_zero(ti) {
            continue;
        }
        for j in 0..n {
            for (k, c) in table.product(i, j) {
                f.add_mul_assign(&mut left[(*k, j)], ti, c);
            }
        }
    }
    let mut p = Matrix::zeros(f, n, n);
    let mut col = one.to_vec();
    for j in 0..n {
        for (i, x) in col.iter().enumerate() {
            p[(i, j)] = x.clone();
        }
        col = left.mul_vec(f, &col);
    }
    (left, p, col)
}

/// True when `1, θ, ..., θ^(n-1)` are independent (θ generates the algebra).
fn generates<F: Field>(f: &F, table: &Table<F::Elem>, one: &[F::Elem], theta: &[F::Elem]) -> bool {
    crate::linalg::rank(f, &powers_of(f, table, one, theta).1) == one.len()
}

/// The idempotent E with `E ≡ 1 mod g` and `E ≡ 0 mod f/g` (g a factor of f coprime to
/// f/g), reduced mod f.
fn idempotent<F: Field>(f: &F, minpoly: &[F::Elem], g: &[F::Elem]) -> Option<Vec<F::Elem>> {
    let (cofactor, r) = poly::divrem(f, minpoly, g);
    if poly::degree(&r).is_some() {
        return None;
    }
    // s cofactor + t g = 1 (the gcd is monic)
    let (gcd, s, _) = poly::ext_gcd(f, &cofactor, g);
    if poly::degree(&gcd) != Some(0) {
        return None;
    }
    Some(poly::rem(f, &poly::mul(f, &s, &cofactor), minpoly))
}

/// A linear form on polynomials of degree below `d`: evaluation at a point, or the
/// coefficient of `x^(d-1)` (the point at infinity).
enum Form<E> {
    At(E),
    Infinity,
}

impl<E: Clone> Form<E> {
    fn apply<F: Field<Elem = E>>(&self, f: &F, a: &[E], d: usize) -> E {
        match self {
            Form::At(x) => poly::eval(f, a, x),
            Form::Infinity => a.get(d - 1).cloned().unwrap_or_else(|| f.zero()),
        }
    }
}

/// The `2d - 1` forms and the polynomials they multiply in the interpolation of a
/// product of two polynomials of degree below d: `c = sum_s form_s(a) form_s(b) poly_s`.
/// `None` when the field has fewer than `2d - 2` distinct small points.
fn interpolation<F: Field>(f: &F, d: usize) -> Option<Vec<FormAndPoly<F::Elem>>> {
    if d == 1 {
        return Some(vec![(Form::At(f.zero()), poly::one(f))]);
    }
    let count = 2 * d - 2;
    let points: Vec<F::Elem> = (0..count as i64)
        .map(|s| f.from_i64(if s % 2 == 1 { (s + 1) / 2 } else { -(s / 2) }))
        .collect();
    for (a, x) in points.iter().enumerate() {
        if points[..a].contains(x) {
            return None;
        }
    }
    let linear = |x: &F::Elem| vec![f.neg(x), f.one()];
    let mut node = poly::one(f);
    for x in &points {
        node = poly::mul(f, &node, &linear(x));
    }
    let mut out = Vec::with_capacity(2 * d - 1);
    for (a, xa) in points.iter().enumerate() {
        let mut l = poly::one(f);
        let mut denom = f.one();
        for (b, xb) in points.iter().enumerate() {
            if a != b {
                l = poly::mul(f, &l, &linear(xb));
                denom = f.mul(&denom, &f.sub(xa, xb));
            }
        }
        let inv = f.inv(&denom)?;
        out.push((Form::At(xa.clone()), poly::scale(f, &inv, &l)));
    }
    out.push((Form::Infinity, node));
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::{cyclic_group_algebra, matrix_algebra, quotient_ring};
    use crate::tensor::{change_basis_algebra, random_invertible};
    use proptest::prelude::*;

    fn z(n: i64) -> Q {
        Q::from_integer(n.into())
    }

    fn scheme_rank(t: &Tensor) -> Option<(usize, usize)> {
        let m = monogenic_scheme(t, &MonogenicParams::default())?;
        Some((m.scheme.rank(), m.factors.len()))
    }

    /// Winograd's theorem (Winograd 1977, Math. Systems Theory 10, from memory): multiplication in Q[x]/(f) has
    /// rank 2n - t, t the number of distinct irreducible factors of f. The factorisations
    /// of x^n - 1 into cyclotomic polynomials (one per divisor of n) are textbook facts
    /// (common practice).
    #[test]
    fn cyclic_convolutions_take_two_n_minus_the_divisor_count() {
        for (n, divisors) in [
            (1, 1),
            (2, 2),
            (3, 2),
            (4, 3),
            (5, 2),
            (6, 4),
            (7, 2),
            (8, 4),
            (12, 6),
        ] {
            let t = cyclic_group_algebra(n).unwrap();
            assert_eq!(scheme_rank(&t), Some((2 * n - divisors, divisors)), "C{n}");
        }
    }

    /// Q[x]/(x^n): one factor, rank 2n - 1 (the truncated product); Q[x]/(x^2 + 1) is the
    /// complex product, rank 3; Q[x]/((x^2 + 1)^2 (x - 2)): two factors, rank 8.
    #[test]
    fn quotient_rings_take_two_n_minus_t() {
        let cases: Vec<(Vec<Q>, usize)> = vec![
            (vec![z(0), z(0), z(0), z(0), z(1)], 7),
            (vec![z(1), z(0), z(1)], 3),
            // (x^2 + 1)^2 (x - 2) = x^5 - 2x^4 + 2x^3 - 4x^2 + x - 2
            (vec![z(-2), z(1), z(-4), z(2), z(-2), z(1)], 8),
        ];
        for (f, rank) in cases {
            let t = quotient_ring(&f).unwrap();
            assert_eq!(scheme_rank(&t).map(|r| r.0), Some(rank), "{f:?}");
        }
    }

    /// Over GF(p) the construction needs 2d - 2 distinct points per factor of degree d:
    /// GF(7)[C5] (x^5 - 1 = (x - 1)(x^4 + ...), irreducible quartic mod 7: 4 is the order of 7 mod 5)
    /// takes 1 + 7 = 8;
    /// over GF(2) a factor of degree 3 needs 4 points and is refused.
    #[test]
    fn prime_fields_need_enough_points() {
        let t = cyclic_group_algebra(5).unwrap();
        let t7 = t.with_field(FieldSpec::Prime(7)).unwrap();
        assert_eq!(scheme_rank(&t7).map(|r| r.0), Some(8));
        let t2 = cyclic_group_algebra(7)
            .unwrap()
            .with_field(FieldSpec::Prime(2))
            .unwrap();
        assert_eq!(scheme_rank(&t2), None);
    }

    #[test]
    fn tables_without_unit_or_generator_are_left_out() {
        // Q x Q x Q x Q has a generator; Q[x, y]/(x^2, xy, y^2) does not
        let mut t = Tensor::algebra(
            FieldSpec::Rational,
            vec!["1".into(), "x".into(), "y".into()],
        );
        t.set(0, 0, 0, z(1));
        for i in 1..3 {
            t.set(0, i, i, z(1));
            t.set(i, 0, i, z(1));
        }
        assert_eq!(scheme_rank(&t), None);
        let matrices = matrix_algebra(2).unwrap();
        assert_eq!(scheme_rank(&matrices), None);
    }

    /// A convolution in three bases of the user's own (one random change of basis per
    /// space, entries up to 10^6): no unit in the table, the isotope gives the same 2n - t.
    #[test]
    fn a_product_in_three_bases_goes_through_an_isotope() {
        for (n, rank) in [(3, 4), (5, 8), (6, 8)] {
            let t = cyclic_group_algebra(n).unwrap();
            let [p, r, s] = [1, 2, 3].map(|k| random_invertible(n, 1_000_000, 40 + k));
            let map = crate::tensor::change_basis(&t, &p, &r, &s).unwrap();
            let m = monogenic_scheme(&map, &MonogenicParams::default()).expect("a scheme");
            assert_eq!(m.scheme.rank(), rank, "C{n}");
            assert!(verify(&m.scheme, &map).is_ok());
        }
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(12))]
        /// The rank 2n - t does not depend on the basis: a table in a basis of the user's
        /// own (entries up to 10^6) gets the same rank, verified exactly.
        #[test]
        fn rank_is_basis_free(n in 2usize..9, seed in 0u64..1000) {
            let t = cyclic_group_algebra(n).unwrap();
            let p = random_invertible(n, 1_000_000, seed);
            let dense = change_basis_algebra(&t, &p).unwrap();
            prop_assert_eq!(scheme_rank(&dense), scheme_rank(&t));
        }
    }
}
