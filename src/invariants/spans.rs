//! Dimensions of subspaces spanned by products, exactly: the span of the squares, the
//! derived series `A, A^2 = AA, (A^2)(A^2), ...` and the lower central series
//! `A, A^2, A^3 = A A^2 + A^2 A, ...`.
//!
//! Each term of a series is spanned by *words*: products of words of the previous term
//! (and of basis elements). A word's coordinates are integers for the integer-scaled
//! constants (a word with k products scales by `D^k`, which does not change spans), so
//! the word can be evaluated modulo any prime. The dimension of the span of a set of
//! words, `n - dim {x : w . x = 0 for every word w}`, is computed by the engine of
//! [`crate::linalg::nullspace`] with the words as its equations (each entry of a word with
//! k products is at most `L^k`, L the row norm); that solution space is proven, so the
//! dimension is exact. Words independent modulo a prime are independent over Q, so as many
//! of them as the proven dimension form a basis of the term, from which the next term's
//! words are made.
//!
//! The terms themselves ([`Term`]: a word basis) are also kept, for the systems built on
//! them: the span of the products of two terms ([`products_dim`], for a Lie algebra
//! `[L^i, L^j]`), the annihilator of a term in A ([`annihilator_of_term`], for a Lie
//! algebra the centraliser) and the centre of a term ([`term_centre_dim`]). Their rows are
//! word products evaluated modulo each prime, with the same entry bound.
//!
//! Cost per term with r basis words: r^2 (derived) or 2 n r (lower central) word products,
//! each at most `supp x supp x (row length)` operations modulo each prime used.

use crate::error::Result;
use crate::linalg::Matrix;
use crate::linalg::modular::rref_mod;
use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
use crate::linalg::system::{RowBuf, RowSource};
use crate::scalar::{Field, Q};
use crate::tensor::{IntegralTensor, ModTable};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};

/// A factor of a word of the next term: a basis word of the current term or a basis
/// element of the algebra.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Factor {
    Word(u32),
    Basis(u32),
}

/// The product `a b`, or `a b + b a` when `symmetric`.
#[derive(Clone, Copy, Debug)]
struct Gen {
    a: Factor,
    b: Factor,
    symmetric: bool,
}

/// The words of one term, as products of the previous term's basis words.
struct Level<'a> {
    it: &'a IntegralTensor,
    prev: Option<&'a Basis>,
    gens: Vec<Gen>,
    /// Products in each generator (for the entry bound).
    depth: u32,
}

/// A basis of a term: its words (as generators over the previous basis) with their depth,
/// and the whole chain below it.
#[derive(Clone, Debug)]
struct Basis {
    chain: Vec<(Vec<Gen>, u32)>,
}

/// Residues of `x y` (x, y dense residue vectors) modulo the table's prime.
fn product(t: &ModTable, x: &[u32], y: &[u32]) -> Vec<u32> {
    let n = t.dims[2];
    let p = t.p as u128;
    let mut acc = vec![0u128; n];
    for (a, &xa) in x.iter().enumerate() {
        if xa == 0 {
            continue;
        }
        for (b, &yb) in y.iter().enumerate() {
            if yb == 0 {
                continue;
            }
            let s = (xa as u128 * yb as u128) % p;
            let (ks, vs) = t.row(a, b);
            for (&k, &v) in ks.iter().zip(vs) {
                acc[k as usize] += s * v as u128;
            }
        }
    }
    acc.into_iter().map(|x| (x % p) as u32).collect()
}

fn unit(n: usize, i: usize) -> Vec<u32> {
    let mut v = vec![0; n];
    v[i] = 1;
    v
}

/// Evaluate generators modulo the table's prime, given the previous basis words' vectors.
fn eval_gens(t: &ModTable, gens: &[Gen], prev: &[Vec<u32>]) -> Vec<Vec<u32>> {
    let n = t.dims[0];
    let vec_of = |f: Factor| match f {
        Factor::Word(i) => prev[i as usize].clone(),
        Factor::Basis(i) => unit(n, i as usize),
    };
    gens.iter()
        .map(|g| {
            let (x, y) = (vec_of(g.a), vec_of(g.b));
            let mut v = product(t, &x, &y);
            if g.symmetric && g.a != g.b {
                let w = product(t, &y, &x);
                for (a, b) in v.iter_mut().zip(w) {
                    *a = ((*a as u64 + b as u64) % t.p) as u32;
                }
            }
            v
        })
        .collect()
}

