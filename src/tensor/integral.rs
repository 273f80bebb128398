//! The structure constants scaled to integers, and their images modulo word primes: the
//! common input of every multi-modular computation (laws, invariant systems, ranks).
//!
//! Over Q the constants are multiplied by the least common multiple `D` of their
//! denominators, so `c' = D c` are integers of any size (no limit). An identity or a linear
//! system that is homogeneous of degree k in the constants changes by the factor `D^k`
//! only, so it vanishes for `c'` exactly when it vanishes for `c`. Over GF(q) the constants
//! are their representatives in `0..q` and `D = 1`.
//!
//! [`ModTable`] holds the residues of `c'` modulo one prime p: `u32` words when p is a
//! kernel prime (below 2^28) or the field's own prime when that is small enough, stored
//! sparsely per product and, for dense tables, also as two dense arrays (by product
//! `(i, j)` and by swapped product `(j, i)`), so that the left and right multiplication
//! matrices `L_i` and `R_k` are contiguous blocks.
//!
//! Invariants: sparse rows are sorted by result index and hold every nonzero constant of
//! the tensor (a residue may be 0: the pattern is the same for every prime); dense arrays,
//! when present, agree with the sparse rows.

use super::Tensor;
use crate::linalg::kernels::KERNEL_PRIME_BITS;
use crate::linalg::nullspace::cached_primes;
use crate::scalar::FieldSpec;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};
use std::sync::OnceLock;

/// Integer-scaled structure constants (see the module documentation), with their residue
/// tables modulo the primes asked for, built once each and shared.
#[derive(Debug)]
pub struct IntegralTensor {
    pub dims: [usize; 3],
    pub field: FieldSpec,
    /// `D`: the lcm of the denominators over Q; 1 over GF(q).
    pub scale: BigInt,
    /// `products[i * dims[1] + j]` = nonzero `(k, c'[i][j][k])`, sorted by k.
    pub products: Vec<Vec<(u32, BigInt)>>,
    /// `max over (i, j) of sum_k |c'[i][j][k]|`: the norm L with `|x y|_1 <= L |x|_1 |y|_1`.
    pub row_norm: BigInt,
    /// The largest `|c'[i][j][k]|`.
    pub max_abs: BigInt,
    nnz: usize,
    /// Dense layouts are built for the residue tables (the table is dense).
    pub dense: bool,
    images: Vec<OnceLock<ModTable>>,
    field_image: OnceLock<ModTable>,
    /// For each right index j: every `(l, k, position)` with `c[l][j][k]` stored at that
    /// position of the residue arrays (the same for every prime).
    by_right: Vec<Vec<(u32, u32, u32)>>,
}

/// A residue table of an [`IntegralTensor`]: kept in the tensor, or built for one use.
pub enum Residues<'a> {
    Kept(&'a ModTable),
    Built(Box<ModTable>),
}

impl std::ops::Deref for Residues<'_> {
    type Target = ModTable;
    fn deref(&self) -> &ModTable {
        match self {
            Residues::Kept(t) => t,
            Residues::Built(t) => t,
        }
    }
}

impl IntegralTensor {
    /// Scale a tensor's constants to integers. Cost: O(nnz) big-integer operations.
    pub fn from_tensor(t: &Tensor) -> Self {
        let dims = t.dims();
        let scale = match t.field() {
            FieldSpec::Rational => crate::scalar::common_denominator(t.entries().map(|e| e.3)),
            FieldSpec::Prime(_) => BigInt::one(),
        };
        let mut products = Vec::with_capacity(dims[0] * dims[1]);
        let mut row_norm = BigInt::zero();
        let mut max_abs = BigInt::zero();
        let mut nnz = 0;
        for i in 0..dims[0] {
            for j in 0..dims[1] {
                let row: Vec<(u32, BigInt)> = t
                    .product(i, j)
                    .iter()
                    .map(|(k, v)| (*k as u32, v.numer() * (&scale / v.denom())))
                    .collect();
                let mut s = BigInt::zero();
                for (_, c) in &row {
                    let a = c.abs();
                    if a > max_abs {
                        max_abs = a.clone();
                    }
                    s += a;
                }
                if s > row_norm {
                    row_norm = s;
                }
                nnz += row.len();
                products.push(row);
            }
        }
        let mut by_right = vec![Vec::new(); dims[1]];
        let mut pos = 0u32;
        for l in 0..dims[0] {
            for (j, br) in by_right.iter_mut().enumerate() {
                for (k, _) in &products[l * dims[1] + j] {
                    br.push((l as u32, *k, pos));
                    pos += 1;
                }
            }
        }
        IntegralTensor {
            dims,
            field: t.field(),
            scale,
            products,
            row_norm,
            max_abs,
            nnz,
            dense: prefers_dense(dims, nnz),
            images: (0..cached_primes().len())
                .map(|_| OnceLock::new())
                .collect(),
            field_image: OnceLock::new(),
            by_right,
        }
    }

    /// `None` over Q, `Some(q)` over GF(q).
    pub fn modulus(&self) -> Option<u64> {
        match self.field {
            FieldSpec::Rational => None,
            FieldSpec::Prime(q) => Some(q),
        }
    }

