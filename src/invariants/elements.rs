//! Subspaces of an algebra A cut out by element conditions, and the unit.
//!
//! - commutative centre `Comm(A) = {z : z a = a z for all a}`;
//! - left, middle, right nuclei `{x : (x,a,b) = 0}`, `{x : (a,x,b) = 0}`, `{x : (a,b,x) = 0}`
//!   with the associator `(a,b,c) = (ab)c - a(bc)`; the nucleus is their intersection;
//! - the centre `Z(A) = Comm(A) ∩ nucleus` (commuting and associating with everything);
//! - left / right / two-sided annihilators `{x : x A = 0}`, `{x : A x = 0}`, both;
//! - the two-sided unit, if any.
//!
//! Every result is a proven basis from [`solve_nullspace`] (vectors in the user's basis).
//! Cost: the associator systems have n^3 equations in n unknowns, each block of n
//! equations n products of a vector with a basis element; the others O(n nnz) terms.

use super::equations::{Eq, Slot, System};
use crate::error::Result;
use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
use crate::scalar::Q;
use crate::tensor::IntegralTensor;
#[cfg(test)]
use num_traits::Zero;

/// Which element subspace to compute.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ElementSpace {
    CommutativeCentre,
    Centre,
    LeftNucleus,
    MiddleNucleus,
    RightNucleus,
    Nucleus,
    LeftAnnihilator,
    RightAnnihilator,
    Annihilator,
}

impl ElementSpace {
    /// The families of equations that cut out the subspace.
    pub fn equations(self) -> Vec<Eq> {
        use ElementSpace::*;
        let assoc = [
            Eq::Associator(Slot::Left),
            Eq::Associator(Slot::Middle),
            Eq::Associator(Slot::Right),
        ];
        match self {
            CommutativeCentre => vec![Eq::Commutator],
            LeftNucleus => vec![Eq::Associator(Slot::Left)],
            MiddleNucleus => vec![Eq::Associator(Slot::Middle)],
            RightNucleus => vec![Eq::Associator(Slot::Right)],
            Nucleus => assoc.to_vec(),
            Centre => {
                let mut v = vec![Eq::Commutator];
                v.extend(assoc);
                v
            }
            LeftAnnihilator => vec![Eq::Annihilator { left: true }],
            RightAnnihilator => vec![Eq::Annihilator { left: false }],
            Annihilator => vec![
                Eq::Annihilator { left: true },
                Eq::Annihilator { left: false },
            ],
        }
    }
}

/// A proven basis of the requested subspace of A. Cost: see the module documentation; for
/// a dense table the associator equations are produced block by block and the elimination
/// stops as soon as the rank mod p is full (a proof that the space is 0).
pub fn element_space(
    k: &IntegralTensor,
    which: ElementSpace,
    params: &SolveParams,
) -> Result<Space> {
    use ElementSpace::*;
    // the nucleus and the centre as intersections of the single-family spaces: three or
    // four systems of n^3 (n^2) equations instead of one of 3 n^3 on top of them
    let parts: &[ElementSpace] = match which {
        Nucleus => &[LeftNucleus, MiddleNucleus, RightNucleus],
        Centre => &[CommutativeCentre, LeftNucleus, MiddleNucleus, RightNucleus],
        _ => return solve_nullspace(&System::new(k, &which.equations()), params),
    };
    let modulus = k.modulus();
    let mut out = element_space(k, parts[0], params)?;
    for &p in &parts[1..] {
        if out.dim() == 0 {
            break;
        }
        out = out.intersection(&element_space(k, p, params)?, modulus)?;
    }
    Ok(out)
}

/// The two-sided unit of A, if any (exact; checked against every equation
/// `u e_j = e_j = e_j u`; see [`crate::laws::find_unit`]).
pub fn unit(k: &IntegralTensor, params: &SolveParams) -> Result<Option<Vec<Q>>> {
    crate::laws::find_unit(k, params)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::{quaternions, upper_triangular_2};

    #[test]
    fn quaternion_centre_and_unit() {
        // H is central simple over Q with unit 1: centre = Q 1, nucleus = H (associative).
        // Source: Jacobson 1980, Basic Algebra II (quaternion algebras are central simple).
        let t = IntegralTensor::from_tensor(&quaternions());
        let p = SolveParams::default();
        assert_eq!(
            element_space(&t, ElementSpace::Centre, &p).unwrap().dim(),
            1
        );
        assert_eq!(
            element_space(&t, ElementSpace::Nucleus, &p).unwrap().dim(),
            4
        );
        assert_eq!(
            element_space(&t, ElementSpace::Annihilator, &p)
                .unwrap()
                .dim(),
            0
        );
        let u = unit(&t, &p).unwrap().unwrap();
        assert_eq!(
            u,
            vec![Q::from_integer(1.into()), Q::zero(), Q::zero(), Q::zero()]
        );
    }

    #[test]
    fn triangular_annihilators() {
        // upper triangular 2x2 (basis e11, e12, e22): unit e11 + e22, centre = scalars;
        // e12 annihilates on neither side alone (e11 e12 = e12), common practice.
        let t = IntegralTensor::from_tensor(&upper_triangular_2());
        let p = SolveParams::default();
        assert_eq!(
            element_space(&t, ElementSpace::Centre, &p).unwrap().dim(),
            1
        );
        assert_eq!(
            element_space(&t, ElementSpace::LeftAnnihilator, &p)
                .unwrap()
                .dim(),
            0
        );
        let u = unit(&t, &p).unwrap().unwrap();
        assert_eq!(
            u,
            vec![
                Q::from_integer(1.into()),
                Q::zero(),
                Q::from_integer(1.into())
            ]
        );
    }
}
