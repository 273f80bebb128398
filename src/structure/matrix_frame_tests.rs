//! Tests of the frames of a matrix product ([`super`]): formats, random bases with small
//! and large entries, refusals, prime fields.

use super::*;
use crate::generators::generate;
use crate::scalar::FieldSpec;
use crate::tensor::random_invertible;

/// `<n,m,p>` after seeded random changes of basis with entries in -b..b.
pub(crate) fn scrambled(f: [usize; 3], b: i64, seed: u64) -> Tensor {
    let t = generate(&format!("matmul:{},{},{}", f[0], f[1], f[2])).unwrap();
    let d = t.dims();
    let [p, q, r] = [0, 1, 2].map(|i| random_invertible(d[i], b, seed * 3 + i as u64));
    change_basis(&t, &p, &q, &r).unwrap()
}

#[test]
fn formats_from_dimensions() {
    assert_eq!(format_of_dims([6, 12, 8]), Some([2, 3, 4]));
    assert_eq!(format_of_dims([4, 4, 4]), Some([2, 2, 2]));
    assert_eq!(format_of_dims([4, 6, 5]), None);
    // p < m, gcd(m, p) = 1
    assert!(has_module([2, 3, 2]) && has_module([4, 4, 3]) && has_module([2, 5, 2]));
    assert!(has_module([3, 5, 3]) && has_module([5, 5, 3]));
    assert!(!has_module([2, 2, 3]) && !has_module([2, 4, 2]) && !has_module([3, 3, 3]));
    assert!(candidate_permutations([4, 8, 8]).is_empty()); // <2,2,4>
    assert!(!candidate_permutations([4, 6, 6]).is_empty()); // <2,2,3>
}

#[test]
fn frames_in_three_random_bases() {
    for f in [
        [2, 2, 3],
        [3, 2, 2],
        [2, 3, 4],
        [1, 2, 3],
        [3, 4, 5],
        [3, 3, 5],
        [5, 3, 5],
    ] {
        for (b, seed) in [(2, 1), (1000, 2)] {
            let t = scrambled(f, b, seed);
            let frame = find_matrix_frame(&t, &FrameParams::default())
                .unwrap_or_else(|| panic!("{f:?} entries {b} seed {seed}"));
            assert_eq!(frame.format, f);
        }
    }
}

#[test]
fn refusals_and_prime_fields() {
    // not reached by the method (no x = s y + 1 among the sides), or not a product
    for spec in ["matmul:2,2,4", "matmul:3,3,3", "poly:2,3"] {
        let t = generate(spec).unwrap();
        assert!(
            find_matrix_frame(&t, &FrameParams::default()).is_none(),
            "{spec}"
        );
    }
    // the dimensions of <2,2,3> (4 x 6 x 6), not the product: two copies of a 2 x 3 x 3
    // block, each the product of a vector by a 3 x 3 matrix... any concise tensor
    let t = generate("poly:2,5").unwrap(); // 2 x 5 x 6
    assert!(find_matrix_frame(&t, &FrameParams::default()).is_none());
    // over GF(7), after changes of basis of determinant 1 (unit lower triangular)
    let t = unimodular_scrambled([2, 3, 4], 5)
        .with_field(FieldSpec::Prime(7))
        .unwrap();
    let frame = find_matrix_frame(&t, &FrameParams::default()).unwrap();
    assert_eq!(frame.format, [2, 3, 4]);
    // coprime sides over small fields, where single draws fail more often
    for (format, q) in [([3, 3, 5], 7), ([5, 3, 3], 3), ([2, 3, 5], 2)] {
        for seed in 1..=3 {
            let t = unimodular_scrambled(format, seed).with_field(FieldSpec::Prime(q));
            let frame = find_matrix_frame(&t.unwrap(), &FrameParams::default());
            assert_eq!(
                frame.map(|fr| fr.format),
                Some(format),
                "{format:?} GF({q}) {seed}"
            );
        }
    }
}

/// `<n,m,p>` after seeded unit lower triangular changes of basis (determinant 1: the
/// same product over every prime field).
fn unimodular_scrambled(format: [usize; 3], seed: u64) -> Tensor {
    let [n, m, p] = format;
    let t = generate(&format!("matmul:{n},{m},{p}")).unwrap();
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let [a, b, c] = t.dims().map(|d| {
        let mut x = Matrix::filled(d, d, Q::from_integer(0.into()));
        for i in 0..d {
            x.data[i * d + i] = Q::from_integer(1.into());
            for j in 0..i {
                x.data[i * d + j] = Q::from_integer(rng.gen_range(-3..=3).into());
            }
        }
        x
    });
    change_basis(&t, &a, &b, &c).unwrap()
}
