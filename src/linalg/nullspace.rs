//! The engine: a proven basis of the solution space of a homogeneous system given by a
//! [`RowSource`], over Q or GF(q).
//!
//! Method.
//! 1. **Components.** When the system is small enough to write out modulo one prime, its
//!    unknowns are joined by the equations they share (union-find over the row patterns,
//!    which do not depend on the prime); the system is the direct sum of its connected
//!    components, solved one by one (structured algebras give many small ones). Larger
//!    systems are solved as one component whose blocks are produced on demand.
//! 2. **Elimination mod p with early exit.** The equations of a component, in a seeded
//!    random order, are added in batches to a reduced echelon form modulo a 28-bit prime
//!    (sparse for short equations, switching to the batched dense form of
//!    [`DenseEchelon`] when it fills in). Full column rank mod p proves that only 0 solves
//!    the system over Q (rank mod p <= rank over Q), and the elimination stops there.
//! 3. **Lift.** Otherwise the candidate basis read off the echelon form (one vector per
//!    free column: 1 there, 0 at the other free columns) is lifted to Q by rational
//!    reconstruction, from one prime or by Chinese remaindering over several.
//! 4. **Exact check.** The candidate is scaled to integer vectors X and checked against
//!    **every** equation of the component: each residual `r = M X` satisfies
//!    `|r| <= t 2^b |X|_max` (t terms of at most 2^b each, see [`RowSource::term_bits`]), so
//!    it is 0 over Z as soon as it vanishes modulo primes whose product exceeds twice that
//!    bound. A checked basis with `m - rank_p` vectors, rank_p the rank mod p of some of
//!    the equations, is the whole solution space: it lies in it, and the space has
//!    dimension at most `m - rank_p`. Only a checked basis is ever returned.
//!
//! Over GF(q) (q < 2^28) the elimination and the check run in GF(q) itself.
//! Memory: a dense echelon form of m columns takes up to 4 m^2 bytes; a component above
//! [`SolveParams::max_memory`] is refused with an error before anything is allocated.

use super::dense_echelon::DenseEchelon;
use super::kernels::KERNEL_PRIME_BITS;
use super::modular::kernel_primes;
use super::sparse_echelon::SparseEchelon;
use super::system::{RowBuf, RowSource, materialize};
use crate::error::{Error, Result};
use crate::scalar::crt_combine;
use crate::scalar::{Q, Reconstructor};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};
use rand::SeedableRng;
use rand::seq::SliceRandom;
use rayon::prelude::*;

/// Parameters of the engine.
#[derive(Clone, Debug)]
pub struct SolveParams {
    /// Seed of the equation order.
    pub seed: u64,
    /// Most primes used for lifting (at most [`MAX_KERNEL_PRIMES`]); a component also stops
    /// once the product of its primes exceeds the Hadamard bound of its solutions.
    pub max_primes: usize,
    /// Bytes the elimination of one component may use.
    pub max_memory: usize,
}

impl Default for SolveParams {
    fn default() -> Self {
        SolveParams {
            seed: 0x5eed,
            max_primes: MAX_KERNEL_PRIMES,
            max_memory: default_memory_limit(),
        }
    }
}

/// A default memory budget: three quarters of the memory available when the process
/// started (from `/proc/meminfo`), at least 1 GiB, 8 GiB when unknown.
pub fn default_memory_limit() -> usize {
    static LIMIT: std::sync::OnceLock<usize> = std::sync::OnceLock::new();
    *LIMIT.get_or_init(|| {
        let avail = std::fs::read_to_string("/proc/meminfo").ok().and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("MemAvailable:"))
                .and_then(|l| l.split_whitespace().nth(1))
                .and_then(|kb| kb.parse::<usize>().ok())
                .map(|kb| kb * 1024)
        });
        match avail {
            Some(b) => (b / 4 * 3).max(1 << 30),
            None => 8 << 30,
        }
    })
}

/// A sparse vector: `(coordinate, nonzero value)`, sorted by coordinate.
pub type SparseQ = Vec<(u32, Q)>;

/// A solution space: a proven basis in reduced form (each vector has 1 at its own free
/// coordinate and 0 at the others'). Over GF(q) the entries are the representatives in
/// `0..q`.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Space {
    pub unknowns: usize,
    pub basis: Vec<SparseQ>,
}

impl Space {
    pub fn dim(&self) -> usize {
        self.basis.len()
    }

    /// Basis vector i as a dense vector.
    pub fn dense(&self, i: usize) -> Vec<Q> {
        let mut v = vec![Q::zero(); self.unknowns];
        for (c, x) in &self.basis[i] {
            v[*c as usize] = x.clone();
        }
        v
    }

    /// All basis vectors, dense.
    pub fn dense_basis(&self) -> Vec<Vec<Q>> {
        (0..self.dim()).map(|i| self.dense(i)).collect()
    }
}

