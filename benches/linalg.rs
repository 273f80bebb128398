//! Exact linear algebra over Q: rank and nullspace of seeded random integer matrices.
//! Target: rank of a 1000 x 1000 integer matrix with small entries well under a second.
use bilin::linalg::{Matrix, nullspace_q, rank_q};
use bilin::scalar::Q;
use criterion::{Criterion, criterion_group, criterion_main};
use rand::{Rng, SeedableRng};

fn random(n: usize, seed: u64) -> Matrix<Q> {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    Matrix {
        rows: n,
        cols: n,
        data: (0..n * n)
            .map(|_| Q::from_integer(rng.gen_range(-9i64..=9).into()))
            .collect(),
    }
}

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("linalg");
    g.sample_size(10);
    let m = random(1000, 1);
    g.bench_function("rank_q 1000x1000 full rank", |b| b.iter(|| rank_q(&m)));
    let mut d = random(1000, 2);
    for i in 990..1000 {
        for j in 0..1000 {
            let v = d[(i - 10, j)].clone() + d[(i - 9, j)].clone();
            d[(i, j)] = v;
        }
    }
    let dt = d.transpose();
    g.bench_function("nullspace_q 1000x1000 rank 990 (small dependencies)", |b| {
        b.iter(|| nullspace_q(&dt))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
