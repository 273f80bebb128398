//! Lower bounds for the tensor rank: published values reached by the exhaustive proofs over
//! GF(2), certificates re-checked and tampered certificates refused, Koszul-Young and
//! Strassen bounds unchanged by a random change of basis with big entries, stored catalog
//! bounds re-derived, and the `bounds` command end to end.

mod common;

use bilin::catalog::{FactCheck, find_entry, rank_facts};
use bilin::input::load_input;
use bilin::ranks::exhaustive::ExhaustiveParams;
use bilin::ranks::rank_proof::{Certificate, check};
use bilin::ranks::{Bounds, BoundsParams, Measure, Method, Status, lower_bounds};
use bilin::scalar::FieldSpec;
use bilin::tensor::{Tensor, change_basis, random_invertible};
use common::{run, tmpdir};
use proptest::prelude::*;

fn load(spec: &str, field: Option<FieldSpec>) -> Tensor {
    load_input(spec, field).unwrap()
}

/// A generator spec or a catalog entry, over GF(2).
fn gf2(spec: &str) -> Tensor {
    match find_entry(spec) {
        Some(e) => e.tensor().unwrap().with_field(FieldSpec::Prime(2)).unwrap(),
        None => load(spec, Some(FieldSpec::Prime(2))),
    }
}

/// Lower bounds with the exhaustive proofs going up to `goal`.
fn bounds_up_to(t: &Tensor, goal: usize) -> Bounds {
    bounds_with(t, goal, 14)
}

/// The same, listing the symmetry groups whose algebra has at most `symmetry` dimensions.
fn bounds_with(t: &Tensor, goal: usize, symmetry: usize) -> Bounds {
    lower_bounds(
        t,
        &BoundsParams {
            exhaustive: Some(ExhaustiveParams {
                goal: Some(goal),
                max_symmetry_dim: symmetry,
                max_work: 400_000_000,
                max_nodes: 400_000,
            }),
            ..BoundsParams::default()
        },
    )
}

fn exhaustive(b: &Bounds) -> Option<usize> {
    b.bounds
        .iter()
        .find(|x| x.method == Method::Exhaustive && x.status == Status::Proven)
        .map(|x| x.value)
}

#[test]
fn published_ranks_over_gf2_are_proven_with_checked_certificates() {
    // (input, rank over GF(2), whether the exhaustive proof is needed to reach it, source)
    let table: [(&str, usize, bool, &str); 6] = [
        // Hopcroft and Kerr 1971, On minimizing the number of multiplications necessary for
        // matrix multiplication, SIAM J. Appl. Math. 20: seven products for 2 x 2 over GF(2)
        ("matmul:2,2,2", 7, true, "Hopcroft and Kerr 1971"),
        // Chudnovsky and Chudnovsky 1988, Algebraic complexities and algebraic curves over
        // finite fields, J. Complexity 4; Montgomery 2005, Five, six, and seven-term
        // Karatsuba-like formulae, IEEE Trans. Computers 54 (from memory): GF(2^k) over
        // GF(2) has bilinear complexity 3, 6, 9 for k = 2, 3, 4
        ("GF4", 3, false, "Chudnovsky and Chudnovsky 1988"),
        ("GF8", 6, true, "Chudnovsky and Chudnovsky 1988"),
        ("GF16", 9, true, "Montgomery 2005"),
        // Montgomery 2005 (from memory): products of polynomials with 3 and 4 coefficients
        // over GF(2) need 6 and 9 multiplications
        ("poly:3,3", 6, true, "Montgomery 2005"),
        ("poly:4,4", 9, true, "Montgomery 2005"),
    ];
    for (spec, rank, needed, source) in table {
        let t = gf2(spec);
        let b = bounds_up_to(&t, rank);
        assert_eq!(b.best(), rank, "{spec} ({source}): {:?}", b.notes);
        if needed {
            assert_eq!(exhaustive(&b), Some(rank), "{spec} ({source})");
            let cert = b.rank_proof.as_ref().unwrap();
            assert_eq!(cert.rank_above + 1, rank);
            // the JSON form round-trips and the checker accepts it
            let back = Certificate::from_json(&cert.to_json(&t)).unwrap();
            assert_eq!(&back, cert);
            check(&t, &back).unwrap();
            let e = b
                .bounds
                .iter()
                .find(|x| x.method == Method::Exhaustive)
                .unwrap();
            assert_eq!((e.measure, e.field), (Measure::Rank, FieldSpec::Prime(2)));
            assert!(!e.extensions);
        }
    }
}

