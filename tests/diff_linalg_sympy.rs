//! Differential test: exact rank and nullspace dimension over Q agree with sympy
//! (a general-purpose reference library from PyPI) on seeded random rational matrices.
//! Skips with a note when python3 or sympy is unavailable.

use bilin::linalg::{Matrix, nullspace_q, rank_q};
use bilin::scalar::{Q, q_to_string};
use rand::{Rng, SeedableRng};
use std::process::Command;

fn sympy_ranks(mats: &[Matrix<Q>]) -> Option<Vec<usize>> {
    let mut script = String::from("import sympy\nout=[]\n");
    for m in mats {
        let rows: Vec<String> = (0..m.rows)
            .map(|i| {
                let r: Vec<String> = m
                    .row(i)
                    .iter()
                    .map(|x| format!("sympy.Rational('{}')", q_to_string(x)))
                    .collect();
                format!("[{}]", r.join(","))
            })
            .collect();
        script.push_str(&format!(
            "out.append(sympy.Matrix([{}]).rank())\n",
            rows.join(",")
        ));
    }
    script.push_str("print(' '.join(map(str,out)))\n");
    let out = Command::new("python3")
        .arg("-c")
        .arg(&script)
        .output()
        .ok()?;
    if !out.status.success() {
        eprintln!(
            "note: sympy unavailable, skipping: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        return None;
    }
    Some(
        String::from_utf8_lossy(&out.stdout)
            .split_whitespace()
            .map(|s| s.parse().unwrap())
            .collect(),
    )
}

#[test]
fn rank_agrees_with_sympy() {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(7);
    let mut mats = Vec::new();
    for _ in 0..30 {
        let (r, c) = (rng.gen_range(1..8), rng.gen_range(1..8));
        // low-rank products of random factors, with fractions
        let k = rng.gen_range(0..=r.min(c));
        let mut m = Matrix::filled(r, c, Q::from_integer(0.into()));
        for _ in 0..k {
            let a: Vec<Q> = (0..r)
                .map(|_| Q::new(rng.gen_range(-5..=5).into(), rng.gen_range(1..4).into()))
                .collect();
            let b: Vec<Q> = (0..c)
                .map(|_| Q::new(rng.gen_range(-5..=5).into(), rng.gen_range(1..4).into()))
                .collect();
            for i in 0..r {
                for j in 0..c {
                    m[(i, j)] += &a[i] * &b[j];
                }
            }
        }
        mats.push(m);
    }
    let Some(expected) = sympy_ranks(&mats) else {
        eprintln!("note: python3/sympy not available; differential test skipped");
        return;
    };
    for (m, e) in mats.iter().zip(expected) {
        assert_eq!(rank_q(m), e, "rank differs from sympy on {m:?}");
        assert_eq!(nullspace_q(m).len(), m.cols - e);
    }
}
