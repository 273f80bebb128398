//! The engines of a search, chosen once for every caller ([`plan_runs`]): which walk
//! (over GF(2) in bit masks, cyclic-invariant, or over GF(p)) and whether numerical runs
//! share the time with it. [`Method::Auto`] chooses from the tensor: over Q, walks over
//! the first small prime whose reduction keeps the three flattening ranks (then p-adic
//! lifting and the exact check), sharing the time with Levenberg-Marquardt runs (the rank
//! over GF(p) may exceed the rank over Q); the numerical route alone when no small prime
//! keeps them.
//! Every plan carries its reason in words.
//!
//! Invariant: a plan never holds a walk whose prime divides a denominator of the tensor,
//! nor a numerical run over GF(p).

use super::cyclic::CyclicScheme;
use super::flip_p::PScheme;
use super::numeric::Fit;
use super::{Method, Params, Symmetry, bits, flip};
use crate::error::{Error, Result};
use crate::scalar::FieldSpec;
use crate::tensor::{Tensor, flattening_ranks};

/// The walk of a search: its field and kind.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Walk {
    /// Over GF(2), factors in `words` 64-bit words.
    Bits { words: usize },
    /// Over GF(2), schemes of <n,n,n> invariant under the cyclic symmetry.
    Cyclic { n: usize, words: usize },
    /// Over GF(p), p odd.
    Prime { p: u64 },
}

/// One kind of run.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RunKind {
    Walk(Walk),
    Numeric(Fit),
}

/// The engines of a search: run n is of kind `kinds[n mod kinds.len()]`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct RunPlan {
    pub kinds: Vec<RunKind>,
    /// Why these engines, in words.
    pub reason: String,
}

/// Unknowns (rank times the sum of the dimensions) up to which [`Method::Auto`] fits by
/// Levenberg-Marquardt, whose step costs the cube of that number; above it, by
/// alternating least squares (common practice).
const LM_MAX_UNKNOWNS: usize = 600;

/// Small primes [`Method::Auto`] tries for the walks of a tensor over Q, after the
/// requested walk prime.
const AUTO_PRIMES: [u64; 6] = [2, 3, 5, 7, 11, 13];

/// The walk over GF(p) for `goal` (over the search field) under `params`, or why there is
/// none.
fn choose_walk(goal: &Tensor, params: &Params, p: u64) -> Result<Walk> {
    if !crate::scalar::is_prime(p) || p >= 1 << 16 {
        return Err(Error::Invalid(format!(
            "the walk prime must be a prime below 65536, not {p}"
        )));
    }
    if params.symmetry == Symmetry::Cyclic {
        if p != 2 {
            return Err(Error::Invalid(
                "the cyclic symmetry is supported for walks over GF(2) only".into(),
            ));
        }
        let d = goal.dims();
        let n = (d[0] as f64).sqrt().round() as usize;
        let square = d == [n * n; 3]
            && n * n <= bits::MAX_DIM
            && CyclicScheme::standard(n)
                .ok()
                .zip(flip::tensor_bits(goal).ok())
                .is_some_and(|(c, b)| c.to_bits().evaluate() == b);
        if !square {
            return Err(Error::Invalid(
                "the cyclic symmetry needs the square matrix format <n,n,n> (as built by matmul:n,n,n, n <= 16)"
                    .into(),
            ));
        }
        return Ok(Walk::Cyclic {
            n,
            words: flip::walker_words(d)?,
        });
    }
    if p == 2 {
        flip::tensor_bits(goal)?;
        Ok(Walk::Bits {
            words: flip::walker_words(goal.dims())?,
        })
    } else {
        let gp = goal
            .with_field(FieldSpec::Prime(p))
            .map_err(Error::Invalid)?;
        PScheme::standard(&gp)?;
        Ok(Walk::Prime { p })
    }
}

/// The walk prime of a search over Q: the requested one (`params.walk_prime`), else the
/// first of [`AUTO_PRIMES`] whose reduction keeps the flattening ranks of `goal`; or the
/// reason none does. Cost: one flattening-rank computation per prime tried.
fn prime_keeping_ranks(goal: &Tensor, params: &Params) -> std::result::Result<(u64, Walk), String> {
    let over_q = flattening_ranks(goal);
    let mut seen = Vec::new();
    for p in std::iter::once(params.walk_prime).chain(AUTO_PRIMES) {
        if seen.contains(&p) {
            continue;
        }
        seen.push(p);
        let kept = goal
            .with_field(FieldSpec::Prime(p))
            .is_ok_and(|g| flattening_ranks(&g) == over_q);
        if let (true, Ok(w)) = (kept, choose_walk(goal, params, p)) {
            return Ok((p, w));
        }
    }
    Err(format!(
        "no prime in {seen:?} keeps the flattening ranks {over_q:?} (or the tensor has no \
         reduction there), so nothing a walk finds could lift to this tensor"
    ))
}

