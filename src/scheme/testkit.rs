//! Test helpers: small tensors built by hand (matrix multiplication, complex numbers,
//! polynomial products, the matrix algebra M_2) and classical schemes in the text form.
//!
//! Matrix multiplication <n,m,p>: A is n x m, B is m x p, C = AB is n x p; `a_ij` has index
//! `i*m + j`, `b_jk` index `j*p + k`, `c_ik` index `i*p + k` (row-major, 0-based), names
//! `a11`.. (1-based).

use super::Scheme;
use crate::scalar::{FieldSpec, Q, q};
use crate::tensor::Tensor;
use num_traits::{One, Zero};
use rand::{Rng, SeedableRng};

/// The matrix multiplication tensor <n,m,p> over Q (the built-in generator).
pub fn matmul(n: usize, m: usize, p: usize) -> Tensor {
    crate::generators::matmul(n, m, p).expect("small format")
}

/// The complex numbers as a 2-dimensional algebra over Q, basis `one`, `i`.
pub fn complex() -> Tensor {
    let mut t = Tensor::algebra(FieldSpec::Rational, vec!["one".into(), "i".into()]);
    t.set(0, 0, 0, Q::one());
    t.set(0, 1, 1, Q::one());
    t.set(1, 0, 1, Q::one());
    t.set(1, 1, 0, -Q::one());
    t
}

/// Product of two polynomials of degree < n (the built-in generator; a0.., b0.., c0..).
pub fn polymul(n: usize) -> Tensor {
    crate::generators::poly_mult(n, n).expect("small")
}

/// The algebra M_2(Q) with basis e11, e12, e21, e22 (the built-in generator).
pub fn m2_algebra() -> Tensor {
    crate::generators::matrix_algebra(2).expect("small")
}

/// A random scheme with small coefficients (rationals over Q), some rows all zero.
pub fn random_scheme(t: &Tensor, r: usize, seed: u64, field: FieldSpec) -> Scheme {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    let d = t.dims();
    let mut s = Scheme::empty(field, d);
    let vec = |n: usize, rng: &mut rand_chacha::ChaCha8Rng| -> Vec<Q> {
        let zero_row = rng.gen_bool(0.1);
        (0..n)
            .map(|_| {
                if zero_row || rng.gen_bool(0.5) {
                    return Q::zero();
                }
                match field {
                    FieldSpec::Rational => q(rng.gen_range(-5..=5), rng.gen_range(1..=3)),
                    FieldSpec::Prime(p) => Q::from_integer(rng.gen_range(0..p).into()),
                }
            })
            .collect()
    };
    for _ in 0..r {
        let u = vec(d[0], &mut rng);
        let v = vec(d[1], &mut rng);
        let w = vec(d[2], &mut rng);
        s.push(u, v, w);
    }
    s
}

/// Strassen 1969, "Gaussian elimination is not optimal", Numer. Math. 13 (formulas from
/// memory).
pub const STRASSEN: &str = "\
# Strassen 1969
field Q
m1 = (a11 + a22)*(b11 + b22)
m2 = (a21 + a22)*b11
m3 = a11*(b12 - b22)
m4 = a22*(b21 - b11)
m5 = (a11 + a12)*b22
m6 = (a21 - a11)*(b11 + b12)
m7 = (a12 - a22)*(b21 + b22)
c11 = m1 + m4 - m5 + m7
c12 = m3 + m5
c21 = m2 + m4
c22 = m1 - m2 + m3 + m6
";

/// Winograd's variant with 15 additions (Probert 1976; Bshouty 1989 for optimality), the
/// products written out in the a's and b's (from memory).
pub const WINOGRAD: &str = "\
# Winograd's variant of Strassen's algorithm
m1 = a11*b11
m2 = a12*b21
m3 = (a11 + a12 - a21 - a22)*b22
m4 = a22*(b11 - b12 - b21 + b22)
m5 = (a21 + a22)*(b12 - b11)
m6 = (a21 + a22 - a11)*(b11 - b12 + b22)
m7 = (a11 - a21)*(b22 - b12)
c11 = m1 + m2
c12 = m1 + m3 + m5 + m6
c21 = m1 - m4 + m6 + m7
c22 = m1 + m5 + m6 + m7
";

/// Karatsuba and Ofman 1962: (a0 + a1 x)(b0 + b1 x) with 3 multiplications.
pub const KARATSUBA: &str = "\
m1 = a0*b0
m2 = a1*b1
m3 = (a0 + a1)*(b0 + b1)
c0 = m1
c1 = m3 - m1 - m2
c2 = m2
";

/// Gauss's 3-multiplication complex product (common practice): (x + iy)(u + iv).
pub const GAUSS: &str = "\
m1 = one*one
m2 = i*i
m3 = (one + i)*(one + i)
one = m1 - m2
i = m3 - m1 - m2
";

/// Parse a scheme text against a tensor (panics on error: tests only).
pub fn scheme(text: &str, t: &Tensor) -> Scheme {
    super::text::parse_text(text, "test", t).unwrap()
}

/// Apply sandwich moves `(side, a, b, c)` one after another (see
/// [`super::sandwich::apply_move`]).
pub fn moved(
    s: &Scheme,
    nmp: [usize; 3],
    moves: &[(super::sandwich::Side, usize, usize, Q)],
) -> Scheme {
    moves.iter().fold(s.clone(), |x, (side, a, b, c)| {
        super::sandwich::apply_move(
            &x,
            nmp,
            &super::sandwich::Move {
                side: *side,
                a: *a,
                b: *b,
                c: c.clone(),
            },
        )
    })
}
