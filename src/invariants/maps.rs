//! Algebras of linear maps attached to an algebra A of dimension n:
//! - the centroid `C(A) = {X : X(ab) = X(a) b = a X(b)}`;
//! - the derivation algebra `Der(A) = {D : D(ab) = D(a) b + a D(b)}`;
//! - inner derivations (A associative: `ad_x = L_x - R_x`; A Lie: `ad_x = L_x`), a
//!   subalgebra of Der(A) in both cases, with `dim Inn = n - dim ker(ad)`, where
//!   `ker(ad)` is the commutative centre (associative) or the centre `{x : x A = 0}` (Lie);
//! - the adjoint algebra `{(f, g) : f(a) b = a g(b)}`.
//!
//! A map X is the vector of its matrix entries: `X(e_i) = sum_l X[l][i] e_l` in
//! coordinate `l n + i`. Bases are proven by [`solve_nullspace`].
//! Cost: systems of 2 n^3 (centroid), n^3 (derivations, adjoint) equations with O(nnz n)
//! terms in n^2 (2 n^2) unknowns; see [`super::solve`] for the elimination.

use super::elements::{ElementSpace, element_space};
use super::equations::{Eq, System};
use super::generated::{Kind, solve_by_generators};
use crate::error::Result;
use crate::linalg::Matrix;
use crate::linalg::nullspace::{SolveParams, Space, largest_component, solve_nullspace};
use crate::scalar::{Q, common_denominator};
use crate::tensor::IntegralTensor;
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_traits::{One, Zero};

/// The centroid and its properties.
#[derive(Clone, Debug)]
pub struct Centroid {
    pub space: Space,
    /// `Some(true)` when proven commutative, `Some(false)` when two basis maps do not
    /// commute, `None` when not decided (large, with A^2 != A).
    pub commutative: Option<bool>,
    /// Why the commutativity verdict holds.
    pub commutative_reason: String,
    /// `Some(true)` when dimension 1 (the centroid is then the ground field).
    pub field: Option<bool>,
}

/// The centroid of an algebra. Commutativity: when A^2 = A it is a theorem (for X, Y in
/// C(A): XY(ab) = X(a Y(b)) = X(a) Y(b) = Y(X(a) b) = YX(ab); Jacobson 1962, Lie Algebras,
/// ch. X); otherwise the basis maps are multiplied exactly (when n <= 32 and dim <= 32).
/// With a unit the basis is read from the centre ([`centroid_of_unital`]): a system in n
/// unknowns instead of n^2. `associative`: the verdict when already known (otherwise the
/// law engine decides it when needed).
pub fn centroid(
    t: &Tensor,
    k: &IntegralTensor,
    params: &SolveParams,
    associative: Option<bool>,
) -> Result<Centroid> {
    let n = k.dims[0];
    let space = if crate::laws::find_unit(k, params)?.is_some() {
        // in an associative algebra (proven by the law engine) the centre is the
        // commutative centre: n^2 equations instead of the nuclei's 3 n^3
        let which = if is_associative(t, associative)? {
            ElementSpace::CommutativeCentre
        } else {
            ElementSpace::Centre
        };
        centroid_of_unital(k, &element_space(k, which, params)?)
    } else {
        solve_maps(k, Kind::Centroid, params)?
    };
    let d = space.dim();
    let (commutative, reason) = if d <= 1 {
        (Some(true), "dimension at most 1".to_string())
    } else if crate::tensor::flatten::flattening_ranks_of(k)[2] == n {
        (
            Some(true),
            "A^2 = A, so the centroid is commutative (theorem)".to_string(),
        )
    } else if n <= 32 && d <= 32 {
        let c = maps_commute(t, &space, n);
        (Some(c), "basis maps multiplied exactly".to_string())
    } else {
        (
            None,
            "not decided (A^2 != A and too large to multiply out)".to_string(),
        )
    };
    let field = if d == 1 { Some(true) } else { None };
    Ok(Centroid {
        space,
        commutative,
        commutative_reason: reason,
        field,
    })
}

fn maps_commute(t: &Tensor, space: &Space, n: usize) -> bool {
    crate::with_field!(t.field(), f => {
        use crate::scalar::Field;
        let mats: Vec<Matrix<_>> = (0..space.dim())
            .map(|i| to_matrix(&space.dense(i), n, 0).map(|x| f.from_rational(x).expect("in field")))
            .collect();
        for a in 0..mats.len() {
            for b in a + 1..mats.len() {
                if mats[a].mul(f, &mats[b]) != mats[b].mul(f, &mats[a]) {
                    return false;
                }
            }
        }
        true
    })
}

