//! The rank interval `lower <= R <= upper` and the search plan built on it: every upper
//! bound carries a scheme verified exactly, planted ranks are recovered exactly, a search
//! at or above the known upper bound returns its scheme at once and one below a proven
//! lower bound is refused.

mod common;

use bilin::catalog::store::all_entries;
use bilin::decompose::pencil::{PencilParams, pencil_scheme};
use bilin::decompose::planted::planted;
use bilin::decompose::{slice_decomposition, slice_scheme};
use bilin::interval::plan::{Plan, known_interval, plan_search};
use bilin::interval::{Lower, UpperParams, rank_interval};
use bilin::ranks::{BoundsParams, lower_bounds};
use bilin::scalar::{FieldSpec, Q};
use bilin::scheme::verify;
use bilin::search::{Method, Params};
use bilin::tensor::{Kind, Tensor, change_basis, random_invertible};
use common::random_basis_file;
use common::run as bilin;
use proptest::prelude::*;

fn interval(t: &Tensor) -> bilin::interval::RankInterval {
    known_interval(t, &[], 1)
}

/// The plan of an automatic search for a scheme of rank at most `r`.
fn plan_at(t: &Tensor, r: usize, iv: &bilin::interval::RankInterval) -> Plan {
    let params = Params {
        target_rank: Some(r),
        method: Method::Auto,
        ..Params::default()
    };
    plan_search(t, &params, iv).expect("a plan")
}

fn tensor(dims: [usize; 3], vals: &[i64]) -> Tensor {
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, dims, None);
    let mut it = vals.iter();
    for i in 0..dims[0] {
        for j in 0..dims[1] {
            for k in 0..dims[2] {
                let v = *it.next().expect("enough values");
                if v != 0 {
                    t.set(i, j, k, Q::from_integer(v.into()));
                }
            }
        }
    }
    t
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, rng_algorithm: proptest::test_runner::RngAlgorithm::ChaCha, ..ProptestConfig::default() })]
    /// A search at any rank at or above the slice bound returns a verified scheme at once,
    /// for odd, even and mixed entries (the all-even case reduces to zero mod 2).
    #[test]
    fn search_at_or_above_the_slice_bound_returns_a_verified_scheme(
        d0 in 1usize..4, d1 in 1usize..4, d2 in 1usize..4, parity in 0u8..3,
        vals in proptest::collection::vec(-9i64..10, 27), extra in 0usize..3,
    ) {
        let vals: Vec<i64> = vals.iter().map(|&v| match parity {
            0 => 2 * v + 1,
            1 => 2 * v,
            _ => v,
        }).collect();
        let t = tensor([d0, d1, d2], &vals);
        let iv = interval(&t);
        prop_assert!(iv.lower.value <= iv.upper.value);
        prop_assert!(verify(iv.scheme(), &t).is_ok());
        let slice_bound = iv.uppers.iter().map(|u| u.value).max().unwrap();
        match plan_at(&t, slice_bound + extra, &iv) {
            Plan::Known { scheme, .. } => prop_assert!(verify(&scheme, &t).is_ok()),
            other => prop_assert!(false, "not answered at once: {:?}", other),
        }
        if iv.lower.value > 0 {
            let refused = matches!(
                plan_at(&t, iv.lower.value - 1, &iv),
                Plan::Refuse { .. }
            );
            prop_assert!(refused);
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, rng_algorithm: proptest::test_runner::RngAlgorithm::ChaCha, ..ProptestConfig::default() })]
    /// The pencil scheme (slices grouped, most often in pairs as matrix pencils, each group
    /// split by evaluation at rational points) verifies exactly and never has more terms than the slice bound along
    /// its axis, on odd, even and mixed integer entries, in the given basis and after a
    /// random change of basis with entries up to 1000 on every axis.
    #[test]
    fn pencil_scheme_verifies_and_never_exceeds_the_slice_bound(
        d0 in 1usize..6, d1 in 1usize..6, d2 in 1usize..6, parity in 0u8..3,
        vals in proptest::collection::vec(-9i64..10, 125), scramble in proptest::bool::ANY,
        seed in 0u64..1000,
    ) {
        let vals: Vec<i64> = vals.iter().map(|&v| match parity {
            0 => 2 * v + 1,
            1 => 2 * v,
            _ => v,
        }).collect();
        let mut t = tensor([d0, d1, d2], &vals);
        if scramble {
            let p = random_invertible(d0, 1000, seed);
            let q = random_invertible(d1, 1000, seed + 1);
            let r = random_invertible(d2, 1000, seed + 2);
            t = change_basis(&t, &p, &q, &r).unwrap();
        }
        for axis in 0..3 {
            let (s, _) = pencil_scheme(&t, axis, &PencilParams { seed, ..PencilParams::default() });
            prop_assert!(verify(&s, &t).is_ok(), "axis {}", axis);
            prop_assert!(s.rank() <= slice_scheme(&t, axis).rank(), "axis {}", axis);
        }
        let iv = interval(&t);
        prop_assert!(iv.upper.value <= slice_decomposition(&t).0.rank());
    }
}

