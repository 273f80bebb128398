//! Published facts about what algebras and maps are made of: the blocks, the radical, the
//! simple components and the Lie structure computed by `bilin::structure`, each checked
//! against its source, then the same answers in a random basis with large entries, and
//! planted direct sums recovered from a scrambled basis.

use bilin::catalog::find_entry;
use bilin::input::load_input;
use bilin::scalar::FieldSpec;
use bilin::scheme::construct::direct_sum_tensor;
use bilin::structure::{
    Decomposition, LieStructure, Outcome, Structure, StructureParams, Wedderburn, compute_structure,
};
use bilin::tensor::{Kind, Tensor, change_basis, change_basis_algebra, random_invertible};
use proptest::prelude::*;

fn load(spec: &str, field: FieldSpec) -> Tensor {
    let t = match find_entry(spec) {
        Some(e) => e.tensor().unwrap(),
        None => load_input(spec, None).unwrap(),
    };
    if t.field() == field {
        t
    } else {
        t.with_field(field).unwrap()
    }
}

fn structure(t: &Tensor) -> Structure {
    compute_structure(t, &StructureParams::default(), &mut |_| {}).unwrap()
}

fn components(s: &Structure) -> &Wedderburn {
    match s.components.as_ref().unwrap() {
        Outcome::Computed(w) => w,
        Outcome::NotApplicable(why) => panic!("no components: {why}"),
    }
}

fn lie(s: &Structure) -> &LieStructure {
    match s.lie.as_ref().unwrap() {
        Outcome::Computed(l) => l,
        Outcome::NotApplicable(why) => panic!("no Lie structure: {why}"),
    }
}

/// Block shapes, sorted (a decomposition is unique up to order and isomorphism of the
/// blocks: Krull-Schmidt for the centroid's idempotents).
fn block_shapes(d: &Decomposition) -> Vec<[usize; 3]> {
    let mut v: Vec<[usize; 3]> = d.blocks.iter().map(|b| b.dims).collect();
    v.sort();
    v
}

/// (dim, centre degree, n, dim D) of each component, sorted.
fn component_shapes(w: &Wedderburn) -> Vec<(usize, usize, Option<usize>, Option<usize>)> {
    let mut v: Vec<_> = w
        .components
        .iter()
        .map(|c| (c.dim, c.centre_degree, c.matrix_size, c.division_dim))
        .collect();
    v.sort();
    v
}

/// Everything that cannot depend on the basis: block shapes, radical dimension, component
/// shapes, Lie radical, nilradical, Levi and Cartan dimensions.
fn fingerprint(t: &Tensor) -> Vec<usize> {
    let s = structure(t);
    let mut v: Vec<usize> = block_shapes(s.blocks.as_ref().unwrap())
        .into_iter()
        .flatten()
        .collect();
    v.push(usize::MAX);
    if let Some(Outcome::Computed(w)) = &s.components {
        v.push(w.radical_dim);
        for (a, b, c, d) in component_shapes(w) {
            v.extend([a, b, c.unwrap_or(0), d.unwrap_or(0)]);
        }
    }
    v.push(usize::MAX);
    if let Some(Outcome::Computed(l)) = &s.lie {
        v.extend([
            l.radical.len(),
            l.nilradical.len(),
            l.levi_dim,
            l.cartan_dim.unwrap_or(0),
        ]);
    }
    v
}

fn euler_phi(mut n: usize) -> usize {
    let mut r = n;
    let mut p = 2;
    while p * p <= n {
        if n.is_multiple_of(p) {
            while n.is_multiple_of(p) {
                n /= p;
            }
            r -= r / p;
        }
        p += 1;
    }
    if n > 1 {
        r -= r / n;
    }
    r
}

