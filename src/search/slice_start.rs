//! A walk start in a basis of the tensor's own choosing: the slice scheme over GF(p) after
//! a change of basis on one axis that makes the slices of low rank.
//!
//! A tensor T with slices S_0, ..., S_{d-1} along an axis is the sum of `e_i (x) S_i`, and
//! each slice of rank r is a sum of r rank-one matrices: a scheme of rank sum_i rank(S_i).
//! Any basis change G of that axis gives another such scheme, `T = sum_l h_l (x) N_l` with
//! `N_l = sum_i G[l][i] S_i` and `h_l` the columns of G^-1. A table written in a basis of
//! the user's own has slices of full rank (the slice scheme of the matrix product <3,3,3>
//! in a random basis has rank 81), while the right basis gives the schoolbook rank (27).
//! Over GF(p) the slice space is finite: its elements are enumerated (or, when there are
//! too many, visited by a random walk of one-coordinate steps), each slice's rank is
//! computed, and a basis of least total rank among those seen is chosen greedily (a
//! minimum-weight basis of a matroid). Tried on all three axes; the lowest wins.
//!
//! Invariant: the returned scheme is over GF(p) and verified exactly against the tensor
//! reduced mod p.

use crate::linalg::dense_echelon::DenseEchelon;
use crate::linalg::modular::rref_mod;
use crate::linalg::{Matrix, inverse};
use crate::scalar::{Field, FieldSpec, PrimeField};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;

/// The budget of the slice search.
#[derive(Clone, Debug)]
pub struct SliceStartParams {
    /// Arithmetic operations (slice entries touched) allowed per axis; the enumeration
    /// is exhaustive when the whole slice space fits.
    pub work_per_axis: u64,
    /// Seed of the random walk used when the slice space is too large to enumerate.
    pub seed: u64,
}

impl Default for SliceStartParams {
    fn default() -> Self {
        SliceStartParams {
            work_per_axis: 200_000_000,
            seed: 0,
        }
    }
}

/// Rank over GF(p) of the `rows x cols` row-major residue matrix `m` (a scratch copy is
/// reduced). Cost: O(rows cols min(rows, cols)).
fn rank_mod_p(m: &[u64], scratch: &mut Vec<u64>, rows: usize, cols: usize, p: u64) -> usize {
    scratch.clear();
    scratch.extend_from_slice(m);
    rref_mod(scratch, rows, cols, p, false).len()
}

/// Rank factorisation over GF(p) of the `rows x cols` matrix `m`: pairs (column, row)
/// whose outer products sum to `m` (the pivot columns of `m` times the nonzero rows of its
/// reduced row echelon form). Cost: O(rows cols min(rows, cols)).
fn rank_one_terms(m: &[u64], rows: usize, cols: usize, p: u64) -> Vec<(Vec<u64>, Vec<u64>)> {
    let mut r = m.to_vec();
    let pivots = rref_mod(&mut r, rows, cols, p, true);
    pivots
        .iter()
        .enumerate()
        .map(|(s, &c)| {
            let col = (0..rows).map(|i| m[i * cols + c]).collect();
            (col, r[s * cols..(s + 1) * cols].to_vec())
        })
        .collect()
}

/// An independent set over GF(p), grown one vector at a time: the vectors as found, and
/// their reduced echelon form for the independence test.
struct Independent {
    form: DenseEchelon,
    found: Vec<Vec<u64>>,
}

impl Independent {
    fn new(p: u64, d: usize) -> Self {
        Independent {
            form: DenseEchelon::new(p, d),
            found: Vec::new(),
        }
    }

    /// Add `v` when it is independent of the set; true if added. Cost: O(len d).
    fn insert(&mut self, v: &[u64]) -> bool {
        let mut row: Vec<u32> = v.iter().map(|&x| x as u32).collect();
        let added = self.form.add_rows(&mut row) == 1;
        if added {
            self.found.push(v.to_vec());
        }
        added
    }
}

