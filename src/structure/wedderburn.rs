//! The Wedderburn components of an associative algebra: `A / rad A = S_1 x ... x S_t` with
//! each `S_i` simple, `S_i = M_{n_i}(D_i)` for a division algebra `D_i` whose centre is the
//! centre `K_i` of `S_i` (Wedderburn 1908; Curtis and Reiner 1962, Representation Theory of
//! Finite Groups and Associative Algebras, sect. 25-26).
//!
//! Method. The radical comes from [`crate::invariants::radical`] (every characteristic),
//! the quotient S from [`crate::invariants::quotient`]. The centre Z(S) is commutative and
//! semisimple; its field components ([`super::fields`]) are the centres `K_i` and their
//! idempotents `e_i` are the primitive central idempotents of S, so `S_i = S e_i`
//! (checked: idempotent, orthogonal, summing to the unit of S; `S e_i` is simple because S
//! is semisimple and its centre `Z e_i` is a field). `dim_F S_i = [K_i : F] N_i^2` with
//! `N_i = n_i m_i`, `m_i` the index of `D_i` (`dim_{K_i} D_i = m_i^2`).
//!
//! Deciding n and D:
//! - over GF(p) every finite division ring is a field (Wedderburn's little theorem), so
//!   `m = 1`, `n = N`, `D = K`;
//! - `N = 1`: `S_i = K_i`, a field;
//! - an element of `S_i` with a reducible minimal polynomial over F gives zero divisors,
//!   and its factors give idempotents `eps` of `S_i`; `dim S_i eps = [K:F] N (r m)` with r
//!   the reduced rank of eps, so m divides `N` and every such `r m`. When their gcd is 1,
//!   `m = 1`; when N is prime, any zero divisor gives `m = 1`;
//! - over Q with `N = 2` and `K = Q`, `S_i` is a quaternion algebra `(a, b)_Q`, decided by
//!   Hilbert symbols ([`super::quaternion`]).
//!
//! Otherwise n and D are reported as not decided, with what is known.

use super::algebra::Alg;
use super::fields::split_into_fields;
use super::quaternion::quaternion_is_division;
use crate::error::{Error, Result};
use crate::invariants::quotient::{QuotientMap, quotient_in};
use crate::invariants::{ElementSpace, element_space};
use crate::laws::find_unit;
use crate::linalg::nullspace::SolveParams;
use crate::linalg::subspace::{Subspace, field_spec, rank_of, reduce, span};
use crate::poly;
use crate::scalar::{Field, FieldSpec, Q};
use crate::tensor::{IntegralTensor, Tensor};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::Zero;
use rand::{Rng, SeedableRng};

/// One simple component `S_i = M_n(D)` of `A / rad A`.
#[derive(Clone, Debug)]
pub struct Component {
    /// The primitive central idempotent, in the coordinates of `A / rad A`.
    pub idempotent: Vec<Q>,
    /// `dim_F S_i`.
    pub dim: usize,
    /// `[K : F]` for the centre K of the component.
    pub centre_degree: usize,
    /// A defining polynomial of K over F (monic, irreducible) and the generator (in the
    /// coordinates of `A / rad A`) it is the minimal polynomial of.
    pub centre_poly: Vec<Q>,
    pub centre_generator: Vec<Q>,
    /// `N = n m = sqrt(dim / [K : F])`.
    pub n_times_index: usize,
    /// n, when decided.
    pub matrix_size: Option<usize>,
    /// `dim_F D = [K : F] m^2`, when decided.
    pub division_dim: Option<usize>,
    /// How n and D were decided, or what is known.
    pub reason: String,
}

/// The Wedderburn decomposition of `A / rad A`.
#[derive(Clone, Debug)]
pub struct Wedderburn {
    /// A basis of rad A (rationals; representatives over GF(p)).
    pub radical: Vec<Vec<Q>>,
    pub radical_dim: usize,
    pub radical_method: String,
    /// The basis names of `A / rad A` (the kept basis vectors of A).
    pub quotient_names: Vec<String>,
    pub components: Vec<Component>,
}

/// Parameters of [`wedderburn`].
#[derive(Clone, Debug)]
pub struct WedderburnParams {
    pub solve: SolveParams,
    pub seed: u64,
    /// Random elements tried per component in the search for zero divisors (over Q).
    pub tries: usize,
}

impl Default for WedderburnParams {
    fn default() -> Self {
        WedderburnParams {
            solve: SolveParams::default(),
            seed: 1,
            tries: 24,
        }
    }
}

/// The Wedderburn components of an associative algebra (the caller checks associativity).
/// Errors: those of the engine; an algebra whose semisimple quotient has no unit cannot
/// occur (a semisimple algebra is unital), so that is reported as an internal error.
pub fn wedderburn(t: &Tensor, params: &WedderburnParams) -> Result<Wedderburn> {
    crate::with_field!(t.field(), f => wedderburn_in(f, t, params))
}

