//! The engine: a proven basis of the solution space of a sparse homogeneous system
//! ([`SparseSystem`]) over Q or GF(p).
//!
//! Method.
//! 1. **Blocks.** Unknowns that share an equation are joined (union-find); the system is a
//!    direct sum of its connected blocks, solved one by one (for graded algebras such as
//!    matrix, group or Clifford algebras the blocks are small).
//! 2. **Streaming elimination mod p.** The equations of a block, in a seeded random order,
//!    are added in batches to a reduced echelon form modulo a 28-bit prime
//!    ([`rref_mod`]); a block of full column rank mod p has only the zero solution over Q
//!    (rank mod p <= rank over Q), so the elimination stops as soon as that happens.
//! 3. **Lift and check.** Otherwise the candidate basis read off the echelon form (one
//!    vector per free column) is lifted to Q by rational reconstruction (one prime first,
//!    then Chinese remaindering over more primes), and **checked exactly over the integers
//!    against every equation of the block**. A checked basis of dimension m - rank_p, where
//!    rank_p is the rank mod p of a subset of the equations, is proven to be the whole
//!    solution space: it lies in it, and the space has dimension at most m - rank_p. So the
//!    check may succeed before all equations were eliminated (early exit).
//! 4. If lifting fails after many primes, the block is solved by exact elimination over Q.
//!
//! Over GF(p) the elimination is exact in the field itself (no lifting); the basis is still
//! checked against every equation. The bases returned are in reduced form: each vector has
//! a 1 at its own free coordinate and 0 at the others', so they are independent.

use super::sparse_echelon::SparseEchelon;
use super::system::SparseSystem;
use crate::error::{Error, Result};
use crate::linalg::{Matrix, echelon, modular::kernel_primes, modular::rref_mod, nullspace_q};
use crate::scalar::{Field, PrimeField, Q, rational_reconstruct};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};
use rand::SeedableRng;
use rand::seq::SliceRandom;

/// Parameters of the engine.
#[derive(Clone, Debug)]
pub struct SolveParams {
    /// Seed of the equation order.
    pub seed: u64,
    /// Most primes used for lifting before exact elimination.
    pub max_primes: usize,
}

impl Default for SolveParams {
    fn default() -> Self {
        SolveParams {
            seed: 0x5eed,
            max_primes: 40,
        }
    }
}

/// A solution space: its dimension and a proven basis (vectors of length `unknowns`).
/// Over GF(p) the entries are the representatives in `0..p`.
#[derive(Clone, Debug, PartialEq)]
pub struct Space {
    pub unknowns: usize,
    pub basis: Vec<Vec<Q>>,
}

impl Space {
    pub fn dim(&self) -> usize {
        self.basis.len()
    }
}

/// A proven basis of `{x : M x = 0}` for a sparse system (see the module documentation).
/// Cost: per block of m unknowns and e equations, O((e' + m) m r) word operations for the
/// e' <= e equations eliminated (r the rank), plus O(nnz(block) * nullity) for the check.
pub fn solve_nullspace(sys: &SparseSystem, params: &SolveParams) -> Result<Space> {
    let n = sys.unknowns;
    // union-find over unknowns
    let mut parent: Vec<u32> = (0..n as u32).collect();
    fn find(parent: &mut [u32], mut x: u32) -> u32 {
        while parent[x as usize] != x {
            parent[x as usize] = parent[parent[x as usize] as usize];
            x = parent[x as usize];
        }
        x
    }
    for r in 0..sys.rows() {
        let (cols, _) = sys.row(r);
        let a = find(&mut parent, cols[0]);
        for &c in &cols[1..] {
            let b = find(&mut parent, c);
            if a != b {
                let (lo, hi) = if a < b { (a, b) } else { (b, a) };
                parent[hi as usize] = lo;
            }
        }
        // keep `a` a root
        let root = find(&mut parent, cols[0]);
        let _ = root;
    }
    // group unknowns and rows by block
    let mut block_of = vec![u32::MAX; n];
    let mut local = vec![0u32; n];
    let mut blocks: Vec<Vec<u32>> = Vec::new();
    for u in 0..n as u32 {
        let root = find(&mut parent, u) as usize;
        if block_of[root] == u32::MAX {
            block_of[root] = blocks.len() as u32;
            blocks.push(Vec::new());
        }
        let b = block_of[root] as usize;
        block_of[u as usize] = b as u32;
        local[u as usize] = blocks[b].len() as u32;
        blocks[b].push(u);
    }
    let mut rows_of: Vec<Vec<u32>> = vec![Vec::new(); blocks.len()];
    for r in 0..sys.rows() {
        let (cols, _) = sys.row(r);
        rows_of[block_of[cols[0] as usize] as usize].push(r as u32);
    }
    let mut basis = Vec::new();
    for (b, unknowns) in blocks.iter().enumerate() {
        let block = Block {
            sys,
            unknowns,
            rows: &rows_of[b],
            local: &local,
        };
        let vecs = block.solve(params, b as u64)?;
        for v in vecs {
            let mut full = vec![Q::zero(); n];
            for (x, &u) in v.into_iter().zip(unknowns.iter()) {
                full[u as usize] = x;
            }
            basis.push(full);
        }
    }
    Ok(Space { unknowns: n, basis })
}

