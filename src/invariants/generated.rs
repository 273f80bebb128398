//! Derivations and the centroid from their values on generators.
//!
//! A derivation D satisfies `D(ab) = D(a) b + a D(b)`, an element X of the centroid
//! `X(ab) = X(a) b`; so both are fixed by their values on a set of generators
//! `g_1 .. g_s` of the algebra: with *words* `w_1 .. w_n` (each a generator or a product of
//! two earlier words) forming a basis, `D(w_c) = M_c u` for the unknown
//! `u = (D(g_1), .., D(g_s))` and matrices `M_c` built by the rule itself
//! (`M_{ab} = R_b M_a + L_a M_b` for D, `M_{ab} = R_b M_a` for X). The map is a
//! derivation (centroid element) iff the rule holds on every pair of words:
//! `sum_c gamma_c M_c - R_{w_b} M_a - L_{w_a} M_b = 0` with `w_a w_b = sum_c gamma_c w_c`
//! (and `... - R_{w_b} M_a = 0 = ... - L_{w_a} M_b` for X): n equations in `s n` unknowns
//! per pair, instead of n^2 unknowns for the plain system.
//!
//! Soundness. Everything is computed modulo word primes on the integer-scaled constants;
//! generators have small integer coordinates and words are products, so a word is an
//! integer vector the same for every prime. Every equation of a pair is a consequence of
//! the definition, so over any subset of pairs the solution space modulo p has dimension
//! at least that over Q (rank mod p <= rank over Q). The candidate basis read off it is
//! lifted to Q (canonical reduced form, Chinese remaindering, rational reconstruction) and
//! **checked exactly against every equation of the plain system** (the engine's check);
//! a checked basis of that size is the whole space. Pairs are fed in a seeded random order
//! and the elimination stops once the rank has not grown for a while; if the lifted
//! candidates fail the check, more pairs are fed. The plain system remains the answer
//! when the generators do not pay (many generators) or when a prime is unlucky for the
//! words.
//!
//! Cost for s generators, dense dimension n: the words n (2 + 2s) n^3, each pair 3 s n^3,
//! usually a few pairs; then the check, one pass over the plain system per prime.

use super::equations::{Eq, System};
use crate::error::Result;
use crate::linalg::dense_echelon::DenseEchelon;
use crate::linalg::kernels::{LazyAcc, Modulus};
use crate::linalg::modular::rref_mod;
use crate::linalg::nullspace::{
    SolveParams, Space, SparseQ, check_solutions, hadamard_bits, primes_prefix,
};
use crate::scalar::{Q, Reconstructor, crt_combine, residue};
use crate::tensor::{IntegralTensor, ModTable};
use num_bigint::BigInt;
use num_traits::{One, Zero};
use rand::seq::SliceRandom;
use rand::{Rng, SeedableRng};

/// Which maps.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    Derivations,
    Centroid,
}

/// A word: a generator (small integer coordinates) or the product of two earlier words.
#[derive(Clone, Debug)]
enum Word {
    Gen(usize),
    Mul(usize, usize),
}

/// Generators and words spanning the algebra.
#[derive(Clone, Debug)]
struct Words {
    gens: Vec<Vec<i64>>,
    words: Vec<Word>,
}

/// Residue vector of `x y` modulo the table's prime (dense vectors).
fn product(t: &ModTable, m: &Modulus, x: &[u32], y: &[u32]) -> Vec<u32> {
    let n = t.dims[2];
    let mut acc = LazyAcc::new(n, t.p);
    let ys: Vec<(usize, u32)> = y
        .iter()
        .copied()
        .enumerate()
        .filter(|(_, v)| *v != 0)
        .collect();
    for (a, &xa) in x.iter().enumerate() {
        if xa == 0 {
            continue;
        }
        for &(b, yb) in &ys {
            let s = m.mul(xa, yb);
            let (ks, vs) = t.row(a, b);
            acc.room(1);
            for (&k, &v) in ks.iter().zip(vs) {
                acc.add_at(k as usize, s, v);
            }
        }
    }
    acc.finish().iter().map(|&v| v as u32).collect()
}

