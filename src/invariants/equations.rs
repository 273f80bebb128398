//! The defining equations of every invariant, in one place, as systems the engine of
//! [`crate::linalg::nullspace`] solves ([`System`] implements [`RowSource`]).
//!
//! Notation: `e_i e_j = sum_k c[i][j][k] e_k` (integer-scaled, see [`IntegralTensor`]). A vector
//! unknown x has coordinates `x_i` (column i). A linear map X has `X(e_i) = sum_l X[l][i] e_l`
//! and unknown `X[l][i]` in column `offset + l * n + i`, n the dimension of its space.
//! Each variant of [`Eq`] states its equations; all systems are homogeneous. Every term is
//! a single constant (or 1) except in the associator systems (a coordinate of an
//! associator, at most `2 L C` with L the row norm and C the largest constant) and the
//! trace form (a constant times a trace, at most `n C^2`); [`RowSource::term_bits`] states
//! this bound for the exact check.
//! Cost of writing a system modulo one prime: O(n nnz) terms for the linear ones; for the
//! associator systems n^2 blocks of n products of a vector with a basis element.

use crate::linalg::system::{RowBuf, RowSource};
use crate::tensor::IntegralTensor;
use crate::tensor::products::{DenseOps, Ops, SparseOps};

/// Which argument of the associator `(a, b, c) = (ab)c - a(bc)` the unknown occupies.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Slot {
    Left,
    Middle,
    Right,
}

/// One family of equations.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Eq {
    /// `x e_j - e_j x = 0` for all j (unknowns: x).
    Commutator,
    /// `(x, e_j, e_k) = 0` (Left), `(e_j, x, e_k) = 0` (Middle) or `(e_j, e_k, x) = 0`
    /// (Right) for all j, k (unknowns: x).
    Associator(Slot),
    /// `x e_j = 0` (left) or `e_j x = 0` for all j (unknowns: x).
    Annihilator { left: bool },
    /// `X(e_i e_j) - X(e_i) e_j = 0` and `X(e_i e_j) - e_i X(e_j) = 0` (unknowns X).
    Centroid,
    /// `D(e_i e_j) - D(e_i) e_j - e_i D(e_j) = 0` (unknowns D).
    Derivations,
    /// `T(f u, v) = T(u, g v)`; unknowns f (a^2 columns) then g (b^2 columns).
    AdjointPairs,
    /// `T(D1 u, v) + T(u, D2 v) = D3 T(u, v)`; unknowns D1, D2, D3.
    DerivationTriples,
    /// `T(X u, v) = Z T(u, v)` and `T(u, Y v) = Z T(u, v)`; unknowns X, Y, Z.
    CentroidTriples,
    /// `{u : T(u, v) = 0 for all v}` (left, a columns) or `{v : T(u, v) = 0 for all u}`.
    MapRadical { left: bool },
    /// Trace form of an algebra: `Tr(L_{x e_j}) = 0` for all j, and `Tr(L_x) = 0`
    /// (unknowns x); `Tr(L_{e_m}) = sum_t c[m][t][t]`.
    TraceForm,
}

impl Eq {
    /// Number of unknowns on a tensor of dimensions `[a, b, c]`.
    pub fn unknowns(self, [a, b, c]: [usize; 3]) -> usize {
        match self {
            Eq::Commutator | Eq::Associator(_) | Eq::Annihilator { .. } | Eq::TraceForm => a,
            Eq::Centroid | Eq::Derivations => a * a,
            Eq::AdjointPairs => a * a + b * b,
            Eq::DerivationTriples | Eq::CentroidTriples => a * a + b * b + c * c,
            Eq::MapRadical { left } => {
                if left {
                    a
                } else {
                    b
                }
            }
        }
    }

    fn blocks(self, [a, b, _]: [usize; 3]) -> usize {
        match self {
            Eq::Commutator | Eq::Annihilator { .. } => a,
            Eq::Associator(_) | Eq::Derivations => a * a,
            Eq::Centroid => 2 * a * a,
            Eq::AdjointPairs | Eq::DerivationTriples => a * b,
            Eq::CentroidTriples => 2 * a * b,
            Eq::MapRadical { left } => {
                if left {
                    b
                } else {
                    a
                }
            }
            Eq::TraceForm => a + 1,
        }
    }
}

/// A homogeneous system made of one or more families of equations on the same unknowns.
pub struct System<'a> {
    k: &'a IntegralTensor,
    parts: Vec<Eq>,
    starts: Vec<usize>,
    unknowns: usize,
}

impl<'a> System<'a> {
    /// The equations of all `parts` (which must have the same unknowns).
    pub fn new(k: &'a IntegralTensor, parts: &[Eq]) -> Self {
        let dims = k.dims;
        let unknowns = parts[0].unknowns(dims);
        debug_assert!(parts.iter().all(|p| p.unknowns(dims) == unknowns));
        let mut starts = vec![0];
        for p in parts {
            starts.push(starts.last().expect("start") + p.blocks(dims));
        }
        System {
            k,
            parts: parts.to_vec(),
            starts,
            unknowns,
        }
    }
}