struct Block<'a> {
    sys: &'a SparseSystem,
    unknowns: &'a [u32],
    rows: &'a [u32],
    local: &'a [u32],
}

/// A reduced echelon form modulo p of some equations of a block.
struct Echelon {
    p: u64,
    m: usize,
    data: Vec<u64>,
    pivots: Vec<usize>,
}

fn rref_p(data: &mut [u64], rows: usize, cols: usize, p: u64) -> Vec<usize> {
    if p < (1 << crate::linalg::modular::KERNEL_PRIME_BITS) {
        return rref_mod(data, rows, cols, p, true);
    }
    let f = PrimeField::new(p).expect("prime");
    let mut mat = Matrix {
        rows,
        cols,
        data: data.to_vec(),
    };
    let piv = echelon::rref(&f, &mut mat);
    data.copy_from_slice(&mat.data);
    piv
}

impl Echelon {
    fn new(p: u64, m: usize) -> Self {
        Echelon {
            p,
            m,
            data: Vec::new(),
            pivots: Vec::new(),
        }
    }
    fn rank(&self) -> usize {
        self.pivots.len()
    }
    /// Add equations (global row ids) and re-reduce. Returns the rank gained.
    fn add_rows(&mut self, blk: &Block, rows: &[u32]) -> usize {
        let before = self.rank();
        let m = self.m;
        let p = self.p as i64;
        self.data.truncate(before * m);
        let start = self.data.len();
        self.data.resize(start + rows.len() * m, 0);
        for (t, &r) in rows.iter().enumerate() {
            let (cols, vals) = blk.sys.row(r as usize);
            let dst = &mut self.data[start + t * m..start + (t + 1) * m];
            for (&c, &v) in cols.iter().zip(vals) {
                dst[blk.local[c as usize] as usize] = v.rem_euclid(p) as u64;
            }
        }
        let total = before + rows.len();
        self.pivots = rref_p(&mut self.data, total, m, self.p);
        self.data.truncate(self.pivots.len() * m);
        self.pivots.len() - before
    }
    /// Add sparse rows given in local columns and re-reduce.
    fn add_dense(&mut self, rows: &[Vec<(u32, u64)>]) {
        let m = self.m;
        let before = self.rank();
        self.data.truncate(before * m);
        for row in rows {
            let start = self.data.len();
            self.data.resize(start + m, 0);
            for &(c, v) in row {
                self.data[start + c as usize] = v;
            }
        }
        let total = before + rows.len();
        self.pivots = rref_p(&mut self.data, total, m, self.p);
        self.data.truncate(self.pivots.len() * m);
    }
    fn free(&self) -> Vec<usize> {
        let mut is_p = vec![false; self.m];
        for &c in &self.pivots {
            is_p[c] = true;
        }
        (0..self.m).filter(|&c| !is_p[c]).collect()
    }
    /// The entries `E[r][f]` for pivot rows r and free columns f, row-major.
    fn image(&self, free: &[usize]) -> Vec<u64> {
        let mut out = Vec::with_capacity(self.rank() * free.len());
        for r in 0..self.rank() {
            for &f in free {
                out.push(self.data[r * self.m + f]);
            }
        }
        out
    }
}

