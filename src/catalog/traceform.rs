//! The trace forms of an algebra and their congruence invariants.
//!
//! `t_L(x, y) = tr(L_x L_y)` and `t_R(x, y) = tr(R_x R_y)` (L_x, R_x: left and right
//! multiplication) are symmetric bilinear forms that change by congruence under a change of
//! basis, so their rank, their signature over Q (Sylvester's law of inertia) and the
//! discriminant of the induced nondegenerate form up to squares are isomorphism invariants.
//! For a Lie algebra t_L is the Killing form; for an associative algebra over Q the kernel
//! of t_L is the radical (Dickson's criterion, see Pierce 1982, Associative Algebras).

use super::dense::Dense;
use crate::scalar::{Field, FieldSpec, PrimeField, Q};
use num_bigint::BigInt;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// The congruence invariants of a symmetric bilinear form.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct FormInvariants {
    pub rank: usize,
    /// (positive, negative) counts over Q; `None` over GF(p).
    pub signature: Option<(usize, usize)>,
    /// The discriminant of the nondegenerate quotient form (a representative; compare with
    /// [`same_square_class`]). Over GF(p), p odd: 1 or a fixed nonsquare. `None` over GF(2).
    pub discriminant: Option<Q>,
}

#[allow(clippy::needless_range_loop)]
/// The Gram matrix of `t_L` (left = true) or `t_R`. Cost: O(n^2 * nnz).
pub fn trace_form(d: &Dense, left: bool) -> Vec<Vec<Q>> {
    let n = d.n;
    // M_i[a][b] = coefficient of e_a in (e_i e_b) for L, (e_b e_i) for R.
    let m = |i: usize, a: usize, b: usize| if left { d.at(i, b, a) } else { d.at(b, i, a) };
    let mut g = vec![vec![Q::zero(); n]; n];
    for i in 0..n {
        for j in i..n {
            let mut s = Q::zero();
            for a in 0..n {
                for b in 0..n {
                    let x = m(i, a, b);
                    if !x.is_zero() {
                        let y = m(j, b, a);
                        if !y.is_zero() {
                            s += x * y;
                        }
                    }
                }
            }
            let s = d.reduce(vec![s]).pop().expect("one value");
            g[i][j] = s.clone();
            g[j][i] = s;
        }
    }
    g
}

#[allow(clippy::needless_range_loop)]
/// Diagonalize a symmetric matrix by congruence (exact; needs characteristic != 2) and
/// return the nonzero diagonal entries. Cost: O(n^3) field operations.
fn diagonal_entries<F: Field>(f: &F, mut g: Vec<Vec<F::Elem>>) -> Vec<F::Elem> {
    let n = g.len();
    let mut out = Vec::new();
    let mut k = 0;
    while k < n {
        // find a nonzero diagonal entry, else make one from an off-diagonal entry
        let piv = (k..n).find(|&i| !f.is_zero(&g[i][i]));
        let p = match piv {
            Some(p) => p,
            None => {
                let Some((i, j)) = (k..n)
                    .flat_map(|i| (i + 1..n).map(move |j| (i, j)))
                    .find(|&(i, j)| !f.is_zero(&g[i][j]))
                else {
                    break;
                };
                // row/column i += row/column j: g[i][i] becomes 2 g[i][j]
                for c in 0..n {
                    let v = g[j][c].clone();
                    g[i][c] = f.add(&g[i][c], &v);
                }
                for r in 0..n {
                    let v = g[r][j].clone();
                    g[r][i] = f.add(&g[r][i], &v);
                }
                i
            }
        };
        g.swap(k, p);
        for row in g.iter_mut() {
            row.swap(k, p);
        }
        let pivot = g[k][k].clone();
        let inv = f.inv(&pivot).expect("nonzero pivot");
        for i in k + 1..n {
            if f.is_zero(&g[i][k]) {
                continue;
            }
            let factor = f.mul(&g[i][k], &inv);
            for c in k..n {
                let v = f.mul(&factor, &g[k][c]);
                g[i][c] = f.sub(&g[i][c], &v);
            }
            for r in k..n {
                let v = f.mul(&factor, &g[r][k]);
                g[r][i] = f.sub(&g[r][i], &v);
            }
        }
        out.push(pivot);
        k += 1;
    }
    out
}

