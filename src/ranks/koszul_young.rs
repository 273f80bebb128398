//! Koszul-Young flattenings (Landsberg and Ottaviani 2015, "New lower bounds for the
//! border rank of matrix multiplication", Theory of Computing 11).
//!
//! Theorem. For T in A (x) B (x) C, a subspace image A' of A (T restricted along a linear
//! map A -> A', dim A' = a') and 0 < p < a' - 1, the Koszul-Young flattening
//!
//! ```text
//! T^p: Lambda^p A' (x) B* -> Lambda^(p+1) A' (x) C,   alpha (x) beta -> sum t'_ijk beta(b_j) (a_i ^ alpha) (x) c_k
//! ```
//!
//! is linear in T, and for a rank-one tensor it has rank binom(a' - 1, p) (the rank of
//! `alpha -> a ^ alpha`). Rank is subadditive and lower semicontinuous, and restriction
//! does not raise the border rank, so
//!
//! ```text
//! border rank(T) >= rank(T^p) / binom(a' - 1, p)
//! ```
//!
//! over every field (the argument is linear algebra only). For `<n,n,n>` with a' = 2n - 1
//! and p = n - 1 the map is injective for a generic A', which gives 2n^2 - n (15 for
//! n = 3).
//!
//! Computation. Rows are indexed by `(gamma, k)`, gamma a (p+1)-subset of `0..a'` in
//! lexicographic order, columns by `(alpha, j)`; the entry is `sign t'[i][j][k]` when
//! `gamma = alpha + {i}`, sign = (-1)^(number of elements of alpha below i), else 0. The
//! matrix is posed as a [`RowSource`] on the integer-scaled constants (a seeded integer
//! projection `A -> A'` when a' < dim A, entries below 2^20 in absolute value) and its
//! rank taken modulo a 28-bit prime (a lower bound for the rank over Q), with a nonzero
//! minor as the certificate ([`super::minor`]), re-checked from the definition above.
//! Over GF(q) everything runs in GF(q).

use super::bound::{Bound, BoundsParams, Measure, Method, Status};
use super::minor::{Minor, check_minor, find_minor};
use crate::linalg::kernels::KERNEL_PRIME_BITS;
use crate::linalg::nullspace::cached_primes;
use crate::linalg::system::{RowBuf, RowSource};
use crate::scalar::{FieldSpec, common_denominator};
use crate::tensor::{AXES, IntegralTensor, Tensor};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::ToPrimitive;
use rand::{Rng, SeedableRng};
use std::collections::HashMap;
use std::sync::{Arc, Mutex};

/// The theorem, for reports.
pub const THEOREM: &str = "border rank (hence rank) >= rank(T^p) / binom(a'-1, p) for the \
     Koszul-Young flattening T^p: Lambda^p A' (x) B* -> Lambda^(p+1) A' (x) C of T restricted \
     to A' (Landsberg and Ottaviani 2015, New lower bounds for the border rank of matrix \
     multiplication, Theory of Computing 11)";

/// Projection entries lie in `-PROJECTION..=PROJECTION`.
const PROJECTION: i64 = 1 << 20;

/// The p-subsets of `0..n` as bit masks, in lexicographic order of their sorted elements.
pub fn subsets(n: usize, p: usize) -> Vec<u32> {
    fn rec(start: usize, n: usize, left: usize, mask: u32, out: &mut Vec<u32>) {
        if left == 0 {
            out.push(mask);
            return;
        }
        for i in start..n {
            if n - i < left {
                break;
            }
            rec(i + 1, n, left - 1, mask | 1 << i, out);
        }
    }
    let mut out = Vec::new();
    if p <= n {
        rec(0, n, p, 0, &mut out);
    }
    out
}

/// `binom(n, k)`.
pub fn binom(n: usize, k: usize) -> usize {
    if k > n {
        return 0;
    }
    (0..k).fold(1usize, |acc, i| acc * (n - i) / (i + 1))
}

