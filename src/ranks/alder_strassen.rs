//! The Alder-Strassen bound: for an associative algebra A with unit over a field F,
//! R(A) >= 2 dim A - t(A), where t(A) is the number of maximal two-sided ideals of A
//! (Alder and Strassen 1981, "On the algorithmic complexity of associative algebras",
//! Theoret. Comput. Sci. 15). A bound on the rank over F itself (t(A) depends on F).
//!
//! t(A) = number of simple components of A/rad A. rad A comes from the shared invariants
//! ([`crate::invariants::radical`]: Dickson's trace-form criterion over Q, the method of
//! Cohen, Ivanyos and Wales 1997 over GF(p), checked to be a nilpotent ideal). The simple
//! components of S = A/rad A correspond to those of its centre Z(S), a
//! commutative semisimple algebra. Over GF(p), t = dim of the fixed space of the Frobenius
//! z -> z^p on Z(S) (exact). Over Q, with a primitive element z of Z(S) whose minimal
//! polynomial f has degree dim Z(S), t = number of irreducible factors of f over Q,
//! factored exactly ([`crate::poly::factor`]); when that factorisation is over its work
//! limit, t <= the number of factors of f mod p for any prime p where f stays squarefree
//! of full degree (Gauss's lemma; counted by Berlekamp's matrix). Otherwise
//! t <= dim Z(S). The bound used on t is stated in the result.
//!
//! A bilinear map that is not an algebra is handled through its unital isotopes
//! ([`super::isotope`]): the rank does not change under a change of the three bases.

use super::bound::{Bound, BoundsParams, Measure, Method};
use crate::linalg::{Matrix, nullspace, rank, rref, solve};
use crate::scalar::{Field, PrimeField, Q};
use crate::tensor::{Kind, Tensor};
use rand::{Rng, SeedableRng};

/// The theorem, for reports.
pub const THEOREM: &str = "R(A) >= 2 dim A - t(A) for an associative algebra A with unit, \
     t(A) = number of maximal two-sided ideals (Alder and Strassen 1981, On the algorithmic \
     complexity of associative algebras, Theoret. Comput. Sci. 15)";

/// The Alder-Strassen bound for an associative algebra with unit, or why it does not apply.
pub fn alder_strassen(t: &Tensor, params: &BoundsParams) -> Result<Bound, String> {
    if t.kind() != Kind::Algebra {
        return Err(
            "the input is not an algebra (one basis for both factors and the result)".into(),
        );
    }
    let n = t.dim();
    if n > params.max_algebra_dim {
        return Err(format!(
            "dimension {n} is above the limit {}",
            params.max_algebra_dim
        ));
    }
    let (t_bound, how) = crate::with_field!(t.field(), f => count_components(f, t, params.seed))?;
    let value = (2 * n).saturating_sub(t_bound);
    Ok(Bound::proven(
        Method::AlderStrassen,
        value,
        Measure::Rank,
        t.field(),
        false,
        format!("dim A = {n}, {how}"),
    ))
}

/// Structure constants as a dense cube over a field: `c[(i*n + j)*n + k]`.
struct Alg<E> {
    n: usize,
    c: Vec<E>,
}

impl<E: Clone> Alg<E> {
    fn mul<F: Field<Elem = E>>(&self, f: &F, x: &[E], y: &[E]) -> Vec<E> {
        let n = self.n;
        let mut out = vec![f.zero(); n];
        for (i, xi) in x.iter().enumerate().filter(|(_, v)| !f.is_zero(v)) {
            for (j, yj) in y.iter().enumerate().filter(|(_, v)| !f.is_zero(v)) {
                let s = f.mul(xi, yj);
                for (k, o) in out.iter_mut().enumerate() {
                    let c = &self.c[(i * n + j) * n + k];
                    if !f.is_zero(c) {
                        f.add_mul_assign(o, &s, c);
                    }
                }
            }
        }
        out
    }
    fn unit_vec<F: Field<Elem = E>>(f: &F, n: usize, i: usize) -> Vec<E> {
        let mut v = vec![f.zero(); n];
        v[i] = f.one();
        v
    }
}

