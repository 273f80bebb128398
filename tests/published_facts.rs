//! Published facts about laws and ranks of classical algebras and bilinear maps, checked
//! against `bilin::laws` and `bilin::ranks`. Each row carries its source.

use bilin::generators::generate;
use bilin::laws::{self, Law};
use bilin::ranks;
use bilin::scalar::FieldSpec;
use bilin::tensor::Tensor;

fn load(spec: &str, field: FieldSpec) -> Tensor {
    let t = generate(spec).unwrap_or_else(|e| panic!("{spec}: {e}"));
    if field == FieldSpec::Rational {
        t
    } else {
        t.with_field(field).expect("reducible")
    }
}

fn verdict(spec: &str, field: FieldSpec, law: Law) -> Option<bool> {
    let p = laws::Params {
        laws: vec![law],
        ..laws::Params::default()
    };
    laws::check_laws(&load(spec, field), &p).unwrap().holds(law)
}

const Q: FieldSpec = FieldSpec::Rational;

/// (input, field, law, holds, source)
const LAW_FACTS: &[(&str, FieldSpec, Law, bool, &str)] = &[
    (
        "quaternions",
        Q,
        Law::Associative,
        true,
        "Hamilton 1844, On quaternions, Phil. Mag.",
    ),
    (
        "quaternions",
        Q,
        Law::Commutative,
        false,
        "Hamilton 1844, On quaternions, Phil. Mag.",
    ),
    (
        "quaternions",
        Q,
        Law::Unital,
        true,
        "Hamilton 1844, On quaternions, Phil. Mag.",
    ),
    (
        "quaternions",
        FieldSpec::Prime(3),
        Law::Associative,
        true,
        "common practice (an identity with integer coefficients survives reduction mod p)",
    ),
    (
        "octonions",
        Q,
        Law::Alternative,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III",
    ),
    (
        "octonions",
        Q,
        Law::Associative,
        false,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III",
    ),
    (
        "octonions",
        Q,
        Law::Flexible,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III",
    ),
    (
        "octonions",
        Q,
        Law::PowerAssociative,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras (alternative implies power-associative, Artin's theorem)",
    ),
    (
        "octonions",
        Q,
        Law::LieAdmissible,
        false,
        "Sagle 1961, Malcev algebras, Trans. AMS (the commutator algebra of the octonions is Malcev, not Lie) (from memory)",
    ),
    (
        "octonions",
        Q,
        Law::Unital,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III",
    ),
    (
        "split-octonions",
        Q,
        Law::Alternative,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III (from memory)",
    ),
    (
        "sedenions",
        Q,
        Law::Alternative,
        false,
        "Schafer 1954, On the algebras formed by the Cayley-Dickson process, Amer. J. Math. (from memory)",
    ),
    (
        "sedenions",
        Q,
        Law::Flexible,
        true,
        "Schafer 1954, On the algebras formed by the Cayley-Dickson process, Amer. J. Math. (from memory)",
    ),
    (
        "sedenions",
        Q,
        Law::PowerAssociative,
        true,
        "Schafer 1954, On the algebras formed by the Cayley-Dickson process, Amer. J. Math. (from memory)",
    ),
    ("complex", Q, Law::Commutative, true, "common practice"),
    ("complex", Q, Law::Associative, true, "common practice"),
    (
        "matrix:3",
        Q,
        Law::Associative,
        true,
        "Jacobson 1985, Basic Algebra I, ch. 2 (from memory)",
    ),
    (
        "matrix:3",
        Q,
        Law::Unital,
        true,
        "Jacobson 1985, Basic Algebra I, ch. 2 (from memory)",
    ),
    ("matrix:2", Q, Law::Commutative, false, "common practice"),
    (
        "matrix:3",
        Q,
        Law::JordanAdmissible,
        true,
        "Jacobson 1968, Structure and Representations of Jordan Algebras, ch. I (special Jordan algebras)",
    ),
    (
        "matrix:3",
        Q,
        Law::LieAdmissible,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 1.2",
    ),
    (
        "sl:2",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 1.2",
    ),
    (
        "sl:2",
        Q,
        Law::Associative,
        false,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 1.2",
    ),
    (
        "so:3",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 1.2 (so(3) is the cross product on Q^3)",
    ),
    (
        "gl:3",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 1.2",
    ),
    (
        "heisenberg:1",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory (from memory)",
    ),
    (
        "heisenberg:2",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory (from memory)",
    ),
    (
        "commutator:matrix:3",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 1.2",
    ),
    (
        "commutator:quaternions",
        Q,
        Law::Lie,
        true,
        "Humphreys 1972, 1.2 (the commutator algebra of an associative algebra is Lie)",
    ),
    (
        "jordan:3",
        Q,
        Law::Jordan,
        true,
        "Jacobson 1968, Structure and Representations of Jordan Algebras, ch. I",
    ),
    (
        "jordan:3",
        Q,
        Law::Associative,
        false,
        "Jacobson 1968, Structure and Representations of Jordan Algebras, ch. I (from memory)",
    ),
    (
        "anticommutator:matrix:3",
        Q,
        Law::Jordan,
        true,
        "Jacobson 1968, Structure and Representations of Jordan Algebras, ch. I (special Jordan algebras)",
    ),
    (
        "anticommutator:octonions",
        Q,
        Law::Jordan,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III (the plus algebra of an alternative algebra is Jordan) (from memory)",
    ),
    (
        "octonions",
        Q,
        Law::JordanAdmissible,
        true,
        "Schafer 1966, An Introduction to Nonassociative Algebras, ch. III (the plus algebra of an alternative algebra is Jordan) (from memory)",
    ),
    (
        "cyclic:5",
        Q,
        Law::Commutative,
        true,
        "common practice (group algebra of an abelian group)",
    ),
    ("cyclic:5", Q, Law::Unital, true, "common practice"),
    (
        "dihedral:3",
        Q,
        Law::Commutative,
        false,
        "common practice (group algebra of a non-abelian group)",
    ),
    ("dihedral:3", Q, Law::Associative, true, "common practice"),
    ("symmetric:3", Q, Law::Associative, true, "common practice"),
    ("dual", Q, Law::Unital, true, "common practice"),
    ("dual", Q, Law::Commutative, true, "common practice"),
];

#[test]
fn law_facts() {
    let mut bad = Vec::new();
    for (spec, field, law, expected, source) in LAW_FACTS {
        let got = verdict(spec, *field, *law);
        if got != Some(*expected) {
            bad.push(format!(
                "{spec} over {field}: {} = {got:?}, expected {expected} ({source})",
                law.name()
            ));
        }
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

/// Cl(0,2) is the quaternions: Lounesto 2001, Clifford Algebras and Spinors, ch. 3.
#[test]
fn clifford_02_is_quaternions() {
    let p = laws::Params::default();
    let a = laws::check_laws(&load("clifford:0,2", Q), &p).unwrap();
    let b = laws::check_laws(&load("quaternions", Q), &p).unwrap();
    for law in Law::ALL {
        assert_eq!(a.holds(law), b.holds(law), "{}", law.name());
    }
    let rp = ranks::Params::default();
    let (ra, rb) = (
        ranks::compute_ranks(&load("clifford:0,2", Q), &rp),
        ranks::compute_ranks(&load("quaternions", Q), &rp),
    );
    assert_eq!(ra.flattening, rb.flattening);
}

/// (input, flattening ranks, source)
const RANK_FACTS: &[(&str, [usize; 3], &str)] = &[
    (
        "matmul:2,2,2",
        [4, 4, 4],
        "Buergisser, Clausen, Shokrollahi 1997, Algebraic Complexity Theory, ch. 14 (flattening ranks of <n,m,p> are nm, mp, pn)",
    ),
    (
        "matmul:2,3,4",
        [6, 12, 8],
        "Buergisser, Clausen, Shokrollahi 1997, Algebraic Complexity Theory, ch. 14",
    ),
    (
        "matmul:3,3,3",
        [9, 9, 9],
        "Buergisser, Clausen, Shokrollahi 1997, Algebraic Complexity Theory, ch. 14",
    ),
    (
        "matmul:1,2,3",
        [2, 6, 3],
        "Buergisser, Clausen, Shokrollahi 1997, Algebraic Complexity Theory, ch. 14",
    ),
    (
        "poly:3,4",
        [3, 4, 6],
        "common practice (the product map of polynomials is concise)",
    ),
    (
        "matrix:3",
        [9, 9, 9],
        "common practice (a unital algebra's tensor is concise)",
    ),
    (
        "heisenberg:1",
        [2, 2, 1],
        "common practice ([x,y] = z: ad z = 0 and the derived algebra is Qz)",
    ),
];

#[test]
fn rank_facts() {
    for (spec, expected, source) in RANK_FACTS {
        let r = ranks::compute_ranks(&load(spec, Q), &ranks::Params::default());
        assert_eq!(&r.flattening, expected, "{spec} ({source})");
    }
}

/// The left slices of <n,m,p> span {A (x) I_p}: largest rank min(n,m) p
/// (common practice, from the definition of the matrix multiplication tensor).
#[test]
fn matmul_slice_span() {
    let r = ranks::compute_ranks(&load("matmul:2,3,2", Q), &ranks::Params::default());
    assert_eq!(r.span[0].certificate_rank, 4);
    assert!(r.span[0].proven || r.span[0].upper_bound >= 4);
    assert_eq!(r.span[0].random_rank, 4);
}

/// The generic element of a semisimple Lie algebra L is regular: its centralizer has
/// dimension rank(L), so the largest rank of ad x is dim L - rank L; for sl(2): 3 - 1 = 2
/// (Humphreys 1972, Introduction to Lie Algebras and Representation Theory, 15.3)
/// (from memory). The left slices of a Lie algebra are the matrices of ad e_i (up to
/// transposition).
#[test]
fn sl2_regular_elements() {
    let r = ranks::compute_ranks(&load("sl:2", Q), &ranks::Params::default());
    assert_eq!(r.span[0].certificate_rank, 2);
    assert_eq!(r.span[0].upper_bound, 2);
    assert!(r.span[0].proven);
    assert!(r.span[0].upper_bound_method.starts_with("grid"));
}
