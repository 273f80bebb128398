//! Products of basis elements and of vectors modulo one prime, for a product table given
//! by its residues ([`ModTable`]): the operations the law plans and the degree-2 invariant
//! systems (associators) are written in.
//!
//! Two implementations share one interface ([`Ops`]):
//! - [`DenseOps`] for dense tables: vectors are arrays of `n` residues; `v * e_k` and
//!   `e_i * v` are vector-matrix products with the contiguous blocks `R_k`, `L_i` of the
//!   table (n^2 multiply-adds, vectorised, see [`crate::linalg::kernels`]); with the
//!   optional pair table `V[{a,b}][y] = S(a,b) * e_y` (`S(a,b) = e_a e_b + e_b e_a` for
//!   a != b, `e_a e_a` for a = b), products with a symmetrised pair cost n or n^2;
//! - [`SparseOps`] for sparse tables: vectors are lists of nonzero residues; a product
//!   costs the number of table entries it touches.
//!
//! Every operation adds `c * (product)` into an accumulator; [`Ops::finish`] reduces it
//! into a vector and clears it. All arithmetic is exact modulo p.

use super::ModTable;
use crate::linalg::kernels::{LAZY_ADDS, LazyAcc, Modulus};

/// Index of the unordered pair `{a, b}` (a <= b) among `0..n(n+1)/2`.
#[inline]
pub fn pair_index(a: usize, b: usize) -> usize {
    let (a, b) = if a <= b { (a, b) } else { (b, a) };
    b * (b + 1) / 2 + a
}

/// The operations of the law plans modulo one prime.
pub trait Ops: Sync {
    /// An accumulator with its scratch space (one per thread).
    type Acc: Send;
    /// A reduced vector.
    type V: Send + Clone;
    fn p(&self) -> u64;
    fn new_acc(&self) -> Self::Acc;
    fn new_vec(&self) -> Self::V;
    /// `acc += c (e_i e_j)`.
    fn add_product(&self, acc: &mut Self::Acc, c: u32, i: usize, j: usize);
    /// `acc += c (v e_k)`.
    fn add_vb(&self, acc: &mut Self::Acc, c: u32, v: &Self::V, k: usize);
    /// `acc += c ((e_i e_j) e_k)`.
    fn add_pb(&self, acc: &mut Self::Acc, c: u32, i: usize, j: usize, k: usize);
    /// `acc += c (e_i (e_j e_k))`.
    fn add_bp(&self, acc: &mut Self::Acc, c: u32, i: usize, j: usize, k: usize);
    /// `acc += c (S(a,b) e_k)`.
    fn add_sb(&self, acc: &mut Self::Acc, c: u32, a: usize, b: usize, k: usize);
    /// `acc += c (S(a,b) w)`.
    fn add_sv(&self, acc: &mut Self::Acc, c: u32, a: usize, b: usize, w: &Self::V);
    /// `acc += c (S(a,b) (e_y e_x))`.
    fn add_sp(&self, acc: &mut Self::Acc, c: u32, a: usize, b: usize, y: usize, x: usize);
    /// `acc += c ((e_i e_j) (e_k e_l))`: a product of two products (dense: one
    /// vector-matrix product per nonzero coordinate of `e_i e_j`).
    #[allow(clippy::too_many_arguments)]
    fn add_pp(&self, acc: &mut Self::Acc, c: u32, i: usize, j: usize, k: usize, l: usize);
    /// Reduce `acc` into `out` and clear `acc`.
    fn finish(&self, acc: &mut Self::Acc, out: &mut Self::V);
    /// Reduce `acc` and clear it, returning every coordinate it may have touched with its
    /// residue, zeros included (all coordinates for a dense table): a list whose pattern
    /// does not depend on the prime.
    fn drain(&self, acc: &mut Self::Acc) -> Vec<(usize, u64)>;
    fn is_zero(&self, v: &Self::V) -> bool;
    /// The nonzero residues `(k, v_k)`, sorted by k.
    fn entries(&self, v: &Self::V) -> Vec<(usize, u64)>;
}

/// Dense tables (see the module documentation).
pub struct DenseOps<'a> {
    t: &'a ModTable,
    n: usize,
    /// `V[pair][y]` rows of n residues, or empty.
    pairs: &'a [u32],
}

/// A dense accumulator and a scratch vector of scaled coefficients.
pub struct DenseAcc {
    acc: LazyAcc,
    scratch: Vec<u32>,
    scratch2: Vec<u32>,
}

impl<'a> DenseOps<'a> {
    /// Operations on a table with dense layouts (an algebra: d0 = d1 = d2 = n), with the
    /// pair table from [`build_pair_table`] or an empty slice.
    pub fn new(t: &'a ModTable, pairs: &'a [u32]) -> Self {
        assert!(t.is_dense());
        let n = t.dims[0];
        assert!(pairs.is_empty() || pairs.len() == pair_table_words(n));
        DenseOps { t, n, pairs }
    }

