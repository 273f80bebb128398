//! Equivalence of classical schemes. de Groote 1978, "On varieties of optimal algorithms
//! for the computation of bilinear mappings II: optimal algorithms for 2x2-matrix
//! multiplication": every rank-7 scheme for <2,2,2> is equivalent to Strassen's.

use super::confirm::fixes_tensor;
use super::*;
use crate::scalar::q;
use crate::scheme::sandwich::Side;
use crate::scheme::testkit::*;
use crate::scheme::verify;
use num_traits::One;

fn params(nmp: [usize; 3]) -> EquivParams {
    EquivParams {
        matmul: Some(nmp),
        ..EquivParams::default()
    }
}

fn check_equivalent(s1: &Scheme, s2: &Scheme, t: &Tensor, p: &EquivParams) -> Transformation {
    let e = equivalence(s1, s2, t, p);
    let Verdict::Equivalent(tr) = e.verdict else {
        panic!("{:?}", e.verdict);
    };
    assert!(fixes_tensor(t, &tr.maps));
    tr.as_ref().clone()
}

#[test]
fn strassen_and_winograd_are_equivalent() {
    let t = matmul(2, 2, 2);
    let s = scheme(STRASSEN, &t);
    let w = scheme(WINOGRAD, &t);
    let tr = check_equivalent(&s, &w, &t, &params([2, 2, 2]));
    // the sandwich form is found and was checked by applying it
    let [x, y, z] = tr.sandwich.expect("a sandwich for matrix multiplication");
    let form = match tr.form.as_str() {
        "input" => s.clone(),
        other => {
            discrete_forms(&s, &t, [2, 2, 2])
                .into_iter()
                .find(|(n, _)| n == other)
                .unwrap()
                .1
        }
    };
    let img = crate::scheme::sandwich::apply_sandwich(&form, [2, 2, 2], [&x, &y, &z]).unwrap();
    assert!(verify(&img, &t).is_ok());
    // and the other way round
    check_equivalent(&w, &s, &t, &params([2, 2, 2]));
}

#[test]
fn a_disguised_strassen_is_found() {
    // sandwich moves, term scaling and a term permutation
    let t = matmul(2, 2, 2);
    let s = scheme(STRASSEN, &t);
    let mut x = moved(
        &s,
        [2, 2, 2],
        &[
            (Side::X, 0, 1, q(1, 1)),
            (Side::Z, 1, 1, q(-3, 2)),
            (Side::Y, 1, 0, q(-1, 1)),
        ],
    );
    x.u[2] = x.u[2].iter().map(|c| c * q(5, 1)).collect();
    x.w[2] = x.w[2].iter().map(|c| c * q(1, 5)).collect();
    x.u.swap(0, 6);
    x.v.swap(0, 6);
    x.w.swap(0, 6);
    assert!(verify(&x, &t).is_ok());
    let tr = check_equivalent(&s, &x, &t, &params([2, 2, 2]));
    assert_eq!(tr.matching[0], 6);
    // over GF(7) too
    let t7 = t.with_field(FieldSpec::Prime(7)).unwrap();
    let s7 = s.with_field(FieldSpec::Prime(7)).unwrap();
    let x7 = x.with_field(FieldSpec::Prime(7)).unwrap();
    check_equivalent(&s7, &x7, &t7, &params([2, 2, 2]));
}

#[test]
fn separated_by_invariants() {
    let t = matmul(2, 2, 2);
    let s = scheme(STRASSEN, &t);
    let e = equivalence(&s, &Scheme::standard(&t), &t, &params([2, 2, 2]));
    match e.verdict {
        Verdict::NotEquivalent { invariant, .. } => assert_eq!(invariant, "rank"),
        v => panic!("{v:?}"),
    }
    // two rank-8 schemes: the schoolbook one and Strassen's with a product split in two
    let mut split = s.clone();
    let (u, w) = (split.u[2].clone(), split.w[2].clone());
    split.v[2] = vec![Q::zero(), Q::one(), Q::zero(), Q::zero()]; // a11*b12
    split.push(u, vec![Q::zero(), Q::zero(), Q::zero(), -Q::one()], w); // -a11*b22
    assert!(verify(&split, &t).is_ok());
    let e = equivalence(&split, &Scheme::standard(&t), &t, &params([2, 2, 2]));
    match e.verdict {
        Verdict::NotEquivalent {
            invariant,
            first,
            second,
        } => assert_ne!(first, second, "{invariant}"),
        v => panic!("{v:?}"),
    }
}

#[test]
fn polynomial_schemes_under_diagonal_symmetries() {
    // Karatsuba and Ofman 1962 and its image under x -> 2x (not a sandwich: any tensor)
    let t = polymul(2);
    let k = scheme(KARATSUBA, &t);
    let mut x = k.clone();
    for e in crate::scheme::symmetry::diagonal_symmetries(&t) {
        x = crate::scheme::symmetry::apply_diagonal(&x, &e, &q(2, 1));
    }
    assert!(verify(&x, &t).is_ok());
    let tr = check_equivalent(&k, &x, &t, &EquivParams::default());
    assert!(tr.sandwich.is_none());
}

#[test]
fn a_big_random_sandwich_is_recognised() {
    // Strassen's scheme under a seeded random sandwich with entries up to 10^6: dense
    // coefficients with big numerators and denominators
    use crate::tensor::random_invertible;
    let t = matmul(2, 2, 2);
    let s = scheme(STRASSEN, &t);
    let [x, y, z] = [1u64, 2, 3].map(|k| random_invertible(2, 1_000_000, k));
    let big = crate::scheme::sandwich::apply_sandwich(&s, [2, 2, 2], [&x, &y, &z]).unwrap();
    assert!(verify(&big, &t).is_ok());
    let tr = check_equivalent(&s, &big, &t, &params([2, 2, 2]));
    assert!(tr.sandwich.is_some());
    check_equivalent(&big, &scheme(WINOGRAD, &t), &t, &params([2, 2, 2]));
}
