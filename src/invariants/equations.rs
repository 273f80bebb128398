//! The defining equations of every invariant, built in one place as sparse systems.
//!
//! Notation: `e_i e_j = sum_k c[i][j][k] e_k` (integer-scaled, see [`IntTable`]). A vector
//! unknown x has coordinates `x_i` (column i). A linear map X has `X(e_i) = sum_l X[l][i] e_l`
//! and unknown `X[l][i]` in column `offset + l * n + i`, n the dimension of its space.
//! Each function states its equations; all systems are homogeneous.
//! Cost: each builder touches every product once per equation block, O(n * nnz) terms
//! (O(n^3) loop steps plus O(nnz^2 / n) terms for the degree-2 associator systems).

use super::system::{BlockBuf, IntTable, SparseSystem};
use crate::error::Result;

/// Commutator: `x e_j - e_j x = 0` for all j (unknowns: x, n columns).
pub fn commutator(t: &IntTable) -> Result<SparseSystem> {
    let n = t.dims[0];
    let mut s = t.system(n);
    let mut b = BlockBuf::default();
    for j in 0..n {
        for i in 0..n {
            for &(k, c) in t.product(i, j) {
                b.add(k, i, c as i128);
            }
            for &(k, c) in t.product(j, i) {
                b.add(k, i, -(c as i128));
            }
        }
        s.push_block(&mut b)?;
    }
    Ok(s)
}

/// Which argument of the associator `(a, b, c) = (ab)c - a(bc)` the unknown occupies.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Slot {
    Left,
    Middle,
    Right,
}

/// Associator: `(x, e_j, e_k) = 0` (Left), `(e_j, x, e_k) = 0` (Middle) or
/// `(e_j, e_k, x) = 0` (Right) for all j, k (unknowns: x).
pub fn associator(t: &IntTable, slot: Slot) -> Result<SparseSystem> {
    associator_blocks(t, slot, None)
}

/// The associator equations of the blocks `(j, k) = (b / n, b % n)` for b in `blocks`
/// (all n^2 blocks when `None`): a subsystem used to probe for a trivial solution space.
pub fn associator_blocks(
    t: &IntTable,
    slot: Slot,
    blocks: Option<&[usize]>,
) -> Result<SparseSystem> {
    let n = t.dims[0];
    let all: Vec<usize>;
    let blocks = match blocks {
        Some(b) => b,
        None => {
            all = (0..n * n).collect();
            &all
        }
    };
    let mut s = t.system(n);
    let mut b = BlockBuf::default();
    // (a b) c - a (b c) with the unknown basis vector e_i in the given slot, accumulated
    // densely over the result coordinate m
    let mut acc = vec![0i128; n];
    let mut touched: Vec<usize> = Vec::new();
    for &blk in blocks {
        let (j, k) = (blk / n, blk % n);
        {
            for i in 0..n {
                let (x, y, z) = match slot {
                    Slot::Left => (i, j, k),
                    Slot::Middle => (j, i, k),
                    Slot::Right => (j, k, i),
                };
                for &(u, c1) in t.product(x, y) {
                    for &(m, c2) in t.product(u, z) {
                        if acc[m] == 0 {
                            touched.push(m);
                        }
                        acc[m] += t.mul(c1, c2 as i128);
                    }
                }
                for &(u, c1) in t.product(y, z) {
                    for &(m, c2) in t.product(x, u) {
                        if acc[m] == 0 {
                            touched.push(m);
                        }
                        acc[m] -= t.mul(c1, c2 as i128);
                    }
                }
                for &m in &touched {
                    b.add(m, i, acc[m]);
                    acc[m] = 0;
                }
                touched.clear();
            }
            s.push_block(&mut b)?;
        }
    }
    Ok(s)
}

/// Left annihilator `x e_j = 0` (left = true) or right annihilator `e_j x = 0`, all j.
pub fn annihilator(t: &IntTable, left: bool) -> Result<SparseSystem> {
    let n = t.dims[0];
    let mut s = t.system(n);
    let mut b = BlockBuf::default();
    for j in 0..n {
        add_products_with(t, j, n, left, &mut b);
        s.push_block(&mut b)?;
    }
    Ok(s)
}

