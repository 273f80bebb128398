//! Solving a system component by component (steps 1 to 3 of [`super::nullspace`]): the
//! connected components of the written-out system, elimination modulo p with early exit
//! (sparse, switching to dense on fill-in), the multi-modular lift by Chinese remaindering
//! and rational reconstruction, each candidate passed to the exact check.

use super::dense_echelon::DenseEchelon;
use super::exact_check::{Residues, check_solutions, exact_check, residual_zero};
use super::kernels::LazyAcc;
use super::nullspace::{SolveParams, SparseQ, human_bytes};
use super::primes::{cached_primes, hadamard_bits};
use super::sparse_echelon::SparseEchelon;
use super::system::{RowBuf, RowSource, materialize};
use crate::error::{Error, Result};
use crate::scalar::crt_combine;
use crate::scalar::{Q, Reconstructor};
use num_bigint::BigInt;
use num_traits::{One, Zero};
use rand::SeedableRng;
use rand::seq::SliceRandom;
use rayon::prelude::*;

/// A connected component: its unknowns (global ids, ascending) and its rows (ids in the
/// written-out system), or the whole system produced block by block.
pub(super) struct Component {
    pub(super) unknowns: Vec<u32>,
    pub(super) rows: Vec<u32>,
    pub(super) streamed: bool,
}

pub(super) fn components(rows: &RowBuf, n: usize) -> Vec<Component> {
    let mut parent: Vec<u32> = (0..n as u32).collect();
    fn find(parent: &mut [u32], mut x: u32) -> u32 {
        while parent[x as usize] != x {
            parent[x as usize] = parent[parent[x as usize] as usize];
            x = parent[x as usize];
        }
        x
    }
    for r in 0..rows.rows() {
        let (cols, _) = rows.row(r);
        if let Some(&c0) = cols.first() {
            for &c in &cols[1..] {
                let (a, b) = (find(&mut parent, c0), find(&mut parent, c));
                if a != b {
                    parent[a.max(b) as usize] = a.min(b);
                }
            }
        }
    }
    let mut comp_of = vec![u32::MAX; n];
    let mut comps: Vec<Component> = Vec::new();
    for u in 0..n as u32 {
        let root = find(&mut parent, u) as usize;
        if comp_of[root] == u32::MAX {
            comp_of[root] = comps.len() as u32;
            comps.push(Component {
                unknowns: Vec::new(),
                rows: Vec::new(),
                streamed: false,
            });
        }
        let c = comp_of[root] as usize;
        comp_of[u as usize] = c as u32;
        comps[c].unknowns.push(u);
    }
    for r in 0..rows.rows() {
        let (cols, _) = rows.row(r);
        if let Some(&c0) = cols.first() {
            comps[comp_of[c0 as usize] as usize].rows.push(r as u32);
        }
    }
    comps
}

pub(super) struct Solver<'a> {
    pub(super) src: &'a dyn RowSource,
    pub(super) primes: &'a [u64],
    pub(super) params: &'a SolveParams,
    /// The system written out modulo the first prime (empty when streamed).
    pub(super) first: &'a RowBuf,
    /// The system written out modulo further primes, shared by the components.
    pub(super) others: Vec<std::sync::OnceLock<RowBuf>>,
}

impl Solver<'_> {
    /// The written-out system modulo p: the first prime, a cached further one, or (past
    /// the cached primes) written out for this call only.
    fn rows_mod(&self, p: u64) -> Rows<'_> {
        if p == self.first.p {
            return Rows::Shared(self.first);
        }
        match cached_primes().iter().position(|&q| q == p) {
            Some(i) if i < self.others.len() => {
                Rows::Shared(self.others[i].get_or_init(|| materialize(self.src, p)))
            }
            _ => Rows::Own(materialize(self.src, p)),
        }
    }
}

/// A written-out system, shared from the cache or owned by the caller.
pub(super) enum Rows<'a> {
    Shared(&'a RowBuf),
    Own(RowBuf),
}

impl std::ops::Deref for Rows<'_> {
    type Target = RowBuf;
    fn deref(&self) -> &RowBuf {
        match self {
            Rows::Shared(r) => r,
            Rows::Own(r) => r,
        }
    }
}

/// Dense or sparse elimination, chosen per component (sparse for short equations), with a
/// switch to the dense form when fill-in grows past 1/8 of the dense size.
pub(super) enum Elim {
    Dense(DenseEchelon, Vec<u32>),
    Sparse(SparseEchelon),
}