fn wedderburn_in<F: Field>(f: &F, t: &Tensor, params: &WedderburnParams) -> Result<Wedderburn> {
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(t);
    let rad = crate::invariants::radical(t, &it, sp)?
        .ok_or_else(|| Error::Invalid("no radical over this field".into()))?;
    let rad_rows: Vec<Vec<F::Elem>> = (0..rad.space.dim())
        .map(|i| {
            rad.space
                .dense(i)
                .iter()
                .map(|x| f.from_rational(x).expect("in the field"))
                .collect()
        })
        .collect();
    let qm = QuotientMap::new(f, t.dim(), &rad_rows);
    let s = quotient_in(f, t, &qm);
    let mut out = Wedderburn {
        radical: rad.space.dense_basis(),
        radical_dim: rad.space.dim(),
        radical_method: rad.method.clone(),
        quotient_names: s.names()[0].clone(),
        components: Vec::new(),
    };
    let n = s.dim();
    if n == 0 {
        return Ok(out);
    }
    let sit = IntegralTensor::from_tensor(&s);
    let unit: Vec<F::Elem> = find_unit(&sit, sp)?
        .ok_or_else(|| Error::Invalid("internal error: A / rad A has no unit".into()))?
        .iter()
        .map(|x| f.from_rational(x).expect("in the field"))
        .collect();
    let salg = Alg::from_tensor(f, &s);
    let zspace = element_space(&sit, ElementSpace::Centre, sp)?;
    let zbasis: Vec<Vec<F::Elem>> = (0..zspace.dim())
        .map(|i| {
            zspace
                .dense(i)
                .iter()
                .map(|x| f.from_rational(x).expect("in the field"))
                .collect()
        })
        .collect();
    let zsub = reduce(f, n, zbasis);
    let zalg = Alg::subalgebra(f, &zsub, |x, y| salg.mul(x, y), true)?;
    let zone = zsub.coords(&unit);
    let parts = split_into_fields(&zalg, &zone, sp, params.seed)?;
    // exact checks in S: idempotent, orthogonal, sum = 1
    let idems: Vec<Vec<F::Elem>> = parts
        .iter()
        .map(|p| zsub.combine(f, &p.idempotent))
        .collect();
    let mut sum = salg.zero();
    for (i, a) in idems.iter().enumerate() {
        sum = salg.add(&sum, a);
        for (j, b) in idems.iter().enumerate() {
            let p = salg.mul(a, b);
            if (i == j && p != *a) || (i != j && !salg.is_zero(&p)) {
                return Err(Error::Invalid(
                    "internal error: central idempotents failed their check".into(),
                ));
            }
        }
    }
    if sum != unit {
        return Err(Error::Invalid(
            "internal error: central idempotents do not add up to 1".into(),
        ));
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    let filter = ModularFilter::new(&s);
    for (part, e) in parts.iter().zip(&idems) {
        let comp_space = span(
            f,
            &(0..n)
                .map(|j| salg.mul(&salg.basis(j), e))
                .collect::<Vec<_>>(),
            n,
            sp,
        )?;
        let dim = comp_space.dim();
        let k = part.degree;
        let nn = if dim % k == 0 {
            let q2 = dim / k;
            let r = num_integer::Roots::sqrt(&q2);
            (r * r == q2).then_some(r)
        } else {
            None
        };
        let Some(big_n) = nn else {
            return Err(Error::Invalid(format!(
                "internal error: a simple component of dimension {dim} over a centre of \
                 degree {k}"
            )));
        };
        let (matrix_size, division_dim, reason) = decide_shape(
            f,
            &salg,
            e,
            &comp_space,
            k,
            big_n,
            params,
            &filter,
            &mut rng,
        )?;
        out.components.push(Component {
            idempotent: poly::to_rationals(f, e),
            dim,
            centre_degree: k,
            centre_poly: part.poly.clone(),
            centre_generator: poly::to_rationals(f, &zsub.combine(f, &part.generator)),
            n_times_index: big_n,
            matrix_size,
            division_dim,
            reason,
        });
    }
    out.components.sort_by_key(|c| (c.dim, c.centre_degree));
    Ok(out)
}

/// Decide n and dim D of a component (see the module documentation).
#[allow(clippy::too_many_arguments)]
fn decide_shape<F: Field>(
    f: &F,
    s: &Alg<F>,
    e: &[F::Elem],
    comp: &Subspace<F::Elem>,
    k: usize,
    big_n: usize,
    params: &WedderburnParams,
    filter: &ModularFilter,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Result<(Option<usize>, Option<usize>, String)> {
    let sp = &params.solve;
    if field_spec(f) != FieldSpec::Rational {
        return Ok((
            Some(big_n),
            Some(k),
            "over a finite field every division algebra is a field (Wedderburn's little \
             theorem)"
                .into(),
        ));
    }
    if big_n == 1 {
        return Ok((
            Some(1),
            Some(k),
            "the component is its centre, a field".into(),
        ));
    }
    // zero divisors and idempotents from minimal polynomials of elements
    let mut g = big_n;
    let mut zero_divisor = false;
    let d = comp.dim();
    for attempt in 0..s.n + params.tries {
        // the projections of the basis elements, then random elements of the component
        let y = if attempt < s.n {
            s.mul(&s.basis(attempt), e)
        } else {
            let c: Vec<F::Elem> = (0..d).map(|_| f.from_i64(rng.gen_range(-3..=3))).collect();
            comp.combine(f, &c)
        };
        if s.is_zero(&y) || filter.irreducible(f, &y, e, d, sp)? {
            continue;
        }
        let mp = s.min_poly(&y, e, d, sp)?;
        let fac = poly::factor(FieldSpec::Rational, &poly::to_rationals(f, &mp))?;
        if fac.is_irreducible() {
            continue;
        }
        zero_divisor = true;
        if fac.factors.len() > 1 {
            // the idempotent of the first factor's primary part
            let (g1, m1) = &fac.factors[0];
            let g1 = poly::from_rationals(f, g1).expect("in the field");
            let mut g1m = poly::one(f);
            for _ in 0..*m1 {
                g1m = poly::mul(f, &g1m, &g1);
            }
            let cof = poly::divrem(f, &mp, &g1m).0;
            let (_, a, _) = poly::ext_gcd(f, &cof, &g1m);
            let h = poly::rem(f, &poly::mul(f, &a, &cof), &mp);
            let eps = s.eval_poly(&h, &y, e);
            let prods: Vec<Vec<F::Elem>> = comp.basis.iter().map(|b| s.mul(b, &eps)).collect();
            let r = rank_of(f, &prods, s.n, sp)?;
            if r % (k * big_n) == 0 {
                g = g.gcd(&(r / (k * big_n)));
            }
        }
        if g == 1 || is_prime_usize(big_n) {
            return Ok((
                Some(big_n),
                Some(k),
                "a zero divisor and the ranks of idempotents show the index is 1".into(),
            ));
        }
    }
    if big_n == 2 && k == 1 && !zero_divisor {
        return quaternion_shape(f, s, e, comp);
    }
    let what = if zero_divisor {
        format!("not a division algebra; the index divides {g}")
    } else {
        "no zero divisor found".to_string()
    };
    Ok((
        None,
        None,
        format!("not decided: n times the index of D is {big_n}; {what}"),
    ))
}

fn is_prime_usize(n: usize) -> bool {
    crate::scalar::is_prime(n as u64)
}

/// A quaternion algebra over Q given as a component (see the module documentation).
fn quaternion_shape<F: Field>(
    f: &F,
    s: &Alg<F>,
    e: &[F::Elem],
    comp: &Subspace<F::Elem>,
) -> Result<(Option<usize>, Option<usize>, String)> {
    // reduced trace: trd(y) = Tr(L_y on the component) / 2
    let trd2 = |y: &[F::Elem]| {
        let mut t = f.zero();
        for (i, b) in comp.basis.iter().enumerate() {
            t = f.add(&t, &comp.coords(&s.mul(y, b))[i]);
        }
        t
    };
    let half = f.inv(&f.from_i64(4)).expect("char 0");
    let scalar = |x: &[F::Elem]| -> Option<F::Elem> {
        // x = c e for some c
        let i = e.iter().position(|c| !f.is_zero(c))?;
        let c = f.mul(&x[i], &f.inv(&e[i])?);
        let ce: Vec<F::Elem> = e.iter().map(|u| f.mul(&c, u)).collect();
        (ce == x).then_some(c)
    };
    let not_decided = |why: &str| Ok((None, None, format!("not decided: {why}")));
    // i: a pure quaternion (trace 0, not a scalar), j = iy - yi (anticommutes with i), for
    // y among the projections of the basis of S (short vectors in the user's basis);
    // a = i^2 and b = j^2 as integers of their square classes (numerator times
    // denominator), tried from the smallest so that their factorisation is cheap
    let pure = |y: &[F::Elem]| {
        let t = f.mul(&trd2(y), &half); // trd(y) / 2
        s.sub(y, &e.iter().map(|u| f.mul(&t, u)).collect::<Vec<_>>())
    };
    let projections: Vec<Vec<F::Elem>> = (0..s.n)
        .map(|t| s.mul(&s.basis(t), e))
        .filter(|y| !s.is_zero(y))
        .collect();
    let class = |x: &F::Elem| {
        let q = f.to_rational(x);
        q.numer() * q.denom()
    };
    // the pure quaternions i of the projections, smallest a first; for the first few, the
    // anticommuting j = iy - yi, smallest b first
    let mut is: Vec<(u64, Vec<F::Elem>, BigInt)> = Vec::new();
    for y in &projections {
        let i = pure(y);
        if s.is_zero(&i) {
            continue;
        }
        let Some(a) = scalar(&s.mul(&i, &i)) else {
            return not_decided("a pure quaternion does not square to a scalar");
        };
        let ca = class(&a);
        if ca.is_zero() {
            return Ok((Some(2), Some(1), "a nonzero nilpotent element".into()));
        }
        is.push((ca.bits(), i, ca));
    }
    is.sort_by_key(|x| x.0);
    let mut pairs: Vec<(u64, Q, Q)> = Vec::new();
    for (abits, i, ca) in is.iter().take(3) {
        for y2 in &projections {
            let j = s.sub(&s.mul(i, y2), &s.mul(y2, i));
            if s.is_zero(&j) {
                continue;
            }
            let Some(b) = scalar(&s.mul(&j, &j)) else {
                return not_decided("an anticommuting element does not square to a scalar");
            };
            let cb = class(&b);
            if cb.is_zero() {
                return Ok((Some(2), Some(1), "a nonzero nilpotent element".into()));
            }
            pairs.push((
                abits + cb.bits(),
                Q::from_integer(ca.clone()),
                Q::from_integer(cb),
            ));
        }
    }
    if pairs.is_empty() {
        return not_decided("no pure quaternion with an anticommuting element found");
    }
    pairs.sort_by_key(|p| p.0);
    pairs.dedup_by(|x, y| x.1 == y.1 && x.2 == y.2);
    let mut last = None;
    let squarefree = |x: Q| {
        super::quaternion::square_decomposition(x.numer()).map_or(x, |(d, _)| Q::from_integer(d))
    };
    for (_, a, b) in pairs.into_iter().take(8) {
        // (a, b)_Q depends on the square classes only
        let (a, b) = (squarefree(a), squarefree(b));
        let sym = format!(
            "the quaternion algebra ({}, {})_Q (Hilbert symbols)",
            crate::scalar::q_to_string(&a),
            crate::scalar::q_to_string(&b)
        );
        match quaternion_is_division(&a, &b) {
            Some(true) => return Ok((Some(1), Some(4), format!("a division algebra: {sym}"))),
            Some(false) => return Ok((Some(2), Some(1), format!("split, M_2(Q): {sym}"))),
            None => last = Some(sym),
        }
    }
    not_decided(&format!(
        "{}, a number could not be factored",
        last.unwrap_or_default()
    ))
}

/// A cheap test before an exact minimal polynomial over Q: the minimal polynomial modulo a
/// word prime. For all but finitely many primes it is the reduction of the minimal
/// polynomial over Q, so when it is irreducible the exact one is almost surely irreducible
/// too and the element is skipped (skipping never makes a result wrong: only elements
/// whose exact minimal polynomial is reducible decide anything).
struct ModularFilter {
    alg: Option<(crate::scalar::PrimeField, Alg<crate::scalar::PrimeField>)>,
}

impl ModularFilter {
    fn new(s: &Tensor) -> Self {
        if s.field() != FieldSpec::Rational {
            return ModularFilter { alg: None };
        }
        let alg = crate::linalg::nullspace::cached_primes()
            .iter()
            .find_map(|&p| s.with_field(FieldSpec::Prime(p)).ok().map(|t| (p, t)))
            .map(|(p, t)| {
                let fp = crate::scalar::PrimeField::new(p).expect("prime");
                let a = Alg::from_tensor(&fp, &t);
                (fp, a)
            });
        ModularFilter { alg }
    }

    /// True when the minimal polynomial of y modulo the prime is irreducible.
    fn irreducible<F: Field>(
        &self,
        f: &F,
        y: &[F::Elem],
        e: &[F::Elem],
        d: usize,
        sp: &SolveParams,
    ) -> Result<bool> {
        let Some((fp, a)) = &self.alg else {
            return Ok(false);
        };
        let red = |v: &[F::Elem]| -> Option<Vec<u64>> {
            v.iter()
                .map(|x| fp.from_rational(&f.to_rational(x)))
                .collect()
        };
        let (Some(yp), Some(ep)) = (red(y), red(e)) else {
            return Ok(false);
        };
        let g = a.min_poly(&yp, &ep, d, sp)?;
        let (_, fs) = crate::poly::finite::factor_mod_p(fp, &g)?;
        Ok(fs.len() == 1 && fs[0].1 == 1)
    }
}
