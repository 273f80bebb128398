//! Rendering of `bilin scheme equiv`: the verdict, the transformation or the separating
//! invariant, and the invariants of both schemes (text or JSON).

use super::{EXIT_FALSE, EXIT_OK};
use bilin::scheme::Scheme;
use bilin::scheme::equiv::{Equivalence, Verdict, matrix_text};
use bilin::scheme::text::product_labels;
use bilin::tensor::Tensor;
use serde_json::json;

/// Print the result; returns the exit code (0 equivalent, 1 otherwise).
pub fn render(
    e: &Equivalence,
    t: &Tensor,
    s: [&Scheme; 2],
    paths: [&str; 2],
    as_json: bool,
) -> i32 {
    let l1 = product_labels(s[0], t);
    let l2 = product_labels(s[1], t);
    let invariants: Vec<serde_json::Value> = e
        .invariants
        .iter()
        .map(|(n, a, b)| json!({"name": n, "first": a, "second": b}))
        .collect();
    let (verdict, detail) = match &e.verdict {
        Verdict::Equivalent(tr) => {
            let matching: Vec<serde_json::Value> = tr
                .matching
                .iter()
                .enumerate()
                .map(|(i, &j)| json!([l1[i], l2[j]]))
                .collect();
            let mats = |m: &[bilin::linalg::Matrix<bilin::scalar::Q>; 3]| {
                m.iter().map(matrix_text).collect::<Vec<_>>()
            };
            (
                "equivalent",
                json!({
                    "form": tr.form,
                    "matching": matching,
                    "maps": mats(&tr.maps),
                    "sandwich": tr.sandwich.as_ref().map(mats),
                }),
            )
        }
        Verdict::NotEquivalent {
            invariant,
            first,
            second,
        } => (
            "not equivalent",
            json!({"invariant": invariant, "first": first, "second": second}),
        ),
        Verdict::Undecided(why) => ("undecided", json!({"reason": why})),
    };
    if as_json {
        let v = json!({
            "schema": "bilin.scheme-equiv/1",
            "first": paths[0],
            "second": paths[1],
            "verdict": verdict,
            "detail": detail,
            "invariants": invariants,
            "search_nodes": e.nodes,
            "forms_compared": e.forms,
        });
        println!("{}", serde_json::to_string_pretty(&v).unwrap_or_default());
    } else {
        match &e.verdict {
            Verdict::Equivalent(tr) => {
                println!(
                    "equivalent: {} and {} are the same algorithm up to the symmetries of the tensor (transformation verified exactly)",
                    paths[0], paths[1]
                );
                if tr.form != "input" {
                    println!("from the {} form of the first scheme", tr.form);
                }
                let pairs: Vec<String> = tr
                    .matching
                    .iter()
                    .enumerate()
                    .map(|(i, &j)| format!("{} -> {}", l1[i], l2[j]))
                    .collect();
                println!("products: {}", pairs.join(", "));
                if let Some([x, y, z]) = &tr.sandwich {
                    println!(
                        "sandwich (A -> X A Y^-1, B -> Y B Z^-1; factors U -> X^T U Y^-T, V -> Y^T V Z^-T, W -> X^-1 W Z):"
                    );
                    println!(
                        "  X = {}\n  Y = {}\n  Z = {}",
                        matrix_text(x),
                        matrix_text(y),
                        matrix_text(z)
                    );
                }
                println!(
                    "maps on the three spaces: P = {}, Q = {}, R = {}",
                    matrix_text(&tr.maps[0]),
                    matrix_text(&tr.maps[1]),
                    matrix_text(&tr.maps[2])
                );
            }
            Verdict::NotEquivalent {
                invariant,
                first,
                second,
            } => println!(
                "not equivalent: the {invariant} is {first} for {} and {second} for {} (an invariant of the symmetry group{})",
                paths[0],
                paths[1],
                if e.forms.len() > 1 {
                    "; the cyclic and transposed forms of the first scheme differ from the second too"
                } else {
                    ""
                }
            ),
            Verdict::Undecided(why) => println!("undecided: {why}"),
        }
        println!("invariants (first | second):");
        for (n, a, b) in &e.invariants {
            let mark = if a == b { "" } else { "   <- differs" };
            println!("  {n}: {a} | {b}{mark}");
        }
    }
    if matches!(e.verdict, Verdict::Equivalent(_)) {
        EXIT_OK
    } else {
        EXIT_FALSE
    }
}
