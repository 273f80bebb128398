//! The structure of a Lie algebra L over Q (characteristic 0): the solvable radical, the
//! nilradical, the dimension of a Levi factor and of a Cartan subalgebra, each checked
//! exactly against its definition.
//!
//! - *Solvable radical* R: the orthogonal complement of `[L, L]` for the Killing form
//!   `kappa(x, y) = Tr(ad_x ad_y)` (Jacobson 1962, Lie Algebras, ch. III, sect. 9;
//!   characteristic 0). Checked: R is an ideal, R is solvable (its derived series reaches
//!   0) and `L / R` is semisimple (its Killing form is nondegenerate, Cartan's criterion);
//!   then every solvable ideal lies in R, so R is the radical.
//! - *Levi factor*: `L = S (+) R` with S semisimple, `S = L / R` (Levi 1905; Jacobson
//!   1962, ch. III, sect. 9): its dimension is `dim L - dim R`.
//! - *Nilradical* N (the largest nilpotent ideal): `N = {x in R : ad_x nilpotent}`. By
//!   Lie's theorem `ad R` is triangular over the algebraic closure, with diagonal entries
//!   the weights `lambda_i` of R on L; for y in R with pairwise distinct values on the
//!   distinct weights, `Tr(ad_x ad_y^k) = sum_i lambda_i(x) lambda_i(y)^k = 0` for
//!   k = 0..n-1 forces every `lambda_i(x) = 0` (a Vandermonde system), while every x in N
//!   satisfies these equations. So N is cut out of R by n linear equations for a random y
//!   (a worked argument of ours from Lie's theorem; Jacobson 1962, ch. II). Checked: the
//!   result is an ideal and nilpotent (its lower central series reaches 0), so it lies in
//!   the nilradical; it contains it by the equations. A y that fails is replaced.
//! - *Cartan subalgebra*: for x in L, `L_0(ad x) = ker (ad_x)^n` is a self-normalising
//!   subalgebra (Humphreys 1972, Introduction to Lie Algebras and Representation Theory,
//!   sect. 15.2); when it is nilpotent it is a Cartan subalgebra, and all Cartan
//!   subalgebras have the same dimension in characteristic 0 (conjugacy over the closure;
//!   Humphreys 1972, sect. 16), the *rank*. A random x is regular with probability 1;
//!   the nilpotency is checked, and x is replaced when it fails.
//!
//! The equations with powers of `ad_y` have large integer coefficients; they are posed to
//! the engine as systems written modulo primes (exact check by a coefficient bound).

use super::algebra::{Alg, products_span};
use crate::error::{Error, Result};
use crate::invariants::forms::{form_invariants, trace_form};
use crate::invariants::quotient::{QuotientMap, quotient_in};
use crate::invariants::spans::{derived_series, lower_central_series};
use crate::linalg::nullspace::{SolveParams, solve_nullspace};
use crate::linalg::subspace::{Subspace, kernel, reduce};
use crate::linalg::system::{RowBuf, RowSource};
use crate::scalar::common_denominator;
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::{IntegralTensor, Tensor};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{Signed, ToPrimitive, Zero};
use rand::{Rng, SeedableRng};

/// The structure of a Lie algebra over Q.
#[derive(Clone, Debug)]
pub struct LieStructure {
    pub dim: usize,
    /// The solvable radical (basis in reduced form).
    pub radical: Vec<Vec<Q>>,
    /// The nilradical.
    pub nilradical: Vec<Vec<Q>>,
    /// `dim L - dim R`: the dimension of a Levi factor (a semisimple subalgebra with
    /// `L = S (+) R`).
    pub levi_dim: usize,
    /// The dimension of a Cartan subalgebra, with the element x it is `L_0(ad x)` of.
    pub cartan_dim: Option<usize>,
    pub cartan_element: Option<Vec<Q>>,
    pub cartan_basis: Vec<Vec<Q>>,
}

/// Parameters of [`lie_structure`].
#[derive(Clone, Debug)]
pub struct LieParams {
    pub solve: SolveParams,
    pub seed: u64,
    /// Random elements tried for the nilradical and the Cartan subalgebra.
    pub tries: usize,
}

