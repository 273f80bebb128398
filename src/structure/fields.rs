//! Commutative semisimple algebras split into their field components, and the decision
//! whether an algebra with unit is a field.
//!
//! A commutative semisimple algebra Z over F is a product of fields `K_1 x ... x K_s`; its
//! primitive idempotents cut out the factors. They are found by factoring minimal
//! polynomials: for an element y of a factor `e Z`, with minimal polynomial
//! `g = g_1 ... g_r` (squarefree, since Z is semisimple), the Chinese remainder theorem in
//! `F[y] = F[x]/(g)` gives orthogonal idempotents `e_j = h_j(y)` with `h_j = 1 mod g_j`,
//! `h_j = 0 mod g / g_j`, summing to e (common practice).
//!
//! - Over GF(p) the Frobenius `z -> z^p` is GF(p)-linear on Z and its fixed points are
//!   `GF(p)^s` (one coordinate per factor); splitting by each basis element of the fixed
//!   space leaves exactly the primitive idempotents (Berlekamp's idea, Berlekamp 1967).
//! - Over Q, basis elements and then seeded random combinations are tried until every
//!   factor is *certified* a field: an element whose minimal polynomial is irreducible
//!   of degree `dim e Z` generates `e Z = F[x]/(g)`, a field.
//!
//! Every field component comes with its degree over F, a generator and its (irreducible)
//! minimal polynomial: a defining polynomial of the field.

use super::algebra::Alg;
use crate::error::{Error, Result};
use crate::linalg::nullspace::SolveParams;
use crate::linalg::subspace::{field_spec, kernel, span};
use crate::poly::{self, Factorisation, integer::primitive};
use crate::scalar::{Field, FieldSpec, Q};
use num_traits::{Signed, Zero};
use rand::{Rng, SeedableRng};

/// One field component `e Z` of a commutative semisimple algebra Z.
#[derive(Clone, Debug)]
pub struct FieldPart<E> {
    /// The primitive idempotent e (coordinates in Z).
    pub idempotent: Vec<E>,
    /// `dim e Z`: the degree of the field over the ground field.
    pub degree: usize,
    /// A generator of the field (an element of `e Z`).
    pub generator: Vec<E>,
    /// Its minimal polynomial, monic and irreducible (rationals; representatives over
    /// GF(p)): a defining polynomial of the field.
    pub poly: Vec<Q>,
}

/// Random candidates tried per component before giving up (over Q).
const MAX_TRIES: usize = 200;

/// The factorisation of the minimal polynomial of y (in an algebra of dimension `dim`
/// with unit e); an error when a factor is repeated (the algebra is not semisimple).
fn factor_min_poly<F: Field>(
    z: &Alg<F>,
    y: &[F::Elem],
    e: &[F::Elem],
    dim: usize,
    params: &SolveParams,
) -> Result<(Vec<F::Elem>, Factorisation)> {
    let f = &z.f;
    let g = z.min_poly(y, e, dim, params)?;
    let fac = poly::factor(field_spec(f), &poly::to_rationals(f, &g))?;
    if fac.factors.iter().any(|(_, m)| *m > 1) {
        return Err(Error::Invalid(
            "the algebra is not semisimple (a minimal polynomial has a repeated factor)".into(),
        ));
    }
    Ok((g, fac))
}

/// The orthogonal idempotents `h_j(y)` of the factors of g (see the module documentation),
/// one per distinct irreducible factor `g_j` of multiplicity `a_j`: `h_j = 1 mod g_j^a_j`,
/// `h_j = 0 mod g / g_j^a_j`. They sum to the unit e of `F[y]`.
pub(crate) fn crt_idempotents<F: Field>(
    z: &Alg<F>,
    y: &[F::Elem],
    e: &[F::Elem],
    g: &[F::Elem],
    fac: &Factorisation,
) -> Vec<Vec<F::Elem>> {
    let f = &z.f;
    fac.factors
        .iter()
        .map(|(gj, a)| {
            let gj = poly::from_rationals(f, gj).expect("a factor in the field");
            let gj = (1..*a).fold(gj.clone(), |acc, _| poly::mul(f, &acc, &gj));
            let cofactor = poly::divrem(f, g, &gj).0;
            let (_, s, _) = poly::ext_gcd(f, &cofactor, &gj);
            let h = poly::rem(f, &poly::mul(f, &s, &cofactor), g);
            z.eval_poly(&h, y, e)
        })
        .collect()
}

