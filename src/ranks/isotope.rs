//! Unital isotopes, which carry the Alder-Strassen bound to bilinear maps.
//!
//! Let T: U x V -> W be bilinear with dim U = dim V = dim W = n, and u0 in U, v0 in V such
//! that `L = T(u0, .)`: V -> W and `R = T(., v0)`: U -> W are invertible. The product
//!
//! ```text
//! x o y = T(R^-1 x, L^-1 y)   on W, with unit e = T(u0, v0)
//! ```
//!
//! is T after the change of bases (R^-1, L^-1, id) of its three spaces (an isotope of T;
//! Albert 1942, "Non-associative algebras I: fundamental concepts and isotopy", Ann. of
//! Math. 43), so it has the same tensor rank. If T is isotopic to an associative algebra
//! A with unit, T(u, v) = h(f(u) g(v)), then this isotope is associative and isomorphic to
//! A: in the coordinates of h it reads X o Y = X c Y with c = (f(u0) g(v0))^-1 invertible,
//! and X -> X c is an isomorphism onto A (from memory; a short computation). So one unital
//! isotope decides whether the Alder-Strassen bound applies, and gives the same t(A).
//!
//! u0 and v0 are searched among small integer vectors (basis vectors first); a slice is
//! accepted when it is invertible modulo a prime (then also over Q), and the isotope is
//! built exactly over the tensor's field.

use super::alder_strassen::alder_strassen;
use super::bound::{Bound, BoundsParams};
use crate::linalg::{Matrix, inverse, rank};
use crate::scalar::{Field, FieldSpec, PrimeField, Q};
use crate::tensor::{Kind, Tensor};
use num_traits::Zero;
use rand::{Rng, SeedableRng};

/// A unital isotope of `t` with the elements that define it.
#[derive(Clone, Debug)]
pub struct Isotope {
    /// The algebra `x o y = T(R^-1 x, L^-1 y)` on the result space.
    pub algebra: Tensor,
    /// `u0` (left factor) and `v0` (right factor), as integers.
    pub u0: Vec<i64>,
    pub v0: Vec<i64>,
}

impl Isotope {
    /// A scheme of `t` from a scheme `s` of this isotope: `T(a, b) = (R a) o (L b)` with
    /// `R = T(., v0)`, `L = T(u0, .)`, so the left forms `α` become `α R`, the right forms
    /// `β` become `β L`, the results stay; the same rank. `None` when a coefficient has
    /// no image in t's field. Not verified here (callers verify). Cost: O(r n^2).
    pub fn pull_back(
        &self,
        t: &Tensor,
        s: &crate::scheme::Scheme,
    ) -> Option<crate::scheme::Scheme> {
        let n = t.dims()[0];
        let field = t.field();
        let rationals = crate::scalar::Rationals;
        let r = slice_matrix(&rationals, t, 1, &self.v0);
        let l = slice_matrix(&rationals, t, 0, &self.u0);
        let through = |x: &[Q], m: &Matrix<Q>| -> Option<Vec<Q>> {
            (0..n)
                .map(|i| {
                    let s: Q = x.iter().enumerate().map(|(k, a)| a * &m[(k, i)]).sum();
                    crate::scheme::reduce_into(field, &s).ok()
                })
                .collect()
        };
        let mut out = crate::scheme::Scheme::empty(field, t.dims());
        for k in 0..s.rank() {
            out.push(through(&s.u[k], &r)?, through(&s.v[k], &l)?, s.w[k].clone());
        }
        Some(out)
    }
}

