//! Homogeneous linear systems over Z (for Q) or over GF(q), given by *how to produce their
//! equations modulo a prime*, block by block ([`RowSource`]). This is the one form in which
//! every invariant subspace and every exact rank is posed; [`super::nullspace`] solves it.
//!
//! Equations are never stored over the integers: a source writes the residues of each
//! block's equations modulo any prime into a [`RowBuf`], as terms `(row, column, value)`.
//! The *pattern* of a row (the columns of its terms) does not depend on the prime, and a
//! block always yields the same number of rows, so row `r` modulo one prime and row `r`
//! modulo another are the images of one integer equation. A source also states a bound
//! on its terms (`term_bits`): every term of an equation over Z has absolute value at most
//! `2^term_bits`, so an equation with t terms has L1 norm at most `t 2^term_bits`; this is
//! what the exact check by the Chinese remainder theorem needs.

/// A homogeneous system `M x = 0` given by its equations modulo primes.
pub trait RowSource: Sync {
    /// Number of unknowns (columns).
    fn unknowns(&self) -> usize;
    /// Number of equation blocks.
    fn blocks(&self) -> usize;
    /// `None` for an integer system (solutions over Q), `Some(q)` for one over GF(q).
    fn modulus(&self) -> Option<u64>;
    /// Write the equations of block `b` modulo `p` into `out` (then `out.end_block(..)`).
    fn block(&self, b: usize, p: u64, out: &mut RowBuf);
    /// `log2` of a bound on the absolute value of every term over Z.
    fn term_bits(&self) -> u64;
    /// An estimate of the number of terms of the whole system (for memory and strategy).
    fn estimated_terms(&self) -> usize;
    /// Solve block by block without writing the system out first (dense systems, where
    /// splitting into components gains nothing and early exits save most of the work).
    fn prefers_streaming(&self) -> bool {
        false
    }
}

/// Equations modulo p in compressed row storage, assembled block by block from terms.
/// Rows keep every column of their pattern, also where the merged residue is 0.
#[derive(Clone, Debug, Default)]
pub struct RowBuf {
    pub p: u64,
    terms: Vec<(u32, u32, u64)>,
    pub ptr: Vec<usize>,
    pub cols: Vec<u32>,
    pub vals: Vec<u32>,
    /// The largest number of terms added to one row.
    pub max_terms: usize,
}

impl RowBuf {
    /// An empty buffer modulo p.
    pub fn new(p: u64) -> Self {
        RowBuf {
            p,
            terms: Vec::new(),
            ptr: vec![0],
            cols: Vec::new(),
            vals: Vec::new(),
            max_terms: 0,
        }
    }

    /// Forget all rows (keep the prime).
    pub fn clear(&mut self) {
        self.terms.clear();
        self.ptr.truncate(1);
        self.cols.clear();
        self.vals.clear();
    }

    /// Number of rows.
    pub fn rows(&self) -> usize {
        self.ptr.len() - 1
    }

    /// Row `r`: columns and residues.
    #[inline]
    pub fn row(&self, r: usize) -> (&[u32], &[u32]) {
        let (a, b) = (self.ptr[r], self.ptr[r + 1]);
        (&self.cols[a..b], &self.vals[a..b])
    }

    /// Add the residue `v < p` to the coefficient of column `col` in row `row` of the
    /// current block.
    #[inline]
    pub fn add(&mut self, row: usize, col: usize, v: u64) {
        self.terms.push((row as u32, col as u32, v));
    }

    /// Add `-v` (v < p).
    #[inline]
    pub fn sub(&mut self, row: usize, col: usize, v: u64) {
        self.terms
            .push((row as u32, col as u32, (self.p - v) % self.p));
    }

    /// Add the product `a b mod p` (a, b < p), with a sign.
    #[inline]
    pub fn add_product(&mut self, row: usize, col: usize, a: u64, b: u64, negative: bool) {
        let v = ((a as u128 * b as u128) % self.p as u128) as u64;
        if negative {
            self.sub(row, col, v);
        } else {
            self.add(row, col, v);
        }
    }