/// The vectors of a basis's words modulo p (the whole chain evaluated from the bottom).
fn eval_basis(t: &ModTable, b: &Basis) -> Vec<Vec<u32>> {
    let n = t.dims[0];
    let mut cur: Vec<Vec<u32>> = (0..n).map(|i| unit(n, i)).collect();
    for (gens, _) in &b.chain {
        cur = eval_gens(t, gens, &cur);
    }
    cur
}

impl RowSource for Level<'_> {
    fn unknowns(&self) -> usize {
        self.it.dims[0]
    }
    fn blocks(&self) -> usize {
        self.gens.len().div_ceil(64)
    }
    fn modulus(&self) -> Option<u64> {
        self.it.modulus()
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        let residues = self.it.residues(p);
        let t = &*residues;
        let prev = match self.prev {
            Some(basis) => eval_basis(t, basis),
            None => (0..t.dims[0]).map(|i| unit(t.dims[0], i)).collect(),
        };
        let gens = &self.gens[b * 64..((b + 1) * 64).min(self.gens.len())];
        let vecs = eval_gens(t, gens, &prev);
        for (r, v) in vecs.iter().enumerate() {
            for (c, &x) in v.iter().enumerate() {
                if x != 0 {
                    out.add(r, c, x as u64);
                }
            }
        }
        out.end_block(gens.len());
    }
    fn term_bits(&self) -> u64 {
        // an entry of a word with k products is at most L^k (plus one bit for a + b a)
        self.depth as u64 * self.it.row_norm_bits().max(1) + 1
    }
    fn estimated_terms(&self) -> usize {
        self.gens.len() * self.it.dims[0]
    }
    fn prefers_streaming(&self) -> bool {
        true
    }
}

/// The dimension of the span of the generators, and those of them that form a basis.
fn span(level: &Level, params: &SolveParams) -> Result<(usize, Vec<Gen>)> {
    let n = level.it.dims[0];
    let null = solve_nullspace(level, params)?.dim();
    let dim = n - null;
    if dim == 0 {
        return Ok((0, Vec::new()));
    }
    // independent generators modulo a prime (independent over Q), greedily
    let primes: Vec<u64> = match level.it.modulus() {
        Some(q) => vec![q],
        None => crate::linalg::nullspace::cached_primes().to_vec(),
    };
    for &p in &primes {
        let residues = level.it.residues(p);
        let t = &*residues;
        let prev = match level.prev {
            Some(b) => eval_basis(t, b),
            None => (0..n).map(|i| unit(n, i)).collect(),
        };
        let mut chosen = Vec::new();
        let mut rows: Vec<u64> = Vec::new();
        for chunk in level.gens.chunks(64) {
            for (g, v) in chunk.iter().zip(eval_gens(t, chunk, &prev)) {
                let mut trial = rows.clone();
                trial.extend(v.iter().map(|&x| x as u64));
                let r = trial.len() / n;
                if rref_mod(&mut trial.clone(), r, n, p, false).len() == r {
                    rows = trial;
                    chosen.push(*g);
                    if chosen.len() == dim {
                        return Ok((dim, chosen));
                    }
                }
            }
        }
    }
    Err(crate::Error::Invalid(
        "no independent words found for a spanned subspace".into(),
    ))
}

/// The dimensions of a chain of terms `S_0 = A, S_1, ...` until it stabilises (at most
/// n + 1 terms), where `next(basis size)` gives the generators of the next term.
fn chain(
    it: &IntegralTensor,
    params: &SolveParams,
    next: impl Fn(usize) -> Vec<Gen>,
) -> Result<(Vec<usize>, Option<Basis>)> {
    let terms = chain_terms(it, params, next)?;
    let dims = terms.iter().map(|t| t.dim).collect();
    let last = terms
        .last()
        .filter(|t| t.dim != 0 && terms.len() <= it.dims[0] + 1)
        .and_then(|t| t.basis.clone());
    Ok((dims, last))
}

