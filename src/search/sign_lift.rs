//! The sign lift: a scheme over GF(2) of an integer tensor turned into a scheme over Z
//! with every coefficient in {-1, 0, 1}, each nonzero GF(2) coefficient becoming +1 or -1
//! and each zero staying 0.
//!
//! Why a lift needs it: the Hensel step from GF(2) to Z/4 solves `J d = e (mod 2)` for the
//! correction `x + 2 d`, and that system has a large kernel (the schemes near a given one
//! form a variety of positive dimension). The plain lift ([`super::hensel`]) takes the
//! solution with its free unknowns at zero, which in general sends zero coefficients to 2
//! and drifts, digit after digit, to a 2-adic point that is not a small integer vector; its
//! rational reconstruction then has denominators. Kauers and Moosbauer 2022 ("Flip graphs
//! for matrix multiplication") report that most of their GF(2) schemes lift to Z (from
//! memory): the integer point is there, the choice of the solution misses it.
//!
//! Write each sign as `(-1)^s` with s in GF(2). A term contributes to cell (i, j, k) when
//! its three coefficients there are nonzero; its sign is `(-1)^(s_u + s_v + s_w)`. A cell
//! with c contributions and tensor entry T is right exactly when `(c - T) / 2` of them are
//! negative. The parity of that count is linear in s: these equations are the first Hensel
//! step with the zero coefficients frozen (the GF(2) Jacobian of [`super::hensel`]
//! restricted to the nonzero coefficients). A cell with c <= 2 (and T in {-1, 0, 1}) is
//! then right for every solution; a cell with more contributions may still have the wrong
//! count (three contributions to an entry 1 need one negative, the parity also allows
//! three). A local search over the solutions of the linear system (moves: adding a kernel
//! basis vector; a walk in the manner of WalkSAT, common practice) makes those counts
//! exact. The result is **verified exactly over Q** before it is returned.
//!
//! Invariant: a returned scheme verifies against the tensor and has every coefficient in
//! {-1, 0, 1}, the zeros exactly those of the GF(2) scheme.

use super::flip::FastRng;
use super::hensel_step::{Kernel, jacobian};
use crate::scalar::{FieldSpec, Q};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use num_traits::{ToPrimitive, Zero};

/// Settings of a sign lift.
#[derive(Clone, Debug)]
pub struct SignLiftParams {
    /// Local-search steps (one move each) over all restarts.
    pub max_steps: u64,
    /// Steps of one restart from a random solution of the linear system.
    pub restart_steps: u64,
    /// Probability (in 1/256) of a random move instead of the best one.
    pub noise: u32,
    pub seed: u64,
    /// Largest tensor (cells `d0 d1 d2`) attempted.
    pub max_cells: usize,
}

impl Default for SignLiftParams {
    fn default() -> Self {
        SignLiftParams {
            max_steps: 200_000,
            restart_steps: 20_000,
            noise: 48,
            seed: 1,
            max_cells: 1 << 22,
        }
    }
}

/// One contribution of a term to a cell whose count the parity does not settle: the
/// columns (sign unknowns) of its three coefficients.
struct Contribution {
    cell: usize,
    cols: [usize; 3],
}

