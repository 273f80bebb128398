//! The matrix product `<n,m,p>` written in three bases of the user's own: bases of the
//! three spaces in which it is the standard product, found exactly.
//!
//! Theorem (common practice). For `T(A, B) = A B` on `U = F^(n x m)`, `V = F^(m x p)`,
//! `W = F^(n x p)`, the left multipliers (the maps a on U with `T(a u, v) = c T(u, v)` for
//! some c on W) are `A -> X A`, `X` in `M_n(F)`: a full matrix algebra, the first maps of
//! the adjoint pairs of the tensor with its axes (U, W, V)
//! ([`crate::invariants::bilinear`]). Every permutation of the axes of a matrix product
//! is a matrix product of the permuted format (`tr(A B C)` is invariant under rotations,
//! `(A B)^T = B^T A^T`).
//!
//! Method, for `p < m` with `gcd(m, p) = 1`:
//! 1. The kernel `{u : T(u, v_t) = 0}` of a seeded random `v_t` is `F^n (x) Y_t` (the
//!    rows of A orthogonal to the columns of `B_t`); a word in such kernels, sums and
//!    intersections ([`super::frame_module`]; one common kernel of s vectors when
//!    `m = s p + 1`) gives `{x y0^T : x in F^n}`: a simple module of the left
//!    multipliers, read as `F^n`. The representation on it is an isomorphism onto
//!    `M_n(F)`, and its inverse gives the units `l_ij` whatever the size of the basis
//!    entries (no eigenvalue is needed).
//! 2. `u_0k`: a basis of the image of `l_00` (`{x0 y^T}`), `u_ik = l_i0 u_0k`.
//! 3. `w_0j`: a basis of `T(u_00, V)` (`{x0 z^T}`); `v_kj`: the unique solution of
//!    `T(u_0k', v) = δ_kk' w_0j` (the map `v -> (T(u_0k', v))_k'` is injective).
//! 4. `w_ij = T(u_i0, v_0j)`. Then `T(u_ik, v_k'j) = δ_kk' w_ij`: with `l_i0` acting on W
//!    as some `c_i0`, `T(u_ik, v_k'j) = c_i0 T(u_0k, v_k'j) = δ_kk' c_i0 w_0j` and
//!    `w_ij = c_i0 w_0j`.
//!
//! The permutations of the axes put every pair of sides in the place of (m, p), so a
//! format is found when two of its sides are coprime and distinct: `<2,2,3>`, `<2,3,4>`,
//! `<3,3,4>`, `<3,3,5>`, `<3,4,5>`, `<3,5,5>`, `<2,2,5>`, `<4,4,5>`, any format with a
//! side 1 and another above 1. Not `<2,2,4>`, `<2,4,4>` or a square format: there every
//! such word gives a sum of several simple modules, and splitting it needs a zero divisor
//! of a matrix algebra in the user's basis (for a square format, an algebra's isotope,
//! [`super::matrix_units`], which finds one when the basis entries are small).
//!
//! Invariant: a frame is returned only after the change of basis it defines turns the
//! tensor into the standard product exactly ([`crate::tensor::change_basis`]).

use super::frame_module::{Coefficients, ModuleWord, coefficients, module_of, plan_module};
use crate::invariants::bilinear::{MapInvariant, map_invariant};
use crate::linalg::integer_rows::IntegerRows;
use crate::linalg::modular::inverse_exact;
use crate::linalg::nullspace::SolveParams;
use crate::linalg::subspace::{Subspace, span, unit_vector};
use crate::linalg::{Matrix, rref};
use crate::scalar::{Field, PrimeField, Q};
use crate::tensor::{AXIS_PERMUTATIONS, IntegralTensor, Tensor, change_basis};
use rand::{Rng, SeedableRng};

