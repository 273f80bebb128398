//! The exact check of a candidate solution basis against every equation of a system (see
//! step 4 of [`super::nullspace`]): integer vectors, residuals modulo enough primes that a
//! residual vanishing modulo all of them vanishes over Z.

use super::kernels::LazyAcc;
use super::nullspace::SparseQ;
use super::primes::{MAX_KERNEL_PRIMES, primes_prefix};
use super::system::{RowBuf, RowSource};
use crate::error::{Error, Result};
use crate::scalar::{common_denominator, residue};
use num_bigint::BigInt;
use rayon::prelude::*;

/// The candidate vectors modulo p, by coordinate: row `c` (of `count` words) holds the
/// residues of every vector at coordinate `c`, so one equation's residuals for all the
/// vectors are a combination of its columns' rows (a vector-times-matrix product).
pub(super) struct Residues {
    pub by_coordinate: Vec<u32>,
    pub count: usize,
}

/// Whether the residual of one equation vanishes modulo p for every candidate vector
/// (`loc` maps a column to its coordinate; `acc` is scratch of `xs.count` words).
/// Cost: one multiply-add per term and vector, vectorised across the vectors.
pub(super) fn residual_zero(
    cols: &[u32],
    vals: &[u32],
    xs: &Residues,
    acc: &mut LazyAcc,
    loc: impl Fn(u32) -> usize,
) -> bool {
    let k = xs.count;
    acc.clear();
    for (&c, &v) in cols.iter().zip(vals) {
        let at = loc(c) * k;
        acc.axpy(v, &xs.by_coordinate[at..at + k]);
    }
    acc.finish().iter().all(|&r| r == 0)
}

/// The exact check of candidate vectors in coordinates `0..m` (see the module
/// documentation): `residuals(p, xs)` says whether every equation vanishes modulo p on the
/// vectors reduced mod p, and gives the largest number of terms of an equation.
pub(super) fn exact_check(
    modulus: Option<u64>,
    term_bits: u64,
    m: usize,
    basis: &[SparseQ],
    residuals: impl Fn(u64, &Residues) -> (bool, usize),
) -> Result<bool> {
    if basis.is_empty() {
        return Ok(true);
    }
    // integer vectors
    let ints: Vec<Vec<(u32, BigInt)>> = basis
        .iter()
        .map(|v| {
            let l = common_denominator(v.iter().map(|(_, x)| x));
            v.iter()
                .map(|(c, x)| (*c, x.numer() * (&l / x.denom())))
                .collect()
        })
        .collect();
    let xbits = ints
        .iter()
        .flatten()
        .map(|(_, x)| x.bits())
        .max()
        .unwrap_or(0);
    let exact_field = modulus.is_some();
    let mut needed = 1usize;
    let mut k = 0;
    while k < needed {
        let p = match modulus {
            Some(q) => q,
            None => primes_prefix(k + 1).get(k).copied().ok_or_else(|| {
                Error::Invalid(format!(
                    "the exact check of a solution with {xbits}-bit entries needs more than \
                     {MAX_KERNEL_PRIMES} primes"
                ))
            })?,
        };
        let count = ints.len();
        let mut by_coordinate = vec![0u32; m * count];
        let reduced: Vec<Vec<u32>> = ints
            .par_iter()
            .map(|v| v.iter().map(|(_, x)| residue(x, p) as u32).collect())
            .collect();
        for (f, (v, r)) in ints.iter().zip(&reduced).enumerate() {
            for ((c, _), &x) in v.iter().zip(r) {
                by_coordinate[*c as usize * count + f] = x;
            }
        }
        let xs = Residues {
            by_coordinate,
            count,
        };
        let (ok, max_terms) = residuals(p, &xs);
        if !ok {
            return Ok(false);
        }
        if k == 0 && !exact_field {
            let bits = (max_terms.max(1) as f64).log2().ceil() as u64 + term_bits + xbits + 2;
            needed = (bits as f64 / 27.99).ceil() as usize;
        }
        k += 1;
    }
    Ok(true)
}

/// Check exactly that vectors (in the system's own coordinates) solve **every** equation
/// of a system, produced block by block (see the module documentation for the bound).
/// Cost: per prime used, one pass over all blocks, O(terms x vectors).
pub fn check_solutions(src: &dyn RowSource, basis: &[SparseQ]) -> Result<bool> {
    let residuals = |p: u64, xs: &Residues| {
        let res: std::result::Result<Vec<usize>, ()> = (0..src.blocks())
            .into_par_iter()
            .map_init(
                || (RowBuf::new(p), LazyAcc::new(xs.count, p)),
                |(b, acc), blk| {
                    b.clear();
                    src.block(blk, p, b);
                    for r in 0..b.rows() {
                        let (cols, vals) = b.row(r);
                        if !residual_zero(cols, vals, xs, acc, |c| c as usize) {
                            return Err(());
                        }
                    }
                    Ok(b.max_terms)
                },
            )
            .collect();
        match res {
            Ok(v) => (true, v.into_iter().max().unwrap_or(0)),
            Err(()) => (false, 0),
        }
    };
    exact_check(
        src.modulus(),
        src.term_bits(),
        src.unknowns(),
        basis,
        residuals,
    )
}
