//! Planted tensors of known rank for tests and benchmarks: `sum_{r<R} a_r (x) b_r (x) c_r`
//! with small random integer factors, each axis then scrambled by a random invertible
//! integer matrix with entries up to `scramble` in absolute value (a user's basis: dense,
//! large coefficients). Seeded, so reproducible.

use crate::linalg::Matrix;
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::{Kind, Tensor, random_invertible};
use num_traits::Zero;
use rand::{Rng, SeedableRng};

/// The planted tensor and its factors (one list per axis, one vector per term).
pub fn planted(
    dims: [usize; 3],
    rank: usize,
    scramble: i64,
    seed: u64,
) -> (Tensor, [Vec<Vec<Q>>; 3]) {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let f = Rationals;
    let factors: [Vec<Vec<Q>>; 3] = std::array::from_fn(|a| {
        let p: Matrix<Q> =
            random_invertible(dims[a], scramble.max(1), seed.wrapping_add(a as u64 + 1));
        (0..rank)
            .map(|_| {
                let v: Vec<Q> = (0..dims[a])
                    .map(|_| Q::from_integer(rng.gen_range(-3i64..=3).into()))
                    .collect();
                p.mul_vec(&f, &v)
            })
            .collect()
    });
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, dims, None);
    let mut dense = vec![Q::zero(); dims[0] * dims[1] * dims[2]];
    for ((fu, fv), fw) in factors[0].iter().zip(&factors[1]).zip(&factors[2]) {
        for (i, x) in fu.iter().enumerate().filter(|(_, x)| !x.is_zero()) {
            for (j, y) in fv.iter().enumerate().filter(|(_, y)| !y.is_zero()) {
                let xy = x * y;
                for (k, z) in fw.iter().enumerate().filter(|(_, z)| !z.is_zero()) {
                    dense[(i * dims[1] + j) * dims[2] + k] += &xy * z;
                }
            }
        }
    }
    for i in 0..dims[0] {
        for j in 0..dims[1] {
            for k in 0..dims[2] {
                let v = &dense[(i * dims[1] + j) * dims[2] + k];
                if !v.is_zero() {
                    t.set(i, j, k, v.clone());
                }
            }
        }
    }
    (t, factors)
}
