//! Multiplication in a semisimple algebra that splits into full matrix algebras and
//! fields, in any basis: the direct sum of a scheme per part, carried into the table's
//! basis through an explicit isomorphism ([`crate::structure::matrix_units`]).
//!
//! Construction. When `A = M_k1(F) x ... x M_ks(F) x K_1 x ... x K_t` (fields K_j), with
//! matrix units and central idempotents found exactly, the product of A is the sum of the
//! products of its parts: `x y = sum_i (x c_i)(y c_i)`. A part `M_k(F)` takes the best
//! scheme of `<k,k,k>` the caller supplies (the catalog's), its linear forms read on the
//! matrix of `x c_i` in the part's matrix units and its results written back through
//! them; a field part takes the interpolation scheme of rank `2 d - 1`
//! ([`super::monogenic`]). The rank is the sum of the parts' ranks. With the rank 7 of
//! `M_2` (Strassen 1969; optimal, Winograd 1971) and `2 d - 1` for fields, every algebra
//! whose matrix parts are at most 2 x 2 meets the Alder-Strassen bound `2 dim A - t`
//! (Alder and Strassen 1981): `2 k^2 - 1` for `M_k`, one maximal ideal per part; the
//! group algebra of the symmetric group S_3, `Q x Q x M_2(Q)`, has rank 9.
//!
//! A bilinear map `U x V -> W` of equal dimensions written in three bases of its own is
//! read through a unital isotope ([`crate::ranks::isotope`]), as for commutative algebras.
//!
//! Invariant: a scheme is returned only after the exact check against the tensor
//! ([`crate::scheme::verify`]).

use super::monogenic::{MonogenicParams, monogenic_scheme};
use super::transport::push_transported;
use crate::laws::{find_unit_direct, find_unit_in};
use crate::linalg::subspace::span;
use crate::ranks::isotope::unital_isotope;
use crate::scalar::{Field, Q};
use crate::scheme::{Scheme, verify};
use crate::structure::algebra::Alg;
use crate::structure::matrix_units::{SimplePart, SplitParams, split_semisimple};
use crate::tensor::Tensor;

/// Parameters of [`semisimple_scheme`].
#[derive(Clone, Debug)]
pub struct SemisimpleParams {
    pub split: SplitParams,
    /// Tables of larger dimension are left out (the split costs O(n^4) exact operations
    /// per candidate element).
    pub max_dim: usize,
}

impl Default for SemisimpleParams {
    fn default() -> Self {
        SemisimpleParams {
            split: SplitParams::default(),
            max_dim: 36,
        }
    }
}

/// The shape of one part: `M_k(F)` or a field of degree d.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PartShape {
    Matrix(usize),
    Field(usize),
}

/// The scheme and the parts it was built from.
#[derive(Clone, Debug)]
pub struct Semisimple {
    /// Verified exactly against the tensor.
    pub scheme: Scheme,
    /// The parts, fields first, each with the rank of its scheme.
    pub parts: Vec<(PartShape, usize)>,
}

impl Semisimple {
    /// The parts as text: `Q x Q x M_2(Q)` (a field of degree d: `K(d)`).
    pub fn parts_text(&self, field: &str) -> String {
        self.parts
            .iter()
            .map(|(p, _)| match p {
                PartShape::Matrix(1) | PartShape::Field(1) => field.to_string(),
                PartShape::Matrix(k) => format!("M_{k}({field})"),
                PartShape::Field(d) => format!("a field of degree {d}"),
            })
            .collect::<Vec<_>>()
            .join(" x ")
    }
}