/// The field components of a commutative semisimple algebra with unit `one` (see the
/// module documentation). Errors: Z is not semisimple, or (over Q, never observed) no
/// certificate within the tries allowed.
pub fn split_into_fields<F: Field>(
    z: &Alg<F>,
    one: &[F::Elem],
    params: &SolveParams,
    seed: u64,
) -> Result<Vec<FieldPart<F::Elem>>> {
    if z.n == 0 {
        return Ok(Vec::new());
    }
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
    split_rec(z, one, params, &mut rng)
}

/// Split by the idempotents of a reducible minimal polynomial, then each factor `e Z`
/// (as an algebra of its own, basis in reduced form) recursively.
fn split_by<F: Field>(
    z: &Alg<F>,
    y: &[F::Elem],
    one: &[F::Elem],
    g: &[F::Elem],
    fac: &Factorisation,
    params: &SolveParams,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Result<Vec<FieldPart<F::Elem>>> {
    let f = &z.f;
    let mut out = Vec::new();
    for e in crt_idempotents(z, y, one, g, fac) {
        let prods: Vec<Vec<F::Elem>> = (0..z.n).map(|i| z.mul(&e, &z.basis(i))).collect();
        let sub = span(f, &prods, z.n, params)?;
        let ez = Alg::subalgebra(f, &sub, |a, b| z.mul(a, b), false)?;
        for part in split_rec(&ez, &sub.coords(&e), params, rng)? {
            out.push(FieldPart {
                idempotent: sub.combine(f, &part.idempotent),
                generator: sub.combine(f, &part.generator),
                ..part
            });
        }
    }
    Ok(out)
}

/// The candidates for generators and splitting elements: the basis, then seeded random
/// combinations with growing coefficients.
fn candidate<F: Field>(z: &Alg<F>, i: usize, rng: &mut rand_chacha::ChaCha8Rng) -> Vec<F::Elem> {
    if i < z.n {
        return z.basis(i);
    }
    let width: i64 = 3 + (i / z.n.max(1)) as i64;
    (0..z.n)
        .map(|_| z.f.from_i64(rng.gen_range(-width..=width)))
        .collect()
}

fn split_rec<F: Field>(
    z: &Alg<F>,
    one: &[F::Elem],
    params: &SolveParams,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Result<Vec<FieldPart<F::Elem>>> {
    let f = &z.f;
    let dim = z.n;
    if dim == 1 {
        return Ok(vec![FieldPart {
            idempotent: one.to_vec(),
            degree: 1,
            generator: one.to_vec(),
            poly: vec![-Q::from_integer(1.into()), Q::from_integer(1.into())],
        }]);
    }
    if let FieldSpec::Prime(p) = field_spec(f) {
        // the fixed points of Frobenius: kernel of z -> z^p - z, one dimension per factor
        let images: Vec<Vec<F::Elem>> = (0..dim)
            .map(|j| {
                let b = z.basis(j);
                z.sub(&z.pow(&b, p, one), &b)
            })
            .collect();
        let rows: Vec<Vec<F::Elem>> = (0..dim)
            .map(|i| images.iter().map(|v| v[i].clone()).collect())
            .collect();
        let fixed = kernel(f, &rows, dim, params)?;
        if fixed.dim() > 1 {
            for b in &fixed.basis {
                let (g, fac) = factor_min_poly(z, b, one, dim, params)?;
                if fac.factors.len() > 1 {
                    return split_by(z, b, one, &g, &fac, params, rng);
                }
            }
            return Err(Error::Invalid(
                "internal error: the Frobenius splitting did not separate the fields".into(),
            ));
        }
    }
    let mut best: Option<(Vec<F::Elem>, Vec<Q>)> = None;
    for i in 0..dim + MAX_TRIES {
        let y = candidate(z, i, rng);
        let (g, fac) = factor_min_poly(z, &y, one, dim, params)?;
        if fac.factors.len() > 1 {
            return split_by(z, &y, one, &g, &fac, params, rng);
        }
        if g.len() - 1 == dim {
            let gq = poly::to_rationals(f, &g);
            let better = match &best {
                None => true,
                Some((_, b)) => field_spec(f) == FieldSpec::Rational && height(&gq) < height(b),
            };
            if better {
                best = Some((y, gq));
            }
        }
        // a certificate from a basis element is kept only after all basis elements were
        // seen (the smallest polynomial among them); a random one is taken at once
        if i + 1 >= dim
            && let Some((generator, poly)) = best.take()
        {
            let (generator, poly) = normalise_quadratic(z, one, generator, poly);
            return Ok(vec![FieldPart {
                idempotent: one.to_vec(),
                degree: dim,
                generator,
                poly,
            }]);
        }
    }
    Err(Error::Invalid(
        "could not certify the field components (no primitive element found)".into(),
    ))
}

/// Over Q, a generator y of a quadratic field with minimal polynomial `x^2 + c1 x + c0`
/// is replaced by `y' = (v / m)(y + c1 / 2)`, a root of `x^2 - D` with D a squarefree
/// integer, the usual defining polynomial of `Q(sqrt D)` (common practice): with
/// `(y + c1/2)^2 = u / v` in lowest terms and `u v = D m^2`
/// ([`super::quaternion::square_decomposition`]). Unchanged when `u v` cannot be so
/// decomposed, over GF(p) and in other degrees.
fn normalise_quadratic<F: Field>(
    z: &Alg<F>,
    one: &[F::Elem],
    y: Vec<F::Elem>,
    g: Vec<Q>,
) -> (Vec<F::Elem>, Vec<Q>) {
    let f = &z.f;
    if g.len() != 3 || field_spec(f) != FieldSpec::Rational {
        return (y, g);
    }
    let t = &g[1] / Q::from_integer(2.into());
    let delta = &t * &t - &g[0];
    let Some((d, m)) = super::quaternion::square_decomposition(&(delta.numer() * delta.denom()))
    else {
        return (y, g);
    };
    let scale = Q::new(delta.denom().clone(), m);
    let Some((tf, sf)) = f.from_rational(&t).zip(f.from_rational(&scale)) else {
        return (y, g);
    };
    let shifted = z.add(&y, &one.iter().map(|u| f.mul(&tf, u)).collect::<Vec<_>>());
    let y2: Vec<F::Elem> = shifted.iter().map(|c| f.mul(&sf, c)).collect();
    // checked exactly: y'^2 = D
    let Some(df) = f.from_rational(&Q::from_integer(d.clone())) else {
        return (y, g);
    };
    let d_one: Vec<F::Elem> = one.iter().map(|u| f.mul(&df, u)).collect();
    if z.mul(&y2, &y2) != d_one {
        return (y, g);
    }
    let poly = vec![-Q::from_integer(d), Q::zero(), Q::from_integer(1.into())];
    (y2, poly)
}

/// The size of a rational polynomial: the largest coefficient of its primitive integer
/// form, then its number of digits.
fn height(g: &[Q]) -> (usize, num_bigint::BigInt) {
    let z = primitive(g);
    let m = z.iter().map(|c| c.abs()).max().unwrap_or_default();
    (m.bits() as usize, m)
}

/// Whether a finite-dimensional algebra with unit is a field, with the evidence.
#[derive(Clone, Debug, PartialEq)]
pub enum FieldDecision {
    /// A field of this degree over the ground field; a defining polynomial (monic,
    /// irreducible) and the generator it belongs to, as coordinates.
    Field { degree: usize, poly: Vec<Q> },
    /// Not a field, and why (two elements that do not commute, a nonzero nilpotent
    /// element, a nontrivial idempotent).
    NotField(String),
}

/// Decide whether the algebra `c` (with unit `one`) is a field: it must be commutative,
/// with zero radical, with a single field component. Cost: the radical of a k-dimensional
/// algebra and the splitting of [`split_into_fields`].
pub fn field_decision<F: Field>(
    c: &Alg<F>,
    one: &[F::Elem],
    params: &SolveParams,
) -> Result<FieldDecision> {
    if c.n == 1 {
        return Ok(FieldDecision::Field {
            degree: 1,
            poly: vec![-Q::from_integer(1.into()), Q::from_integer(1.into())],
        });
    }
    if !c.is_commutative() {
        return Ok(FieldDecision::NotField("it is not commutative".into()));
    }
    let t = c.to_tensor("c");
    let it = crate::tensor::IntegralTensor::from_tensor(&t);
    let rad = crate::invariants::radical(&t, &it, params)?
        .ok_or_else(|| Error::Invalid("no radical over this field".into()))?;
    if rad.space.dim() > 0 {
        return Ok(FieldDecision::NotField(format!(
            "it has nonzero nilpotent elements (a radical of dimension {})",
            rad.space.dim()
        )));
    }
    // a quick witness first: c is semisimple here, so a basis element whose minimal
    // polynomial (of degree >= 2) has a small integer root r gives coprime factors x - r
    // and g / (x - r), hence a nontrivial idempotent (no factorisation needed)
    let f = &c.f;
    for i in 0..c.n {
        let g = c.min_poly(&c.basis(i), one, c.n, params)?;
        if g.len() < 3 {
            continue;
        }
        for r in [0i64, 1, -1, 2, -2] {
            if f.is_zero(&poly::eval(f, &g, &f.from_i64(r))) {
                return Ok(FieldDecision::NotField(format!(
                    "it has nontrivial idempotents (the minimal polynomial of basis element \
                     {}, of degree {}, has the root {r})",
                    i + 1,
                    g.len() - 1
                )));
            }
        }
    }
    let parts = split_into_fields(c, one, params, 0x5eed)?;
    if parts.len() > 1 {
        return Ok(FieldDecision::NotField(format!(
            "it has nontrivial idempotents ({} field components)",
            parts.len()
        )));
    }
    let p = &parts[0];
    Ok(FieldDecision::Field {
        degree: p.degree,
        poly: p.poly.clone(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{PrimeField, Rationals, q};

    /// Q[x]/(f) as an algebra, basis 1, x, ..., x^(d-1).
    fn quotient_alg<F: Field>(f: &F, g: &[i64]) -> Alg<F> {
        let d = g.len() - 1;
        let gf: Vec<F::Elem> = g.iter().map(|&c| f.from_i64(c)).collect();
        Alg::from_products(f, d, |a, b| {
            let mut m = vec![f.zero(); a + b + 1];
            m[a + b] = f.one();
            let r = poly::rem(f, &m, &gf);
            let mut v = vec![f.zero(); d];
            for (i, c) in r.into_iter().enumerate() {
                v[i] = c;
            }
            v
        })
    }

    #[test]
    fn splits_cyclotomic_algebras() {
        // Q[x]/(x^6 - 1) = Q x Q x Q(w) x Q(w): degrees 1, 1, 2, 2 (Q[C_6], common
        // practice: the cyclotomic fields Q(zeta_d), d | 6)
        let z = quotient_alg(&Rationals, &[-1, 0, 0, 0, 0, 0, 1]);
        let one = z.basis(0);
        let parts = split_into_fields(&z, &one, &SolveParams::default(), 1).unwrap();
        let mut degs: Vec<usize> = parts.iter().map(|p| p.degree).collect();
        degs.sort();
        assert_eq!(degs, vec![1, 1, 2, 2]);
        // the sum of the idempotents is 1
        let sum = parts
            .iter()
            .fold(z.zero(), |acc, p| z.add(&acc, &p.idempotent));
        assert_eq!(sum, one);
        // GF(2)[x]/(x^3 - 1) = GF(2) x GF(4) (x^3 - 1 = (x + 1)(x^2 + x + 1))
        let f2 = PrimeField::new(2).unwrap();
        let z = quotient_alg(&f2, &[1, 0, 0, 1]);
        let one = z.basis(0);
        let parts = split_into_fields(&z, &one, &SolveParams::default(), 1).unwrap();
        let mut degs: Vec<usize> = parts.iter().map(|p| p.degree).collect();
        degs.sort();
        assert_eq!(degs, vec![1, 2]);
        // GF(3)[x]/(x^3 - x) = GF(3)^3: three components of degree 1
        let f3 = PrimeField::new(3).unwrap();
        let z = quotient_alg(&f3, &[0, 2, 0, 1]);
        let parts = split_into_fields(&z, &z.basis(0), &SolveParams::default(), 1).unwrap();
        assert_eq!(parts.len(), 3);
    }

    #[test]
    fn field_decisions() {
        let p = SolveParams::default();
        // Q(sqrt 2) is a field of degree 2; Q[x]/(x^2) has a nilpotent; Q[x]/(x^2 - 1) an
        // idempotent (common practice)
        let z = quotient_alg(&Rationals, &[-2, 0, 1]);
        assert_eq!(
            field_decision(&z, &z.basis(0), &p).unwrap(),
            FieldDecision::Field {
                degree: 2,
                poly: vec![q(-2, 1), q(0, 1), q(1, 1)]
            }
        );
        let z = quotient_alg(&Rationals, &[0, 0, 1]);
        assert!(matches!(
            field_decision(&z, &z.basis(0), &p).unwrap(),
            FieldDecision::NotField(_)
        ));
        let z = quotient_alg(&Rationals, &[-1, 0, 1]);
        assert!(matches!(
            field_decision(&z, &z.basis(0), &p).unwrap(),
            FieldDecision::NotField(_)
        ));
        // GF(7)[x]/(x^2 + 1) = GF(49) (-1 is not a square mod 7)
        let f7 = PrimeField::new(7).unwrap();
        let z = quotient_alg(&f7, &[1, 0, 1]);
        assert!(matches!(
            field_decision(&z, &z.basis(0), &p).unwrap(),
            FieldDecision::Field { degree: 2, .. }
        ));
    }
}
