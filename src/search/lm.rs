//! Numerical fit by Levenberg-Marquardt with bounded norms (Tichavsky, Phan and Cichocki
//! 2017, "Numerical CP decomposition of some difficult tensors"), one of the fits of the
//! numerical route ([`super::numeric`]).
//!
//! Unknowns: all factor entries x (N = r (d0 + d1 + d2)). Objective
//! `||T - sum_t a_t (x) b_t (x) c_t||^2 + gamma ||x||^2`: the ridge term keeps the norms
//! bounded (gamma decays geometrically to a floor, 1e-4 by default, held while the fit
//! improves and lowered tenfold when it stalls; a fit stalled below a relative error of
//! 1e-2 is near an exact decomposition of bounded norm, whose error is proportional to the
//! ridge, and the ridge is removed so that the last steps converge to it: the polynomial
//! products poly:8,8 at rank 15, whose evaluation points need larger norms, stall at
//! 2.4e-3 under the ridge), term norms are
//! balanced after each step, and a run whose largest entry exceeds `bound` is abandoned
//! (it drifts towards a border-rank limit). A ridge that vanishes within the first steps
//! lets most fits of <3,3,3> at rank 23 drift that way (error decreasing like 1/steps,
//! norms growing); held, it leads half of them to an exact fit (our runs, seeds 0..3). A step solves `(J^T J + (gamma + mu) I) d = -(J^T e + gamma x)` (in the
//! re-fits of the rounding `mu diag(J^T J)` in place of `mu I`, Marquardt's scaling, from a
//! small start: a freeze moves the fit a short way, where Gauss-Newton steps converge) with
//! the damping mu raised on a rejected step and lowered on an accepted one. `J^T J` is
//! assembled from the Gram matrices `K_a = F_a^T F_a` without forming J: the block of axes
//! (a, a) is `I (x) (K_b * K_c)` and the block of axes (a, b) has entries
//! `F_a[i, x'] F_b[j, x] K_c[x, x']` (c the third axis). During rounding the frozen
//! entries are left out of the system, and a re-fit after a freeze is cut short: on a
//! plateau (the error not down by a tenth over five steps: near an exact fit the steps
//! converge fast) and after a budget of steps that shrinks with the cube of the free
//! unknowns (ten steps at least), so that a freeze that breaks a large fit costs a few
//! steps rather than a hundred.

use super::numeric::{Dense, Factors};
use nalgebra::{DMatrix, DVector};
use rand_chacha::ChaCha8Rng;

/// Settings of the Levenberg-Marquardt fit.
#[derive(Clone, Debug)]
pub struct LmParams {
    /// Most steps of the numerical phase.
    pub iters: usize,
    /// Ridge weight: start, per-step decay factor, and the floor it decays to (lowered
    /// tenfold whenever the fit stalls, removed when it stalls near an exact fit).
    pub gamma0: f64,
    pub gamma_decay: f64,
    pub gamma_min: f64,
    /// Initial damping.
    pub mu0: f64,
    /// Abandon a run when an entry exceeds this in absolute value (after balancing).
    pub bound: f64,
    /// Relative error below which the fit counts as converged.
    pub tol: f64,
    /// Most steps after each freeze of the rounding, for fits of up to `round_free` free
    /// unknowns; a larger fit gets as many as the same arithmetic allows (a step costs
    /// the cube of the free unknowns), and at least `round_min_iters`.
    pub round_iters: usize,
    pub round_free: usize,
    pub round_min_iters: usize,
    /// A re-fit after a freeze gives up when after `round_stall_steps` steps its error is
    /// above `round_stall_ratio` times the error before them (a plateau: the freeze left
    /// no exact fit nearby; near one the steps converge fast).
    pub round_stall_steps: usize,
    pub round_stall_ratio: f64,
    /// Initial damping of a re-fit after a freeze, and whether it is relative to the
    /// diagonal of `J^T J` (Marquardt's scaling). The default (1e-2, absolute) re-fits
    /// cautiously, which suits fits near isolated schemes (matrix products: <3,3,3> at
    /// rank 23 rounds in half the time as with the other); [`fast_refits`] (1e-6, scaled)
    /// takes Gauss-Newton steps at once, which suits fits inside a family of schemes,
    /// where a freeze moves the fit a short way along it (a point of a polynomial product
    /// moved by 0.05: relative error 3e-3 after 10 steps with the default, 4e-13 with
    /// these; our runs).
    pub round_mu0: f64,
    pub round_scaled: bool,
    /// The fit stalls when after this many steps its error is above `stall_ratio` times
    /// the error before them; the ridge's floor is then lowered tenfold.
    pub stall_steps: usize,
    pub stall_ratio: f64,
    /// A fit stalled below this relative error has its ridge removed.
    pub release: f64,
}