/// Parameters of [`find_matrix_frame`] and [`frame_in`].
#[derive(Clone, Debug)]
pub struct FrameParams {
    pub solve: SolveParams,
    /// Seed of the random vectors whose kernels give the first simple module.
    pub seed: u64,
    /// Tensors with a larger side are left out (the left multipliers are a kernel in
    /// `a^2 + c^2` unknowns).
    pub max_dim: usize,
    /// Draws of the random vectors tried (seeds `seed`, `seed + 1`, ...): over a small
    /// field a draw is out of general position with a probability of about `1 / q` per
    /// condition, and a failed draw is retried.
    pub tries: usize,
}

impl Default for FrameParams {
    fn default() -> Self {
        FrameParams {
            solve: SolveParams::default(),
            seed: 1,
            max_dim: 36,
            tries: 4,
        }
    }
}

/// `[n, m, p]` with `n m = a`, `m p = b`, `n p = c`, if the dimensions are those of a
/// matrix product.
pub fn format_of_dims([a, b, c]: [usize; 3]) -> Option<[usize; 3]> {
    let side = |num: usize, den: usize| -> Option<usize> {
        if den == 0 || !num.is_multiple_of(den) {
            return None;
        }
        let x = num / den;
        let r = (x as f64).sqrt().round() as usize;
        (r > 0 && r * r == x).then_some(r)
    };
    let f = [side(a * c, b)?, side(a * b, c)?, side(b * c, a)?];
    (f[0] * f[1] == a && f[1] * f[2] == b && f[0] * f[2] == c).then_some(f)
}

/// Whether the first simple module is reached for the format `<n,m,p>`: `p < m` and
/// `gcd(m, p) = 1` ([`plan_module`]).
pub fn has_module([_, m, p]: [usize; 3]) -> bool {
    plan_module(m, p).is_some()
}

/// The permutations of the axes of a tensor of dimensions `d` for which the method
/// applies (every permutation of a matrix product's axes is a matrix product of the
/// permuted format: `tr(A B C)` is invariant under rotations, and `(A B)^T = B^T A^T`), each with the permuted format, the cheapest left multiplier system first
/// (`a^2 + c^2` unknowns); empty when the dimensions are not those of a matrix product.
pub fn candidate_permutations(d: [usize; 3]) -> Vec<([usize; 3], [usize; 3])> {
    let mut out: Vec<([usize; 3], [usize; 3])> = AXIS_PERMUTATIONS
        .iter()
        .filter_map(|&perm| Some((perm, format_of_dims(perm.map(|i| d[i]))?)))
        .filter(|(_, f)| has_module(*f))
        .collect();
    out.sort_by_key(|(perm, _)| d[perm[0]].pow(2) + d[perm[2]].pow(2));
    out
}

/// The frame of a matrix product `<n,m,p>` in the tensor's coordinates: `us[i m + k]`
/// (the matrix unit `E_ik` of U), `vs[k p + j]`, `ws[i p + j]` (the indices of the
/// generator `matmul:n,m,p`), with `T(u_ik, v_k'j) = δ_kk' w_ij`.
#[derive(Clone, Debug)]
pub struct FrameVectors<E> {
    pub us: Vec<Vec<E>>,
    pub vs: Vec<Vec<E>>,
    pub ws: Vec<Vec<E>>,
}

/// A frame found and checked: `change_basis(t.permute_axes(perm), bases)` is the generator
/// `matmul:` of `permuted` exactly.
#[derive(Clone, Debug)]
pub struct MatrixFrame {
    /// `[n, m, p]`: the tensor is `<n,m,p>` in some bases of its three spaces.
    pub format: [usize; 3],
    /// The permutation of the axes the frame is written for.
    pub perm: [usize; 3],
    /// The format of the permuted tensor.
    pub permuted: [usize; 3],
    /// Columns: the frame vectors of the permuted tensor's three axes.
    pub bases: [Matrix<Q>; 3],
}

