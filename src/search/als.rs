//! Numerical search: regularised alternating least squares (ALS) in f64, then rounding to
//! small-denominator rationals entry by entry, then exact verification over Q.
//!
//! Model: `T ~ sum_t a_t (x) b_t (x) c_t` with factor matrices `F_0 (d0 x r)`,
//! `F_1 (d1 x r)`, `F_2 (d2 x r)`. One ALS sweep solves, for each axis m in turn, the
//! ridge problem `min ||T_(m) - F_m Z^T||^2 + lambda ||F_m||^2` with the other two factors
//! fixed: `F_m = R (G + lambda I)^-1`, `G = (F_p^T F_p) * (F_q^T F_q)` (entrywise), `R` the
//! tensor contracted with the other factors. lambda decays geometrically to a floor; term
//! norms are balanced after each sweep and a run is abandoned when a factor norm exceeds a
//! bound (drift towards a border-rank limit, where terms blow up and cancel).
//!
//! Rounding: each term is scaled so its left and right factors have largest entry 1; then
//! repeatedly a free entry of a left or right factor is frozen at a nearby rational `p/q`
//! (simplest denominators first, then the smallest move) and the free entries are re-solved
//! by ALS (rows with frozen entries are solved on the free ones only); a freeze after which
//! the error does not return to round-off level is undone and banned. When every left and
//! right entry is frozen, the result factors are solved for exactly over Q (the Brent
//! equations are linear in them) and the scheme is checked with [`crate::scheme::verify`];
//! only a verified scheme is returned.
//! Floating point only *finds* candidates; the exact check *confirms*.

use crate::linalg::{Matrix, solve};
use crate::scalar::{FieldSpec, Q, Rationals, q, q_to_f64};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;
use nalgebra::{DMatrix, DVector};
use num_traits::Zero;
use rand::Rng;
use rand_chacha::ChaCha8Rng;

/// Settings of one ALS run.
#[derive(Clone, Debug)]
pub struct AlsParams {
    /// Maximum ALS sweeps in the numerical phase.
    pub sweeps: usize,
    /// Initial ridge weight and its per-sweep decay factor and floor.
    pub lambda0: f64,
    pub lambda_decay: f64,
    pub lambda_min: f64,
    /// Abandon a run when an entry exceeds this in absolute value (after balancing).
    pub bound: f64,
    /// Relative error below which the numerical phase counts as converged.
    pub tol: f64,
    /// Denominators tried when rounding.
    pub denominators: Vec<i64>,
    /// Sweeps after each freeze, and how many rejected freezes end the rounding.
    pub round_sweeps: usize,
    pub max_rejects: usize,
    /// How far (absolute) an entry may be moved by one freeze.
    pub radius: f64,
    /// Relative error accepted after a freeze (the exact check decides at the end).
    pub round_tol: f64,
}

impl Default for AlsParams {
    fn default() -> Self {
        AlsParams {
            sweeps: 3000,
            lambda0: 1e-2,
            lambda_decay: 0.99,
            lambda_min: 1e-12,
            bound: 20.0,
            tol: 1e-11,
            denominators: vec![1, 2, 3, 4],
            round_sweeps: 300,
            max_rejects: 200,
            radius: 0.75,
            round_tol: 1e-9,
        }
    }
}

/// The tensor as dense f64 plus its sparse entry list.
struct Dense {
    dims: [usize; 3],
    data: Vec<f64>,
    entries: Vec<([usize; 3], f64)>,
    norm: f64,
}

impl Dense {
    fn new(t: &Tensor) -> Dense {
        let d = t.dims();
        let mut data = vec![0.0; d[0] * d[1] * d[2]];
        let mut entries = Vec::new();
        for (i, j, k, c) in t.entries() {
            let v = q_to_f64(c);
            data[(i * d[1] + j) * d[2] + k] = v;
            entries.push(([i, j, k], v));
        }
        let norm = data.iter().map(|x| x * x).sum::<f64>().sqrt().max(1e-300);
        Dense {
            dims: d,
            data,
            entries,
            norm,
        }
    }
}

/// Factor matrices plus the frozen mask (`Some(p/q)` = fixed at that rational).
#[derive(Clone)]
struct State {
    f: [DMatrix<f64>; 3],
    frozen: [Vec<Option<(i64, i64)>>; 3],
}