/// The vectors of the words modulo the table's prime.
fn eval_words(t: &ModTable, w: &Words) -> Vec<Vec<u32>> {
    let m = Modulus::new(t.p);
    let mut out: Vec<Vec<u32>> = Vec::with_capacity(w.words.len());
    for word in &w.words {
        let v = match word {
            Word::Gen(g) => w.gens[*g]
                .iter()
                .map(|&c| c.rem_euclid(t.p as i64) as u32)
                .collect(),
            Word::Mul(a, b) => product(t, &m, &out[*a], &out[*b]),
        };
        out.push(v);
    }
    out
}

/// Rank modulo p of some vectors.
fn rank_of(vs: &[Vec<u32>], n: usize, p: u64) -> usize {
    let mut data: Vec<u64> = vs.iter().flatten().map(|&x| x as u64).collect();
    rref_mod(&mut data, vs.len(), n, p, false).len()
}

/// Choose generators and words modulo `p` (see the module documentation): generators are
/// seeded random elements with coordinates in -3..3 while the words do not span, then
/// products of the words so far, greedily keeping those that raise the rank.
/// `None` when more than `max_gens` generators would be needed.
fn choose_words(t: &ModTable, seed: u64, max_gens: usize) -> Option<Words> {
    let n = t.dims[0];
    let p = t.p;
    let md = Modulus::new(p);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let mut w = Words {
        gens: Vec::new(),
        words: Vec::new(),
    };
    let mut vecs: Vec<Vec<u32>> = Vec::new();
    // an incremental echelon form of the words so far: a vector raises the rank iff it
    // is independent of them
    let mut ech = DenseEchelon::new(p, n);
    let raises = |ech: &mut DenseEchelon, v: &[u32]| {
        let before = ech.rank();
        let mut row = v.to_vec();
        ech.add_rows(&mut row);
        ech.rank() > before
    };
    while vecs.len() < n {
        if w.gens.len() >= max_gens {
            return None;
        }
        // a new generator outside the span so far
        let g: Vec<i64> = (0..n).map(|_| rng.gen_range(-3..=3)).collect();
        let gv: Vec<u32> = g.iter().map(|&c| c.rem_euclid(p as i64) as u32).collect();
        if !raises(&mut ech, &gv) {
            continue;
        }
        w.gens.push(g);
        w.words.push(Word::Gen(w.gens.len() - 1));
        vecs.push(gv);
        // close under products, breadth first
        let mut next = 0;
        while next < vecs.len() && vecs.len() < n {
            let a = next;
            next += 1;
            for b in 0..=a {
                for (x, y) in [(a, b), (b, a)] {
                    if vecs.len() == n {
                        break;
                    }
                    let v = product(t, &md, &vecs[x], &vecs[y]);
                    if raises(&mut ech, &v) {
                        vecs.push(v);
                        w.words.push(Word::Mul(x, y));
                    }
                }
            }
        }
    }
    Some(w)
}

/// `L_x` (left = true: `y -> x y`) or `R_x` (`y -> y x`) as an n x n row-major matrix
/// acting on column vectors: entry `[k][i]` = coefficient of `e_k` in `x e_i` (or `e_i x`).
fn mult_matrix(t: &ModTable, x: &[u32], left: bool) -> Vec<u32> {
    let n = t.dims[0];
    let p = t.p;
    let mut acc = vec![0u64; n * n];
    let md = Modulus::new(p);
    for (m, &xm) in x.iter().enumerate() {
        if xm == 0 {
            continue;
        }
        for i in 0..n {
            let (ks, vs) = if left { t.row(m, i) } else { t.row(i, m) };
            for (&k, &v) in ks.iter().zip(vs) {
                let cell = &mut acc[k as usize * n + i];
                *cell = md.reduce(*cell + xm as u64 * v as u64);
            }
        }
    }
    acc.into_iter().map(|v| v as u32).collect()
}