/// The derivation algebra Der(A) (proven basis).
pub fn derivations(k: &IntegralTensor, params: &SolveParams) -> Result<Space> {
    solve_maps(k, Kind::Derivations, params)
}

/// Derivations or the centroid: through generators ([`super::generated`]) when the plain
/// system (n^2 unknowns) would be eliminated as one large block: dense tables, or sparse
/// ones whose largest connected block of unknowns is large; otherwise the plain system,
/// block by block. Both answers are proven by the same exact check.
fn solve_maps(k: &IntegralTensor, kind: Kind, params: &SolveParams) -> Result<Space> {
    let n = k.dims[0];
    let plain = System::new(
        k,
        &[match kind {
            Kind::Derivations => Eq::Derivations,
            Kind::Centroid => Eq::Centroid,
        }],
    );
    let worth = n >= 8 && (k.dense || largest_component(&plain) > 8 * n);
    if worth && let Some(space) = solve_by_generators(k, kind, params)? {
        return Ok(space);
    }
    solve_nullspace(&plain, params)
}

/// The adjoint algebra: pairs (f, g) with `f(a) b = a g(b)`; a vector holds f (first n^2
/// coordinates) then g. With a unit the basis is read from the middle nucleus (see
/// [`adjoint_of_unital`]): a system in n unknowns instead of 2 n^2. `associative` as for
/// [`centroid`].
pub fn adjoint_algebra(
    t: &Tensor,
    k: &IntegralTensor,
    params: &SolveParams,
    associative: Option<bool>,
) -> Result<Space> {
    if crate::laws::find_unit(k, params)?.is_some() {
        let middle = if is_associative(t, associative)? {
            Space::whole(k.dims[0])
        } else {
            element_space(k, ElementSpace::MiddleNucleus, params)?
        };
        return Ok(adjoint_of_unital(k, &middle));
    }
    solve_nullspace(&System::new(k, &[Eq::AdjointPairs]), params)
}

/// Associativity: the known verdict, or decided by the law engine (stopping at a first
/// failure).
fn is_associative(t: &Tensor, known: Option<bool>) -> Result<bool> {
    if let Some(a) = known {
        return Ok(a);
    }
    let lp = crate::laws::Params {
        laws: vec![crate::laws::Law::Associative],
        stop_first: true,
        ..Default::default()
    };
    Ok(crate::laws::check_laws(t, &lp)?.holds(crate::laws::Law::Associative) == Some(true))
}

/// The adjoint algebra of a unital algebra from its middle nucleus N_m (the w with
/// `(a w) b = a (w b)` for all a, b): the pairs `(R_w, L_w)`, w in N_m. Proof: for a pair
/// (f, g) put u = f(1), w = g(1); then f(a) = f(a) 1 = a w and g(b) = 1 g(b) = u b, and
/// u = f(1) = w; the condition `(a w) b = a (w b)` is then the definition of N_m; and
/// w -> (R_w, L_w) is injective since R_w(1) = w (common practice).
/// Cost: O(n nnz) per basis vector of N_m.
pub fn adjoint_of_unital(k: &IntegralTensor, middle: &Space) -> Space {
    let n = k.dims[0];
    let basis = (0..middle.dim())
        .map(|b| {
            // f = R_w first, then g = L_w
            let terms: Vec<Term> = middle.basis[b]
                .iter()
                .flat_map(|(p, wp)| [(*p as usize, wp, false, 0), (*p as usize, wp, true, n * n)])
                .collect();
            multiplication_sum(k, &terms, 2 * n * n)
        })
        .collect();
    Space {
        unknowns: 2 * n * n,
        basis,
    }
}

/// Inner derivations of an associative (`lie = false`) or Lie (`lie = true`) algebra:
/// a basis `ad_{e_p}` for p outside the free coordinates of the kernel of `x -> ad_x`.
pub fn inner_derivations(k: &IntegralTensor, lie: bool, params: &SolveParams) -> Result<Space> {
    let n = k.dims[0];
    let which = if lie {
        ElementSpace::LeftAnnihilator
    } else {
        ElementSpace::CommutativeCentre
    };
    let ker = element_space(k, which, params)?;
    // the engine's reduced form puts 1 at each vector's own free coordinate and 0 at the
    // others': the coordinates where one kernel vector is 1 and all others 0 are the free
    // ones
    let dense = ker.dense_basis();
    let mut free = vec![false; n];
    for (i, v) in dense.iter().enumerate() {
        let f = (0..n)
            .find(|&c| {
                v[c].is_one()
                    && dense
                        .iter()
                        .enumerate()
                        .all(|(j, w)| j == i || w[c].is_zero())
            })
            .expect("reduced basis");
        free[f] = true;
    }
    let basis = (0..n)
        .filter(|&p| !free[p])
        .map(|p| ad_vector(k, p, lie))
        .collect();
    Ok(Space {
        unknowns: n * n,
        basis,
    })
}