/// Returns (upper bound on t, explanation).
fn count_components<F: Field>(f: &F, t: &Tensor, seed: u64) -> Result<(usize, String), String> {
    let n = t.dim();
    let tab = t.table(f);
    let mut c = vec![f.zero(); n * n * n];
    for i in 0..n {
        for j in 0..n {
            for (k, v) in tab.product(i, j) {
                c[(i * n + j) * n + k] = v.clone();
            }
        }
    }
    let a = Alg { n, c };
    // associativity and the unit, by the shared law engine
    let lp = crate::laws::Params {
        laws: vec![crate::laws::Law::Associative],
        stop_first: true,
        ..Default::default()
    };
    let lr = crate::laws::check_laws(t, &lp).map_err(|e| e.to_string())?;
    match lr.get(crate::laws::Law::Associative) {
        Some(r) if r.holds == Some(true) => {}
        Some(r) if r.holds == Some(false) => {
            let w = r
                .witness
                .as_ref()
                .map(|w| format!(": {} = {}", w.expression, w.value));
            return Err(format!(
                "the algebra is not associative{}",
                w.unwrap_or_default()
            ));
        }
        _ => return Err("associativity was not decided".into()),
    }
    let it = crate::tensor::IntegralTensor::from_tensor(t);
    let sp = crate::linalg::nullspace::SolveParams::default();
    let one: Vec<F::Elem> = crate::laws::find_unit(&it, &sp)
        .map_err(|e| e.to_string())?
        .ok_or("the algebra has no unit element")?
        .iter()
        .map(|x| f.from_rational(x).expect("in the field"))
        .collect();
    // the radical by the shared invariants engine (Dickson's criterion in characteristic
    // 0, the method of Cohen, Ivanyos and Wales over GF(p)); a simple quotient settles t
    let r = crate::invariants::radical(t, &it, &sp)
        .map_err(|e| e.to_string())?
        .ok_or("no radical over this field")?;
    if r.quotient_centre_dim <= 1 {
        return Ok((
            1,
            format!(
                "dim rad A = {}, dim A/rad A = {}, dim Z(A/rad A) = {}, so t = 1 \
                 (A/rad A is simple)",
                r.space.dim(),
                r.quotient_dim,
                r.quotient_centre_dim
            ),
        ));
    }
    let rad: Vec<Vec<F::Elem>> = r
        .space
        .dense_basis()
        .iter()
        .map(|v| {
            v.iter()
                .map(|x| f.from_rational(x).expect("in field"))
                .collect()
        })
        .collect();
    // quotient S = A / rad: coordinates on the non-pivot columns of rref(rad)
    let mut rm = Matrix::from_rows(rad.clone(), n);
    let pivots = rref(f, &mut rm);
    let keep: Vec<usize> = (0..n).filter(|c| !pivots.contains(c)).collect();
    let ds = keep.len();
    let reduce = |x: &[F::Elem]| -> Vec<F::Elem> {
        let mut x = x.to_vec();
        for (r, &p) in pivots.iter().enumerate() {
            let c = x[p].clone();
            if !f.is_zero(&c) {
                for col in 0..n {
                    f.sub_mul_assign(&mut x[col], &c, &rm[(r, col)]);
                }
            }
        }
        keep.iter().map(|&i| x[i].clone()).collect()
    };
    let lift = |y: &[F::Elem]| -> Vec<F::Elem> {
        let mut x = vec![f.zero(); n];
        for (pos, &i) in keep.iter().enumerate() {
            x[i] = y[pos].clone();
        }
        x
    };
    let smul = |x: &[F::Elem], y: &[F::Elem]| reduce(&a.mul(f, &lift(x), &lift(y)));
    let s_one = reduce(&one);
    // centre of S: z with z s_j - s_j z = 0 for all j
    let mut cm = Matrix::zeros(f, ds * ds, ds);
    for zi in 0..ds {
        let ez = Alg::<F::Elem>::unit_vec(f, ds, zi);
        for j in 0..ds {
            let sj = Alg::<F::Elem>::unit_vec(f, ds, j);
            let l = smul(&ez, &sj);
            let r = smul(&sj, &ez);
            for k in 0..ds {
                cm[(j * ds + k, zi)] = f.sub(&l[k], &r[k]);
            }
        }
    }
    let centre = nullspace(f, &cm);
    let dz = centre.len();
    let head = format!(
        "dim rad A = {}, dim A/rad A = {ds}, dim Z(A/rad A) = {dz}",
        rad.len()
    );
    if dz <= 1 {
        return Ok((dz.max(1), format!("{head}, so t = 1 (A/rad A is simple)")));
    }
    let p = f.characteristic();
    if p != 0 {
        // Frobenius fixed points on the centre: t = dim ker(F - I)
        let zmat = Matrix::from_rows(centre.clone(), ds).transpose(); // ds x dz
        let mut fm = Matrix::zeros(f, dz, dz);
        for (col, z) in centre.iter().enumerate() {
            let zp = pow_in(z, p, &s_one, &smul);
            let coords = solve(f, &zmat, &zp).ok_or("Frobenius left the centre")?;
            for r in 0..dz {
                fm[(r, col)] = coords[r].clone();
            }
        }
        for i in 0..dz {
            fm[(i, i)] = f.sub(&fm[(i, i)], &f.one());
        }
        let tt = dz - rank(f, &fm);
        return Ok((
            tt,
            format!("{head}, t = {tt} (fixed points of Frobenius on the centre, exact)"),
        ));
    }
    // characteristic 0: a primitive element of the centre and its minimal polynomial
    // candidates: the centre's basis vectors (small minimal polynomials, cheap to factor:
    // x^n - 1 for a cyclic group algebra), then random combinations, small ones first
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    for attempt in 0..dz + 8 {
        let mut z = vec![f.zero(); ds];
        for (k, b) in centre.iter().enumerate() {
            let c = f.from_i64(match attempt {
                a if a < dz => i64::from(a == k),
                a if a < dz + 4 => rng.gen_range(-3..=3),
                _ => rng.gen_range(-50..=50),
            });
            for (zi, bi) in z.iter_mut().zip(b) {
                f.add_mul_assign(zi, &c, bi);
            }
        }
        let mut powers = vec![s_one.clone()];
        for _ in 0..dz {
            let next = smul(powers.last().expect("nonempty"), &z);
            powers.push(next);
        }
        let pm = Matrix::from_rows(powers.clone(), ds).transpose(); // ds x (dz+1)
        let ker = nullspace(f, &pm);
        // minimal polynomial has degree dz iff z^0..z^{dz-1} are independent
        if ker.len() != 1 || rank(f, &Matrix::from_rows(powers[..dz].to_vec(), ds)) != dz {
            continue;
        }
        let coeffs: Vec<Q> = ker[0].iter().map(|x| f.to_rational(x)).collect();
        // exact: the irreducible factors over Q (Zassenhaus); the count modulo primes
        // bounds it when the factorisation is over its work limit
        if let Ok(fs) = crate::poly::factor(crate::scalar::FieldSpec::Rational, &coeffs) {
            let r = fs.factors.len();
            return Ok((
                r,
                format!(
                    "{head}, t = {r} (irreducible factors over Q of the minimal polynomial of a primitive element of the centre, exact)"
                ),
            ));
        }
        if let Some((r, prime)) = min_factor_count(&coeffs) {
            return Ok((
                r,
                format!(
                    "{head}, t <= {r} (factors mod {prime} of the minimal polynomial of a primitive element of the centre)"
                ),
            ));
        }
    }
    Ok((dz, format!("{head}, t <= dim Z(A/rad A) = {dz}")))
}

