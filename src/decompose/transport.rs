//! A scheme carried through linear maps: the terms of a scheme of a model tensor (a matrix
//! algebra, a matrix product) rewritten in the coordinates of a tensor isomorphic to it,
//! given the model coordinates of each of the tensor's basis vectors on the two input axes
//! and the tensor coordinates of each model basis vector on the result axis.
//!
//! If `x = sum_m x_m e_m` has model coordinates `P x` (`P[i][m]` = coordinate i of `e_m`),
//! a linear form `α` of the model reads `x -> α(P x) = sum_m (sum_i α_i P[i][m]) x_m`, and
//! a model result `z` is `sum_i z_i b_i` in the tensor's basis. The sums are taken over one
//! common denominator ([`IntegerRows`]): the coordinates of a user's dense basis are large.
//!
//! Invariant: none checked here; the callers verify the sum exactly against the tensor.

use crate::linalg::integer_rows::IntegerRows;
use crate::scalar::{Field, Q};
use crate::scheme::{Scheme, reduce_into};

/// Append the terms of the model scheme `s` to `out`: a linear form `α` on input axis
/// `a` (0 or 1) becomes `x -> α(proj[a] x)` on the tensor's basis vectors (`proj[a][m]`
/// the model coordinates of basis vector m), a result `z` becomes `sum_i z_i embed[i]`.
/// Cost per term: one combination of integer rows per axis.
pub fn push_transported<F: Field>(
    f: &F,
    out: &mut Scheme,
    s: &Scheme,
    proj: [&[Vec<F::Elem>]; 2],
    embed: &[Vec<F::Elem>],
) {
    let field = out.field;
    let forms = proj.map(|p| {
        let n = p.len();
        let parts = p.first().map_or(0, Vec::len);
        // row i of the model coordinates, as a function of the basis vector
        let rows: Vec<Vec<Q>> = (0..parts)
            .map(|i| p.iter().map(|x| f.to_rational(&x[i])).collect())
            .collect();
        IntegerRows::new(&rows, n)
    });
    let len = embed.first().map_or(0, Vec::len);
    let embed: Vec<Vec<Q>> = embed
        .iter()
        .map(|e| e.iter().map(|x| f.to_rational(x)).collect())
        .collect();
    let results = IntegerRows::new(&embed, len);
    let reduce = |v: Vec<Q>| -> Vec<Q> {
        v.iter()
            .map(|x| reduce_into(field, x).expect("a coefficient of the field"))
            .collect()
    };
    for r in 0..s.rank() {
        out.push(
            reduce(forms[0].combine(&s.u[r])),
            reduce(forms[1].combine(&s.v[r])),
            reduce(results.combine(&s.w[r])),
        );
    }
}
