//! Rows of rationals written over one common denominator, for many exact linear
//! combinations of the same rows: `sum_k c_k r_k` then costs integer multiply-adds and one
//! reduction per coordinate, instead of a gcd per term (the rows of a table in a user's
//! dense basis have numerators and denominators of hundreds of bits).
//!
//! Invariant: `rows[k][i] / den` is the i-th coordinate of row k, exactly.

use crate::scalar::{Q, common_denominator};
use num_bigint::BigInt;
use num_traits::Zero;

/// Rows of equal length over one common denominator (see the module documentation).
#[derive(Clone, Debug)]
pub struct IntegerRows {
    rows: Vec<Vec<BigInt>>,
    den: BigInt,
    len: usize,
}

impl IntegerRows {
    /// The rows `rows`, all of length `len`. Cost: one lcm per entry with a denominator and
    /// one exact division per entry.
    pub fn new(rows: &[Vec<Q>], len: usize) -> IntegerRows {
        let den = common_denominator(rows.iter().flatten());
        let rows = rows
            .iter()
            .map(|r| {
                debug_assert_eq!(r.len(), len);
                r.iter().map(|x| x.numer() * (&den / x.denom())).collect()
            })
            .collect();
        IntegerRows { rows, den, len }
    }

    /// `sum_k c[k] rows[k]`, exactly. Cost: `len` multiply-adds per nonzero `c[k]` of
    /// integers, one reduction per coordinate.
    pub fn combine(&self, c: &[Q]) -> Vec<Q> {
        let cden = common_denominator(c.iter());
        let mut acc = vec![BigInt::zero(); self.len];
        for (ck, row) in c.iter().zip(&self.rows) {
            if ck.is_zero() {
                continue;
            }
            let m = ck.numer() * (&cden / ck.denom());
            for (a, r) in acc.iter_mut().zip(row) {
                if !r.is_zero() {
                    *a += &m * r;
                }
            }
        }
        let den = &self.den * &cden;
        acc.into_iter().map(|a| Q::new(a, den.clone())).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn combinations_match_rational_arithmetic() {
        let q = |n: i64, d: i64| Q::new(n.into(), d.into());
        let rows = vec![
            vec![q(1, 3), q(-2, 5), q(0, 1)],
            vec![q(7, 2), q(1, 1), q(-1, 6)],
        ];
        let ir = IntegerRows::new(&rows, 3);
        let c = [q(3, 4), q(-2, 7)];
        let want: Vec<Q> = (0..3)
            .map(|i| &c[0] * &rows[0][i] + &c[1] * &rows[1][i])
            .collect();
        assert_eq!(ir.combine(&c), want);
        assert_eq!(ir.combine(&[q(0, 1), q(0, 1)]), vec![q(0, 1); 3]);
    }
}
