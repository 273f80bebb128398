//! `polish` never makes a scheme worse: for every example scheme in examples/schemes/ and
//! every objective, the objective's value after polishing is at most its value before
//! (measured by the one cost model), the rank and validity are kept, and the result
//! verifies exactly. Winograd's 15 additions (Probert 1976, from memory) stay 15 under the
//! additions objective.

use bilin::scheme::cost::{Objective, count_cost};
use bilin::scheme::polish::{PolishParams, polish};
use bilin::scheme::{parse_scheme, verify};

/// Every example file with its input (a new example must be added here).
const EXAMPLES: &[(&str, &str)] = &[
    ("gauss.txt", "complex"),
    ("karatsuba.txt", "poly:2,2"),
    ("strassen.txt", "matmul:2,2,2"),
    ("winograd.txt", "matmul:2,2,2"),
    ("toom3.txt", "poly:3,3"),
    ("toom_3x4.txt", "poly:3,4"),
    ("matmul333_23.txt", "matmul:3,3,3"),
    ("matmul444_49.txt", "matmul:4,4,4"),
];

fn matmul_format(input: &str) -> Option<[usize; 3]> {
    let v: Vec<usize> = input
        .strip_prefix("matmul:")?
        .split(',')
        .map(|x| x.parse().unwrap())
        .collect();
    Some([v[0], v[1], v[2]])
}

#[test]
fn every_example_is_listed() {
    let mut files: Vec<String> = std::fs::read_dir("examples/schemes")
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    files.sort();
    let mut listed: Vec<String> = EXAMPLES.iter().map(|e| e.0.to_string()).collect();
    listed.sort();
    assert_eq!(files, listed);
}

#[test]
fn polish_never_increases_the_objective() {
    bilin::catalog::register_input_resolver();
    for (file, input) in EXAMPLES {
        let t = bilin::input::load_input(input, None).unwrap();
        let path = format!("examples/schemes/{file}");
        let s = parse_scheme(&std::fs::read_to_string(&path).unwrap(), &path, &t).unwrap();
        let before = count_cost(&s);
        // a small budget keeps the test quick; the guarantee holds for any budget
        let evaluations = if s.rank() > 10 { 20 } else { 150 };
        for objective in Objective::ALL {
            let params = PolishParams {
                objective,
                matmul: matmul_format(input),
                evaluations,
                ..PolishParams::default()
            };
            let p = polish(&s, &t, &params).unwrap();
            assert!(verify(&p.scheme, &t).is_ok(), "{file} {objective:?}");
            let after = count_cost(&p.scheme);
            assert_eq!(
                after, p.after,
                "{file}: the reported measures are the cost model's"
            );
            assert_eq!(p.before, before);
            assert!(
                objective.value(&after) <= objective.value(&before),
                "{file} {objective:?}: {:?} -> {:?}",
                objective.value(&before),
                objective.value(&after)
            );
            assert!(objective.key(&after) <= objective.key(&before));
        }
    }
}

#[test]
fn winograd_keeps_its_15_additions() {
    let t = bilin::input::load_input("matmul:2,2,2", None).unwrap();
    let path = "examples/schemes/winograd.txt";
    let s = parse_scheme(&std::fs::read_to_string(path).unwrap(), path, &t).unwrap();
    let params = PolishParams {
        objective: Objective::Additions,
        matmul: Some([2, 2, 2]),
        ..PolishParams::default()
    };
    let p = polish(&s, &t, &params).unwrap();
    assert_eq!(p.after.total(), 15);
    assert_eq!(p.after.additions, [4, 4, 7]);
}