impl Default for LmParams {
    fn default() -> Self {
        LmParams {
            iters: 600,
            gamma0: 1e-3,
            gamma_decay: 0.8,
            gamma_min: 1e-4,
            mu0: 1e-2,
            bound: 40.0,
            tol: 1e-11,
            round_iters: 100,
            round_free: 160,
            round_min_iters: 10,
            round_stall_steps: 5,
            round_stall_ratio: 0.9,
            round_mu0: 1e-2,
            round_scaled: false,
            stall_steps: 50,
            stall_ratio: 0.97,
            release: 1e-2,
        }
    }
}

/// Index of entry (row i, term x) of axis a in the unknown vector.
struct Layout {
    off: [usize; 3],
    r: usize,
    n: usize,
}

impl Layout {
    fn new(t: &Dense, r: usize) -> Layout {
        let d = t.dims;
        Layout {
            off: [0, d[0] * r, (d[0] + d[1]) * r],
            r,
            n: (d[0] + d[1] + d[2]) * r,
        }
    }
    #[inline]
    fn at(&self, a: usize, i: usize, x: usize) -> usize {
        self.off[a] + i * self.r + x
    }
}

/// `J^T J` and the gradient `J^T (model - T) + gamma x`.
fn normal_system(t: &Dense, s: &Factors, lay: &Layout, gamma: f64) -> (DMatrix<f64>, DVector<f64>) {
    let r = lay.r;
    let d = t.dims;
    let k: Vec<DMatrix<f64>> = (0..3).map(|a| s.f[a].transpose() * &s.f[a]).collect();
    let others = |a: usize| match a {
        0 => (1, 2),
        1 => (0, 2),
        _ => (0, 1),
    };
    let mut g = DMatrix::<f64>::zeros(lay.n, lay.n);
    let mut grad = DVector::<f64>::zeros(lay.n);
    for a in 0..3 {
        let (b, c) = others(a);
        let h = k[b].component_mul(&k[c]);
        for i in 0..d[a] {
            for x in 0..r {
                for y in 0..r {
                    g[(lay.at(a, i, x), lay.at(a, i, y))] = h[(x, y)];
                }
            }
        }
        // gradient: F_a H - MTTKRP_a + gamma F_a
        let fh = &s.f[a] * &h;
        for i in 0..d[a] {
            for x in 0..r {
                grad[lay.at(a, i, x)] = fh[(i, x)] + gamma * s.f[a][(i, x)];
            }
        }
    }
    for (idx, v) in &t.entries {
        for x in 0..r {
            grad[lay.at(0, idx[0], x)] -= v * s.f[1][(idx[1], x)] * s.f[2][(idx[2], x)];
            grad[lay.at(1, idx[1], x)] -= v * s.f[0][(idx[0], x)] * s.f[2][(idx[2], x)];
            grad[lay.at(2, idx[2], x)] -= v * s.f[0][(idx[0], x)] * s.f[1][(idx[1], x)];
        }
    }
    for (a, b, c) in [(0, 1, 2), (0, 2, 1), (1, 2, 0)] {
        for i in 0..d[a] {
            for j in 0..d[b] {
                for x in 0..r {
                    for y in 0..r {
                        let v = s.f[a][(i, y)] * s.f[b][(j, x)] * k[c][(x, y)];
                        let (p, q) = (lay.at(a, i, x), lay.at(b, j, y));
                        g[(p, q)] = v;
                        g[(q, p)] = v;
                    }
                }
            }
        }
    }
    (g, grad)
}