/// The centroid of a unital algebra A from its centre Z(A) (the elements that commute and
/// associate with everything): `C(A) = {L_z : z in Z(A)}`, one map per basis vector of
/// the centre. Proof: for X in C(A) put z = X(1); then X(a) = X(1 a) = z a and
/// X(a) = X(a 1) = a z, and X(ab) = (za)b = a(zb) = (ab)z with X(ab) = z(ab) put every
/// associator containing z to zero, so z is in Z(A); conversely, for z in Z(A),
/// z(ab) = (za)b = a(zb); and z -> L_z is injective since L_z(1) = z (common practice;
/// Jacobson 1962, Lie Algebras, ch. X, from memory). The centre's basis is proven by its
/// own system, so the maps need no system of n^2 unknowns.
/// Cost: O(n nnz) per basis vector of the centre.
pub fn centroid_of_unital(k: &IntegralTensor, centre: &Space) -> Space {
    let n = k.dims[0];
    let basis = (0..centre.dim())
        .map(|b| {
            // L_z = sum_p z_p L_{e_p}
            let terms: Vec<Term> = centre.basis[b]
                .iter()
                .map(|(p, zp)| (*p as usize, zp, true, 0))
                .collect();
            multiplication_sum(k, &terms, n * n)
        })
        .collect();
    Space {
        unknowns: n * n,
        basis,
    }
}

/// A term `coef L_{e_p}` (`left`) or `coef R_{e_p}` of a map stored at `offset`:
/// `(p, coef, left, offset)`.
type Term<'a> = (usize, &'a Q, bool, usize);

/// The sum of the terms as a sparse vector of `len` coordinates in the original constants
/// (over GF(q) the representatives): `L_{e_p}(e_i) = e_p e_i`, `R_{e_p}(e_i) = e_i e_p`,
/// entry `[l][i]` at `offset + l n + i`. The coefficients are put over their common
/// denominator d and the products accumulated in integers with the integer-scaled
/// constants (scale L), so each nonzero entry costs one fraction `a / (d L)`, not one
/// rational addition per term.
/// Cost: O(nnz of the rows or columns of the p) integer multiply-adds.
fn multiplication_sum(k: &IntegralTensor, terms: &[Term], len: usize) -> Vec<(u32, Q)> {
    let n = k.dims[0];
    let den = common_denominator(terms.iter().map(|t| t.1));
    let mut acc = vec![BigInt::zero(); len];
    for &(p, coef, left, offset) in terms {
        let c = coef.numer() * (&den / coef.denom());
        for i in 0..n {
            for (l, x) in k.product_by(p, i, left) {
                acc[offset + *l as usize * n + i] += &c * x;
            }
        }
    }
    let scale = den * &k.scale;
    let field = k
        .modulus()
        .map(|m| crate::scalar::PrimeField::new(m).expect("prime"));
    acc.into_iter()
        .enumerate()
        .filter(|(_, a)| !a.is_zero())
        .map(|(i, a)| {
            let x = Q::new(a, scale.clone());
            let x = match &field {
                Some(f) => {
                    use crate::scalar::Field;
                    f.to_rational(&f.from_rational(&x).expect("residue"))
                }
                None => x,
            };
            (i as u32, x)
        })
        .filter(|(_, x)| !x.is_zero())
        .collect()
}

/// `ad_{e_p}` as a sparse map vector in the original constants (over GF(q) the
/// representatives): `x e_i - e_i x` (associative) or `x e_i` (Lie).
fn ad_vector(k: &IntegralTensor, p: usize, lie: bool) -> Vec<(u32, Q)> {
    let n = k.dims[0];
    let (one, minus) = (Q::one(), -Q::one());
    let mut terms: Vec<Term> = vec![(p, &one, true, 0)];
    if !lie {
        terms.push((p, &minus, false, 0));
    }
    multiplication_sum(k, &terms, n * n)
}