/// The sign lift of `s` (a scheme over GF(2)) to a scheme of `t` (a tensor over Q with
/// integer entries) with coefficients in {-1, 0, 1}, or `None` when there is none within
/// the step budget (or the tensor is not integral, or too large). Verified exactly.
/// Cost: one GF(2) elimination of the `cells x nonzeros` parity system, then
/// `params.max_steps` local-search steps of O(moves touching a cell x contributions).
pub fn lift_signs(s: &Scheme, t: &Tensor, params: &SignLiftParams) -> Option<Scheme> {
    if s.field != FieldSpec::Prime(2) || t.field() != FieldSpec::Rational || s.dims != t.dims() {
        return None;
    }
    let d = s.dims;
    let cells = d[0] * d[1] * d[2];
    if cells > params.max_cells {
        return None;
    }
    let mut target = vec![0i64; cells];
    for (i, j, k, c) in t.entries() {
        if !c.is_integer() {
            return None;
        }
        target[(i * d[1] + j) * d[2] + k] = c.to_integer().to_i64()?;
    }
    let len = d[0] + d[1] + d[2];
    let rank = s.rank();
    // the GF(2) coefficients in the layout of the lift (per term: u, v, w)
    let mut x0 = Vec::with_capacity(rank * len);
    for tt in 0..rank {
        for f in [&s.u[tt], &s.v[tt], &s.w[tt]] {
            x0.extend(f.iter().map(|e| u64::from(!e.is_zero())));
        }
    }
    // sign unknowns: the nonzero coefficients
    let mut col_of = vec![usize::MAX; x0.len()];
    let mut n = 0;
    for (i, &v) in x0.iter().enumerate() {
        if v == 1 {
            col_of[i] = n;
            n += 1;
        }
    }
    // the contributions per cell
    let mut count = vec![0i64; cells];
    let mut contribs: Vec<Contribution> = Vec::new();
    for tt in 0..rank {
        let b = &x0[tt * len..(tt + 1) * len];
        let nz = |lo: usize, hi: usize| (lo..hi).filter(|&e| b[e] == 1).collect::<Vec<_>>();
        let (us, vs, ws) = (nz(0, d[0]), nz(d[0], d[0] + d[1]), nz(d[0] + d[1], len));
        for &i in &us {
            for &j in &vs {
                for &k in &ws {
                    let cell = (i * d[1] + (j - d[0])) * d[2] + (k - d[0] - d[1]);
                    count[cell] += 1;
                    contribs.push(Contribution {
                        cell,
                        cols: [
                            col_of[tt * len + i],
                            col_of[tt * len + j],
                            col_of[tt * len + k],
                        ],
                    });
                }
            }
        }
    }
    // negatives needed per cell: (c - T) / 2, between 0 and c
    let mut need = vec![0i64; cells];
    for c in 0..cells {
        let (cnt, tv) = (count[c], target[c]);
        if (cnt - tv) % 2 != 0 || tv.abs() > cnt {
            return None;
        }
        need[c] = (cnt - tv) / 2;
    }
    // the parity system: the GF(2) Jacobian restricted to the nonzero coefficients
    let jac: Vec<Vec<(usize, u64)>> = jacobian(&x0, d, rank, 2)
        .into_iter()
        .map(|row| {
            row.into_iter()
                .filter(|&(u, v)| v & 1 == 1 && col_of[u] != usize::MAX)
                .map(|(u, _)| (col_of[u], 1))
                .collect()
        })
        .collect();
    let kernel = Kernel::bits(jac, n, None, &super::halt::Halt::default())?;
    let rhs: Vec<u64> = need.iter().map(|&x| (x & 1) as u64).collect();
    let particular = kernel.solve(&rhs, n)?;
    // cells whose count the parity leaves open
    let open = |c: usize| count[c] >= 2 && (need[c] >= 2 || need[c] + 2 <= count[c]);
    contribs.retain(|x| open(x.cell));
    let mut signs: Vec<bool> = particular.iter().map(|&b| b == 1).collect();
    if !contribs.is_empty() {
        let basis = kernel.null_basis_bits(n);
        signs = search_signs(signs, &basis, &contribs, &need, params)?;
    }
    // the scheme over Z
    let mut out = Scheme::empty(FieldSpec::Rational, d);
    let value = |i: usize| match col_of[i] {
        usize::MAX => Q::zero(),
        c if signs[c] => Q::from_integer((-1).into()),
        _ => Q::from_integer(1.into()),
    };
    for tt in 0..rank {
        let f = |lo: usize, hi: usize| (lo..hi).map(|e| value(tt * len + e)).collect();
        out.push(f(0, d[0]), f(d[0], d[0] + d[1]), f(d[0] + d[1], len));
    }
    verify(&out, t).is_ok().then_some(out)
}

