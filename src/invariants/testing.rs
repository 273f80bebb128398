//! Small algebras built by hand for the tests of this module (the full generators live
//! elsewhere; these keep the tests self-contained).

use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;

fn names(p: &str, n: usize) -> Vec<String> {
    (0..n).map(|i| format!("{p}{i}")).collect()
}

fn qi(x: i64) -> Q {
    Q::from_integer(x.into())
}

/// Cayley-Dickson basis product in dimension `dim` (a power of 2): `e_i e_j = s e_k`.
/// Doubling rule `(a,b)(c,d) = (ac - conj(d) b, d a + b conj(c))`.
pub fn cayley_dickson(i: usize, j: usize, dim: usize) -> (i64, usize) {
    if dim == 1 {
        return (1, 0);
    }
    let h = dim / 2;
    let conj = |y: usize| if y == 0 { 1 } else { -1 };
    match (i < h, j < h) {
        (true, true) => cayley_dickson(i, j, h),
        (true, false) => {
            let (s, k) = cayley_dickson(j - h, i, h);
            (s, k + h)
        }
        (false, true) => {
            let (s, k) = cayley_dickson(i - h, j, h);
            (s * conj(j), k + h)
        }
        (false, false) => {
            let (s, k) = cayley_dickson(j - h, i - h, h);
            (-s * conj(j - h), k)
        }
    }
}

/// The Cayley-Dickson algebra of dimension `dim` over Q (4: quaternions, 8: octonions).
pub fn cayley_dickson_algebra(dim: usize) -> Tensor {
    let mut t = Tensor::algebra(FieldSpec::Rational, names("e", dim));
    for i in 0..dim {
        for j in 0..dim {
            let (s, k) = cayley_dickson(i, j, dim);
            t.set(i, j, k, qi(s));
        }
    }
    t
}

pub fn quaternions() -> Tensor {
    cayley_dickson_algebra(4)
}

pub fn octonions() -> Tensor {
    cayley_dickson_algebra(8)
}

/// M_n with matrix units `E_ab` at index `a n + b`.
pub fn matrix_algebra(n: usize) -> Tensor {
    let nm: Vec<String> = (0..n * n).map(|i| format!("E{}{}", i / n, i % n)).collect();
    let mut t = Tensor::algebra(FieldSpec::Rational, nm);
    for a in 0..n {
        for b in 0..n {
            for d in 0..n {
                t.set(a * n + b, b * n + d, a * n + d, qi(1));
            }
        }
    }
    t
}

/// Upper triangular 2x2 matrices, basis e11, e12, e22.
pub fn upper_triangular_2() -> Tensor {
    let mut t = Tensor::algebra(
        FieldSpec::Rational,
        vec!["e11".into(), "e12".into(), "e22".into()],
    );
    t.set(0, 0, 0, qi(1));
    t.set(0, 1, 1, qi(1));
    t.set(1, 2, 1, qi(1));
    t.set(2, 2, 2, qi(1));
    t
}

/// Q[x]/(x^n), basis 1, x, ..., x^(n-1).
pub fn truncated_polynomials(n: usize) -> Tensor {
    let mut t = Tensor::algebra(FieldSpec::Rational, names("x", n));
    for i in 0..n {
        for j in 0..n - i {
            t.set(i, j, i + j, qi(1));
        }
    }
    t
}

/// Q[S_3]: basis the 6 permutations of {0,1,2} in lexicographic order; product = composition
/// `(g h)(x) = g(h(x))`.
pub fn group_algebra_s3() -> Tensor {
    let perms: Vec<[usize; 3]> = vec![
        [0, 1, 2],
        [0, 2, 1],
        [1, 0, 2],
        [1, 2, 0],
        [2, 0, 1],
        [2, 1, 0],
    ];
    let mut t = Tensor::algebra(FieldSpec::Rational, names("g", 6));
    for (i, g) in perms.iter().enumerate() {
        for (j, h) in perms.iter().enumerate() {
            let gh = [g[h[0]], g[h[1]], g[h[2]]];
            let k = perms.iter().position(|p| *p == gh).expect("closed");
            t.set(i, j, k, qi(1));
        }
    }
    t
}

/// Q(sqrt 2) (d = 2) or Q(i) (d = -1): basis 1, s with s^2 = d.
pub fn quadratic_field(d: i64) -> Tensor {
    let mut t = Tensor::algebra(FieldSpec::Rational, vec!["one".into(), "s".into()]);
    t.set(0, 0, 0, qi(1));
    t.set(0, 1, 1, qi(1));
    t.set(1, 0, 1, qi(1));
    t.set(1, 1, 0, qi(d));
    t
}

/// sl_2 with basis e, f, h: [e,f] = h, [h,e] = 2e, [h,f] = -2f.
pub fn sl2() -> Tensor {
    let mut t = Tensor::algebra(
        FieldSpec::Rational,
        vec!["e".into(), "f".into(), "h".into()],
    );
    let mut br = |i: usize, j: usize, k: usize, v: i64| {
        t.set(i, j, k, qi(v));
        t.set(j, i, k, qi(-v));
    };
    br(0, 1, 2, 1);
    br(2, 0, 0, 2);
    br(2, 1, 1, -2);
    t
}

/// The Heisenberg Lie algebra of dimension 3: [x,y] = z.
pub fn heisenberg3() -> Tensor {
    let mut t = Tensor::algebra(
        FieldSpec::Rational,
        vec!["x".into(), "y".into(), "z".into()],
    );
    t.set(0, 1, 2, qi(1));
    t.set(1, 0, 2, qi(-1));
    t
}

/// A dense random algebra of dimension n, constants in -2..=2, seeded.
pub fn random_algebra(n: usize, seed: u64) -> Tensor {
    crate::tensor::random_algebra(n, 2, seed)
}