impl Default for LieParams {
    fn default() -> Self {
        LieParams {
            solve: SolveParams::default(),
            seed: 1,
            tries: 6,
        }
    }
}

/// The structure of a Lie algebra over Q (the caller checks the Lie law). Errors: a
/// tensor over GF(p) (the methods need characteristic 0), the engine's errors, or a check
/// that keeps failing for every random element tried.
pub fn lie_structure(t: &Tensor, params: &LieParams) -> Result<LieStructure> {
    if t.field() != FieldSpec::Rational {
        return Err(Error::Invalid(
            "the Lie structure (radical, Levi factor, Cartan subalgebra) is computed over Q \
             (characteristic 0)"
                .into(),
        ));
    }
    let f = &Rationals;
    let sp = &params.solve;
    let n = t.dim();
    let it = IntegralTensor::from_tensor(t);
    let l = Alg::from_tensor(f, t);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    // solvable radical: kappa(x, w) = 0 for w in [L, L]
    let derived = products_span(f, t, sp)?;
    let kappa: Vec<Vec<Q>> = trace_form(&it, true)
        .into_iter()
        .map(|r| r.into_iter().map(Q::from_integer).collect())
        .collect();
    let rows: Vec<Vec<Q>> = derived
        .basis
        .iter()
        .map(|w| {
            (0..n)
                .map(|a| kappa[a].iter().zip(w).map(|(k, x)| k * x).sum())
                .collect()
        })
        .collect();
    let radical = kernel(f, &rows, n, sp)?;
    check_ideal(&l, &radical, "solvable radical")?;
    let rad_alg = Alg::subalgebra(f, &radical, |x, y| l.mul(x, y), true)?;
    if radical.dim() > 0 {
        let series = derived_series(&IntegralTensor::from_tensor(&rad_alg.to_tensor("r")), sp)?;
        if series.last() != Some(&0) {
            return Err(Error::Invalid(
                "internal error: the Killing-orthogonal of [L, L] is not solvable".into(),
            ));
        }
    }
    let levi = quotient_in(f, t, &QuotientMap::new(f, n, &radical.basis));
    if levi.dim() > 0 {
        let g = trace_form(&IntegralTensor::from_tensor(&levi), true);
        if form_invariants(FieldSpec::Rational, &g).rank != levi.dim() {
            return Err(Error::Invalid(
                "internal error: L / R is not semisimple".into(),
            ));
        }
    }
    // nilradical inside R
    let mut nilradical = None;
    if radical.dim() == 0 {
        nilradical = Some(Subspace::zero(n));
    }
    for _ in 0..params.tries {
        if nilradical.is_some() {
            break;
        }
        let c: Vec<i64> = (0..radical.dim()).map(|_| rng.gen_range(-5..=5)).collect();
        let cand = nilradical_candidate(&it, &radical, &c, sp)?;
        if check_ideal(&l, &cand, "nilradical").is_ok() && is_nilpotent(&l, &cand, sp)? {
            nilradical = Some(cand);
        }
    }
    let nilradical = nilradical.ok_or_else(|| {
        Error::Invalid("the nilradical was not found with the random elements tried".into())
    })?;
    // Cartan subalgebra
    let mut cartan = None;
    for _ in 0..params.tries {
        let x: Vec<i64> = (0..n).map(|_| rng.gen_range(-5..=5)).collect();
        let h = generalized_kernel(&it, &x, sp)?;
        if h.dim() > 0 && is_subalgebra(&l, &h) && is_nilpotent(&l, &h, sp)? {
            cartan = Some((h, x));
            break;
        }
    }
    Ok(LieStructure {
        dim: n,
        levi_dim: n - radical.dim(),
        radical: radical.basis.clone(),
        nilradical: nilradical.basis,
        cartan_dim: cartan.as_ref().map(|c| c.0.dim()),
        cartan_element: cartan
            .as_ref()
            .map(|c| c.1.iter().map(|&v| Q::from_integer(v.into())).collect()),
        cartan_basis: cartan.map(|c| c.0.basis).unwrap_or_default(),
    })
}