/// Candidate factors: basis vectors, sums of two, then seeded small random vectors.
fn candidates(n: usize, seed: u64) -> Vec<Vec<i64>> {
    let mut out = Vec::new();
    for i in 0..n {
        let mut v = vec![0; n];
        v[i] = 1;
        out.push(v);
    }
    for i in 0..n.min(6) {
        for j in i + 1..n.min(6) {
            let mut v = vec![0; n];
            v[i] = 1;
            v[j] = 1;
            out.push(v);
        }
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    for round in 0..24 {
        let b = if round < 12 { 1 } else { 3 };
        out.push((0..n).map(|_| rng.gen_range(-b..=b)).collect());
    }
    out
}

/// The slice matrix of `t` along `axis` (0: `T(u, .)`, rows the result, columns the right
/// factor; 1: `T(., v)`, columns the left factor) contracted with `c`, over `f`.
pub(crate) fn slice_matrix<F: Field>(f: &F, t: &Tensor, axis: usize, c: &[i64]) -> Matrix<F::Elem> {
    let n = t.dims()[2];
    let mut m = Matrix::zeros(f, n, n);
    for (i, j, k, v) in t.entries() {
        let (s, col) = if axis == 0 { (i, j) } else { (j, i) };
        if c[s] != 0 {
            let x = f.mul(
                &f.from_i64(c[s]),
                &f.from_rational(v).expect("in the field"),
            );
            m[(k, col)] = f.add(&m[(k, col)], &x);
        }
    }
    m
}

/// A factor whose slice along `axis` is invertible (checked modulo a prime over Q).
fn invertible_factor(t: &Tensor, axis: usize, seed: u64) -> Option<Vec<i64>> {
    let n = t.dims()[2];
    let p = match t.field() {
        FieldSpec::Rational => crate::linalg::nullspace::cached_primes()[0],
        FieldSpec::Prime(q) => q,
    };
    let fp = PrimeField::new(p)?;
    candidates(n, seed ^ axis as u64)
        .into_iter()
        .find(|c| rank(&fp, &slice_matrix(&fp, t, axis, c)) == n)
}

/// The factors `u0`, `v0` of a unital isotope of a tensor with three equal dimensions,
/// or why none was found. Cost: a few n x n slice ranks modulo a prime.
fn isotope_factors(t: &Tensor) -> Result<(Vec<i64>, Vec<i64>), String> {
    let d = t.dims();
    if d[0] != d[1] || d[1] != d[2] {
        return Err(format!(
            "the dimensions {}x{}x{} are not equal, so no algebra is isotopic to it",
            d[0], d[1], d[2]
        ));
    }
    let u0 = invertible_factor(t, 0, 11).ok_or("no invertible left slice was found")?;
    let v0 = invertible_factor(t, 1, 12).ok_or("no invertible right slice was found")?;
    Ok((u0, v0))
}

/// A unital isotope of a tensor with three equal dimensions, or why none was found.
/// Cost: a few slice ranks modulo a prime, two exact n x n inverses and O(n^4) field
/// operations.
pub fn unital_isotope(t: &Tensor) -> Result<Isotope, String> {
    let (u0, v0) = isotope_factors(t)?;
    isotope_with(t, u0, v0)
}

/// The isotope with the factors `u0`, `v0` (invertible slices), exactly over t's field.
fn isotope_with(t: &Tensor, u0: Vec<i64>, v0: Vec<i64>) -> Result<Isotope, String> {
    let algebra = crate::with_field!(t.field(), f => build(f, t, &u0, &v0, t.field()))
        .ok_or("a slice that is invertible modulo a prime is singular (internal error)")?;
    debug_assert_eq!(algebra.dim(), t.dims()[2]);
    Ok(Isotope { algebra, u0, v0 })
}

/// Over Q: why the isotope with factors `u0`, `v0` is not associative, when its reduction
/// modulo a prime p already is not (with a failing triple of basis elements). The
/// reduction of a p-integral associative algebra is associative, so a failure modulo p
/// proves that the isotope over Q is not associative. Cost: O(n^4) operations modulo p and
/// the law check of the reduction; it spares the O(n^4) operations on growing fractions
/// of the exact isotope when the answer is no.
fn nonassociative_reduction(t: &Tensor, u0: &[i64], v0: &[i64]) -> Option<String> {
    if t.field() != FieldSpec::Rational {
        return None;
    }
    let p = crate::linalg::nullspace::cached_primes()[0];
    let fp = PrimeField::new(p)?;
    let p_integral = t
        .entries()
        .all(|(_, _, _, v)| fp.from_rational(v).is_some());
    if !p_integral {
        return None;
    }
    let reduced = build(&fp, t, u0, v0, FieldSpec::Prime(p))?;
    let params = crate::laws::Params {
        laws: vec![crate::laws::Law::Associative],
        stop_first: true,
        ..Default::default()
    };
    let report = crate::laws::check_laws(&reduced, &params).ok()?;
    let r = report.get(crate::laws::Law::Associative)?;
    if r.holds != Some(false) {
        return None;
    }
    let at = r
        .witness
        .as_ref()
        .map(|w| format!(" (at {})", w.expression))
        .unwrap_or_default();
    Some(format!(
        "its reduction modulo {p} is not associative{at}, so neither is the isotope over Q"
    ))
}

/// The constants `c'[x][y][z] = sum_ij Rinv[i][x] Linv[j][y] c[i][j][z]`.
/// The isotope is written over `out_field` (the tensor's field, or GF(p) for a reduction).
fn build<F: Field>(
    f: &F,
    t: &Tensor,
    u0: &[i64],
    v0: &[i64],
    out_field: FieldSpec,
) -> Option<Tensor> {
    let n = t.dims()[0];
    let linv = inverse(f, &slice_matrix(f, t, 0, u0))?; // j x k -> rows j (right factor)
    let rinv = inverse(f, &slice_matrix(f, t, 1, v0))?; // rows i (left factor)
    // t1[x][j][z] = sum_i Rinv[i][x] c[i][j][z]
    let mut t1 = vec![f.zero(); n * n * n];
    for (i, j, z, v) in t.entries() {
        let c = f.from_rational(v).expect("in the field");
        for x in 0..n {
            let r = &rinv[(i, x)];
            if !f.is_zero(r) {
                f.add_mul_assign(&mut t1[(x * n + j) * n + z], r, &c);
            }
        }
    }
    let names: Vec<String> = t.names()[2].clone();
    let mut out = Tensor::algebra(out_field, names);
    for x in 0..n {
        for y in 0..n {
            let mut row = vec![f.zero(); n];
            for j in 0..n {
                let l = &linv[(j, y)];
                if f.is_zero(l) {
                    continue;
                }
                for (z, o) in row.iter_mut().enumerate() {
                    f.add_mul_assign(o, l, &t1[(x * n + j) * n + z]);
                }
            }
            let row: Vec<(usize, Q)> = row
                .iter()
                .enumerate()
                .map(|(z, e)| (z, f.to_rational(e)))
                .filter(|(_, q)| !q.is_zero())
                .collect();
            out.set_product(x, y, row);
        }
    }
    Some(out)
}

/// The Alder-Strassen bound through a unital isotope (see the module documentation).
/// Cost: [`unital_isotope`] plus [`alder_strassen`] on the isotope.
pub fn alder_strassen_of_isotope(t: &Tensor, params: &BoundsParams) -> Result<Bound, String> {
    let n = t.dims()[2];
    if n > params.max_isotope_dim {
        return Err(format!(
            "no isotope is tried above dimension {}",
            params.max_isotope_dim
        ));
    }
    let (u0, v0) = isotope_factors(t)?;
    let show = |v: &[i64]| {
        v.iter()
            .map(|x| x.to_string())
            .collect::<Vec<_>>()
            .join(",")
    };
    let how = format!(
        "the unital isotope x o y = T(R^-1 x, L^-1 y), L = T(u0, .), R = T(., v0), u0 = ({}), v0 = ({})",
        show(&u0),
        show(&v0)
    );
    if let Some(why) = nonassociative_reduction(t, &u0, &v0) {
        return Err(format!(
            "{how}: {why}, so T is not isotopic to an associative algebra with unit"
        ));
    }
    let iso = isotope_with(t, u0, v0)?;
    match alder_strassen(&iso.algebra, params) {
        Ok(mut b) => {
            if t.kind() == Kind::Algebra {
                b.detail = format!(
                    "{how} (the algebra itself is not unital associative); {}",
                    b.detail
                );
            } else {
                b.detail = format!("through {how}, which has the same rank; {}", b.detail);
            }
            Ok(b)
        }
        Err(why) if why.starts_with("the algebra is not associative") => Err(format!(
            "{how}: {why}, so T is not isotopic to an associative algebra with unit"
        )),
        Err(why) => Err(format!("{how}: {why}")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::matmul;

    #[test]
    fn matrix_multiplication_is_isotopic_to_the_matrix_algebra() {
        // <n,n,n> is isotopic to M_n: R(<2,2,2>) >= 2*4 - 1 = 7 and R(<3,3,3>) >= 17
        // (Alder and Strassen 1981, On the algorithmic complexity of associative algebras)
        let p = BoundsParams::default();
        assert_eq!(
            alder_strassen_of_isotope(&matmul(2, 2, 2), &p)
                .unwrap()
                .value,
            7
        );
        assert_eq!(
            alder_strassen_of_isotope(&matmul(3, 3, 3), &p)
                .unwrap()
                .value,
            17
        );
        let gf3 = matmul(2, 2, 2).with_field(FieldSpec::Prime(3)).unwrap();
        assert_eq!(alder_strassen_of_isotope(&gf3, &p).unwrap().value, 7);
        // the octonions are not isotopic to an associative algebra
        let o = crate::generators::generate("octonions").unwrap();
        assert!(alder_strassen_of_isotope(&o, &p).is_err());
        // non-square shapes have no isotope
        assert!(unital_isotope(&matmul(2, 2, 3)).is_err());
    }
}
