//! Clifford algebras Cl(p, q) over Q.
//!
//! Generators `e_1, ..., e_n` (n = p + q) with `e_i^2 = +1` for `i <= p`, `e_i^2 = -1` for
//! `i > p`, and `e_i e_j = -e_j e_i` for `i != j`. Basis: the ordered monomials
//! `e_{i1} e_{i2} ... e_{ir}` with `i1 < ... < ir`, listed by degree and then
//! lexicographically; the empty monomial (the unit) is named `one`, the others `e1`, `e12`,
//! `e123`, ... (`e1_2_10` with separators when n >= 10). Dimension `2^n`, n <= 12.
//! Cl(0,1) is the complex numbers and Cl(0,2) the quaternions (i = e1, j = e2, k = e12).

use super::check_dim;
use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;
use num_traits::One;

/// Product of monomials given as bitmasks (bit i-1 set when e_i occurs): sign and result.
fn blade_product(a: u32, b: u32, p: usize) -> (bool, u32) {
    let mut negative = false;
    // Move each generator of b left past the larger generators of a.
    for j in 0..32 {
        if (b >> j) & 1 == 1 {
            let larger = (a >> (j + 1)).count_ones();
            if larger % 2 == 1 {
                negative = !negative;
            }
        }
    }
    // Squares of the common generators: e_i^2 = -1 for i > p (bit index >= p).
    let common = a & b;
    let neg_squares = if p >= 32 {
        0
    } else {
        (common >> p).count_ones()
    };
    if neg_squares % 2 == 1 {
        negative = !negative;
    }
    (negative, a ^ b)
}

/// Cl(p, q): dimension `2^(p+q)`, at most 2048 (the algebra limit). Cost: O(4^n n).
pub fn clifford(p: usize, q: usize) -> Result<Tensor> {
    let what = format!("the Clifford algebra Cl({p},{q})");
    let n = p
        .checked_add(q)
        .ok_or_else(|| Error::Invalid(format!("{what} is too large")))?;
    let dim = check_dim(&what, if n < 40 { Some(1usize << n) } else { None })?;
    let mut masks: Vec<u32> = (0..dim as u32).collect();
    masks.sort_by_key(|&m| {
        let idx: Vec<u32> = (0..n as u32).filter(|i| (m >> i) & 1 == 1).collect();
        (idx.len(), idx)
    });
    let mut pos = vec![0usize; dim];
    for (i, &m) in masks.iter().enumerate() {
        pos[m as usize] = i;
    }
    let names = masks
        .iter()
        .map(|&m| {
            if m == 0 {
                return "one".to_string();
            }
            let idx: Vec<String> = (0..n)
                .filter(|i| (m >> i) & 1 == 1)
                .map(|i| (i + 1).to_string())
                .collect();
            format!("e{}", idx.join(if n >= 10 { "_" } else { "" }))
        })
        .collect();
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for (i, &a) in masks.iter().enumerate() {
        for (j, &b) in masks.iter().enumerate() {
            let (neg, c) = blade_product(a, b, p);
            t.set(
                i,
                j,
                pos[c as usize],
                if neg { -Q::one() } else { Q::one() },
            );
        }
    }
    Ok(t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn cl02_is_quaternions() {
        let t = clifford(0, 2).unwrap();
        assert_eq!(t.names()[0], vec!["one", "e1", "e2", "e12"]);
        for x in 1..4 {
            assert_eq!(t.product(x, x), &[(0, q(-1, 1))]);
        }
        assert_eq!(t.product(1, 2), &[(3, q(1, 1))]);
        assert_eq!(t.product(2, 1), &[(3, q(-1, 1))]);
        // j k = e2 e1 e2 = -e1 e2 e2 = e1 = i.
        assert_eq!(t.product(2, 3), &[(1, q(1, 1))]);
    }

    #[test]
    fn signatures() {
        let c = clifford(0, 1).unwrap();
        assert_eq!(c.product(1, 1), &[(0, q(-1, 1))]);
        let t = clifford(1, 1).unwrap();
        assert_eq!(t.product(1, 1), &[(0, q(1, 1))]);
        assert_eq!(t.product(2, 2), &[(0, q(-1, 1))]);
        // (e1 e2)^2 = -e1 e1 e2 e2 = -(1)(-1) = 1.
        assert_eq!(t.product(3, 3), &[(0, q(1, 1))]);
        let big = clifford(3, 0).unwrap();
        assert_eq!(big.dim(), 8);
        assert_eq!(big.name(0, 7), "e123");
        assert!(clifford(7, 6).is_err());
        assert_eq!(clifford(0, 0).unwrap().dim(), 1);
    }
}
