//! The radical of a finite-dimensional associative algebra over GF(p), where the trace-form
//! criterion of characteristic 0 fails (the regular trace of 1 in F_2[C_2] is 2 = 0).
//!
//! Method (Cohen, Ivanyos and Wales 1997, "Finding the radical of an algebra of linear
//! transformations", J. Pure Appl. Algebra 117/118; after Ronyai 1990, "Computing the
//! structure of finite algebras", J. Symbolic Comput. 9). Let A act faithfully on
//! V = F^m by the left regular representation (on A itself when A has a unit, else on the
//! unital hull `F 1 + A`, m = n + 1), and for a in A let `g_i(a)` be the coefficient of
//! `x^(m - p^i)` in the characteristic polynomial of L_a. Put `I_{-1} = A` and
//! `I_i = {a in I_{i-1} : g_i(ab) = 0 for all b in A (and b = 1)}`. Then every `I_i` is an
//! ideal, `g_i` is additive (p^i-semilinear) on `I_{i-1}`, hence GF(p)-linear there, and
//! `I_l = rad A` for `p^l <= m < p^(l+1)`.
//!
//! Why (a sketch, worked out for this implementation): over the algebraic closure,
//! `A / rad A = prod M_{n_j}` and the j-th simple module occurs `m_j` times in V. For a in
//! `I_{i-1}` the components `a_j` vanish unless `p^i | m_j`, so the characteristic
//! polynomial is `x^r prod_j (chi_{a_j}(x)^(m_j / p^i))^(p^i)` and the coefficient at
//! `x^(m - p^i)` is `-(sum_j (m_j / p^i) tr a_j)^(p^i)`. Over GF(p) the p^i-th power is the
//! identity, so g_i is linear on `I_{i-1}`, and `g_i(ab) = 0` for all b kills exactly the
//! components with `p^(i+1)` not dividing m_j (the trace form of `M_{n_j}` is
//! nondegenerate). Every m_j is at most m, so `I_l` has no component left: it is the
//! radical (nilpotent elements have characteristic polynomial `x^m` and lie in every I_i).
//!
//! The result is checked exactly before it is returned: it is a two-sided ideal and it is
//! nilpotent (so it lies in rad A); with the theorem above it is rad A.
//!
//! Cost: at most `(l + 1) n` characteristic polynomials of m x m matrices (O(m^3) each),
//! `(l + 1) n^2` products, and small linear systems solved by the engine.

use crate::error::{Error, Result};
use crate::laws::find_unit;
use crate::linalg::Matrix;
use crate::linalg::charpoly;
use crate::linalg::nullspace::{SolveParams, Space};
use crate::linalg::subspace::{Subspace, kernel, reduce, span};
use crate::scalar::{Field, FieldSpec, PrimeField};
use crate::tensor::{IntegralTensor, Table, Tensor};

/// The radical of an associative algebra over GF(p) (the caller checks associativity),
/// proven as described in the module documentation; vectors are the representatives in
/// `0..p`. Errors: the tensor is over Q; p is too large for the engine (p >= 2^28).
pub fn radical_mod_p(t: &Tensor, it: &IntegralTensor, params: &SolveParams) -> Result<Space> {
    let FieldSpec::Prime(p) = t.field() else {
        return Err(Error::Invalid(
            "the characteristic-p radical needs an algebra over GF(p)".into(),
        ));
    };
    let f = PrimeField::new(p).expect("a prime field");
    let n = t.dim();
    let tab = t.table(&f);
    let unital = find_unit(it, params)?.is_some();
    let m = if unital { n } else { n + 1 };
    let mut ideal = Subspace::whole(&f, n);
    let mut q = 1usize; // p^i
    while q <= m && ideal.dim() > 0 {
        let g: Vec<u64> = ideal
            .basis
            .iter()
            .map(|c| {
                let cp = charpoly(&f, &left_matrix(&f, &tab, c, unital));
                cp[m - q]
            })
            .collect();
        // one equation per multiplier b: sum_t alpha_t g(c_t b) = 0, with g(c_t b)
        // expanded in the basis of the ideal (c_t b lies in it)
        let mut rows: Vec<Vec<u64>> = Vec::with_capacity(n + 1);
        for j in 0..n {
            rows.push(
                ideal
                    .basis
                    .iter()
                    .map(|c| {
                        let cb = tab.mul_basis_right(&f, c, j);
                        dot(&f, &ideal.coords(&cb), &g)
                    })
                    .collect(),
            );
        }
        if !unital {
            rows.push(g.clone()); // b = 1
        }
        let alphas = kernel(&f, &rows, ideal.dim(), params)?;
        let next: Vec<Vec<u64>> = alphas.basis.iter().map(|a| ideal.combine(&f, a)).collect();
        ideal = reduce(&f, n, next);
        q = match q.checked_mul(p as usize) {
            Some(x) => x,
            None => break,
        };
    }
    check_nilpotent_ideal(&f, &tab, &ideal, params)?;
    Ok(Space {
        unknowns: n,
        basis: ideal
            .basis
            .iter()
            .map(|v| {
                v.iter()
                    .enumerate()
                    .filter(|(_, x)| **x != 0)
                    .map(|(i, x)| (i as u32, f.to_rational(x)))
                    .collect()
            })
            .collect(),
    })
}

fn dot(f: &PrimeField, a: &[u64], b: &[u64]) -> u64 {
    a.iter().zip(b).fold(0, |s, (x, y)| f.add(&s, &f.mul(x, y)))
}

/// The matrix of `L_c` on A (unital) or on `F 1 + A` (basis 1, e_0, ..., e_{n-1}).
fn left_matrix(f: &PrimeField, tab: &Table<u64>, c: &[u64], unital: bool) -> Matrix<u64> {
    let n = c.len();
    let off = usize::from(!unital);
    let m = n + off;
    let mut mat = Matrix::filled(m, m, 0u64);
    if !unital {
        for (k, x) in c.iter().enumerate() {
            mat[(k + 1, 0)] = *x;
        }
    }
    for j in 0..n {
        for (k, x) in tab.mul_basis_right(f, c, j).into_iter().enumerate() {
            mat[(k + off, j + off)] = x;
        }
    }
    mat
}

/// Check exactly that a subspace is a two-sided ideal and nilpotent.
fn check_nilpotent_ideal(
    f: &PrimeField,
    tab: &Table<u64>,
    ideal: &Subspace<u64>,
    params: &SolveParams,
) -> Result<()> {
    let n = ideal.ambient;
    let fail = |what: &str| {
        Err(Error::Invalid(format!(
            "internal error: the computed radical is not {what}"
        )))
    };
    for r in &ideal.basis {
        for j in 0..n {
            if !ideal.contains(f, &tab.mul_basis_right(f, r, j))
                || !ideal.contains(f, &tab.mul_basis_left(f, j, r))
            {
                return fail("an ideal");
            }
        }
    }
    let mut power = ideal.clone();
    while power.dim() > 0 {
        let prods: Vec<Vec<u64>> = power
            .basis
            .iter()
            .flat_map(|x| ideal.basis.iter().map(move |y| tab.mul(f, x, y)))
            .collect();
        let next = span(f, &prods, n, params)?;
        if next.dim() >= power.dim() {
            return fail("nilpotent");
        }
        power = next;
    }
    Ok(())
}