/// `(-1)^(number of elements of mask below i)`: the sign of `e_i ^ e_mask`.
fn sign(mask: u32, i: usize) -> bool {
    (mask & ((1u32 << i) - 1)).count_ones() % 2 == 1
}

/// The choice of a Koszul-Young flattening.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Choice {
    /// The axes playing A, B, C.
    pub roles: [usize; 3],
    /// dim A'.
    pub sub: usize,
    /// The exterior power p.
    pub p: usize,
    /// The projection A -> A' (`sub` rows of `dim A` integers); `None`: A' = A.
    pub projection: Option<Vec<Vec<i64>>>,
}

impl Choice {
    /// (rows, columns) of the flattening matrix.
    pub fn shape(&self, dims: [usize; 3]) -> [usize; 2] {
        [
            binom(self.sub, self.p + 1) * dims[self.roles[2]],
            binom(self.sub, self.p) * dims[self.roles[1]],
        ]
    }

    /// The divisor binom(a' - 1, p).
    pub fn divisor(&self) -> usize {
        binom(self.sub - 1, self.p)
    }

    /// The JSON form (roles by axis names).
    pub fn to_json(&self) -> serde_json::Value {
        serde_json::json!({
            "roles": self.roles.map(|a| AXES[a]),
            "subspace": self.sub,
            "p": self.p,
            "projection": self.projection,
        })
    }
}

/// The Koszul-Young flattening of an integer-scaled tensor as a linear system: unknowns
/// its columns (or its rows when `transposed`), one equation per row (column).
pub struct Flattening<'a> {
    pub it: &'a IntegralTensor,
    pub choice: &'a Choice,
    pub transposed: bool,
    lower: Vec<u32>,
    upper: Vec<u32>,
    lower_index: HashMap<u32, usize>,
    upper_index: HashMap<u32, usize>,
    projected: Mutex<HashMap<u64, Arc<Vec<u32>>>>,
}

impl<'a> Flattening<'a> {
    pub fn new(it: &'a IntegralTensor, choice: &'a Choice, transposed: bool) -> Self {
        let lower = subsets(choice.sub, choice.p);
        let upper = subsets(choice.sub, choice.p + 1);
        let index = |v: &[u32]| v.iter().enumerate().map(|(i, &m)| (m, i)).collect();
        Flattening {
            it,
            choice,
            transposed,
            lower_index: index(&lower),
            upper_index: index(&upper),
            lower,
            upper,
            projected: Mutex::new(HashMap::new()),
        }
    }

    fn dims(&self) -> [usize; 3] {
        self.choice.roles.map(|a| self.it.dims[a])
    }

    /// `t'[i][j][k]` modulo p (roles A', B, C), dense.
    fn projected(&self, p: u64) -> Arc<Vec<u32>> {
        if let Some(v) = self.projected.lock().expect("not poisoned").get(&p) {
            return v.clone();
        }
        let [da, db, dc] = self.dims();
        let s = self.choice.sub;
        let roles = self.choice.roles;
        let mut t = vec![0u64; da * db * dc];
        let pb = BigInt::from(p);
        for i0 in 0..self.it.dims[0] {
            for i1 in 0..self.it.dims[1] {
                for (k2, c) in self.it.product(i0, i1) {
                    let idx = [i0, i1, *k2 as usize];
                    let r = c.mod_floor(&pb).to_u64().expect("reduced");
                    let (a, b, cc) = (idx[roles[0]], idx[roles[1]], idx[roles[2]]);
                    t[(a * db + b) * dc + cc] = r;
                }
            }
        }
        let out: Vec<u32> = match &self.choice.projection {
            None => t.iter().map(|&x| x as u32).collect(),
            Some(pr) => {
                let mut out = vec![0u64; s * db * dc];
                for (i, row) in pr.iter().enumerate() {
                    for (a, &c) in row.iter().enumerate() {
                        let c = c.rem_euclid(p as i64) as u64;
                        if c == 0 {
                            continue;
                        }
                        for x in 0..db * dc {
                            let v = t[a * db * dc + x];
                            if v != 0 {
                                let o = &mut out[i * db * dc + x];
                                *o = (*o + c * v) % p;
                            }
                        }
                    }
                }
                out.iter().map(|&x| x as u32).collect()
            }
        };
        let out = Arc::new(out);
        self.projected
            .lock()
            .expect("not poisoned")
            .insert(p, out.clone());
        out
    }
}