/// Q[S_3] = Q + Q + M_2(Q) (Curtis and Reiner 1962, Representation Theory of Finite Groups
/// and Associative Algebras: the trivial, sign and two-dimensional representations).
#[test]
fn rational_group_algebra_of_s3() {
    let s = structure(&load("symmetric:3", FieldSpec::Rational));
    assert_eq!(s.associative, Some(true));
    let d = s.blocks.as_ref().unwrap();
    assert_eq!(block_shapes(d), vec![[1, 1, 1], [1, 1, 1], [4, 4, 4]]);
    assert_eq!(d.outside, 0);
    let w = components(&s);
    assert_eq!(w.radical_dim, 0);
    assert_eq!(
        component_shapes(w),
        vec![
            (1, 1, Some(1), Some(1)),
            (1, 1, Some(1), Some(1)),
            (4, 1, Some(2), Some(1))
        ]
    );
}

/// Q[C_n] = product over d | n of Q(zeta_d), of degree phi(d) (common practice: the
/// factorisation x^n - 1 = product of the cyclotomic polynomials).
#[test]
fn rational_cyclic_group_algebras_are_cyclotomic_fields() {
    for n in [5usize, 6, 8, 12] {
        let s = structure(&load(&format!("cyclic:{n}"), FieldSpec::Rational));
        let mut want: Vec<usize> = (1..=n)
            .filter(|d| n.is_multiple_of(*d))
            .map(euler_phi)
            .collect();
        want.sort();
        let w = components(&s);
        let mut got: Vec<usize> = w.components.iter().map(|c| c.centre_degree).collect();
        got.sort();
        assert_eq!(got, want, "Q[C_{n}]");
        assert!(w.components.iter().all(|c| c.dim == c.centre_degree));
        let mut blocks: Vec<usize> = s
            .blocks
            .as_ref()
            .unwrap()
            .blocks
            .iter()
            .map(|b| b.dims[0])
            .collect();
        blocks.sort();
        assert_eq!(blocks, want, "blocks of Q[C_{n}]");
    }
}

/// Q[Q_8] = 4 Q + H, H the rational quaternions, a division algebra (Curtis and Reiner
/// 1962; common practice).
#[test]
fn rational_quaternion_group_algebra() {
    let s = structure(&load("Q8", FieldSpec::Rational));
    assert_eq!(
        component_shapes(components(&s)),
        vec![
            (1, 1, Some(1), Some(1)),
            (1, 1, Some(1), Some(1)),
            (1, 1, Some(1), Some(1)),
            (1, 1, Some(1), Some(1)),
            (4, 1, Some(1), Some(4))
        ]
    );
}

/// F_2[C_4] = F_2[x]/((x - 1)^4) is local: radical of dimension 3, quotient F_2 (common
/// practice). F_3[S_3]: S_3 has two 3-regular classes, so two simple modules, both of
/// dimension 1 (Brauer; common practice, checked by hand): radical of dimension 6 - 2 = 4.
#[test]
fn radicals_in_characteristic_p() {
    let s = structure(&load("cyclic:4", FieldSpec::Prime(2)));
    let w = components(&s);
    assert_eq!(w.radical_dim, 3);
    assert_eq!(component_shapes(w), vec![(1, 1, Some(1), Some(1))]);
    assert_eq!(block_shapes(s.blocks.as_ref().unwrap()), vec![[4, 4, 4]]);

    let s = structure(&load("symmetric:3", FieldSpec::Prime(3)));
    let w = components(&s);
    assert_eq!(w.radical_dim, 4);
    assert_eq!(
        component_shapes(w),
        vec![(1, 1, Some(1), Some(1)), (1, 1, Some(1), Some(1))]
    );
    // F_3[S_3] is a single block (one 3-block: the principal block; common practice)
    assert_eq!(block_shapes(s.blocks.as_ref().unwrap()), vec![[6, 6, 6]]);

    // F_2[S_3]: the 2-regular classes are those of 1 and of the 3-cycles, so two simple
    // modules, of dimensions 1 and 2 (Brauer; common practice): F_2 + M_2(F_2) modulo a
    // radical of dimension 6 - 1 - 4 = 1
    let s = structure(&load("dihedral:3", FieldSpec::Prime(2)));
    let w = components(&s);
    assert_eq!(w.radical_dim, 1);
    assert_eq!(
        component_shapes(w),
        vec![(1, 1, Some(1), Some(1)), (4, 1, Some(2), Some(1))]
    );

    // Maschke: p does not divide |G| gives a semisimple group algebra (common practice);
    // F_5[S_3] = F_5 + F_5 + M_2(F_5)
    let s = structure(&load("symmetric:3", FieldSpec::Prime(5)));
    let w = components(&s);
    assert_eq!(w.radical_dim, 0);
    assert_eq!(
        component_shapes(w),
        vec![
            (1, 1, Some(1), Some(1)),
            (1, 1, Some(1), Some(1)),
            (4, 1, Some(2), Some(1))
        ]
    );
}

