//! Built-in generators: exact structure tensors of classical algebras and bilinear maps,
//! all over Q (`FieldSpec::Rational`) with readable basis names.
//!
//! Every generator documents its basis order and product convention in its own file; the
//! overview with the command-line spec syntax is in `docs/generators.md`. Invariants of
//! every result: dimensions are at most [`crate::tensor::MAX_DIM`] per axis and at most
//! [`crate::tensor::MAX_PRODUCTS`] products (an algebra of dimension at most 2048); larger
//! requests return [`Error::Invalid`] before anything is allocated), names are distinct and start with a
//! letter, and algebras have kind [`crate::tensor::Kind::Algebra`].

mod cayley_dickson;
mod clifford;
mod derived;
mod group;
mod jordan;
mod lie;
mod matrix;
mod polynomial;
mod spec;

pub use cayley_dickson::{cayley_dickson, cayley_dickson_with_signs};
pub use clifford::clifford;
pub use derived::{anticommutator_algebra, commutator_algebra};
pub use group::{
    cyclic_group_algebra, dihedral_group_algebra, permutation_group_algebra,
    symmetric_group_algebra,
};
pub use jordan::jordan_symmetric;
pub use lie::{gl, heisenberg, sl, so};
pub use matrix::{matmul, matrix_algebra};
pub use polynomial::{poly_mult, quotient_ring};
pub use spec::{generate, generator_names, is_generator_family};

use crate::error::{Error, Result};
use crate::tensor::{MAX_ALGEBRA_DIM, MAX_DIM, check_shape};

/// Refuse an algebra dimension above [`MAX_ALGEBRA_DIM`] (at most 2^22 products; an
/// overflowing dimension is given as `None`) with a message naming the generator.
pub(crate) fn check_dim(what: &str, dim: Option<usize>) -> Result<usize> {
    match dim {
        Some(d) if d <= MAX_ALGEBRA_DIM => Ok(d),
        Some(d) => Err(Error::Invalid(format!(
            "{what} has dimension {d}, above the limit of {MAX_ALGEBRA_DIM} for an algebra \
             ({MAX_ALGEBRA_DIM}^2 = 2^22 products; a bilinear map has at most {MAX_DIM} per axis)"
        ))),
        None => Err(Error::Invalid(format!(
            "{what} has a dimension above the limit of {MAX_ALGEBRA_DIM} for an algebra"
        ))),
    }
}

/// Refuse a bilinear map whose axis dimensions (`None`: overflow) break the limits of
/// [`crate::tensor::check_shape`]; returns the dimensions.
pub(crate) fn check_map_dims(what: &str, dims: [Option<usize>; 3]) -> Result<[usize; 3]> {
    let mut out = [0; 3];
    for (a, d) in dims.iter().enumerate() {
        out[a] = d.ok_or_else(|| {
            Error::Invalid(format!(
                "{what} has a dimension above the limit of {MAX_DIM} per axis"
            ))
        })?;
    }
    check_shape(out).map_err(|m| Error::Invalid(format!("{what}: {m}")))?;
    Ok(out)
}

/// Refuse a zero size parameter.
pub(crate) fn check_positive(what: &str, param: &str, v: usize) -> Result<()> {
    if v == 0 {
        return Err(Error::Invalid(format!(
            "{what}: {param} must be at least 1, got 0"
        )));
    }
    Ok(())
}

/// A name from a letter prefix and 1-based indices: `a12`, or `a1_12` when `separate`.
pub(crate) fn index_name(prefix: &str, idx: &[usize], separate: bool) -> String {
    let parts: Vec<String> = idx.iter().map(|i| i.to_string()).collect();
    format!("{prefix}{}", parts.join(if separate { "_" } else { "" }))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::Q;
    use crate::tensor::Tensor;
    use num_traits::Zero;

    /// `(e_i e_j) e_k` as a vector, for all basis triples, via the sparse products.
    fn triple(t: &Tensor, i: usize, j: usize, k: usize, left_first: bool) -> Vec<Q> {
        let n = t.dim();
        let mut out = vec![Q::zero(); n];
        if left_first {
            for (m, a) in t.product(i, j) {
                for (r, b) in t.product(*m, k) {
                    out[*r] += a * b;
                }
            }
        } else {
            for (m, a) in t.product(j, k) {
                for (r, b) in t.product(i, *m) {
                    out[*r] += a * b;
                }
            }
        }
        out
    }

    fn is_associative(t: &Tensor) -> bool {
        let n = t.dim();
        (0..n).all(|i| {
            (0..n).all(|j| (0..n).all(|k| triple(t, i, j, k, true) == triple(t, i, j, k, false)))
        })
    }

    /// Jacobi identity `[[x,y],z] + [[y,z],x] + [[z,x],y] = 0` and antisymmetry on basis.
    fn is_lie(t: &Tensor) -> bool {
        let n = t.dim();
        for i in 0..n {
            if !t.product(i, i).is_empty() {
                return false;
            }
            for j in 0..n {
                for k in 0..n {
                    let a = triple(t, i, j, k, true);
                    let b = triple(t, j, k, i, true);
                    let c = triple(t, k, i, j, true);
                    if (0..n).any(|r| !(&a[r] + &b[r] + &c[r]).is_zero()) {
                        return false;
                    }
                }
            }
        }
        true
    }

    #[test]
    fn associative_families() {
        // Matrix, group, Clifford, quotient algebras and the quaternions are associative
        // (common practice); the octonions are not.
        for t in [
            matrix_algebra(3).unwrap(),
            dihedral_group_algebra(3).unwrap(),
            symmetric_group_algebra(3).unwrap(),
            permutation_group_algebra(&[vec![1, 2, 0, 3, 4, 5], vec![0, 1, 2, 4, 5, 3]]).unwrap(),
            clifford(2, 1).unwrap(),
            quotient_ring(&[
                crate::scalar::q(1, 1),
                crate::scalar::q(0, 1),
                crate::scalar::q(3, 2),
            ])
            .unwrap(),
            cayley_dickson(2).unwrap(),
            cayley_dickson_with_signs(2, &[crate::scalar::q(1, 1), crate::scalar::q(-1, 1)])
                .unwrap(),
        ] {
            assert!(is_associative(&t));
        }
        assert!(!is_associative(&cayley_dickson(3).unwrap()));
    }

    #[test]
    fn lie_families() {
        // Jacobi identity for the Lie families (common practice).
        for t in [
            gl(3).unwrap(),
            sl(3).unwrap(),
            so(4).unwrap(),
            heisenberg(2).unwrap(),
        ] {
            assert!(is_lie(&t), "{:?}", t.names()[0]);
        }
        assert!(is_lie(
            &commutator_algebra(&cayley_dickson(2).unwrap()).unwrap()
        ));
        assert!(!is_lie(&matrix_algebra(2).unwrap()));
    }
}
