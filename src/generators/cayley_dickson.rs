//! The Cayley-Dickson construction: complex numbers, quaternions, octonions, sedenions, ...
//! and their split forms.
//!
//! An algebra A with involution `conj` is doubled to pairs `(a, b)` with
//! `(a, b)(c, d) = (ac + gamma conj(d) b, d a + b conj(c))` and `conj(a, b) = (conj(a), -b)`.
//! Starting from Q (level 0, `conj` the identity) and doubling with `gammas[0], gammas[1],
//! ...` gives an algebra of dimension `2^level`. With every `gamma = -1` this is the
//! classical tower `(a,b)(c,d) = (ac - conj(d) b, d a + b conj(c))`: level 1 the complex
//! numbers, 2 the quaternions, 3 the octonions, 4 the sedenions; `gamma = +1` at a step
//! gives the split forms (split-complex numbers, split quaternions, split octonions).
//!
//! Basis: `e0 = 1`; at level L with `h = 2^(L-1)`, `e_i` for `i < h` is `(e_i, 0)` and
//! `e_{h+i}` is `(0, e_i)`. Names `e0, e1, ...`. In the quaternions `e1 e2 = e3`
//! (i j = k with i = e1, j = e2, k = e3).

use super::check_dim;
use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q, q};
use crate::tensor::Tensor;
use num_traits::One;

/// Sign of `conj(e_i)`: +1 for `e0`, -1 otherwise.
fn conj_sign(i: usize) -> Q {
    if i == 0 { Q::one() } else { -Q::one() }
}

/// `e_i e_j = coef * e_k` at the given level (product of two basis elements is always a
/// signed scaled basis element).
fn basis_product(i: usize, j: usize, level: usize, gammas: &[Q]) -> (Q, usize) {
    if level == 0 {
        return (Q::one(), 0);
    }
    let h = 1usize << (level - 1);
    let g = &gammas[level - 1];
    match (i < h, j < h) {
        // (a,0)(c,0) = (ac, 0)
        (true, true) => basis_product(i, j, level - 1, gammas),
        // (a,0)(0,d) = (0, d a)
        (true, false) => {
            let (c, k) = basis_product(j - h, i, level - 1, gammas);
            (c, k + h)
        }
        // (0,b)(c,0) = (0, b conj(c))
        (false, true) => {
            let (c, k) = basis_product(i - h, j, level - 1, gammas);
            (c * conj_sign(j), k + h)
        }
        // (0,b)(0,d) = (gamma conj(d) b, 0)
        (false, false) => {
            let (c, k) = basis_product(j - h, i - h, level - 1, gammas);
            (c * conj_sign(j - h) * g, k)
        }
    }
}

/// The Cayley-Dickson algebra of dimension `2^level` doubled with the given `gammas`
/// (`gammas.len() == level`, every gamma nonzero). Level at most 11 (dimension 2048, the algebra limit).
/// Cost: O(4^level * level).
pub fn cayley_dickson_with_signs(level: usize, gammas: &[Q]) -> Result<Tensor> {
    let what = format!("the Cayley-Dickson algebra of level {level}");
    if gammas.len() != level {
        return Err(Error::Invalid(format!(
            "{what}: expected {level} doubling parameters, got {}",
            gammas.len()
        )));
    }
    if gammas.iter().any(num_traits::Zero::is_zero) {
        return Err(Error::Invalid(format!(
            "{what}: the doubling parameters must be nonzero"
        )));
    }
    let dim = check_dim(
        &what,
        if level < 40 {
            Some(1usize << level)
        } else {
            None
        },
    )?;
    let mut t = Tensor::algebra(
        FieldSpec::Rational,
        (0..dim).map(|i| format!("e{i}")).collect(),
    );
    for i in 0..dim {
        for j in 0..dim {
            let (c, k) = basis_product(i, j, level, gammas);
            t.set(i, j, k, c);
        }
    }
    Ok(t)
}