#[test]
fn the_search_stops_at_a_checked_decomposition() {
    // Strassen 1969 (Gaussian elimination is not optimal, Numer. Math. 13): seven products
    // for 2 x 2 matrices, valid over every commutative ring, so R = 7 over GF(2) exactly
    let b = bounds_up_to(&gf2("matmul:2,2,2"), 100);
    assert_eq!(
        (b.best(), b.exhaustive_upper),
        (7, Some(7)),
        "{:?}",
        b.notes
    );
}

/// The certificate of R(<2,2,2>) > 6 over GF(2) (with or without symmetry), and its tensor.
fn strassen_certificate(symmetry: bool) -> (Tensor, Certificate) {
    let t = gf2("matmul:2,2,2");
    let b = bounds_with(&t, 7, if symmetry { 14 } else { 0 });
    (t, b.rank_proof.unwrap())
}

#[test]
fn tampered_certificates_are_refused() {
    let (t, sym) = strassen_certificate(true);
    let cert = sym.clone();
    check(&t, &cert).unwrap();
    assert!(cert.levels.len() == 2 && cert.levels[1].nodes.len() > 1);
    assert!(!cert.left.is_empty(), "the first level is cut by symmetry");
    // one branch removed
    for i in 0..cert.levels[1].nodes.len() {
        let mut c = cert.clone();
        c.levels[1].nodes.remove(i);
        assert!(check(&t, &c).is_err(), "branch {i} removed");
    }
    // one coefficient changed: without symmetry every space of level 1 is needed (with
    // it, a change inside an orbit is another valid proof)
    let (t, cert) = strassen_certificate(false);
    check(&t, &cert).unwrap();
    assert!(cert.left.is_empty());
    for bit in 0..4 {
        let mut c = cert.clone();
        c.levels[1].nodes[0].factors[0].0 ^= 1 << bit;
        assert!(check(&t, &c).is_err(), "bit {bit} of u changed");
        let mut c = cert.clone();
        c.levels[1].nodes[0].factors[0].1 ^= 1 << bit;
        assert!(check(&t, &c).is_err(), "bit {bit} of v changed");
    }
    // a stronger claim, another tensor, a symmetry that does not preserve the slices,
    // and dropped symmetries
    let mut c = cert.clone();
    c.rank_above += 1;
    assert!(check(&t, &c).is_err());
    assert!(check(&gf2("matmul:2,2,2").permute_axes([0, 2, 1]), &cert).is_err());
    let cert = sym;
    let mut c = cert.clone();
    c.left[0] = 0b0000_0000_0000_0011 | 1 << 5 | 1 << 10 | 1 << 15;
    assert!(check(&t, &c).is_err());
    let mut c = cert.clone();
    c.left.clear();
    c.right.clear();
    assert!(
        check(&t, &c).is_err(),
        "without the symmetries level 1 is incomplete"
    );
}

#[test]
fn stored_lower_bounds_over_gf2_are_re_derived() {
    for (name, value) in [("GF8", "6"), ("matmul222", "7"), ("polymul4", "9")] {
        let e = find_entry(name).unwrap();
        let t = e.tensor().unwrap();
        let got = rank_facts::check_rank_fact(
            "rank.lower",
            value,
            Some("GF(2)"),
            &t,
            &rank_facts::RankCheckParams::default(),
        );
        assert!(matches!(got, FactCheck::Agrees), "{name}: {got:?}");
    }
}