fn objective(t: &Dense, s: &Factors, gamma: f64) -> f64 {
    let e = s.error(t) * t.norm;
    let reg: f64 = s.f.iter().map(|m| m.norm_squared()).sum();
    e * e + gamma * reg
}

/// One damped step on the free unknowns; returns false when no damping gives a decrease
/// (or `stop` is set between two tries).
fn step(
    t: &Dense,
    s: &mut Factors,
    lay: &Layout,
    free: &[usize],
    (gamma, mu): (f64, &mut f64),
    scaled: bool,
    stop: &dyn Fn() -> bool,
) -> bool {
    let (g, grad) = normal_system(t, s, lay, gamma);
    let nf = free.len();
    let f0 = objective(t, s, gamma);
    // enough tries for the damping to climb from its floor (1e-15) past 1e12
    for _ in 0..40 {
        if stop() {
            return false;
        }
        let mut a = DMatrix::<f64>::zeros(nf, nf);
        let mut b = DVector::<f64>::zeros(nf);
        for (p, &fp) in free.iter().enumerate() {
            b[p] = -grad[fp];
            for (q, &fq) in free.iter().enumerate() {
                a[(p, q)] = g[(fp, fq)];
            }
            a[(p, p)] += gamma + *mu * if scaled { g[(fp, fp)].max(1e-12) } else { 1.0 };
        }
        let Some(ch) = a.cholesky() else {
            *mu *= 5.0;
            continue;
        };
        let delta = ch.solve(&b);
        let mut s2 = s.clone();
        for (p, &fp) in free.iter().enumerate() {
            let (ax, rest) = if fp < lay.off[1] {
                (0, fp)
            } else if fp < lay.off[2] {
                (1, fp - lay.off[1])
            } else {
                (2, fp - lay.off[2])
            };
            s2.f[ax][(rest / lay.r, rest % lay.r)] += delta[p];
        }
        let f1 = objective(t, &s2, gamma);
        if f1.is_finite() && f1 < f0 {
            *s = s2;
            *mu = (*mu / 3.0).max(1e-15);
            return true;
        }
        *mu *= 5.0;
        if *mu > 1e12 {
            break;
        }
    }
    false
}

fn free_unknowns(s: &Factors, lay: &Layout) -> Vec<usize> {
    let mut out = Vec::with_capacity(lay.n);
    for a in 0..3 {
        for (e, fz) in s.frozen[a].iter().enumerate() {
            if fz.is_none() {
                out.push(lay.off[a] + e);
            }
        }
    }
    out
}

/// The numerical phase from a random start. Returns factors with relative error below
/// `tol`, or `None` (no convergence, blow-up, or stopped).
pub fn converge(
    t: &Dense,
    r: usize,
    p: &LmParams,
    rng: &mut ChaCha8Rng,
    stop: &dyn Fn() -> bool,
) -> Option<Factors> {
    let mut s = Factors::random(t, r, rng);
    let lay = Layout::new(t, r);
    let free: Vec<usize> = (0..lay.n).collect();
    let mut gamma = p.gamma0;
    let mut mu = p.mu0;
    // the ridge's floor: held while the fit improves, lowered tenfold when it stalls, so
    // the norms stay bounded until the fit is near an exact decomposition (a fit that
    // lets the ridge vanish early drifts towards a border-rank limit with growing norms)
    let mut floor = p.gamma_min;
    let mut mark = (0usize, f64::INFINITY);
    for it in 0..p.iters {
        // every step: one step of a large fit takes seconds
        if stop() {
            return None;
        }
        if !step(t, &mut s, &lay, &free, (gamma, &mut mu), false, stop) {
            // stuck at this ridge weight: lower it, or give up at the floor
            if floor <= 0.0 && gamma <= 0.0 {
                return (s.error(t) < p.tol).then_some(s);
            }
            floor = lower_floor(floor);
            gamma = floor;
        }
        gamma = (gamma * p.gamma_decay).max(floor);
        s.balance();
        if s.max_abs() > p.bound {
            return None;
        }
        let e = s.error(t);
        if e < p.tol {
            return Some(s);
        }
        if it >= mark.0 + p.stall_steps {
            if e > p.stall_ratio * mark.1 {
                // near an exact decomposition of bounded norm the error is proportional
                // to the ridge: release it at once, Newton's steps do the rest
                floor = if e < p.release {
                    0.0
                } else {
                    lower_floor(floor)
                };
            }
            mark = (it, e);
        }
        if it > p.iters / 2 && e > 1e-3 {
            return None;
        }
    }
    (s.error(t) < p.tol).then_some(s)
}

