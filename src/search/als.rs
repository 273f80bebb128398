//! Numerical fit by regularised alternating least squares (ALS) in f64, one of the fits
//! of the numerical route ([`super::numeric`]: rounding, exact solve, exact check).
//!
//! Model: `T ~ sum_t a_t (x) b_t (x) c_t` with factor matrices `F_0 (d0 x r)`,
//! `F_1 (d1 x r)`, `F_2 (d2 x r)`. One ALS sweep solves, for each axis m in turn, the
//! ridge problem `min ||T_(m) - F_m Z^T||^2 + lambda ||F_m||^2` with the other two factors
//! fixed: `F_m = R (G + lambda I)^-1`, `G = (F_p^T F_p) * (F_q^T F_q)` (entrywise), `R` the
//! tensor contracted with the other factors. lambda decays geometrically to a floor; term
//! norms are balanced after each sweep and a run is abandoned when a factor norm exceeds a
//! bound (drift towards a border-rank limit, where terms blow up and cancel). Rows with
//! frozen entries (during rounding) are solved on their free entries only.

use super::numeric::{Dense, Factors};
use nalgebra::{DMatrix, DVector};
use rand_chacha::ChaCha8Rng;

/// Settings of the ALS fit.
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
    /// Sweeps after each freeze of the rounding.
    pub round_sweeps: usize,
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
            round_sweeps: 300,
        }
    }
}

/// One ridge update of axis m. Returns false on a numerical failure.
fn update(s: &mut Factors, t: &Dense, m: usize, lambda: f64) -> bool {
    let (p, qa) = match m {
        0 => (1, 2),
        1 => (0, 2),
        _ => (0, 1),
    };
    let r = s.rank();
    let g = (s.f[p].transpose() * &s.f[p]).component_mul(&(s.f[qa].transpose() * &s.f[qa]));
    let mut rhs = DMatrix::<f64>::zeros(t.dims[m], r);
    for (idx, v) in &t.entries {
        for x in 0..r {
            rhs[(idx[m], x)] += v * s.f[p][(idx[p], x)] * s.f[qa][(idx[qa], x)];
        }
    }
    let any_frozen = s.frozen[m].iter().any(Option::is_some);
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
        s.f[m] = sol.transpose();
        return s.f[m].iter().all(|x| x.is_finite());
    }
    for row in 0..t.dims[m] {
        let free: Vec<usize> = (0..r)
            .filter(|&x| s.frozen[m][row * r + x].is_none())
            .collect();
        for x in 0..r {
            if let Some((a, b)) = s.frozen[m][row * r + x] {
                s.f[m][(row, x)] = a as f64 / b as f64;
            }
        }
        if free.is_empty() {
            continue;
        }
        let n = free.len();
        let mut gf = DMatrix::<f64>::zeros(n, n);
        let mut b = DVector::<f64>::zeros(n);
        for (a, &fa) in free.iter().enumerate() {
            let mut acc = rhs[(row, fa)];
            for x in 0..r {
                if s.frozen[m][row * r + x].is_some() {
                    acc -= g[(fa, x)] * s.f[m][(row, x)];
                }
            }
            b[a] = acc;
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
            s.f[m][(row, fa)] = sol[a];
        }
    }
    s.f[m].iter().all(|x| x.is_finite())
}

fn sweep(s: &mut Factors, t: &Dense, lambda: f64) -> bool {
    (0..3).all(|m| update(s, t, m, lambda))
}

/// The numerical phase: ALS from a random start. Returns a state with relative error
/// below `tol`, or `None` (no convergence, blow-up, or stopped).
pub fn converge(
    t: &Dense,
    r: usize,
    p: &AlsParams,
    rng: &mut ChaCha8Rng,
    stop: &dyn Fn() -> bool,
) -> Option<Factors> {
    let mut s = Factors::random(t, r, rng);
    let mut lambda = p.lambda0;
    for it in 0..p.sweeps {
        if !sweep(&mut s, t, lambda) {
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
pub fn relax(t: &Dense, s: &mut Factors, p: &AlsParams, tol: f64, stop: &dyn Fn() -> bool) -> bool {
    for it in 0..p.round_sweeps {
        if (it % 10 == 0 && stop()) || !sweep(s, t, p.lambda_min) {
            return false;
        }
        if it % 10 == 9 {
            let e = s.error(t);
            if e < tol {
                return true;
            }
            if it >= 49 && e > 1e-3 {
                return false;
            }
        }
    }
    s.error(t) < tol
}

#[cfg(test)]
mod tests {
    use crate::scalar::{FieldSpec, q};
    use crate::scheme::verify;
    use crate::search::numeric::{Fit, NumericParams, numeric_run};
    use crate::tensor::Tensor;
    use rand::SeedableRng;
    use rand_chacha::ChaCha8Rng;

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

    /// Complex multiplication has rank 3 over Q (Gauss's trick; common practice).
    #[test]
    fn complex_rank_three() {
        let t = complex();
        let stop = || false;
        let p = NumericParams {
            fit: Fit::Als,
            ..NumericParams::default()
        };
        let found = (0..40).find_map(|seed| {
            let mut rng = ChaCha8Rng::seed_from_u64(seed);
            numeric_run(&t, 3, &p, &mut rng, &stop).scheme()
        });
        let s = found.expect("a rank-3 scheme");
        assert_eq!(s.rank(), 3);
        assert!(verify(&s, &t).is_ok());
    }
}