impl RowSource for Flattening<'_> {
    fn unknowns(&self) -> usize {
        let [r, c] = self.choice.shape(self.it.dims);
        if self.transposed { r } else { c }
    }
    fn blocks(&self) -> usize {
        let [r, c] = self.choice.shape(self.it.dims);
        if self.transposed { c } else { r }
    }
    fn modulus(&self) -> Option<u64> {
        self.it.modulus()
    }
    fn block(&self, blk: usize, p: u64, out: &mut RowBuf) {
        let [_, db, dc] = self.dims();
        let t = self.projected(p);
        let at = |i: usize, j: usize, k: usize| t[(i * db + j) * dc + k] as u64;
        let s = self.choice.sub;
        if !self.transposed {
            // row (gamma, k): columns (gamma - {i}, j)
            let (g, k) = (self.upper[blk / dc], blk % dc);
            for i in (0..s).filter(|&i| g >> i & 1 == 1) {
                let alpha = g & !(1 << i);
                let base = self.lower_index[&alpha] * db;
                let neg = sign(alpha, i);
                for j in 0..db {
                    let v = at(i, j, k);
                    if v != 0 {
                        if neg {
                            out.sub(0, base + j, v);
                        } else {
                            out.add(0, base + j, v);
                        }
                    }
                }
            }
        } else {
            // column (alpha, j): rows (alpha + {i}, k)
            let (a, j) = (self.lower[blk / db], blk % db);
            for i in (0..s).filter(|&i| a >> i & 1 == 0) {
                let base = self.upper_index[&(a | 1 << i)] * dc;
                let neg = sign(a, i);
                for k in 0..dc {
                    let v = at(i, j, k);
                    if v != 0 {
                        if neg {
                            out.sub(0, base + k, v);
                        } else {
                            out.add(0, base + k, v);
                        }
                    }
                }
            }
        }
        out.end_block(1);
    }
    fn term_bits(&self) -> u64 {
        let da = self.it.dims[self.choice.roles[0]] as u64;
        let proj = if self.choice.projection.is_some() {
            21 + 64 - da.leading_zeros() as u64
        } else {
            0
        };
        proj + self.it.constant_bits()
    }
    fn estimated_terms(&self) -> usize {
        let [r, c] = self.choice.shape(self.it.dims);
        r * c
    }
    fn prefers_streaming(&self) -> bool {
        true
    }
}

/// One computed Koszul-Young bound.
#[derive(Clone, Debug)]
pub struct Outcome {
    pub choice: Choice,
    /// Rank of the flattening modulo the prime (a proven lower bound for its rank).
    pub rank: usize,
    /// `ceil(rank / binom(a'-1, p))`.
    pub value: usize,
    pub minor: Minor,
}

/// Compute one Koszul-Young flattening's rank and certificate. Cost: two eliminations of a
/// matrix of the choice's shape modulo a prime.
pub fn evaluate(it: &IntegralTensor, choice: &Choice) -> Outcome {
    let p = it.modulus().unwrap_or(cached_primes()[0]);
    let by_rows = Flattening::new(it, choice, false);
    let by_cols = Flattening::new(it, choice, true);
    let minor = find_minor(&by_rows, &by_cols, p);
    let rank = minor.size();
    Outcome {
        choice: choice.clone(),
        rank,
        value: rank.div_ceil(choice.divisor()),
        minor,
    }
}