/// Systems with at most this many terms are written out modulo the first prime and split
/// into connected components.
const MATERIALIZE_TERMS: usize = 1 << 25;

/// A proven basis of `{x : M x = 0}` (see the module documentation).
/// Cost per component of m unknowns: O(e' m r) word operations for the e' equations
/// eliminated (r the rank), plus O(nnz x nullity x primes) for the check.
pub fn solve_nullspace(src: &dyn RowSource, params: &SolveParams) -> Result<Space> {
    let n = src.unknowns();
    let primes: Vec<u64> = match src.modulus() {
        Some(q) if q < 1 << KERNEL_PRIME_BITS => vec![q],
        Some(q) => {
            return Err(Error::Invalid(format!(
                "linear systems over GF({q}) need a prime below 2^28"
            )));
        }
        None => primes_prefix(params.max_primes.max(2)).to_vec(),
    };
    let mut basis = Vec::new();
    if !src.prefers_streaming() && src.estimated_terms() <= MATERIALIZE_TERMS {
        let rows = materialize(src, primes[0]);
        let comps = components(&rows, n);
        let solver = Solver {
            src,
            primes: &primes,
            params,
            first: &rows,
            others: (0..cached_primes().len())
                .map(|_| Default::default())
                .collect(),
        };
        let results: Vec<Result<Vec<SparseQ>>> = comps
            .par_iter()
            .enumerate()
            .map(|(k, c)| solver.component(c, k as u64))
            .collect();
        for (c, r) in comps.iter().zip(results) {
            for v in r? {
                basis.push(
                    v.into_iter()
                        .map(|(i, x)| (c.unknowns[i as usize], x))
                        .collect(),
                );
            }
        }
    } else {
        let all = Component {
            unknowns: (0..n as u32).collect(),
            rows: Vec::new(),
            streamed: true,
        };
        let empty = RowBuf::new(primes[0]);
        let solver = Solver {
            src,
            primes: &primes,
            params,
            first: &empty,
            others: Vec::new(),
        };
        basis = solver.component(&all, 0)?;
    }
    basis.sort_by_key(|v: &SparseQ| v.first().map(|e| e.0));
    Ok(Space { unknowns: n, basis })
}

/// The number of unknowns of the largest connected component of a system (unknowns
/// joined by the equations they share), from its pattern modulo the first prime.
/// Cost: writing the system out once (its terms) and a union-find.
pub fn largest_component(src: &dyn RowSource) -> usize {
    let p = src.modulus().unwrap_or(cached_primes()[0]);
    let rows = materialize(src, p);
    components(&rows, src.unknowns())
        .iter()
        .map(|c| c.unknowns.len())
        .max()
        .unwrap_or(0)
}

/// The exact rank of a system's matrix, `unknowns - nullity`. Fast path: the rank modulo
/// the first prime reaches the number of unknowns (full column rank modulo p implies full
/// column rank over Q); otherwise the nullspace is computed and proven.
/// Cost: one streamed elimination modulo p, plus [`solve_nullspace`] when not full.
pub fn rank_of_system(src: &dyn RowSource) -> Result<usize> {
    let m = src.unknowns();
    if m == 0 {
        return Ok(0);
    }
    let p = match src.modulus() {
        Some(q) if q < 1 << KERNEL_PRIME_BITS => q,
        Some(q) => {
            return Err(Error::Invalid(format!(
                "linear systems over GF({q}) need a prime below 2^28"
            )));
        }
        None => cached_primes()[0],
    };
    if rank_modulo(src, p) == m {
        return Ok(m);
    }
    let params = SolveParams {
        max_memory: usize::MAX,
        ..Default::default()
    };
    Ok(m - solve_nullspace(src, &params)?.dim())
}

/// The rank of a system's matrix modulo p (a lower bound for the rank over Q of an
/// integer system), stopping once it is full. Cost: O(rows m rank) word operations.
pub fn rank_modulo(src: &dyn RowSource, p: u64) -> usize {
    let m = src.unknowns();
    let mut e = DenseEchelon::new(p, m);
    let mut buf = RowBuf::new(p);
    let mut batch: Vec<u32> = Vec::new();
    let per = batch_size(m);
    for b in 0..src.blocks() {
        src.block(b, p, &mut buf);
        if buf.rows() >= per || b + 1 == src.blocks() {
            for r in 0..buf.rows() {
                let (cols, vals) = buf.row(r);
                let start = batch.len();
                batch.resize(start + m, 0);
                for (&c, &v) in cols.iter().zip(vals) {
                    batch[start + c as usize] = v;
                }
            }
            buf.clear();
            e.add_rows(&mut batch);
            if e.rank() == m {
                break;
            }
        }
    }
    e.rank()
}