impl Elim {
    fn new(p: u64, m: usize, short_rows: bool) -> Self {
        if m > 64 && short_rows {
            Elim::Sparse(SparseEchelon::new(p, m))
        } else {
            Elim::Dense(DenseEchelon::new(p, m), Vec::new())
        }
    }
    fn rank(&self) -> usize {
        match self {
            Elim::Dense(e, _) => e.rank(),
            Elim::Sparse(e) => e.rank(),
        }
    }
    fn pivots(&self) -> Vec<usize> {
        match self {
            Elim::Dense(e, _) => e.pivot_columns(),
            Elim::Sparse(e) => e.pivots(),
        }
    }
    fn free(&self) -> Vec<usize> {
        match self {
            Elim::Dense(e, _) => e.free_columns(),
            Elim::Sparse(e) => e.free(),
        }
    }
    fn image(&self, free: &[usize]) -> Vec<u64> {
        match self {
            Elim::Dense(e, _) => e.image(free),
            Elim::Sparse(e) => e.image(free),
        }
    }
    /// Add rows given as local (column, residue) lists.
    fn add(&mut self, rows: &[Vec<(u32, u32)>]) {
        match self {
            Elim::Dense(e, buf) => {
                let m = e.m;
                for r in rows {
                    let start = buf.len();
                    buf.resize(start + m, 0);
                    for &(c, v) in r {
                        buf[start + c as usize] = v;
                    }
                }
                e.add_rows(buf);
            }
            Elim::Sparse(e) => {
                let mut wide: Vec<(u32, u64)> = Vec::new();
                for r in rows {
                    wide.clear();
                    wide.extend(r.iter().map(|&(c, v)| (c, v as u64)));
                    wide.sort_unstable();
                    e.add(&wide);
                }
                if e.nnz() > (e.m * e.m / 8).max(4096) {
                    let mut d = DenseEchelon::new(e.p, e.m);
                    let mut buf = Vec::with_capacity(e.rank() * e.m);
                    for r in e.rows() {
                        let start = buf.len();
                        buf.resize(start + e.m, 0);
                        for &(c, v) in r {
                            buf[start + c as usize] = v as u32;
                        }
                    }
                    d.add_rows(&mut buf);
                    *self = Elim::Dense(d, Vec::new());
                }
            }
        }
    }
}

/// Rows fed per batch.
pub(super) fn batch_size(m: usize) -> usize {
    (m / 4).clamp(64, 512)
}

impl Solver<'_> {
    pub(super) fn component(&self, c: &Component, salt: u64) -> Result<Vec<SparseQ>> {
        let m = c.unknowns.len();
        if !c.streamed && c.rows.is_empty() {
            return Ok((0..m).map(|i| vec![(i as u32, Q::one())]).collect());
        }
        let dense_bytes = 4 * m * m;
        if dense_bytes > self.params.max_memory {
            return Err(Error::TooLarge(format!(
                "a linear system with {m} connected unknowns needs about {} of memory for \
                 its elimination, above the limit of {} (raise it with --max-memory)",
                human_bytes(dense_bytes),
                human_bytes(self.params.max_memory)
            )));
        }
        let mut local = std::collections::HashMap::new();
        if !c.streamed {
            for (i, &u) in c.unknowns.iter().enumerate() {
                local.insert(u, i as u32);
            }
        }
        let ctx = Ctx {
            s: self,
            c,
            local,
            salt,
        };
        ctx.solve()
    }
}

pub(super) struct Ctx<'a, 'b> {
    s: &'a Solver<'b>,
    c: &'a Component,
    /// global -> local column (empty when streamed: identity)
    local: std::collections::HashMap<u32, u32>,
    salt: u64,
}

impl Ctx<'_, '_> {
    fn m(&self) -> usize {
        self.c.unknowns.len()
    }

    fn loc(&self, g: u32) -> u32 {
        if self.c.streamed { g } else { self.local[&g] }
    }

    /// The order in which rows (materialized) or blocks (streamed) are fed.
    fn order(&self) -> Vec<u32> {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(
            self.s.params.seed ^ self.salt.wrapping_mul(0x9e37_79b9),
        );
        let mut o: Vec<u32> = if self.c.streamed {
            (0..self.s.src.blocks() as u32).collect()
        } else {
            self.c.rows.clone()
        };
        o.shuffle(&mut rng);
        o
    }