/// Dense or sparse elimination, chosen per block (sparse for short equations), with a
/// switch to dense form when fill-in grows past 1/8 of the dense size.
enum Elim {
    Dense(Echelon),
    Sparse(SparseEchelon),
}

impl Elim {
    fn new(p: u64, blk: &Block) -> Self {
        let m = blk.unknowns.len();
        let terms: usize = blk
            .rows
            .iter()
            .map(|&r| blk.sys.row(r as usize).0.len())
            .sum();
        if m > 64 && terms <= 8 * blk.rows.len() {
            Elim::Sparse(SparseEchelon::new(p, m))
        } else {
            Elim::Dense(Echelon::new(p, m))
        }
    }
    fn rank(&self) -> usize {
        match self {
            Elim::Dense(e) => e.rank(),
            Elim::Sparse(e) => e.rank(),
        }
    }
    fn p(&self) -> u64 {
        match self {
            Elim::Dense(e) => e.p,
            Elim::Sparse(e) => e.p,
        }
    }
    fn pivots(&self) -> Vec<usize> {
        match self {
            Elim::Dense(e) => e.pivots.clone(),
            Elim::Sparse(e) => e.pivots(),
        }
    }
    fn free(&self) -> Vec<usize> {
        match self {
            Elim::Dense(e) => e.free(),
            Elim::Sparse(e) => e.free(),
        }
    }
    fn image(&self, free: &[usize]) -> Vec<u64> {
        match self {
            Elim::Dense(e) => e.image(free),
            Elim::Sparse(e) => e.image(free),
        }
    }
    fn add_rows(&mut self, blk: &Block, rows: &[u32]) {
        match self {
            Elim::Dense(e) => {
                e.add_rows(blk, rows);
            }
            Elim::Sparse(e) => {
                let p = e.p as i64;
                let mut buf = Vec::new();
                for &r in rows {
                    let (cols, vals) = blk.sys.row(r as usize);
                    buf.clear();
                    buf.extend(
                        cols.iter()
                            .zip(vals)
                            .map(|(&c, &v)| (blk.local[c as usize], v.rem_euclid(p) as u64)),
                    );
                    buf.sort_unstable();
                    e.add(&buf);
                }
                if e.nnz() > (e.m * e.m / 8).max(4096) {
                    // too much fill-in: continue densely
                    let mut d = Echelon::new(e.p, e.m);
                    d.add_dense(e.rows());
                    *self = Elim::Dense(d);
                }
            }
        }
    }
}