/// The first kernel primes, computed once.
pub fn cached_primes() -> &'static [u64] {
    static PRIMES: std::sync::OnceLock<Vec<u64>> = std::sync::OnceLock::new();
    PRIMES.get_or_init(|| kernel_primes(192))
}

/// Most kernel primes the engine uses: their product has about 229,000 bits, enough for
/// the solutions of any system it can eliminate in memory.
pub const MAX_KERNEL_PRIMES: usize = 8192;

/// The first `count` kernel primes (at most [`MAX_KERNEL_PRIMES`]), the same sequence as
/// [`cached_primes`]; the longer list is computed once, only when asked for.
pub fn primes_prefix(count: usize) -> &'static [u64] {
    let first = cached_primes();
    if count <= first.len() {
        return &first[..count];
    }
    static MANY: std::sync::OnceLock<Vec<u64>> = std::sync::OnceLock::new();
    let many = MANY.get_or_init(|| kernel_primes(MAX_KERNEL_PRIMES));
    &many[..count.min(many.len())]
}

/// Bits a modulus needs so that rational reconstruction recovers every reduced solution
/// vector of a system of rank at most `rank`, with integer coefficients of at most
/// `term_bits` bits and at most `terms` terms per equation: by Cramer's rule each entry is
/// a ratio of two minors of size at most `rank`, each below `(sqrt(terms) 2^term_bits)^rank`
/// (Hadamard's inequality), and reconstruction needs a modulus above `2 N D`.
pub fn hadamard_bits(rank: usize, term_bits: u64, terms: usize) -> u64 {
    let row = term_bits as f64 + (terms.max(1) as f64).log2() / 2.0;
    (2.0 * rank as f64 * row).ceil() as u64 + 2
}

/// A connected component: its unknowns (global ids, ascending) and its rows (ids in the
/// written-out system), or the whole system produced block by block.
struct Component {
    unknowns: Vec<u32>,
    rows: Vec<u32>,
    streamed: bool,
}