    /// The residue table modulo p (a prime below 2^28), with dense layouts when the table is
    /// dense. Tables for the first kernel primes and for the field's prime are built once
    /// and kept; for any other prime the table is built for the caller alone.
    pub fn residues(&self, p: u64) -> Residues<'_> {
        if self.modulus() == Some(p) {
            return Residues::Kept(self.field_image.get_or_init(|| self.image(p, self.dense)));
        }
        match cached_primes().iter().position(|&q| q == p) {
            Some(i) => Residues::Kept(self.images[i].get_or_init(|| self.image(p, self.dense))),
            None => Residues::Built(Box::new(self.image(p, self.dense))),
        }
    }

    /// The constants `c[l][j][k]` with right index j as `(l, k, position)`.
    pub fn by_right(&self, j: usize) -> &[(u32, u32, u32)] {
        &self.by_right[j]
    }

    /// `log2` of `max(1, largest |constant|)`, rounded up.
    pub fn constant_bits(&self) -> u64 {
        self.max_abs.bits().max(1)
    }

    /// Number of nonzero constants.
    pub fn nnz(&self) -> usize {
        self.nnz
    }

    /// The product `i * j` as `(k, c')`.
    pub fn product(&self, i: usize, j: usize) -> &[(u32, BigInt)] {
        &self.products[i * self.dims[1] + j]
    }

    /// `x * i` (`left`: the column `i` of `L_x`) or `i * x` (the column `i` of `R_x`), as
    /// `(k, c')`.
    pub fn product_by(&self, x: usize, i: usize, left: bool) -> &[(u32, BigInt)] {
        if left {
            self.product(x, i)
        } else {
            self.product(i, x)
        }
    }

    /// `log2` of the row norm L (0 for the zero tensor), rounded up.
    pub fn row_norm_bits(&self) -> u64 {
        self.row_norm.bits()
    }

    /// The residues of the constants modulo `p` (a kernel prime, or the field's prime when
    /// it is below 2^28). `dense` asks for the dense layouts as well.
    /// Cost: O(nnz) reductions, plus O(d0 d1 d2) words for the dense layouts.
    pub fn image(&self, p: u64, dense: bool) -> ModTable {
        assert!(p < 1 << KERNEL_PRIME_BITS, "residue words need p < 2^28");
        let [a, b, _] = self.dims;
        let pb = BigInt::from(p);
        let mut ptr = Vec::with_capacity(a * b + 1);
        let mut idx = Vec::with_capacity(self.nnz);
        let mut val = Vec::with_capacity(self.nnz);
        ptr.push(0u32);
        for row in &self.products {
            for (k, x) in row {
                let r = match x.to_i64() {
                    Some(s) => s.rem_euclid(p as i64) as u32,
                    None => x.mod_floor(&pb).to_u32().expect("reduced below p"),
                };
                // zero residues are kept: the pattern does not depend on the prime
                idx.push(*k);
                val.push(r);
            }
            ptr.push(idx.len() as u32);
        }
        let mut m = ModTable {
            p,
            dims: self.dims,
            ptr,
            idx,
            val,
            by_product: Vec::new(),
            by_swapped: Vec::new(),
        };
        if dense {
            m.fill_dense();
        }
        m
    }

    /// The residues modulo the field's own prime q (for a tensor over GF(q), q < 2^28).
    pub fn field_image(&self, dense: bool) -> Option<ModTable> {
        match self.field {
            FieldSpec::Prime(q) if q < 1 << KERNEL_PRIME_BITS => Some(self.image(q, dense)),
            _ => None,
        }
    }
}

/// Residues of the integer-scaled constants modulo one prime (see the module
/// documentation).
#[derive(Clone, Debug)]
pub struct ModTable {
    pub p: u64,
    pub dims: [usize; 3],
    ptr: Vec<u32>,
    idx: Vec<u32>,
    val: Vec<u32>,
    /// `(i * d1 + j) * d2 + k` -> residue (empty unless requested).
    by_product: Vec<u32>,
    /// `(j * d0 + i) * d2 + k` -> residue (empty unless requested).
    by_swapped: Vec<u32>,
}

impl ModTable {
    /// The sparse product `i * j`: result indices and residues.
    #[inline]
    pub fn row(&self, i: usize, j: usize) -> (&[u32], &[u32]) {
        let r = i * self.dims[1] + j;
        let (s, e) = (self.ptr[r] as usize, self.ptr[r + 1] as usize);
        (&self.idx[s..e], &self.val[s..e])
    }

    /// Whether the dense layouts are present.
    pub fn is_dense(&self) -> bool {
        !self.by_product.is_empty()
    }

    /// The whole dense table `(i d1 + j) d2 + k -> residue`, when the dense layouts are
    /// present.
    pub fn dense_table(&self) -> Option<&[u32]> {
        self.is_dense().then_some(&self.by_product[..])
    }

