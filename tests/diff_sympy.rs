//! Differential test: exact ranks of random rational matrices and of flattenings of random
//! tensors agree with sympy's `Matrix.rank()` (exact rational arithmetic).
//! Skips with a note when python3 or sympy is unavailable.

use bilin::linalg::{Matrix, rank_q};
use bilin::scalar::{FieldSpec, Q, q, q_to_string};
use bilin::tensor::{Kind, Tensor, flattening, flattening_ranks};
use rand::{Rng, SeedableRng};
use std::io::Write;
use std::process::{Command, Stdio};

fn sympy_available() -> bool {
    Command::new("python3")
        .args(["-c", "import sympy"])
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .status()
        .map(|s| s.success())
        .unwrap_or(false)
}

/// Ranks of the matrices computed by sympy (one python process for all).
fn sympy_ranks(ms: &[Matrix<Q>]) -> Vec<usize> {
    let json: Vec<serde_json::Value> = ms
        .iter()
        .map(|m| {
            serde_json::json!({
                "rows": m.rows, "cols": m.cols,
                "data": m.data.iter().map(q_to_string).collect::<Vec<_>>()
            })
        })
        .collect();
    let script = "import sys, json\nfrom sympy import Matrix, Rational\n\
        for m in json.load(sys.stdin):\n\
        \x20   d = [Rational(x) for x in m['data']]\n\
        \x20   r, c = m['rows'], m['cols']\n\
        \x20   print(0 if r == 0 or c == 0 else Matrix(r, c, d).rank())\n";
    let mut child = Command::new("python3")
        .args(["-c", script])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .spawn()
        .expect("python3 starts");
    child
        .stdin
        .take()
        .unwrap()
        .write_all(serde_json::to_string(&json).unwrap().as_bytes())
        .unwrap();
    let out = child.wait_with_output().unwrap();
    assert!(out.status.success(), "sympy script failed");
    String::from_utf8(out.stdout)
        .unwrap()
        .lines()
        .map(|l| l.trim().parse().unwrap())
        .collect()
}

fn random_matrix(rng: &mut impl Rng) -> Matrix<Q> {
    let (r, c) = (rng.gen_range(1..7), rng.gen_range(1..7));
    let target = rng.gen_range(0..=r.min(c));
    // a product of an r x target and a target x c matrix (rank <= target), with fractions
    let a: Vec<Q> = (0..r * target)
        .map(|_| q(rng.gen_range(-3..=3), rng.gen_range(1..4)))
        .collect();
    let b: Vec<Q> = (0..target * c)
        .map(|_| q(rng.gen_range(-3..=3), rng.gen_range(1..4)))
        .collect();
    let mut m = Matrix::filled(r, c, q(0, 1));
    for i in 0..r {
        for j in 0..c {
            for k in 0..target {
                m[(i, j)] += &a[i * target + k] * &b[k * c + j];
            }
        }
    }
    m
}

fn random_tensor(rng: &mut impl Rng) -> Tensor {
    let dims = [
        rng.gen_range(1..4),
        rng.gen_range(1..4),
        rng.gen_range(1..4),
    ];
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, dims, None);
    for i in 0..dims[0] {
        for j in 0..dims[1] {
            for k in 0..dims[2] {
                if rng.gen_bool(0.4) {
                    t.set(i, j, k, q(rng.gen_range(-2..=2), rng.gen_range(1..3)));
                }
            }
        }
    }
    t
}

#[test]
fn ranks_agree_with_sympy() {
    if !sympy_available() {
        eprintln!("note: python3 with sympy not available; differential test skipped");
        return;
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(2024);
    let ms: Vec<Matrix<Q>> = (0..40).map(|_| random_matrix(&mut rng)).collect();
    let ours: Vec<usize> = ms.iter().map(rank_q).collect();
    assert_eq!(ours, sympy_ranks(&ms));

    let ts: Vec<Tensor> = (0..20).map(|_| random_tensor(&mut rng)).collect();
    let flats: Vec<Matrix<Q>> = ts
        .iter()
        .flat_map(|t| (0..3).map(move |a| flattening(t, a)))
        .collect();
    let ours: Vec<usize> = ts.iter().flat_map(flattening_ranks).collect();
    assert_eq!(ours, sympy_ranks(&flats));
}
