//! What emitted code computes: the three straight-line programs of a scheme (the CSE
//! programs of [`crate::scheme::cost`]) with their coefficients in the form the target
//! arithmetic needs, and the input range that keeps integer arithmetic free of overflow.
//!
//! - *Exact* (over Q, the default): every temporary and every left and right form is
//!   scaled to a primitive integer combination (`x + 3/2 y` becomes `2x + 3y`, the form
//!   `1/2 a0 + 1/2 a1` becomes `a0 + a1`); a product of scaled forms is the product times a
//!   known rational; each output form is scaled by the least common denominator `D_k` of its
//!   coefficients and divided by `D_k` exactly at the end (the division is exact because
//!   the output is an integer for integer inputs). When the tensor itself has non-integral
//!   constants, output k holds `den_k * c_k` with `den_k` the common denominator of its
//!   constants.
//! - *Float*: the field programs, coefficients rounded to the nearest double.
//! - *Modular* (over GF(p)): the field programs, coefficients in `0..p`.
//!
//! Overflow bound (exact): every variable is a linear form in the inputs; for inputs with
//! `|a_i|, |b_j| <= X` every partial sum of a left or right expression is at most `K1 X`
//! and every product, output expression and partial sum on the output side at most
//! `K2 X^2`, with K1 and K2 computed exactly from the coefficients (triangle inequality).
//! Code over a signed type with largest value M is overflow-free for
//! `X <= min(M / K1, sqrt(M / K2))`.

use crate::scalar::{FieldSpec, Q};
use crate::scheme::Scheme;
use crate::scheme::cost::{Form, LinearProgram, programs};
use crate::tensor::Tensor;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};

/// The arithmetic of emitted code.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Arith {
    /// Exact integers (over Q) or residues mod p (over GF(p)).
    Exact,
    /// Floating point (over Q only), rational coefficients rounded once.
    Float,
}

/// The three programs in the target arithmetic (see the module docs).
#[derive(Clone, Debug)]
pub struct Plan {
    pub field: FieldSpec,
    pub arith: Arith,
    /// Over the left inputs; final form t is the left factor of product t.
    pub left: LinearProgram,
    pub right: LinearProgram,
    /// Over the products; final form k gives result k (before `out_mul`, `out_div`).
    pub out: LinearProgram,
    /// Exact only: output k is `form_k * out_mul[k] / out_div[k]` (1 and 1 otherwise).
    pub out_mul: Vec<BigInt>,
    pub out_div: Vec<BigInt>,
    /// Exact only: output k holds `out_scale[k] * c_k` (1 unless the tensor has
    /// non-integral constants).
    pub out_scale: Vec<BigInt>,
    /// Exact only: the constants K1 and K2 of the overflow bound.
    pub k1: BigInt,
    pub k2: BigInt,
    /// Exact only: bounds (in units of X) of the left and right factor of every product.
    pub left_norms: Vec<BigInt>,
    pub right_norms: Vec<BigInt>,
}

fn lcm_of_denominators<'a>(cs: impl Iterator<Item = &'a Q>) -> BigInt {
    crate::scalar::common_denominator(cs)
}

/// Rewrite a program whose input variable i holds `input_scale[i]` times the original
/// input, so that every temporary is a primitive integer combination. Final forms are
/// made primitive (`primitive`) or only cleared of denominators. Returns the integral
/// program and, per final form, the factor `lambda` with `integral value = lambda * value`.
fn integralize(p: &LinearProgram, input_scale: &[Q], primitive: bool) -> (LinearProgram, Vec<Q>) {
    let mut scale: Vec<Q> = input_scale.to_vec();
    let rescale = |f: &Form, scale: &[Q], primitive: bool| -> (Form, Q) {
        let e: Vec<(usize, Q)> = f.iter().map(|(i, c)| (*i, c / &scale[*i])).collect();
        if e.is_empty() {
            return (e, Q::one());
        }
        let den = lcm_of_denominators(e.iter().map(|x| &x.1));
        let mut lambda = Q::from_integer(den);
        if primitive {
            let g = e.iter().fold(BigInt::zero(), |g, (_, c)| g.gcd(c.numer()));
            lambda /= Q::from_integer(g);
            if e[0].1.is_negative() {
                lambda = -lambda;
            }
        }
        let out = e.into_iter().map(|(i, c)| (i, c * &lambda)).collect();
        (out, lambda)
    };
    let mut temps = Vec::with_capacity(p.temps.len());
    for t in &p.temps {
        let (f, l) = rescale(t, &scale, true);
        temps.push(f);
        scale.push(l);
    }
    let mut forms = Vec::with_capacity(p.forms.len());
    let mut lambdas = Vec::with_capacity(p.forms.len());
    for f in &p.forms {
        let (f, l) = rescale(f, &scale, primitive);
        forms.push(f);
        lambdas.push(l);
    }
    (
        LinearProgram {
            inputs: p.inputs,
            temps,
            forms,
        },
        lambdas,
    )
}