/// The checked frame of `t.permute_axes(perm)` (see [`MatrixFrame`]), or `None`. Cost:
/// that of [`frame_in`] and one change of basis.
pub fn frame_for(t: &Tensor, perm: [usize; 3], params: &FrameParams) -> Option<[Matrix<Q>; 3]> {
    let moved = t.permute_axes(perm);
    let permuted = format_of_dims(moved.dims())?;
    if !has_module(permuted) {
        return None;
    }
    let bases = crate::with_field!(t.field(), f => {
        let fv = frame_in(f, &moved, permuted, params)?;
        let to_q = |vs: &[Vec<_>]| -> Matrix<Q> {
            let d = vs.len();
            Matrix::from_rows(
                vs.iter().map(|v| v.iter().map(|x| f.to_rational(x)).collect()).collect(),
                d,
            )
            .transpose()
        };
        Some([to_q(&fv.us), to_q(&fv.vs), to_q(&fv.ws)])
    })?;
    let [n, m, p] = permuted;
    let model = crate::generators::matmul(n, m, p)
        .ok()?
        .with_field(t.field())
        .ok()?;
    let [bu, bv, bw] = &bases;
    let image = change_basis(&moved, bu, bv, bw)?;
    crate::iso::same_constants(&image, &model).then_some(bases)
}

/// The frame of a matrix product written in bases of its own (see the module
/// documentation), for the first permutation of [`candidate_permutations`] that gives
/// one; `None` when the format is not reached or the tensor is not a matrix product.
pub fn find_matrix_frame(t: &Tensor, params: &FrameParams) -> Option<MatrixFrame> {
    let format = format_of_dims(t.dims())?;
    candidate_permutations(t.dims())
        .into_iter()
        .find_map(|(perm, permuted)| {
            Some(MatrixFrame {
                format,
                perm,
                permuted,
                bases: frame_for(t, perm, params)?,
            })
        })
}

/// Linear combinations of fixed vectors over F, computed over one common denominator
/// ([`IntegerRows`]): the maps and vectors of a user's dense basis have entries of hundreds
/// of bits, and a gcd per operation would dominate.
struct Rows {
    rows: IntegerRows,
}

impl Rows {
    fn new<F: Field>(f: &F, rows: &[Vec<F::Elem>], len: usize) -> Rows {
        let q: Vec<Vec<Q>> = rows
            .iter()
            .map(|r| r.iter().map(|x| f.to_rational(x)).collect())
            .collect();
        Rows {
            rows: IntegerRows::new(&q, len),
        }
    }

    /// `sum_k c_k rows_k`.
    fn combine<F: Field>(&self, f: &F, c: &[F::Elem]) -> Option<Vec<F::Elem>> {
        let c: Vec<Q> = c.iter().map(|x| f.to_rational(x)).collect();
        self.rows
            .combine(&c)
            .iter()
            .map(|x| f.from_rational(x))
            .collect()
    }
}

/// A linear map on F^d (stored row-major, `[l][i]` at `l d + i`: basis vector i goes to
/// `sum_l m[l][i] e_l`), kept as its columns for [`Map::apply`].
struct Map {
    cols: Rows,
    d: usize,
}

impl Map {
    fn new<F: Field>(f: &F, m: &[F::Elem], d: usize) -> Map {
        Map {
            cols: Rows::new(f, &columns(m, d), d),
            d,
        }
    }

    /// `m x`.
    fn apply<F: Field>(&self, f: &F, x: &[F::Elem]) -> Option<Vec<F::Elem>> {
        debug_assert_eq!(x.len(), self.d);
        self.cols.combine(f, x)
    }
}

/// The columns of a row-major map on F^d.
fn columns<E: Clone>(m: &[E], d: usize) -> Vec<Vec<E>> {
    (0..d)
        .map(|i| (0..d).map(|l| m[l * d + i].clone()).collect())
        .collect()
}

/// One multiplier algebra: the first maps of a basis of its pairs, on F^d.
struct Side<E> {
    first: Vec<Vec<E>>,
    rows: Rows,
    d: usize,
}

impl<E: Clone> Side<E> {
    /// The map `sum_s c_s first_s`.
    fn element<F: Field<Elem = E>>(&self, f: &F, c: &[E]) -> Option<Map> {
        Some(Map::new(f, &self.rows.combine(f, c)?, self.d))
    }
}

