//! The search for a term matching: which term of the second scheme each term of the first
//! goes to, with linear maps (P, Q, R) sending every factor onto the line of its image.
//!
//! For a matched pair (t -> s) the condition "P u_t is a multiple of u'_s" is linear in the
//! entries of P: with n ranging over a basis of the vectors orthogonal to u'_s,
//! `n . (P u_t) = 0`. The search works modulo a prime: it assigns terms one at a time
//! (only to terms with the same local invariants), keeps each side's conditions in reduced
//! echelon form and prunes a branch when no random member of a side's solution space is
//! invertible. A complete matching is handed to an exact check (the caller's `leaf`),
//! which confirms or rejects it over the scheme's own field; the search goes on until a
//! leaf is confirmed, the branches run out, or the node budget is spent.

use crate::scalar::{Field, PrimeField};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;

/// One side's conditions on its d x d matrix (d^2 unknowns, row-major), in reduced
/// echelon form.
#[derive(Clone)]
struct Side {
    d: usize,
    rows: Vec<Vec<u64>>,
    pivots: Vec<usize>,
}

impl Side {
    fn new(d: usize) -> Self {
        Side {
            d,
            rows: Vec::new(),
            pivots: Vec::new(),
        }
    }

    fn add_row(&mut self, f: &PrimeField, mut r: Vec<u64>) {
        for (row, &pc) in self.rows.iter().zip(&self.pivots) {
            let c = r[pc];
            if c != 0 {
                for (x, y) in r.iter_mut().zip(row) {
                    *x = f.sub(x, &f.mul(&c, y));
                }
            }
        }
        let Some(pc) = r.iter().position(|&x| x != 0) else {
            return;
        };
        let inv = f.inv(&r[pc]).expect("nonzero pivot");
        for x in r.iter_mut() {
            *x = f.mul(x, &inv);
        }
        for row in self.rows.iter_mut() {
            let c = row[pc];
            if c != 0 {
                for (x, y) in row.iter_mut().zip(&r) {
                    *x = f.sub(x, &f.mul(&c, y));
                }
            }
        }
        self.rows.push(r);
        self.pivots.push(pc);
    }

    /// A random member of the solution space.
    fn random_member(&self, f: &PrimeField, rng: &mut ChaCha8Rng) -> Vec<u64> {
        let n = self.d * self.d;
        let mut pivot = vec![false; n];
        for &pc in &self.pivots {
            pivot[pc] = true;
        }
        let p = f.modulus();
        let mut x: Vec<u64> = (0..n)
            .map(|j| if pivot[j] { 0 } else { rng.gen_range(0..p) })
            .collect();
        for (row, &pc) in self.rows.iter().zip(&self.pivots) {
            let mut s = 0;
            for j in 0..n {
                if j != pc && row[j] != 0 {
                    s = f.add(&s, &f.mul(&row[j], &x[j]));
                }
            }
            x[pc] = f.neg(&s);
        }
        x
    }

    /// True when a random member of the space is invertible within `tries` draws (a
    /// member found proves that the space holds an invertible matrix).
    fn has_invertible(&self, f: &PrimeField, rng: &mut ChaCha8Rng, tries: usize) -> bool {
        if self.rows.len() >= self.d * self.d {
            return false;
        }
        (0..tries).any(|_| det_nonzero(f, self.random_member(f, rng), self.d))
    }
}

fn det_nonzero(f: &PrimeField, mut m: Vec<u64>, d: usize) -> bool {
    for c in 0..d {
        let Some(p) = (c..d).find(|&r| m[r * d + c] != 0) else {
            return false;
        };
        if p != c {
            for j in 0..d {
                m.swap(p * d + j, c * d + j);
            }
        }
        let inv = f.inv(&m[c * d + c]).expect("nonzero");
        for r in c + 1..d {
            let k = f.mul(&m[r * d + c], &inv);
            if k != 0 {
                for j in c..d {
                    let v = f.mul(&k, &m[c * d + j]);
                    m[r * d + j] = f.sub(&m[r * d + j], &v);
                }
            }
        }
    }
    true
}