fn check_ideal(l: &Alg<Rationals>, s: &Subspace<Q>, what: &str) -> Result<()> {
    for v in &s.basis {
        for i in 0..l.n {
            if !s.contains(&Rationals, &l.mul(&l.basis(i), v)) {
                return Err(Error::Invalid(format!(
                    "internal error: the {what} is not an ideal"
                )));
            }
        }
    }
    Ok(())
}

fn is_subalgebra(l: &Alg<Rationals>, s: &Subspace<Q>) -> bool {
    s.basis
        .iter()
        .all(|a| s.basis.iter().all(|b| s.contains(&Rationals, &l.mul(a, b))))
}

/// True when the subalgebra spanned by s is nilpotent (lower central series to 0).
fn is_nilpotent(l: &Alg<Rationals>, s: &Subspace<Q>, sp: &SolveParams) -> Result<bool> {
    if s.dim() == 0 {
        return Ok(true);
    }
    let sub = Alg::subalgebra(&Rationals, s, |x, y| l.mul(x, y), true)?;
    let series = lower_central_series(&IntegralTensor::from_tensor(&sub.to_tensor("s")), sp)?;
    Ok(series.last() == Some(&0))
}

/// Integer vectors proportional to the basis vectors (each scaled by its denominators).
fn integer_basis(s: &Subspace<Q>) -> Vec<Vec<BigInt>> {
    s.basis
        .iter()
        .map(|v| {
            let l = common_denominator(v.iter());
            v.iter().map(|x| x.numer() * (&l / x.denom())).collect()
        })
        .collect()
}

/// `ad_v` modulo p for an integer vector v and the integer-scaled constants:
/// `ad_v[l][i] = sum_a v_a c'[a][i][l]`, row-major n x n.
fn ad_mod(it: &IntegralTensor, v: &[u64], p: u64) -> Vec<u64> {
    let n = it.dims[0];
    let t = it.residues(p);
    let mut m = vec![0u64; n * n];
    for (a, &va) in v.iter().enumerate() {
        if va == 0 {
            continue;
        }
        for i in 0..n {
            let (ks, vs) = t.row(a, i);
            for (&l, &c) in ks.iter().zip(vs) {
                let x = &mut m[l as usize * n + i];
                *x = ((*x as u128 + va as u128 * c as u128) % p as u128) as u64;
            }
        }
    }
    m
}

fn matmul_mod(a: &[u64], b: &[u64], n: usize, p: u64) -> Vec<u64> {
    let mut out = vec![0u64; n * n];
    for i in 0..n {
        for k in 0..n {
            let x = a[i * n + k];
            if x == 0 {
                continue;
            }
            for j in 0..n {
                let o = &mut out[i * n + j];
                *o = ((*o as u128 + x as u128 * b[k * n + j] as u128) % p as u128) as u64;
            }
        }
    }
    out
}

fn residues(v: &[BigInt], p: u64) -> Vec<u64> {
    let pb = BigInt::from(p);
    v.iter()
        .map(|x| x.mod_floor(&pb).to_u64().expect("reduced"))
        .collect()
}

/// Bits of `max |ad_v[l][i]|` for an integer vector v: at most `|v|_1 max |c'|`.
fn ad_bits(it: &IntegralTensor, v: &[BigInt]) -> u64 {
    let l1: BigInt = v.iter().map(|x| x.abs()).sum();
    (l1 * &it.max_abs).bits().max(1)
}

/// The equations `sum_j alpha_j Tr(ad_{r_j} ad_y^k) = 0`, k = 0..n-1 (one block).
struct TracePowers<'a> {
    it: &'a IntegralTensor,
    r: Vec<Vec<BigInt>>,
    y: Vec<BigInt>,
}