/// A 10 x 12 x 7 array of random counts (fixed seed): the slice bound is 70 (every 10 x 12
/// slice has rank 10); the pencil bound splits two pairs of 10 x 12 slices with 12 terms
/// each (a general 10 x 12 pencil has only rectangular Kronecker blocks: rank 12, Ja'Ja'
/// 1979, "Optimal evaluation of pairs of bilinear forms", SIAM J. Comput. 8, from memory)
/// and a triple with 2 * 10 + 1 = 21 (the construction of the module), so the interval's
/// upper side is 45 and its scheme verifies exactly.
#[test]
fn random_counts_get_an_upper_bound_below_the_slice_bound() {
    use rand::{Rng, SeedableRng};
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(5);
    let vals: Vec<i64> = (0..10 * 12 * 7)
        .map(|_| [0, 0, 0, 1, 1, 2, 3, 5, 8, 13][rng.gen_range(0..10)])
        .collect();
    let t = tensor([10, 12, 7], &vals);
    assert_eq!(slice_decomposition(&t).0.rank(), 70);
    let iv = interval(&t);
    assert_eq!(iv.upper.name, "pencils");
    assert_eq!(iv.upper.value, 45, "{:?}", iv.lines());
    assert!(verify(iv.scheme(), &t).is_ok());
    // the command line on the stored counts file: the pencil bound with its source
    let (code, out, err) = bilin(&["bounds", "tests/data/counts_10x12x7.json"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("<= R <= 45 over Q"), "{out}");
    assert!(
        out.contains("upper 45: pencils") && out.contains("Ja'Ja' 1979"),
        "{out}"
    );
    assert!(out.contains("upper 70: slices"), "{out}");
}

/// Planted ranks 3 in 6x5x4 and 5 in 8x8x8 (integer factors, every axis scrambled by an
/// integer change of basis with entries up to 100): the interval closes on the planted
/// rank, by simultaneous diagonalisation (Leurgans, Ross and Abel 1993, "A decomposition
/// for three-way arrays", SIAM J. Matrix Anal. Appl. 14), and the factors verify exactly.
#[test]
fn planted_ranks_are_recovered_exactly() {
    for (dims, r, seed) in [([6, 5, 4], 3, 11), ([8, 8, 8], 5, 12), ([5, 5, 5], 5, 13)] {
        let (t, _) = planted(dims, r, 100, seed);
        let iv = interval(&t);
        assert_eq!(iv.exact, Some(r), "{dims:?}: {:?}", iv.lines());
        assert!(verify(iv.scheme(), &t).is_ok());
        assert!(iv.uniqueness.as_ref().is_some_and(|u| u.unique));
        // the same tensor in another basis: still exact
        let p = random_invertible(dims[0], 30, seed);
        let q = random_invertible(dims[1], 30, seed + 1);
        let s = random_invertible(dims[2], 30, seed + 2);
        let u = change_basis(&t, &p, &q, &s).unwrap();
        assert_eq!(interval(&u).exact, Some(r));
    }
}

/// `bounds` has an upper bound for every catalog entry, never below the lower bound, and
/// it is the rank of a scheme that verifies exactly.
#[test]
fn every_catalog_entry_has_an_interval() {
    // the cheaper lower bounds (flattening, slice span, Alder-Strassen for small
    // algebras): the upper side is what is tested here
    let cheap = BoundsParams {
        max_algebra_dim: 16,
        max_isotope_dim: 8,
        max_koszul_young_size: 0,
        exhaustive: None,
        ..BoundsParams::default()
    };
    for e in all_entries().unwrap() {
        let t = e.tensor().unwrap();
        let lower = Lower::best_of(&lower_bounds(&t, &cheap));
        let iv = rank_interval(&t, lower, &UpperParams::default(), &[]);
        assert!(iv.lower.value <= iv.upper.value, "{}", e.file);
        assert!(verify(iv.scheme(), &t).is_ok(), "{}", e.file);
    }
}

/// Known ranks close the interval: 2 x 2 matrices have rank 7 (Strassen 1969; Winograd
/// 1971, "On multiplication of 2 x 2 matrices", Linear Algebra Appl. 4), the Alder-Strassen
/// bound 2 * 4 - 1 of the algebra M_2 meeting the stored scheme; polynomials of degree 1 and 2 have rank 2n - 1 (Toom 1963; Winograd 1980,
/// "Arithmetic complexity of computations"), which the catalog's schemes and the
/// flattening bound meet.
#[test]
fn published_ranks_close_or_bracket_the_interval() {
    for (name, lo, hi) in [("polymul2", 3, 3), ("polymul3", 5, 5), ("matmul222", 7, 7)] {
        let t = bilin::catalog::store::catalog_tensor(name).unwrap();
        let iv = interval(&t);
        assert_eq!((iv.lower.value, iv.upper.value), (lo, hi), "{name}");
    }
    // a lower bound above a verified scheme is a defect: ignored with a note
    let t = bilin::catalog::store::catalog_tensor("polymul2").unwrap();
    let wrong = Lower {
        value: 9,
        name: "wrong".into(),
        theorem: "-".into(),
    };
    let iv = rank_interval(&t, wrong, &UpperParams::default(), &[]);
    assert!(iv.lower.value <= iv.upper.value && !iv.notes.is_empty());
}

/// Multiplication modulo a polynomial with t distinct irreducible factors has rank 2n - t
/// over Q (Winograd 1977, "Some bilinear forms whose multiplicative complexity depends on
/// the field of constants", Math. Systems Theory 10; lower bound: Alder and Strassen 1981,
/// Theoret. Comput. Sci. 15; from memory). The interval closes on it for the cyclic group
/// algebras (x^n - 1: one cyclotomic factor per divisor of n, common practice), the
/// quadratic and cyclotomic fields and the complex numbers, in the catalog's basis and in
/// a basis of the user's own with entries up to 10^6 (the change of basis is the same on
/// the three axes: an algebra written in other coordinates).
#[test]
fn commutative_algebras_close_at_two_n_minus_t_in_any_basis() {
    let cases = [
        ("C4", 5),
        ("C5", 8),
        ("C6", 8),
        ("C8", 12),
        ("C9", 15),
        ("C3xC3", 13),
        ("Q-sqrt2", 3),
        ("Q-zeta5", 7),
        ("complex", 3),
    ];
    for (k, (name, rank)) in cases.into_iter().enumerate() {
        let t = bilin::catalog::store::catalog_tensor(name).unwrap();
        let p = random_invertible(t.dims()[0], 1_000_000, 17 + k as u64);
        let dense = bilin::tensor::change_basis_algebra(&t, &p).unwrap();
        for (which, t) in [("catalog basis", &t), ("dense basis", &dense)] {
            let iv = interval(t);
            assert_eq!(iv.exact, Some(rank), "{name} in the {which}");
            assert!(verify(iv.scheme(), t).is_ok(), "{name} in the {which}");
        }
    }
}

/// Toom 1963; Cook 1966 (from memory): the product of polynomials of degrees below m and
/// n has rank m + n - 1 over Q (the flattening onto the result proves the lower bound);
/// the interval closes there for the products, their transposes (correlations: the
/// result axis first) and for divided powers (`x^(i) x^(j) = binom(i+j, i) x^(i+j)`).
#[test]
fn polynomial_products_close_at_m_plus_n_minus_one() {
    for (m, n) in [(2, 2), (3, 5), (8, 8), (4, 11), (12, 12)] {
        let t = bilin::generators::poly_mult(m, n).unwrap();
        for (which, t) in [
            ("product", t.clone()),
            ("correlation", t.permute_axes([2, 0, 1])),
        ] {
            let iv = interval(&t);
            assert_eq!(iv.exact, Some(m + n - 1), "poly:{m},{n} ({which})");
            assert!(verify(iv.scheme(), &t).is_ok(), "poly:{m},{n} ({which})");
        }
    }
    let (m, n) = (5, 6);
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [m, n, m + n - 1], None);
    let binom = |a: i64, b: i64| (0..b).fold(1i64, |acc, s| acc * (a - s) / (s + 1));
    for i in 0..m {
        for j in 0..n {
            let c = binom((i + j) as i64, i as i64);
            t.set(i, j, i + j, Q::from_integer(c.into()));
        }
    }
    assert_eq!(interval(&t).exact, Some(m + n - 1), "divided powers");
}

