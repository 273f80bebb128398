//! The simple components of the centre of a unital algebra over Q, when the centre is
//! semisimple (a product of number fields): their degrees, and the trace form of the
//! centre as an algebra of its own.
//!
//! Method: for a seeded random element z of the centre Z (a proven basis from
//! [`element_space`]), the minimal polynomial of z is the first linear relation of its
//! powers `1, z, z^2, ...` (exact, [`Alg::min_poly`]). When it has degree d = dim Z (z generates Z; otherwise another z is drawn), Z is isomorphic to `Q[t]/(m)`,
//! m the minimal polynomial of z. Z is semisimple exactly when m is squarefree, and then
//! its simple components are the fields `Q[t]/(g)` for the irreducible factors g of m
//! ([`crate::poly::rational::factor_rational`]), so the sorted degrees of the factors are an invariant.
//! The trace form `(x, y) -> Tr_Z(x y)` of Z, in the basis `1, t, ..., t^(d-1)` the Hankel
//! matrix of the power sums of the roots of m (Newton's identities), gives the signature
//! `(r1 + r2, r2)` (r1 real, r2 pairs of complex embeddings of the components) and the
//! discriminant of Z up to squares.
//!
//! Cost: at most 2d exact products in A and a few nullspaces of n x (k + 1) matrices per try,
//! then the factorization of a degree-d integer polynomial.

use super::algebra::Alg;
use crate::error::Result;
use crate::invariants::elements::{ElementSpace, element_space};
use crate::invariants::forms::{FormInvariants, form_invariants};
use crate::linalg::nullspace::SolveParams;
use crate::scalar::common_denominator;
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::{IntegralTensor, Tensor};
use num_bigint::BigInt;
use num_traits::Zero;

/// The components of a semisimple centre.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CentreComponents {
    /// The degrees over Q of the component fields, ascending.
    pub degrees: Vec<usize>,
    /// The trace form of the centre as an algebra.
    pub trace: FormInvariants,
}

/// Parameters of [`centre_components`].
#[derive(Clone, Debug)]
pub struct ComponentParams {
    pub seed: u64,
    /// Random elements tried before giving up on finding a generator.
    pub tries: usize,
    /// Skip centres of larger dimension.
    pub max_dim: usize,
    pub solve: SolveParams,
}

impl Default for ComponentParams {
    fn default() -> Self {
        ComponentParams {
            seed: 1,
            tries: 6,
            max_dim: 48,
            solve: SolveParams::default(),
        }
    }
}

/// The components of the centre of a unital algebra over Q; `None` when the algebra has no
/// unit, is over GF(p), its centre is not semisimple or is above the size limit, or no
/// generator of the centre was found in `tries` draws.
pub fn centre_components(
    t: &Tensor,
    it: &IntegralTensor,
    params: &ComponentParams,
) -> Result<Option<CentreComponents>> {
    use rand::{Rng, SeedableRng};
    if t.field() != FieldSpec::Rational {
        return Ok(None);
    }
    let Some(one) = crate::laws::find_unit(it, &params.solve)? else {
        return Ok(None);
    };
    let z_space = element_space(it, ElementSpace::Centre, &params.solve)?;
    let d = z_space.dim();
    if d == 0 || d > params.max_dim {
        return Ok(None);
    }
    let basis = z_space.dense_basis();
    let n = t.dim();
    let alg = Alg::from_tensor(&Rationals, t);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed ^ 0xc0de);
    for _ in 0..params.tries.max(1) {
        let z: Vec<Q> = (0..n)
            .map(|i| {
                basis.iter().fold(Q::zero(), |acc, b| {
                    acc + &b[i] * Q::from_integer(rng.gen_range(-9i64..=9).into())
                })
            })
            .collect();
        // z generates Z exactly when its minimal polynomial has degree d = dim Z
        let m = alg.min_poly(&z, &one, d, &params.solve)?;
        if m.len() != d + 1 {
            continue;
        }
        let factors = crate::poly::rational::factor_rational(&m)?.factors;
        if factors.iter().any(|(_, mult)| *mult > 1) {
            return Ok(None);
        }
        let mut degrees: Vec<usize> = factors.iter().map(|(g, _)| g.len() - 1).collect();
        degrees.sort_unstable();
        let trace = form_invariants(FieldSpec::Rational, &hankel_trace_form(&m));
        return Ok(Some(CentreComponents { degrees, trace }));
    }
    Ok(None)
}

/// The Gram matrix (scaled to integers by a square) of the trace form of `Q[t]/(m)` in the
/// basis `1, t, ..., t^(d-1)`: entry (i, j) the power sum `s_{i+j}` of the roots of the
/// monic m (Newton's identities).
fn hankel_trace_form(m: &[Q]) -> Vec<Vec<BigInt>> {
    let d = m.len() - 1;
    // e.g. m = t^d + c_{d-1} t^{d-1} + ... + c_0; s_0 = d,
    // s_k = -(k c_{d-k} + sum_{i=1}^{k-1} c_{d-i} s_{k-i}) for k <= d, and
    // s_k = -sum_{i=1}^{d} c_{d-i} s_{k-i} for k > d.
    let c = |i: usize| m[d - i].clone(); // coefficient of t^{d-i}
    let mut s: Vec<Q> = vec![Q::from_integer(BigInt::from(d))];
    for k in 1..=2 * d.saturating_sub(1) {
        let mut acc = Q::zero();
        for i in 1..=k.min(d) {
            if i == k {
                acc += Q::from_integer(BigInt::from(k)) * c(k);
            } else {
                acc += c(i) * &s[k - i];
            }
        }
        s.push(-acc);
    }
    let den = common_denominator(s.iter());
    let den2 = &den * &den;
    (0..d)
        .map(|i| {
            (0..d)
                .map(|j| {
                    let x = &s[i + j];
                    x.numer() * (&den2 / x.denom())
                })
                .collect()
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;

    #[test]
    fn cyclic_group_algebras() {
        // Q[C_n] = prod over d | n of Q(zeta_d), degrees phi(d) (Perlis and Walker 1950,
        // Abelian group algebras of finite order; common practice): C8 -> 1, 1, 2, 4;
        // C9 and C3 x C3 have the same trace form but fields 1, 2, 6 and 1, 2, 2, 2, 2.
        let comp = |spec: &str| {
            let t = generate(spec).unwrap();
            let it = IntegralTensor::from_tensor(&t);
            centre_components(&t, &it, &Default::default())
                .unwrap()
                .unwrap()
        };
        assert_eq!(comp("cyclic:8").degrees, vec![1, 1, 2, 4]);
        let c9 = comp("cyclic:9");
        let c33 = comp("perm:1,2,0,3,4,5;0,1,2,4,5,3");
        assert_eq!(c9.degrees, vec![1, 2, 6]);
        assert_eq!(c33.degrees, vec![1, 2, 2, 2, 2]);
        // signature (r1 + r2, r2): Q (1,0), Q(zeta_3) (1,1), Q(zeta_9) (3,3)
        assert_eq!(c9.trace.signature, Some((5, 4)));
        assert_eq!(c33.trace.signature, Some((5, 4)));
    }
}