    /// Visit the component's rows modulo p, in `order`, in groups of about `batch` rows,
    /// as local sparse rows; `f` returns false to stop.
    fn feed(
        &self,
        p: u64,
        rows_p: Option<&RowBuf>,
        order: &[u32],
        mut f: impl FnMut(&[Vec<(u32, u32)>]) -> bool,
    ) {
        let batch = batch_size(self.m());
        let mut group: Vec<Vec<(u32, u32)>> = Vec::with_capacity(batch);
        let mut buf = RowBuf::new(p);
        for &id in order {
            if self.c.streamed {
                buf.clear();
                self.s.src.block(id as usize, p, &mut buf);
                for r in 0..buf.rows() {
                    let (cols, vals) = buf.row(r);
                    if vals.iter().any(|&v| v != 0) {
                        group.push(cols.iter().copied().zip(vals.iter().copied()).collect());
                    }
                }
            } else {
                let rows = rows_p.expect("written out");
                let (cols, vals) = rows.row(id as usize);
                if vals.iter().any(|&v| v != 0) {
                    group.push(
                        cols.iter()
                            .zip(vals)
                            .filter(|(_, v)| **v != 0)
                            .map(|(&c, &v)| (self.loc(c), v))
                            .collect(),
                    );
                }
            }
            if group.len() >= batch {
                if !f(&group) {
                    return;
                }
                group.clear();
            }
        }
        if !group.is_empty() {
            f(&group);
        }
    }

    fn short_rows(&self, rows: Option<&RowBuf>) -> bool {
        match rows {
            Some(r) if !self.c.rows.is_empty() => {
                let terms: usize = self.c.rows.iter().map(|&i| r.row(i as usize).0.len()).sum();
                terms <= 8 * self.c.rows.len()
            }
            _ => false,
        }
    }

    fn solve(&self) -> Result<Vec<SparseQ>> {
        let m = self.m();
        let primes = self.s.primes;
        let order = self.order();
        let first = (!self.c.streamed).then_some(self.s.first);
        let short = self.short_rows(first);
        // 1. first prime, with early exits
        let mut ech = Elim::new(primes[0], m, short);
        let mut result: Option<Vec<SparseQ>> = None;
        let mut tried_rank = usize::MAX;
        let mut fed_all = true;
        self.feed(primes[0], first, &order, |group| {
            ech.add(group);
            if ech.rank() == m {
                result = Some(Vec::new());
                fed_all = false;
                return false;
            }
            let nullity = m - ech.rank();
            // a cheap early lift once the rank has stopped growing for a batch
            if ech.rank() == tried_rank && nullity * ech.rank() <= 1 << 18 {
                let free = ech.free();
                let img: Vec<BigInt> = ech.image(&free).into_iter().map(BigInt::from).collect();
                if let Some(b) = reconstruct(&img, &BigInt::from(primes[0]), &ech.pivots(), &free)
                    && self.check(&b).unwrap_or(false)
                {
                    result = Some(b);
                    fed_all = false;
                    return false;
                }
            }
            tried_rank = ech.rank();
            true
        });
        if let Some(r) = result {
            return Ok(r);
        }
        debug_assert!(fed_all);
        if self.s.src.modulus().is_some() {
            // exact in GF(q): the basis is read off the echelon form
            let free = ech.free();
            let q = primes[0];
            let img = ech.image(&free);
            let b = basis_from_image(&img, &ech.pivots(), &free, |e| {
                Q::from_integer(BigInt::from((q - e) % q))
            });
            if !self.check(&b)? {
                return Err(Error::Invalid(
                    "internal error: a basis over GF(q) failed its check".into(),
                ));
            }
            return Ok(b);
        }
        // 2. multi-modular lift
        let mut best_pivots = ech.pivots();
        let mut best_rank = ech.rank();
        let mut free = ech.free();
        let mut residues: Vec<BigInt> = ech.image(&free).into_iter().map(BigInt::from).collect();
        let mut modulus = BigInt::from(primes[0]);
        let mut combined = 1usize;
        let mut next_try = 2usize;
        if let Some(b) = reconstruct(&residues, &modulus, &best_pivots, &free)
            && self.check(&b)?
        {
            return Ok(b);
        }
        for &p in &primes[1..] {
            let rows_p = (!self.c.streamed).then(|| self.s.rows_mod(p));
            let mut e = Elim::new(p, m, short);
            // The equations come in the same order at every prime, so the ones fed until
            // the rank reaches the best rank seen span the row space whenever that rank is
            // the true one: feeding stops there. Before each reconstruction attempt all
            // equations are fed, which finds a higher rank if the first primes were
            // unlucky (rank mod p <= rank over Q); the exact check guards the rest.
            let full = (combined + 1).is_power_of_two() || combined + 1 >= next_try;
            let target = if full { m } else { best_rank };
            self.feed(p, rows_p.as_deref(), &order, |group| {
                e.add(group);
                e.rank() < target
            });
            if e.rank() == m {
                return Ok(Vec::new());
            }
            let piv = e.pivots();
            if e.rank() > best_rank || (e.rank() == best_rank && piv < best_pivots) {
                // the earlier primes were unlucky: restart from this one
                best_rank = e.rank();
                best_pivots = piv;
                free = e.free();
                residues = e.image(&free).into_iter().map(BigInt::from).collect();
                modulus = BigInt::from(p);
                combined = 1;
                next_try = 2;
            } else if piv == best_pivots {
                crt_combine(&mut residues, &modulus, &e.image(&free), p);
                modulus *= p;
                combined += 1;
            } else {
                continue;
            }
            // past this size of modulus the right pivots would have reconstructed
            let cap = hadamard_bits(best_rank, self.s.src.term_bits(), m) + 64;
            let past_cap = modulus.bits() > cap;
            if combined >= next_try || combined == 1 || past_cap {
                next_try = combined * 2;
                if let Some(b) = reconstruct(&residues, &modulus, &best_pivots, &free)
                    && self.check(&b)?
                {
                    return Ok(b);
                }
                if past_cap {
                    break;
                }
            }
        }
        if let Some(b) = reconstruct(&residues, &modulus, &best_pivots, &free)
            && self.check(&b)?
        {
            return Ok(b);
        }
        Err(Error::Invalid(format!(
            "could not lift the solution space of a system with {m} unknowns to Q within \
             {} primes",
            primes.len()
        )))
    }

