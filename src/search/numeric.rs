//! The numerical route to exact schemes, shared by every caller that wants an exact
//! low-rank decomposition of a tensor over Q: a floating-point fit (alternating least
//! squares, [`super::als`], or Levenberg-Marquardt with bounded norms, [`super::lm`]),
//! rounding by rational reconstruction, an exact solve of the result factors and an exact
//! check. Floating point only *finds*; [`crate::scheme::verify`] *confirms*.
//!
//! A converged fit is first read as it is ([`super::recover`]): when the decomposition is
//! unique and rational (data built from integer factors), its directions are rational and
//! their common denominators give the exact factors at once.
//!
//! Rounding (otherwise): the sparsification and rounding of a fit's factors to simple
//! values (Tichavsky, Phan and Cichocki 2017, "Numerical CP decomposition of some difficult
//! tensors"), carried out in batches. Each term is scaled so that one entry of its left and
//! right factors is 1 (the scaling freedom of a term): its largest entry first (the better
//! conditioned re-fits), then its first significant entry (evaluation-style factors
//! `(1, a, a^2, ...)` keep their shape). Then, repeatedly, free entries of the left and right
//! factors are frozen at rationals and the free entries are re-fitted: first every entry
//! within round-off of a simple rational, or of a simple multiple of a frozen entry of
//! its factor (all at once: they are determined by the entries frozen before, such as the
//! powers (-3/4)^k of a frozen evaluation point); when there is none, the fit is polished
//! to the limit of f64 and entries within 1e-12 of a rational of denominator up to 30 000
//! are taken too; else a *batch* of entries, each moved to a rational within a radius
//! of it (at radii from 1e-6 to `radius`, the rational of least denominator, by continued
//! fractions; no fixed list of denominators), taken in the order: the entries next to
//! their factor's normalised 1 first (the others are often functions of them, such as the
//! powers of an evaluation point), then the least cost `q^2 (1 + move / 0.05)` (a near
//! point of small denominator over a far integer, which sends several evaluation points
//! to one value, and over a nearer value of large denominator, whose powers run out of
//! reach), then the smallest move. The batch starts at a fraction of the free entries
//! (`batch`); a batch after which the fit does not return to round-off level is undone and
//! halved (bisection, down to one freeze), an accepted one doubles the next. A single freeze
//! that breaks the fit is banned; when every candidate is banned, the bans are lifted once
//! if a freeze has succeeded since (the fit has moved); `max_stuck` refused freezes in a row
//! end the rounding (a dead end: the freezes so far leave no rational point within reach),
//! and the same fit is rounded again with its rows taken in another random order
//! (`reorders` times), which costs far less than a new fit. Each re-fit stops early on a
//! plateau and within a budget of arithmetic ([`super::lm::relax`]); a fit of
//! Levenberg-Marquardt is rounded with cautious re-fits and then with Gauss-Newton ones
//! ([`super::lm::fast_refits`]), which a fit inside a family of schemes needs. When every left and
//! right entry is frozen, the result factors are solved for exactly over Q (the Brent
//! equations are linear in them) and the scheme is verified exactly.
//!
//! Invariant: [`numeric_run`] returns only schemes verified exactly against the tensor.

use crate::linalg::{Matrix, solve};
use crate::scalar::{FieldSpec, Q, Rationals, q, q_to_f64};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use nalgebra::DMatrix;
use num_traits::Zero;
use rand::seq::SliceRandom;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;

/// The numerical fit.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Fit {
    /// Regularised alternating least squares ([`super::als`]).
    Als,
    /// Levenberg-Marquardt with bounded norms ([`super::lm`]).
    Lm,
}