impl RowSource for System<'_> {
    fn unknowns(&self) -> usize {
        self.unknowns
    }
    fn blocks(&self) -> usize {
        *self.starts.last().expect("start")
    }
    fn modulus(&self) -> Option<u64> {
        self.k.modulus()
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        let part = self.starts.partition_point(|&s| s <= b) - 1;
        write_block(self.k, self.parts[part], b - self.starts[part], p, out);
    }
    fn term_bits(&self) -> u64 {
        let cb = self.k.constant_bits();
        let n = self.k.dims[0].max(1) as u64;
        self.parts
            .iter()
            .map(|p| match p {
                Eq::Associator(_) => self.k.row_norm_bits().max(1) + cb + 1,
                Eq::TraceForm => (64 - n.leading_zeros() as u64) + 2 * cb,
                _ => cb,
            })
            .max()
            .unwrap_or(cb)
    }
    fn estimated_terms(&self) -> usize {
        let [a, b, c] = self.k.dims;
        let nnz = self.k.nnz();
        self.parts
            .iter()
            .map(|p| match p {
                Eq::Associator(_) => {
                    if self.k.dense {
                        a * a * a * a
                    } else {
                        a * nnz * 4
                    }
                }
                Eq::Centroid => 2 * (a * nnz + a * a * nnz / b.max(1)),
                Eq::Derivations => a * nnz + 2 * a * a * nnz / b.max(1),
                Eq::AdjointPairs | Eq::DerivationTriples | Eq::CentroidTriples => {
                    2 * (a.max(b).max(c)) * nnz
                }
                _ => 2 * nnz + a,
            })
            .sum()
    }
    fn prefers_streaming(&self) -> bool {
        self.k.dense
    }
}

/// Write block `b` of one family modulo p.
fn write_block(k: &IntegralTensor, eq: Eq, b: usize, p: u64, out: &mut RowBuf) {
    let residues = k.residues(p);
    let t = &*residues;
    let [a, bd, c] = k.dims;
    let n = a;
    match eq {
        Eq::Commutator => {
            let j = b;
            for i in 0..n {
                let (ks, vs) = t.row(i, j);
                for (&kk, &v) in ks.iter().zip(vs) {
                    out.add(kk as usize, i, v as u64);
                }
                let (ks, vs) = t.row(j, i);
                for (&kk, &v) in ks.iter().zip(vs) {
                    out.sub(kk as usize, i, v as u64);
                }
            }
            out.end_block(n);
        }
        Eq::Associator(slot) => {
            if t.is_dense() {
                associator_block(&DenseOps::new(t, &[]), slot, b, n, out);
            } else {
                associator_block(&SparseOps::new(t), slot, b, n, out);
            }
        }
        Eq::Annihilator { left } => {
            products_with(t, b, n, left, out);
            out.end_block(n);
        }
        Eq::Centroid => {
            let (ij, side) = (b / 2, b % 2);
            let (i, j) = (ij / n, ij % n);
            map_of_product(t, i, j, n, out);
            if side == 0 {
                map_times_basis(k, t, i, j, n, 0, out, true);
            } else {
                basis_times_map(t, i, j, n, 0, out, true);
            }
            out.end_block(n);
        }
        Eq::Derivations => {
            let (i, j) = (b / n, b % n);
            map_of_product(t, i, j, n, out);
            map_times_basis(k, t, i, j, n, 0, out, true);
            basis_times_map(t, i, j, n, 0, out, true);
            out.end_block(n);
        }
        Eq::AdjointPairs => map_block(k, t, b, (1, -1, 0), out),
        Eq::DerivationTriples => map_block(k, t, b, (1, 1, 1), out),
        Eq::CentroidTriples => {
            let signs = if b < a * bd { (1, 0, 1) } else { (0, 1, 1) };
            map_block(k, t, b % (a * bd), signs, out);
        }
        Eq::MapRadical { left } => {
            let inner = if left { a } else { bd };
            products_with(t, b, inner, left, out);
            out.end_block(c);
        }
        Eq::TraceForm => {
            let tau: Vec<u64> = (0..n)
                .map(|m| {
                    (0..n)
                        .map(|u| coeff(t, m, u, u))
                        .fold(0u64, |s, x| (s + x) % p)
                })
                .collect();
            if b < n {
                let j = b;
                for i in 0..n {
                    let (ks, vs) = t.row(i, j);
                    for (&m, &v) in ks.iter().zip(vs) {
                        out.add_product(0, i, v as u64, tau[m as usize], false);
                    }
                }
            } else {
                for (i, &ti) in tau.iter().enumerate() {
                    out.add(0, i, ti);
                }
            }
            out.end_block(1);
        }
    }
}

