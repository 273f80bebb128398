//! Explicit isomorphisms between semisimple algebras that split into full matrix algebras
//! over their field and copies of the field, in any bases: both are split by matrix units
//! ([`crate::structure::matrix_units`]) and the units of equal parts are matched.
//!
//! Theorem (Wedderburn 1908): such an algebra is `M_k1(F) x ... x M_ks(F)` (a copy of F is
//! `M_1(F)`), determined up to isomorphism by the sizes `k_i`; any systems of matrix units
//! `E_jl`, `E'_jl` of parts of equal size give the isomorphism `E_jl -> E'_jl` of the
//! parts, and parts of equal size may be matched in any order.
//!
//! Invariant: a map is returned only after the change of basis it defines reproduces the
//! first algebra's structure constants exactly ([`super::same_constants`]).

use crate::laws::{find_unit_direct, find_unit_in};
use crate::linalg::Matrix;
use crate::scalar::{Field, Q};
use crate::structure::algebra::Alg;
use crate::structure::matrix_units::{SimplePart, SplitParams, split_semisimple};
use crate::tensor::{Kind, Tensor, change_basis_algebra};

/// Algebras of larger dimension are left out (each split costs O(n^4) exact operations
/// per candidate element).
const MAX_DIM: usize = 36;

/// The parts of an algebra as (size, the matrix of the projection of each basis vector
/// onto the part, the part's units), fields of degree 1 as size 1; `None` when the
/// algebra does not split so (a field part of higher degree, no split found).
type Parts<E> = Vec<(usize, Vec<Vec<E>>, Vec<Vec<E>>)>;

fn parts_of<F: Field>(f: &F, t: &Tensor, params: &SplitParams) -> Option<Parts<F::Elem>> {
    let a = Alg::from_tensor(f, t);
    let one = find_unit_in(f, t, &params.solve).ok()??;
    let parts = split_semisimple(&a, &one, params).ok()??;
    let mut out = Vec::new();
    for p in &parts {
        match p {
            SimplePart::Field { idempotent, degree } => {
                if *degree != 1 {
                    return None;
                }
                // x c = λ c: λ read at a coordinate where c is nonzero
                let at = idempotent.iter().position(|x| !f.is_zero(x))?;
                let inv = f.inv(&idempotent[at])?;
                let coords = (0..a.n)
                    .map(|m| vec![f.mul(&a.mul(&a.basis(m), idempotent)[at], &inv)])
                    .collect();
                out.push((1, coords, vec![idempotent.clone()]));
            }
            SimplePart::Matrix { size, units, .. } => {
                let coords = (0..a.n)
                    .map(|m| p.matrix_of(&a, &a.basis(m)))
                    .collect::<Option<_>>()?;
                out.push((*size, coords, units.clone()));
            }
        }
    }
    out.sort_by_key(|p| p.0);
    Some(out)
}

/// An invertible M (columns: the images in E's coordinates of X's basis vectors) with
/// `change_basis_algebra(e, M)` equal to `x`, when both split into matrix algebras over
/// their field and copies of it with parts of the same sizes; `None` otherwise (which
/// does not mean "not isomorphic"). Cost: two splits ([`split_semisimple`]), `n` sums of
/// units and one change of basis with its exact comparison.
pub fn find_split_isomorphism(x: &Tensor, e: &Tensor, params: &SplitParams) -> Option<Matrix<Q>> {
    let n = x.dim();
    if x.kind() != Kind::Algebra || e.kind() != Kind::Algebra || e.dim() != n {
        return None;
    }
    if x.field() != e.field() || n == 0 || n > MAX_DIM {
        return None;
    }
    // a screen modulo a word prime first: associative with a unit, both
    for t in [x, e] {
        let (fp, tp) = t.screening()?;
        let a = Alg::from_tensor(&fp, &tp);
        if !a.looks_associative(params.seed) || find_unit_direct(&fp, &a.table).is_none() {
            return None;
        }
    }
    let m = crate::with_field!(x.field(), f => {
        let px = parts_of(f, x, params)?;
        let pe = parts_of(f, e, params)?;
        if px.iter().map(|p| p.0).ne(pe.iter().map(|p| p.0)) {
            return None;
        }
        // column b: sum over the parts of sum_jl m_jl(x_b) E'_jl
        let mut data = vec![Q::from_integer(0.into()); n * n];
        for ((_, coords, _), (_, _, units)) in px.iter().zip(&pe) {
            for (b, c) in coords.iter().enumerate() {
                for (cj, u) in c.iter().zip(units) {
                    if f.is_zero(cj) {
                        continue;
                    }
                    for (r, ur) in u.iter().enumerate() {
                        data[r * n + b] += f.to_rational(&f.mul(cj, ur));
                    }
                }
            }
        }
        let data = data
            .iter()
            .map(|q| crate::scheme::reduce_into(x.field(), q).ok())
            .collect::<Option<Vec<Q>>>()?;
        Some(Matrix { rows: n, cols: n, data })
    })?;
    let moved = change_basis_algebra(e, &m)?;
    super::same_constants(&moved, x).then_some(m)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;
    use crate::tensor::random_invertible;

    #[test]
    fn matrix_algebras_and_group_algebras_in_random_bases() {
        // M_2(Q) against the split quaternions and Cl(1,1) (both M_2(Q)); Q[S_3] against
        // itself in a random basis; M_3(Q) in a random basis (entries -2..2)
        for (a, b) in [
            ("matrix:2", "split-quaternions"),
            ("clifford:1,1", "matrix:2"),
            ("dihedral:3", "symmetric:3"),
        ] {
            let (ta, tb) = (generate(a).unwrap(), generate(b).unwrap());
            assert!(
                find_split_isomorphism(&ta, &tb, &SplitParams::default()).is_some(),
                "{a} {b}"
            );
        }
        let m3 = generate("matrix:3").unwrap();
        let moved = change_basis_algebra(&m3, &random_invertible(9, 2, 8)).unwrap();
        let iso = find_split_isomorphism(&moved, &m3, &SplitParams::default()).unwrap();
        assert!(super::super::same_constants(
            &change_basis_algebra(&m3, &iso).unwrap(),
            &moved
        ));
        // the quaternions (a division algebra) and Q x Q x M_2 against Q^2 x ... do not split
        let h = generate("quaternions").unwrap();
        assert!(
            find_split_isomorphism(&h, &generate("matrix:2").unwrap(), &SplitParams::default())
                .is_none()
        );
    }
}