fn components(rows: &RowBuf, n: usize) -> Vec<Component> {
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

struct Solver<'a> {
    src: &'a dyn RowSource,
    primes: &'a [u64],
    params: &'a SolveParams,
    /// The system written out modulo the first prime (empty when streamed).
    first: &'a RowBuf,
    /// The system written out modulo further primes, shared by the components.
    others: Vec<std::sync::OnceLock<RowBuf>>,
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
enum Rows<'a> {
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
enum Elim {
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
fn batch_size(m: usize) -> usize {
    (m / 4).clamp(64, 512)
}

impl Solver<'_> {
    fn component(&self, c: &Component, salt: u64) -> Result<Vec<SparseQ>> {
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

struct Ctx<'a, 'b> {
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
            self.feed(p, rows_p.as_deref(), &order, |group| {
                e.add(group);
                e.rank() < m
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
        let rows_ok = |p: u64, xs: &[Vec<u64>]| {
            let rows = self.s.rows_mod(p);
            let ok = self.c.rows.par_iter().all(|&r| {
                let (cols, vals) = rows.row(r as usize);
                residual_zero(cols, vals, xs, p, |c| self.local[&c] as usize)
            });
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

/// Whether the residual of one equation vanishes modulo p for every vector of `xs`
/// (dense residue vectors; `loc` maps a column to its coordinate).
fn residual_zero(
    cols: &[u32],
    vals: &[u32],
    xs: &[Vec<u64>],
    p: u64,
    loc: impl Fn(u32) -> usize,
) -> bool {
    xs.iter().all(|x| {
        let mut acc: u128 = 0;
        for (&c, &v) in cols.iter().zip(vals) {
            acc += v as u128 * x[loc(c)] as u128;
        }
        acc.is_multiple_of(p as u128)
    })
}

/// The exact check of candidate vectors in coordinates `0..m` (see the module
/// documentation): `residuals(p, xs)` says whether every equation vanishes modulo p on the
/// vectors reduced mod p, and gives the largest number of terms of an equation.
fn exact_check(
    modulus: Option<u64>,
    term_bits: u64,
    m: usize,
    basis: &[SparseQ],
    residuals: impl Fn(u64, &[Vec<u64>]) -> (bool, usize),
) -> Result<bool> {
    if basis.is_empty() {
        return Ok(true);
    }
    // integer vectors
    let ints: Vec<Vec<(u32, BigInt)>> = basis
        .iter()
        .map(|v| {
            let l = v
                .iter()
                .fold(BigInt::one(), |acc, (_, x)| acc.lcm(x.denom()));
            v.iter()
                .map(|(c, x)| (*c, x.numer() * (&l / x.denom())))
                .collect()
        })
        .collect();
    let xbits = ints
        .iter()
        .flatten()
        .map(|(_, x)| x.bits())
        .max()
        .unwrap_or(0);
    let exact_field = modulus.is_some();
    let mut needed = 1usize;
    let mut k = 0;
    while k < needed {
        let p = match modulus {
            Some(q) => q,
            None => primes_prefix(k + 1).get(k).copied().ok_or_else(|| {
                Error::Invalid(format!(
                    "the exact check of a solution with {xbits}-bit entries needs more than \
                     {MAX_KERNEL_PRIMES} primes"
                ))
            })?,
        };
        let pb = BigInt::from(p);
        let xs: Vec<Vec<u64>> = ints
            .iter()
            .map(|v| {
                let mut d = vec![0u64; m];
                for (c, x) in v {
                    d[*c as usize] = match x.to_i64() {
                        Some(s) => s.rem_euclid(p as i64) as u64,
                        None => x.mod_floor(&pb).to_u64().expect("reduced"),
                    };
                }
                d
            })
            .collect();
        let (ok, max_terms) = residuals(p, &xs);
        if !ok {
            return Ok(false);
        }
        if k == 0 && !exact_field {
            let bits = (max_terms.max(1) as f64).log2().ceil() as u64 + term_bits + xbits + 2;
            needed = (bits as f64 / 27.99).ceil() as usize;
        }
        k += 1;
    }
    Ok(true)
}

/// Check exactly that vectors (in the system's own coordinates) solve **every** equation
/// of a system, produced block by block (see the module documentation for the bound).
/// Cost: per prime used, one pass over all blocks, O(terms x vectors).
pub fn check_solutions(src: &dyn RowSource, basis: &[SparseQ]) -> Result<bool> {
    let residuals = |p: u64, xs: &[Vec<u64>]| {
        let res: std::result::Result<Vec<usize>, ()> = (0..src.blocks())
            .into_par_iter()
            .map_init(
                || RowBuf::new(p),
                |b, blk| {
                    b.clear();
                    src.block(blk, p, b);
                    for r in 0..b.rows() {
                        let (cols, vals) = b.row(r);
                        if !residual_zero(cols, vals, xs, p, |c| c as usize) {
                            return Err(());
                        }
                    }
                    Ok(b.max_terms)
                },
            )
            .collect();
        match res {
            Ok(v) => (true, v.into_iter().max().unwrap_or(0)),
            Err(()) => (false, 0),
        }
    };
    exact_check(
        src.modulus(),
        src.term_bits(),
        src.unknowns(),
        basis,
        residuals,
    )
}

/// A byte count for messages (`1.5 GiB`, `300 MiB`).
pub fn human_bytes(b: usize) -> String {
    let x = b as f64;
    match b {
        0..1024 => format!("{b} bytes"),
        1024..1_048_576 => format!("{:.0} KiB", x / 1024.0),
        1_048_576..1_073_741_824 => format!("{:.0} MiB", x / 1_048_576.0),
        _ => format!("{:.1} GiB", x / 1_073_741_824.0),
    }
}

/// The basis from the entries `E[r][f]` of a reduced echelon form: vector f has 1 at its
/// free column and `-E[r][f]` (given by `neg`) at pivot r.
fn basis_from_image<T>(
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
fn reconstruct(
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

#[cfg(test)]
mod tests {
    use super::super::system::IntegerRows;
    use super::*;

    #[test]
    fn small_systems_over_q_and_mod_p() {
        // x0 + 2 x1 - x2 = 0 ; 3 x3 = 0 ; x4 free
        let rows = vec![
            vec![1, 2, -1, 0, 0].into_iter().map(BigInt::from).collect(),
            vec![0, 0, 0, 3, 0].into_iter().map(BigInt::from).collect(),
        ];
        let sys = IntegerRows::new(5, rows);
        let sp = solve_nullspace(&sys, &SolveParams::default()).unwrap();
        assert_eq!(sp.dim(), 3);
    }

    #[test]
    fn lifts_fractions_and_big_entries() {
        // 3 x0 - 7 x1 = 0 in many scaled forms; a huge coefficient row too
        let mut rows: Vec<Vec<BigInt>> = (1..200)
            .map(|t| vec![BigInt::from(3 * t), BigInt::from(-7 * t)])
            .collect();
        let big = BigInt::from(3) * BigInt::from(10).pow(40);
        rows.push(vec![
            big.clone(),
            -(big * BigInt::from(7)) / BigInt::from(3),
        ]);
        let sys = IntegerRows::new(2, rows);
        let sp = solve_nullspace(&sys, &SolveParams::default()).unwrap();
        assert_eq!(sp.dim(), 1);
        let v = sp.dense(0);
        assert_eq!(
            &v[0] * Q::from_integer(3.into()),
            &v[1] * Q::from_integer(7.into())
        );
    }
}