/// The left multipliers of `T: U x V -> W` (the maps a on U with `T(a u, v) = c T(u, v)`
/// for some c on W): the first maps of the adjoint pairs of the tensor with its axes
/// (U, W, V), when the space has dimension `expect`. The conditions are taken first for s
/// seeded random v only (the tensor restricted on V to their span: `a c s` equations
/// instead of `a b c`, s the least with `a c s >= a^2 + c^2`, plus 2); the solutions
/// contain the left multipliers, and a space of dimension `expect` is exactly theirs. A
/// larger one falls back to every v.
fn left_multipliers<F: Field>(
    f: &F,
    t: &Tensor,
    expect: usize,
    sp: &SolveParams,
    rng: &mut impl Rng,
) -> Option<Side<F::Elem>> {
    let tp = t.permute_axes([0, 2, 1]);
    let [a, c, b] = tp.dims();
    let s = (a * a + c * c).div_ceil(a * c) + 2;
    let mut space = None;
    if s < b {
        let r: Vec<Vec<Q>> = (0..s)
            .map(|_| {
                (0..b)
                    .map(|_| Q::from_integer(rng.gen_range(-3..=3).into()))
                    .collect()
            })
            .collect();
        let mut restricted = Tensor::zero(tp.field(), tp.kind(), [a, c, s], None);
        for (u, w, v, x) in tp.entries() {
            for (j, rj) in r.iter().enumerate() {
                if !num_traits::Zero::is_zero(&rj[v]) {
                    restricted.add(u, w, j, &(x * &rj[v]));
                }
            }
        }
        let it = IntegralTensor::from_tensor(&restricted);
        space = map_invariant(&it, MapInvariant::AdjointPairs, sp)
            .ok()
            .filter(|found| found.dim() == expect);
    }
    let space = match space {
        Some(found) => found,
        None => map_invariant(
            &IntegralTensor::from_tensor(&tp),
            MapInvariant::AdjointPairs,
            sp,
        )
        .ok()?,
    };
    if space.dim() != expect {
        return None;
    }
    let first: Vec<Vec<F::Elem>> = (0..expect)
        .map(|i| {
            space.dense(i)[..a * a]
                .iter()
                .map(|x| f.from_rational(x))
                .collect::<Option<_>>()
        })
        .collect::<Option<_>>()?;
    Some(Side {
        rows: Rows::new(f, &first, a * a),
        first,
        d: a,
    })
}

/// The image of a map.
fn image<F: Field>(f: &F, m: &Map, sp: &SolveParams) -> Option<Subspace<F::Elem>> {
    let d = m.d;
    let cols: Vec<Vec<F::Elem>> = (0..d)
        .map(|i| m.apply(f, &unit_vector(f, d, i)))
        .collect::<Option<_>>()?;
    span(f, &cols, d, sp).ok()
}

/// Matrix units of the algebra spanned by `ops` (maps on F^d) from a simple module `s`
/// of dimension k with `ops.len() = k^2`: the representation `ρ(op)[j][l]` = coordinate j
/// of `op s_l` is an isomorphism onto `M_k(F)`, and unit `E_jl` (index `j k + l`) is the
/// coefficient vector of `ρ^-1(e_jl)`. `None` when ρ is not invertible.
/// Cost: `k^3` applications of maps and one inverse of size `k^2`.
fn units_from_module<F: Field>(
    f: &F,
    ops: &[Vec<F::Elem>],
    d: usize,
    s: &Subspace<F::Elem>,
) -> Option<Vec<Vec<F::Elem>>> {
    let k = s.dim();
    if ops.len() != k * k || k == 0 {
        return None;
    }
    let mut rho = Matrix::zeros(f, k * k, k * k);
    for (c, op) in ops.iter().enumerate() {
        let op = Map::new(f, op, d);
        for (l, x) in s.basis.iter().enumerate() {
            // coordinates read at the pivots: a space that is not invariant gives wrong
            // units, which the final verification rejects
            let coords = s.coords(&op.apply(f, x)?);
            for (j, cj) in coords.into_iter().enumerate() {
                rho.data[(j * k + l) * (k * k) + c] = cj;
            }
        }
    }
    let inv = inverse_exact(f, &rho)?;
    Some((0..k * k).map(|idx| inv.column(idx)).collect())
}