/// Adds to block `b` the terms `x e_o` (left = true) or `e_o x` (left = false) of an
/// unknown vector x with `inner` coordinates (column x_i), one row per result coordinate.
fn add_products_with(t: &IntTable, o: usize, inner: usize, left: bool, b: &mut BlockBuf) {
    for x in 0..inner {
        let prod = if left {
            t.product(x, o)
        } else {
            t.product(o, x)
        };
        for &(k, c) in prod {
            b.add(k, x, c as i128);
        }
    }
}

/// The unit, homogenised: unknowns (u, s) (n + 1 columns) with
/// `u e_j - s e_j = 0` and `e_j u - s e_j = 0` for all j. A solution with s != 0 gives the
/// two-sided unit u / s; the constants being scaled by L, it is then L u / s in A.
pub fn unit(t: &IntTable) -> Result<SparseSystem> {
    let n = t.dims[0];
    let mut s = t.system(n + 1);
    let mut b = BlockBuf::default();
    for left in [true, false] {
        for j in 0..n {
            add_products_with(t, j, n, left, &mut b);
            b.add(j, n, -1);
            s.push_block(&mut b)?;
        }
    }
    Ok(s)
}

/// Centroid: `X(e_i e_j) - X(e_i) e_j = 0` and `X(e_i e_j) - e_i X(e_j) = 0` (unknowns X).
pub fn centroid(t: &IntTable) -> Result<SparseSystem> {
    let n = t.dims[0];
    let mut s = t.system(n * n);
    let mut b = BlockBuf::default();
    for i in 0..n {
        for j in 0..n {
            for side in 0..2 {
                add_map_of_product(t, i, j, &mut b);
                if side == 0 {
                    add_map_times_basis(t, i, j, &mut b);
                } else {
                    add_basis_times_map(t, i, j, &mut b);
                }
                s.push_block(&mut b)?;
            }
        }
    }
    Ok(s)
}

/// Derivations: `D(e_i e_j) - D(e_i) e_j - e_i D(e_j) = 0` (unknowns D).
pub fn derivations(t: &IntTable) -> Result<SparseSystem> {
    let n = t.dims[0];
    let mut s = t.system(n * n);
    let mut b = BlockBuf::default();
    for i in 0..n {
        for j in 0..n {
            add_map_of_product(t, i, j, &mut b);
            add_map_times_basis(t, i, j, &mut b);
            add_basis_times_map(t, i, j, &mut b);
            s.push_block(&mut b)?;
        }
    }
    Ok(s)
}

/// Adds `+X(e_i e_j)` (unknown map X on an n-dimensional algebra, offset 0) to block `b`.
fn add_map_of_product(t: &IntTable, i: usize, j: usize, b: &mut BlockBuf) {
    let n = t.dims[0];
    for &(m, c) in t.product(i, j) {
        for k in 0..n {
            b.add(k, k * n + m, c as i128);
        }
    }
}

/// Adds `-X(e_i) e_j` (unknown map X, offset 0) to block `b`.
fn add_map_times_basis(t: &IntTable, i: usize, j: usize, b: &mut BlockBuf) {
    let n = t.dims[0];
    for &(l, k, c) in &t.by_right[j] {
        b.add(k, l * n + i, -(c as i128));
    }
}

/// Adds `-e_i X(e_j)` (unknown map X, offset 0) to block `b`.
fn add_basis_times_map(t: &IntTable, i: usize, j: usize, b: &mut BlockBuf) {
    let n = t.dims[0];
    for l in 0..n {
        for &(k, c) in t.product(i, l) {
            b.add(k, l * n + j, -(c as i128));
        }
    }
}

