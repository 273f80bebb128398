//! One evaluation plan per identity component: the value of one instance modulo a prime.
//!
//! An instance is a sorted multiset `ms` of basis indices for the repeated variable x and a
//! tuple `free` for the linear variables; its value is the sum, over the distinct
//! orderings of `ms` placed in the x-slots, of the identity's terms (see
//! [`super::check`]). The plans never enumerate orderings: they use bilinearity. A
//! distinct ordering of a multiset M placed in the leaves of a product `A * B` is the same
//! as a distinct sub-multiset `M_A` for the leaves of A with a distinct ordering of it and
//! one of the rest, so
//! `sum over orderings of A * B = sum over M_A of (sum over orderings of A) * (... of B)`.
//! With `S(a,b) = e_a e_b + e_b e_a` (a != b) or `e_a e_a` (the sum over the orderings of a
//! pair) every instance becomes a few products of a vector with a basis element, or of
//! `S(a,b)` with a vector, each costing one vector-matrix product (see [`crate::tensor::products`]).
//! The formulas are division-free, so they are exact in every characteristic and agree
//! with the direct evaluation instance by instance (tested against it).
//!
//! Cost per instance, dense table of dimension n, in units of n^2 multiply-adds:
//! commutative, anticommutative O(1/n); associative, Jacobi, the alternative and flexible
//! laws 2-4; third powers up to 6; fourth powers up to 10; the Jordan identity up to 6;
//! the Malcev identity up to 14, plus two products of products (2n).

use super::identities::Component;
use crate::tensor::products::Ops;

/// Scratch space for one thread: a second accumulator and a vector.
pub struct Scratch<O: Ops> {
    pub acc2: O::Acc,
    pub tmp: O::V,
}

impl<O: Ops> Scratch<O> {
    pub fn new(o: &O) -> Self {
        Scratch {
            acc2: o.new_acc(),
            tmp: o.new_vec(),
        }
    }
}

/// The positions of the distinct values of a sorted multiset.
fn distinct(ms: &[usize]) -> impl Iterator<Item = usize> + '_ {
    (0..ms.len()).filter(move |&i| i == 0 || ms[i] != ms[i - 1])
}

/// The multiset without position i.
fn without(ms: &[usize], i: usize) -> ([usize; 4], usize) {
    let mut out = [0usize; 4];
    let mut len = 0;
    for (k, &x) in ms.iter().enumerate() {
        if k != i {
            out[len] = x;
            len += 1;
        }
    }
    (out, len)
}

/// Add `c S(a,b)` (the sum over the orderings of a pair) to an accumulator.
fn add_pair<O: Ops>(o: &O, acc: &mut O::Acc, c: u32, a: usize, b: usize) {
    o.add_product(acc, c, a, b);
    if a != b {
        o.add_product(acc, c, b, a);
    }
}

/// Add `c sum_{orderings (u,v) of {a,b}} e_x (e_u e_v)`.
fn add_basis_pair<O: Ops>(o: &O, acc: &mut O::Acc, c: u32, x: usize, a: usize, b: usize) {
    o.add_bp(acc, c, x, a, b);
    if a != b {
        o.add_bp(acc, c, x, b, a);
    }
}

