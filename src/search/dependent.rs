//! Reductions by linearly dependent products over GF(2): when, for two axes y and z, the
//! rank-one products `v_t (x) w_t` of the terms in a set `S + {k}` sum to zero, term k is
//! absorbed, `u_k (x) v_k (x) w_k = sum_{t in S} u_k (x) v_t (x) w_t`, so
//! `sum_t u_t (x) v_t (x) w_t = sum_{t != k} (u_t + [t in S] u_k) (x) v_t (x) w_t`
//! (rank - 1; here u is the factor on the third axis x).
//!
//! This generalises both reductions of the walk: two terms sharing two factors (S = one
//! term, equal products), and three or more terms sharing a factor whose other factors are
//! dependent (Kauers and Moosbauer 2022 reduce only these). Products of terms that share
//! no factor can be dependent too, e.g. `a (x) b + a (x) c + d (x) b + d (x) c = (a + d)
//! (x) (b + c)`; a walk that never checks for them keeps a scheme that is not minimal.
//!
//! Invariant: the sum of the scheme is unchanged; afterwards the products on every pair
//! of axes are linearly independent (no further reduction of this kind applies).

use super::bits::{bits_of, words, xor_words};
use super::flip::Walker;

/// The rank-one product `v (x) w` of two masks as a mask of `dy * dz` bits, bit
/// `i * dz + j` for bits i of v and j of w. Cost: O(|v| |w|) bit sets.
fn kron(v: &[u64], w: &[u64], dz: usize, out: &mut [u64]) {
    out.fill(0);
    for i in bits_of(v) {
        for j in bits_of(w) {
            let b = i * dz + j;
            out[b / 64] |= 1 << (b % 64);
        }
    }
}

/// A set of rows of `rows` (each `len` words) summing to zero, as the indices of its
/// members (the last one is the row found dependent on the others), if any.
/// Cost: O(r^2 (len + r / 64)) word operations for r rows (an incremental GF(2)
/// elimination that carries the combinations). Each kept row is reduced by the rows kept
/// before it, so it is zero at their pivots and one pass in order reduces a new row.
fn dependent_rows(rows: &[u64], len: usize) -> Option<Vec<usize>> {
    let r = rows.len() / len.max(1);
    let cw = words(r);
    // reduced rows with their pivot bit and the combination of input rows they are
    let mut basis: Vec<(usize, Vec<u64>, Vec<u64>)> = Vec::new();
    for t in 0..r {
        let mut v = rows[t * len..(t + 1) * len].to_vec();
        let mut comb = vec![0u64; cw];
        comb[t / 64] |= 1 << (t % 64);
        for (pivot, b, bc) in &basis {
            if v[pivot / 64] >> (pivot % 64) & 1 == 1 {
                xor_words(&mut v, b);
                xor_words(&mut comb, bc);
            }
        }
        match v.iter().position(|&x| x != 0) {
            None => {
                let mut set: Vec<usize> = bits_of(&comb).filter(|&s| s != t).collect();
                set.push(t);
                return Some(set);
            }
            Some(wd) => {
                let pivot = wd * 64 + v[wd].trailing_zeros() as usize;
                basis.push((pivot, v, comb));
            }
        }
    }
    None
}

impl<const W: usize> Walker<W> {
    /// Apply reductions by dependent products (module doc) on all three pairs of axes
    /// until none applies, with the plain reductions after each. Returns true when the rank
    /// went down. Cost: per pass, three eliminations of r products of `d_y d_z` bits,
    /// O(r^2 (d_y d_z / 64 + r / 64)) word operations.
    pub fn reduce_products(&mut self) -> bool {
        let mut any = false;
        let dims = self.dims();
        'again: loop {
            for x in 0..3 {
                let (y, z) = ((x + 1) % 3, (x + 2) % 3);
                let len = words(dims[y] * dims[z]);
                let r = self.rank();
                let mut rows = vec![0u64; r * len];
                for t in 0..r {
                    let (fy, fz) = (self.factor(y, t), self.factor(z, t));
                    kron(fy, fz, dims[z], &mut rows[t * len..(t + 1) * len]);
                }
                let Some(set) = dependent_rows(&rows, len) else {
                    continue;
                };
                let (&k, rest) = set.split_last().expect("a dependent set is not empty");
                self.absorb(x, k, rest);
                any = true;
                continue 'again;
            }
            return any;
        }
    }

    /// Add the factor of term k on axis x to that of every term of `into`, drop term k,
    /// and apply the plain reductions.
    fn absorb(&mut self, x: usize, k: usize, into: &[usize]) {
        let uk = *self.factor_mask(x, k);
        for &t in into {
            self.add_to_factor(x, t, &uk);
        }
        self.remove_and_settle(k, into);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::search::bits::BitScheme;

    /// The five terms a (x) b (x) e0, a (x) c (x) e1, d (x) b (x) e2, d (x) c (x) e3 and
    /// (a + d) (x) (b + c) (x) e4: no two share two factors and no three share one with
    /// dependent partners, yet their products on the first two axes sum to zero.
    #[test]
    fn products_without_shared_factors_reduce() {
        let (a, d, b, c) = (1u64, 2u64, 1u64, 2u64);
        let s = BitScheme {
            dims: [2, 2, 5],
            terms: vec![
                [vec![a], vec![b], vec![1]],
                [vec![a], vec![c], vec![2]],
                [vec![d], vec![b], vec![4]],
                [vec![d], vec![c], vec![8]],
                [vec![a ^ d], vec![b ^ c], vec![16]],
            ],
        };
        let mut w = Walker::<1>::new(&s, 1);
        assert_eq!(w.rank(), 5);
        assert!(w.reduce_products());
        assert_eq!(w.rank(), 4);
        assert_eq!(w.scheme().evaluate(), s.evaluate());
        assert!(!w.reduce_products());
    }

    /// Three terms sharing their left factor whose middle factors sum to zero become two,
    /// the tensor unchanged: a (x) e0 (x) e0 + a (x) e1 (x) e1 + a (x) (e0 + e1) (x) e2.
    #[test]
    fn three_dependent_terms_reduce_to_two() {
        let s = BitScheme {
            dims: [1, 2, 3],
            terms: vec![
                [vec![1], vec![1], vec![1]],
                [vec![1], vec![2], vec![2]],
                [vec![1], vec![3], vec![4]],
            ],
        };
        let mut w = Walker::<1>::new(&s, 1);
        assert_eq!(w.rank(), 3, "no two terms share two factors");
        assert!(w.reduce_products());
        assert_eq!(w.rank(), 2);
        assert_eq!(w.scheme().evaluate(), s.evaluate());
        assert!(!w.reduce_products());
    }

    #[test]
    fn dependent_rows_finds_a_zero_sum() {
        // rows 1, 2, 3 (one word each): 1 ^ 2 ^ 3 = 0
        let set = dependent_rows(&[1, 2, 3], 1).unwrap();
        assert_eq!(set, vec![0, 1, 2]);
        assert!(dependent_rows(&[1, 2, 4], 1).is_none());
    }
}