/// The terms of a chain `S_0 = A, S_1, ...` with their word bases (see [`chain`]).
fn chain_terms(
    it: &IntegralTensor,
    params: &SolveParams,
    next: impl Fn(usize) -> Vec<Gen>,
) -> Result<Vec<Term>> {
    let n = it.dims[0];
    let mut terms = vec![Term {
        basis: None,
        dim: n,
        depth: 0,
    }];
    let mut basis: Option<Basis> = None;
    let mut depth = 0u32;
    loop {
        let cur = terms.last().expect("a term").dim;
        let gens = next(cur);
        let level = Level {
            it,
            prev: basis.as_ref(),
            gens,
            depth: 2 * depth + 1,
        };
        let (dim, chosen) = span(&level, params)?;
        if dim == cur {
            break;
        }
        depth = level.depth;
        let mut chain = basis.map(|b| b.chain).unwrap_or_default();
        chain.push((chosen, depth));
        basis = Some(Basis { chain });
        terms.push(Term {
            basis: basis.clone(),
            dim,
            depth,
        });
        if dim == 0 || terms.len() > n + 1 {
            break;
        }
    }
    Ok(terms)
}

/// A series of subspaces: the dimensions of its terms until it stabilises, and a basis of
/// its last term when that term is not zero (the witness that the series does not reach
/// 0: a nonzero term equal to the next one).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Series {
    pub dims: Vec<usize>,
    /// Exact coordinates of a basis of the last term, in reduced echelon form (empty when
    /// the series reaches 0). Over GF(q) the representatives in `0..q`.
    pub last: Vec<Vec<Q>>,
}

/// The series and the basis of its last term (see [`Series`]). The last term's words
/// are evaluated exactly (integers for the scaled constants; a word with k products is
/// `D^k` times the true one, which does not change the span) and brought to reduced
/// echelon form. Cost: the series, plus one exact evaluation of each word of the chain
/// (at most n words per term, each `supp x supp x (row length)` big-integer operations).
fn series(
    it: &IntegralTensor,
    params: &SolveParams,
    next: impl Fn(usize) -> Vec<Gen>,
) -> Result<Series> {
    let (dims, basis) = chain(it, params, next)?;
    let n = it.dims[0];
    let last = if dims.last() == Some(&0) {
        Vec::new()
    } else {
        let mut cur: Vec<Vec<BigInt>> = (0..n)
            .map(|i| {
                let mut v = vec![BigInt::zero(); n];
                v[i] = BigInt::one();
                v
            })
            .collect();
        for (gens, _) in basis.iter().flat_map(|b| &b.chain) {
            cur = gens.iter().map(|g| exact_gen(it, g, &cur)).collect();
        }
        echelon_basis(it, cur)
    };
    Ok(Series { dims, last })
}

/// The exact vector of one generator over the previous words `prev` (scaled constants;
/// over GF(q) reduced modulo q).
fn exact_gen(it: &IntegralTensor, g: &Gen, prev: &[Vec<BigInt>]) -> Vec<BigInt> {
    let n = it.dims[0];
    let vec_of = |f: Factor| match f {
        Factor::Word(i) => prev[i as usize].clone(),
        Factor::Basis(i) => {
            let mut v = vec![BigInt::zero(); n];
            v[i as usize] = BigInt::one();
            v
        }
    };
    let (x, y) = (vec_of(g.a), vec_of(g.b));
    let mut out = vec![BigInt::zero(); n];
    let mut add = |x: &[BigInt], y: &[BigInt]| {
        for (a, xa) in x.iter().enumerate().filter(|(_, v)| !v.is_zero()) {
            for (b, yb) in y.iter().enumerate().filter(|(_, v)| !v.is_zero()) {
                let s = xa * yb;
                for (k, c) in it.product(a, b) {
                    out[*k as usize] += &s * c;
                }
            }
        }
    };
    add(&x, &y);
    if g.symmetric && g.a != g.b {
        add(&y, &x);
    }
    if let Some(q) = it.modulus() {
        let q = BigInt::from(q);
        for v in &mut out {
            *v = v.mod_floor(&q);
        }
    }
    out
}

