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
use super::system::{RowBuf, RowSource, materialize};
use crate::error::{Error, Result};
use crate::scalar::{Q, common_denominator};
use num_bigint::BigInt;
use num_traits::Zero;
use rayon::prelude::*;

use super::components::{Component, Solver, batch_size, components};
pub use super::exact_check::check_solutions;
pub use super::primes::{MAX_KERNEL_PRIMES, cached_primes, hadamard_bits, primes_prefix};

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
    /// The whole space of `unknowns` coordinates, with its standard basis.
    pub fn whole(unknowns: usize) -> Space {
        Space {
            unknowns,
            basis: (0..unknowns)
                .map(|i| vec![(i as u32, Q::from_integer(1.into()))])
                .collect(),
        }
    }

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

    /// The linear equations cutting out this space: a proven basis of `{w : w . b = 0 for
    /// every basis vector b}` (over GF(q) when `modulus` is `Some(q)`).
    fn equations(&self, modulus: Option<u64>) -> Result<Space> {
        let rows: Vec<Vec<BigInt>> = (0..self.dim())
            .map(|i| integer_row(&self.dense(i)))
            .collect();
        solve_integer_rows(self.unknowns, rows, modulus)
    }

    /// The intersection of two spaces of the same ambient space, a proven basis in reduced
    /// form: the solutions of the equations of both (over GF(q) when `modulus` is
    /// `Some(q)`). Cost: three exact nullspaces of at most n x n systems (n unknowns).
    pub fn intersection(&self, other: &Space, modulus: Option<u64>) -> Result<Space> {
        let n = self.unknowns;
        if self.dim() == n {
            return Ok(other.clone());
        }
        if other.dim() == n {
            return Ok(self.clone());
        }
        if self.dim() == 0 || other.dim() == 0 {
            return Ok(Space {
                unknowns: n,
                basis: Vec::new(),
            });
        }
        let mut rows = Vec::new();
        for s in [self, other] {
            rows.extend(
                s.equations(modulus)?
                    .dense_basis()
                    .iter()
                    .map(|w| integer_row(w)),
            );
        }
        solve_integer_rows(n, rows, modulus)
    }
}

/// A rational row as integers: scaled by the lcm of its denominators (the same equation).
pub fn integer_row(row: &[Q]) -> Vec<BigInt> {
    let l = common_denominator(row.iter());
    row.iter().map(|x| x.numer() * (&l / x.denom())).collect()
}

/// The proven nullspace of integer rows (read modulo q when `modulus` is `Some(q)`).
fn solve_integer_rows(cols: usize, rows: Vec<Vec<BigInt>>, modulus: Option<u64>) -> Result<Space> {
    let sys = match modulus {
        Some(q) => super::system::IntegerRows::modulo(cols, rows, q),
        None => super::system::IntegerRows::new(cols, rows),
    };
    let params = SolveParams {
        max_memory: usize::MAX,
        ..Default::default()
    };
    solve_nullspace(&sys, &params)
}

/// Systems with at most this many terms are written out modulo the first prime and split
/// into connected components.
const MATERIALIZE_TERMS: usize = 1 << 25;

/// Written-out copies of a system kept for reuse by its components: one per prime, for the
/// first primes only (most components need few; a long lift writes the system out anew).
const CACHED_SYSTEMS: usize = 16;

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
            others: (0..CACHED_SYSTEMS).map(|_| Default::default()).collect(),
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
    echelon_modulo(src, p).rank()
}

/// The reduced echelon form modulo p of a system's equations, fed in order and stopping
/// once the rank is full: its pivot columns are independent columns of the matrix.
/// Cost: O(rows m rank) word operations.
pub fn echelon_modulo(src: &dyn RowSource, p: u64) -> DenseEchelon {
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
    e
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

#[cfg(test)]
mod tests {
    use super::super::system::IntegerRows;
    use super::*;
    use num_bigint::BigInt;

    #[test]
    fn intersections_of_spaces() {
        // in Q^3: {x0 = x1} meets {x2 = 2 x0} in the line through (1, 1, 2); over GF(3)
        // the same equations; a space meets the whole space in itself (common practice)
        let solve = |rows: Vec<Vec<i64>>, modulus| {
            let rows = rows
                .into_iter()
                .map(|r| r.into_iter().map(BigInt::from).collect())
                .collect();
            solve_integer_rows(3, rows, modulus).unwrap()
        };
        for modulus in [None, Some(3)] {
            let a = solve(vec![vec![1, -1, 0]], modulus);
            let b = solve(vec![vec![-2, 0, 1]], modulus);
            let c = a.intersection(&b, modulus).unwrap();
            assert_eq!(c, solve(vec![vec![1, -1, 0], vec![-2, 0, 1]], modulus));
            assert_eq!(c.dim(), 1);
            assert_eq!(a.intersection(&Space::whole(3), modulus).unwrap(), a);
            let zero = solve(vec![vec![1, 0, 0], vec![0, 1, 0], vec![0, 0, 1]], modulus);
            assert_eq!(a.intersection(&zero, modulus).unwrap().dim(), 0);
        }
        let c = solve(vec![vec![1, -1, 0], vec![-2, 0, 1]], None);
        // reduced form: 1 at the free coordinate x2
        let half = Q::new(1.into(), 2.into());
        assert_eq!(c.dense(0), [half.clone(), half, Q::from_integer(1.into())]);
    }

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