/// The value of one instance of component `c` (over the table of `o`, which is already
/// the commutator or anticommutator table for the components written in those) into
/// `out`. `acc` must be clear; it is clear again afterwards.
pub fn eval_instance<O: Ops>(
    o: &O,
    c: Component,
    ms: &[usize],
    free: &[usize],
    acc: &mut O::Acc,
    s: &mut Scratch<O>,
    out: &mut O::V,
) {
    use Component::*;
    let m1 = (o.p() - 1) as u32;
    match c {
        Comm => {
            o.add_product(acc, 1, free[0], free[1]);
            o.add_product(acc, m1, free[1], free[0]);
        }
        Anti => add_pair(o, acc, 1, ms[0], ms[1]),
        Assoc => {
            let (i, j, k) = (free[0], free[1], free[2]);
            o.add_pb(acc, 1, i, j, k);
            o.add_bp(acc, m1, i, j, k);
        }
        Jacobi | CommutatorJacobi => {
            let (i, j, k) = (free[0], free[1], free[2]);
            o.add_pb(acc, 1, i, j, k);
            o.add_pb(acc, 1, j, k, i);
            o.add_pb(acc, 1, k, i, j);
        }
        LeftAlt => {
            // (x x) z - x (x z)
            let (a, b, k) = (ms[0], ms[1], free[0]);
            o.add_sb(acc, 1, a, b, k);
            o.add_bp(acc, m1, a, b, k);
            if a != b {
                o.add_bp(acc, m1, b, a, k);
            }
        }
        RightAlt => {
            // (z x) x - z (x x)
            let (a, b, k) = (ms[0], ms[1], free[0]);
            o.add_pb(acc, 1, k, a, b);
            if a != b {
                o.add_pb(acc, 1, k, b, a);
            }
            add_basis_pair(o, acc, m1, k, a, b);
        }
        Flex => {
            // (x z) x - x (z x)
            let (a, b, k) = (ms[0], ms[1], free[0]);
            o.add_pb(acc, 1, a, k, b);
            o.add_bp(acc, m1, a, k, b);
            if a != b {
                o.add_pb(acc, 1, b, k, a);
                o.add_bp(acc, m1, b, k, a);
            }
        }
        Power3 => {
            // (x x) x - x (x x): group the orderings by the lone factor
            for i in distinct(ms) {
                let (r, _) = without(ms, i);
                o.add_sb(acc, 1, r[0], r[1], ms[i]);
                add_basis_pair(o, acc, m1, ms[i], r[0], r[1]);
            }
        }
        Power4 => {
            // (x x)(x x): a distinct pair for the left factor, the rest on the right
            for i in 0..4 {
                for j in i + 1..4 {
                    if earlier_pair(ms, i, j) {
                        continue;
                    }
                    let mut rest = (0..4).filter(|&k| k != i && k != j);
                    let (u, v) = (rest.next().expect("two"), rest.next().expect("two"));
                    add_pair(o, &mut s.acc2, 1, ms[u], ms[v]);
                    o.finish(&mut s.acc2, &mut s.tmp);
                    o.add_sv(acc, 1, ms[i], ms[j], &s.tmp);
                }
            }
            // - ((x x) x) x: group by the last factor, then by the third
            for i in distinct(ms) {
                let (r, _) = without(ms, i);
                let r = &r[..3];
                for k in distinct(r) {
                    let (q, _) = without(r, k);
                    o.add_sb(&mut s.acc2, 1, q[0], q[1], r[k]);
                }
                o.finish(&mut s.acc2, &mut s.tmp);
                o.add_vb(acc, m1, &s.tmp, ms[i]);
            }
        }
        JordanId => {
            // ((x x) y) x - (x x)(y x): group by the last x
            let y = free[0];
            for i in distinct(ms) {
                let (q, _) = without(ms, i);
                o.add_sb(&mut s.acc2, 1, q[0], q[1], y);
                o.finish(&mut s.acc2, &mut s.tmp);
                o.add_vb(acc, 1, &s.tmp, ms[i]);
                o.add_sp(acc, m1, q[0], q[1], y, ms[i]);
            }
        }
        MalcevId => malcev(o, ms, free, acc, s),
        AnticommutatorJordan => unreachable!("evaluated as JordanId on the anticommutator table"),
    }
    o.finish(acc, out);
}

/// The Malcev identity `(xy)(xz) + (y(xz))x + ((xz)x)y - ((xy)z)x - ((yz)x)x - ((zx)y)x`
/// summed over the distinct orderings (u, v) of the multiset {a, b} in the two x-slots
/// (u in the slots of the first x, v in those of the second). The terms are grouped by
/// their last right factor: e_a collects `(y(e_b z))` from the ordering (a, b) and
/// `-((e_b y)z + (y z)e_b + (z e_b)y)` from (b, a); e_b the same with a and b exchanged;
/// e_y collects `(e_b z)e_a + (e_a z)e_b`; the product of two products `(e_u y)(e_v z)`
/// is one operation ([`Ops::add_pp`]).
fn malcev<O: Ops>(o: &O, ms: &[usize], free: &[usize], acc: &mut O::Acc, s: &mut Scratch<O>) {
    let m1 = (o.p() - 1) as u32;
    let (a, b, y, z) = (ms[0], ms[1], free[0], free[1]);
    let pairs: &[(usize, usize)] = if a == b { &[(a, a)] } else { &[(a, b), (b, a)] };
    for &(last, other) in pairs {
        // the terms ending in e_last
        o.add_bp(&mut s.acc2, 1, y, other, z);
        o.add_pb(&mut s.acc2, m1, other, y, z);
        o.add_pb(&mut s.acc2, m1, y, z, other);
        o.add_pb(&mut s.acc2, m1, z, other, y);
        o.finish(&mut s.acc2, &mut s.tmp);
        o.add_vb(acc, 1, &s.tmp, last);
        // (e_last y)(e_other z)
        o.add_pp(acc, 1, last, y, other, z);
    }
    // ((e_other z) e_last) e_y
    for &(last, other) in pairs {
        o.add_pb(&mut s.acc2, 1, other, z, last);
    }
    o.finish(&mut s.acc2, &mut s.tmp);
    o.add_vb(acc, 1, &s.tmp, y);
}

/// Whether the pair of positions (i, j) of a sorted 4-multiset has the same values as an
/// earlier pair (so that each distinct sub-multiset is taken once).
fn earlier_pair(ms: &[usize], i: usize, j: usize) -> bool {
    for a in 0..4 {
        for b in a + 1..4 {
            if (a, b) >= (i, j) {
                return false;
            }
            if ms[a] == ms[i] && ms[b] == ms[j] {
                return true;
            }
        }
    }
    false
}

/// An upper estimate of the vector-matrix products per instance (for work budgets);
/// `row` is the average number of nonzero coordinates of a product of two basis elements
/// (n for a dense table), the cost of one [`Ops::add_pp`] in vector-matrix products.
pub fn products_per_instance(c: Component, row: f64) -> f64 {
    use Component::*;
    match c {
        MalcevId => 14.0 + 2.0 * row,
        Comm | Anti => 0.02,
        Assoc => 2.0,
        Jacobi | CommutatorJacobi => 3.0,
        LeftAlt | RightAlt | Flex => 4.0,
        Power3 => 6.0,
        Power4 => 10.0,
        JordanId | AnticommutatorJordan => 6.0,
    }
}