/// The Koszul-Young and Strassen commutator values of a tensor.
fn border_values(t: &Tensor) -> (Option<usize>, Option<usize>) {
    let b = lower_bounds(
        t,
        &BoundsParams {
            exhaustive: None,
            ..BoundsParams::default()
        },
    );
    let get = |m: Method| {
        b.bounds.iter().find(|x| x.method == m).map(|x| {
            assert_eq!(x.status, Status::Proven, "{}", x.detail);
            x.value
        })
    };
    (get(Method::KoszulYoung), get(Method::StrassenCommutator))
}

#[test]
fn border_rank_bounds_of_matrix_multiplication() {
    // Landsberg and Ottaviani 2015, New lower bounds for the border rank of matrix
    // multiplication, Theory of Computing 11: 2n^2 - n for <n,n,n> (6 and 15); Strassen
    // 1983, Rank and optimal computation of generic tensors, Linear Algebra Appl. 52/53:
    // 3n^2/2 from the commutator (6 for n = 2, ceil(13.5) = 14 for n = 3)
    assert_eq!(
        border_values(&load("matmul:2,2,2", None)),
        (Some(6), Some(6))
    );
    assert_eq!(
        border_values(&load("matmul:3,3,3", None)),
        (Some(15), Some(14))
    );
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 4, .. ProptestConfig::default() })]

    /// Common practice: the border rank is defined without reference to a basis, and so
    /// are the flattenings these bounds compute; a random change of the three bases with
    /// entries up to 10^6 leaves the values unchanged.
    #[test]
    fn border_rank_bounds_survive_a_change_of_basis(seed in 0u64..1000, which in 0usize..3) {
        let spec = ["matmul:2,2,2", "quaternions", "poly:3,3"][which];
        let t = load(spec, None);
        let d = t.dims();
        let [p, r, s] = [0, 1, 2].map(|i| random_invertible(d[i], 1_000_000, seed * 3 + i as u64));
        let u = change_basis(&t, &p, &r, &s).unwrap();
        prop_assert_eq!(border_values(&t), border_values(&u));
    }
}

#[test]
fn bounds_writes_and_checks_certificates() {
    let dir = tmpdir("rank-proofs");
    let file = dir.join("m222.json");
    let f = file.to_str().unwrap();
    let (c, out, err) = run(&[
        "bounds",
        "matmul:2,2,2",
        "--field",
        "GF(2)",
        "--proof-out",
        f,
    ]);
    assert_eq!(c, 0, "{err}");
    assert!(out.contains("R >= 7    exhaustive search"), "{out}");
    let (c, out, _) = run(&[
        "bounds",
        "matmul:2,2,2",
        "--field",
        "GF(2)",
        "--check-proof",
        f,
    ]);
    assert_eq!(c, 0);
    assert!(out.contains("certificate holds: R > 6"), "{out}");
    // a weaker proof never replaces a stronger one: GF(8) proves R > 5, and with no room
    // for a second level only R > 4
    let g8 = dir.join("gf8.json");
    let g = g8.to_str().unwrap();
    assert_eq!(run(&["bounds", "GF8", "--proof-out", g]).0, 0);
    let (c, _, err) = run(&[
        "bounds",
        "GF8",
        "--exhaustive-spaces",
        "0",
        "--proof-out",
        g,
    ]);
    assert_eq!(c, 0);
    assert!(err.contains("already proves R > 5; kept it"), "{err}");
    let (_, out, _) = run(&["bounds", "GF8", "--check-proof", g]);
    assert!(out.contains("R > 5"), "{out}");
    // a certificate for another tensor is refuted (exit 1)
    let (c, out, _) = run(&["bounds", "poly:2,3", "--field", "GF(2)", "--check-proof", f]);
    assert_eq!(c, 1, "{out}");
    // a removed branch is refuted
    let mut v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&file).unwrap()).unwrap();
    v["levels"][1].as_array_mut().unwrap().pop();
    std::fs::write(&file, v.to_string()).unwrap();
    let (c, out, _) = run(&[
        "bounds",
        "matmul:2,2,2",
        "--field",
        "GF(2)",
        "--check-proof",
        f,
    ]);
    assert_eq!(c, 1, "{out}");
    assert!(out.contains("certificate refuted"), "{out}");
    // a broken file is bad input (exit 2) with its position
    std::fs::write(&file, "{\"format\": \n  oops").unwrap();
    let (c, _, err) = run(&[
        "bounds",
        "matmul:2,2,2",
        "--field",
        "GF(2)",
        "--check-proof",
        f,
    ]);
    assert_eq!(c, 2);
    assert!(err.contains("m222.json:2:"), "{err}");
    // JSON lists the new bounds with their theorems
    let (c, out, _) = run(&["bounds", "matmul:3,3,3", "--json"]);
    assert_eq!(c, 0);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let ky = v["bounds"]
        .as_array()
        .unwrap()
        .iter()
        .find(|b| b["method"] == "koszul-young")
        .unwrap();
    assert_eq!(
        (ky["value"].as_u64(), ky["measure"].as_str()),
        (Some(15), Some("border-rank"))
    );
    assert!(
        ky["theorem"]
            .as_str()
            .unwrap()
            .contains("Landsberg and Ottaviani 2015")
    );
}