/// Pairs of maps (X on the left space, Y on the right space) with
/// `T(X e_i, e_j) * sx + T(e_i, Y e_j) * sy - Z T(e_i, e_j) * sz = 0`, unknowns
/// `X` (offset 0), `Y` (offset a^2), `Z` (offset a^2 + b^2, only when `sz != 0`).
/// With a = b = c this covers adjoint pairs (1, -1, 0) and derivation triples (1, 1, 1).
fn map_equations(t: &IntTable, sx: i128, sy: i128, sz: i128, s: &mut SparseSystem) -> Result<()> {
    let [a, bd, c] = t.dims;
    let (oy, oz) = (a * a, a * a + bd * bd);
    let mut b = BlockBuf::default();
    for i in 0..a {
        for j in 0..bd {
            if sx != 0 {
                for &(l, k, v) in &t.by_right[j] {
                    b.add(k, l * a + i, sx * v as i128);
                }
            }
            if sy != 0 {
                for l in 0..bd {
                    for &(k, v) in t.product(i, l) {
                        b.add(k, oy + l * bd + j, sy * v as i128);
                    }
                }
            }
            if sz != 0 {
                for &(m, v) in t.product(i, j) {
                    for k in 0..c {
                        b.add(k, oz + k * c + m, -sz * v as i128);
                    }
                }
            }
            s.push_block(&mut b)?;
        }
    }
    Ok(())
}

/// Adjoint pairs: `T(f u, v) = T(u, g v)`; unknowns f (a^2 columns) then g (b^2 columns).
pub fn adjoint_pairs(t: &IntTable) -> Result<SparseSystem> {
    let [a, b, _] = t.dims;
    let mut s = t.system(a * a + b * b);
    map_equations(t, 1, -1, 0, &mut s)?;
    Ok(s)
}

/// Derivation triples: `T(D1 u, v) + T(u, D2 v) = D3 T(u, v)`; unknowns D1, D2, D3.
pub fn derivation_triples(t: &IntTable) -> Result<SparseSystem> {
    let [a, b, c] = t.dims;
    let mut s = t.system(a * a + b * b + c * c);
    map_equations(t, 1, 1, 1, &mut s)?;
    Ok(s)
}

/// Centroid triples: `T(X u, v) = Z T(u, v)` and `T(u, Y v) = Z T(u, v)`; unknowns X, Y, Z.
pub fn centroid_triples(t: &IntTable) -> Result<SparseSystem> {
    let [a, b, c] = t.dims;
    let mut s = t.system(a * a + b * b + c * c);
    map_equations(t, 1, 0, 1, &mut s)?;
    map_equations(t, 0, 1, 1, &mut s)?;
    Ok(s)
}

/// Left radical `{u : T(u, v) = 0 for all v}` (left = true, unknowns u, a columns) or right
/// radical `{v : T(u, v) = 0 for all u}` (b columns).
pub fn radical_of_map(t: &IntTable, left: bool) -> Result<SparseSystem> {
    let [a, bd, _] = t.dims;
    let mut s = t.system(if left { a } else { bd });
    let mut b = BlockBuf::default();
    let (outer, inner) = if left { (bd, a) } else { (a, bd) };
    for o in 0..outer {
        add_products_with(t, o, inner, left, &mut b);
        s.push_block(&mut b)?;
    }
    Ok(s)
}

/// Trace form of an algebra: `T(x, e_j) = Tr(L_{x e_j}) = 0` for all j, and `Tr(L_x) = 0`
/// (unknowns x). `Tr(L_{e_m}) = sum_t c[m][t][t]`.
pub fn trace_form(t: &IntTable) -> Result<SparseSystem> {
    let n = t.dims[0];
    let tau: Vec<i128> = (0..n)
        .map(|m| (0..n).map(|u| coeff(t, m, u, u) as i128).sum::<i128>())
        .collect();
    let mut s = t.system(n);
    let mut b = BlockBuf::default();
    for j in 0..n {
        for i in 0..n {
            for &(m, c) in t.product(i, j) {
                b.add(0, i, t.mul(c, tau[m]));
            }
        }
        s.push_block(&mut b)?;
    }
    for (i, &ti) in tau.iter().enumerate() {
        b.add(0, i, ti);
    }
    s.push_block(&mut b)?;
    Ok(s)
}

/// The coefficient `c[i][j][k]`.
pub fn coeff(t: &IntTable, i: usize, j: usize, k: usize) -> i64 {
    let p = t.product(i, j);
    p.binary_search_by_key(&k, |e| e.0)
        .map(|x| p[x].1)
        .unwrap_or(0)
}
