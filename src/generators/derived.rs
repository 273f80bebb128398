//! Algebras derived from an algebra A on the same basis: the commutator algebra
//! `[x, y] = xy - yx` and the anticommutator (Jordan) algebra `x . y = (xy + yx)/2`.
//!
//! The anticommutator includes the factor 1/2 so that it has the same unit as A; it is
//! therefore refused over GF(2). Both keep the field and names of A.

use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q, q};
use crate::tensor::{Kind, Tensor};

fn symmetrised(t: &Tensor, what: &str, sign: &Q, scale: &Q) -> Result<Tensor> {
    if t.kind() != Kind::Algebra {
        return Err(Error::Invalid(format!(
            "the {what} algebra needs an algebra (one basis), got a bilinear map"
        )));
    }
    let mut out = Tensor::zero(t.field(), Kind::Algebra, t.dims(), Some(t.names().clone()));
    for (i, j, k, v) in t.entries() {
        out.add(i, j, k, &(v * scale));
        out.add(j, i, k, &(v * sign * scale));
    }
    Ok(out)
}

/// The commutator algebra: `c'[i][j][k] = c[i][j][k] - c[j][i][k]`. Cost: O(nnz).
pub fn commutator_algebra(t: &Tensor) -> Result<Tensor> {
    symmetrised(t, "commutator", &q(-1, 1), &q(1, 1))
}

/// The anticommutator algebra: `c'[i][j][k] = (c[i][j][k] + c[j][i][k]) / 2`; refused in
/// characteristic 2. Cost: O(nnz).
pub fn anticommutator_algebra(t: &Tensor) -> Result<Tensor> {
    if t.field() == FieldSpec::Prime(2) {
        return Err(Error::Invalid(
            "the anticommutator algebra (xy + yx)/2 is not defined over GF(2)".into(),
        ));
    }
    symmetrised(t, "anticommutator", &q(1, 1), &q(1, 2))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::{cayley_dickson, gl, jordan_symmetric, matmul, matrix_algebra};

    #[test]
    fn commutator_of_matrices_is_gl() {
        let m = matrix_algebra(3).unwrap();
        assert_eq!(commutator_algebra(&m).unwrap(), gl(3).unwrap());
        assert!(commutator_algebra(&matmul(2, 2, 2).unwrap()).is_err());
    }

    #[test]
    fn anticommutator() {
        // Quaternions: x.y = (xy+yx)/2; i.j = 0, i.i = -1.
        let h = anticommutator_algebra(&cayley_dickson(2).unwrap()).unwrap();
        assert!(h.product(1, 2).is_empty());
        assert_eq!(h.product(1, 1), &[(0, q(-1, 1))]);
        // On M_2 restricted to symmetric matrices it matches jordan_symmetric(2):
        // E11 . (E12 + E21) = (E12 + E21)/2.
        let a = anticommutator_algebra(&matrix_algebra(2).unwrap()).unwrap();
        assert_eq!(a.product(0, 1), &[(1, q(1, 2))]);
        let j = jordan_symmetric(2).unwrap();
        assert_eq!(j.product(0, 2), &[(2, q(1, 2))]);
        let gf2 = cayley_dickson(1)
            .unwrap()
            .with_field(FieldSpec::Prime(2))
            .unwrap();
        assert!(anticommutator_algebra(&gf2).is_err());
    }
}
