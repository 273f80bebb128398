//! The two-sided unit of an algebra, found by solving a linear system exactly.
//!
//! `u = sum_a u_a e_a` is a two-sided unit iff `u * e_j = e_j = e_j * u` for every basis
//! element, i.e. `sum_a u_a c[a][j][k] = delta_jk` and `sum_a u_a c[j][a][k] = delta_jk`:
//! `2 n^2` linear equations in `n` unknowns. A unit, when it exists, is unique.
//!
//! [`find_unit`] poses them homogeneously for the integer-scaled constants `c' = L c`,
//! unknowns `(u, s)`: `u e_j - s e_j = 0 = e_j u - s e_j`; a solution with `s != 0` gives
//! the unit `L u / s` of A. The system is solved by the engine of
//! [`crate::linalg::nullspace`] (modular elimination, lifting, exact check).
//! [`find_unit_direct`] eliminates in the field itself (the reference for tests).

use crate::error::Result;
use crate::linalg::nullspace::{SolveParams, solve_nullspace};
use crate::linalg::system::{RowBuf, RowSource};
use crate::linalg::{Matrix, solve};
use crate::scalar::{Field, PrimeField, Q};
use crate::tensor::{IntegralTensor, Table};
use num_traits::Zero;

/// The homogenised unit equations (see the module documentation): blocks `(side, j)`, rows
/// the result coordinates.
pub struct UnitEquations<'a>(pub &'a IntegralTensor);

impl RowSource for UnitEquations<'_> {
    fn unknowns(&self) -> usize {
        self.0.dims[0] + 1
    }
    fn blocks(&self) -> usize {
        2 * self.0.dims[0]
    }
    fn modulus(&self) -> Option<u64> {
        self.0.modulus()
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        let n = self.0.dims[0];
        let residues = self.0.residues(p);
        let t = &*residues;
        let (left, j) = (b < n, b % n);
        for x in 0..n {
            let (ks, vs) = if left { t.row(x, j) } else { t.row(j, x) };
            for (&k, &v) in ks.iter().zip(vs) {
                out.add(k as usize, x, v as u64);
            }
        }
        out.sub(j, n, 1);
        out.end_block(n);
    }
    fn term_bits(&self) -> u64 {
        self.0.constant_bits()
    }
    fn estimated_terms(&self) -> usize {
        2 * self.0.nnz() + 2 * self.0.dims[0]
    }
    fn prefers_streaming(&self) -> bool {
        self.0.dense
    }
}

/// The coordinates of the two-sided unit of an algebra (over its own field: rationals, or
/// the representatives in `0..q`), or `None` when there is none.
/// Cost: one system of 2 n^2 equations in n + 1 unknowns (see the module documentation).
pub fn find_unit(it: &IntegralTensor, params: &SolveParams) -> Result<Option<Vec<Q>>> {
    let n = it.dims[0];
    let sp = solve_nullspace(&UnitEquations(it), params)?;
    let Some(v) = (0..sp.dim()).map(|i| sp.dense(i)).find(|v| !v[n].is_zero()) else {
        return Ok(None);
    };
    let u: Vec<Q> = match it.modulus() {
        None => {
            let f = Q::from_integer(it.scale.clone()) / &v[n];
            v[..n].iter().map(|x| x * &f).collect()
        }
        Some(p) => {
            let f = PrimeField::new(p).expect("prime");
            let s = f.from_rational(&v[n]).expect("residue");
            let si = f.inv(&s).expect("nonzero");
            v[..n]
                .iter()
                .map(|x| f.to_rational(&f.mul(&f.from_rational(x).expect("residue"), &si)))
                .collect()
        }
    };
    Ok(Some(u))
}

/// The unit of the algebra `t` as elements of the field context `f` (t's field), by the
/// modular solver of [`find_unit`] (exact; elimination in fractions is slow on a dense
/// table with large entries). Cost: that of [`find_unit`].
pub fn find_unit_in<F: Field>(
    f: &F,
    t: &crate::tensor::Tensor,
    params: &SolveParams,
) -> Result<Option<Vec<F::Elem>>> {
    let Some(u) = find_unit(&IntegralTensor::from_tensor(t), params)? else {
        return Ok(None);
    };
    Ok(u.iter().map(|x| f.from_rational(x)).collect())
}

/// The unit by exact elimination in the field of a table (any field, any prime).
/// Cost: one elimination of a `2 n^2 x (n + 1)` matrix over the field.
pub fn find_unit_direct<F: Field>(f: &F, t: &Table<F::Elem>) -> Option<Vec<F::Elem>> {
    let n = t.dims[0];
    let mut m = Matrix::zeros(f, 2 * n * n, n);
    let mut b = vec![f.zero(); 2 * n * n];
    for a in 0..n {
        for j in 0..n {
            for (k, c) in t.product(a, j) {
                // u * e_j: equation (j, k), unknown a
                m[(j * n + k, a)] = c.clone();
            }
            for (k, c) in t.product(j, a) {
                // e_j * u: equation (j, k), unknown a
                m[(n * n + j * n + k, a)] = c.clone();
            }
        }
    }
    for j in 0..n {
        b[j * n + j] = f.one();
        b[n * n + j * n + j] = f.one();
    }
    // drop all-zero equations with zero right side (most of them for sparse tables)
    let keep: Vec<usize> = (0..2 * n * n)
        .filter(|&r| !f.is_zero(&b[r]) || m.row(r).iter().any(|x| !f.is_zero(x)))
        .collect();
    let rows: Vec<Vec<F::Elem>> = keep.iter().map(|&r| m.row(r).to_vec()).collect();
    let bb: Vec<F::Elem> = keep.iter().map(|&r| b[r].clone()).collect();
    let mm = Matrix::from_rows(rows, n);
    solve(f, &mm, &bb)
}