/// A basis of the span of `rows` in reduced echelon form over the tensor's field.
fn echelon_basis(it: &IntegralTensor, rows: Vec<Vec<BigInt>>) -> Vec<Vec<Q>> {
    let n = it.dims[0];
    crate::with_field!(it.field, f => {
        let elems: Vec<Vec<_>> = rows
            .iter()
            .map(|r| {
                r.iter()
                    .map(|x| f.from_rational(&Q::from_integer(x.clone())).unwrap_or_else(|| f.zero()))
                    .collect()
            })
            .collect();
        let mut m = Matrix::from_rows(elems, n);
        let pivots = crate::linalg::rref(f, &mut m);
        (0..pivots.len())
            .map(|i| m.row(i).iter().map(|x| f.to_rational(x)).collect())
            .collect()
    })
}

/// Dimensions of the derived series `A, AA, (AA)(AA), ...` until it stabilises.
/// For a Lie algebra this is `L, [L,L], ...`.
pub fn derived_series(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<usize>> {
    Ok(chain(it, params, derived_next(it.dims[0]))?.0)
}

/// [`derived_series`] with a basis of its last term (see [`Series`]).
pub fn derived_series_terms(it: &IntegralTensor, params: &SolveParams) -> Result<Series> {
    series(it, params, derived_next(it.dims[0]))
}

/// The terms of the derived series with word bases (dimensions as [`derived_series`]).
pub fn derived_terms(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<Term>> {
    chain_terms(it, params, derived_next(it.dims[0]))
}

/// Generators of the next derived term: all products of two basis words.
fn derived_next(n: usize) -> impl Fn(usize) -> Vec<Gen> {
    let first = std::cell::Cell::new(true);
    move |r| {
        let f = |i: usize| {
            if first.get() {
                Factor::Basis(i as u32)
            } else {
                Factor::Word(i as u32)
            }
        };
        let r = if first.get() { n } else { r };
        let g = (0..r)
            .flat_map(|a| (0..r).map(move |b| (a, b)))
            .map(|(a, b)| Gen {
                a: f(a),
                b: f(b),
                symmetric: false,
            })
            .collect();
        first.set(false);
        g
    }
}

/// Dimensions of the lower central series `A, A^2, A A^2 + A^2 A, ...` until it
/// stabilises. For a Lie algebra this is `L, [L,L], [L,[L,L]], ...`.
pub fn lower_central_series(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<usize>> {
    Ok(chain(it, params, lower_next(it.dims[0]))?.0)
}

/// [`lower_central_series`] with a basis of its last term (see [`Series`]).
pub fn lower_central_series_terms(it: &IntegralTensor, params: &SolveParams) -> Result<Series> {
    series(it, params, lower_next(it.dims[0]))
}

/// The terms of the lower central series with word bases (dimensions as
/// [`lower_central_series`]).
pub fn lower_central_terms(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<Term>> {
    chain_terms(it, params, lower_next(it.dims[0]))
}

/// Generators of the next lower central term: products of a basis element and a word, both
/// orders.
fn lower_next(n: usize) -> impl Fn(usize) -> Vec<Gen> {
    let first = std::cell::Cell::new(true);
    move |r| {
        let g = if first.get() {
            (0..n)
                .flat_map(|a| (0..n).map(move |b| (a, b)))
                .map(|(a, b)| Gen {
                    a: Factor::Basis(a as u32),
                    b: Factor::Basis(b as u32),
                    symmetric: false,
                })
                .collect()
        } else {
            (0..n)
                .flat_map(|e| (0..r).map(move |w| (e, w)))
                .flat_map(|(e, w)| {
                    [
                        Gen {
                            a: Factor::Basis(e as u32),
                            b: Factor::Word(w as u32),
                            symmetric: false,
                        },
                        Gen {
                            a: Factor::Word(w as u32),
                            b: Factor::Basis(e as u32),
                            symmetric: false,
                        },
                    ]
                })
                .collect()
        };
        first.set(false);
        g
    }
}

/// `dim span {x x : x in A}`: spanned by `e_i e_i` and `e_i e_j + e_j e_i` (i < j).
pub fn squares_dim(it: &IntegralTensor, params: &SolveParams) -> Result<usize> {
    let n = it.dims[0];
    let gens = (0..n)
        .flat_map(|a| (a..n).map(move |b| (a, b)))
        .map(|(a, b)| Gen {
            a: Factor::Basis(a as u32),
            b: Factor::Basis(b as u32),
            symmetric: true,
        })
        .collect();
    let level = Level {
        it,
        prev: None,
        gens,
        depth: 1,
    };
    Ok(n - solve_nullspace(&level, params)?.dim())
}

/// A term of a series (derived or lower central) with a basis of words: `dim` products of
/// basis elements, independent over Q (independent modulo a prime); the whole algebra
/// when it has no words (its basis elements). `depth` bounds the number of products in a
/// word, so every entry of a word of the integer-scaled constants is at most `L^depth`.
#[derive(Clone, Debug)]
pub struct Term {
    basis: Option<Basis>,
    /// The dimension of the term.
    pub dim: usize,
    depth: u32,
}

impl Term {
    /// The words' vectors modulo the table's prime.
    fn vectors(&self, t: &ModTable) -> Vec<Vec<u32>> {
        let n = t.dims[0];
        match &self.basis {
            Some(b) => eval_basis(t, b),
            None => (0..n).map(|i| unit(n, i)).collect(),
        }
    }
}

/// For each term, its words' vectors modulo one prime.
type WordVectors = std::sync::Arc<Vec<Vec<Vec<u32>>>>;

/// The words' vectors of some terms modulo each prime asked, computed once per prime.
struct TermVectors<'a> {
    terms: Vec<&'a Term>,
    cache: std::sync::Mutex<Vec<(u64, WordVectors)>>,
}

impl<'a> TermVectors<'a> {
    fn new(terms: Vec<&'a Term>) -> Self {
        TermVectors {
            terms,
            cache: Default::default(),
        }
    }

    fn get(&self, t: &ModTable) -> WordVectors {
        let mut c = self.cache.lock().expect("an unpoisoned cache");
        if let Some((_, v)) = c.iter().find(|(p, _)| *p == t.p) {
            return v.clone();
        }
        let v = std::sync::Arc::new(self.terms.iter().map(|x| x.vectors(t)).collect());
        c.push((t.p, std::sync::Arc::clone(&v)));
        v
    }
}

/// What a [`TermSystem`] states.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum TermEq {
    /// Rows: the products `u v` and `v u` of a word u of the first term and a word v of the
    /// second; the row space is their span (unknowns: coordinates).
    Products,
    /// `x w = 0` and `w x = 0` for every word w of the term (unknowns: x in A).
    Annihilator,
    /// `y w = 0` and `w y = 0` for every word w, with `y = sum_a y_a w_a` in the term
    /// (unknowns: the coefficients y_a).
    Centre,
}

/// A linear system built from the word bases of one or two terms (see [`TermEq`]).
struct TermSystem<'a> {
    it: &'a IntegralTensor,
    what: TermEq,
    vecs: TermVectors<'a>,
    dims: (usize, usize),
    depth: u32,
}

/// Words of the first term per block of a [`TermSystem`].
const TERM_BLOCK: usize = 8;

impl RowSource for TermSystem<'_> {
    fn unknowns(&self) -> usize {
        match self.what {
            TermEq::Products | TermEq::Annihilator => self.it.dims[0],
            TermEq::Centre => self.dims.0,
        }
    }
    fn blocks(&self) -> usize {
        self.dims.0.div_ceil(TERM_BLOCK)
    }
    fn modulus(&self) -> Option<u64> {
        self.it.modulus()
    }
    fn block(&self, b: usize, p: u64, out: &mut RowBuf) {
        let residues = self.it.residues(p);
        let t = &*residues;
        let n = t.dims[0];
        let all = self.vecs.get(t);
        let range = b * TERM_BLOCK..((b + 1) * TERM_BLOCK).min(self.dims.0);
        let first = &all[0];
        let mut rows = 0;
        match self.what {
            TermEq::Products => {
                let second = &all[all.len() - 1];
                for a in range {
                    for v in second {
                        for w in [product(t, &first[a], v), product(t, v, &first[a])] {
                            for (c, &x) in w.iter().enumerate() {
                                if x != 0 {
                                    out.add(rows, c, x as u64);
                                }
                            }
                            rows += 1;
                        }
                    }
                }
            }
            TermEq::Annihilator => {
                for a in range {
                    let w = &first[a];
                    for i in 0..n {
                        let e = unit(n, i);
                        for (r, v) in [product(t, &e, w), product(t, w, &e)].iter().enumerate() {
                            for (m, &x) in v.iter().enumerate() {
                                if x != 0 {
                                    out.add(rows + r * n + m, i, x as u64);
                                }
                            }
                        }
                    }
                    rows += 2 * n;
                }
            }
            TermEq::Centre => {
                for bw in range {
                    for (a, wa) in first.iter().enumerate() {
                        let w = &first[bw];
                        for (r, v) in [product(t, wa, w), product(t, w, wa)].iter().enumerate() {
                            for (m, &x) in v.iter().enumerate() {
                                if x != 0 {
                                    out.add(rows + r * n + m, a, x as u64);
                                }
                            }
                        }
                    }
                    rows += 2 * n;
                }
            }
        }
        out.end_block(rows);
    }
    fn term_bits(&self) -> u64 {
        self.depth as u64 * self.it.row_norm_bits().max(1) + 1
    }
    fn estimated_terms(&self) -> usize {
        2 * self.dims.0 * self.dims.1.max(1) * self.it.dims[0]
    }
}