/// The slice scheme along `axis` (dims `d` of the tensor, `slices` its slices along that
/// axis, entries mod p) in a basis of that axis of low total slice rank: its terms in the
/// axis order (axis, next, next), or `None` when no basis is found.
fn slice_scheme_along(
    slices: &[Vec<u64>],
    d: [usize; 3],
    axis: usize,
    p: u64,
    params: &SliceStartParams,
) -> Option<Vec<[Vec<u64>; 3]>> {
    let (da, db, dc) = (d[axis], d[(axis + 1) % 3], d[(axis + 2) % 3]);
    let size = db * dc;
    let step_cost = (size * (1 + db.min(dc))) as u64;
    let steps = (params.work_per_axis / step_cost.max(1)).max(1);
    let space = (p as f64).powi(da as i32);
    let exhaustive = space <= steps as f64 + 1.0;
    // per rank level, an independent set of the combinations seen at that rank
    let mut levels: Vec<Independent> = (0..=db.min(dc)).map(|_| Independent::new(p, da)).collect();
    let mut g = vec![0u64; da];
    let mut n = vec![0u64; size];
    let mut scratch = Vec::with_capacity(size);
    let mut rng = ChaCha8Rng::seed_from_u64(params.seed ^ axis as u64);
    let mut consider = |g: &[u64], n: &[u64], levels: &mut Vec<Independent>| {
        if g.iter().all(|&x| x == 0) {
            return;
        }
        let level = &mut levels[rank_mod_p(n, &mut scratch, db, dc, p)];
        if level.found.len() < da {
            level.insert(g);
        }
    };
    // the unit vectors first: the given basis is always available
    for (i, s) in slices.iter().enumerate() {
        let mut e = vec![0u64; da];
        e[i] = 1;
        consider(&e, s, &mut levels);
    }
    let add_slice = |i: usize, g: &mut [u64], n: &mut [u64]| {
        g[i] = (g[i] + 1) % p;
        for (x, y) in n.iter_mut().zip(&slices[i]) {
            *x = (*x + y) % p;
        }
    };
    if exhaustive {
        // a mixed-radix counter: each increment adds the slices of the changed digits
        loop {
            let mut i = 0;
            while i < da {
                add_slice(i, &mut g, &mut n);
                if g[i] != 0 {
                    break;
                }
                i += 1;
            }
            if i == da {
                break;
            }
            consider(&g, &n, &mut levels);
        }
    } else {
        for _ in 0..steps {
            let i = rng.gen_range(0..da);
            add_slice(i, &mut g, &mut n);
            consider(&g, &n, &mut levels);
        }
    }
    // a minimum-weight basis, greedily through the levels
    let mut chosen = Independent::new(p, da);
    for level in &levels {
        for v in &level.found {
            if chosen.found.len() < da {
                chosen.insert(v);
            }
        }
    }
    let rows = chosen.found;
    let f = PrimeField::new(p)?;
    let h = inverse(&f, &Matrix::from_rows(rows.clone(), da))?;
    let mut terms = Vec::new();
    for (l, gl) in rows.iter().enumerate() {
        let mut nl = vec![0u64; size];
        for (i, s) in slices.iter().enumerate() {
            if gl[i] != 0 {
                for (x, y) in nl.iter_mut().zip(s) {
                    *x = (*x + gl[i] * y) % p;
                }
            }
        }
        let hl: Vec<u64> = (0..da).map(|i| h[(i, l)]).collect();
        for (col, row) in rank_one_terms(&nl, db, dc, p) {
            terms.push([hl.clone(), col, row]);
        }
    }
    Some(terms)
}