/// The `n x n` matrix of a map stored at `offset` in a vector.
pub fn to_matrix(v: &[Q], n: usize, offset: usize) -> Matrix<Q> {
    Matrix {
        rows: n,
        cols: n,
        data: v[offset..offset + n * n].to_vec(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::*;

    fn der_dim(t: &Tensor) -> usize {
        derivations(&IntegralTensor::from_tensor(t), &SolveParams::default())
            .unwrap()
            .dim()
    }

    #[test]
    fn derivations_of_classical_algebras() {
        // Der(O) = G2, dimension 14: Schafer 1966, An Introduction to Nonassociative
        // Algebras, ch. III.8.
        assert_eq!(der_dim(&octonions()), 14);
        // Der(H) = inner = ad(H) ~ so(3), dimension 3: Schafer 1966, ch. III.
        assert_eq!(der_dim(&quaternions()), 3);
        // Der(M_n) = inner, dimension n^2 - 1: Jacobson 1962, Lie Algebras, ch. I
        // (every derivation of a central simple associative algebra is inner).
        for n in 2..=3 {
            let t = matrix_algebra(n);
            let it = IntegralTensor::from_tensor(&t);
            let p = SolveParams::default();
            assert_eq!(derivations(&it, &p).unwrap().dim(), n * n - 1);
            assert_eq!(inner_derivations(&it, false, &p).unwrap().dim(), n * n - 1);
        }
    }

    #[test]
    fn heisenberg_derivations() {
        // Computed by hand: for [x,y] = z, D(z) = D([x,y]) = [Dx,y] + [x,Dy]. Write
        // D x = a x + b y + c z, D y = d x + e y + f z, D z = g x + h y + i z. Then
        // [Dx, y] + [x, Dy] = (a + e) z, so D z = (a + e) z: g = h = 0, i = a + e; and
        // [Dx, z] = 0 = [x, Dz], [Dy, z] = 0 = [y, Dz] hold. Free: a, b, c, d, e, f: dim 6.
        assert_eq!(der_dim(&heisenberg3()), 6);
    }

    #[test]
    fn centroids() {
        // Central simple algebras have centroid = ground field: Jacobson 1980, Basic
        // Algebra II, sect. 10.1 (from memory for the section number).
        let p = SolveParams::default();
        for t in [octonions(), quaternions(), matrix_algebra(2)] {
            let it = IntegralTensor::from_tensor(&t);
            let c = centroid(&t, &it, &p, None).unwrap();
            assert_eq!(c.space.dim(), 1);
            assert_eq!(c.field, Some(true));
        }
        // A field extension K of Q has centroid K (dimension [K:Q] = 2): Jacobson 1980.
        for d in [2, -1] {
            let t = quadratic_field(d);
            let it = IntegralTensor::from_tensor(&t);
            let c = centroid(&t, &it, &p, None).unwrap();
            assert_eq!(c.space.dim(), 2);
            assert_eq!(c.commutative, Some(true));
        }
    }

    #[test]
    fn adjoint_of_matrix_algebra() {
        // For unital A, f(a) b = a g(b) forces f = R_c, g = L_c with c = g(1) (put a = 1
        // and b = 1): dim = dim A. Common practice.
        let t = matrix_algebra(2);
        let it = IntegralTensor::from_tensor(&t);
        assert_eq!(
            adjoint_algebra(&t, &it, &SolveParams::default(), None)
                .unwrap()
                .dim(),
            4
        );
    }

    #[test]
    fn centroid_and_adjoint_of_a_unital_algebra_from_its_centre_and_middle_nucleus() {
        // differential: the maps L_z (z in the centre) against the centroid's own system,
        // on unital algebras associative or not, commutative or not, over Q and GF(5),
        // and in a scrambled basis (the theorem: see `centroid_of_unital`)
        let p = SolveParams::default();
        // entries up to 10^6
        let m = crate::tensor::random_invertible(8, 1_000_000, 7);
        let scrambled = crate::tensor::change_basis_algebra(&octonions(), &m).unwrap();
        let cases = [
            quaternions(),
            octonions(),
            matrix_algebra(2),
            group_algebra_s3(),
            quadratic_field(-3),
            truncated_polynomials(4),
            scrambled,
            group_algebra_s3()
                .with_field(crate::scalar::FieldSpec::Prime(5))
                .unwrap(),
        ];
        for t in cases {
            let it = IntegralTensor::from_tensor(&t);
            let system = solve_maps(&it, Kind::Centroid, &p).unwrap();
            let fast = centroid(&t, &it, &p, None).unwrap().space;
            assert_eq!(fast.dim(), system.dim());
            let plain = System::new(&it, &[Eq::Centroid]);
            assert!(crate::linalg::nullspace::check_solutions(&plain, &fast.basis).unwrap());
            // the adjoint algebra likewise, from the middle nucleus
            let pairs = System::new(&it, &[Eq::AdjointPairs]);
            let fast = adjoint_algebra(&t, &it, &p, None).unwrap();
            assert_eq!(fast.dim(), solve_nullspace(&pairs, &p).unwrap().dim());
            assert!(crate::linalg::nullspace::check_solutions(&pairs, &fast.basis).unwrap());
        }
    }
}
