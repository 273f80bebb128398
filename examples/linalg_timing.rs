use bilin::linalg::{Matrix, nullspace_q, rank_q};
use bilin::scalar::Q;
use rand::{Rng, SeedableRng};
fn main() {
    let n = 1000;
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(1);
    let m = Matrix { rows: n, cols: n, data: (0..n * n).map(|_| Q::from_integer(rng.gen_range(-9i64..=9).into())).collect() };
    let t = std::time::Instant::now();
    let r = rank_q(&m);
    println!("full random rank {r} in {:?}", t.elapsed());
    // rank-deficient: last 10 rows are copies of sums
    let mut m2 = m.clone();
    for i in 990..1000 { for j in 0..n { let v = m2[(i-990, j)].clone() + m2[(i-989, j)].clone(); m2[(i, j)] = v; } }
    let t = std::time::Instant::now();
    let ns = nullspace_q(&m2.transpose());
    println!("deficient nullspace dim {} in {:?}", ns.len(), t.elapsed());
    let t = std::time::Instant::now();
    let r = rank_q(&m2);
    println!("deficient rank {r} in {:?}", t.elapsed());
}