/// Choose the engines of a search for `goal` (the tensor over the search field), the one
/// method selection shared by every caller of the search. `start_rank` is the rank of a
/// verified start scheme, if any: without a target rank the numerical runs aim one below
/// the best rank so far, so they need it. Errors name what does not fit (a numerical
/// method over GF(p), a walk over a prime that divides a denominator, ...).
/// Cost: for [`Method::Auto`] over Q, one flattening-rank computation per prime tried.
pub fn plan_runs(goal: &Tensor, params: &Params, start_rank: Option<usize>) -> Result<RunPlan> {
    let over_q = goal.field() == FieldSpec::Rational;
    let aim = params.target_rank.or(start_rank);
    let numeric = |fit: Fit, reason: String| -> Result<RunPlan> {
        if !over_q {
            return Err(Error::Invalid(
                "the numerical route works over Q; use --method flip over GF(p)".into(),
            ));
        }
        if aim.is_none() {
            return Err(Error::Invalid(
                "the numerical route needs a target rank (--rank)".into(),
            ));
        }
        Ok(RunPlan {
            kinds: vec![RunKind::Numeric(fit)],
            reason,
        })
    };
    let asked = "the method asked for".to_string();
    let walk_prime = match goal.field() {
        FieldSpec::Prime(p) => p,
        FieldSpec::Rational => params.walk_prime,
    };
    match params.method {
        Method::Als => numeric(Fit::Als, asked),
        Method::Lm => numeric(Fit::Lm, asked),
        Method::Flip => Ok(RunPlan {
            kinds: vec![RunKind::Walk(choose_walk(goal, params, walk_prime)?)],
            reason: asked,
        }),
        Method::Auto if !over_q || params.symmetry == Symmetry::Cyclic => {
            let w = choose_walk(goal, params, walk_prime)?;
            Ok(RunPlan {
                kinds: vec![RunKind::Walk(w)],
                reason: format!(
                    "walks over GF({walk_prime}), {}",
                    if over_q {
                        "the walks the cyclic symmetry allows, lifted to Q"
                    } else {
                        "the field searched"
                    }
                ),
            })
        }
        Method::Auto => {
            let walk = prime_keeping_ranks(goal, params);
            let lm_too = aim.is_some();
            let unknowns = aim.unwrap_or(0) * goal.dims().iter().sum::<usize>();
            let (fit, fit_name) = if unknowns <= LM_MAX_UNKNOWNS {
                (Fit::Lm, "Levenberg-Marquardt".to_string())
            } else {
                (
                    Fit::Als,
                    format!(
                        "alternating least squares ({unknowns} unknowns: a \
                         Levenberg-Marquardt step would cost their cube)"
                    ),
                )
            };
            match walk {
                Ok((p, w)) => {
                    let mut reason = format!(
                        "reduced mod {p} the tensor keeps its flattening ranks: walks over \
                         GF({p}), lifted p-adically to Q and checked exactly"
                    );
                    let mut kinds = vec![RunKind::Walk(w)];
                    if lm_too {
                        // above every dimension simultaneous diagonalisation does not
                        // apply, and a unique decomposition is read off a fit at once
                        let above = aim.is_some_and(|r| goal.dims().iter().all(|&d| r > d));
                        if above {
                            kinds.insert(0, RunKind::Numeric(fit));
                        } else {
                            kinds.push(RunKind::Numeric(fit));
                        }
                        reason += &format!(
                            ", sharing the time with runs of {fit_name} (the rank over GF(p) may \
                             exceed the rank over Q{})",
                            if above {
                                "; the fits first: at a rank above every dimension a \
                                 unique decomposition is read off a fit"
                            } else {
                                ""
                            }
                        );
                    }
                    Ok(RunPlan { kinds, reason })
                }
                Err(why) if lm_too => numeric(
                    fit,
                    format!("runs of {fit_name}, rounded and checked exactly: {why}"),
                ),
                Err(why) => Err(Error::Invalid(format!(
                    "{why}; the numerical route needs a target rank (--rank)"
                ))),
            }
        }
    }
}