impl State {
    fn rank(&self) -> usize {
        self.f[0].ncols()
    }

    /// Relative residual `||T - model|| / ||T||`. Cost O(d0 d1 d2 r).
    fn error(&self, t: &Dense) -> f64 {
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

    /// One ridge update of axis m. Returns false on a numerical failure.
    fn update(&mut self, t: &Dense, m: usize, lambda: f64) -> bool {
        let (p, qa) = match m {
            0 => (1, 2),
            1 => (0, 2),
            _ => (0, 1),
        };
        let r = self.rank();
        let g = (self.f[p].transpose() * &self.f[p])
            .component_mul(&(self.f[qa].transpose() * &self.f[qa]));
        let mut rhs = DMatrix::<f64>::zeros(t.dims[m], r);
        for (idx, v) in &t.entries {
            for x in 0..r {
                rhs[(idx[m], x)] += v * self.f[p][(idx[p], x)] * self.f[qa][(idx[qa], x)];
            }
        }
        let any_frozen = self.frozen[m].iter().any(Option::is_some);
        if !any_frozen {
            let mut gl = g.clone();
            for x in 0..r {
                gl[(x, x)] += lambda;
            }
            let Some(ch) = gl.cholesky() else {
                return false;
            };
            // F_m = rhs * gl^-1  <=>  gl * F_m^T = rhs^T
            let sol = ch.solve(&rhs.transpose());
            self.f[m] = sol.transpose();
            return self.f[m].iter().all(|x| x.is_finite());
        }
        for row in 0..t.dims[m] {
            let free: Vec<usize> = (0..r)
                .filter(|&x| self.frozen[m][row * r + x].is_none())
                .collect();
            for x in 0..r {
                if let Some((a, b)) = self.frozen[m][row * r + x] {
                    self.f[m][(row, x)] = a as f64 / b as f64;
                }
            }
            if free.is_empty() {
                continue;
            }
            let n = free.len();
            let mut gf = DMatrix::<f64>::zeros(n, n);
            let mut b = DVector::<f64>::zeros(n);
            for (a, &fa) in free.iter().enumerate() {
                let mut s = rhs[(row, fa)];
                for x in 0..r {
                    if self.frozen[m][row * r + x].is_some() {
                        s -= g[(fa, x)] * self.f[m][(row, x)];
                    }
                }
                b[a] = s;
                for (c, &fc) in free.iter().enumerate() {
                    gf[(a, c)] = g[(fa, fc)];
                }
                gf[(a, a)] += lambda;
            }
            let Some(ch) = gf.cholesky() else {
                return false;
            };
            let sol = ch.solve(&b);
            for (a, &fa) in free.iter().enumerate() {
                self.f[m][(row, fa)] = sol[a];
            }
        }
        self.f[m].iter().all(|x| x.is_finite())
    }

    fn sweep(&mut self, t: &Dense, lambda: f64) -> bool {
        (0..3).all(|m| self.update(t, m, lambda))
    }

    /// Rescale each term so its three factors have equal norms (only when nothing frozen).
    fn balance(&mut self) {
        if self.frozen.iter().any(|f| f.iter().any(Option::is_some)) {
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

    /// Scale each term so that its left and right factors have largest entry +1
    /// (the scaling freedom of a term), moving the factor into the result factor.
    fn normalise(&mut self) {
        for x in 0..self.rank() {
            for a in 0..2 {
                let col = self.f[a].column(x);
                let (mut best, mut idx) = (0.0f64, 0);
                for (i, v) in col.iter().enumerate() {
                    if v.abs() > best.abs() + 1e-9 {
                        best = *v;
                        idx = i;
                    }
                }
                let _ = idx;
                if best.abs() < 1e-12 {
                    continue;
                }
                self.f[a].column_mut(x).scale_mut(1.0 / best);
                self.f[2].column_mut(x).scale_mut(best);
            }
        }
    }

    fn max_abs(&self) -> f64 {
        self.f
            .iter()
            .flat_map(|m| m.iter())
            .fold(0.0, |a, &b| a.max(b.abs()))
    }
}

/// A freeze candidate: ((denominator level, distance), axis, entry, p/q).
type Candidate = ((usize, f64), usize, usize, (i64, i64));

fn gcd(a: i64, b: i64) -> i64 {
    if b == 0 { a.abs() } else { gcd(b, a % b) }
}

/// Nearest `p/q` with q in `dens` (ties to the smaller denominator), with its distance.
fn nearest_rational(x: f64, dens: &[i64]) -> ((i64, i64), f64) {
    let mut best = ((x.round() as i64, 1), f64::INFINITY);
    for &d in dens {
        let p = (x * d as f64).round();
        let dist = (x - p / d as f64).abs() * (1.0 + 0.05 * (d - 1) as f64);
        if dist < best.1 - 1e-15 {
            best = ((p as i64, d), dist);
        }
    }
    best
}

fn random_state(t: &Dense, r: usize, rng: &mut ChaCha8Rng) -> State {
    let mk =
        |n: usize, rng: &mut ChaCha8Rng| DMatrix::from_fn(n, r, |_, _| rng.gen_range(-1.0..1.0));
    State {
        f: [mk(t.dims[0], rng), mk(t.dims[1], rng), mk(t.dims[2], rng)],
        frozen: [
            vec![None; t.dims[0] * r],
            vec![None; t.dims[1] * r],
            vec![None; t.dims[2] * r],
        ],
    }
}

/// The numerical phase: ALS from a random start. Returns a state with relative error
/// below `tol`, or `None` (no convergence, blow-up, or stopped).
fn converge(
    t: &Dense,
    r: usize,
    p: &AlsParams,
    rng: &mut ChaCha8Rng,
    stop: &dyn Fn() -> bool,
) -> Option<State> {
    let mut s = random_state(t, r, rng);
    let mut lambda = p.lambda0;
    for it in 0..p.sweeps {
        if !s.sweep(t, lambda) {
            return None;
        }
        s.balance();
        if s.max_abs() > p.bound {
            return None;
        }
        lambda = (lambda * p.lambda_decay).max(p.lambda_min);
        if it % 25 == 24 {
            if stop() {
                return None;
            }
            let e = s.error(t);
            if e < p.tol {
                return Some(s);
            }
            // a stalled run is not worth the remaining sweeps
            if it > p.sweeps / 2 && e > 1e-2 {
                return None;
            }
        }
    }
    (s.error(t) < p.tol).then_some(s)
}

/// Re-solve the free entries after freezing; true when the error returns below `tol`.
fn relax(t: &Dense, s: &mut State, p: &AlsParams) -> bool {
    for it in 0..p.round_sweeps {
        if !s.sweep(t, p.lambda_min) {
            return false;
        }
        if it % 10 == 9 {
            let e = s.error(t);
            if e < p.round_tol {
                return true;
            }
            if it >= 49 && e > 1e-3 {
                return false;
            }
        }
    }
    s.error(t) < p.round_tol
}

/// The rounding phase: freeze entries one by one at nearby small-denominator rationals.
fn round_state(t: &Dense, mut s: State, p: &AlsParams, stop: &dyn Fn() -> bool) -> Option<State> {
    s.normalise();
    if !relax(t, &mut s, p) {
        return None;
    }
    let r = s.rank();
    let mut banned: Vec<(usize, usize, (i64, i64))> = Vec::new();
    // the entries of the rational solution need not be the nearest ones: the free
    // directions of the solution set let the relaxation move far
    let mut rejects = 0;
    loop {
        if stop() {
            return None;
        }
        // candidates: every free entry with each nearby p/q, simplest denominators first,
        // then the smallest move
        let mut cands: Vec<Candidate> = Vec::new();
        let mut tight = Vec::new();
        let mut any_free = false;
        for a in 0..2 {
            for (e, fz) in s.frozen[a].iter().enumerate() {
                if fz.is_some() {
                    continue;
                }
                any_free = true;
                let x = s.f[a][(e / r, e % r)];
                let (pq, dist) = nearest_rational(x, &p.denominators);
                if dist < 1e-9 {
                    tight.push((a, e, pq));
                    continue;
                }
                for (level, &d) in p.denominators.iter().enumerate() {
                    let num = (x * d as f64).round() as i64;
                    let dist = (x - num as f64 / d as f64).abs();
                    if dist > p.radius || gcd(num, d) != 1 {
                        continue;
                    }
                    let pq = (num, d);
                    if !banned.contains(&(a, e, pq)) {
                        cands.push(((level, dist), a, e, pq));
                    }
                }
            }
        }
        if !any_free {
            return Some(s);
        }
        let batch: Vec<(usize, usize, (i64, i64))> = if !tight.is_empty() {
            tight
        } else {
            if cands.is_empty() {
                return None;
            }
            cands.sort_by(|x, y| x.0.0.cmp(&y.0.0).then(x.0.1.total_cmp(&y.0.1)));
            vec![(cands[0].1, cands[0].2, cands[0].3)]
        };
        let saved = s.clone();
        for &(a, e, pq) in &batch {
            s.frozen[a][e] = Some(pq);
            s.f[a][(e / r, e % r)] = pq.0 as f64 / pq.1 as f64;
        }
        if relax(t, &mut s, p) {
            continue;
        }
        s = saved;
        if batch.len() == 1 {
            banned.push(batch[0]);
        }
        rejects += 1;
        if rejects > p.max_rejects {
            return None;
        }
    }
}

/// One ALS run from a random start (seeded by `rng`): numerical phase, rounding, exact
/// check. Returns a scheme of rank `r` verified exactly over Q, or `None`.
/// Cost per sweep: O(nnz(T) r + (d0 + d1 + d2) r^2 + r^3) flops; the error check costs
/// O(d0 d1 d2 r).
pub fn als_run(
    t: &Tensor,
    r: usize,
    p: &AlsParams,
    rng: &mut ChaCha8Rng,
    stop: &dyn Fn() -> bool,
) -> Option<Scheme> {
    if t.field() != FieldSpec::Rational || r == 0 {
        return None;
    }
    let dense = Dense::new(t);
    let s = converge(&dense, r, p, rng, stop)?;
    let s = round_state(&dense, s, p, stop)?;
    let d = t.dims();
    let uv = |a: usize, x: usize| -> Vec<Q> {
        (0..d[a])
            .map(|i| {
                let (n, m) = s.frozen[a][i * r + x].expect("left and right factors frozen");
                q(n, m)
            })
            .collect()
    };
    let us: Vec<Vec<Q>> = (0..r).map(|x| uv(0, x)).collect();
    let vs: Vec<Vec<Q>> = (0..r).map(|x| uv(1, x)).collect();
    let ws = solve_result_factors(t, &us, &vs)?;
    let mut out = Scheme::empty(FieldSpec::Rational, d);
    for x in 0..r {
        let zero = |v: &Vec<Q>| v.iter().all(num_traits::Zero::is_zero);
        // terms with a zero factor contribute nothing
        if !(zero(&us[x]) || zero(&vs[x]) || zero(&ws[x])) {
            out.push(us[x].clone(), vs[x].clone(), ws[x].clone());
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use rand::SeedableRng;

    /// The complex numbers over Q as a bilinear map on (re, im).
    fn complex() -> Tensor {
        let mut t = Tensor::zero(
            FieldSpec::Rational,
            crate::tensor::Kind::Bilinear,
            [2, 2, 2],
            None,
        );
        t.set(0, 0, 0, q(1, 1));
        t.set(1, 1, 0, q(-1, 1));
        t.set(0, 1, 1, q(1, 1));
        t.set(1, 0, 1, q(1, 1));
        t
    }

    #[test]
    fn nearest_rationals() {
        assert_eq!(nearest_rational(0.5000001, &[1, 2, 3]).0, (1, 2));
        assert_eq!(nearest_rational(-0.33333, &[1, 2, 3]).0, (-1, 3));
        assert_eq!(nearest_rational(2.0, &[1, 2]).0, (2, 1));
    }

    /// Complex multiplication has rank 3 over Q (Gauss's trick; common practice).
    #[test]
    fn complex_rank_three() {
        let t = complex();
        let stop = || false;
        let p = AlsParams::default();
        let mut found = None;
        for seed in 0..40 {
            let mut rng = ChaCha8Rng::seed_from_u64(seed);
            if let Some(s) = als_run(&t, 3, &p, &mut rng, &stop) {
                found = Some(s);
                break;
            }
        }
        let s = found.expect("a rank-3 scheme");
        assert_eq!(s.rank(), 3);
        assert!(verify(&s, &t).is_ok());
    }
}