    fn symmetric(&self, a: usize, b: usize) -> Vec<u32> {
        symmetric(self.t, a, b)
    }

    #[inline]
    fn pair_block(&self, a: usize, b: usize) -> &[u32] {
        let n = self.n;
        let i = pair_index(a, b);
        &self.pairs[i * n * n..(i + 1) * n * n]
    }
}

/// Words of the pair table of dimension n: n^3 (n + 1) / 2.
pub fn pair_table_words(n: usize) -> usize {
    n * n * n * (n + 1) / 2
}

/// `S(a, b)` of a dense table as a dense vector.
fn symmetric(t: &ModTable, a: usize, b: usize) -> Vec<u32> {
    let x = t.dense_row(a, b);
    if a == b {
        return x.to_vec();
    }
    let y = t.dense_row(b, a);
    x.iter()
        .zip(y)
        .map(|(&u, &v)| ((u as u64 + v as u64) % t.p) as u32)
        .collect()
}

/// The pair table `V[{a,b}][y] = S(a,b) e_y` of a dense table, pairs in the order of
/// [`pair_index`]. Cost: n^5 / 2 multiply-adds (in parallel), n^3 (n + 1) / 2 words.
pub fn build_pair_table(t: &ModTable) -> Vec<u32> {
    use rayon::prelude::*;
    let n = t.dims[0];
    let mut pairs = vec![0u32; pair_table_words(n)];
    let list: Vec<(usize, usize)> = (0..n).flat_map(|b| (0..=b).map(move |a| (a, b))).collect();
    pairs
        .par_chunks_mut(n * n)
        .zip(list.par_iter())
        .for_each(|(block, &(a, b))| {
            let s = symmetric(t, a, b);
            let mut acc = LazyAcc::new(n, t.p);
            for y in 0..n {
                acc.clear();
                acc.vec_mat(&s, t.right_block(y));
                let v = acc.finish();
                for (o, &x) in block[y * n..(y + 1) * n].iter_mut().zip(v) {
                    *o = x as u32;
                }
            }
        });
    pairs
}

/// `c * v` into `out` (a copy when c = 1).
#[inline]
fn scaled<'s>(c: u32, v: &[u32], p: u64, out: &'s mut Vec<u32>) -> &'s [u32] {
    out.clear();
    if c == 1 {
        out.extend_from_slice(v);
    } else {
        let m = Modulus::new(p);
        out.extend(v.iter().map(|&x| m.mul(c, x)));
    }
    out
}

