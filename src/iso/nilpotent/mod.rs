//! Explicit isomorphisms of nilpotent Lie algebras over Q, solved generator by generator
//! along the lower central series, verified exactly.
//!
//! Method. Let E (the catalog entry, in its published basis) and X (the input) be
//! nilpotent Lie algebras of the same dimension. A homomorphism phi: E -> X is fixed by
//! the images y_1..y_d of generators g_1..g_d of E, basis vectors of E spanning a
//! complement of E^2 = [E, E]; phi is onto (so an isomorphism) exactly when the y_i are
//! independent modulo X^2. E is spanned by left-normed words `[g_a, w]`; for each word that
//! is not a new basis word, E gives a relation `[g_a, w] = sum c_j w_j`, and phi is a
//! homomorphism exactly when every such relation holds for the images (the set of u with
//! `phi[u, v] = [phi u, phi v]` for all v is a subalgebra, by the Jacobi identity, so the
//! generators suffice).
//!
//! The images are chosen in turn. Each y_i is looked for inside the characteristic
//! subspace of X that corresponds to the smallest characteristic subspace of E holding
//! g_i; the family of characteristic subspaces is built the same way in both algebras:
//! the terms of the lower and upper central series, the subspaces that the derivation
//! algebra cuts out ([`derivations`]: the images of Der and of the kernel N of its trace
//! form, the kernels of N), their centralisers modulo each term of the lower central
//! series ({x : [x, S] ⊆ L^k}), and the pairwise intersections of these. The relations that involve g_i (and earlier generators only)
//! are polynomial in y_i; their affine-linear part is read off exactly (interpolation in a
//! scaling parameter) and solved; a seeded random point of the solution space is then
//! checked against the full relations, exactly. Choices that fail are retried and, when a
//! step has no solution, the previous choice is redone, within a step budget.
//!
//! The result is accepted only after [`crate::tensor::change_basis_algebra`] reproduces X's
//! structure constants from E's exactly. "Not found" means not found within the budget
//! (for instance when the images must solve a norm equation), never "not isomorphic".
//! Invariant: every returned matrix has passed that exact check.
//!
//! Files: [`space`] (the exact subspace operations and the characteristic family),
//! [`derivations`] (the members cut out by the derivation algebra),
//! [`words`] (words and relations of E), [`adapted`] (X's basis by layers), [`search`]
//! (the images generator by generator), [`lifting`] (deeper layers and the obstruction).

mod adapted;
mod derivations;
mod lifting;
mod search;
mod space;
mod words;

use super::same_constants;
use crate::linalg::Matrix;
use crate::linalg::modular::inverse_q;
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::{Kind, Tensor, change_basis_algebra};
use adapted::Adapted;
use rand::SeedableRng;
use search::Search;
use space::{Lie, span_of};
use words::{plan_words, word_images};

/// Parameters of [`find_nilpotent_isomorphism`].
#[derive(Clone, Debug)]
pub struct LieIsoParams {
    /// Seed of the random points of the solution spaces.
    pub seed: u64,
    /// Give up after this many attempts (each: fresh leading parts, then the lifting).
    pub max_steps: usize,
    /// Do not attempt algebras of larger dimension.
    pub max_dim: usize,
}

impl Default for LieIsoParams {
    fn default() -> Self {
        LieIsoParams {
            seed: 1,
            max_steps: 6,
            max_dim: 12,
        }
    }
}

type Vector = Vec<Q>;
type Subspace = Vec<Vector>;

/// Whether a tensor is a nilpotent Lie algebra over Q: anticommutative, Jacobi, lower
/// central series reaching 0 (exact; cost O(n^5) for the Jacobi identity).
pub fn is_nilpotent_lie(t: &Tensor) -> bool {
    if t.kind() != Kind::Algebra || t.field() != FieldSpec::Rational {
        return false;
    }
    let lie = Lie { t, n: t.dim() };
    let ok = crate::laws::check_laws(
        t,
        &crate::laws::Params {
            laws: vec![crate::laws::Law::Lie],
            stop_first: true,
            ..Default::default()
        },
    )
    .ok()
    .and_then(|r| r.holds(crate::laws::Law::Lie))
    .unwrap_or(false);
    ok && lie.lower_central().last().is_some_and(|s| s.is_empty())
}

