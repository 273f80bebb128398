//! Trace forms of an algebra and their congruence invariants.
//!
//! `t_L(x, y) = tr(L_x L_y)` and `t_R(x, y) = tr(R_x R_y)` (L_x, R_x: left and right
//! multiplication) are symmetric bilinear forms that change by congruence under a change of
//! basis, so their rank, their signature over Q (Sylvester's law of inertia) and the
//! discriminant of the induced nondegenerate form up to squares are isomorphism invariants.
//! For a Lie algebra t_L is the Killing form; for an associative algebra over Q the kernel
//! of t_L is the radical (Dickson's criterion, see Pierce 1982, Associative Algebras).
//!
//! The Gram matrix is computed for the integer-scaled constants `c' = D c` (it scales by
//! `D^2`, a square, so rank, signature and discriminant class are unchanged), modulo enough
//! primes to recover its integer entries by the Chinese remainder theorem (each entry is at
//! most `n^2 C^2`, C the largest constant): no big-integer arithmetic in the sums.
//! Cost: O(n^2 nnz) word operations per prime, then O(n^3) exact operations for the
//! diagonalisation.

use crate::linalg::nullspace::cached_primes;
use crate::scalar::common_denominator;
use crate::scalar::{Field, FieldSpec, PrimeField, Q, Rationals};
use crate::scalar::{crt_combine, residue};
use crate::tensor::IntegralTensor;
use num_bigint::BigInt;
use num_integer::Integer;
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