/// The slices of the dense tensor `t` (dims `d`) along `axis`: `d[axis]` matrices of
/// `d[axis + 1] x d[axis + 2]` (axes mod 3), row-major. Cost: O(d0 d1 d2).
fn slices_along(t: &[u64], d: [usize; 3], axis: usize) -> Vec<Vec<u64>> {
    let (b, c) = ((axis + 1) % 3, (axis + 2) % 3);
    (0..d[axis])
        .map(|ia| {
            (0..d[b])
                .flat_map(|ib| (0..d[c]).map(move |ic| (ib, ic)))
                .map(|(ib, ic)| {
                    let mut idx = [0; 3];
                    idx[axis] = ia;
                    idx[b] = ib;
                    idx[c] = ic;
                    t[(idx[0] * d[1] + idx[1]) * d[2] + idx[2]]
                })
                .collect()
        })
        .collect()
}

/// The sum of the ranks over GF(p) of `slices` (the slices along `axis` in the given
/// basis). Cost: O(d0 d1 d2 min(d1, d2)).
fn given_slice_rank(slices: &[Vec<u64>], d: [usize; 3], axis: usize, p: u64) -> usize {
    let (rows, cols) = (d[(axis + 1) % 3], d[(axis + 2) % 3]);
    let mut scratch = Vec::new();
    slices
        .iter()
        .map(|m| rank_mod_p(m, &mut scratch, rows, cols, p))
        .sum()
}

/// The slice scheme over GF(`p`) of `goal` (over Q or GF(p)) in the basis of least slice
/// rank found on any axis, if its rank is below `below` (the rank of the standard scheme,
/// one term per nonzero coefficient); verified exactly against `goal` reduced mod p.
/// `None` when the tensor does not reduce mod p, when the slice scheme in the given basis
/// is not below `below` already (a sparse table: no search), or nothing lower is found.
/// Cost: about `params.work_per_axis` operations per axis, plus one verification.
pub fn slice_start(
    goal: &Tensor,
    p: u64,
    below: usize,
    params: &SliceStartParams,
) -> Option<Scheme> {
    let field = FieldSpec::Prime(p);
    let red = if goal.field() == field {
        goal.clone()
    } else {
        goal.with_field(field).ok()?
    };
    let d = red.dims();
    let f = PrimeField::new(p)?;
    let mut dense = vec![0u64; d[0] * d[1] * d[2]];
    for (i, j, k, x) in red.entries() {
        dense[(i * d[1] + j) * d[2] + k] = f.from_rational(x)?;
    }
    let slices: [Vec<Vec<u64>>; 3] = std::array::from_fn(|axis| slices_along(&dense, d, axis));
    // a table already sparse (a generator's basis) has its standard scheme at or below
    // the slice scheme in the given basis: nothing to look for
    let plain = (0..3)
        .map(|axis| given_slice_rank(&slices[axis], d, axis, p))
        .min()
        .unwrap_or(usize::MAX);
    if plain >= below {
        return None;
    }
    let mut best: Option<(usize, Vec<[Vec<u64>; 3]>)> = None;
    for axis in 0..3 {
        let Some(terms) = slice_scheme_along(&slices[axis], d, axis, p, params) else {
            continue;
        };
        if best.as_ref().is_none_or(|(a, _)| terms.len() < *a) {
            // back to the order (left, right, result)
            let back: Vec<[Vec<u64>; 3]> = terms
                .into_iter()
                .map(|[x, y, z]| {
                    let mut out: [Vec<u64>; 3] = Default::default();
                    out[axis] = x;
                    out[(axis + 1) % 3] = y;
                    out[(axis + 2) % 3] = z;
                    out
                })
                .collect();
            best = Some((back.len(), back));
        }
    }
    let (rank, terms) = best?;
    if rank >= below {
        return None;
    }
    let conv = |v: &[u64]| -> Vec<crate::scalar::Q> {
        v.iter()
            .map(|&x| crate::scalar::Q::from_integer(BigInt::from(x)))
            .collect()
    };
    let mut s = Scheme::empty(field, d);
    for [u, v, w] in &terms {
        s.u.push(conv(u));
        s.v.push(conv(v));
        s.w.push(conv(w));
    }
    verify(&s, &red).ok()?;
    Some(s)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::search::tests::matmul;

    /// The matrix product <n,m,p> has a scheme of rank nmp (the schoolbook product); in a
    /// random basis of each axis (entries -2..2) its slice scheme has rank far above, and
    /// the basis search over GF(p) finds the schoolbook rank back (common practice: a
    /// basis of rank-one matrices of the slice space).
    #[test]
    fn schoolbook_rank_back_from_a_random_basis() {
        for (dims, p) in [
            ([2, 2, 2], 2),
            ([3, 3, 3], 2),
            ([2, 3, 3], 3),
            ([3, 3, 3], 5),
        ] {
            let t = matmul(dims[0], dims[1], dims[2]);
            let n = t.dims();
            let m = |axis: usize| crate::tensor::random_invertible(n[axis], 3, 7 + axis as u64);
            let scrambled =
                crate::tensor::change_basis(&t, &m(0), &m(1), &m(2)).expect("invertible");
            assert!(
                scrambled.nnz() > t.nnz(),
                "the random basis makes the table dense"
            );
            if scrambled.with_field(FieldSpec::Prime(p)).is_err() {
                continue;
            }
            let want = dims[0] * dims[1] * dims[2];
            let s = slice_start(&scrambled, p, usize::MAX, &SliceStartParams::default())
                .expect("a slice scheme");
            assert!(s.rank() <= want, "{dims:?} over GF({p}): {}", s.rank());
            let red = scrambled.with_field(FieldSpec::Prime(p)).unwrap();
            assert!(verify(&s, &red).is_ok());
        }
    }
}