#[test]
fn stored_certificates_still_hold() {
    // certificates written by `bounds --proof-out`, kept as data: the format stays readable
    // and the checker accepts them (R(<2,2,2>) > 6, R(GF(8)) > 5, R(poly 4x4) > 8 over GF(2))
    for (input, file, above) in [
        ("matmul:2,2,2", "matmul222-gf2.json", 6),
        ("GF8", "gf8.json", 5),
        ("poly:4,4", "poly44-gf2.json", 8),
    ] {
        let path = format!(
            "{}/tests/data/rank-proofs/{file}",
            env!("CARGO_MANIFEST_DIR")
        );
        let (c, out, err) = run(&["bounds", input, "--field", "GF(2)", "--check-proof", &path]);
        assert_eq!(c, 0, "{file}: {out}{err}");
        assert!(out.contains(&format!("R > {above} over GF(2)")), "{out}");
    }
}

/// A random integer matrix of determinant 1 (unit lower times unit upper triangular, 0/1
/// entries), so invertible over GF(2) as well.
fn unimodular(n: usize, seed: u64) -> bilin::linalg::Matrix<bilin::scalar::Q> {
    use rand::{Rng, SeedableRng};
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let mut bits = |i: usize, j: usize| i64::from(i == j || rng.gen_bool(0.5));
    let l: Vec<i64> = (0..n * n)
        .map(|x| {
            if x % n <= x / n {
                bits(x / n, x % n)
            } else {
                0
            }
        })
        .collect();
    let u: Vec<i64> = (0..n * n)
        .map(|x| {
            if x % n >= x / n {
                bits(x / n, x % n)
            } else {
                0
            }
        })
        .collect();
    bilin::linalg::Matrix {
        rows: n,
        cols: n,
        data: (0..n * n)
            .map(|x| {
                let (i, j) = (x / n, x % n);
                bilin::scalar::Q::from_integer(
                    (0..n)
                        .map(|k| l[i * n + k] * u[k * n + j])
                        .sum::<i64>()
                        .into(),
                )
            })
            .collect(),
    }
}

#[test]
fn exhaustive_bounds_survive_a_change_of_basis_over_gf2() {
    // common practice: the rank does not depend on the bases; three random changes of
    // basis over GF(2) (integer matrices of determinant 1, reduced mod 2)
    let q = gf2("matmul:2,2,2").with_field(FieldSpec::Rational).unwrap();
    for seed in 0..3u64 {
        let [p, r, s] = [0, 1, 2].map(|i| unimodular(4, seed * 3 + i));
        let u = change_basis(&q, &p, &r, &s)
            .unwrap()
            .with_field(FieldSpec::Prime(2))
            .unwrap();
        let b = bounds_up_to(&u, 7);
        assert_eq!(exhaustive(&b), Some(7), "seed {seed}: {:?}", b.notes);
        check(&u, b.rank_proof.as_ref().unwrap()).unwrap();
    }
}