/// `A B` for row-major `A` (r x k) and `B` (k x c) modulo p.
fn mat_mul(a: &[u32], b: &[u32], r: usize, k: usize, c: usize, p: u64) -> Vec<u32> {
    let mut out = Vec::with_capacity(r * c);
    let mut acc = LazyAcc::new(c, p);
    for i in 0..r {
        acc.clear();
        acc.vec_mat(&a[i * k..(i + 1) * k], b);
        out.extend(acc.finish().iter().map(|&v| v as u32));
    }
    out
}

/// The inverse of a row-major n x n matrix modulo p (`None` if singular).
fn inverse(a: &[u32], n: usize, p: u64) -> Option<Vec<u32>> {
    let mut aug = vec![0u64; n * 2 * n];
    for i in 0..n {
        for j in 0..n {
            aug[i * 2 * n + j] = a[i * n + j] as u64;
        }
        aug[i * 2 * n + n + i] = 1;
    }
    let piv = rref_mod(&mut aug, n, 2 * n, p, true);
    if piv.len() < n || piv[n - 1] != n - 1 {
        return None;
    }
    Some(
        (0..n)
            .flat_map(|i| (0..n).map(move |j| (i, j)))
            .map(|(i, j)| aug[i * 2 * n + n + j] as u32)
            .collect(),
    )
}

/// One prime's computation: the reduced echelon form (pivots, rows) of the candidate
/// space in the coordinates of the plain system (`X[l][i]` at `l n + i`), or `None` when
/// the words are dependent modulo p.
struct Candidate {
    pivots: Vec<usize>,
    /// rows x n^2 residues
    rows: Vec<u32>,
}