/// The conditions `n . (P u) = 0` for all n orthogonal to `u2` (see the module docs);
/// `Err` when exactly one of the two factors is zero.
fn line_conditions(f: &PrimeField, u: &[u64], u2: &[u64]) -> Result<Vec<Vec<u64>>, ()> {
    let d = u.len();
    let zu = u.iter().all(|&x| x == 0);
    let Some(q) = u2.iter().position(|&x| x != 0) else {
        return if zu { Ok(Vec::new()) } else { Err(()) };
    };
    if zu {
        return Err(());
    }
    let mut out = Vec::with_capacity(d - 1);
    for x in (0..d).filter(|&x| x != q) {
        let mut row = vec![0u64; d * d];
        for y in 0..d {
            row[x * d + y] = f.mul(&u2[q], &u[y]);
            row[q * d + y] = f.neg(&f.mul(&u2[x], &u[y]));
        }
        out.push(row);
    }
    Ok(out)
}

/// A term matching problem modulo a prime: the factors of both schemes as residues,
/// `allowed[t]` the terms of the second scheme term t may go to.
pub struct Problem<'a> {
    pub field: PrimeField,
    /// `first[axis][t]`, `second[axis][s]`: factor vectors mod p.
    pub first: [Vec<Vec<u64>>; 3],
    pub second: [Vec<Vec<u64>>; 3],
    pub allowed: Vec<Vec<usize>>,
    pub max_nodes: usize,
    pub seed: u64,
    /// The exact check of a complete matching (`true`: confirmed, stop).
    pub leaf: &'a mut dyn FnMut(&[usize]) -> bool,
}

/// How a search ended.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Ending {
    /// A leaf was confirmed.
    Found,
    /// Every branch was tried.
    Exhausted,
    /// The node budget ran out.
    Budget,
}

/// Run the search (see the module docs). Returns how it ended and the nodes visited.
pub fn search(pb: &mut Problem) -> (Ending, usize) {
    let r = pb.allowed.len();
    let mut order: Vec<usize> = (0..r).collect();
    order.sort_by_key(|&t| (pb.allowed[t].len(), t));
    let dims = [
        pb.first[0].first().map_or(0, |x| x.len()),
        pb.first[1].first().map_or(0, |x| x.len()),
        pb.first[2].first().map_or(0, |x| x.len()),
    ];
    let sides = [Side::new(dims[0]), Side::new(dims[1]), Side::new(dims[2])];
    let mut rng = ChaCha8Rng::seed_from_u64(pb.seed);
    let mut sigma = vec![usize::MAX; r];
    let mut used = vec![false; r];
    let mut nodes = 0usize;
    let ending = descend(
        pb, &order, 0, &sides, &mut sigma, &mut used, &mut rng, &mut nodes,
    );
    (ending, nodes)
}

#[allow(clippy::too_many_arguments)]
fn descend(
    pb: &mut Problem,
    order: &[usize],
    depth: usize,
    sides: &[Side; 3],
    sigma: &mut Vec<usize>,
    used: &mut Vec<bool>,
    rng: &mut ChaCha8Rng,
    nodes: &mut usize,
) -> Ending {
    if depth == order.len() {
        return if (pb.leaf)(sigma) {
            Ending::Found
        } else {
            Ending::Exhausted
        };
    }
    let t = order[depth];
    let f = pb.field;
    let mut exhausted = true;
    for si in 0..pb.allowed[t].len() {
        let s = pb.allowed[t][si];
        if used[s] {
            continue;
        }
        *nodes += 1;
        if *nodes > pb.max_nodes {
            return Ending::Budget;
        }
        let mut next = sides.clone();
        let mut ok = true;
        for (a, side) in next.iter_mut().enumerate() {
            match line_conditions(&f, &pb.first[a][t], &pb.second[a][s]) {
                Ok(rows) => rows.into_iter().for_each(|row| side.add_row(&f, row)),
                Err(()) => ok = false,
            }
            if !ok || !side.has_invertible(&f, rng, 6) {
                ok = false;
                break;
            }
        }
        if !ok {
            continue;
        }
        sigma[t] = s;
        used[s] = true;
        let e = descend(pb, order, depth + 1, &next, sigma, used, rng, nodes);
        used[s] = false;
        sigma[t] = usize::MAX;
        match e {
            Ending::Found => return Ending::Found,
            Ending::Budget => exhausted = false,
            Ending::Exhausted => {}
        }
        if !exhausted {
            return Ending::Budget;
        }
    }
    Ending::Exhausted
}