/// Settings of the rounding phase.
#[derive(Clone, Debug)]
pub struct RoundParams {
    /// Largest denominator of a chosen freeze.
    pub max_denominator: i64,
    /// Entries within `tight_radius / q` (relative) of a rational `p/q` with q up to this
    /// are frozen there at once (they are determined by the entries frozen before).
    pub tight_denominator: i64,
    pub tight_radius: f64,
    /// When no entry is that close, the fit is polished (re-fitted towards `polish_tol`,
    /// where f64 leaves its entries accurate to about 1e-13) and entries within
    /// `deep_radius` (relative) of a rational with a denominator up to `deep_denominator`
    /// are frozen there at once: the powers of an evaluation point such as
    /// (-3/4)^5 = -243/1024. The chance that an entry falls that close to such a rational
    /// is about `deep_radius` times the number of them in a unit interval (0.3 q^2):
    /// 3e-4 at the defaults.
    pub deep_denominator: i64,
    pub deep_radius: f64,
    pub polish_tol: f64,
    /// Largest move of one freeze (absolute).
    pub radius: f64,
    /// Relative error accepted after a freeze (the exact check decides at the end).
    pub tol: f64,
    /// Rejected freezes that end the rounding.
    pub max_rejects: usize,
    /// Rejected freezes in a row that end the rounding (a dead end: the entries frozen so
    /// far leave no rational point within reach).
    pub max_stuck: usize,
    /// Freezes tried together at first, as a fraction of the free entries (at least one):
    /// the batch is halved after a refused batch (bisection down to a single freeze) and
    /// doubled after an accepted one.
    pub batch: f64,
    /// Normalisation: the first entry of a left or right factor at least this fraction of
    /// its largest becomes 1 (small: evaluation-style factors `(1, a, a^2, ...)` keep their
    /// shape; large: better conditioned refits).
    pub lead: f64,
    /// Order of the rows within each factor when the freezes are chosen (`None`: the
    /// natural order; a seed: a random order, for another rounding of the same fit).
    pub order_seed: Option<u64>,
    /// Roundings of one fit in random row orders after the two in the natural order (a
    /// rounding that ends in a dead end costs far less than a new fit).
    pub reorders: usize,
}

impl Default for RoundParams {
    fn default() -> Self {
        RoundParams {
            max_denominator: 64,
            tight_denominator: 1000,
            deep_denominator: 30_000,
            deep_radius: 1e-12,
            polish_tol: 1e-14,
            tight_radius: 1e-8,
            radius: 0.75,
            tol: 1e-9,
            max_rejects: 200,
            max_stuck: 16,
            batch: 0.125,
            lead: 1e-3,
            order_seed: None,
            reorders: 6,
        }
    }
}

/// The tensor as dense f64 plus its sparse entry list, divided by its largest entry in
/// absolute value (`scale`), so that the factor bounds of the fits mean the same for a
/// table of 0s and 1s and for a user's array with entries in the millions. The scaling
/// changes no rank and no scheme up to the scale of the result factors, which the exact
/// solve recomputes against the tensor itself.
pub struct Dense {
    pub dims: [usize; 3],
    pub data: Vec<f64>,
    pub entries: Vec<([usize; 3], f64)>,
    pub norm: f64,
    /// The largest entry in absolute value of the tensor (1 for the zero tensor).
    pub scale: f64,
}

impl Dense {
    pub fn new(t: &Tensor) -> Dense {
        let d = t.dims();
        let raw: Vec<([usize; 3], f64)> = t
            .entries()
            .map(|(i, j, k, c)| ([i, j, k], q_to_f64(c)))
            .collect();
        let big = raw.iter().fold(0.0f64, |m, e| m.max(e.1.abs()));
        let scale = if big > 0.0 && big.is_finite() {
            big
        } else {
            1.0
        };
        let mut data = vec![0.0; d[0] * d[1] * d[2]];
        let mut entries = Vec::with_capacity(raw.len());
        for ([i, j, k], v) in raw {
            let v = v / scale;
            data[(i * d[1] + j) * d[2] + k] = v;
            entries.push(([i, j, k], v));
        }
        let norm = data.iter().map(|x| x * x).sum::<f64>().sqrt().max(1e-300);
        Dense {
            dims: d,
            data,
            entries,
            norm,
            scale,
        }
    }
}

/// A re-fit of the free entries towards a relative error (true when reached).
pub type Relax<'a> = dyn Fn(&Dense, &mut Factors, f64) -> bool + 'a;

/// A frozen entry: the rational `p/q`.
pub type Frozen = Option<(i64, i64)>;

/// Factor matrices `F_a` (`d_a x r`) plus the frozen mask, indexed `row * r + term`.
#[derive(Clone)]
pub struct Factors {
    pub f: [DMatrix<f64>; 3],
    pub frozen: [Vec<Frozen>; 3],
}