/// `dim (S T + T S)`: the span of the products of a word of S and a word of T, both orders
/// (for a Lie algebra, `[S, T]`). Cost: 2 dim S dim T word products modulo each prime.
pub fn products_dim(
    it: &IntegralTensor,
    s: &Term,
    t: &Term,
    params: &SolveParams,
) -> Result<usize> {
    if s.dim == 0 || t.dim == 0 {
        return Ok(0);
    }
    let sys = TermSystem {
        it,
        what: TermEq::Products,
        vecs: TermVectors::new(vec![s, t]),
        dims: (s.dim, t.dim),
        depth: s.depth + t.depth + 1,
    };
    Ok(it.dims[0] - solve_nullspace(&sys, params)?.dim())
}

/// The annihilator of a term in A, `{x : x w = w x = 0 for every w in T}` (for a Lie
/// algebra, the centraliser of T), as a proven basis. Cost: 2 n^2 dim T products.
pub fn annihilator_of_term(it: &IntegralTensor, t: &Term, params: &SolveParams) -> Result<Space> {
    let sys = TermSystem {
        it,
        what: TermEq::Annihilator,
        vecs: TermVectors::new(vec![t]),
        dims: (t.dim, 1),
        depth: t.depth + 1,
    };
    solve_nullspace(&sys, params)
}

/// `dim` of the centre of a term as an algebra, `{y in T : y T = T y = 0}`. Cost:
/// 2 (dim T)^2 word products modulo each prime.
pub fn term_centre_dim(it: &IntegralTensor, t: &Term, params: &SolveParams) -> Result<usize> {
    if t.dim == 0 {
        return Ok(0);
    }
    let sys = TermSystem {
        it,
        what: TermEq::Centre,
        vecs: TermVectors::new(vec![t]),
        dims: (t.dim, t.dim),
        depth: 2 * t.depth + 1,
    };
    Ok(solve_nullspace(&sys, params)?.dim())
}