impl RowSource for TracePowers<'_> {
    fn unknowns(&self) -> usize {
        self.r.len()
    }
    fn blocks(&self) -> usize {
        1
    }
    fn modulus(&self) -> Option<u64> {
        None
    }
    fn block(&self, _b: usize, p: u64, out: &mut RowBuf) {
        let n = self.it.dims[0];
        let ads: Vec<Vec<u64>> = self
            .r
            .iter()
            .map(|v| ad_mod(self.it, &residues(v, p), p))
            .collect();
        let ady = ad_mod(self.it, &residues(&self.y, p), p);
        let mut power: Vec<u64> = (0..n * n).map(|i| u64::from(i % (n + 1) == 0)).collect();
        for k in 0..n {
            for (j, a) in ads.iter().enumerate() {
                // Tr(A P) = sum_{l,i} A[l][i] P[i][l]
                let mut s: u128 = 0;
                for l in 0..n {
                    for i in 0..n {
                        s += a[l * n + i] as u128 * power[i * n + l] as u128;
                    }
                    s %= p as u128;
                }
                out.add(k, j, s as u64);
            }
            power = matmul_mod(&power, &ady, n, p);
        }
        out.end_block(n);
    }
    fn term_bits(&self) -> u64 {
        let n = self.it.dims[0] as u64;
        let logn = 64 - n.leading_zeros() as u64;
        let ra = self
            .r
            .iter()
            .map(|v| ad_bits(self.it, v))
            .max()
            .unwrap_or(1);
        let ya = ad_bits(self.it, &self.y);
        2 * logn + ra + n.saturating_sub(1) * (logn + ya) + 1
    }
    fn estimated_terms(&self) -> usize {
        self.it.dims[0] * self.r.len()
    }
    fn prefers_streaming(&self) -> bool {
        true
    }
}

/// `{x in R : Tr(ad_x ad_y^k) = 0, k < n}` for `y = sum c_j r_j`.
fn nilradical_candidate(
    it: &IntegralTensor,
    radical: &Subspace<Q>,
    c: &[i64],
    sp: &SolveParams,
) -> Result<Subspace<Q>> {
    let n = it.dims[0];
    let r = integer_basis(radical);
    let mut y = vec![BigInt::zero(); n];
    for (cj, rj) in c.iter().zip(&r) {
        for (yi, x) in y.iter_mut().zip(rj) {
            *yi += x * cj;
        }
    }
    let sys = TracePowers {
        it,
        r: r.clone(),
        y,
    };
    let alphas = solve_nullspace(&sys, sp)?;
    // the unknowns are the coefficients of the integer-scaled basis vectors
    let fixed: Vec<Vec<Q>> = (0..alphas.dim())
        .map(|i| {
            let a = alphas.dense(i);
            let mut v = vec![Q::zero(); n];
            for (aj, rj) in a.iter().zip(&r) {
                for (vi, x) in v.iter_mut().zip(rj) {
                    *vi += aj * Q::from_integer(x.clone());
                }
            }
            v
        })
        .collect();
    Ok(reduce(&Rationals, n, fixed))
}

/// The rows of `ad_x^n` (one block): their kernel is `L_0(ad x)`.
struct PowerRows<'a> {
    it: &'a IntegralTensor,
    x: Vec<BigInt>,
}

impl RowSource for PowerRows<'_> {
    fn unknowns(&self) -> usize {
        self.it.dims[0]
    }
    fn blocks(&self) -> usize {
        1
    }
    fn modulus(&self) -> Option<u64> {
        None
    }
    fn block(&self, _b: usize, p: u64, out: &mut RowBuf) {
        let n = self.it.dims[0];
        let a = ad_mod(self.it, &residues(&self.x, p), p);
        let mut m = a.clone();
        for _ in 1..n {
            m = matmul_mod(&m, &a, n, p);
        }
        for r in 0..n {
            for c in 0..n {
                if m[r * n + c] != 0 {
                    out.add(r, c, m[r * n + c]);
                }
            }
        }
        out.end_block(n);
    }
    fn term_bits(&self) -> u64 {
        let n = self.it.dims[0] as u64;
        let logn = 64 - n.leading_zeros() as u64;
        n * (logn + ad_bits(self.it, &self.x)) + 1
    }
    fn estimated_terms(&self) -> usize {
        self.it.dims[0] * self.it.dims[0]
    }
    fn prefers_streaming(&self) -> bool {
        true
    }
}

/// `L_0(ad x) = ker (ad_x)^n`.
fn generalized_kernel(it: &IntegralTensor, x: &[i64], sp: &SolveParams) -> Result<Subspace<Q>> {
    let n = it.dims[0];
    let sys = PowerRows {
        it,
        x: x.iter().map(|&v| BigInt::from(v)).collect(),
    };
    let sol = solve_nullspace(&sys, sp)?;
    Ok(reduce(&Rationals, n, sol.dense_basis()))
}