/// Semisimple algebras split into matrix algebras over Q and fields have an upper bound
/// from a scheme per part through explicit matrix units; where every matrix part is at most
/// 2 x 2 it meets the Alder-Strassen bound `2 dim A - t` (Alder and Strassen 1981, On the
/// algorithmic complexity of associative algebras, Theoret. Comput. Sci. 15; the rank 7 of
/// M_2: Strassen 1969, Winograd 1971), so the rank is exact: Q[S_3] = Q x Q x M_2(Q) has
/// rank 9, Q[D_4] = Q^4 x M_2(Q) rank 11, the split quaternions M_2(Q) rank 7 (Wedderburn
/// parts of group algebras: Serre 1977, Linear Representations of Finite Groups, sect. 5;
/// from memory). In the generators' basis and in a seeded random basis (entries -2..2),
/// and for a map in three bases of its own (read through a unital isotope).
#[test]
fn split_semisimple_algebras_close_at_the_alder_strassen_bound() {
    for (spec, rank) in [
        ("dihedral:3", 9),
        ("symmetric:3", 9),
        ("dihedral:4", 11),
        ("clifford:1,1", 7),
        ("split-quaternions", 7),
    ] {
        let t = bilin::generators::generate(spec).unwrap();
        let n = t.dim();
        let p = random_invertible(n, 2, 11);
        let (q, r) = (random_invertible(n, 2, 12), random_invertible(n, 2, 13));
        for (which, t) in [
            ("generator basis", t.clone()),
            ("random basis", change_basis(&t, &p, &p, &p).unwrap()),
            ("three random bases", change_basis(&t, &p, &q, &r).unwrap()),
        ] {
            let iv = interval(&t);
            assert_eq!(iv.exact, Some(rank), "{spec} ({which})");
            assert!(verify(iv.scheme(), &t).is_ok(), "{spec} ({which})");
        }
    }
    // Q[S_4] = Q x Q x M_2(Q) x M_3(Q) x M_3(Q): 1 + 1 + 7 + 23 + 23 with Laderman's 23
    // (Laderman 1976), against Alder-Strassen 2 * 24 - 5 = 43
    let t = bilin::generators::generate("symmetric:4").unwrap();
    let iv = interval(&t);
    assert_eq!((iv.lower.value, iv.upper.value), (43, 55));
    assert!(
        iv.uppers
            .iter()
            .any(|u| u.name == "semisimple" && u.value == 55)
    );
}