impl Factors {
    pub fn random(t: &Dense, r: usize, rng: &mut ChaCha8Rng) -> Factors {
        let mk = |n: usize, rng: &mut ChaCha8Rng| {
            DMatrix::from_fn(n, r, |_, _| rng.gen_range(-1.0..1.0))
        };
        Factors {
            f: [mk(t.dims[0], rng), mk(t.dims[1], rng), mk(t.dims[2], rng)],
            frozen: [
                vec![None; t.dims[0] * r],
                vec![None; t.dims[1] * r],
                vec![None; t.dims[2] * r],
            ],
        }
    }

    pub fn rank(&self) -> usize {
        self.f[0].ncols()
    }

    pub fn any_frozen(&self) -> bool {
        self.frozen.iter().any(|f| f.iter().any(Option::is_some))
    }

    /// Relative residual `||T - model|| / ||T||`. Cost O(d0 d1 d2 r).
    pub fn error(&self, t: &Dense) -> f64 {
        let d = t.dims;
        let r = self.rank();
        let mut s = 0.0;
        for i in 0..d[0] {
            for j in 0..d[1] {
                for k in 0..d[2] {
                    let mut m = 0.0;
                    for x in 0..r {
                        m += self.f[0][(i, x)] * self.f[1][(j, x)] * self.f[2][(k, x)];
                    }
                    let e = t.data[(i * d[1] + j) * d[2] + k] - m;
                    s += e * e;
                }
            }
        }
        s.sqrt() / t.norm
    }

    /// Rescale each term so its three factors have equal norms (only when nothing frozen).
    pub fn balance(&mut self) {
        if self.any_frozen() {
            return;
        }
        for x in 0..self.rank() {
            let n: Vec<f64> = (0..3).map(|a| self.f[a].column(x).norm()).collect();
            if n.iter().any(|&v| v < 1e-300) {
                continue;
            }
            let g = (n[0] * n[1] * n[2]).cbrt();
            for (a, na) in n.iter().enumerate() {
                let s = g / na;
                self.f[a].column_mut(x).scale_mut(s);
            }
        }
    }

    /// Scale each term so that the first significant entry (at least `lead` times the
    /// largest) of its left and right factors is 1, moving the scale into the result, and
    /// freeze those entries at 1 (the scaling is a symmetry, so this loses no solution).
    pub fn normalise(&mut self, lead: f64) {
        let r = self.rank();
        for x in 0..r {
            for a in 0..2 {
                let col = self.f[a].column(x);
                let big = col.iter().fold(0.0f64, |m, v| m.max(v.abs()));
                if big < 1e-12 {
                    continue;
                }
                let (i, &first) = col
                    .iter()
                    .enumerate()
                    .find(|(_, v)| v.abs() >= lead * big)
                    .expect("entry");
                self.f[a].column_mut(x).scale_mut(1.0 / first);
                self.f[2].column_mut(x).scale_mut(first);
                self.f[a][(i, x)] = 1.0;
                self.frozen[a][i * r + x] = Some((1, 1));
            }
        }
    }

    pub fn max_abs(&self) -> f64 {
        self.f
            .iter()
            .flat_map(|m| m.iter())
            .fold(0.0, |a, &b| a.max(b.abs()))
    }
}

/// The rational of least denominator in `[lo, hi]` (ties: least numerator in absolute
/// value), by the continued-fraction recursion; `None` beyond `max_den`.
pub fn simplest_rational(lo: f64, hi: f64, max_den: i64) -> Option<(i64, i64)> {
    fn go(lo: f64, hi: f64, depth: u32) -> Option<(i128, i128)> {
        if depth > 40 || !lo.is_finite() || !hi.is_finite() || hi - lo < 0.0 {
            return None;
        }
        if lo <= 0.0 && hi >= 0.0 {
            return Some((0, 1));
        }
        if hi < 0.0 {
            return go(-hi, -lo, depth + 1).map(|(p, q)| (-p, q));
        }
        let c = lo.ceil();
        if c <= hi {
            return (c.abs() < 1e15).then_some((c as i128, 1));
        }
        let fl = lo.floor();
        // lo, hi in (fl, fl + 1): fl + 1 / y with y in [1/(hi - fl), 1/(lo - fl)]
        let (p, q) = go(1.0 / (hi - fl), 1.0 / (lo - fl), depth + 1)?;
        Some((fl as i128 * p + q, p))
    }
    let (p, q) = go(lo, hi, 0)?;
    (q <= max_den as i128 && p.abs() <= i64::MAX as i128).then_some((p as i64, q as i64))
}