/// `x -> (y -> T(x, y))`: the slices `T(e_i, .)` (b x c, row-major) as rows.
struct Slices {
    rows: Rows,
    dims: [usize; 3],
}

impl Slices {
    fn new<F: Field>(f: &F, c: &Coefficients<F::Elem>, dims: [usize; 3]) -> Slices {
        let [a, b, cd] = dims;
        let mut rows = vec![vec![f.zero(); b * cd]; a];
        for (i, j, k, v) in c {
            rows[*i][j * cd + k] = v.clone();
        }
        Slices {
            rows: Rows::new(f, &rows, b * cd),
            dims,
        }
    }

    /// `T(x, .)` as rows `T(x, e_j)`.
    fn at<F: Field>(&self, f: &F, x: &[F::Elem]) -> Option<Rows> {
        let [_, b, c] = self.dims;
        let flat = self.rows.combine(f, x)?;
        let rows: Vec<Vec<F::Elem>> = flat.chunks(c).map(<[_]>::to_vec).collect();
        debug_assert_eq!(rows.len(), b);
        Some(Rows::new(f, &rows, c))
    }
}

/// Indices of `g.len()` linearly independent columns of the matrix with rows `g` (the
/// equations of the system `x^T G = r^T` that determine x), chosen modulo a word prime
/// over Q (independent there, so over Q) and in the field over GF(q); `None` when the
/// rows are dependent.
fn independent_columns<F: Field>(f: &F, g: &[Vec<F::Elem>]) -> Option<Vec<usize>> {
    let cols = g.first()?.len();
    if f.characteristic() != 0 {
        // over GF(q) in the field itself: independence of the representatives modulo
        // another prime says nothing
        let mut m = Matrix::from_rows(g.to_vec(), cols);
        let pivots = rref(f, &mut m);
        return (pivots.len() == g.len()).then_some(pivots);
    }
    for p in crate::scalar::word_primes(4) {
        let fp = PrimeField::new(p)?;
        let Some(rows) = g
            .iter()
            .map(|r| {
                r.iter()
                    .map(|x| fp.from_rational(&f.to_rational(x)))
                    .collect()
            })
            .collect::<Option<Vec<Vec<u64>>>>()
        else {
            continue;
        };
        let mut m = Matrix::from_rows(rows, cols);
        let pivots = rref(&fp, &mut m);
        if pivots.len() == g.len() {
            return Some(pivots);
        }
    }
    None
}

/// The frame vectors of a tensor whose format `[n, m, p]` has `p < m` and
/// `gcd(m, p) = 1` (see the module documentation), over the field context f; not yet checked (a tensor that is not
/// this matrix product gives `None` or vectors that fail the caller's check). Cost: one
/// kernel of `a b c` equations in `a^2 + c^2` unknowns, inverses of sizes `n^2` and b,
/// `O(a^2 + b^2)` combinations of rows.
pub fn frame_in<F: Field>(
    f: &F,
    t: &Tensor,
    [n, m, p]: [usize; 3],
    params: &FrameParams,
) -> Option<FrameVectors<F::Elem>> {
    let dims = t.dims();
    if dims.iter().any(|&x| x == 0 || x > params.max_dim) || [n * m, m * p, n * p] != dims {
        return None;
    }
    let word = plan_module(m, p)?;
    let coef = coefficients(f, t)?;
    let table = Table {
        slices: Slices::new(f, &coef, dims),
        coef,
        word,
    };
    (0..params.tries.max(1) as u64).find_map(|k| {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed.wrapping_add(k));
        frame_from_draw(f, t, [n, m, p], &table, params, &mut rng)
    })
}

