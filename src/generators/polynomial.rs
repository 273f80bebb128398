//! Polynomial multiplication maps and quotient rings Q[x]/(f).
//!
//! `poly_mult(m, n)`: the bilinear map (deg < m) x (deg < n) -> (deg < m+n-1), basis the
//! monomials `x^i` named `a0..a{m-1}`, `b0..b{n-1}`, `c0..c{m+n-2}`; `a_i * b_j = c_{i+j}`.
//!
//! `quotient_ring(f)`: the algebra Q[x]/(f) for `f = f_0 + f_1 x + ... + f_d x^d`
//! (coefficients lowest degree first, `f_d != 0`, d >= 1), basis `x^0, ..., x^{d-1}` named
//! `x0, ..., x{d-1}`; `x^i x^j` is the remainder of `x^{i+j}` modulo f. f need not be monic.

use super::{check_dim, check_map_dims, check_positive};
use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{Kind, Tensor};
use num_traits::{One, Zero};

/// The polynomial multiplication map: `c[i][j][i+j] = 1`. Dimensions `[m, n, m+n-1]`.
/// Cost: O(mn).
pub fn poly_mult(m: usize, n: usize) -> Result<Tensor> {
    let what = format!("polynomial multiplication ({m},{n})");
    check_positive(&what, "m", m)?;
    check_positive(&what, "n", n)?;
    let [m, n, c] = check_map_dims(&what, [Some(m), Some(n), (m + n).checked_sub(1)])?;
    let mk = |p: &str, k: usize| (0..k).map(|i| format!("{p}{i}")).collect::<Vec<_>>();
    let names = [mk("a", m), mk("b", n), mk("c", c)];
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [m, n, c], Some(names));
    for i in 0..m {
        for j in 0..n {
            t.set(i, j, i + j, Q::one());
        }
    }
    Ok(t)
}

/// The algebra Q[x]/(f), coefficients of f lowest degree first. Errors: degree below 1,
/// zero leading coefficient, degree above the dimension limit. Cost: O(d^3) for a dense f,
/// O(d^2 w) when f has w nonzero lower coefficients and the powers stay sparse.
pub fn quotient_ring(coeffs: &[Q]) -> Result<Tensor> {
    let Some(lead) = coeffs.last() else {
        return Err(Error::Invalid(
            "quotient ring: no coefficients given for f".into(),
        ));
    };
    if lead.is_zero() {
        return Err(Error::Invalid(
            "quotient ring: the leading (last) coefficient of f must be nonzero".into(),
        ));
    }
    let d = coeffs.len() - 1;
    if d == 0 {
        return Err(Error::Invalid(
            "quotient ring: f must have degree at least 1 (give at least two coefficients)".into(),
        ));
    }
    check_dim("the quotient ring Q[x]/(f)", Some(d))?;
    // powers[s] = sparse coordinates of x^s mod f, for s <= 2d-2 (sorted by degree).
    let low: Vec<(usize, Q)> = coeffs[..d]
        .iter()
        .enumerate()
        .filter(|(_, c)| !c.is_zero())
        .map(|(k, c)| (k, c / lead))
        .collect();
    let mut powers: Vec<Vec<(usize, Q)>> = Vec::with_capacity(2 * d - 1);
    let mut cur: Vec<(usize, Q)> = vec![(0, Q::one())];
    for _ in 0..(2 * d - 1) {
        // multiply by x: shift up, and reduce x^d = -sum_{k<d} (f_k / f_d) x^k.
        let mut next: Vec<Q> = Vec::new();
        let mut shifted: Vec<(usize, Q)> = Vec::with_capacity(cur.len() + low.len());
        let mut top = None;
        for (k, c) in &cur {
            if k + 1 == d {
                top = Some(c.clone());
            } else {
                shifted.push((k + 1, c.clone()));
            }
        }
        if let Some(top) = top {
            next.resize(d, Q::zero());
            for (k, c) in shifted.drain(..) {
                next[k] = c;
            }
            for (k, fk) in &low {
                next[*k] -= &top * fk;
            }
            shifted = next
                .into_iter()
                .enumerate()
                .filter(|(_, c)| !c.is_zero())
                .collect();
        }
        powers.push(std::mem::replace(&mut cur, shifted));
    }
    let names = (0..d).map(|i| format!("x{i}")).collect();
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for i in 0..d {
        for j in 0..d {
            for (k, v) in &powers[i + j] {
                t.set(i, j, *k, v.clone());
            }
        }
    }
    Ok(t)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn poly_shape() {
        let t = poly_mult(3, 2).unwrap();
        assert_eq!(t.dims(), [3, 2, 4]);
        assert_eq!(t.get(2, 1, 3), q(1, 1));
        assert_eq!(t.nnz(), 6);
        assert!(poly_mult(0, 2).is_err());
    }

    #[test]
    fn sqrt2() {
        // Q[x]/(x^2 - 2): x * x = 2.
        let t = quotient_ring(&[q(-2, 1), q(0, 1), q(1, 1)]).unwrap();
        assert_eq!(t.dim(), 2);
        assert_eq!(t.product(1, 1), &[(0, q(2, 1))]);
        assert_eq!(t.product(0, 1), &[(1, q(1, 1))]);
    }

    #[test]
    fn cyclotomic_is_cyclic_group() {
        // Q[x]/(x^n - 1) is the group algebra of Z/n with x = g (common practice).
        let mut f = vec![q(0, 1); 8];
        f[0] = q(-1, 1);
        f[7] = q(1, 1);
        let mut t = quotient_ring(&f).unwrap();
        t.set_names(0, (0..7).map(|i| format!("g{i}")).collect());
        assert_eq!(t, crate::generators::cyclic_group_algebra(7).unwrap());
        // degree 1: Q[x]/(2x + 6) = Q with x = -3, so x0 * x0 = x0.
        let one = quotient_ring(&[q(6, 1), q(2, 1)]).unwrap();
        assert_eq!(one.product(0, 0), &[(0, q(1, 1))]);
    }

    #[test]
    fn non_monic_cubic() {
        // f = 2x^3 - x - 1: x^3 = (x + 1)/2, x^4 = (x^2 + x)/2.
        let t = quotient_ring(&[q(-1, 1), q(-1, 1), q(0, 1), q(2, 1)]).unwrap();
        assert_eq!(t.product(1, 2), &[(0, q(1, 2)), (1, q(1, 2))]);
        assert_eq!(t.product(2, 2), &[(1, q(1, 2)), (2, q(1, 2))]);
        assert!(quotient_ring(&[q(1, 1)]).is_err());
        assert!(quotient_ring(&[q(1, 1), q(0, 1)]).is_err());
        assert!(quotient_ring(&[]).is_err());
    }
}