/// The rational of least denominator (up to `max_den`) within `radius` (relative) of `x`.
fn rational_within(x: f64, radius: f64, max_den: i64) -> Option<(i64, i64)> {
    let r = radius * x.abs().max(1.0);
    simplest_rational(x - r, x + r, max_den)
}

/// The rational an entry `x` of a fit is taken to equal at once: within
/// `radius / q` (relative) of `p/q` with `q <= max_den` (a chance match is rare: about
/// `2 radius max_den` for a random entry).
fn tight_rational(x: f64, radius: f64, max_den: i64) -> Option<(i64, i64)> {
    let r = radius * x.abs().max(1.0);
    rational_within(x, radius, max_den)
        .filter(|&(n, d)| (x - n as f64 / d as f64).abs() <= r / d as f64)
}

/// `(a/b) (c/d)` in lowest terms, `None` past 64 bits.
fn rational_product((a, b): (i64, i64), (c, d): (i64, i64)) -> Option<(i64, i64)> {
    let x = num_rational::Ratio::<i128>::new(a.into(), b.into())
        * num_rational::Ratio::<i128>::new(c.into(), d.into());
    Some((
        i64::try_from(*x.numer()).ok()?,
        i64::try_from(*x.denom()).ok()?,
    ))
}

/// A freeze candidate: ((free entries above it in its factor, cost, distance), axis,
/// entry, p/q).
type Candidate = ((i64, f64, f64), usize, usize, (i64, i64));

/// The distance at which a move costs as much again as its denominator.
const MOVE_SCALE: f64 = 0.05;

/// The cost of freezing an entry at `p/q`, `dist` away from its fitted value:
/// `q^2 (1 + dist / MOVE_SCALE)`. On a fit near an exact scheme of simple values it orders
/// by denominator; on a fit inside a family of schemes (the evaluation points of a
/// polynomial product) it prefers a near value of small denominator to a far integer,
/// which would send several points to the same value, and to a nearer value of larger
/// denominator, whose powers (the other entries of an evaluation factor) need
/// denominators beyond reach: 1/2 over 5/8 for 0.627.
fn freeze_cost(q: i64, dist: f64) -> f64 {
    (q as f64).powi(2) * (1.0 + dist / MOVE_SCALE)
}

/// The radii at which the simplest nearby rational of an entry is taken.
const RADII: [f64; 6] = [1e-6, 1e-4, 1e-2, 0.1, 0.3, 0.75];