/// Bounds of a program's variables (`var_bound`, in units of the input bound) and the
/// largest bound of a partial sum of any of its expressions.
fn program_bounds(p: &LinearProgram, input_bound: &[BigInt]) -> (Vec<BigInt>, BigInt) {
    let mut nb: Vec<BigInt> = input_bound.to_vec();
    let mut worst = BigInt::zero();
    let expr = |f: &Form, nb: &[BigInt]| -> BigInt {
        f.iter()
            .map(|(i, c)| c.numer().abs() * &nb[*i])
            .fold(BigInt::zero(), |s, x| s + x)
    };
    for t in &p.temps {
        let e = expr(t, &nb);
        worst = worst.max(e.clone());
        nb.push(e);
    }
    let mut finals = Vec::with_capacity(p.forms.len());
    for f in &p.forms {
        let e = expr(f, &nb);
        worst = worst.max(e.clone());
        finals.push(e);
    }
    (finals, worst)
}

impl Plan {
    /// Build the plan of a scheme for `t` in `arith` (Float only over Q).
    /// Cost: the CSE of [`programs`] plus O(size of the programs) big-integer operations.
    pub fn new(s: &Scheme, t: &Tensor, arith: Arith) -> Plan {
        let [left, right, out] = programs(s);
        let d2 = s.dims[2];
        let ones = vec![BigInt::one(); d2];
        let exact_q = arith == Arith::Exact && s.field == FieldSpec::Rational;
        if !exact_q {
            return Plan {
                field: s.field,
                arith,
                left,
                right,
                out,
                out_mul: ones.clone(),
                out_div: ones.clone(),
                out_scale: ones,
                k1: BigInt::zero(),
                k2: BigInt::zero(),
                left_norms: Vec::new(),
                right_norms: Vec::new(),
            };
        }
        let (left, lam) = integralize(&left, &vec![Q::one(); s.dims[0]], true);
        let (right, mu) = integralize(&right, &vec![Q::one(); s.dims[1]], true);
        let prod_scale: Vec<Q> = lam.iter().zip(&mu).map(|(a, b)| a * b).collect();
        let (out, dens) = integralize(&out, &prod_scale, false);
        // den_k: common denominator of the tensor's constants of result k
        let mut out_scale = vec![BigInt::one(); d2];
        for (_, _, k, c) in t.entries() {
            out_scale[k] = out_scale[k].lcm(c.denom());
        }
        let mut out_mul = Vec::with_capacity(d2);
        let mut out_div = Vec::with_capacity(d2);
        for k in 0..d2 {
            let dk = dens[k].to_integer();
            let g = dk.gcd(&out_scale[k]);
            out_mul.push(&out_scale[k] / &g);
            out_div.push(&dk / &g);
        }
        // overflow constants
        let (lf, lw) = program_bounds(&left, &vec![BigInt::one(); s.dims[0]]);
        let (rf, rw) = program_bounds(&right, &vec![BigInt::one(); s.dims[1]]);
        let k1 = lw.max(rw);
        let mb: Vec<BigInt> = lf.iter().zip(&rf).map(|(a, b)| a * b).collect();
        let (of, ow) = program_bounds(&out, &mb);
        let mut k2 = ow;
        for x in &mb {
            k2 = k2.max(x.clone());
        }
        for (k, e) in of.iter().enumerate() {
            k2 = k2.max(e * &out_mul[k]);
        }
        Plan {
            field: s.field,
            arith,
            left,
            right,
            out,
            out_mul,
            out_div,
            out_scale,
            k1,
            k2,
            left_norms: lf,
            right_norms: rf,
        }
    }

    /// True when the code is exact integer code over Q (scaled programs).
    pub fn integral(&self) -> bool {
        self.arith == Arith::Exact && self.field == FieldSpec::Rational
    }

    /// The largest X such that inputs with `|a_i|, |b_j| <= X` keep every intermediate of
    /// the exact code within `max` in absolute value (see the module docs).
    pub fn max_input(&self, max: &BigInt) -> BigInt {
        let lin = if self.k1.is_zero() {
            max.clone()
        } else {
            max / &self.k1
        };
        let quad = if self.k2.is_zero() {
            max.clone()
        } else {
            (max / &self.k2).sqrt()
        };
        lin.min(quad).min(max.clone())
    }

    /// The largest magnitude of a number the code writes (coefficients, output factors
    /// and divisors).
    pub fn largest_constant(&self) -> BigInt {
        let progs = [&self.left, &self.right, &self.out];
        let coefs = progs
            .iter()
            .flat_map(|p| p.temps.iter().chain(&p.forms).flatten())
            .map(|(_, c)| c.numer().abs().max(c.denom().clone()));
        coefs
            .chain(self.out_mul.iter().cloned())
            .chain(self.out_div.iter().cloned())
            .fold(BigInt::zero(), |m, x| m.max(x))
    }

    /// Exact divisions performed by the code (outputs with a divisor other than 1).
    pub fn divisions(&self) -> usize {
        self.out_div.iter().filter(|d| !d.is_one()).count()
    }

