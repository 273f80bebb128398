//! Invariants of a Lie algebra L (the caller decides the Lie law with [`crate::laws`]):
//! derived series `L^(k+1) = [L^(k), L^(k)]`, lower central series
//! `L^{k+1} = [L, L^k]`, solvable / nilpotent (the series reach 0), the Killing form
//! `κ(x, y) = Tr(ad_x ad_y)` with its rank, and semisimplicity by Cartan's criterion
//! (κ nondegenerate; characteristic 0 only: Jacobson 1962, Lie Algebras, ch. III).
//!
//! Cost: that of the series ([`super::spans`]) and of one trace form ([`super::forms`]).

use super::forms::{form_invariants, trace_form};
use super::spans::{derived_series, lower_central_series};
use crate::error::Result;
use crate::linalg::nullspace::SolveParams;
use crate::scalar::FieldSpec;
use crate::tensor::IntegralTensor;

/// Lie-algebra invariants.
#[derive(Clone, Debug, PartialEq, Eq, serde::Serialize)]
pub struct LieInvariants {
    /// dims of L^(0) = L, L^(1), ... until it stabilises.
    pub derived_series: Vec<usize>,
    /// dims of L^1 = L, L^2, ... until it stabilises.
    pub lower_central_series: Vec<usize>,
    pub solvable: bool,
    pub nilpotent: bool,
    pub killing_rank: usize,
    /// Cartan's criterion; `None` over GF(p).
    pub semisimple: Option<bool>,
}

/// The invariants of a Lie algebra (the caller has checked the Lie law): the series by
/// [`super::spans`], the Killing form `tr(ad_x ad_y) = tr(L_x L_y)` by [`super::forms`].
pub fn lie_invariants(it: &IntegralTensor, params: &SolveParams) -> Result<LieInvariants> {
    let n = it.dims[0];
    let derived = derived_series(it, params)?;
    let lower = lower_central_series(it, params)?;
    let killing_rank = form_invariants(it.field, &trace_form(it, true)).rank;
    Ok(LieInvariants {
        solvable: derived.last() == Some(&0),
        nilpotent: lower.last() == Some(&0),
        derived_series: derived,
        lower_central_series: lower,
        killing_rank,
        semisimple: match it.field {
            FieldSpec::Rational => Some(killing_rank == n),
            FieldSpec::Prime(_) => None,
        },
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::*;
    use crate::tensor::Tensor;

    #[test]
    fn sl2_and_heisenberg() {
        // sl_2 is simple: Killing form nondegenerate (Cartan's criterion), [L,L] = L:
        // Jacobson 1962, Lie Algebras, ch. I-III.
        let t = sl2();
        let lie = |t: &Tensor| {
            let p = crate::laws::Params {
                laws: vec![crate::laws::Law::Lie],
                ..Default::default()
            };
            crate::laws::check_laws(t, &p)
                .unwrap()
                .holds(crate::laws::Law::Lie)
        };
        assert_eq!(lie(&t), Some(true));
        let l = lie_invariants(&IntegralTensor::from_tensor(&t), &Default::default()).unwrap();
        assert_eq!(
            (l.killing_rank, l.semisimple, l.solvable),
            (3, Some(true), false)
        );
        assert_eq!(l.derived_series, vec![3]);
        // Heisenberg: [L,L] = Q z, [L,[L,L]] = 0: nilpotent of class 2, Killing form 0
        // (Jacobson 1962, ch. I; common practice).
        let h = lie_invariants(
            &IntegralTensor::from_tensor(&heisenberg3()),
            &Default::default(),
        )
        .unwrap();
        assert_eq!(h.lower_central_series, vec![3, 1, 0]);
        assert_eq!(h.derived_series, vec![3, 1, 0]);
        assert!(h.nilpotent && h.solvable);
        assert_eq!(h.killing_rank, 0);
        assert_eq!(lie(&octonions()), Some(false));
    }
}