/// The rounding phase: freeze left and right entries at rationals, re-fitting the free
/// entries with `relax` (true when the fit returns below the tolerance). Each re-fit
/// settles a batch of freezes (see the module notes); `stop` is polled before each.
/// Cost: one `relax` per batch tried; at most `max_rejects` refused single freezes.
pub fn round_factors(
    t: &Dense,
    mut s: Factors,
    p: &RoundParams,
    relax: &Relax,
    stop: &dyn Fn() -> bool,
) -> Option<Factors> {
    s.normalise(p.lead);
    if !relax(t, &mut s, p.tol) {
        return None;
    }
    let r = s.rank();
    let rows = |n: usize| -> Vec<usize> {
        let mut v: Vec<usize> = (0..n).collect();
        if let Some(seed) = p.order_seed {
            v.shuffle(&mut ChaCha8Rng::seed_from_u64(seed ^ n as u64));
        }
        v
    };
    let rows = [rows(t.dims[0]), rows(t.dims[1])];
    // the position (in the row order) of each term's normalised entry, per axis
    let pivots: [Vec<Option<usize>>; 2] = std::array::from_fn(|a| {
        (0..r)
            .map(|x| {
                rows[a]
                    .iter()
                    .position(|&i| s.frozen[a][i * r + x] == Some((1, 1)))
            })
            .collect()
    });
    let mut banned: Vec<(usize, usize, (i64, i64))> = Vec::new();
    let (mut rejects, mut stuck) = (0, 0);
    // a freeze succeeded since the bans were last lifted
    let mut moved = false;
    // freezes tried together next (set from `p.batch` at the first choice)
    let mut size = usize::MAX;
    // the fit has been polished since the last accepted freeze
    let mut polished = false;
    loop {
        if stop() {
            return None;
        }
        let mut cands: Vec<Candidate> = Vec::new();
        let mut tight = Vec::new();
        let mut free = 0usize;
        for (a, order_a) in rows.iter().enumerate() {
            // the positions of the free entries of each term, in the row order
            let mut free_at = vec![Vec::new(); r];
            for (pos, &i) in order_a.iter().enumerate() {
                for (x, at) in free_at.iter_mut().enumerate() {
                    if s.frozen[a][i * r + x].is_none() {
                        at.push(pos);
                    }
                }
            }
            for (pos, e) in order_a
                .iter()
                .enumerate()
                .flat_map(|(pos, &i)| (0..r).map(move |x| (pos, i * r + x)))
            {
                if s.frozen[a][e].is_some() {
                    continue;
                }
                free += 1;
                // free entries between it and its term's normalised entry (before it
                // when none): the entries next to the 1 go first, as the point of an
                // evaluation-style factor (..., 1/a, 1, a, a^2, ...) is
                let order = match pivots[a][e % r] {
                    Some(pp) => free_at[e % r]
                        .iter()
                        .filter(|&&q| pp.min(pos) < q && q < pp.max(pos))
                        .count(),
                    None => free_at[e % r].iter().filter(|&&q| q < pos).count(),
                };
                let x = s.f[a][(e / r, e % r)];
                // (a tight freeze that broke the fit, such as a small power of an
                // evaluation point read as 0, is banned and the entry chosen as the others)
                // else a simple multiple of a frozen entry of the same factor: the
                // powers of an evaluation point, (-3/4)^6 = -3/4 (-3/4)^5
                let of_frozen = || {
                    (0..s.f[a].nrows()).find_map(|i| {
                        let (n, d) = s.frozen[a][i * r + e % r].filter(|f| f.0 != 0)?;
                        let ratio = x * d as f64 / n as f64;
                        let (rn, rd) = tight_rational(ratio, p.tight_radius, p.tight_denominator)?;
                        rational_product((rn, rd), (n, d))
                            .filter(|&pq| !banned.contains(&(a, e, pq)))
                    })
                };
                if let Some(pq) = tight_rational(x, p.tight_radius, p.tight_denominator)
                    .filter(|&pq| !banned.contains(&(a, e, pq)))
                    .or_else(of_frozen)
                {
                    tight.push((a, e, pq));
                    continue;
                }
                let mut seen: Vec<(i64, i64)> = Vec::new();
                for rad in RADII.iter().filter(|&&x| x <= p.radius) {
                    let Some(pq) = simplest_rational(x - rad, x + rad, p.max_denominator) else {
                        continue;
                    };
                    if seen.contains(&pq) || banned.contains(&(a, e, pq)) {
                        continue;
                    }
                    seen.push(pq);
                    let dist = (x - pq.0 as f64 / pq.1 as f64).abs();
                    cands.push(((order as i64, freeze_cost(pq.1, dist), dist), a, e, pq));
                }
            }
        }
        if free == 0 {
            return Some(s);
        }
        if tight.is_empty() && !polished {
            // the entries determined by the frozen ones, to more digits
            polished = true;
            let mut fine = s.clone();
            relax(t, &mut fine, p.polish_tol);
            if fine.error(t) <= s.error(t) {
                s = fine;
            }
            for (a, frozen) in s.frozen.iter().enumerate().take(2) {
                for (e, _) in frozen.iter().enumerate().filter(|(_, f)| f.is_none()) {
                    let x = s.f[a][(e / r, e % r)];
                    if let Some(pq) = rational_within(x, p.deep_radius, p.deep_denominator)
                        .filter(|&pq| !banned.contains(&(a, e, pq)))
                    {
                        tight.push((a, e, pq));
                    }
                }
            }
            if tight.is_empty() {
                // choose from the polished fit
                continue;
            }
        }
        let chosen = tight.is_empty();
        let batch: Vec<(usize, usize, (i64, i64))> = if !chosen {
            tight
        } else {
            // the entries next to their factor's 1 first (the others are often
            // functions of them), then the least cost, then the smallest move; one
            // freeze per entry
            cands.sort_by(|x, y| {
                x.0.0
                    .cmp(&y.0.0)
                    .then(x.0.1.total_cmp(&y.0.1))
                    .then(x.0.2.total_cmp(&y.0.2))
            });
            let mut taken = [
                vec![false; s.frozen[0].len()],
                vec![false; s.frozen[1].len()],
            ];
            cands.retain(|c| !std::mem::replace(&mut taken[c.1][c.2], true));
            if cands.is_empty() {
                // every candidate refused: after a successful freeze the fit has moved,
                // so the refused ones get one more chance
                if !moved {
                    return None;
                }
                moved = false;
                banned.clear();
                continue;
            }
            let first = ((free as f64 * p.batch).ceil() as usize).max(1);
            cands
                .iter()
                .take(size.min(first))
                .map(|c| (c.1, c.2, c.3))
                .collect()
        };
        let saved = s.clone();
        for &(a, e, pq) in &batch {
            s.frozen[a][e] = Some(pq);
            s.f[a][(e / r, e % r)] = pq.0 as f64 / pq.1 as f64;
        }
        if relax(t, &mut s, p.tol) {
            moved = true;
            polished = false;
            stuck = 0;
            if chosen {
                size = batch.len().saturating_mul(2);
            }
            continue;
        }
        s = saved;
        if chosen && batch.len() > 1 {
            // bisection: the better half of the batch next
            size = batch.len() / 2;
            continue;
        }
        // a single freeze (or a batch of determined entries) that breaks the fit
        banned.push(batch[0]);
        rejects += 1;
        stuck += 1;
        if rejects > p.max_rejects || stuck > p.max_stuck {
            return None;
        }
    }
}

