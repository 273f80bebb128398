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
//! Cost: the associator systems have n^3 / n... equations in n unknowns, built in
//! O(n^3 + nnz^2 / n) steps; the others O(n nnz).

use super::equations::{self, Slot};
use super::solve::{SolveParams, Space, solve_nullspace};
use super::system::{IntTable, SparseSystem};
use crate::error::Result;
use crate::scalar::{Field, PrimeField, Q};
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

/// The system whose solutions form the requested subspace.
pub fn element_system(t: &IntTable, which: ElementSpace) -> Result<SparseSystem> {
    use ElementSpace::*;
    let stack = |parts: Vec<SparseSystem>| {
        let mut s = t.system(t.dims[0]);
        for p in &parts {
            s.append(p);
        }
        s
    };
    Ok(match which {
        CommutativeCentre => equations::commutator(t)?,
        LeftNucleus => equations::associator(t, Slot::Left)?,
        MiddleNucleus => equations::associator(t, Slot::Middle)?,
        RightNucleus => equations::associator(t, Slot::Right)?,
        Nucleus => stack(vec![
            equations::associator(t, Slot::Left)?,
            equations::associator(t, Slot::Middle)?,
            equations::associator(t, Slot::Right)?,
        ]),
        Centre => stack(vec![
            equations::commutator(t)?,
            equations::associator(t, Slot::Left)?,
            equations::associator(t, Slot::Middle)?,
            equations::associator(t, Slot::Right)?,
        ]),
        LeftAnnihilator => equations::annihilator(t, true)?,
        RightAnnihilator => equations::annihilator(t, false)?,
        Annihilator => stack(vec![
            equations::annihilator(t, true)?,
            equations::annihilator(t, false)?,
        ]),
    })
}

/// A proven basis of the requested subspace of A. Cost: see the module documentation.
///
/// For the spaces defined by associators, a probe comes first: the equations of a seeded
/// random sample of blocks `(e_j, e_k)` (4, 16, 64, ... of the n^2) are eliminated mod p;
/// full column rank mod p proves the space is 0 (rank mod p <= rank over Q) without
/// building the O(n^5)-term system of a dense algebra. Otherwise the full system is solved.
pub fn element_space(t: &IntTable, which: ElementSpace, params: &SolveParams) -> Result<Space> {
    use ElementSpace::*;
    let n = t.dims[0];
    let slots: &[Slot] = match which {
        LeftNucleus => &[Slot::Left],
        MiddleNucleus => &[Slot::Middle],
        RightNucleus => &[Slot::Right],
        Nucleus | Centre => &[Slot::Left, Slot::Middle, Slot::Right],
        _ => &[],
    };
    if !slots.is_empty() && n > 8 {
        use rand::SeedableRng;
        use rand::seq::SliceRandom;
        let mut order: Vec<usize> = (0..n * n).collect();
        order.shuffle(&mut rand_chacha::ChaCha8Rng::seed_from_u64(params.seed));
        let p = match t.modulus {
            Some(p) if p < (1 << crate::linalg::modular::KERNEL_PRIME_BITS) => Some(p),
            Some(_) => None,
            None => Some(crate::linalg::modular::kernel_primes(1)[0]),
        };
        let mut take = 4;
        while let Some(p) = p
            && take < n * n
            && take <= 256
        {
            let mut sys = t.system(n);
            if which == Centre {
                sys.append(&equations::commutator(t)?);
            }
            for &sl in slots {
                sys.append(&equations::associator_blocks(t, sl, Some(&order[..take]))?);
            }
            if probe_full_rank(&sys, p) {
                return Ok(Space {
                    unknowns: n,
                    basis: Vec::new(),
                });
            }
            take *= 4;
        }
    }
    solve_nullspace(&element_system(t, which)?, params)
}

/// True when the system has full column rank modulo p (so only 0 solves it over Q).
fn probe_full_rank(sys: &SparseSystem, p: u64) -> bool {
    let n = sys.unknowns;
    let mut data = vec![0u64; sys.rows() * n];
    for r in 0..sys.rows() {
        let (cols, vals) = sys.row(r);
        for (&c, &v) in cols.iter().zip(vals) {
            data[r * n + c as usize] = v.rem_euclid(p as i64) as u64;
        }
    }
    crate::linalg::modular::rref_mod(&mut data, sys.rows(), n, p, false).len() == n
}

/// The two-sided unit of A, if any (exact; checked against every equation
/// `u e_j = e_j = e_j u`). Cost: one system of 2 n^2 equations in n + 1 unknowns.
pub fn unit(t: &IntTable, params: &SolveParams) -> Result<Option<Vec<Q>>> {
    let n = t.dims[0];
    let sp = solve_nullspace(&equations::unit(t)?, params)?;
    let Some(v) = sp.basis.iter().find(|v| !v[n].is_zero()) else {
        return Ok(None);
    };
    // the unit of the scaled algebra is u / s; the unit of A is L u / s
    let u: Vec<Q> = match t.modulus {
        None => {
            let f = Q::from_integer(t.scale.clone()) / &v[n];
            v[..n].iter().map(|x| x * &f).collect()
        }
        Some(p) => {
            let f = PrimeField::new(p).expect("prime");
            let s = f.from_rational(&v[n]).expect("residue");
            let si = f.inv(&s).expect("nonzero");
            v[..n]
                .iter()
                .map(|x| f.to_rational(&f.mul(&f.from_rational(x).expect("residue"), &si)))
                .collect()
        }
    };
    Ok(Some(u))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::{quaternions, upper_triangular_2};

    #[test]
    fn quaternion_centre_and_unit() {
        // H is central simple over Q with unit 1: centre = Q 1, nucleus = H (associative).
        // Source: Jacobson 1980, Basic Algebra II (quaternion algebras are central simple).
        let t = IntTable::from_tensor(&quaternions()).unwrap();
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
        let t = IntTable::from_tensor(&upper_triangular_2()).unwrap();
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