    /// Close the current block: its `rows` rows (keys `0..rows`) are appended, each with its
    /// terms merged by column.
    /// Cost: O(terms) to group the terms by row (a counting sort), then a sort of each
    /// row's few terms by column.
    pub fn end_block(&mut self, rows: usize) {
        let p = self.p;
        debug_assert!(
            self.terms.iter().all(|t| (t.0 as usize) < rows),
            "row keys below the block's row count"
        );
        // counting sort by row: start[r] .. start[r + 1] will hold row r's terms
        let mut start = vec![0usize; rows + 1];
        for t in &self.terms {
            start[t.0 as usize + 1] += 1;
        }
        for r in 0..rows {
            start[r + 1] += start[r];
        }
        let mut next = start.clone();
        let mut grouped: Vec<(u32, u64)> = vec![(0, 0); self.terms.len()];
        for t in &self.terms {
            let at = &mut next[t.0 as usize];
            grouped[*at] = (t.1, t.2);
            *at += 1;
        }
        for r in 0..rows {
            let row = &mut grouped[start[r]..start[r + 1]];
            row.sort_unstable_by_key(|t| t.0);
            let mut idx = 0;
            while idx < row.len() {
                let col = row[idx].0;
                let mut acc = 0u64;
                while idx < row.len() && row[idx].0 == col {
                    acc = (acc + row[idx].1) % p;
                    idx += 1;
                }
                self.cols.push(col);
                self.vals.push(acc as u32);
            }
            self.max_terms = self.max_terms.max(row.len());
            self.ptr.push(self.cols.len());
        }
        self.terms.clear();
    }
}

/// Write the whole system modulo p (all blocks in order).
pub fn materialize(src: &dyn RowSource, p: u64) -> RowBuf {
    let mut out = RowBuf::new(p);
    for b in 0..src.blocks() {
        src.block(b, p, &mut out);
    }
    out
}

/// A dense integer matrix (rows of big integers) as a system: one block per row. Its
/// solutions are over Q, or over GF(q) when built with [`IntegerRows::modulo`].
pub struct IntegerRows {
    pub cols: usize,
    pub rows: Vec<Vec<num_bigint::BigInt>>,
    bits: u64,
    modulus: Option<u64>,
}

impl IntegerRows {
    pub fn new(cols: usize, rows: Vec<Vec<num_bigint::BigInt>>) -> Self {
        let bits = rows.iter().flatten().map(|x| x.bits()).max().unwrap_or(0);
        IntegerRows {
            cols,
            rows,
            bits,
            modulus: None,
        }
    }

    /// The same rows read modulo the prime q: a system over GF(q).
    pub fn modulo(cols: usize, rows: Vec<Vec<num_bigint::BigInt>>, q: u64) -> Self {
        IntegerRows {
            modulus: Some(q),
            ..IntegerRows::new(cols, rows)
        }
    }
}

impl RowSource for IntegerRows {
    fn unknowns(&self) -> usize {
        self.cols
    }
    fn blocks(&self) -> usize {
        self.rows.len()
    }
    fn modulus(&self) -> Option<u64> {
        self.modulus
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        use num_traits::Zero;
        for (c, x) in self.rows[b].iter().enumerate() {
            if !x.is_zero() {
                let r = crate::scalar::residue(x, p);
                out.add(0, c, r);
            }
        }
        out.end_block(1);
    }
    fn term_bits(&self) -> u64 {
        self.bits
    }
    fn estimated_terms(&self) -> usize {
        self.rows.len() * self.cols
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn blocks_merge_terms_and_keep_patterns() {
        let mut b = RowBuf::new(5);
        b.add(1, 2, 3);
        b.add(0, 1, 1);
        b.sub(1, 2, 3); // cancels to 0, the column stays in the pattern
        b.add(0, 0, 2);
        b.add(0, 1, 1);
        b.end_block(3);
        assert_eq!(b.rows(), 3);
        assert_eq!(b.row(0), (&[0u32, 1][..], &[2u32, 2][..]));
        assert_eq!(b.row(1), (&[2u32][..], &[0u32][..]));
        assert_eq!(b.row(2), (&[][..], &[][..]));
        assert_eq!(b.max_terms, 3);
    }
}