/// The exact scheme of rounded factors: left and right factors as frozen, result factors
/// solved exactly, terms with a zero factor dropped, then verified.
pub fn exact_scheme(t: &Tensor, s: &Factors) -> Option<Scheme> {
    let d = t.dims();
    let r = s.rank();
    let uv = |a: usize, x: usize| -> Option<Vec<Q>> {
        (0..d[a])
            .map(|i| s.frozen[a][i * r + x].map(|(n, m)| q(n, m)))
            .collect()
    };
    let us: Vec<Vec<Q>> = (0..r).map(|x| uv(0, x)).collect::<Option<_>>()?;
    let vs: Vec<Vec<Q>> = (0..r).map(|x| uv(1, x)).collect::<Option<_>>()?;
    scheme_from_left_right(t, us, vs)
}

/// The scheme with exact left and right factors `us`, `vs` and the result factors solved
/// for exactly ([`solve_result_factors`]), terms with a zero factor dropped, verified
/// exactly against `t`; `None` when the result factors have no solution.
/// Cost: that of [`solve_result_factors`] plus one verification.
pub fn scheme_from_left_right(t: &Tensor, us: Vec<Vec<Q>>, vs: Vec<Vec<Q>>) -> Option<Scheme> {
    let ws = solve_result_factors(t, &us, &vs)?;
    let mut out = Scheme::empty(FieldSpec::Rational, t.dims());
    let zero = |v: &Vec<Q>| v.iter().all(Zero::is_zero);
    for ((u, v), w) in us.into_iter().zip(vs).zip(ws) {
        if !(zero(&u) || zero(&v) || zero(&w)) {
            out.push(u, v, w);
        }
    }
    verify(&out, t).ok().map(|_| out)
}