    /// The dense product `i * j` (requires the dense layouts).
    #[inline]
    pub fn dense_row(&self, i: usize, j: usize) -> &[u32] {
        let c = self.dims[2];
        let r = i * self.dims[1] + j;
        &self.by_product[r * c..(r + 1) * c]
    }

    /// The matrix of `L_i` as rows `m -> e_i * e_m` (d1 rows of d2 words; dense layouts).
    #[inline]
    pub fn left_block(&self, i: usize) -> &[u32] {
        let (b, c) = (self.dims[1], self.dims[2]);
        &self.by_product[i * b * c..(i + 1) * b * c]
    }

    /// The matrix of `R_k` as rows `m -> e_m * e_k` (d0 rows of d2 words; dense layouts).
    #[inline]
    pub fn right_block(&self, k: usize) -> &[u32] {
        let (a, c) = (self.dims[0], self.dims[2]);
        &self.by_swapped[k * a * c..(k + 1) * a * c]
    }

    /// Number of stored residues (the nonzero constants; some residues may be 0).
    pub fn nnz(&self) -> usize {
        self.idx.len()
    }

    /// The residue stored at a position of the sparse rows (positions run over the
    /// products in order, `(i, j)` row-major, and within a product by result index).
    #[inline]
    pub fn value(&self, pos: usize) -> u32 {
        self.val[pos]
    }

    /// The table of the product `x y + s y x` (`s = -1` when `minus`, else `+1`) of a square
    /// table, modulo the same prime and with the same layouts. Cost: O(nnz).
    pub fn symmetrised(&self, minus: bool) -> ModTable {
        let n = self.dims[0];
        let p = self.p;
        let mut ptr = Vec::with_capacity(n * n + 1);
        let mut idx = Vec::new();
        let mut val = Vec::new();
        let mut acc = vec![0u64; self.dims[2]];
        let mut touched: Vec<u32> = Vec::new();
        let mut mark = vec![false; self.dims[2]];
        ptr.push(0u32);
        for i in 0..n {
            for j in 0..n {
                for (swap, (ks, vs)) in [(false, self.row(i, j)), (true, self.row(j, i))] {
                    for (&k, &v) in ks.iter().zip(vs) {
                        let v = if swap && minus {
                            (p - v as u64) % p
                        } else {
                            v as u64
                        };
                        if !mark[k as usize] {
                            mark[k as usize] = true;
                            touched.push(k);
                        }
                        acc[k as usize] = (acc[k as usize] + v) % p;
                    }
                }
                touched.sort_unstable();
                for &k in &touched {
                    let v = acc[k as usize];
                    if v != 0 {
                        idx.push(k);
                        val.push(v as u32);
                    }
                    acc[k as usize] = 0;
                    mark[k as usize] = false;
                }
                touched.clear();
                ptr.push(idx.len() as u32);
            }
        }
        let mut m = ModTable {
            p,
            dims: self.dims,
            ptr,
            idx,
            val,
            by_product: Vec::new(),
            by_swapped: Vec::new(),
        };
        if self.is_dense() {
            m.fill_dense();
        }
        m
    }

    fn fill_dense(&mut self) {
        let [a, b, c] = self.dims;
        let mut bp = vec![0u32; a * b * c];
        let mut bs = vec![0u32; a * b * c];
        for i in 0..a {
            for j in 0..b {
                let (ks, vs) = self.row(i, j);
                for (&k, &v) in ks.iter().zip(vs) {
                    bp[(i * b + j) * c + k as usize] = v;
                    bs[(j * a + i) * c + k as usize] = v;
                }
            }
        }
        self.by_product = bp;
        self.by_swapped = bs;
    }
}

/// Whether a table with `nnz` nonzero constants in shape `dims` is evaluated with dense
/// kernels: at least one product in eight is nonzero on average per result coordinate
/// (a dense row operation then costs at most 8 times the sparse one) and the dense
/// layouts take at most 2^26 words.
pub fn prefers_dense(dims: [usize; 3], nnz: usize) -> bool {
    let total = dims[0] * dims[1] * dims[2];
    total > 0 && total <= 1 << 26 && nnz * 8 >= total
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn scaling_and_images() {
        let mut t = Tensor::algebra(FieldSpec::Rational, vec!["a".into(), "b".into()]);
        t.set(0, 0, 1, q(1, 2));
        t.set(0, 1, 0, q(-2, 3));
        t.set(1, 1, 1, q(5, 1));
        let it = IntegralTensor::from_tensor(&t);
        assert_eq!(it.scale, BigInt::from(6));
        assert_eq!(it.product(0, 0), &[(1, BigInt::from(3))]);
        assert_eq!(it.product(0, 1), &[(0, BigInt::from(-4))]);
        assert_eq!(it.row_norm, BigInt::from(30));
        let m = it.image(7, true);
        assert_eq!(m.row(0, 1), (&[0u32][..], &[3u32][..]));
        assert_eq!(m.dense_row(1, 1), &[0, 2]);
        assert_eq!(m.right_block(1), &[3, 0, 0, 2]);
        assert_eq!(m.left_block(0), &[0, 3, 3, 0]);
    }
}