/// Find an invertible M (columns: the images in E of X's basis vectors, in E's
/// coordinates) with `change_basis_algebra(e, M)` equal to `x` coefficient by coefficient,
/// for nilpotent Lie algebras x and e over Q (module documentation for the method).
/// Returns `None` when none is found within the budget, when the shapes differ or when
/// an algebra is not a nilpotent Lie algebra over Q. Cost: the characteristic subspaces
/// (O(n) subspace operations of O(n^4) each, then pairwise intersections), plus per
/// attempt O(n d) evaluations of the relations (d generators).
pub fn find_nilpotent_isomorphism(
    x: &Tensor,
    e: &Tensor,
    params: &LieIsoParams,
) -> Option<Matrix<Q>> {
    let n = x.dim();
    if e.dim() != n || n > params.max_dim || !is_nilpotent_lie(x) || !is_nilpotent_lie(e) {
        return None;
    }
    let (lx, le) = (Lie { t: x, n }, Lie { t: e, n });
    let (fx, fe) = (lx.characteristic_family(), le.characteristic_family());
    if fx.len() != fe.len() || fx.iter().zip(&fe).any(|(a, b)| a.len() != b.len()) {
        return None;
    }
    let e2 = le.lower_central().get(1).cloned().unwrap_or_default();
    let adapted = Adapted::new(&lx)?;
    // the smallest member of the family holding each basis vector of E
    let smallest = |v: &[Q]| -> (Subspace, Subspace) {
        let (mut se, mut sx) = (le.whole(), lx.whole());
        for (a, b) in fe.iter().zip(&fx) {
            if le.contains(a, v) {
                se = le.intersect(&se, a);
                sx = lx.intersect(&sx, b);
            }
        }
        (se, sx)
    };
    let mut order: Vec<(usize, usize, Subspace)> = (0..n)
        .map(|i| {
            let (se, sx) = smallest(&le.unit(i));
            (se.len(), i, sx)
        })
        .collect();
    // the most general generators first: the scale of a special one is then a rational
    // function of the earlier scales (L_{5,6}: the image of x2 scales as the square of x1's)
    order.sort_by_key(|(d, i, _)| (std::cmp::Reverse(*d), *i));
    let mut gens: Vec<Vector> = Vec::new();
    let mut places = Vec::new();
    let mut span = e2;
    for (_, i, sx) in order {
        if le.contains(&span, &le.unit(i)) {
            continue;
        }
        let g = le.unit(i);
        span.push(g.clone());
        gens.push(g);
        let lead: Vec<Vector> = sx.iter().map(|v| adapted.layer_part(v, 1)).collect();
        let k = lead.first().map_or(0, |v| v.len());
        places.push(span_of(lead, k));
    }
    if gens.is_empty() {
        // the zero algebra
        return Some(Matrix::identity(&Rationals, n));
    }
    let plan = plan_words(&le, &gens);
    if plan.vectors.len() != n {
        return None;
    }
    let mut search = Search {
        x: lx,
        plan,
        places,
        adapted,
        rng: rand_chacha::ChaCha8Rng::seed_from_u64(params.seed),
        steps: 0,
        params: params.clone(),
    };
    let ys = search.run()?;
    // phi(e_k) from the word images: F = Phi W^-1, then M = F^-1
    let images = word_images(&search.x, &search.plan, &ys, n);
    let columns = |vs: &[Vector]| Matrix {
        rows: n,
        cols: n,
        data: (0..n)
            .flat_map(|r| vs.iter().map(move |c| c[r].clone()))
            .collect(),
    };
    let w_inv = inverse_q(&columns(&search.plan.vectors))?;
    let f = columns(&images).mul(&Rationals, &w_inv);
    let m = inverse_q(&f)?;
    let y = change_basis_algebra(e, &m)?;
    same_constants(&y, x).then_some(m)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use crate::tensor::random_invertible;

    /// A Lie algebra from its brackets [x_i, x_j] = c x_k (i < j).
    fn lie(n: usize, brackets: &[(usize, usize, usize, i64)]) -> Tensor {
        let names = (1..=n).map(|i| format!("x{i}")).collect();
        let mut t = Tensor::algebra(FieldSpec::Rational, names);
        for &(i, j, k, c) in brackets {
            t.set(i, j, k, q(c, 1));
            t.set(j, i, k, q(-c, 1));
        }
        t
    }

    /// L_{5,6} (de Graaf 2007, Classification of 6-dimensional nilpotent Lie algebras over
    /// fields of characteristic not 2, J. Algebra 309): [x1,x2] = x3, [x1,x3] = x4,
    /// [x1,x4] = x5, [x2,x3] = x5.
    fn l56() -> Tensor {
        lie(5, &[(0, 1, 2, 1), (0, 2, 3, 1), (0, 3, 4, 1), (1, 2, 4, 1)])
    }

    #[test]
    fn finds_an_isomorphism_in_a_basis_with_large_coefficients() {
        let e = l56();
        assert!(find_nilpotent_isomorphism(&e, &e, &LieIsoParams::default()).is_some());
        let x = change_basis_algebra(&e, &random_invertible(5, 1_000_000, 5)).unwrap();
        let m = find_nilpotent_isomorphism(&x, &e, &LieIsoParams::default()).expect("found");
        assert!(same_constants(&change_basis_algebra(&e, &m).unwrap(), &x));
    }

    #[test]
    fn non_isomorphic_algebras_give_none() {
        // L_{5,5}: [x1,x2] = x3, [x1,x3] = x5, [x2,x4] = x5 (de Graaf 2007), not L_{5,6}.
        let other = lie(5, &[(0, 1, 2, 1), (0, 2, 4, 1), (1, 3, 4, 1)]);
        assert!(find_nilpotent_isomorphism(&other, &l56(), &LieIsoParams::default()).is_none());
        // not nilpotent: sl2 (Humphreys 1972, Introduction to Lie algebras)
        let sl2 = lie(3, &[(0, 1, 2, 1), (2, 0, 0, 2), (2, 1, 1, -2)]);
        assert!(!is_nilpotent_lie(&sl2));
        assert!(find_nilpotent_isomorphism(&sl2, &sl2, &LieIsoParams::default()).is_none());
    }
}