#[cfg(test)]
mod invariance {
    use super::*;
    use crate::scalar::Q;
    use crate::tensor::{Kind, change_basis, random_invertible};
    use proptest::prelude::*;
    use rand::Rng;

    /// A random tensor of the given dims over Q with entries in -2..=2 (seeded).
    fn random_tensor(d: [usize; 3], seed: u64) -> Tensor {
        let mut rng = ChaCha8Rng::seed_from_u64(seed);
        let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, d, None);
        for i in 0..d[0] {
            for j in 0..d[1] {
                for k in 0..d[2] {
                    // sparse, so that low-rank slices exist to be found
                    if rng.gen_range(0..3) == 0 {
                        t.set(i, j, k, Q::from_integer(rng.gen_range(-2i64..=2).into()));
                    }
                }
            }
        }
        t
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]

        /// With the whole slice space enumerated, the greedy basis is a minimum-weight
        /// basis of the matroid (common practice), so the rank of the slice scheme depends
        /// on the tensor only, not on its basis: unchanged by a change of basis with large
        /// entries on every axis (drawn until invertible mod 3).
        #[test]
        fn slice_start_rank_is_basis_free(
            d0 in 1usize..4, d1 in 1usize..4, d2 in 1usize..4, seed in 0u64..1 << 32,
        ) {
            let t = random_tensor([d0, d1, d2], seed);
            let m = |axis: usize, n: usize| random_invertible(n, 1_000_000, seed ^ ((axis as u64 + 1) * 7919));
            let u = change_basis(&t, &m(0, d0), &m(1, d1), &m(2, d2)).unwrap();
            let p = 3;
            prop_assume!(u.with_field(FieldSpec::Prime(p)).is_ok());
            let red_t = t.with_field(FieldSpec::Prime(p)).unwrap();
            let red_u = u.with_field(FieldSpec::Prime(p)).unwrap();
            // the reductions are equivalent only when the basis change is invertible mod 3
            let f = PrimeField::new(p).unwrap();
            let dets_ok = [d0, d1, d2].iter().enumerate().all(|(a, &n)| {
                let reduced = m(a, n).map(|x| f.from_rational(x).unwrap());
                crate::linalg::rank(&f, &reduced) == n
            });
            prop_assume!(dets_ok);
            let params = SliceStartParams::default();
            let rank = |x: &Tensor| slice_start(x, p, usize::MAX, &params).map(|s| s.rank());
            prop_assert_eq!(rank(&red_t), rank(&red_u));
        }
    }
}