/// A scheme for the multiplication of a semisimple algebra split into matrix algebras and
/// fields (see the module documentation), with `matrix_scheme(k)` a scheme of the matrix
/// algebra `M_k` in its basis `E_ij` (index `i k + j`) over the tensor's field (the
/// generator `matrix:k`), or `None`: the table is not square, not associative with a unit
/// (nor isotopic to such an algebra), not semisimple, has a part of another kind, no split
/// was found, or a part has no scheme. Cost: that of [`split_semisimple`] and one exact
/// verification.
pub fn semisimple_scheme(
    t: &Tensor,
    params: &SemisimpleParams,
    matrix_scheme: &dyn Fn(usize) -> Option<Scheme>,
) -> Option<Semisimple> {
    let d = t.dims();
    if d[0] != d[1] || d[1] != d[2] || d[0] < 2 || d[0] > params.max_dim {
        return None;
    }
    // screening modulo a word prime: associative (on seeded random triples), with a unit
    let (fp, tp) = t.screening()?;
    let ap = Alg::from_tensor(&fp, &tp);
    if !ap.looks_associative(params.split.seed) {
        // not associative; perhaps a map whose unital isotope is
        return through_isotope(t, params, matrix_scheme);
    }
    if find_unit_direct(&fp, &ap.table).is_none() {
        return through_isotope(t, params, matrix_scheme);
    }
    let s = crate::with_field!(t.field(), f => of_algebra(f, t, params, matrix_scheme))?;
    verify(&s.scheme, t).is_ok().then_some(s)
}

/// The scheme of a map without a unit through its unital isotope (the isotope must be an
/// algebra with a unit, screened associative first).
fn through_isotope(
    t: &Tensor,
    params: &SemisimpleParams,
    matrix_scheme: &dyn Fn(usize) -> Option<Scheme>,
) -> Option<Semisimple> {
    let iso = unital_isotope(t).ok()?;
    let (fp, tp) = iso.algebra.screening()?;
    if !Alg::from_tensor(&fp, &tp).looks_associative(params.split.seed) {
        return None;
    }
    let s = crate::with_field!(t.field(), f => of_algebra(f, &iso.algebra, params, matrix_scheme))?;
    let scheme = iso.pull_back(t, &s.scheme)?;
    verify(&scheme, t)
        .is_ok()
        .then_some(Semisimple { scheme, ..s })
}

/// The construction over the field context `f` (not yet verified against t).
fn of_algebra<F: Field>(
    f: &F,
    t: &Tensor,
    params: &SemisimpleParams,
    matrix_scheme: &dyn Fn(usize) -> Option<Scheme>,
) -> Option<Semisimple> {
    let a = Alg::from_tensor(f, t);
    let n = a.n;
    let sp = &params.split.solve;
    let one = find_unit_in(f, t, sp).ok()??;
    let parts = split_semisimple(&a, &one, &params.split).ok()??;
    let mut scheme = Scheme::empty(t.field(), [n, n, n]);
    let mut shapes = Vec::new();
    for part in &parts {
        let before = scheme.rank();
        match part {
            SimplePart::Field { idempotent, degree } => {
                let prods: Vec<Vec<F::Elem>> =
                    (0..n).map(|m| a.mul(&a.basis(m), idempotent)).collect();
                let comp = span(f, &prods, n, sp).ok()?;
                let k = Alg::subalgebra(f, &comp, |x, y| a.mul(x, y), false).ok()?;
                let s = field_scheme(&k.to_tensor("k"))?;
                // the coordinates of x c in the part's basis, for each basis vector x
                let proj: Vec<Vec<F::Elem>> = prods.iter().map(|p| comp.coords(p)).collect();
                push_transported(f, &mut scheme, &s, [&proj, &proj], &comp.basis);
                shapes.push((PartShape::Field(*degree), scheme.rank() - before));
            }
            SimplePart::Matrix { size, units, .. } => {
                let s = if *size == 1 {
                    let one = vec![Q::from_integer(1.into())];
                    let mut s = Scheme::empty(t.field(), [1, 1, 1]);
                    s.push(one.clone(), one.clone(), one);
                    s
                } else {
                    matrix_scheme(*size)?
                };
                let proj: Vec<Vec<F::Elem>> = (0..n)
                    .map(|m| part.matrix_of(&a, &a.basis(m)))
                    .collect::<Option<_>>()?;
                push_transported(f, &mut scheme, &s, [&proj, &proj], units);
                shapes.push((PartShape::Matrix(*size), scheme.rank() - before));
            }
        }
    }
    Some(Semisimple {
        scheme,
        parts: shapes,
    })
}