impl Block<'_> {
    fn solve(&self, params: &SolveParams, salt: u64) -> Result<Vec<Vec<Q>>> {
        let m = self.unknowns.len();
        if self.rows.is_empty() {
            return Ok(vec![unit(m, 0)]);
        }
        let mut order: Vec<u32> = self.rows.to_vec();
        let mut rng =
            rand_chacha::ChaCha8Rng::seed_from_u64(params.seed ^ salt.wrapping_mul(0x9e37));
        order.shuffle(&mut rng);
        match self.sys.modulus {
            Some(p) => self.solve_mod(p, &order),
            None => self.solve_q(params, &order),
        }
    }

    fn solve_mod(&self, p: u64, order: &[u32]) -> Result<Vec<Vec<Q>>> {
        let m = self.unknowns.len();
        let mut ech = Elim::new(p, self);
        for chunk in order.chunks(batch_size(m)) {
            ech.add_rows(self, chunk);
            if ech.rank() == m {
                return Ok(Vec::new());
            }
        }
        let free = ech.free();
        let pivots = ech.pivots();
        let img = ech.image(&free);
        let nf = free.len();
        let basis: Vec<Vec<Q>> = free
            .iter()
            .enumerate()
            .map(|(k, &f)| {
                let mut v = vec![Q::zero(); m];
                v[f] = Q::one();
                for (r, &pc) in pivots.iter().enumerate() {
                    let e = img[r * nf + k];
                    if e != 0 {
                        v[pc] = Q::from_integer(BigInt::from(p - e));
                    }
                }
                v
            })
            .collect();
        if !self.check(&basis) {
            return Err(Error::Invalid(
                "internal error: modular basis failed its check".into(),
            ));
        }
        Ok(basis)
    }

    fn solve_q(&self, params: &SolveParams, order: &[u32]) -> Result<Vec<Vec<Q>>> {
        let m = self.unknowns.len();
        let primes = &cached_primes()[..params.max_primes.clamp(2, 64)];
        let mut ech = Elim::new(primes[0], self);
        let mut used = 0;
        for chunk in order.chunks(batch_size(m)) {
            ech.add_rows(self, chunk);
            used += chunk.len();
            if ech.rank() == m {
                return Ok(Vec::new());
            }
            // early exit: try a one-prime lift when it is cheap
            let nullity = m - ech.rank();
            if used < order.len() && nullity * ech.rank() <= 1 << 16 {
                let free = ech.free();
                let img: Vec<BigInt> = ech.image(&free).into_iter().map(BigInt::from).collect();
                if let Some(b) = reconstruct(&img, &BigInt::from(ech.p()), &ech.pivots(), &free, m)
                    && self.check(&b)
                {
                    return Ok(b);
                }
            }
        }
        // all equations used: multi-modular lift
        let mut best = ech;
        let mut best_pivots = best.pivots();
        let mut free = best.free();
        let mut residues: Vec<BigInt> = best.image(&free).into_iter().map(BigInt::from).collect();
        let mut modulus = BigInt::from(best.p());
        for (t, &p) in primes.iter().enumerate() {
            if t > 0 {
                let mut e = Elim::new(p, self);
                for chunk in order.chunks(batch_size(m)) {
                    e.add_rows(self, chunk);
                }
                let e_pivots = e.pivots();
                if e.rank() > best.rank() || (e.rank() == best.rank() && e_pivots < best_pivots) {
                    // the earlier primes were unlucky: restart from this one
                    best = e;
                    best_pivots = e_pivots;
                    free = best.free();
                    residues = best.image(&free).into_iter().map(BigInt::from).collect();
                    modulus = BigInt::from(p);
                    if best.rank() == m {
                        return Ok(Vec::new());
                    }
                } else if e_pivots != best_pivots {
                    continue;
                } else {
                    crt_combine(&mut residues, &modulus, &e.image(&free), p);
                    modulus *= p;
                }
            }
            if let Some(b) = reconstruct(&residues, &modulus, &best_pivots, &free, m)
                && self.check(&b)
            {
                return Ok(b);
            }
        }
        // exact fallback
        let mut mat = Matrix::filled(self.rows.len(), m, Q::zero());
        for (t, &r) in self.rows.iter().enumerate() {
            let (cols, vals) = self.sys.row(r as usize);
            for (&c, &v) in cols.iter().zip(vals) {
                mat[(t, self.local[c as usize] as usize)] = Q::from_integer(v.into());
            }
        }
        Ok(nullspace_q(&mat))
    }

    /// Exact check of candidate vectors (local coordinates) against every equation of the
    /// block: over Q with integer arithmetic, over GF(p) modulo p.
    fn check(&self, basis: &[Vec<Q>]) -> bool {
        basis.iter().all(|v| {
            // scale to integers
            let l = v.iter().fold(BigInt::one(), |acc, x| acc.lcm(x.denom()));
            let ints: Vec<BigInt> = v.iter().map(|x| x.numer() * (&l / x.denom())).collect();
            let small: Option<Vec<i64>> = ints.iter().map(|x| x.to_i64()).collect();
            let modulus = self.sys.modulus;
            self.rows.iter().all(|&r| {
                let (cols, vals) = self.sys.row(r as usize);
                if let Some(p) = modulus {
                    let p = p as i128;
                    let mut acc: i128 = 0;
                    for (&c, &a) in cols.iter().zip(vals) {
                        let x = &ints[self.local[c as usize] as usize];
                        let x = x.mod_floor(&BigInt::from(p)).to_i128().expect("< p");
                        acc = (acc + (a as i128 % p) * x % p) % p;
                    }
                    return acc == 0;
                }
                if let Some(s) = &small {
                    let mut acc: i128 = 0;
                    let mut ok = true;
                    for (&c, &a) in cols.iter().zip(vals) {
                        let x = s[self.local[c as usize] as usize] as i128;
                        match acc.checked_add(a as i128 * x) {
                            Some(y) => acc = y,
                            None => {
                                ok = false;
                                break;
                            }
                        }
                    }
                    if ok {
                        return acc == 0;
                    }
                }
                let mut acc = BigInt::zero();
                for (&c, &a) in cols.iter().zip(vals) {
                    acc += &ints[self.local[c as usize] as usize] * a;
                }
                acc.is_zero()
            })
        })
    }
}

