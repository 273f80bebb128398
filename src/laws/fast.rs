//! An exact word-size path for identities over Q.
//!
//! Over Q, scale the structure constants by the lcm `D` of their denominators to integers
//! `c' = D c`. Every law's identity is homogeneous: each term has the same number `k` of
//! products, so an instance's value over Q is `D^-k` times its value `v` computed with
//! `c'`, and it vanishes iff `v = 0`. With `L = max_{i,j} sum_k |c'[i][j][k]|`, a product
//! tree of `k` products of basis elements has L1 norm at most `L^k` (since
//! `|x*y|_1 <= L |x|_1 |y|_1`), so every coordinate of `v` is bounded by
//! `B = (orderings) * (sum of |term coefficients|) * L^k`. When `2B < P` for the prime
//! `P = 2^61 - 1`, `v mod P` determines `v`, and the whole check runs in GF(P) with the
//! same verdicts and counts; the witness value is then recomputed over Q.

use super::check::{Check, check_identity, witness_at};
use super::expr::{Expr, Identity, Notation};
use crate::scalar::{Field, PrimeField};
use crate::tensor::Table;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};

/// The prime 2^61 - 1.
const P: u64 = (1 << 61) - 1;

fn products(e: &Expr) -> usize {
    match e {
        Expr::Var(_) => 0,
        Expr::Mul(a, b) => 1 + products(a) + products(b),
    }
}

/// The integer table `D c` reduced mod P, when the bound above allows the word path.
fn modular_image<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    id: &Identity,
    d: usize,
) -> Option<Table<u64>> {
    let k = products(&id.terms.first()?.1);
    if id.terms.iter().any(|(_, e)| products(e) != k) {
        return None;
    }
    let mut den = BigInt::one();
    for row in &t.products {
        for (_, c) in row {
            den = den.lcm(f.to_rational(c).denom());
        }
    }
    let mut l = BigInt::zero();
    let mut ints: Vec<Vec<(usize, BigInt)>> = Vec::with_capacity(t.products.len());
    for row in &t.products {
        let r: Vec<(usize, BigInt)> = row
            .iter()
            .map(|(kk, c)| {
                let q = f.to_rational(c);
                (*kk, q.numer() * (&den / q.denom()))
            })
            .collect();
        let s: BigInt = r.iter().map(|(_, v)| v.abs()).sum();
        l = l.max(s);
        ints.push(r);
    }
    let orderings: u64 = (1..=d as u64).product::<u64>().max(1);
    let coef_sum: u64 = id.terms.iter().map(|(c, _)| c.unsigned_abs()).sum();
    let bound = BigInt::from(orderings) * BigInt::from(coef_sum) * num_traits::pow(l, k);
    if bound * 2 >= BigInt::from(P) {
        return None;
    }
    let pb = BigInt::from(P);
    let products = ints
        .into_iter()
        .map(|r| {
            r.into_iter()
                .map(|(kk, v)| {
                    let m = v.mod_floor(&pb);
                    (kk, u64::try_from(m).expect("reduced below P"))
                })
                .collect()
        })
        .collect();
    Some(Table {
        dims: t.dims,
        products,
    })
}

/// [`check_identity`], through GF(2^61 - 1) when that is exact (characteristic 0 and the
/// bound holds), otherwise directly in `f`. Same results either way.
pub fn check_identity_fast<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    id: &Identity,
    d: usize,
    notation: Notation,
    stop_first: bool,
) -> Check {
    if f.characteristic() == 0
        && let Some(tp) = modular_image(f, t, id, d)
    {
        let pf = PrimeField::new(P).expect("2^61 - 1 is prime");
        let mut c = check_identity(&pf, &tp, names, id, d, notation, stop_first);
        if let Some(inst) = &c.first {
            c.witness = Some(witness_at(f, t, names, id, inst, notation));
        }
        return c;
    }
    check_identity(f, t, names, id, d, notation, stop_first)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::laws::expr::{mul, var};
    use crate::scalar::{Q, Rationals, q};

    #[test]
    fn same_as_exact() {
        // a random-ish rational 3-dim algebra with halves
        let mut products = vec![Vec::new(); 9];
        for (ij, row) in products.iter_mut().enumerate() {
            for k in 0..3 {
                let v = q(((ij * 7 + k * 3) % 5) as i64 - 2, 1 + (ij % 2) as i64);
                if v != Q::zero() {
                    row.push((k, v));
                }
            }
        }
        let t = Table {
            dims: [3, 3, 3],
            products,
        };
        let names: Vec<String> = ["a", "b", "c"].iter().map(|s| s.to_string()).collect();
        let id = Identity {
            terms: vec![
                (1, mul(mul(var(0), var(1)), var(2))),
                (-1, mul(var(0), mul(var(1), var(2)))),
            ],
            nvars: 3,
        };
        for d in [0, 2, 3] {
            let a = check_identity(&Rationals, &t, &names, &id, d, Notation::Product, false);
            let b = check_identity_fast(&Rationals, &t, &names, &id, d, Notation::Product, false);
            assert!(modular_image(&Rationals, &t, &id, d).is_some());
            assert_eq!((a.checked, a.failures), (b.checked, b.failures));
            assert_eq!(a.witness, b.witness);
        }
    }
}