/// The interpolation scheme of a field part (rank `2 d - 1`; rank 1 for degree 1).
fn field_scheme(k: &Tensor) -> Option<Scheme> {
    monogenic_scheme(k, &MonogenicParams::default()).map(|m| m.scheme)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;
    use crate::scalar::FieldSpec;
    use crate::tensor::{change_basis_algebra, random_invertible};

    /// The schoolbook scheme of `M_k` except `M_2`: Strassen's 7 (built from the catalog in
    /// the callers; here the standard scheme keeps the test below the catalog layer).
    fn matrix_scheme(k: usize) -> Option<Scheme> {
        Some(Scheme::standard(&generate(&format!("matrix:{k}")).ok()?))
    }

    #[test]
    fn group_algebras_get_the_sum_of_their_parts() {
        // Q[S_3] = Q x Q x M_2(Q): 1 + 1 + 8 with the schoolbook M_2 here (Serre 1977,
        // Linear Representations of Finite Groups, sect. 5; from memory)
        let t = generate("dihedral:3").unwrap();
        let s = semisimple_scheme(&t, &SemisimpleParams::default(), &matrix_scheme).unwrap();
        assert_eq!(s.scheme.rank(), 10);
        assert_eq!(s.parts_text("Q"), "Q x Q x M_2(Q)");
        // Q[A_4] = Q x Q(w) x M_3(Q): 1 + 3 + 27
        let t = generate("perm:1,2,0,3;1,0,3,2").unwrap();
        let s = semisimple_scheme(&t, &SemisimpleParams::default(), &matrix_scheme).unwrap();
        assert_eq!(s.scheme.rank(), 31);
    }

    #[test]
    fn a_matrix_algebra_in_a_random_basis_and_as_a_map() {
        let m = generate("matrix:3").unwrap();
        let p = random_invertible(9, 2, 5);
        let t = change_basis_algebra(&m, &p).unwrap();
        let s = semisimple_scheme(&t, &SemisimpleParams::default(), &matrix_scheme).unwrap();
        assert_eq!(s.parts, vec![(PartShape::Matrix(3), 27)]);
        // three bases of its own: a map, read through its unital isotope
        let (q, r) = (random_invertible(9, 2, 6), random_invertible(9, 2, 7));
        let t = crate::tensor::change_basis(&m, &p, &q, &r).unwrap();
        let s = semisimple_scheme(&t, &SemisimpleParams::default(), &matrix_scheme).unwrap();
        assert_eq!(s.scheme.rank(), 27);
    }

    #[test]
    fn over_a_prime_field_and_refusals() {
        // the quaternions split mod 3 (M_2(GF(3))) but not over Q (a division algebra)
        let h = generate("quaternions").unwrap();
        assert!(semisimple_scheme(&h, &SemisimpleParams::default(), &matrix_scheme).is_none());
        let h3 = h.with_field(FieldSpec::Prime(3)).unwrap();
        let s = semisimple_scheme(&h3, &SemisimpleParams::default(), &matrix_scheme).unwrap();
        assert_eq!(s.parts, vec![(PartShape::Matrix(2), 8)]);
        // not associative; not semisimple
        for spec in ["octonions", "quotient:0,0,1"] {
            let t = generate(spec).unwrap();
            assert!(semisimple_scheme(&t, &SemisimpleParams::default(), &matrix_scheme).is_none());
        }
    }

    proptest::proptest! {
        #![proptest_config(proptest::prelude::ProptestConfig { cases: 12, rng_algorithm: proptest::test_runner::RngAlgorithm::ChaCha, ..Default::default() })]
        /// The parts and the rank do not depend on the basis: a seeded random change of
        /// basis (entries -2..2) of M_2(Q), Q[S_3] and M_3(Q) gives the same parts and a
        /// verified scheme of the same rank.
        #[test]
        fn parts_survive_a_change_of_basis(which in 0usize..3, seed in 0u64..1000) {
            let (spec, rank) = [("matrix:2", 8), ("dihedral:3", 10), ("matrix:3", 27)][which];
            let t = generate(spec).unwrap();
            let p = random_invertible(t.dim(), 2, seed);
            let moved = change_basis_algebra(&t, &p).unwrap();
            let params = SemisimpleParams::default();
            let a = semisimple_scheme(&t, &params, &matrix_scheme).unwrap();
            let b = semisimple_scheme(&moved, &params, &matrix_scheme).unwrap();
            proptest::prop_assert_eq!(a.scheme.rank(), rank);
            proptest::prop_assert_eq!(b.scheme.rank(), rank);
            proptest::prop_assert_eq!(a.parts, b.parts);
        }
    }
}
