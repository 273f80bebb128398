//! Timing of exact rank and nullspace over Q on seeded random integer matrices.
//! `cargo run --release --example linalg_timing -- N` (default 1000).
use bilin::linalg::{Matrix, nullspace_q, rank_q};
use bilin::scalar::Q;
use rand::{Rng, SeedableRng};

fn main() {
    let n: usize = std::env::args()
        .nth(1)
        .and_then(|s| s.parse().ok())
        .unwrap_or(1000);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(1);
    let m = Matrix {
        rows: n,
        cols: n,
        data: (0..n * n)
            .map(|_| Q::from_integer(rng.gen_range(-9i64..=9).into()))
            .collect(),
    };
    let t = std::time::Instant::now();
    let r = rank_q(&m);
    eprintln!(
        "rank of a random {n} x {n} matrix, entries in -9..9: {r} in {:?}",
        t.elapsed()
    );
    // A rank-deficient matrix whose dependencies are small: 10 rows are sums of others.
    let mut m2 = m.clone();
    for i in n - 10..n {
        for j in 0..n {
            let v = m2[(i + 10 - n, j)].clone() + m2[(i + 11 - n, j)].clone();
            m2[(i, j)] = v;
        }
    }
    let t = std::time::Instant::now();
    let ns = nullspace_q(&m2.transpose());
    eprintln!(
        "left nullspace of the rank-{} matrix: dim {} in {:?}",
        n - 10,
        ns.len(),
        t.elapsed()
    );
}