/// sl_2 + heisenberg_1 (a Lie direct sum): the solvable radical is the Heisenberg ideal
/// (dimension 3, nilpotent, so also the nilradical), a Levi factor is sl_2 (dimension 3),
/// and a Cartan subalgebra has dimension 1 + 3 (Humphreys 1972, Introduction to Lie
/// Algebras and Representation Theory: Cartan subalgebras of a direct sum are sums of
/// Cartan subalgebras; a nilpotent algebra is its own Cartan subalgebra).
#[test]
fn lie_direct_sum() {
    let t = direct_sum_tensor(
        &load("sl:2", FieldSpec::Rational),
        &load("heisenberg:1", FieldSpec::Rational),
    )
    .unwrap();
    assert_eq!(t.kind(), Kind::Algebra);
    let s = structure(&t);
    assert_eq!(s.lie_algebra, Some(true));
    let l = lie(&s);
    assert_eq!(l.levi_dim, 3);
    assert_eq!(l.radical.len(), 3);
    assert_eq!(l.nilradical.len(), 3);
    assert_eq!(l.cartan_dim, Some(4));
    assert_eq!(
        block_shapes(s.blocks.as_ref().unwrap()),
        vec![[3, 3, 3], [3, 3, 3]]
    );
}

/// The rank of sl_n (dimension of a Cartan subalgebra) is n - 1; gl_n has the centre as
/// solvable radical and nilradical, Levi factor sl_n (Humphreys 1972).
#[test]
fn lie_ranks() {
    for n in [2usize, 3, 4] {
        let s = structure(&load(&format!("sl:{n}"), FieldSpec::Rational));
        let l = lie(&s);
        assert_eq!(l.cartan_dim, Some(n - 1), "rank of sl_{n}");
        assert_eq!(l.levi_dim, n * n - 1);
        let s = structure(&load(&format!("gl:{n}"), FieldSpec::Rational));
        let l = lie(&s);
        assert_eq!(
            (l.radical.len(), l.nilradical.len(), l.levi_dim),
            (1, 1, n * n - 1)
        );
        assert_eq!(l.cartan_dim, Some(n));
    }
    // so(4) = sl_2 + sl_2 over the reals and so(4) is of rank 2 (Humphreys 1972; from memory)
    let l = structure(&load("so:4", FieldSpec::Rational));
    assert_eq!(lie(&l).cartan_dim, Some(2));
    assert_eq!(lie(&l).levi_dim, 6);
}

/// The centroid is a field exactly for a central simple algebra over a field extension:
/// Q[x]/(x^3 - 2) (a field of degree 3: its own centroid), Cl(3,0) = M_2(Q(i)) (centroid
/// Q(i), degree 2), M_3(Q) (centroid Q); not for Q[C_5] = Q + Q(zeta_5) (common practice).
#[test]
fn centroid_decided_a_field() {
    use bilin::invariants::all::{Params, compute_invariants};
    use bilin::structure::FieldDecision;
    let decide = |spec: &str| {
        let r = compute_invariants(
            &load(spec, FieldSpec::Rational),
            &Params::default(),
            &mut |_| {},
        )
        .unwrap();
        r.centroid_field.unwrap()
    };
    for (spec, degree) in [("quotient:-2,0,0,1", 3usize), ("Cl3-0", 2), ("matrix:3", 1)] {
        match decide(spec) {
            FieldDecision::Field { degree: d, poly } => {
                assert_eq!(d, degree, "{spec}");
                assert_eq!(poly.len(), degree + 1, "{spec}");
            }
            other => panic!("{spec}: {other:?}"),
        }
    }
    assert!(matches!(decide("cyclic:5"), FieldDecision::NotField(_)));
}