/// The classical Cayley-Dickson algebra (all gammas -1): level 1 complex numbers,
/// 2 quaternions, 3 octonions, 4 sedenions. Cost: O(4^level * level).
pub fn cayley_dickson(level: usize) -> Result<Tensor> {
    cayley_dickson_with_signs(level, &vec![q(-1, 1); level])
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quaternions() {
        // Hamilton's relations i^2 = j^2 = k^2 = ijk = -1 (common practice).
        let t = cayley_dickson(2).unwrap();
        let one = q(1, 1);
        for x in 1..4 {
            assert_eq!(t.product(x, x), &[(0, -one.clone())]);
            assert_eq!(t.product(0, x), &[(x, one.clone())]);
            assert_eq!(t.product(x, 0), &[(x, one.clone())]);
        }
        assert_eq!(t.product(1, 2), &[(3, one.clone())]);
        assert_eq!(t.product(2, 1), &[(3, -one.clone())]);
        assert_eq!(t.product(2, 3), &[(1, one.clone())]);
        assert_eq!(t.product(3, 1), &[(2, one.clone())]);
    }

    #[test]
    fn complex_and_split() {
        let c = cayley_dickson(1).unwrap();
        assert_eq!(c.product(1, 1), &[(0, q(-1, 1))]);
        let s = cayley_dickson_with_signs(1, &[q(1, 1)]).unwrap();
        assert_eq!(s.product(1, 1), &[(0, q(1, 1))]);
        assert!(cayley_dickson_with_signs(2, &[q(1, 1)]).is_err());
        assert!(cayley_dickson(13).is_err());
    }

    /// `x conj(x)` as a vector; for a composition algebra it is `N(x) e0`.
    fn norm(t: &Tensor, x: &[Q]) -> Vec<Q> {
        let c: Vec<Q> = x
            .iter()
            .enumerate()
            .map(|(i, v)| if i == 0 { v.clone() } else { -v })
            .collect();
        t.multiply(x, &c)
    }

    #[test]
    fn hurwitz_composition() {
        // Hurwitz (1898), "Ueber die Composition der quadratischen Formen von beliebig vielen
        // Variablen": the norm is multiplicative in dimensions 1, 2, 4, 8, for the classical
        // and split forms alike, and not in the sedenions (dimension 16).
        let mut seed = 12345u64;
        let mut next = || {
            seed = seed
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            q(((seed >> 33) % 7) as i64 - 3, 1)
        };
        for level in 1..=4usize {
            for signs in 0..(1u32 << level) {
                let gammas: Vec<Q> = (0..level)
                    .map(|b| q(if signs >> b & 1 == 1 { 1 } else { -1 }, 1))
                    .collect();
                let t = cayley_dickson_with_signs(level, &gammas).unwrap();
                let n = t.dim();
                let mut multiplicative = true;
                for _ in 0..6 {
                    let x: Vec<Q> = (0..n).map(|_| next()).collect();
                    let y: Vec<Q> = (0..n).map(|_| next()).collect();
                    let (nx, ny, nxy) = (norm(&t, &x), norm(&t, &y), norm(&t, &t.multiply(&x, &y)));
                    assert!(
                        nx[1..].iter().all(num_traits::Zero::is_zero),
                        "x conj(x) is a scalar"
                    );
                    multiplicative &= nxy[0] == &nx[0] * &ny[0];
                }
                assert_eq!(
                    multiplicative,
                    level <= 3,
                    "level {level}, gammas {gammas:?}"
                );
            }
        }
    }

    #[test]
    fn octonions_alternative_not_associative() {
        let t = cayley_dickson(3).unwrap();
        assert_eq!(t.dim(), 8);
        let e = |i: usize| (0..8).map(|k| q((k == i) as i64, 1)).collect::<Vec<_>>();
        // (e1 e2) e4 = -(e1 (e2 e4)): the octonions are not associative (common practice).
        let l = t.multiply(&t.multiply(&e(1), &e(2)), &e(4));
        let r = t.multiply(&e(1), &t.multiply(&e(2), &e(4)));
        assert_ne!(l, r);
        assert_eq!(l, r.iter().map(|v| -v).collect::<Vec<_>>());
        // Alternativity on a non-basis element x = e1 + 2 e2 + e7: (x x) y = x (x y).
        let x: Vec<Q> = (0..8).map(|k| q([0, 1, 2, 0, 0, 0, 0, 1][k], 1)).collect();
        let y: Vec<Q> = (0..8).map(|k| q([3, 0, 1, -1, 2, 0, 5, 0][k], 1)).collect();
        assert_eq!(
            t.multiply(&t.multiply(&x, &x), &y),
            t.multiply(&x, &t.multiply(&x, &y))
        );
    }
}