/// The residue of `c[i][j][k]` (0 when absent).
pub fn coeff(t: &crate::tensor::ModTable, i: usize, j: usize, k: usize) -> u64 {
    let (ks, vs) = t.row(i, j);
    ks.binary_search(&(k as u32))
        .map(|x| vs[x] as u64)
        .unwrap_or(0)
}

/// `(x, e_j, e_k)`-type associators with the unknown basis vector `e_i` in the slot, for
/// block `(j, k) = (b / n, b % n)`: row m, column i.
fn associator_block<O: Ops>(o: &O, slot: Slot, b: usize, n: usize, out: &mut RowBuf) {
    let (j, k) = (b / n, b % n);
    let m1 = (o.p() - 1) as u32;
    let mut acc = o.new_acc();
    for i in 0..n {
        let (x, y, z) = match slot {
            Slot::Left => (i, j, k),
            Slot::Middle => (j, i, k),
            Slot::Right => (j, k, i),
        };
        o.add_pb(&mut acc, 1, x, y, z);
        o.add_bp(&mut acc, m1, x, y, z);
        for (m, v) in o.drain(&mut acc) {
            out.add(m, i, v);
        }
    }
    out.end_block(n);
}

/// Adds the terms `x e_o` (left) or `e_o x` of an unknown vector x with `inner`
/// coordinates (column x_i), one row per result coordinate.
pub fn products_with(
    t: &crate::tensor::ModTable,
    o: usize,
    inner: usize,
    left: bool,
    out: &mut RowBuf,
) {
    for x in 0..inner {
        let (ks, vs) = if left { t.row(x, o) } else { t.row(o, x) };
        for (&kk, &v) in ks.iter().zip(vs) {
            out.add(kk as usize, x, v as u64);
        }
    }
}

/// Adds `+X(e_i e_j)` (unknown map X on an n-dimensional space, offset 0).
fn map_of_product(t: &crate::tensor::ModTable, i: usize, j: usize, n: usize, out: &mut RowBuf) {
    let (ms, vs) = t.row(i, j);
    for (&m, &v) in ms.iter().zip(vs) {
        for kk in 0..n {
            out.add(kk, kk * n + m as usize, v as u64);
        }
    }
}

/// Adds `-X(e_i) e_j` (or `+` when not `negative`), X at `offset` on a space of dimension
/// `dim` (rows: result coordinates).
#[allow(clippy::too_many_arguments)]
fn map_times_basis(
    k: &IntegralTensor,
    t: &crate::tensor::ModTable,
    i: usize,
    j: usize,
    dim: usize,
    offset: usize,
    out: &mut RowBuf,
    negative: bool,
) {
    for &(l, kk, pos) in k.by_right(j) {
        let v = t.value(pos as usize) as u64;
        let col = offset + l as usize * dim + i;
        if negative {
            out.sub(kk as usize, col, v);
        } else {
            out.add(kk as usize, col, v);
        }
    }
}

/// Adds `-e_i X(e_j)` (or `+`), X at `offset` on the right space of dimension `dim`.
fn basis_times_map(
    t: &crate::tensor::ModTable,
    i: usize,
    j: usize,
    dim: usize,
    offset: usize,
    out: &mut RowBuf,
    negative: bool,
) {
    for l in 0..dim {
        let (ks, vs) = t.row(i, l);
        for (&kk, &v) in ks.iter().zip(vs) {
            let col = offset + l * dim + j;
            if negative {
                out.sub(kk as usize, col, v as u64);
            } else {
                out.add(kk as usize, col, v as u64);
            }
        }
    }
}

/// Block `(i, j)` of `T(X e_i, e_j) sx + T(e_i, Y e_j) sy - Z T(e_i, e_j) sz = 0` with
/// unknowns X (offset 0), Y (offset a^2), Z (offset a^2 + b^2, only when sz != 0);
/// signs in {-1, 0, 1}. Rows: the result coordinates.
fn map_block(
    k: &IntegralTensor,
    t: &crate::tensor::ModTable,
    b: usize,
    (sx, sy, sz): (i32, i32, i32),
    out: &mut RowBuf,
) {
    let [a, bd, c] = k.dims;
    let (oy, oz) = (a * a, a * a + bd * bd);
    let (i, j) = (b / bd, b % bd);
    if sx != 0 {
        map_times_basis(k, t, i, j, a, 0, out, sx < 0);
    }
    if sy != 0 {
        basis_times_map(t, i, j, bd, oy, out, sy < 0);
    }
    if sz != 0 {
        let (ms, vs) = t.row(i, j);
        for (&m, &v) in ms.iter().zip(vs) {
            for kk in 0..c {
                let col = oz + kk * c + m as usize;
                if sz > 0 {
                    out.sub(kk, col, v as u64);
                } else {
                    out.add(kk, col, v as u64);
                }
            }
        }
    }
    out.end_block(c);
}