fn planted(pick: usize) -> (Tensor, Vec<[usize; 3]>) {
    let specs = [
        ("matmul:2,2,2", FieldSpec::Rational),
        ("poly:2,3", FieldSpec::Rational),
        ("quaternions", FieldSpec::Rational),
        ("matrix:2", FieldSpec::Rational),
        ("quotient:-2,0,0,1", FieldSpec::Rational),
        ("T2", FieldSpec::Rational),
        ("sl:2", FieldSpec::Rational),
    ];
    let a = load(specs[pick % specs.len()].0, FieldSpec::Rational);
    let b = load(
        specs[(pick / specs.len()) % specs.len()].0,
        FieldSpec::Rational,
    );
    let t = direct_sum_tensor(&a, &b).unwrap();
    let mut want = vec![a.dims(), b.dims()];
    want.sort();
    (t, want)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 12, ..ProptestConfig::default() })]

    /// A planted direct sum of two indecomposable tensors, scrambled by a random change of
    /// basis with entries up to 10^6 on each axis, splits back into the planted sizes.
    #[test]
    fn planted_direct_sums_are_recovered(pick in 0usize..49, seed in 0u64..1 << 32) {
        let (t, want) = planted(pick);
        let d = t.dims();
        let u = if t.kind() == Kind::Algebra {
            change_basis_algebra(&t, &random_invertible(d[0], 1_000_000, seed)).unwrap()
        } else {
            let m = |a: usize| random_invertible(d[a], 1_000_000, seed + a as u64);
            change_basis(&t, &m(0), &m(1), &m(2)).unwrap()
        };
        let s = structure(&u);
        let dec = s.blocks.as_ref().unwrap();
        prop_assert_eq!(block_shapes(dec), want);
        prop_assert_eq!(dec.outside, 0);
        prop_assert!(dec.blocks.iter().all(|b| b.certificate.is_some()));
    }

    /// Blocks, radical, components and Lie structure do not depend on the basis.
    #[test]
    fn structure_unchanged_by_a_change_of_basis(pick in 0usize..8, seed in 0u64..1 << 32) {
        let specs = [
            "symmetric:3", "Q8", "cyclic:6", "T3", "Cl0-3", "gl:2", "dihedral:4", "octonions",
        ];
        let t = load(specs[pick], FieldSpec::Rational);
        let u = change_basis_algebra(&t, &random_invertible(t.dim(), 1_000_000, seed)).unwrap();
        prop_assert_eq!(fingerprint(&t), fingerprint(&u), "{}", specs[pick]);
    }
}

/// Over GF(p) the same answers in a random basis (entries reduced mod p; a seed whose
/// matrix is singular mod p is skipped).
#[test]
fn structure_over_gf_p_unchanged_by_a_change_of_basis() {
    for (spec, p) in [
        ("symmetric:3", 3u64),
        ("cyclic:4", 2),
        ("dihedral:3", 2),
        ("cyclic:6", 3),
    ] {
        let t = load(spec, FieldSpec::Prime(p));
        let want = fingerprint(&t);
        let mut tried = 0;
        for seed in 0..20u64 {
            let Some(u) = change_basis_algebra(&t, &random_invertible(t.dim(), 1_000_000, seed))
            else {
                continue;
            };
            assert_eq!(fingerprint(&u), want, "{spec} over GF({p}), seed {seed}");
            tried += 1;
            if tried == 3 {
                break;
            }
        }
        assert_eq!(tried, 3, "{spec}");
    }
}
