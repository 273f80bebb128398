//! Sparse homogeneous linear systems with integer coefficients: the one form in which
//! every invariant of this module is posed.
//!
//! An invariant (derivations, centroid, nuclei, ...) is the solution space of equations
//! that are polynomial (of degree 1 or 2) in the structure constants. The constants are
//! first scaled to integers ([`IntTable`]: over Q by the lcm of their denominators, which
//! leaves every homogeneous system's solutions unchanged; over GF(p) the representatives
//! in `0..p`). Each equation is then a short sparse row of integers ([`SparseSystem`],
//! compressed row storage). Over GF(p) coefficients are stored reduced mod p.
//!
//! Invariants: rows are sorted by column, hold no zero coefficient and no repeated column;
//! over Q every stored coefficient fits in an `i64`.

use crate::error::{Error, Result};
use crate::scalar::FieldSpec;
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive};

/// Largest absolute value of an integer-scaled structure constant accepted (2^40): then
/// every coefficient of a degree-2 equation is accumulated exactly in `i128`.
pub const MAX_SCALED_BITS: u32 = 40;

/// Structure constants as integers: `products[i * dims[1] + j]` = nonzero `(k, c)`.
#[derive(Clone, Debug)]
pub struct IntTable {
    pub dims: [usize; 3],
    pub products: Vec<Vec<(usize, i64)>>,
    /// `None` over Q, `Some(p)` over GF(p).
    pub modulus: Option<u64>,
    /// For each right index j: all `(l, k, c)` with `c[l][j][k] != 0`.
    pub by_right: Vec<Vec<(usize, usize, i64)>>,
    /// The scale L (integer constants = L * constants over Q; 1 over GF(p)).
    pub scale: BigInt,
}

impl IntTable {
    /// Scale a tensor's constants to integers (see the module documentation).
    /// Errors when a scaled constant exceeds 2^40 in absolute value over Q.
    pub fn from_tensor(t: &Tensor) -> Result<Self> {
        let dims = t.dims();
        let modulus = match t.field() {
            FieldSpec::Rational => None,
            FieldSpec::Prime(p) => Some(p),
        };
        let lcm = t
            .entries()
            .fold(BigInt::one(), |acc, (_, _, _, v)| acc.lcm(v.denom()));
        let mut products = vec![Vec::new(); dims[0] * dims[1]];
        let limit = BigInt::from(1u64 << MAX_SCALED_BITS);
        for (i, j, k, v) in t.entries() {
            let x = match modulus {
                None => {
                    let s = v.numer() * (&lcm / v.denom());
                    if s.magnitude() > limit.magnitude() {
                        return Err(Error::Invalid(format!(
                            "structure constants too large for the invariant solver: after \
                             clearing denominators a constant exceeds 2^{MAX_SCALED_BITS}"
                        )));
                    }
                    s.to_i64().expect("bounded")
                }
                Some(p) => {
                    let r = v.numer().mod_floor(&BigInt::from(p));
                    r.to_i64().expect("p < 2^63")
                }
            };
            if x != 0 {
                products[i * dims[1] + j].push((k, x));
            }
        }
        let mut by_right = vec![Vec::new(); dims[1]];
        for i in 0..dims[0] {
            for j in 0..dims[1] {
                for &(k, c) in &products[i * dims[1] + j] {
                    by_right[j].push((i, k, c));
                }
            }
        }
        let scale = if modulus.is_some() {
            BigInt::one()
        } else {
            lcm
        };
        Ok(IntTable {
            dims,
            products,
            modulus,
            by_right,
            scale,
        })
    }

    /// The product of basis vectors `i * j` as `(k, c)`.
    #[inline]
    pub fn product(&self, i: usize, j: usize) -> &[(usize, i64)] {
        &self.products[i * self.dims[1] + j]
    }

    /// An empty system over this table's field with `unknowns` columns.
    pub fn system(&self, unknowns: usize) -> SparseSystem {
        SparseSystem::new(unknowns, self.modulus)
    }

    /// The product of two coefficients, reduced mod p over GF(p) (so that sums of many
    /// products stay far below 2^127).
    #[inline]
    pub fn mul(&self, a: i64, b: i128) -> i128 {
        match self.modulus {
            None => a as i128 * b,
            Some(p) => (a as i128 * b.rem_euclid(p as i128)).rem_euclid(p as i128),
        }
    }