/// The first 64 kernel primes, computed once.
fn cached_primes() -> &'static [u64] {
    static PRIMES: std::sync::OnceLock<Vec<u64>> = std::sync::OnceLock::new();
    PRIMES.get_or_init(|| kernel_primes(64))
}

fn batch_size(m: usize) -> usize {
    (m + 16).max(64)
}

fn unit(m: usize, i: usize) -> Vec<Q> {
    let mut v = vec![Q::zero(); m];
    v[i] = Q::one();
    v
}

fn inv_mod(a: u64, p: u64) -> u64 {
    let f = PrimeField::new(p).expect("prime");
    f.inv(&(a % p)).expect("invertible")
}

/// x = a (mod m), x = b (mod p) -> x mod m p, entrywise.
fn crt_combine(res: &mut [BigInt], m: &BigInt, img: &[u64], p: u64) {
    let m_mod_p = (m % p).to_u64().expect("small");
    let minv = inv_mod(m_mod_p, p) as u128;
    for (a, &b) in res.iter_mut().zip(img) {
        let a_mod_p = (&*a % p).to_u64().expect("small");
        let t = ((b + p - a_mod_p) % p) as u128 * minv % p as u128;
        *a += m * BigInt::from(t as u64);
    }
}

/// The candidate basis from residues of `E[r][f]` (reduced echelon form mod `modulus`).
fn reconstruct(
    res: &[BigInt],
    modulus: &BigInt,
    pivots: &[usize],
    free: &[usize],
    m: usize,
) -> Option<Vec<Vec<Q>>> {
    let nf = free.len();
    let mut basis: Vec<Vec<Q>> = free.iter().map(|&f| unit(m, f)).collect();
    for (r, &pc) in pivots.iter().enumerate() {
        for (k, v) in basis.iter_mut().enumerate() {
            let x = &res[r * nf + k];
            if !x.is_zero() {
                v[pc] = -rational_reconstruct(x, modulus)?;
            }
        }
    }
    Some(basis)
}

#[cfg(test)]
mod tests {
    use super::super::system::BlockBuf;
    use super::*;

    #[test]
    fn small_system_over_q_and_mod_p() {
        // x0 + 2 x1 - x2 = 0 ; 3 x3 = 0 ; x4 free
        for modulus in [None, Some(7)] {
            let mut s = SparseSystem::new(5, modulus);
            let mut b = BlockBuf::default();
            b.add(0, 0, 1);
            b.add(0, 1, 2);
            b.add(0, 2, -1);
            b.add(1, 3, 3);
            s.push_block(&mut b).unwrap();
            let sp = solve_nullspace(&s, &SolveParams::default()).unwrap();
            assert_eq!(sp.dim(), 3);
        }
    }

    #[test]
    fn lifts_fractions() {
        // 3 x0 - 7 x1 = 0 repeated in many forms: solution x = (7/3, 1) direction
        let mut s = SparseSystem::new(2, None);
        let mut b = BlockBuf::default();
        for t in 1..200 {
            b.add(t, 0, 3 * t as i128);
            b.add(t, 1, -7 * t as i128);
        }
        s.push_block(&mut b).unwrap();
        let sp = solve_nullspace(&s, &SolveParams::default()).unwrap();
        assert_eq!(sp.dim(), 1);
        let v = &sp.basis[0];
        assert_eq!(
            &v[0] * Q::from_integer(3.into()),
            &v[1] * Q::from_integer(7.into())
        );
    }
}