fn candidate_mod(
    it: &IntegralTensor,
    words: &Words,
    kind: Kind,
    p: u64,
    order: &[(usize, usize)],
    pairs_fed: usize,
    probe_seed: Option<u64>,
) -> Option<Found> {
    let residues = it.residues(p);
    let t = &*residues;
    let n = it.dims[0];
    let s = words.gens.len();
    let m = s * n;
    let wv = eval_words(t, words);
    if rank_of(&wv, n, p) < n {
        return None;
    }
    // W: rows are the words; gamma = x W^{-1}
    let wflat: Vec<u32> = wv.iter().flatten().copied().collect();
    let winv = inverse(&wflat, n, p)?;
    let lm: Vec<Vec<u32>> = wv.iter().map(|x| mult_matrix(t, x, true)).collect();
    let rm: Vec<Vec<u32>> = wv.iter().map(|x| mult_matrix(t, x, false)).collect();
    // M_c, n x m each
    let mut mc: Vec<Vec<u32>> = Vec::with_capacity(n);
    for (c, word) in words.words.iter().enumerate() {
        let mat = match word {
            Word::Gen(g) => {
                let mut z = vec![0u32; n * m];
                for k in 0..n {
                    z[k * m + g * n + k] = 1;
                }
                z
            }
            Word::Mul(a, b) => {
                let x = mat_mul(&rm[*b], &mc[*a], n, n, m, p);
                match kind {
                    Kind::Derivations => {
                        let y = mat_mul(&lm[*a], &mc[*b], n, n, m, p);
                        x.iter()
                            .zip(&y)
                            .map(|(&u, &v)| ((u as u64 + v as u64) % p) as u32)
                            .collect()
                    }
                    Kind::Centroid => x,
                }
            }
        };
        debug_assert_eq!(c, mc.len());
        mc.push(mat);
    }
    // M by rows: [k][c][..m]
    let mut mk = vec![0u32; n * n * m];
    for (c, mat) in mc.iter().enumerate() {
        for k in 0..n {
            mk[(k * n + c) * m..(k * n + c + 1) * m].copy_from_slice(&mat[k * m..(k + 1) * m]);
        }
    }
    let md = Modulus::new(p);
    let neg = |v: &[u32]| -> Vec<u32> { v.iter().map(|&x| ((p - x as u64) % p) as u32).collect() };
    let mut ech = DenseEchelon::new(p, m);
    let mut batch: Vec<u32> = Vec::new();
    let mut acc = LazyAcc::new(m, p);
    for &(a, b) in order.iter().take(pairs_fed) {
        let prod = product(t, &md, &wv[a], &wv[b]);
        let gamma = mat_mul(&prod, &winv, 1, n, n, p);
        let nr = neg(&rm[b]);
        let nl = neg(&lm[a]);
        for k in 0..n {
            // sum_c gamma_c M_c[k]
            acc.clear();
            acc.vec_mat(&gamma, &mk[k * n * m..(k + 1) * n * m]);
            let base: Vec<u64> = acc.finish().to_vec();
            let right = {
                acc.clear();
                acc.vec_mat(&nr[k * n..(k + 1) * n], &mc[a]);
                acc.finish().to_vec()
            };
            let left = {
                acc.clear();
                acc.vec_mat(&nl[k * n..(k + 1) * n], &mc[b]);
                acc.finish().to_vec()
            };
            match kind {
                Kind::Derivations => {
                    batch.extend((0..m).map(|j| ((base[j] + right[j] + left[j]) % p) as u32));
                }
                Kind::Centroid => {
                    batch.extend((0..m).map(|j| ((base[j] + right[j]) % p) as u32));
                    batch.extend((0..m).map(|j| ((base[j] + left[j]) % p) as u32));
                }
            }
        }
        if batch.len() >= 256 * m {
            ech.add_rows(&mut batch);
        }
        if ech.rank() == m {
            break;
        }
    }
    ech.add_rows(&mut batch);
    // the candidates: one per free column of the u-space
    let free = ech.free_columns();
    let pivots = ech.pivot_columns();
    let img = ech.image(&free);
    let nf = free.len();
    let mut maps: Vec<Vec<u32>> = Vec::with_capacity(nf);
    for (fi, &f) in free.iter().enumerate() {
        let mut u = vec![0u32; m];
        u[f] = 1;
        for (r, &pc) in pivots.iter().enumerate() {
            let e = img[r * nf + fi];
            u[pc] = ((p - e) % p) as u32;
        }
        // D(w_c) = M_c u, then D(e_j) = sum_c Winv[j][c] D(w_c)
        let dw: Vec<Vec<u32>> = mc.iter().map(|mat| mat_mul(mat, &u, n, m, 1, p)).collect();
        // dwt: n (c) x n (l): row c is D(w_c)
        let dwt: Vec<u32> = dw.into_iter().flatten().collect();
        let de = mat_mul(&winv, &dwt, n, n, n, p); // row j: D(e_j)
        // X[l][j] at l n + j
        let mut x = vec![0u32; n * n];
        for j in 0..n {
            for l in 0..n {
                x[l * n + j] = de[j * n + l];
            }
        }
        maps.push(x);
    }
    if let Some(seed) = probe_seed {
        let broken = violated_pairs(t, kind, &wv, &maps, seed, 2 * s + 2);
        if !broken.is_empty() {
            return Some(Found::Broken(broken));
        }
    }
    // canonical form: reduced echelon form of the candidate maps
    let k = maps.len();
    let mut data: Vec<u64> = maps.iter().flatten().map(|&x| x as u64).collect();
    let piv = rref_mod(&mut data, k, n * n, p, true);
    let r = piv.len();
    Some(Found::Candidate(Candidate {
        pivots: piv,
        rows: data[..r * n * n].iter().map(|&x| x as u32).collect(),
    }))
}

/// What one prime gives: the candidate space, or word pairs where a random combination
/// of the candidates breaks the rule (so more pairs must be fed).
enum Found {
    Candidate(Candidate),
    Broken(Vec<(usize, usize)>),
}

/// Rounds of [`violated_pairs`] before pairs are only fed in the seeded order.
const MAX_PROBE_ROUNDS: u64 = 16;

/// Largest dimension for which [`violated_pairs`] is run (its dense table has n^3 words).
const MAX_PROBE_DIM: usize = 320;