    /// Total number of nonzero constants.
    pub fn nnz(&self) -> usize {
        self.products.iter().map(Vec::len).sum()
    }
}

/// A homogeneous sparse linear system `M x = 0` in compressed row storage.
#[derive(Clone, Debug)]
pub struct SparseSystem {
    pub unknowns: usize,
    pub modulus: Option<u64>,
    row_ptr: Vec<usize>,
    cols: Vec<u32>,
    vals: Vec<i64>,
}

impl SparseSystem {
    /// The empty system (no equations) in `unknowns` unknowns.
    pub fn new(unknowns: usize, modulus: Option<u64>) -> Self {
        SparseSystem {
            unknowns,
            modulus,
            row_ptr: vec![0],
            cols: Vec::new(),
            vals: Vec::new(),
        }
    }

    /// Number of stored (nonzero) equations.
    pub fn rows(&self) -> usize {
        self.row_ptr.len() - 1
    }

    /// Number of stored coefficients.
    pub fn nnz(&self) -> usize {
        self.cols.len()
    }

    /// Equation `r` as (columns, coefficients).
    #[inline]
    pub fn row(&self, r: usize) -> (&[u32], &[i64]) {
        let (a, b) = (self.row_ptr[r], self.row_ptr[r + 1]);
        (&self.cols[a..b], &self.vals[a..b])
    }

    /// Append the equations of a block (see [`BlockBuf`]); empties the buffer.
    pub fn push_block(&mut self, buf: &mut BlockBuf) -> Result<()> {
        buf.terms.sort_unstable_by_key(|t| (t.0, t.1));
        let terms = std::mem::take(&mut buf.terms);
        let mut idx = 0;
        while idx < terms.len() {
            let row = terms[idx].0;
            while idx < terms.len() && terms[idx].0 == row {
                let col = terms[idx].1;
                let mut acc: i128 = 0;
                while idx < terms.len() && terms[idx].0 == row && terms[idx].1 == col {
                    acc = match self.modulus {
                        Some(p) => (acc + terms[idx].2.rem_euclid(p as i128)) % p as i128,
                        None => acc.checked_add(terms[idx].2).ok_or_else(too_large)?,
                    };
                    idx += 1;
                }
                if acc != 0 {
                    let v = i64::try_from(acc).map_err(|_| too_large())?;
                    self.cols.push(col);
                    self.vals.push(v);
                }
            }
            if *self.row_ptr.last().expect("nonempty") != self.cols.len() {
                self.row_ptr.push(self.cols.len());
            }
        }
        buf.terms = terms;
        buf.terms.clear();
        Ok(())
    }

    /// Append all equations of another system on the same unknowns (shifting none).
    pub fn append(&mut self, other: &SparseSystem) {
        debug_assert_eq!(self.unknowns, other.unknowns);
        for r in 0..other.rows() {
            let (c, v) = other.row(r);
            self.cols.extend_from_slice(c);
            self.vals.extend_from_slice(v);
            self.row_ptr.push(self.cols.len());
        }
    }
}

fn too_large() -> Error {
    Error::Invalid("a coefficient of an invariant's linear system exceeds 64 bits".to_string())
}

/// Terms `(row key, column, value)` of a block of equations; keys only group terms into
/// equations within one block.
#[derive(Default, Debug)]
pub struct BlockBuf {
    terms: Vec<(u32, u32, i128)>,
}

impl BlockBuf {
    /// Add `value` to the coefficient of unknown `col` in equation `row` of the block.
    #[inline]
    pub fn add(&mut self, row: usize, col: usize, value: i128) {
        if value != 0 {
            self.terms.push((row as u32, col as u32, value));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn blocks_merge_terms() {
        let mut s = SparseSystem::new(3, None);
        let mut b = BlockBuf::default();
        b.add(1, 2, 3);
        b.add(0, 1, 1);
        b.add(1, 2, -3); // cancels: row 1 vanishes
        b.add(0, 0, 2);
        b.add(0, 1, 1);
        s.push_block(&mut b).unwrap();
        assert_eq!(s.rows(), 1);
        assert_eq!(s.row(0), (&[0u32, 1][..], &[2i64, 2][..]));
        let mut m = SparseSystem::new(2, Some(5));
        b.add(0, 0, 7);
        b.add(0, 1, 10);
        m.push_block(&mut b).unwrap();
        assert_eq!(m.row(0), (&[0u32][..], &[2i64][..]));
    }
}