/// The candidate flattenings of a shape, best possible value first, each with the size of
/// its smaller side at most `max_size`.
fn candidates(dims: [usize; 3], max_size: usize) -> Vec<(usize, usize, Choice)> {
    let mut out = Vec::new();
    for a in 0..3 {
        let (b, c) = crate::tensor::others(a);
        for sub in 3..=dims[a].min(16) {
            for p in 1..sub - 1 {
                let choice = Choice {
                    roles: [a, b, c],
                    sub,
                    p,
                    projection: None,
                };
                let [r, cl] = choice.shape(dims);
                let size = r.min(cl);
                if size > max_size {
                    continue;
                }
                out.push((size.div_ceil(choice.divisor()), size, choice));
            }
        }
    }
    out.sort_by(|x, y| y.0.cmp(&x.0).then(x.1.cmp(&y.1)));
    out
}

/// The best Koszul-Young bound above the flattening bound, or `None` when no flattening
/// within the size limit beats it. Cost: the cube of the size of each flattening computed
/// (at most a few), in word operations.
pub fn bound(t: &Tensor, params: &BoundsParams) -> Result<Option<Bound>, String> {
    if matches!(t.field(), FieldSpec::Prime(q) if q >= 1 << KERNEL_PRIME_BITS) {
        return Err(format!(
            "over {} it needs a prime below 2^28",
            t.field().name()
        ));
    }
    let it = IntegralTensor::from_tensor(t);
    let dims = t.dims();
    let mut best_value = crate::tensor::flattening_ranks(t)
        .into_iter()
        .max()
        .unwrap_or(0);
    let mut best: Option<Outcome> = None;
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed ^ 0x4b59);
    let q = it.modulus();
    let mut work = 0f64;
    let budget = 4.0 * (params.max_koszul_young_size as f64).powi(3);
    for (potential, size, mut choice) in candidates(dims, params.max_koszul_young_size) {
        if potential <= best_value {
            break;
        }
        work += (size as f64).powi(3);
        if work > budget && best.is_some() {
            break;
        }
        let da = dims[choice.roles[0]];
        if choice.sub < da {
            choice.projection = Some(
                (0..choice.sub)
                    .map(|_| {
                        (0..da)
                            .map(|_| match q {
                                Some(q) => rng.gen_range(0..q as i64),
                                None => rng.gen_range(-PROJECTION..=PROJECTION),
                            })
                            .collect()
                    })
                    .collect(),
            );
        }
        let out = evaluate(&it, &choice);
        if out.value > best_value {
            best_value = out.value;
            best = Some(out);
        }
    }
    let Some(out) = best else {
        return Ok(None);
    };
    let status = match check_certificate(t, &out.choice, &out.minor) {
        Ok(()) => Status::Proven,
        Err(_) => Status::Evidence,
    };
    let c = &out.choice;
    let [rows, cols] = c.shape(dims);
    let sub = match &c.projection {
        None => format!("A' = A (the {} space)", AXES[c.roles[0]]),
        Some(_) => format!(
            "A' = the image of the {} space under a seeded integer {} x {} projection",
            AXES[c.roles[0]], c.sub, dims[c.roles[0]]
        ),
    };
    let mut b = Bound::proven(
        Method::KoszulYoung,
        out.value,
        Measure::BorderRank,
        t.field(),
        true,
        format!(
            "p = {}, {sub}, B = {}, C = {}: the {rows} x {cols} flattening has rank >= {} \
             (a nonzero {}-minor modulo {}, re-checked), and ceil({} / binom({}, {})) = {}",
            c.p,
            AXES[c.roles[1]],
            AXES[c.roles[2]],
            out.rank,
            out.rank,
            out.minor.prime,
            out.rank,
            c.sub - 1,
            c.p,
            out.value
        ),
    );
    b.status = status;
    let mut cert = c.to_json();
    cert["minor"] = out.minor.to_json();
    cert["rank"] = out.rank.into();
    b.certificate = Some(cert);
    Ok(Some(b))
}