/// The next floor of the ridge: a tenth, and zero below 1e-10.
fn lower_floor(floor: f64) -> f64 {
    if floor > 1e-10 { floor / 10.0 } else { 0.0 }
}

/// `p` with the re-fits after a freeze taking Gauss-Newton steps at once (damping 1e-6
/// relative to the diagonal of `J^T J`), see [`LmParams::round_mu0`].
pub fn fast_refits(p: &LmParams) -> LmParams {
    LmParams {
        round_mu0: 1e-6,
        round_scaled: true,
        ..p.clone()
    }
}

/// Re-fit the free entries after a freeze; true when the error returns below `tol`.
/// Gives up on a plateau (see [`LmParams::round_stall_steps`]) or when its budget of
/// steps is spent (see [`LmParams::round_iters`]). `stop` is polled before every step.
pub fn relax(t: &Dense, s: &mut Factors, p: &LmParams, tol: f64, stop: &dyn Fn() -> bool) -> bool {
    let lay = Layout::new(t, s.rank());
    let free = free_unknowns(s, &lay);
    let mut mu = p.round_mu0;
    let mut mark = f64::INFINITY;
    // a budget of arithmetic per re-fit: a step costs the cube of the free unknowns
    let size = (p.round_free as f64 / free.len().max(1) as f64).min(1.0);
    let iters = ((p.round_iters as f64 * size.powi(3)) as usize).max(p.round_min_iters);
    for it in 0..iters {
        let e = s.error(t);
        if e < tol {
            return true;
        }
        if it % p.round_stall_steps.max(1) == 0 {
            if it > 0 && e > p.round_stall_ratio * mark {
                return false;
            }
            mark = e;
        }
        if free.is_empty()
            || stop()
            || !step(t, s, &lay, &free, (0.0, &mut mu), p.round_scaled, stop)
        {
            break;
        }
    }
    s.error(t) < tol
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::search::tests::poly;
    use rand::SeedableRng;

    /// The assembled normal matrix equals J^T J of a finite-difference Jacobian.
    #[test]
    fn normal_matrix_matches_finite_differences() {
        let t = Dense::new(&poly(2, 3));
        let mut rng = ChaCha8Rng::seed_from_u64(1);
        let s = Factors::random(&t, 3, &mut rng);
        let lay = Layout::new(&t, 3);
        let (g, _) = normal_system(&t, &s, &lay, 0.0);
        let model = |s: &Factors| -> Vec<f64> {
            let d = t.dims;
            let mut out = Vec::new();
            for i in 0..d[0] {
                for j in 0..d[1] {
                    for k in 0..d[2] {
                        out.push(
                            (0..3)
                                .map(|x| s.f[0][(i, x)] * s.f[1][(j, x)] * s.f[2][(k, x)])
                                .sum::<f64>(),
                        );
                    }
                }
            }
            out
        };
        let base = model(&s);
        let mut jac = DMatrix::<f64>::zeros(base.len(), lay.n);
        for a in 0..3 {
            for i in 0..t.dims[a] {
                for x in 0..3 {
                    let mut s2 = s.clone();
                    s2.f[a][(i, x)] += 1e-6;
                    for (row, (m1, m0)) in model(&s2).iter().zip(&base).enumerate() {
                        jac[(row, lay.at(a, i, x))] = (m1 - m0) / 1e-6;
                    }
                }
            }
        }
        let want = jac.transpose() * &jac;
        assert!((want - g).abs().max() < 1e-4);
    }
}
