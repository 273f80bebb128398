//! The upper central series of an algebra: `Z_0 = 0`, `Z_{k+1} = {x : x A + A x in Z_k}`
//! (`Z_1` is the annihilator; for a Lie algebra, the centre), until it stabilises. For a
//! nilpotent Lie algebra it reaches L, in as many steps as the lower central series.
//!
//! Each step is a homogeneous system in x: `f(x e_j) = 0` and `f(e_j x) = 0` for every j and
//! every f in an integer basis of the annihilator of `Z_k` in the dual space (for `Z_0 = 0`,
//! the coordinate functionals). Both the dual basis and `Z_{k+1}` come from
//! [`solve_nullspace`], so every term is a proven basis.
//! Cost per step: n blocks of `2 r n` terms per nonzero constant, r = n - dim Z_k.

use crate::error::Result;
use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
use crate::linalg::system::{IntegerRows, RowBuf, RowSource};
use crate::scalar::common_denominator;
use crate::tensor::IntegralTensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};

/// The equations `f(x e_j) = 0`, `f(e_j x) = 0` (block j) for the functionals f.
struct Preimage<'a> {
    it: &'a IntegralTensor,
    perp: Vec<Vec<BigInt>>,
    bits: u64,
}

impl RowSource for Preimage<'_> {
    fn unknowns(&self) -> usize {
        self.it.dims[0]
    }
    fn blocks(&self) -> usize {
        self.it.dims[0]
    }
    fn modulus(&self) -> Option<u64> {
        self.it.modulus()
    }
    fn block(&self, j: usize, p: u64, out: &mut RowBuf) {
        let residues = self.it.residues(p);
        let t = &*residues;
        let n = self.it.dims[0];
        let pb = BigInt::from(p);
        let fs: Vec<Vec<u64>> = self
            .perp
            .iter()
            .map(|f| {
                f.iter()
                    .map(|x| x.mod_floor(&pb).to_u64().expect("reduced"))
                    .collect()
            })
            .collect();
        for (r, f) in fs.iter().enumerate() {
            for i in 0..n {
                for (side, (ks, vs)) in [t.row(i, j), t.row(j, i)].into_iter().enumerate() {
                    for (&m, &v) in ks.iter().zip(vs) {
                        let fm = f[m as usize];
                        if fm != 0 && v != 0 {
                            out.add_product(2 * r + side, i, v as u64, fm, false);
                        }
                    }
                }
            }
        }
        out.end_block(2 * fs.len());
    }
    fn term_bits(&self) -> u64 {
        self.bits
    }
    fn estimated_terms(&self) -> usize {
        2 * self.perp.len() * self.it.nnz()
    }
}

/// An integer basis of the functionals vanishing on the span of `space`'s vectors (n
/// coordinates).
fn dual_annihilator(space: &Space, n: usize, params: &SolveParams) -> Result<Vec<Vec<BigInt>>> {
    if space.dim() == 0 {
        return Ok((0..n)
            .map(|i| {
                let mut v = vec![BigInt::zero(); n];
                v[i] = BigInt::one();
                v
            })
            .collect());
    }
    let rows: Vec<Vec<BigInt>> = space
        .dense_basis()
        .iter()
        .map(|v| integer_vector(v))
        .collect();
    let null = solve_nullspace(&IntegerRows::new(n, rows), params)?;
    Ok(null
        .dense_basis()
        .iter()
        .map(|v| integer_vector(v))
        .collect())
}

/// A rational vector times the lcm of its denominators.
pub fn integer_vector(v: &[crate::scalar::Q]) -> Vec<BigInt> {
    let d = common_denominator(v.iter());
    v.iter().map(|x| x.numer() * (&d / x.denom())).collect()
}

/// The upper central series as proven bases `Z_1, Z_2, ...` up to the first repetition
/// (the last term is where it stabilises).
pub fn upper_central_series(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<Space>> {
    let n = it.dims[0];
    let mut out: Vec<Space> = Vec::new();
    let mut cur = Space {
        unknowns: n,
        basis: Vec::new(),
    };
    loop {
        let perp = dual_annihilator(&cur, n, params)?;
        let fbits = perp.iter().flatten().map(|x| x.bits()).max().unwrap_or(1);
        let nbits = 64 - (n as u64).leading_zeros() as u64;
        let sys = Preimage {
            it,
            perp,
            bits: fbits + it.constant_bits() + nbits + 1,
        };
        let next = solve_nullspace(&sys, params)?;
        let grew = next.dim() > cur.dim();
        if !grew {
            break;
        }
        out.push(next.clone());
        if next.dim() == n {
            break;
        }
        cur = next;
    }
    Ok(out)
}

/// The dimensions of the upper central series `dim Z_1, dim Z_2, ...` until it stabilises
/// (empty when the annihilator is 0).
pub fn upper_central_dims(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<usize>> {
    Ok(upper_central_series(it, params)?
        .iter()
        .map(Space::dim)
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::heisenberg3;

    #[test]
    fn heisenberg_upper_series() {
        // Heisenberg: Z_1 = <z>, Z_2 = L (class 2; Jacobson 1962, Lie Algebras, ch. I).
        let it = IntegralTensor::from_tensor(&heisenberg3());
        assert_eq!(
            upper_central_dims(&it, &Default::default()).unwrap(),
            vec![1, 3]
        );
    }
}