/// Re-check a Koszul-Young certificate from the definition (not through [`Flattening`]):
/// every entry of the minor is recomputed from the tensor's exact constants, scaled by
/// the common denominator D (which does not change ranks) and reduced modulo the prime.
/// Cost: r^2 entries of O(dim A) terms and one r x r elimination modulo the prime.
pub fn check_certificate(t: &Tensor, choice: &Choice, minor: &Minor) -> Result<(), String> {
    let dims = t.dims();
    let roles = choice.roles;
    let mut sorted = roles;
    sorted.sort_unstable();
    if sorted != [0, 1, 2] || choice.p == 0 || choice.p + 1 >= choice.sub {
        return Err("the roles or the exterior power are not valid".into());
    }
    let da = dims[roles[0]];
    match &choice.projection {
        None if choice.sub != da => return Err("A' = A needs a' = dim A".into()),
        Some(pr) if pr.len() != choice.sub || pr.iter().any(|r| r.len() != da) => {
            return Err("the projection does not have the shape a' x dim A".into());
        }
        _ => {}
    }
    if let FieldSpec::Prime(q) = t.field()
        && minor.prime != q
    {
        return Err(format!("over GF({q}) the minor must be taken modulo {q}"));
    }
    let scale = common_denominator(t.entries().map(|(_, _, _, v)| v));
    let pb = BigInt::from(minor.prime);
    let p = minor.prime;
    let lower = subsets(choice.sub, choice.p);
    let upper = subsets(choice.sub, choice.p + 1);
    let (db, dc) = (dims[roles[1]], dims[roles[2]]);
    // t'[i][j][k] = sum_a w[i][a] t[a][j][k] modulo the prime (w the projection, or the
    // identity), from the exact constants scaled to integers: one pass over the entries
    let mut projected = vec![0u64; choice.sub * db * dc];
    for (i0, i1, i2, v) in t.entries() {
        let idx = [i0, i1, i2];
        let (a, j, k) = (idx[roles[0]], idx[roles[1]], idx[roles[2]]);
        let value = (v.numer() * (&scale / v.denom()))
            .mod_floor(&pb)
            .to_u64()
            .expect("reduced");
        let mut add = |i: usize, w: u64| {
            let cell = &mut projected[(i * db + j) * dc + k];
            *cell = ((*cell as u128 + w as u128 * value as u128) % p as u128) as u64;
        };
        match &choice.projection {
            None => add(a, 1),
            Some(pr) => {
                for (i, row) in pr.iter().enumerate().take(choice.sub) {
                    add(i, row[a].rem_euclid(p as i64) as u64);
                }
            }
        }
    }
    let coef = |i: usize, j: usize, k: usize| projected[(i * db + j) * dc + k];
    check_minor(minor, choice.shape(dims), |row, col| {
        let (g, k) = (upper[row / dc], row % dc);
        let (a, j) = (lower[col / db], col % db);
        if a & !g != 0 || (g & !a).count_ones() != 1 {
            return 0;
        }
        let i = (g & !a).trailing_zeros() as usize;
        let v = coef(i, j, k);
        if sign(a, i) { (p - v) % p } else { v }
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::matmul;

    #[test]
    fn matmul_reaches_two_n_squared_minus_n() {
        // Landsberg and Ottaviani 2015: border rank <n,n,n> >= 2n^2 - n, reached by the
        // Koszul-Young flattening with a' = 2n - 1, p = n - 1 (6 for n = 2, 15 for n = 3)
        let p = BoundsParams::default();
        let b = bound(&matmul(2, 2, 2), &p).unwrap().unwrap();
        assert_eq!((b.value, b.status), (6, Status::Proven), "{}", b.detail);
        let b = bound(&matmul(3, 3, 3), &p).unwrap().unwrap();
        assert_eq!((b.value, b.status), (15, Status::Proven), "{}", b.detail);
        assert_eq!(b.measure, Measure::BorderRank);
    }

    #[test]
    fn subsets_and_signs() {
        assert_eq!(
            subsets(4, 2),
            vec![0b11, 0b101, 0b1001, 0b110, 0b1010, 0b1100]
        );
        assert_eq!(binom(8, 3), 56);
        assert!(!sign(0b1010, 0) && sign(0b1010, 2) && !sign(0b1010, 4));
    }
}