/// A product on coordinate vectors.
type Product<'a, E> = &'a dyn Fn(&[E], &[E]) -> Vec<E>;

/// `z^e` in an algebra with unit `one` and product `mul`, by repeated squaring.
fn pow_in<E: Clone>(z: &[E], mut e: u64, one: &[E], mul: Product<'_, E>) -> Vec<E> {
    let mut r = one.to_vec();
    let mut b = z.to_vec();
    while e > 0 {
        if e & 1 == 1 {
            r = mul(&r, &b);
        }
        e >>= 1;
        if e > 0 {
            b = mul(&b, &b);
        }
    }
    r
}

/// The least number of irreducible factors of the integer polynomial proportional to
/// `coeffs` (low degree first) modulo primes where it keeps its degree and stays
/// squarefree: an upper bound for the number of its irreducible factors over Q.
/// Returns (count, prime) or `None` if no prime among the first few qualifies.
fn min_factor_count(coeffs: &[Q]) -> Option<(usize, u64)> {
    let ints = crate::poly::integer::primitive(coeffs);
    let d = ints.len().checked_sub(1)?;
    let mut best: Option<(usize, u64)> = None;
    for p in crate::scalar::word_primes(40)
        .into_iter()
        .chain([3u64, 5, 7, 11, 13, 17, 19, 23, 29, 31])
    {
        let Some(fp) = PrimeField::new(p) else {
            continue;
        };
        let poly: Vec<u64> = ints.iter().map(|x| fp.reduce_big(x)).collect();
        if poly[d] == 0 {
            continue;
        }
        let poly = crate::poly::monic(&fp, &poly);
        if !crate::poly::finite::is_squarefree_mod_p(&fp, &poly) {
            continue;
        }
        let r = berlekamp_count(&fp, &poly);
        if best.is_none_or(|b| r < b.0) {
            best = Some((r, p));
        }
        if r == 1 {
            break;
        }
    }
    best
}