    /// Exact check of candidate vectors (local coordinates) against every equation of the
    /// component (see the module documentation).
    fn check(&self, basis: &[SparseQ]) -> Result<bool> {
        if self.c.streamed {
            return check_solutions(self.s.src, basis);
        }
        let rows_ok = |p: u64, xs: &Residues| {
            let rows = self.s.rows_mod(p);
            let ok = self
                .c
                .rows
                .par_iter()
                .map_init(
                    || LazyAcc::new(xs.count, p),
                    |acc, &r| {
                        let (cols, vals) = rows.row(r as usize);
                        residual_zero(cols, vals, xs, acc, |c| self.local[&c] as usize)
                    },
                )
                .all(|ok| ok);
            (ok, rows.max_terms)
        };
        exact_check(
            self.s.src.modulus(),
            self.s.src.term_bits(),
            self.m(),
            basis,
            rows_ok,
        )
    }
}

/// The basis from the entries `E[r][f]` of a reduced echelon form: vector f has 1 at its
/// free column and `-E[r][f]` (given by `neg`) at pivot r.
pub(super) fn basis_from_image<T>(
    img: &[T],
    pivots: &[usize],
    free: &[usize],
    neg: impl Fn(&T) -> Q,
) -> Vec<SparseQ>
where
    T: PartialEq + Default,
{
    let nf = free.len();
    let zero = T::default();
    free.iter()
        .enumerate()
        .map(|(k, &f)| {
            let mut v: SparseQ = vec![(f as u32, Q::one())];
            for (r, &pc) in pivots.iter().enumerate() {
                let e = &img[r * nf + k];
                if *e != zero {
                    v.push((pc as u32, neg(e)));
                }
            }
            v.sort_by_key(|e| e.0);
            v
        })
        .collect()
}

/// The candidate basis from residues of `E[r][f]` modulo `modulus`.
pub(super) fn reconstruct(
    res: &[BigInt],
    modulus: &BigInt,
    pivots: &[usize],
    free: &[usize],
) -> Option<Vec<SparseQ>> {
    let nf = free.len();
    let rec = Reconstructor::new(modulus);
    let mut out = Vec::with_capacity(nf);
    for (k, &f) in free.iter().enumerate() {
        let at: Vec<(usize, &BigInt)> = pivots
            .iter()
            .enumerate()
            .map(|(r, &pc)| (pc, &res[r * nf + k]))
            .filter(|(_, x)| !x.is_zero())
            .collect();
        let xs: Vec<BigInt> = at.iter().map(|(_, x)| (*x).clone()).collect();
        let qs = rec.reconstruct_many(&xs)?;
        let mut v: SparseQ = vec![(f as u32, Q::one())];
        v.extend(at.iter().zip(qs).map(|((pc, _), q)| (*pc as u32, -q)));
        v.sort_by_key(|e| e.0);
        out.push(v);
    }
    Some(out)
}