/// The Gram matrix of `t_L` (left = true) or `t_R` for the integer-scaled constants: over
/// Q its exact integer entries, over GF(q) the residues. Entry `[i][j] = sum_{a,b}
/// M_i[a][b] M_j[b][a]` with `M_i[a][b]` the coefficient of `e_a` in `e_i e_b` (L) or
/// `e_b e_i` (R).
pub fn trace_form(it: &IntegralTensor, left: bool) -> Vec<Vec<BigInt>> {
    let n = it.dims[0];
    let primes: Vec<u64> = match it.modulus() {
        Some(q) => vec![q],
        None => {
            let bits = 2 * it.constant_bits() + 2 * (64 - (n as u64).leading_zeros() as u64) + 2;
            cached_primes()[..(bits as f64 / 27.99).ceil() as usize].to_vec()
        }
    };
    let grams: Vec<Vec<u64>> = primes
        .iter()
        .map(|&p| {
            // m[i] = the matrix M_i as (a, b, residue) triples
            let mats: Vec<Vec<(usize, usize, u64)>> = (0..n)
                .map(|i| {
                    let mut v = Vec::new();
                    for b in 0..n {
                        for (a, x) in it.product_by(i, b, left) {
                            let x = residue(x, p);
                            if x != 0 {
                                v.push((*a as usize, b, x));
                            }
                        }
                    }
                    v
                })
                .collect();
            let mut g = vec![0u64; n * n];
            let mut dense = vec![0u64; n * n];
            for j in 0..n {
                dense.iter_mut().for_each(|x| *x = 0);
                for &(a, b, x) in &mats[j] {
                    dense[a * n + b] = x;
                }
                for i in 0..=j {
                    let mut s: u128 = 0;
                    for &(a, b, x) in &mats[i] {
                        s += x as u128 * dense[b * n + a] as u128;
                    }
                    let s = (s % p as u128) as u64;
                    g[i * n + j] = s;
                    g[j * n + i] = s;
                }
            }
            g
        })
        .collect();
    // Chinese remaindering of the Gram matrices, entry by entry
    let mut entries: Vec<BigInt> = grams[0].iter().map(|&x| BigInt::from(x)).collect();
    let mut modulus = BigInt::from(primes[0]);
    for (g, &p) in grams.iter().zip(&primes).skip(1) {
        crt_combine(&mut entries, &modulus, g, p);
        modulus *= p;
    }
    let half = &modulus >> 1u32;
    let mut entries = entries.into_iter();
    (0..n)
        .map(|_| {
            (0..n)
                .map(|_| {
                    let mut x = entries.next().expect("n^2 entries");
                    if it.modulus().is_none() && x > half {
                        x -= &modulus;
                    }
                    x
                })
                .collect()
        })
        .collect()
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

/// Rank, signature and discriminant class of a symmetric form with integer (over Q) or
/// residue (over GF(q)) entries.
pub fn form_invariants(field: FieldSpec, g: &[Vec<BigInt>]) -> FormInvariants {
    match field {
        FieldSpec::Rational => {
            let gq: Vec<Vec<Q>> = g
                .iter()
                .map(|r| r.iter().map(|x| Q::from_integer(x.clone())).collect())
                .collect();
            let diag = diagonal_entries(&Rationals, gq);
            let pos = diag.iter().filter(|x| x.is_positive()).count();
            let disc = diag.iter().fold(Q::one(), |a, b| a * b);
            FormInvariants {
                rank: diag.len(),
                signature: Some((pos, diag.len() - pos)),
                discriminant: Some(disc),
            }
        }
        FieldSpec::Prime(p) => {
            let f = PrimeField::new(p).expect("prime");
            let gg: Vec<Vec<u64>> = g
                .iter()
                .map(|r| r.iter().map(|x| f.reduce_big(x)).collect())
                .collect();
            if p == 2 {
                let m = crate::linalg::Matrix::from_rows(gg, g.len());
                return FormInvariants {
                    rank: crate::linalg::rank(&f, &m),
                    signature: None,
                    discriminant: None,
                };
            }
            let diag = diagonal_entries(&f, gg);
            let disc = diag.iter().fold(1u64, |a, b| f.mul(&a, b));
            let square = f.pow(disc, (p - 1) / 2) == 1;
            let rep = if square {
                1
            } else {
                (2..p).find(|&a| f.pow(a, (p - 1) / 2) != 1).unwrap_or(1)
            };
            FormInvariants {
                rank: diag.len(),
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

/// The Gram matrix of the trace form `(X, Y) -> tr(X Y)` on a space of linear maps of an
/// n-dimensional space (each basis vector holds a map's matrix, `X[l][i]` at `l n + i`, as
/// in [`crate::invariants::maps`]). Each basis map is first scaled to integer entries (a
/// congruence), so rank, signature and discriminant class are those of the form on the
/// space. Over GF(q) the entries are residues. For the derivation algebra this form is
/// invariant under automorphisms of the algebra, so its congruence class is an invariant.
/// Cost: O(dim^2 nnz) big-integer operations.
pub fn map_trace_form(
    space: &crate::linalg::nullspace::Space,
    n: usize,
    modulus: Option<u64>,
) -> Vec<Vec<BigInt>> {
    let d = space.dim();
    let maps: Vec<Vec<(usize, usize, BigInt)>> = (0..d)
        .map(|a| {
            let v = &space.basis[a];
            let den = common_denominator(v.iter().map(|(_, x)| x));
            v.iter()
                .map(|(c, x)| {
                    let c = *c as usize;
                    (c / n, c % n, x.numer() * (&den / x.denom()))
                })
                .collect()
        })
        .collect();
    let mut dense = vec![BigInt::zero(); n * n];
    let mut g = vec![vec![BigInt::zero(); d]; d];
    for b in 0..d {
        for (l, i, x) in &maps[b] {
            dense[l * n + i] = x.clone();
        }
        for a in 0..=b {
            // tr(X_a X_b) = sum X_a[l][i] X_b[i][l]
            let mut s = BigInt::zero();
            for (l, i, x) in &maps[a] {
                let y = &dense[i * n + l];
                if !y.is_zero() {
                    s += x * y;
                }
            }
            if let Some(q) = modulus {
                s = s.mod_floor(&BigInt::from(q));
            }
            g[a][b] = s.clone();
            g[b][a] = s;
        }
        for (l, i, _) in &maps[b] {
            dense[l * n + i] = BigInt::zero();
        }
    }
    g
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