/// A local search over `start + span(basis)` for signs giving every open cell its number
/// of negative contributions; `None` when the step budget runs out.
fn search_signs(
    start: Vec<bool>,
    basis: &[Vec<u64>],
    contribs: &[Contribution],
    need: &[i64],
    params: &SignLiftParams,
) -> Option<Vec<bool>> {
    let bit = |v: &[u64], c: usize| v[c / 64] >> (c % 64) & 1 == 1;
    // the moves: basis vectors that flip at least one open contribution
    let moves: Vec<(&Vec<u64>, Vec<usize>)> = basis
        .iter()
        .filter_map(|b| {
            let flips: Vec<usize> = contribs
                .iter()
                .enumerate()
                .filter(|(_, x)| x.cols.iter().filter(|&&c| bit(b, c)).count() % 2 == 1)
                .map(|(i, _)| i)
                .collect();
            (!flips.is_empty()).then_some((b, flips))
        })
        .collect();
    // open cells, renumbered, and the moves touching each
    let mut cell_id = std::collections::HashMap::new();
    for x in contribs {
        let next = cell_id.len();
        cell_id.entry(x.cell).or_insert(next);
    }
    let cells = cell_id.len();
    let mut need_of = vec![0i64; cells];
    for (&c, &id) in &cell_id {
        need_of[id] = need[c];
    }
    let cid: Vec<usize> = contribs.iter().map(|x| cell_id[&x.cell]).collect();
    let mut touching = vec![Vec::new(); cells];
    for (m, (_, flips)) in moves.iter().enumerate() {
        for &f in flips {
            if touching[cid[f]].last() != Some(&m) {
                touching[cid[f]].push(m);
            }
        }
    }
    let mut rng = FastRng::new(params.seed);
    let mut steps = 0u64;
    let mut delta_neg = vec![0i64; cells];
    while steps < params.max_steps {
        // a random solution of the linear system
        let mut x = start.clone();
        for (b, _) in &moves {
            if rng.next_u64() & 1 == 1 {
                for (c, xc) in x.iter_mut().enumerate() {
                    *xc ^= bit(b, c);
                }
            }
        }
        let mut neg_c: Vec<bool> = contribs
            .iter()
            .map(|k| k.cols.iter().filter(|&&c| x[c]).count() % 2 == 1)
            .collect();
        let mut neg = vec![0i64; cells];
        for (k, &ng) in neg_c.iter().enumerate() {
            neg[cid[k]] += i64::from(ng);
        }
        let mut bad: Vec<usize> = (0..cells).filter(|&c| neg[c] != need_of[c]).collect();
        let mut local = 0u64;
        while local < params.restart_steps && steps < params.max_steps {
            if bad.is_empty() {
                return Some(x);
            }
            steps += 1;
            local += 1;
            let cell = bad[rng.below(bad.len())];
            let cands = &touching[cell];
            if cands.is_empty() {
                break;
            }
            // the change of the total error of each candidate move
            let gain = |m: usize, delta_neg: &mut [i64]| -> i64 {
                let flips = &moves[m].1;
                for &f in flips {
                    delta_neg[cid[f]] += if neg_c[f] { -1 } else { 1 };
                }
                let mut g = 0;
                for &f in flips {
                    let c = cid[f];
                    if delta_neg[c] != 0 {
                        g += (neg[c] + delta_neg[c] - need_of[c]).abs()
                            - (neg[c] - need_of[c]).abs();
                        delta_neg[c] = 0;
                    }
                }
                g
            };
            let pick = if rng.next_u64() % 256 < u64::from(params.noise) {
                cands[rng.below(cands.len())]
            } else {
                let mut best = (i64::MAX, 0usize);
                for &m in cands {
                    let g = gain(m, &mut delta_neg);
                    let tie = rng.next_u64() & 1 == 1;
                    if g < best.0 || (g == best.0 && tie) {
                        best = (g, m);
                    }
                }
                best.1
            };
            let (b, flips) = &moves[pick];
            for (c, xc) in x.iter_mut().enumerate() {
                *xc ^= bit(b, c);
            }
            for &f in flips {
                neg[cid[f]] += if neg_c[f] { -1 } else { 1 };
                neg_c[f] = !neg_c[f];
            }
            bad.clear();
            bad.extend((0..cells).filter(|&c| neg[c] != need_of[c]));
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every stored scheme over Q with coefficients in {-1, 0, 1} (Strassen 1969 for
    /// <2,2,2>, and the schemes bilin found), reduced mod 2, lifts back by signs; the
    /// scheme it gives has coefficients in {-1, 0, 1} and verifies.
    #[test]
    fn unit_schemes_reduced_mod_2_lift_by_signs() {
        let unit = |x: &Q| x.is_zero() || x.numer().magnitude() == x.denom().magnitude();
        let mut lifted_some = 0;
        for st in crate::catalog::STORED_SCHEMES {
            // a scheme stored over GF(p) was kept there because it did not lift
            if st.field().is_some_and(|f| f != FieldSpec::Rational) {
                continue;
            }
            let s = st.read().unwrap();
            if !s.u.iter().chain(&s.v).chain(&s.w).flatten().all(unit) {
                continue;
            }
            let t = crate::catalog::find_entry(st.entry)
                .unwrap()
                .tensor()
                .unwrap();
            let red = s.with_field(FieldSpec::Prime(2)).unwrap();
            let z = lift_signs(&red, &t, &SignLiftParams::default())
                .unwrap_or_else(|| panic!("sign lift of {}", st.file));
            assert_eq!(z.rank(), s.rank());
            assert!(verify(&z, &t).is_ok());
            assert!(z.u.iter().chain(&z.v).chain(&z.w).flatten().all(unit));
            lifted_some += 1;
        }
        assert!(lifted_some >= 2, "Strassen's scheme and more");
    }

    /// <1,1,1> (one product): three copies of the term lift as 1 + 1 - 1 (the count of
    /// negatives is not settled by its parity: the local search sets it); four copies do
    /// not hold over GF(2) and are refused.
    #[test]
    fn wrong_parity_is_refused() {
        let t = crate::search::tests::matmul(1, 1, 1);
        let mut s = Scheme::empty(FieldSpec::Prime(2), [1, 1, 1]);
        let one = || vec![Q::from_integer(1.into())];
        for _ in 0..3 {
            s.push(one(), one(), one());
        }
        let z = lift_signs(&s, &t, &SignLiftParams::default()).expect("1 + 1 - 1");
        assert!(verify(&z, &t).is_ok());
        s.push(one(), one(), one());
        assert!(lift_signs(&s, &t, &SignLiftParams::default()).is_none());
    }
}