/// Given exact left and right factors, solve the Brent equations (linear in the result
/// factors) exactly over Q: for each k, `sum_t u_t[i] v_t[j] w_t[k] = c[i][j][k]`.
/// Returns `w_t` for each term, or `None` when the system has no solution.
/// Cost: d2 exact eliminations of a `d0 d1 x r` system.
pub fn solve_result_factors(t: &Tensor, us: &[Vec<Q>], vs: &[Vec<Q>]) -> Option<Vec<Vec<Q>>> {
    let d = t.dims();
    let r = us.len();
    let mut a = Matrix::zeros(&Rationals, d[0] * d[1], r);
    for x in 0..r {
        for i in 0..d[0] {
            for j in 0..d[1] {
                a[(i * d[1] + j, x)] = &us[x][i] * &vs[x][j];
            }
        }
    }
    let mut ws = vec![vec![Q::zero(); d[2]]; r];
    for k in 0..d[2] {
        let b: Vec<Q> = (0..d[0] * d[1])
            .map(|ij| t.get(ij / d[1], ij % d[1], k))
            .collect();
        let sol = solve(&Rationals, &a, &b)?;
        for (w, x) in ws.iter_mut().zip(sol) {
            w[k] = x;
        }
    }
    Some(ws)
}

/// Settings of one numerical run.
#[derive(Clone, Debug)]
pub struct NumericParams {
    pub fit: Fit,
    pub als: super::als::AlsParams,
    pub lm: super::lm::LmParams,
    pub round: RoundParams,
}

impl Default for NumericParams {
    fn default() -> Self {
        NumericParams {
            fit: Fit::Lm,
            als: super::als::AlsParams::default(),
            lm: super::lm::LmParams::default(),
            round: RoundParams::default(),
        }
    }
}

/// What one numerical run came to.
#[derive(Clone, Debug, PartialEq)]
pub enum NumericOutcome {
    /// The fit did not converge at the rank asked (or the run was stopped first).
    NoFit,
    /// The fit converged, but no rounding of it verified.
    Unrounded,
    /// A scheme verified exactly over Q.
    Found(Scheme),
}

impl NumericOutcome {
    /// The verified scheme, if the run found one.
    pub fn scheme(self) -> Option<Scheme> {
        match self {
            NumericOutcome::Found(s) => Some(s),
            _ => None,
        }
    }

    /// True when the fit converged (whether or not it rounded): evidence that the rank
    /// asked is reachable over the reals, which the search uses to share its time.
    pub fn fitted(&self) -> bool {
        !matches!(self, NumericOutcome::NoFit)
    }
}

