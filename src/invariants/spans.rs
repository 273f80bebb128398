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
//! Cost per term with r basis words: r^2 (derived) or 2 n r (lower central) word products,
//! each at most `supp x supp x (row length)` operations modulo each prime used.

use crate::error::Result;
use crate::linalg::modular::rref_mod;
use crate::linalg::nullspace::{SolveParams, solve_nullspace};
use crate::linalg::system::{RowBuf, RowSource};
use crate::tensor::{IntegralTensor, ModTable};

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
) -> Result<Vec<usize>> {
    let n = it.dims[0];
    let mut dims = vec![n];
    let mut basis: Option<Basis> = None;
    let mut depth = 0u32;
    loop {
        let cur = *dims.last().expect("a term");
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
        dims.push(dim);
        if dim == 0 || dims.len() > n + 1 {
            break;
        }
        depth = level.depth;
        let mut chain = basis.map(|b| b.chain).unwrap_or_default();
        chain.push((chosen, depth));
        basis = Some(Basis { chain });
    }
    Ok(dims)
}

/// Dimensions of the derived series `A, AA, (AA)(AA), ...` until it stabilises.
/// For a Lie algebra this is `L, [L,L], ...`.
pub fn derived_series(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<usize>> {
    let n = it.dims[0];
    let first = std::cell::Cell::new(true);
    chain(it, params, |r| {
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
    })
}

/// Dimensions of the lower central series `A, A^2, A A^2 + A^2 A, ...` until it
/// stabilises. For a Lie algebra this is `L, [L,L], [L,[L,L]], ...`.
pub fn lower_central_series(it: &IntegralTensor, params: &SolveParams) -> Result<Vec<usize>> {
    let n = it.dims[0];
    let first = std::cell::Cell::new(true);
    chain(it, params, |r| {
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
    })
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