    /// Additions and multiplications by constants other than +-1 that the code performs
    /// (constants: in the three programs, plus the output factors `out_mul`).
    pub fn operation_counts(&self) -> (usize, usize) {
        let unit = |c: &Q| crate::scheme::cost::is_unit(self.field, c);
        let progs = [&self.left, &self.right, &self.out];
        let adds = progs.iter().map(|p| p.additions()).sum();
        let mut scal: usize = progs
            .iter()
            .flat_map(|p| p.temps.iter().chain(&p.forms).flatten())
            .filter(|(_, c)| !unit(c))
            .count();
        scal += self.out_mul.iter().filter(|m| !m.is_one()).count();
        (adds, scal)
    }
}

/// The largest value of a signed integer type with `bits` bits: `2^(bits-1) - 1`.
pub fn signed_max(bits: u32) -> BigInt {
    (BigInt::one() << (bits - 1)) - 1
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use crate::scheme::cost::evaluate;
    use crate::scheme::testkit::*;

    #[test]
    fn integral_programs_compute_scaled_products() {
        // Toom-3 style fractions: a scheme for poly:2,2 with halves
        let t = polymul(2);
        let s = scheme(
            "m1 = a0*b0\nm2 = a1*b1\nm3 = (1/2 a0 + 1/2 a1)*(2/3 b0 + 2/3 b1)\n\
             c0 = m1\nc1 = 3 m3 - m1 - m2\nc2 = m2\n",
            &t,
        );
        assert!(crate::scheme::verify(&s, &t).is_ok());
        let p = Plan::new(&s, &t, Arith::Exact);
        assert!(p.integral());
        for prog in [&p.left, &p.right, &p.out] {
            for f in prog.temps.iter().chain(&prog.forms) {
                assert!(f.iter().all(|(_, c)| c.is_integer()), "{f:?}");
            }
        }
        // evaluate the integral code on integers and compare with the tensor
        let a = [q(3, 1), q(-7, 1)];
        let b = [q(5, 1), q(11, 1)];
        let l = evaluate(&p.left, &a);
        let r = evaluate(&p.right, &b);
        let m: Vec<Q> = l.iter().zip(&r).map(|(x, y)| x * y).collect();
        let o = evaluate(&p.out, &m);
        let c: Vec<Q> = o
            .iter()
            .enumerate()
            .map(|(k, x)| {
                x * Q::from_integer(p.out_mul[k].clone()) / Q::from_integer(p.out_div[k].clone())
            })
            .collect();
        assert_eq!(c, t.multiply(&a, &b));
        // bounds: |c| <= 2 X^2 etc.; a positive finite range
        let x = p.max_input(&signed_max(64));
        assert!(x > BigInt::from(1_000_000_000u64));
    }

    #[test]
    fn exact_plans_of_dense_rational_tables_in_a_users_basis() {
        // the complex numbers and a 3 x 3 polynomial product after a seeded random change of
        // basis with big entries: dense rational constants; the standard scheme (one
        // product per constant) has rational coefficients everywhere, and the integral
        // plan must give den_k * c_k exactly for big integer inputs
        use crate::tensor::{change_basis, random_invertible};
        use rand::{Rng, SeedableRng};
        for (t0, seed) in [(complex(), 1u64), (polymul(3), 2)] {
            let d = t0.dims();
            let [p, r, s_] = [0, 1, 2].map(|a| random_invertible(d[a], 1000, seed * 10 + a as u64));
            let t = change_basis(&t0, &p, &r, &s_).unwrap();
            assert!(t.entries().any(|(_, _, _, c)| !c.is_integer()));
            let s = crate::scheme::Scheme::standard(&t);
            let plan = Plan::new(&s, &t, Arith::Exact);
            let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
            for _ in 0..20 {
                let a: Vec<Q> = (0..d[0])
                    .map(|_| {
                        Q::from_integer(rng.gen_range(-1_000_000_000i64..=1_000_000_000).into())
                    })
                    .collect();
                let b: Vec<Q> = (0..d[1])
                    .map(|_| {
                        Q::from_integer(rng.gen_range(-1_000_000_000i64..=1_000_000_000).into())
                    })
                    .collect();
                let l = evaluate(&plan.left, &a);
                let r = evaluate(&plan.right, &b);
                let m: Vec<Q> = l.iter().zip(&r).map(|(x, y)| x * y).collect();
                let o = evaluate(&plan.out, &m);
                let want = t.multiply(&a, &b);
                for k in 0..d[2] {
                    let got = &o[k] * Q::from_integer(plan.out_mul[k].clone());
                    // the exact division leaves no remainder
                    assert!((&got / Q::from_integer(plan.out_div[k].clone())).is_integer());
                    assert_eq!(
                        got / Q::from_integer(plan.out_div[k].clone()),
                        &want[k] * Q::from_integer(plan.out_scale[k].clone())
                    );
                }
            }
        }
    }
}