impl Ops for DenseOps<'_> {
    type Acc = DenseAcc;
    type V = Vec<u32>;
    fn p(&self) -> u64 {
        self.t.p
    }
    fn new_acc(&self) -> DenseAcc {
        DenseAcc {
            acc: LazyAcc::new(self.n, self.t.p),
            scratch: Vec::with_capacity(self.n),
            scratch2: Vec::with_capacity(self.n),
        }
    }
    fn new_vec(&self) -> Vec<u32> {
        vec![0; self.n]
    }
    fn add_product(&self, a: &mut DenseAcc, c: u32, i: usize, j: usize) {
        a.acc.axpy(c, self.t.dense_row(i, j));
    }
    fn add_vb(&self, a: &mut DenseAcc, c: u32, v: &Vec<u32>, k: usize) {
        let s = scaled(c, v, self.t.p, &mut a.scratch);
        a.acc.vec_mat(s, self.t.right_block(k));
    }
    fn add_pb(&self, a: &mut DenseAcc, c: u32, i: usize, j: usize, k: usize) {
        let s = scaled(c, self.t.dense_row(i, j), self.t.p, &mut a.scratch);
        a.acc.vec_mat(s, self.t.right_block(k));
    }
    fn add_bp(&self, a: &mut DenseAcc, c: u32, i: usize, j: usize, k: usize) {
        let s = scaled(c, self.t.dense_row(j, k), self.t.p, &mut a.scratch);
        a.acc.vec_mat(s, self.t.left_block(i));
    }
    fn add_sb(&self, a: &mut DenseAcc, c: u32, x: usize, y: usize, k: usize) {
        if self.pairs.is_empty() {
            let s = self.symmetric(x, y);
            let s = scaled(c, &s, self.t.p, &mut a.scratch);
            a.acc.vec_mat(s, self.t.right_block(k));
        } else {
            let n = self.n;
            a.acc.axpy(c, &self.pair_block(x, y)[k * n..(k + 1) * n]);
        }
    }
    fn add_sv(&self, a: &mut DenseAcc, c: u32, x: usize, y: usize, w: &Vec<u32>) {
        if self.pairs.is_empty() {
            // S(x,y) w = sum_m S_m (e_m w): n vector-matrix products (witnesses only)
            let s = self.symmetric(x, y);
            let ws = scaled(c, w, self.t.p, &mut a.scratch).to_vec();
            for (m, &sm) in s.iter().enumerate() {
                if sm != 0 {
                    let coefs = scaled(sm, &ws, self.t.p, &mut a.scratch2);
                    a.acc.vec_mat(coefs, self.t.left_block(m));
                }
            }
        } else {
            let s = scaled(c, w, self.t.p, &mut a.scratch);
            a.acc.vec_mat(s, self.pair_block(x, y));
        }
    }
    fn add_sp(&self, a: &mut DenseAcc, c: u32, x: usize, y: usize, u: usize, v: usize) {
        let w = self.t.dense_row(u, v).to_vec();
        self.add_sv(a, c, x, y, &w);
    }
    fn add_pp(&self, a: &mut DenseAcc, c: u32, i: usize, j: usize, k: usize, l: usize) {
        // sum_m (e_i e_j)_m e_m (e_k e_l)
        let w = scaled(c, self.t.dense_row(k, l), self.t.p, &mut a.scratch).to_vec();
        for (m, &pm) in self.t.dense_row(i, j).iter().enumerate() {
            if pm != 0 {
                let coefs = scaled(pm, &w, self.t.p, &mut a.scratch2);
                a.acc.vec_mat(coefs, self.t.left_block(m));
            }
        }
    }
    fn finish(&self, a: &mut DenseAcc, out: &mut Vec<u32>) {
        let v = a.acc.finish();
        out.clear();
        out.extend(v.iter().map(|&x| x as u32));
        a.acc.clear();
    }
    fn drain(&self, a: &mut DenseAcc) -> Vec<(usize, u64)> {
        let v: Vec<(usize, u64)> = a.acc.finish().iter().copied().enumerate().collect();
        a.acc.clear();
        v
    }
    fn is_zero(&self, v: &Vec<u32>) -> bool {
        v.iter().all(|&x| x == 0)
    }
    fn entries(&self, v: &Vec<u32>) -> Vec<(usize, u64)> {
        v.iter()
            .enumerate()
            .filter(|(_, x)| **x != 0)
            .map(|(k, &x)| (k, x as u64))
            .collect()
    }
}

/// Sparse tables (see the module documentation).
pub struct SparseOps<'a> {
    t: &'a ModTable,
    n: usize,
    m: Modulus,
}

/// A sparse accumulator: dense values with the list of touched coordinates.
pub struct SparseAcc {
    vals: Vec<u64>,
    touched: Vec<u32>,
    mark: Vec<bool>,
    /// Products added per coordinate since the last reduction (an upper bound).
    pending: usize,
    m: Modulus,
}

impl SparseAcc {
    #[inline]
    fn room(&mut self, k: usize) {
        if self.pending + k > LAZY_ADDS {
            for &i in &self.touched {
                self.vals[i as usize] = self.m.reduce(self.vals[i as usize]);
            }
            self.pending = 0;
        }
        self.pending += k;
    }

    #[inline]
    fn scatter(&mut self, c: u32, idx: &[u32], val: &[u32]) {
        for (&k, &v) in idx.iter().zip(val) {
            let ku = k as usize;
            if !self.mark[ku] {
                self.mark[ku] = true;
                self.touched.push(k);
            }
            self.vals[ku] += c as u64 * v as u64;
        }
    }
}

impl<'a> SparseOps<'a> {
    pub fn new(t: &'a ModTable) -> Self {
        SparseOps {
            t,
            n: t.dims[0],
            m: Modulus::new(t.p),
        }
    }

    /// The entries of `S(a,b)` (unsorted, possibly repeated indices), scaled by c.
    fn for_pair(&self, a: usize, b: usize, mut f: impl FnMut(usize, u32)) {
        let (ix, vx) = self.t.row(a, b);
        for (&m, &x) in ix.iter().zip(vx) {
            f(m as usize, x);
        }
        if a != b {
            let (iy, vy) = self.t.row(b, a);
            for (&m, &x) in iy.iter().zip(vy) {
                f(m as usize, x);
            }
        }
    }
}

