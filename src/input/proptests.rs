//! Property tests: writers and parsers are inverse on random small tensors over Q and
//! GF(p), and the parsers never panic on arbitrary or mutated inputs (seeded, deterministic).

use super::*;
use crate::scalar::{FieldSpec, Q, q};
use crate::tensor::{Kind, Tensor};
use proptest::prelude::*;
use proptest::test_runner::{Config, RngAlgorithm, TestRng, TestRunner};

fn config(cases: u32) -> Config {
    Config {
        cases,
        failure_persistence: None,
        ..Config::default()
    }
}

fn runner(cases: u32) -> TestRunner {
    TestRunner::new_with_rng(
        config(cases),
        TestRng::deterministic_rng(RngAlgorithm::ChaCha),
    )
}

/// A random small tensor: dims 1..4, sparse entries n/d with |n| <= 20, 1 <= d <= 6.
fn arb_tensor() -> impl Strategy<Value = Tensor> {
    (
        prop_oneof![
            Just(FieldSpec::Rational),
            Just(FieldSpec::Prime(2)),
            Just(FieldSpec::Prime(7)),
            Just(FieldSpec::Prime(1_000_003))
        ],
        any::<bool>(),
        1usize..5,
        1usize..5,
        1usize..5,
        prop::collection::vec(
            (0usize..4, 0usize..4, 0usize..4, -20i64..=20, 1i64..=6),
            0..20,
        ),
        prop::collection::vec(0usize..5, 3),
    )
        .prop_map(|(field, algebra, a, b, c, es, styles)| {
            let (kind, dims) = if algebra {
                (Kind::Algebra, [a; 3])
            } else {
                (Kind::Bilinear, [a, b, c])
            };
            let mut t = Tensor::zero(field, kind, dims, None);
            let p = field.characteristic();
            for (i, j, k, n, d) in es {
                let d = if p != 0 && (d as u64).is_multiple_of(p) {
                    1
                } else {
                    d
                };
                if i < dims[0] && j < dims[1] && k < dims[2] {
                    t.set(i, j, k, q(n, d));
                }
            }
            // Name styles exercising every allowed name character.
            for (axis, style) in styles.iter().enumerate() {
                if algebra && axis > 0 {
                    break;
                }
                let pat = ["e", "x'", "_b.", "\u{3b1}", "E_"][*style];
                t.set_names(axis, (0..dims[axis]).map(|i| format!("{pat}{i}")).collect());
            }
            t
        })
}

#[test]
fn round_trip_all_writers() {
    runner(300)
        .run(&arb_tensor(), |t| {
            prop_assert_eq!(&parse_table(&write_table(&t), "t").unwrap(), &t);
            prop_assert_eq!(&parse_json(&write_json(&t), "t").unwrap(), &t);
            if t.kind() == Kind::Algebra {
                prop_assert_eq!(&parse_table(&write_grid(&t).unwrap(), "t").unwrap(), &t);
            }
            prop_assert_eq!(&parse_any(&write_json(&t), "t").unwrap(), &t);
            Ok(())
        })
        .unwrap();
    let _ = Q::default();
}

#[test]
fn never_panics_on_arbitrary_strings() {
    runner(2000)
        .run(&any::<String>(), |s| {
            let _ = parse_table(&s, "x");
            let _ = parse_json(&s, "x");
            Ok(())
        })
        .unwrap();
    // Strings over the format's own alphabet reach deeper into the parser.
    let alphabet = prop::collection::vec(
        prop::sample::select(vec![
            "basis ", "left ", "right ", "result ", "unit ", "field ", "GF(7)", "Q", "grid\n",
            "end\n", "\n", " ", "e", "i", "x1", "*", "=", "+", "-", "/", "0", "1", "2", ".", "#",
            "{", "}", "[", "]", ",", "\"", ":", "kind", "dims", "entries",
        ]),
        0..40,
    )
    .prop_map(|v| v.concat());
    runner(2000)
        .run(&alphabet, |s| {
            let _ = parse_table(&s, "x");
            let _ = parse_json(&s, "x");
            Ok(())
        })
        .unwrap();
}

#[test]
fn never_panics_on_mutated_files() {
    let seeds: Vec<String> = ["quaternions", "matmul:2,1,2", "dual", "heisenberg:1"]
        .iter()
        .flat_map(|s| {
            let t = crate::generators::generate(s).unwrap();
            let mut v = vec![write_table(&t), write_json(&t)];
            if let Ok(g) = write_grid(&t) {
                v.push(g);
            }
            v
        })
        .collect();
    let n = seeds.len();
    let strat = (
        0..n,
        prop::collection::vec((any::<prop::sample::Index>(), 0u8..3, any::<char>()), 1..6),
    );
    runner(2000)
        .run(&strat, |(s, muts)| {
            let mut chars: Vec<char> = seeds[s].chars().collect();
            for (at, op, c) in muts {
                let len = chars.len();
                match op {
                    0 if len > 0 => {
                        chars.remove(at.index(len));
                    }
                    1 => chars.insert(at.index(len + 1), c),
                    _ if len > 0 => chars[at.index(len)] = c,
                    _ => {}
                }
            }
            let text: String = chars.into_iter().collect();
            let _ = parse_any(&text, "m");
            Ok(())
        })
        .unwrap();
}
