//! Direct, exact checks of the basic laws of an algebra on its basis, for the fingerprint.
//!
//! A multilinear identity holds on the whole algebra iff it holds on basis vectors; the
//! quadratic and cubic identities (alternative, flexible, Jordan) are checked through their
//! linearizations together with the diagonal terms, which is exact in every characteristic
//! for the quadratic ones, and for the Jordan identity in characteristic 0 or above 3 (the
//! caller gets `None` otherwise).

use super::dense::Dense;
use crate::scalar::Q;

/// `e_i e_j = e_j e_i` for all i, j. Cost: O(n^3).
pub fn is_commutative(d: &Dense) -> bool {
    let n = d.n;
    (0..n).all(|i| (0..n).all(|j| (0..n).all(|k| d.is_zero(&(d.at(i, j, k) - d.at(j, i, k))))))
}

/// `x x = 0` for all x (so `xy = -yx`): `e_i e_i = 0` and `e_i e_j + e_j e_i = 0`. O(n^3).
pub fn is_anticommutative(d: &Dense) -> bool {
    let n = d.n;
    (0..n).all(|i| {
        (0..n).all(|k| d.is_zero(d.at(i, i, k)))
            && (0..n).all(|j| (0..n).all(|k| d.is_zero(&(d.at(i, j, k) + d.at(j, i, k)))))
    })
}

/// All associators vanish. `assoc` from [`Dense::associators`].
pub fn is_associative(d: &Dense, assoc: &[Vec<Q>]) -> bool {
    assoc.iter().all(|v| d.is_zero_vec(v))
}

fn sum_zero(d: &Dense, a: &[Q], b: &[Q]) -> bool {
    a.iter().zip(b).all(|(x, y)| d.is_zero(&(x + y)))
}

/// Alternative: `(x, x, y) = 0 = (y, x, x)` for all x, y.
pub fn is_alternative(d: &Dense, assoc: &[Vec<Q>]) -> bool {
    let n = d.n;
    let a = |i: usize, j: usize, k: usize| &assoc[(i * n + j) * n + k];
    (0..n).all(|i| {
        (0..n).all(|k| {
            d.is_zero_vec(a(i, i, k))
                && d.is_zero_vec(a(k, i, i))
                && (0..n).all(|j| {
                    sum_zero(d, a(i, j, k), a(j, i, k)) && sum_zero(d, a(k, i, j), a(k, j, i))
                })
        })
    })
}

/// Flexible: `(x, y, x) = 0` for all x, y.
pub fn is_flexible(d: &Dense, assoc: &[Vec<Q>]) -> bool {
    let n = d.n;
    let a = |i: usize, j: usize, k: usize| &assoc[(i * n + j) * n + k];
    (0..n).all(|i| {
        (0..n).all(|j| {
            d.is_zero_vec(a(i, j, i)) && (0..n).all(|k| sum_zero(d, a(i, j, k), a(k, j, i)))
        })
    })
}

/// A Lie algebra: anticommutative and the Jacobi identity `(xy)z + (yz)x + (zx)y = 0`.
/// Cost: O(n^3) products.
pub fn is_lie(d: &Dense) -> bool {
    if !is_anticommutative(d) {
        return false;
    }
    let n = d.n;
    let basis = d.full_basis();
    for i in 0..n {
        for j in i + 1..n {
            let ij = d.basis_product(i, j);
            for k in j + 1..n {
                let jk = d.basis_product(j, k);
                let ki = d.basis_product(k, i);
                let s1 = d.mul(&ij, &basis[k]);
                let s2 = d.mul(&jk, &basis[i]);
                let s3 = d.mul(&ki, &basis[j]);
                if !(0..n).all(|l| d.is_zero(&(&s1[l] + &s2[l] + &s3[l]))) {
                    return false;
                }
            }
        }
    }
    true
}

/// A Jordan algebra: commutative and `(x^2 y) x = x^2 (y x)`. Checked through the full
/// linearization `sum over the 3 ways (a b | c)` of `((ab)y)c - (ab)(yc)`, valid when 6 is
/// invertible; returns `None` in characteristic 2 or 3. Cost: O(n^4) products.
pub fn is_jordan(d: &Dense) -> Option<bool> {
    let ch = d.field.characteristic();
    if ch == 2 || ch == 3 {
        return None;
    }
    if !is_commutative(d) {
        return Some(false);
    }
    let n = d.n;
    let basis = d.full_basis();
    let term = |a: usize, b: usize, c: usize, y: usize| -> Vec<Q> {
        let ab = d.basis_product(a, b);
        let l = d.mul(&d.mul(&ab, &basis[y]), &basis[c]);
        let r = d.mul(&ab, &d.basis_product(y, c));
        l.into_iter().zip(r).map(|(x, z)| x - z).collect()
    };
    for a in 0..n {
        for b in a..n {
            for c in b..n {
                for y in 0..n {
                    let t1 = term(a, b, c, y);
                    let t2 = term(b, c, a, y);
                    let t3 = term(c, a, b, y);
                    if !(0..n).all(|l| d.is_zero(&(&t1[l] + &t2[l] + &t3[l]))) {
                        return Some(false);
                    }
                }
            }
        }
    }
    Some(true)
}