/// Word pairs `(a, b)` at which a seeded random combination `X` of the candidate maps
/// breaks the defining rule modulo p, at most `limit` of them (seeded choice), or none.
/// The defect `V(x, y)` (for a derivation `X(xy) - X(x)y - xX(y)`; for the centroid both
/// `X(xy) - X(x)y` and `X(xy) - xX(y)`) is bilinear, so it vanishes on every pair of words
/// iff it vanishes on every pair of basis elements; it is computed on basis pairs by
/// matrix products and carried to word pairs as `W V W^T` (rows of `W`: the words).
/// A random combination breaks the rule wherever some candidate does, except with
/// probability about 1/p. `maps[f][l n + j]` is the coefficient of `e_l` in `X_f(e_j)`.
/// Cost: about 5 n^4 multiply-adds modulo p (7 n^4 for the centroid), n^3 words.
fn violated_pairs(
    t: &ModTable,
    kind: Kind,
    wv: &[Vec<u32>],
    maps: &[Vec<u32>],
    seed: u64,
    limit: usize,
) -> Vec<(usize, usize)> {
    use rayon::prelude::*;
    let n = t.dims[0];
    let p = t.p;
    if maps.is_empty() || n > MAX_PROBE_DIM {
        return Vec::new();
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    // X = sum r_f X_f; xt[a][b] = X[b][a]
    let mut acc = LazyAcc::new(n * n, p);
    for m in maps {
        acc.axpy(rng.gen_range(1..p) as u32, m);
    }
    let x: Vec<u32> = acc.finish().iter().map(|&v| v as u32).collect();
    let xt: Vec<u32> = (0..n * n).map(|ab| x[(ab % n) * n + ab / n]).collect();
    // the dense table c[(i n + j) n + k], built only when the table is sparse
    let built;
    let c: &[u32] = match t.dense_table() {
        Some(c) => c,
        None => {
            let mut d = vec![0u32; n * n * n];
            for i in 0..n {
                for j in 0..n {
                    let (ks, vs) = t.row(i, j);
                    for (&k, &v) in ks.iter().zip(vs) {
                        d[(i * n + j) * n + k as usize] = v;
                    }
                }
            }
            built = d;
            &built
        }
    };
    let w: Vec<u32> = wv.iter().flatten().copied().collect();
    let width = match kind {
        Kind::Derivations => n,
        Kind::Centroid => 2 * n,
    };
    let sub = |a: &[u32], b: &[u32]| -> Vec<u32> {
        a.iter()
            .zip(b)
            .map(|(&u, &v)| ((u as u64 + p - v as u64) % p) as u32)
            .collect::<Vec<u32>>()
    };
    // u[i][(b, k)] = sum_j W[b][j] V(e_i, e_j)[k]
    let u: Vec<u32> = (0..n)
        .into_par_iter()
        .flat_map_iter(|i| {
            let ci = &c[i * n * n..(i + 1) * n * n];
            // X(e_i e_j)[k] = sum_l c[i][j][l] X[k][l]
            let t1 = mat_mul(ci, &xt, n, n, n, p);
            // (X(e_i) e_j)[k] = sum_l X[l][i] c[l][j][k]
            let mut acc = LazyAcc::new(n * n, p);
            acc.vec_mat(&xt[i * n..(i + 1) * n], c);
            let t2: Vec<u32> = acc.finish().iter().map(|&v| v as u32).collect();
            // (e_i X(e_j))[k] = sum_l X[l][j] c[i][l][k]
            let t3 = mat_mul(&xt, ci, n, n, n, p);
            let v: Vec<u32> = match kind {
                Kind::Derivations => sub(&sub(&t1, &t2), &t3),
                Kind::Centroid => {
                    let (a, b) = (sub(&t1, &t2), sub(&t1, &t3));
                    (0..n)
                        .flat_map(|j| {
                            a[j * n..(j + 1) * n]
                                .iter()
                                .chain(&b[j * n..(j + 1) * n])
                                .copied()
                        })
                        .collect()
                }
            };
            mat_mul(&w, &v, n, n, width, p)
        })
        .collect();
    // V(w_a, w_b) = sum_i W[a][i] u[i][(b, k)]
    let vw = mat_mul(&w, &u, n, n, n * width, p);
    let mut broken: Vec<(usize, usize)> = (0..n * n)
        .filter(|&ab| vw[ab * width..(ab + 1) * width].iter().any(|&v| v != 0))
        .map(|ab| (ab / n, ab % n))
        .collect();
    broken.shuffle(&mut rng);
    broken.truncate(limit);
    broken
}

/// The derivation algebra or the centroid through generators, proven by the exact check
/// against the plain system; `None` when the method does not apply (too many generators
/// for the dimension, or no lift within the primes), and the caller solves the plain
/// system.
pub fn solve_by_generators(
    it: &IntegralTensor,
    kind: Kind,
    params: &SolveParams,
) -> Result<Option<Space>> {
    let n = it.dims[0];
    if n < 4 {
        return Ok(None);
    }
    let primes: Vec<u64> = match it.modulus() {
        Some(q) if q < 1 << crate::linalg::kernels::KERNEL_PRIME_BITS => vec![q],
        Some(_) => return Ok(None),
        None => primes_prefix(params.max_primes.max(2)).to_vec(),
    };
    let max_gens = (n / 4).max(1);
    let Some(words) = choose_words(&it.residues(primes[0]), params.seed, max_gens) else {
        return Ok(None);
    };
    let mut order: Vec<(usize, usize)> = (0..n)
        .flat_map(|a| (0..n).map(move |b| (a, b)))
        .filter(|&(a, b)| {
            // pairs that define a word satisfy the derivation rule by construction
            kind == Kind::Centroid
                || !words
                    .words
                    .iter()
                    .any(|w| matches!(w, Word::Mul(x, y) if (*x, *y) == (a, b)))
        })
        .collect();
    order.shuffle(&mut rand_chacha::ChaCha8Rng::seed_from_u64(
        params.seed ^ 0xdead,
    ));
    let plain = System::new(
        it,
        &[match kind {
            Kind::Derivations => Eq::Derivations,
            Kind::Centroid => Eq::Centroid,
        }],
    );
    let s = words.gens.len();
    let mut fed = (2 * s).max(4).min(order.len());
    // rounds in which pairs where the candidates break the rule are fed first
    let mut probes = 0u64;
    loop {
        let probe_seed = (probes < MAX_PROBE_ROUNDS).then_some(params.seed ^ probes);
        match lift(it, &words, kind, &primes, &order, fed, &plain, probe_seed)? {
            Lifted::Space(space) => return Ok(Some(space)),
            Lifted::Broken(pairs) => {
                probes += 1;
                for pair in pairs {
                    if let Some(pos) = order[fed..].iter().position(|&q| q == pair) {
                        order.swap(fed, fed + pos);
                        fed += 1;
                    }
                }
                continue;
            }
            Lifted::Failed => {}
        }
        if fed == order.len() {
            return Ok(None);
        }
        fed = (fed * 4).min(order.len());
    }
}

/// What [`lift`] gives: the proven space, word pairs to feed first (the candidates of the
/// first prime break the rule there), or nothing (more pairs are needed).
enum Lifted {
    Space(Space),
    Broken(Vec<(usize, usize)>),
    Failed,
}

/// Candidates modulo successive primes, combined and reconstructed, checked exactly.
/// With `probe_seed`, the first prime's candidates are first probed for pairs where they
/// break the rule ([`violated_pairs`]).
#[allow(clippy::too_many_arguments)]
fn lift(
    it: &IntegralTensor,
    words: &Words,
    kind: Kind,
    primes: &[u64],
    order: &[(usize, usize)],
    fed: usize,
    plain: &System,
    probe_seed: Option<u64>,
) -> Result<Lifted> {
    let n = it.dims[0];
    let nn = n * n;
    let exact_field = it.modulus().is_some();
    let mut best: Option<Vec<usize>> = None;
    let mut residues: Vec<BigInt> = Vec::new();
    let mut modulus = BigInt::one();
    // a few entries reconstructed ahead of the whole candidate: (positions, values)
    let mut probe: Option<(Vec<usize>, Vec<Q>)> = None;
    let mut combined = 0usize;
    let mut next_attempt = 1usize;
    let mut previous_basis: Option<Vec<SparseQ>> = None;
    // past the Hadamard bound of the full system the candidate cannot stabilise
    let cap = hadamard_bits(nn, crate::linalg::system::RowSource::term_bits(plain), nn) + 64;
    for &p in primes {
        if modulus.bits() > cap {
            break;
        }
        let probe_pairs = if best.is_none() { probe_seed } else { None };
        let c = match candidate_mod(it, words, kind, p, order, fed, probe_pairs) {
            None => continue,
            Some(Found::Broken(pairs)) => return Ok(Lifted::Broken(pairs)),
            Some(Found::Candidate(c)) => c,
        };
        let better = match &best {
            None => true,
            Some(b) => c.pivots.len() < b.len() || (c.pivots.len() == b.len() && c.pivots > *b),
        };
        if better {
            best = Some(c.pivots.clone());
            residues = c.rows.iter().map(|&x| BigInt::from(x)).collect();
            modulus = BigInt::from(p);
            probe = None;
            combined = 1;
            next_attempt = 1;
        } else if best.as_ref() == Some(&c.pivots) {
            crt_combine(&mut residues, &modulus, &c.rows, p);
            modulus *= p;
            combined += 1;
        } else {
            continue;
        }
        let pivots = best.as_ref().expect("set");
        let rec = Reconstructor::new(&modulus);
        // A few probe entries first, the whole reconstruction only once they are stable:
        // a probe reconstructed at modulus M that also agrees modulo the next prime p is
        // the reconstruction at M p (uniqueness below sqrt(M p / 2)), checked in O(1) per
        // entry. While the probe fails, attempts follow a geometric schedule in the number
        // of primes (at most 1/8 more primes than needed), not one Euclid per prime.
        let mut probe_stable = exact_field;
        if !exact_field {
            if let Some((at, qs)) = &probe {
                probe_stable = at.iter().zip(qs).all(|(&i, q)| {
                    let d = residue(q.denom(), p);
                    d != 0
                        && (d as u128 * c.rows[i] as u128 % p as u128) as u64
                            == residue(q.numer(), p)
                });
                if !probe_stable {
                    probe = None;
                    next_attempt = combined;
                }
            }
            if probe.is_none() && combined >= next_attempt {
                next_attempt = (combined + 1).max(combined * 9 / 8);
                let at: Vec<usize> = (0..residues.len())
                    .filter(|&i| !residues[i].is_zero())
                    .take(8)
                    .collect();
                let qs: Option<Vec<Q>> =
                    at.iter().map(|&i| rec.reconstruct(&residues[i])).collect();
                probe = qs.map(|qs| (at, qs));
            }
            if !probe_stable {
                continue;
            }
        }
        let basis: Option<Vec<SparseQ>> = (0..pivots.len())
            .map(|r| {
                let row = &residues[r * nn..(r + 1) * nn];
                let cols: Vec<usize> = (0..nn).filter(|&c| !row[c].is_zero()).collect();
                let xs: Vec<BigInt> = cols.iter().map(|&c| row[c].clone()).collect();
                let qs = if exact_field {
                    xs.into_iter().map(Q::from_integer).collect()
                } else {
                    rec.reconstruct_many(&xs)?
                };
                Some(cols.iter().map(|&c| c as u32).zip(qs).collect())
            })
            .collect();
        if basis.is_none() {
            // the probe was lucky, other entries need more primes
            probe = None;
            next_attempt = (combined + 1).max(combined * 9 / 8);
        }
        if let Some(basis) = &basis {
            if check_solutions(plain, basis)? {
                return Ok(Lifted::Space(Space {
                    unknowns: nn,
                    basis: basis.clone(),
                }));
            }
            // the same reconstruction from two moduli, and still not a solution: the
            // candidate space itself is too large (too few pairs fed), not its lift
            if previous_basis.as_ref() == Some(basis) {
                return Ok(Lifted::Failed);
            }
            previous_basis = Some(basis.clone());
        }
        if exact_field {
            return Ok(Lifted::Failed);
        }
    }
    Ok(Lifted::Failed)
}
