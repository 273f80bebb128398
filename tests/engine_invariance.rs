//! Property tests of the exact engines on tables in a basis of the user's own: every law
//! verdict, every invariant dimension and the whole catalog fingerprint are unchanged by a
//! random change of basis with large entries (up to 10^6, determinant not 1), which makes
//! the table dense with coefficients of hundreds of bits. Common practice: these are
//! defined without reference to a basis, so they cannot depend on it.

use bilin::catalog::{FingerprintParams, all_entries, compute_fingerprint};
use bilin::invariants::all::{Params, compute_invariants};
use bilin::laws::{self, Law};
use bilin::scalar::{FieldSpec, q};
use bilin::tensor::{Kind, Tensor, change_basis_algebra, random_invertible};
use proptest::prelude::*;
use rand::{Rng, SeedableRng};

/// The dimensions of every invariant part, in a fixed order (`usize::MAX` when absent).
fn invariant_dims(t: &Tensor) -> Vec<usize> {
    let r = compute_invariants(t, &Params::default(), &mut |_| {}).unwrap();
    let d = |s: &Option<bilin::invariants::Space>| s.as_ref().map_or(usize::MAX, |s| s.dim());
    let mut v = vec![
        d(&r.commutative_centre),
        d(&r.centre),
        d(&r.left_nucleus),
        d(&r.middle_nucleus),
        d(&r.right_nucleus),
        d(&r.nucleus),
        d(&r.left_annihilator),
        d(&r.right_annihilator),
        d(&r.annihilator),
        r.unit.as_ref().map_or(usize::MAX, |u| u.is_some() as usize),
        r.centroid.as_ref().map_or(usize::MAX, |c| c.space.dim()),
        r.derivations.as_ref().map_or(usize::MAX, |c| c.space.dim()),
        r.derivations
            .as_ref()
            .and_then(|c| c.inner.as_ref())
            .map_or(usize::MAX, |s| s.dim()),
        d(&r.adjoint),
    ];
    if let Some(bilin::invariants::all::RadicalPart::Computed(rad)) = &r.radical {
        v.push(rad.space.dim());
        v.push(rad.quotient_centre_dim);
    }
    if let Some(l) = &r.lie {
        v.extend(&l.derived_series);
        v.extend(&l.lower_central_series);
        v.push(l.killing_rank);
    }
    v
}

fn verdicts(t: &Tensor) -> Vec<Option<bool>> {
    let r = laws::check_laws(t, &laws::Params::default()).unwrap();
    Law::ALL.iter().map(|&l| r.holds(l)).collect()
}

/// A random algebra: dense with small entries and fractions, or sparse.
fn random_algebra(n: usize, seed: u64) -> Tensor {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let names = (0..n).map(|i| format!("e{i}")).collect();
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    let density = if seed.is_multiple_of(2) { 1.0 } else { 0.3 };
    for i in 0..n {
        for j in 0..n {
            for k in 0..n {
                if rng.gen_bool(density) {
                    t.set(i, j, k, q(rng.gen_range(-3..=3), rng.gen_range(1..=3)));
                }
            }
        }
    }
    t
}

/// Catalog algebras of dimension 3 to 8 (the structured inputs) and random ones.
fn samples() -> Vec<(String, Tensor)> {
    let mut out: Vec<(String, Tensor)> = all_entries()
        .unwrap()
        .iter()
        .filter_map(|e| {
            let t = e.tensor().ok()?;
            (t.kind() == Kind::Algebra
                && (3..=8).contains(&t.dim())
                && t.field() == FieldSpec::Rational)
                .then(|| (e.meta.name.clone(), t))
        })
        .collect();
    for (k, n) in [3usize, 4, 5, 6].into_iter().enumerate() {
        out.push((format!("random {n}"), random_algebra(n, k as u64)));
    }
    out
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]

    #[test]
    fn unchanged_by_a_change_of_basis_with_large_entries(pick in 0usize..1000, seed in 0u64..1 << 32) {
        let all = samples();
        let (name, t) = &all[pick % all.len()];
        let p = random_invertible(t.dim(), 1_000_000, seed);
        let u = change_basis_algebra(t, &p).unwrap();
        prop_assert_eq!(verdicts(t), verdicts(&u), "laws of {}", name);
        prop_assert_eq!(invariant_dims(t), invariant_dims(&u), "invariants of {}", name);
        let fp = FingerprintParams::default();
        let (a, b) = (compute_fingerprint(t, &fp), compute_fingerprint(&u, &fp));
        prop_assert!(a.differences(&b).is_empty(), "fingerprint of {}: {:?}", name, a.differences(&b));
    }
}

/// Coefficients of 2^100 and denominators near 10^12 are analysed in full (no size limit
/// on the constants).
#[test]
fn huge_coefficients_are_analysed() {
    let big = num_bigint::BigInt::from(1u8) << 100u32;
    let names: Vec<String> = (0..4).map(|i| format!("e{i}")).collect();
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    // quaternion-like signs scaled by huge numbers and fractions with large denominators
    let d1 = num_bigint::BigInt::from(999_999_999_989i64); // a prime near 10^12
    for i in 0..4 {
        for j in 0..4 {
            let k = i ^ j;
            let v = if (i + 2 * j) % 3 == 0 {
                bilin::scalar::Q::from_integer(big.clone())
            } else {
                bilin::scalar::Q::new((i as i64 + 1).into(), d1.clone())
            };
            t.set(i, j, k, v);
        }
    }
    let params = bilin::report::Params {
        invariants: Some(Default::default()),
        bounds: Some(Default::default()),
        ..Default::default()
    };
    let r = bilin::report::analyze(&t, "huge", &params).unwrap();
    assert!(
        r.laws
            .as_ref()
            .unwrap()
            .results
            .iter()
            .all(|x| x.holds.is_some())
    );
    let u = change_basis_algebra(&t, &random_invertible(4, 1_000_000, 3)).unwrap();
    assert_eq!(verdicts(&t), verdicts(&u));
    assert_eq!(invariant_dims(&t), invariant_dims(&u));
}