/// Number of irreducible factors of a squarefree monic f over GF(p): d - rank(Q - I),
/// Q the matrix of x^i -> x^{ip} mod f (Berlekamp 1967).
fn berlekamp_count(fp: &PrimeField, f: &[u64]) -> usize {
    use crate::poly::{mulmod, one, powmod, rem, x};
    let d = f.len() - 1;
    let xp = powmod(fp, &x(fp), fp.modulus(), f);
    let mut m = Matrix::zeros(fp, d, d);
    let mut cur = rem(fp, &one(fp), f);
    for i in 0..d {
        for (j, c) in cur.iter().enumerate() {
            m[(i, j)] = *c;
        }
        m[(i, i)] = fp.sub(&m[(i, i)], &1);
        cur = mulmod(fp, &cur, &xp, f);
    }
    d - rank(fp, &m)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::FieldSpec;
    use crate::scheme::testkit::*;
    use num_traits::One;

    #[test]
    fn alder_strassen_complex_and_m2() {
        // Alder and Strassen 1981: R(C over Q) >= 2*2 - 1 = 3, R(M_2) >= 2*4 - 1 = 7.
        let p = BoundsParams::default();
        let b = alder_strassen(&complex(), &p).unwrap();
        assert_eq!(b.value, 3, "{}", b.detail);
        let b = alder_strassen(&m2_algebra(), &p).unwrap();
        assert_eq!(b.value, 7, "{}", b.detail);
        // Q x Q (two components): 2*2 - 2 = 2
        let mut qq = Tensor::algebra(FieldSpec::Rational, vec!["e1".into(), "e2".into()]);
        qq.set(0, 0, 0, Q::one());
        qq.set(1, 1, 1, Q::one());
        assert_eq!(alder_strassen(&qq, &p).unwrap().value, 2);
        // over GF(5), i^2 = -1 splits (2^2 = -1): two components, bound 2; over GF(7) a field: 3
        let c5 = complex().with_field(FieldSpec::Prime(5)).unwrap();
        assert_eq!(alder_strassen(&c5, &p).unwrap().value, 2);
        let c7 = complex().with_field(FieldSpec::Prime(7)).unwrap();
        assert_eq!(alder_strassen(&c7, &p).unwrap().value, 3);
        // dual numbers Q[e]/(e^2): rad = (e), t = 1, bound 3
        let mut dual = Tensor::algebra(FieldSpec::Rational, vec!["one".into(), "e".into()]);
        dual.set(0, 0, 0, Q::one());
        dual.set(0, 1, 1, Q::one());
        dual.set(1, 0, 1, Q::one());
        assert_eq!(alder_strassen(&dual, &p).unwrap().value, 3);
        // the built-in generators: complex numbers (t = 1) and Hamilton's quaternions, a
        // division algebra with centre Q (t = 1): 2*4 - 1 = 7 (Alder and Strassen 1981)
        let c = crate::generators::generate("complex").unwrap();
        assert_eq!(alder_strassen(&c, &p).unwrap().value, 3);
        let h = crate::generators::generate("quaternions").unwrap();
        assert_eq!(alder_strassen(&h, &p).unwrap().value, 7);
        // group algebras by their Wedderburn decompositions (common practice):
        // QS_3 = Q + Q + M_2(Q) (t = 3), QC_3 = Q + Q(w) (t = 2), QC_5 = Q + Q(z_5) (t = 2),
        // QD_4 = Q^4 + M_2(Q) (t = 5)
        for (spec, want) in [
            ("symmetric:3", 9),
            ("cyclic:3", 4),
            ("cyclic:5", 8),
            ("dihedral:4", 11),
        ] {
            let a = crate::generators::generate(spec).unwrap();
            assert_eq!(alder_strassen(&a, &p).unwrap().value, want, "{spec}");
        }
        // over GF(p) the radical comes from the characteristic-p method: F_2[C_4] is local
        // (t = 1), F_3[S_3] / rad = F_3 x F_3 (t = 2), F_2[S_3] / rad = F_2 x M_2(F_2)
        // (t = 2); Brauer theory, common practice
        for (spec, prime, want) in [
            ("cyclic:4", 2u64, 7),
            ("symmetric:3", 3, 10),
            ("symmetric:3", 2, 10),
        ] {
            let a = crate::generators::generate(spec)
                .unwrap()
                .with_field(FieldSpec::Prime(prime))
                .unwrap();
            assert_eq!(
                alder_strassen(&a, &p).unwrap().value,
                want,
                "{spec} mod {prime}"
            );
        }
        // not an algebra
        assert!(alder_strassen(&matmul(2, 2, 2), &p).is_err());
    }
}
