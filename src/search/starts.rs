//! Where a search starts: the best scheme built from the catalog's stored schemes for a
//! matrix format, the interpolation scheme of a commutative algebra with one generator, the
//! sum of the parts' schemes of a semisimple algebra split into matrix algebras and fields,
//! or the evaluation scheme of a product of polynomials ([`known_start`]), a walk start given by the user checked over the walk
//! field, and the walks' own start, the standard scheme or, for a dense table, the slice
//! scheme in a basis of low slice rank ([`super::slice_start`]).
//!
//! Invariant: every scheme returned is verified exactly against the goal (over the search
//! field, or reduced mod the walk prime).

use super::flip::Snapshot;
use super::{Params, bits, hensel, slice_start};
use crate::decompose::evaluation::{EvaluationParams, evaluation_scheme};
use crate::decompose::matrix_product::matrix_product_scheme;
use crate::decompose::monogenic::{MonogenicParams, monogenic_scheme};
use crate::decompose::semisimple::{SemisimpleParams, semisimple_scheme};
use crate::error::{Error, Result};
use crate::scalar::FieldSpec;
use crate::scheme::{Scheme, verify};
use crate::structure::matrix_frame::FrameParams;
use crate::tensor::Tensor;

/// The standard scheme `std` of the walks over GF(`p`), or the slice scheme in a basis of
/// low slice rank ([`slice_start`](super::slice_start)) when that is lower: a table in a basis of the user's
/// own is dense, and its standard scheme (one term per nonzero coefficient) far above the
/// rank. Cost: that of [`slice_start::slice_start`] (about a second at most).
pub(crate) fn lower_start<S: Snapshot>(
    std: S,
    goal: &Tensor,
    p: u64,
    convert: impl Fn(&Scheme) -> Option<S>,
) -> S {
    let params = slice_start::SliceStartParams::default();
    // below the standard rank by construction (the conversion only drops zero terms)
    slice_start::slice_start(goal, p, std.rank(), &params)
        .and_then(|s| convert(&s))
        .unwrap_or(std)
}

/// The start a search takes without one: when `goal` is the matrix multiplication tensor
/// <n,m,p> in the generator's basis, the best scheme over the search field built from the
/// catalog's stored schemes ([`crate::catalog::schemes::matmul_bases`],
/// [`crate::scheme::build`]), if it is below the schoolbook rank; for a commutative
/// algebra with one generator, its interpolation scheme of rank 2n - t, the exact rank
/// ([`monogenic_scheme`]); for a semisimple algebra split into matrix algebras and fields
/// (in any basis), the sum of the parts' schemes ([`semisimple_scheme`]); for a product of
/// polynomials, its evaluation scheme of rank m + n - 1, the exact rank
/// ([`evaluation_scheme`]); else `None`. With
/// `walk: Some(params)` only stored schemes whose coefficients reduce modulo the walk prime
/// take part (a start for the walks); with `integral` only stored schemes with integer
/// coefficients. Verified exactly. Cost: a dynamic programme over the sub-formats and one
/// verification (milliseconds for sides up to 16).
pub fn known_start(goal: &Tensor, walk: Option<&Params>, integral: bool) -> Option<Scheme> {
    let d = goal.dims();
    if d.iter().any(|&x| x > bits::MAX_DIM) {
        return None;
    }
    let walk_field = walk.map(|params| match goal.field() {
        FieldSpec::Rational => FieldSpec::Prime(params.walk_prime),
        p => p,
    });
    let Some(f) = crate::scheme::build::matmul_format_of(goal) else {
        // at most one of the two applies: an algebra is square, a product of polynomials
        // (of degrees at least 1) is not
        // the catalog's best scheme of a matrix format: the model of the semisimple parts
        // and of a matrix product in bases of its own
        let field = goal.field();
        let model = |f: [usize; 3]| {
            crate::catalog::schemes::best_matmul_scheme(f, field)
                .ok()
                .map(|b| b.scheme)
        };
        let s = monogenic_scheme(goal, &MonogenicParams::default())
            .map(|m| m.scheme)
            .or_else(|| {
                let matrix = |k: usize| model([k, k, k]);
                semisimple_scheme(goal, &SemisimpleParams::default(), &matrix).map(|s| s.scheme)
            })
            .or_else(|| {
                matrix_product_scheme(goal, &FrameParams::default(), &model).map(|m| m.scheme)
            })
            .or_else(|| evaluation_scheme(goal, &EvaluationParams::default()).map(|e| e.scheme))?;
        return on_walk_field(s, goal, walk_field, integral);
    };
    let bases: Vec<_> = crate::catalog::schemes::matmul_bases(goal.field())
        .into_iter()
        .filter(|b| walk_field.is_none_or(|wf| b.scheme.with_field(wf).is_ok()))
        .filter(|b| !integral || hensel::is_integral(&b.scheme))
        .collect();
    let built = crate::scheme::build::build_matmul(f, goal.field(), &bases).ok()?;
    (built.scheme.rank() < f[0] * f[1] * f[2]).then_some(built.scheme)
}

/// A known scheme `s` of `goal` as a start: with `walk_field`, only when it reduces to a
/// scheme over that field (checked exactly), with `integral` only when its coefficients
/// are integers. Cost: one reduction and one verification.
fn on_walk_field(
    s: Scheme,
    goal: &Tensor,
    walk_field: Option<FieldSpec>,
    integral: bool,
) -> Option<Scheme> {
    if integral && !hensel::is_integral(&s) {
        return None;
    }
    match walk_field {
        None => Some(s),
        Some(wf) if wf == goal.field() => Some(s),
        Some(wf) => {
            let r = s.with_field(wf).ok()?;
            verify(&r, &goal.with_field(wf).ok()?).is_ok().then_some(r)
        }
    }
}

/// The walk start `s` over the walk field (GF(`walk_prime`) for a goal over Q, else the
/// goal's field), checked exactly against the goal over that field.
/// Cost: one verification, O(r d0 d1 d2) at most.
pub(crate) fn check_walk_from(s: &Scheme, goal: &Tensor, walk_prime: u64) -> Result<Scheme> {
    let wf = match goal.field() {
        FieldSpec::Rational => FieldSpec::Prime(walk_prime),
        f => f,
    };
    let bad = |why: String| Error::Invalid(format!("the walk start: {why}"));
    let s = s.with_field(wf).map_err(|e| bad(e.to_string()))?;
    let g = goal.with_field(wf).map_err(bad)?;
    verify(&s, &g).map_err(|m| {
        bad(format!(
            "it does not verify over {wf}: {} coefficients differ, the first at {:?}",
            m.count, m.index
        ))
    })?;
    Ok(s)
}