/// One numerical run from a random start (seeded by `rng`): fit at rank `r`, read the
/// fit as an exact decomposition or round it, solve the result factors exactly, verify.
/// Returns a scheme of rank at most `r` verified exactly over Q, or whether the fit
/// converged without rounding. `stop` is polled between iterations.
/// Cost: per iteration O(nnz(T) r + (d0 + d1 + d2) r^2 + r^3) (ALS) or
/// O((r (d0 + d1 + d2))^3) (Levenberg-Marquardt); each error check O(d0 d1 d2 r).
pub fn numeric_run(
    t: &Tensor,
    r: usize,
    p: &NumericParams,
    rng: &mut ChaCha8Rng,
    stop: &dyn Fn() -> bool,
) -> NumericOutcome {
    if t.field() != FieldSpec::Rational || r == 0 {
        return NumericOutcome::NoFit;
    }
    let dense = Dense::new(t);
    // an ill-conditioned tensor is fitted in whitened coordinates, the factors mapped back
    let pre = super::whiten::precondition(&dense);
    let work = pre.as_ref().map_or(&dense, |w| &w.work);
    let fitted = match p.fit {
        Fit::Als => super::als::converge(work, r, &p.als, rng, stop),
        Fit::Lm => super::lm::converge(work, r, &p.lm, rng, stop),
    };
    let Some(mut fitted) = fitted else {
        return NumericOutcome::NoFit;
    };
    if let Some(w) = &pre {
        w.map_back(&mut fitted);
    }
    // a unique decomposition made of rational directions is read off the fit at once
    if let Some(s) = super::recover::read_exact_scheme(t, &fitted) {
        return NumericOutcome::Found(s);
    }
    let relax_als =
        |t: &Dense, s: &mut Factors, tol: f64| super::als::relax(t, s, &p.als, tol, stop);
    let relax_lm = |t: &Dense, s: &mut Factors, tol: f64| super::lm::relax(t, s, &p.lm, tol, stop);
    let fast = super::lm::fast_refits(&p.lm);
    let relax_fast =
        |t: &Dense, s: &mut Factors, tol: f64| super::lm::relax(t, s, &fast, tol, stop);
    let relaxes: [&Relax; 2] = match p.fit {
        Fit::Als => [&relax_als, &relax_als],
        Fit::Lm => [&relax_lm, &relax_fast],
    };
    // the better conditioned normalisation first (largest entry 1), with cautious re-fits
    // (near an isolated scheme) and then with Gauss-Newton re-fits (inside a family of
    // schemes, such as the evaluation points of a polynomial product); then the
    // evaluation-style one (first entry 1); then other row orders, both re-fits in turn
    let seeds: Vec<u64> = (0..p.round.reorders).map(|_| rng.r#gen()).collect();
    let tries = [(0.99, None, 0), (0.99, None, 1), (p.round.lead, None, 0)]
        .into_iter()
        .chain(
            seeds
                .into_iter()
                .enumerate()
                .map(|(i, k)| (0.99, Some(k), i % 2)),
        );
    for (lead, order_seed, refit) in tries {
        if stop() {
            return NumericOutcome::Unrounded;
        }
        let rp = RoundParams {
            lead,
            order_seed,
            ..p.round.clone()
        };
        let found = round_factors(&dense, fitted.clone(), &rp, relaxes[refit], stop)
            .and_then(|rounded| exact_scheme(t, &rounded));
        if let Some(s) = found {
            return NumericOutcome::Found(s);
        }
    }
    NumericOutcome::Unrounded
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::search::tests::matmul;
    use std::cell::Cell;

    /// Batched rounding turns a converged fit of <2,2,2> at rank 7 (Strassen 1969,
    /// "Gaussian elimination is not optimal") and of <2,2,3> at rank 11 (Hopcroft and
    /// Kerr 1971, "On minimizing the number of multiplications necessary for matrix
    /// multiplication") into an exact scheme, re-fitting fewer times than it freezes.
    #[test]
    fn batched_rounding_of_matrix_products() {
        for (n, m, k, r) in [(2, 2, 2, 7), (2, 2, 3, 11)] {
            let t = matmul(n, m, k);
            let dense = Dense::new(&t);
            let p = NumericParams::default();
            let stop = || false;
            let fitted = (0..20)
                .find_map(|seed| {
                    let mut rng = ChaCha8Rng::seed_from_u64(seed);
                    super::super::lm::converge(&dense, r, &p.lm, &mut rng, &stop)
                })
                .expect("a converged fit");
            let relaxes = Cell::new(0);
            let relax = |d: &Dense, s: &mut Factors, tol: f64| {
                relaxes.set(relaxes.get() + 1);
                super::super::lm::relax(d, s, &p.lm, tol, &stop)
            };
            let rp = RoundParams {
                lead: 0.99,
                batch: 0.25,
                ..RoundParams::default()
            };
            let rounded = round_factors(&dense, fitted, &rp, &relax, &stop).expect("rounded");
            let s = exact_scheme(&t, &rounded).expect("an exact scheme");
            assert_eq!(s.rank(), r);
            assert!(verify(&s, &t).is_ok());
            // the left and right entries frozen after the normalisation (2r of them)
            let chosen = (n * m + m * k) * r - 2 * r;
            assert!(relaxes.get() < chosen, "{} re-fits", relaxes.get());
        }
    }

    #[test]
    fn simplest_rationals() {
        assert_eq!(simplest_rational(0.49, 0.51, 100), Some((1, 2)));
        assert_eq!(simplest_rational(-0.34, -0.33, 100), Some((-1, 3)));
        assert_eq!(simplest_rational(1.9, 2.1, 100), Some((2, 1)));
        assert_eq!(simplest_rational(0.1, 0.9, 100), Some((1, 2)));
        assert_eq!(simplest_rational(-0.2, 0.3, 100), Some((0, 1)));
        // 1/24 and 5/7 recovered from nearby floats
        assert_eq!(
            simplest_rational(1.0 / 24.0 - 1e-9, 1.0 / 24.0 + 1e-9, 100),
            Some((1, 24))
        );
        assert_eq!(
            simplest_rational(5.0 / 7.0 - 1e-7, 5.0 / 7.0 + 1e-7, 100),
            Some((5, 7))
        );
        assert_eq!(simplest_rational(0.3141592, 0.3141593, 100), None);
    }
}