impl Ops for SparseOps<'_> {
    type Acc = SparseAcc;
    type V = Vec<(u32, u32)>;
    fn p(&self) -> u64 {
        self.t.p
    }
    fn new_acc(&self) -> SparseAcc {
        SparseAcc {
            vals: vec![0; self.n],
            touched: Vec::new(),
            mark: vec![false; self.n],
            pending: 0,
            m: self.m,
        }
    }
    fn new_vec(&self) -> Self::V {
        Vec::new()
    }
    fn add_product(&self, a: &mut SparseAcc, c: u32, i: usize, j: usize) {
        let (ix, vx) = self.t.row(i, j);
        a.room(1);
        a.scatter(c, ix, vx);
    }
    fn add_vb(&self, a: &mut SparseAcc, c: u32, v: &Self::V, k: usize) {
        a.room(v.len());
        for &(m, x) in v {
            let (ix, vx) = self.t.row(m as usize, k);
            a.scatter(self.m.mul(c, x), ix, vx);
        }
    }
    fn add_pb(&self, a: &mut SparseAcc, c: u32, i: usize, j: usize, k: usize) {
        let (im, vm) = self.t.row(i, j);
        a.room(im.len());
        for (&m, &x) in im.iter().zip(vm) {
            let (ix, vx) = self.t.row(m as usize, k);
            a.scatter(self.m.mul(c, x), ix, vx);
        }
    }
    fn add_bp(&self, a: &mut SparseAcc, c: u32, i: usize, j: usize, k: usize) {
        let (im, vm) = self.t.row(j, k);
        a.room(im.len());
        for (&m, &x) in im.iter().zip(vm) {
            let (ix, vx) = self.t.row(i, m as usize);
            a.scatter(self.m.mul(c, x), ix, vx);
        }
    }
    fn add_sb(&self, a: &mut SparseAcc, c: u32, x: usize, y: usize, k: usize) {
        let len = self.t.row(x, y).0.len() + self.t.row(y, x).0.len();
        a.room(len);
        self.for_pair(x, y, |m, s| {
            let (ix, vx) = self.t.row(m, k);
            a.scatter(self.m.mul(c, s), ix, vx);
        });
    }
    fn add_sv(&self, a: &mut SparseAcc, c: u32, x: usize, y: usize, w: &Self::V) {
        let len = self.t.row(x, y).0.len() + self.t.row(y, x).0.len();
        a.room(len * w.len());
        self.for_pair(x, y, |m, s| {
            let cs = self.m.mul(c, s);
            for &(m2, t) in w {
                let (ix, vx) = self.t.row(m, m2 as usize);
                a.scatter(self.m.mul(cs, t), ix, vx);
            }
        });
    }
    fn add_sp(&self, a: &mut SparseAcc, c: u32, x: usize, y: usize, u: usize, v: usize) {
        let (iw, vw) = self.t.row(u, v);
        let len = self.t.row(x, y).0.len() + self.t.row(y, x).0.len();
        a.room(len * iw.len());
        self.for_pair(x, y, |m, s| {
            let cs = self.m.mul(c, s);
            for (&m2, &t) in iw.iter().zip(vw) {
                let (ix, vx) = self.t.row(m, m2 as usize);
                a.scatter(self.m.mul(cs, t), ix, vx);
            }
        });
    }
    fn add_pp(&self, a: &mut SparseAcc, c: u32, i: usize, j: usize, k: usize, l: usize) {
        let (ip, vp) = self.t.row(i, j);
        let (iw, vw) = self.t.row(k, l);
        for (&m, &x) in ip.iter().zip(vp) {
            let cx = self.m.mul(c, x);
            for (&m2, &t) in iw.iter().zip(vw) {
                let (ix, vx) = self.t.row(m as usize, m2 as usize);
                a.room(1);
                a.scatter(self.m.mul(cx, t), ix, vx);
            }
        }
    }
    fn finish(&self, a: &mut SparseAcc, out: &mut Self::V) {
        out.clear();
        for &k in &a.touched {
            let ku = k as usize;
            let v = self.m.reduce(a.vals[ku]);
            if v != 0 {
                out.push((k, v as u32));
            }
            a.vals[ku] = 0;
            a.mark[ku] = false;
        }
        a.touched.clear();
        a.pending = 0;
    }
    fn drain(&self, a: &mut SparseAcc) -> Vec<(usize, u64)> {
        let mut out: Vec<(usize, u64)> = a
            .touched
            .iter()
            .map(|&k| (k as usize, self.m.reduce(a.vals[k as usize])))
            .collect();
        for &k in &a.touched {
            a.vals[k as usize] = 0;
            a.mark[k as usize] = false;
        }
        a.touched.clear();
        a.pending = 0;
        out.sort_unstable();
        out
    }
    fn is_zero(&self, v: &Self::V) -> bool {
        v.is_empty()
    }
    fn entries(&self, v: &Self::V) -> Vec<(usize, u64)> {
        let mut e: Vec<(usize, u64)> = v.iter().map(|&(k, x)| (k as usize, x as u64)).collect();
        e.sort_unstable();
        e
    }
}