/// What every draw of [`frame_in`] reads: the tensor's coefficients over the field, its
/// slices, and the word that cuts out the module.
struct Table<E> {
    coef: Coefficients<E>,
    slices: Slices,
    word: ModuleWord,
}

/// One attempt of [`frame_in`] with the random vectors drawn from `rng`.
fn frame_from_draw<F: Field>(
    f: &F,
    t: &Tensor,
    [n, m, p]: [usize; 3],
    table: &Table<F::Elem>,
    params: &FrameParams,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Option<FrameVectors<F::Elem>> {
    let dims = t.dims();
    let [a, b, c] = dims;
    let sp = &params.solve;
    let slices = &table.slices;
    // a simple left module in U: {x y0^T}, cut out by kernels {A : A B_t = 0}
    let module = module_of(f, &table.coef, dims, &table.word, sp, rng)?;
    if module.dim() != n {
        return None;
    }
    let left = left_multipliers(f, t, n * n, sp, rng)?;
    let lu = units_from_module(f, &left.first, a, &module)?;
    let l: Vec<Map> = (0..n)
        .map(|i| left.element(f, &lu[i * n]))
        .collect::<Option<_>>()?;
    // u_0k: a basis of the image of l_00 ({x0 y^T}), u_ik = l_i0 u_0k
    let row0 = image(f, &l[0], sp)?;
    if row0.dim() != m {
        return None;
    }
    let mut us = vec![Vec::new(); a];
    for (k, u0k) in row0.basis.iter().enumerate() {
        for i in 0..n {
            us[i * m + k] = l[i].apply(f, u0k)?;
        }
    }
    // w_0j: a basis of T(u_00, V) ({x0 z^T}); v_kj: the solution of
    // T(u_0k', v) = δ_kk' w_0j (unique: v -> (T(u_0k', v))_k' is injective)
    let at: Vec<Rows> = row0
        .basis
        .iter()
        .map(|u| slices.at(f, u))
        .collect::<Option<_>>()?;
    let images: Vec<Vec<F::Elem>> = (0..b)
        .map(|v| at[0].combine(f, &unit_vector(f, b, v)))
        .collect::<Option<_>>()?;
    let w0 = span(f, &images, c, sp).ok()?;
    if w0.dim() != p {
        return None;
    }
    // G[v] = (T(u_0k', e_v))_k', rows of length m c
    let g: Vec<Vec<F::Elem>> = (0..b)
        .map(|v| {
            let e = unit_vector(f, b, v);
            let mut row = Vec::with_capacity(m * c);
            for r in &at {
                row.extend(r.combine(f, &e)?);
            }
            Some(row)
        })
        .collect::<Option<_>>()?;
    let pick = independent_columns(f, &g)?;
    let square = Matrix::from_rows(
        g.iter()
            .map(|r| pick.iter().map(|&j| r[j].clone()).collect())
            .collect(),
        b,
    );
    // x^T S = rhs^T: x = S^-T rhs
    let inv_rows = Rows::new(f, &inverse_exact(f, &square)?.to_rows(), b);
    let mut vs = vec![Vec::new(); b];
    for k in 0..m {
        for (j, w) in w0.basis.iter().enumerate() {
            let rhs: Vec<F::Elem> = pick
                .iter()
                .map(|&col| {
                    let (kk, coord) = (col / c, col % c);
                    if kk == k { w[coord].clone() } else { f.zero() }
                })
                .collect();
            vs[k * p + j] = inv_rows.combine(f, &rhs)?;
        }
    }
    let mut ws = Vec::with_capacity(n * p);
    for i in 0..n {
        let at = slices.at(f, &us[i * m])?;
        for v in &vs[..p] {
            ws.push(at.combine(f, v)?);
        }
    }
    Some(FrameVectors { us, vs, ws })
}

#[cfg(test)]
#[path = "matrix_frame_tests.rs"]
pub(crate) mod tests;
