//! Seeded random tables: dense algebras with small integer structure constants, the demo
//! and benchmark inputs of "a table with no structure to exploit".
use super::Tensor;
use crate::scalar::{FieldSpec, Q};
use rand::{Rng, SeedableRng};

/// A dense random algebra of dimension `n` over Q: every structure constant c_ijk drawn
/// uniformly from `-bound..=bound` by a ChaCha8 generator seeded with `seed` (so the same
/// arguments give the same table on every machine). Cost: n^3 draws.
pub fn random_algebra(n: usize, bound: i64, seed: u64) -> Tensor {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let names = (0..n).map(|i| format!("e{i}")).collect();
    let mut t = Tensor::algebra(FieldSpec::Rational, names);
    for i in 0..n {
        for j in 0..n {
            for k in 0..n {
                t.set(
                    i,
                    j,
                    k,
                    Q::from_integer(rng.gen_range(-bound..=bound).into()),
                );
            }
        }
    }
    t
}