/// The command line on a matrix algebra in a basis of the user's own: `bounds` gives the
/// upper bound of the catalog's <3,3,3> scheme carried through explicit matrix units, and
/// `search` at that rank answers at once with a scheme that `verify` accepts.
#[test]
fn command_line_matrix_algebra_in_a_random_basis() {
    let dir = std::env::temp_dir().join(format!("bilin-units-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let m3 = random_basis_file(&dir, "matrix:3", "4", "m3.json");
    let m3s = m3.as_str();
    let (code, out, err) = bilin(&["bounds", m3s]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("upper 23: semisimple"), "{out}");
    assert!(out.contains("M_3(Q)"), "{out}");
    let f = dir.join("m3-23.json");
    let fs = f.to_str().unwrap();
    let (code, _, err) = bilin(&["search", m3s, "--rank", "23", "--out", fs]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("known before any search"), "{err}");
    let (code, out, err) = bilin(&["verify", m3s, fs]);
    assert_eq!(code, 0, "{out}{err}");
    std::fs::remove_dir_all(&dir).ok();
}

/// Matrix products written in three bases of their own (seeded random changes of basis
/// with entries up to 1000 in absolute value) get the rank of the catalog's best scheme of
/// their format as an upper bound, with a verified scheme: <2,2,3> 11, <2,3,4> 20
/// (Hopcroft and Kerr 1971, On minimizing the number of multiplications necessary for
/// matrix multiplication, SIAM J. Appl. Math. 20; from memory), <3,3,4> 29 (Smirnov
/// 2013, The bilinear complexity and practical algorithms for matrix multiplication,
/// Comput. Math. Math. Phys. 53; from memory) and <3,3,5> 36 (Smirnov 2013, same
/// paper; from memory), in two orientations each; the format is found whatever the order
/// of the axes.
#[test]
fn matrix_products_in_bases_of_their_own_take_the_stored_schemes() {
    for (format, rank) in [
        ([2, 2, 3], 11),
        ([3, 2, 2], 11),
        ([2, 3, 4], 20),
        ([4, 3, 2], 20),
        ([3, 3, 4], 29),
        // sides 5 and 3: the module of two kernels' sum meeting a third
        ([3, 3, 5], 36),
        ([5, 3, 3], 36),
    ] {
        let [n, m, p] = format;
        let t = bilin::generators::generate(&format!("matmul:{n},{m},{p}")).unwrap();
        let d = t.dims();
        let [a, b, c] = [0, 1, 2].map(|i| random_invertible(d[i], 1000, 40 + i as u64));
        let moved = change_basis(&t, &a, &b, &c).unwrap();
        let stored = bilin::catalog::schemes::best_matmul_scheme(format, FieldSpec::Rational)
            .unwrap()
            .scheme
            .rank();
        assert_eq!(stored, rank, "{format:?}");
        let iv = interval(&moved);
        let found = iv
            .uppers
            .iter()
            .find(|u| u.name == "matrix product")
            .unwrap_or_else(|| panic!("{format:?}: no matrix product bound"));
        assert_eq!(found.value, rank, "{format:?}");
        assert!(verify(&found.scheme, &moved).is_ok(), "{format:?}");
        assert_eq!(iv.upper.value, rank, "{format:?}");
    }
}

/// The command line on a matrix product in three bases of the user's own: `bounds` gives
/// the stored rank of its format, `search` at that rank answers at once, `verify` accepts
/// the file.
#[test]
fn command_line_matrix_product_in_three_bases() {
    let dir = std::env::temp_dir().join(format!("bilin-frame-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let t = random_basis_file(&dir, "matmul:2,3,4", "7", "m234.json");
    let ts = t.as_str();
    let (code, out, err) = bilin(&["bounds", ts]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("upper 20: matrix product"), "{out}");
    assert!(out.contains("<2,3,4>"), "{out}");
    assert!(out.contains("published for <2,3,4> over Q"), "{out}");
    let f = dir.join("m234-20.txt");
    let fs = f.to_str().unwrap();
    let (code, _, err) = bilin(&["search", ts, "--rank", "20", "--out", fs]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("known before any search"), "{err}");
    let (code, out, err) = bilin(&["verify", ts, fs]);
    assert_eq!(code, 0, "{out}{err}");
    std::fs::remove_dir_all(&dir).ok();
}

/// The command line on a product of polynomials: `bounds` closes the interval with the
/// evaluation scheme, `search` answers at once and writes it, `verify` accepts the file.
#[test]
fn command_line_polynomial_product_at_its_rank() {
    let (code, out, err) = bilin(&["bounds", "poly:6,9"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("R = 14 over Q"), "{out}");
    assert!(out.contains("upper 14: evaluation"), "{out}");
    let dir = std::env::temp_dir().join(format!("bilin-toom-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let f = dir.join("poly99.txt");
    let fs = f.to_str().unwrap();
    let (code, _, err) = bilin(&["search", "poly:9,9", "--rank", "17", "--out", fs]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("known before any search"), "{err}");
    let (code, out, err) = bilin(&["verify", "poly:9,9", fs]);
    assert_eq!(code, 0, "{out}{err}");
    std::fs::remove_dir_all(&dir).ok();
}

/// The command line: an interval in `bounds`, the known scheme at once in `search`, a
/// refusal below the lower bound (exit 1, the known scheme still printed), the method
/// choice printed with its reason.
#[test]
fn command_line_interval_and_plan() {
    let dir = std::env::temp_dir().join(format!("bilin-interval-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let f = dir.join("odd.json");
    // slices [[3,5],[7,1]] and [[1,3],[5,9]] along the result axis
    std::fs::write(
        &f,
        r#"{"kind":"bilinear","dims":[2,2,2],"entries":[[0,0,0,3],[0,1,0,5],[1,0,0,7],[1,1,0,1],[0,0,1,1],[0,1,1,3],[1,0,1,5],[1,1,1,9]]}"#,
    )
    .unwrap();
    let fs = f.to_str().unwrap();
    let (code, out, err) = bilin(&["bounds", fs]);
    assert_eq!(code, 0, "{err}");
    // Alder-Strassen through the unital isotope: R >= 2 * 2 - 1, met by the two slices
    // split as a pencil (3 terms)
    assert!(out.contains("R = 3 over Q"), "{out}");
    let (code, out, err) = bilin(&["search", fs, "--rank", "8", "--time", "10"]);
    assert_eq!(code, 0, "{err}");
    assert!(
        err.contains("answered at once") && out.contains("\"rank\":3"),
        "{err}"
    );
    let (code, out, err) = bilin(&["search", fs, "--rank", "2"]);
    assert_eq!(code, 1, "{err}");
    assert!(err.contains("below the proven lower bound R >= 3"), "{err}");
    assert!(out.contains("\"rank\":3"), "{out}");
    // an odd 3 x 3 x 3 array between its bounds: mod 2 every entry is 1 (flattening
    // ranks drop to 1), mod 3 they are kept
    let g = dir.join("odd3.json");
    let entries: Vec<String> = (0..27)
        .map(|n| {
            format!(
                "[{},{},{},{}]",
                n / 9,
                n / 3 % 3,
                n % 3,
                [3, 1, 5, 7, 9, 1, 3, 11, 5][n % 9] + 2 * (n / 9) as i64
            )
        })
        .collect();
    std::fs::write(
        &g,
        format!(
            r#"{{"kind":"bilinear","dims":[3,3,3],"entries":[{}]}}"#,
            entries.join(",")
        ),
    )
    .unwrap();
    let gs = g.to_str().unwrap();
    let (_, out, _) = bilin(&["bounds", gs]);
    let (code, _, err) = bilin(&["search", gs, "--rank", "3", "--time", "2", "--threads", "1"]);
    assert!(code == 0 || code == 1, "{err}");
    assert!(err.contains("method auto: reduced mod 3"), "{out}\n{err}");
    let (code, out, _) = bilin(&["analyze", "matmul:2,2,2", "--no-invariants"]);
    assert_eq!(code, 0);
    assert!(out.contains("R = 7 over Q"), "{out}");
    std::fs::remove_dir_all(&dir).ok();
}

/// A search with a short time limit ends near it whatever step it is in (walks over
/// GF(p), p-adic lifts, numerical fits) and closes with the rank interval: planted rank 18
/// in 8 x 8 x 8 searched at 17. A planted rank 12 in 8 x 8 x 8 (above every dimension) is
/// found at its rank, read off a numerical fit, and the interval closes on it (the
/// Koszul-Young bound proves 12). Integer factors in a user's basis.
#[test]
fn a_time_limited_search_ends_near_its_limit_with_the_interval() {
    let dir = common::tmpdir("time-limit");
    let search = |rank: usize, r: &str, time: &str| {
        let f = dir.join(format!("planted-{rank}.json"));
        let (t, _) = planted([8, 8, 8], rank, 100, 1);
        std::fs::write(&f, bilin::input::write_json(&t)).unwrap();
        let t0 = std::time::Instant::now();
        let args = ["search", f.to_str().unwrap(), "--rank", r, "--time", time];
        let (code, out, err) = bilin(&[&args[..], &["--seed", "1", "--quiet"]].concat());
        (code, out, err, t0.elapsed().as_secs_f64())
    };
    let (code, _, err, secs) = search(18, "17", "2");
    assert_eq!(code, 1, "{err}");
    // generous: the interval is computed before the limit starts, and the machine is shared
    assert!(secs < 15.0, "{secs} s\n{err}");
    assert!(
        err.contains("the rank over Q lies in") && err.contains("<= R <="),
        "{err}"
    );
    let (code, out, err, _) = search(12, "12", "60");
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("\"rank\":12") && err.contains("the rank over Q is 12"),
        "{out}\n{err}"
    );
    std::fs::remove_dir_all(&dir).ok();
}

/// A tensor proven to be a matrix product cites the published bounds stored with the
/// catalog's entry of its format, over the interval's field: <3,3,3> R >= 19 (Blaser
/// 2003, On the complexity of the multiplication of matrices of small formats,
/// J. Complexity 19) and R <= 23 (Laderman 1976, Bull. Amer. Math. Soc. 82); <4,4,4> over
/// GF(2) R <= 47 (Fawzi et al. 2022, Nature 610; from memory); <2,3,4> in three bases of
/// its own, found by its frame, R <= 20 (Hopcroft and Kerr 1971; from memory). A tensor
/// that is not a matrix product cites nothing.
#[test]
fn recognised_matrix_formats_cite_the_published_bounds() {
    let t = bilin::generators::generate("matmul:3,3,3").unwrap();
    let p = interval(&t).published.expect("published bounds of <3,3,3>");
    assert_eq!((p.format, p.entry.as_str()), ([3, 3, 3], "matmul333"));
    let lower = p.lower.unwrap();
    assert_eq!(lower.value, 19);
    assert!(lower.source.contains("2003"), "{}", lower.source);
    assert_eq!(p.upper.unwrap().value, 23);

    let t = bilin::generators::generate("matmul:4,4,4")
        .unwrap()
        .with_field(FieldSpec::Prime(2))
        .unwrap();
    let p = interval(&t).published.expect("published bounds of <4,4,4>");
    assert_eq!(p.upper.unwrap().value, 47);

    let t = bilin::generators::generate("matmul:2,3,4").unwrap();
    let d = t.dims();
    let [a, b, c] = [0, 1, 2].map(|i| random_invertible(d[i], 5, 70 + i as u64));
    let moved = change_basis(&t, &a, &b, &c).unwrap();
    let p = interval(&moved)
        .published
        .expect("published bounds of <2,3,4>");
    assert_eq!((p.format, p.entry.as_str()), ([2, 3, 4], "matmul234"));
    assert_eq!(p.upper.unwrap().value, 20);

    let t = bilin::generators::generate("poly:3,3").unwrap();
    assert!(interval(&t).published.is_none());
}

/// M_2(Q) in a random basis of its own is split into matrix units, so it is proven to be
/// <2,2,2>, and `bounds` cites the published bounds of matmul222: R = 7 (Winograd 1971,
/// On multiplication of 2x2 matrices, Linear Algebra Appl. 4; Strassen 1969).
#[test]
fn command_line_cites_published_bounds_for_a_matrix_algebra_in_its_own_basis() {
    let dir = std::env::temp_dir().join(format!("bilin-m2-published-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = random_basis_file(&dir, "matrix:2", "5", "m2.json");
    let (code, out, err) = bilin(&["bounds", &file]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("R = 7 over Q"), "{out}");
    assert!(out.contains("published for <2,2,2> over Q"), "{out}");
    assert!(out.contains("R >= 7 (Winograd 1971"), "{out}");
    std::fs::remove_dir_all(&dir).ok();
}