/// Rank, signature and discriminant class of a symmetric form over the algebra's field.
pub fn form_invariants(d: &Dense, g: &[Vec<Q>]) -> FormInvariants {
    let n = g.len();
    let rank = d.rank_rows(g.to_vec(), n);
    match d.field {
        FieldSpec::Rational => {
            let diag = diagonal_entries(&crate::scalar::Rationals, g.to_vec());
            let pos = diag.iter().filter(|x| x.is_positive()).count();
            let disc = diag.iter().fold(Q::one(), |a, b| a * b);
            FormInvariants {
                rank,
                signature: Some((pos, diag.len() - pos)),
                discriminant: Some(disc),
            }
        }
        FieldSpec::Prime(2) => FormInvariants {
            rank,
            signature: None,
            discriminant: None,
        },
        FieldSpec::Prime(p) => {
            let f = PrimeField::new(p).expect("prime");
            let gg = g
                .iter()
                .map(|r| {
                    r.iter()
                        .map(|x| f.from_rational(x).expect("in field"))
                        .collect()
                })
                .collect();
            let diag = diagonal_entries(&f, gg);
            let disc = diag.iter().fold(1u64, |a, b| f.mul(&a, b));
            let square = f.pow(disc, (p - 1) / 2) == 1;
            let rep = if square {
                1
            } else {
                (2..p).find(|&a| f.pow(a, (p - 1) / 2) != 1).unwrap_or(1)
            };
            FormInvariants {
                rank,
                signature: None,
                discriminant: Some(Q::from_integer(BigInt::from(rep))),
            }
        }
    }
}

/// True if `a b` is a square in Q (both nonzero): a and b lie in the same square class.
/// Over GF(p) the representatives from [`form_invariants`] are compared directly.
pub fn same_square_class(a: &Q, b: &Q) -> bool {
    let p = a * b;
    if !p.is_positive() {
        return false;
    }
    let is_sq = |x: &BigInt| {
        let r = x.sqrt();
        &(&r * &r) == x
    };
    is_sq(p.numer()) && is_sq(p.denom())
}

/// A readable form of a square class: the squarefree integer when it can be found by trial
/// division by primes below 10^4, otherwise `N mod squares`.
pub fn square_class_text(a: &Q) -> String {
    let mut m: BigInt = a.numer() * a.denom();
    let neg = m.is_negative();
    m = m.abs();
    let mut free = BigInt::one();
    let mut p = 2u64;
    while p < 10_000 && m > BigInt::one() {
        let bp = BigInt::from(p);
        let mut e = 0;
        while (&m % &bp).is_zero() {
            m /= &bp;
            e += 1;
        }
        if e % 2 == 1 {
            free *= &bp;
        }
        p += 1;
    }
    let sign = if neg { "-" } else { "" };
    if m.is_one() || m.to_u64().is_some_and(|v| v < 100_000_000) {
        // m has no prime factor below 10^4 and is below 10^8: it is 1 or a prime
        format!("{sign}{}", free * m)
    } else {
        format!("{sign}{} (mod squares)", a.numer() * a.denom())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn square_classes() {
        // common practice: a b is a square iff a and b lie in one square class
        assert!(same_square_class(&q(2, 1), &q(8, 1)));
        assert!(same_square_class(&q(3, 4), &q(12, 1)));
        assert!(!same_square_class(&q(2, 1), &q(3, 1)));
        assert!(!same_square_class(&q(-1, 1), &q(1, 1)));
        assert_eq!(square_class_text(&q(-12, 1)), "-3");
        assert_eq!(square_class_text(&q(50, 9)), "2");
    }
}
