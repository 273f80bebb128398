//! Finite-dimensional algebras given by structure constants in a field context, with the
//! element-level operations the structure theory needs: products, powers, polynomials in
//! an element, minimal polynomials, lifting idempotents over a nilpotent ideal, and the
//! structure constants of a subalgebra or of an algebra of linear maps (the centre, the
//! centroid) read off a basis in reduced form.
//!
//! Elements are coordinate vectors. Every linear system is solved by the engine (through
//! [`crate::linalg::subspace`]); products are exact in the field.

use crate::error::{Error, Result};
use crate::linalg::nullspace::SolveParams;
use crate::linalg::subspace::{Subspace, field_spec, kernel, span};
use crate::scalar::common_denominator;
use crate::scalar::{Field, Q};
use crate::tensor::{Table, Tensor};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Zero};

/// An algebra of dimension n over the field context `f` (see the module documentation).
#[derive(Clone, Debug)]
pub struct Alg<F: Field> {
    pub f: F,
    pub n: usize,
    pub table: Table<F::Elem>,
    /// Over Q, the structure constants over a common denominator, so that a product
    /// costs integer multiply-adds and one reduction per coordinate instead of a gcd per
    /// term (the constants of a user's dense basis have hundreds of bits).
    integer: Option<IntegerTable>,
}

/// Structure constants `c_abk = products[a n + b][k] / den` with integer numerators.
#[derive(Clone, Debug)]
struct IntegerTable {
    products: Vec<Vec<(usize, BigInt)>>,
    den: BigInt,
}

impl IntegerTable {
    fn new<F: Field>(f: &F, table: &Table<F::Elem>) -> Option<IntegerTable> {
        if f.characteristic() != 0 {
            return None;
        }
        let den = table
            .products
            .iter()
            .flatten()
            .fold(BigInt::one(), |acc, (_, c)| {
                acc.lcm(f.to_rational(c).denom())
            });
        let products = table
            .products
            .iter()
            .map(|row| {
                row.iter()
                    .map(|(k, c)| {
                        let q = f.to_rational(c);
                        (*k, q.numer() * (&den / q.denom()))
                    })
                    .collect()
            })
            .collect();
        Some(IntegerTable { products, den })
    }

    /// A vector of rationals as integers over a common denominator.
    fn integer_vector<F: Field>(f: &F, x: &[F::Elem]) -> (Vec<BigInt>, BigInt) {
        let q: Vec<Q> = x.iter().map(|c| f.to_rational(c)).collect();
        let den = common_denominator(q.iter());
        let ints = q.iter().map(|c| c.numer() * (&den / c.denom())).collect();
        (ints, den)
    }

    /// `x y` over Q. Cost: O(|supp x| |supp y| nnz per product) big-integer multiply-adds
    /// and n reductions.
    fn mul<F: Field>(
        &self,
        f: &F,
        n: usize,
        out_len: usize,
        x: &[F::Elem],
        y: &[F::Elem],
    ) -> Vec<F::Elem> {
        let (xi, dx) = Self::integer_vector(f, x);
        let (yi, dy) = Self::integer_vector(f, y);
        let mut acc = vec![BigInt::zero(); out_len];
        for (i, a) in xi.iter().enumerate() {
            if a.is_zero() {
                continue;
            }
            for (j, b) in yi.iter().enumerate() {
                if b.is_zero() {
                    continue;
                }
                let s = a * b;
                for (k, c) in &self.products[i * n + j] {
                    acc[*k] += &s * c;
                }
            }
        }
        let den = dx * dy * &self.den;
        acc.into_iter()
            .map(|a| {
                f.from_rational(&Q::new(a, den.clone()))
                    .expect("a rational in Q")
            })
            .collect()
    }
}

impl<F: Field> Alg<F> {
    /// The algebra of a tensor (an algebra or a square map read on its left basis), in the
    /// field context f matching the tensor's field.
    pub fn from_tensor(f: &F, t: &Tensor) -> Self {
        let table = t.table(f);
        Alg {
            f: f.clone(),
            n: t.dim(),
            integer: IntegerTable::new(f, &table),
            table,
        }
    }

    /// The algebra with the given products of basis elements (dense vectors).
    pub fn from_products(f: &F, n: usize, product: impl Fn(usize, usize) -> Vec<F::Elem>) -> Self {
        let mut products = Vec::with_capacity(n * n);
        for a in 0..n {
            for b in 0..n {
                products.push(
                    product(a, b)
                        .into_iter()
                        .enumerate()
                        .filter(|(_, c)| !f.is_zero(c))
                        .collect(),
                );
            }
        }
        let table = Table {
            dims: [n; 3],
            products,
        };
        Alg {
            f: f.clone(),
            n,
            integer: IntegerTable::new(f, &table),
            table,
        }
    }

    /// The structure constants of a subalgebra with a basis in reduced form, read at the
    /// pivots from the products computed by `mul` (which must land in the subalgebra: the
    /// caller knows it is closed, or sets `check` to verify every product exactly).
    pub fn subalgebra(
        f: &F,
        sub: &Subspace<F::Elem>,
        mul: impl Fn(&[F::Elem], &[F::Elem]) -> Vec<F::Elem>,
        check: bool,
    ) -> Result<Self> {
        let k = sub.dim();
        let mut prods = Vec::with_capacity(k * k);
        for a in 0..k {
            for b in 0..k {
                let p = mul(&sub.basis[a], &sub.basis[b]);
                if check && !sub.contains(f, &p) {
                    return Err(Error::Invalid(
                        "internal error: a product left the subalgebra".into(),
                    ));
                }
                prods.push(sub.coords(&p));
            }
        }
        Ok(Alg::from_products(f, k, |a, b| prods[a * k + b].clone()))
    }

    /// The algebra as a tensor over `field` (names `prefix0, prefix1, ...`).
    pub fn to_tensor(&self, prefix: &str) -> Tensor {
        let names = (0..self.n).map(|i| format!("{prefix}{i}")).collect();
        let mut t = Tensor::algebra(field_spec(&self.f), names);
        for a in 0..self.n {
            for b in 0..self.n {
                let row: Vec<(usize, Q)> = self
                    .table
                    .product(a, b)
                    .iter()
                    .map(|(k, c)| (*k, self.f.to_rational(c)))
                    .collect();
                t.set_product(a, b, row);
            }
        }
        t
    }

    pub fn zero(&self) -> Vec<F::Elem> {
        vec![self.f.zero(); self.n]
    }

    /// Basis element i.
    pub fn basis(&self, i: usize) -> Vec<F::Elem> {
        crate::linalg::subspace::unit_vector(&self.f, self.n, i)
    }

    pub fn mul(&self, x: &[F::Elem], y: &[F::Elem]) -> Vec<F::Elem> {
        match &self.integer {
            Some(it) => it.mul(&self.f, self.table.dims[1], self.table.dims[2], x, y),
            None => self.table.mul(&self.f, x, y),
        }
    }

    pub fn add(&self, x: &[F::Elem], y: &[F::Elem]) -> Vec<F::Elem> {
        x.iter().zip(y).map(|(a, b)| self.f.add(a, b)).collect()
    }

    pub fn sub(&self, x: &[F::Elem], y: &[F::Elem]) -> Vec<F::Elem> {
        x.iter().zip(y).map(|(a, b)| self.f.sub(a, b)).collect()
    }

    pub fn scale(&self, c: &F::Elem, x: &[F::Elem]) -> Vec<F::Elem> {
        x.iter().map(|a| self.f.mul(c, a)).collect()
    }

    pub fn is_zero(&self, x: &[F::Elem]) -> bool {
        x.iter().all(|a| self.f.is_zero(a))
    }

    /// `sum_i c_i e_i`-style combination of elements.
    pub fn combine(&self, coefs: &[F::Elem], elems: &[Vec<F::Elem>]) -> Vec<F::Elem> {
        let mut out = self.zero();
        for (c, e) in coefs.iter().zip(elems) {
            if self.f.is_zero(c) {
                continue;
            }
            for (o, x) in out.iter_mut().zip(e) {
                self.f.add_mul_assign(o, c, x);
            }
        }
        out
    }

    /// True when every pair of basis elements commutes.
    pub fn is_commutative(&self) -> bool {
        (0..self.n)
            .all(|a| (a + 1..self.n).all(|b| self.table.product(a, b) == self.table.product(b, a)))
    }

    /// `(x y) z = x (y z)` for four seeded random triples with entries in -1000..=1000: a
    /// screen (false proves the algebra is not associative; true is evidence only).
    /// Cost: 4 products per triple.
    pub fn looks_associative(&self, seed: u64) -> bool {
        use rand::{Rng, SeedableRng};
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        (0..4).all(|_| {
            let mut draw = || -> Vec<F::Elem> {
                (0..self.n)
                    .map(|_| self.f.from_i64(rng.gen_range(-1000..=1000)))
                    .collect()
            };
            let (x, y, z) = (draw(), draw(), draw());
            self.mul(&self.mul(&x, &y), &z) == self.mul(&x, &self.mul(&y, &z))
        })
    }

    /// `x^e` with `x^0 = one`, by repeated squaring.
    pub fn pow(&self, x: &[F::Elem], mut e: u64, one: &[F::Elem]) -> Vec<F::Elem> {
        let mut r = one.to_vec();
        let mut b = x.to_vec();
        while e > 0 {
            if e & 1 == 1 {
                r = self.mul(&r, &b);
            }
            e >>= 1;
            if e > 0 {
                b = self.mul(&b, &b);
            }
        }
        r
    }

    /// `g(y)` for a polynomial g (constant term first), with `y^0 = one` (Horner).
    pub fn eval_poly(&self, g: &[F::Elem], y: &[F::Elem], one: &[F::Elem]) -> Vec<F::Elem> {
        let mut acc = self.zero();
        for c in g.iter().rev() {
            acc = self.mul(&acc, y);
            for (a, u) in acc.iter_mut().zip(one) {
                self.f.add_mul_assign(a, c, u);
            }
        }
        acc
    }

    /// The minimal polynomial of y (monic, constant term first) in the unital algebra
    /// generated by y with unit `one`: the monic g of least degree with `g(y) = 0`, found
    /// as a kernel element of least degree of the matrix of `one, y, ..., y^d`. `max_degree`
    /// bounds the degree (the dimension of a subalgebra with unit `one` containing y; at
    /// most n).
    pub fn min_poly(
        &self,
        y: &[F::Elem],
        one: &[F::Elem],
        max_degree: usize,
        params: &SolveParams,
    ) -> Result<Vec<F::Elem>> {
        let f = &self.f;
        let top = max_degree.min(self.n);
        let mut powers = vec![one.to_vec()];
        // degree bounds 1, 2, 4, ... (then top): the powers are computed only up to twice
        // the degree of the minimal polynomial, and each kernel is proven exactly
        let mut bound = 1;
        loop {
            let bound_now = bound.min(top);
            while powers.len() <= bound_now {
                let next = self.mul(powers.last().expect("a power"), y);
                powers.push(next);
            }
            let m = powers.len();
            // rows: one per coordinate, unknowns: the coefficients of the powers
            let rows: Vec<Vec<F::Elem>> = (0..self.n)
                .map(|c| powers.iter().map(|p| p[c].clone()).collect())
                .collect();
            let ker = kernel(f, &rows, m, params)?;
            // the kernel is in reduced form: its vector of least degree is the minimal
            // polynomial's coefficient vector
            let best = ker
                .basis
                .iter()
                .filter_map(|v| {
                    let d = v.iter().rposition(|x| !f.is_zero(x))?;
                    Some((d, v))
                })
                .min_by_key(|(d, _)| *d);
            if let Some((d, v)) = best {
                return Ok(crate::poly::monic(f, &v[..=d]));
            }
            if bound_now >= top {
                return Err(Error::Invalid(
                    "internal error: no minimal polynomial".into(),
                ));
            }
            bound *= 2;
        }
    }

    /// An idempotent congruent to x modulo a nilpotent ideal (x^2 - x nilpotent), by the
    /// iteration `x <- 3x^2 - 2x^3` (each step squares the defect; common practice, e.g.
    /// Curtis and Reiner 1962, sect. 54). Errors after 64 steps (x was not close to an
    /// idempotent).
    pub fn lift_idempotent(&self, x: &[F::Elem]) -> Result<Vec<F::Elem>> {
        let f = &self.f;
        let (three, two) = (f.from_i64(3), f.from_i64(2));
        let mut x = x.to_vec();
        for _ in 0..64 {
            let x2 = self.mul(&x, &x);
            if x2 == x {
                return Ok(x);
            }
            let x3 = self.mul(&x2, &x);
            x = self.sub(&self.scale(&three, &x2), &self.scale(&two, &x3));
        }
        Err(Error::Invalid(
            "internal error: an idempotent did not lift".into(),
        ))
    }
}

/// Composition `X Y` of tuples of linear maps stored blockwise in one vector (a map on a
/// space of dimension d takes d^2 coordinates `l d + i` for its entry `[l][i]`).
pub fn compose<F: Field>(f: &F, x: &[F::Elem], y: &[F::Elem], sizes: &[usize]) -> Vec<F::Elem> {
    let mut out = vec![f.zero(); x.len()];
    let mut off = 0;
    for &d in sizes {
        for l in 0..d {
            for m in 0..d {
                let a = &x[off + l * d + m];
                if f.is_zero(a) {
                    continue;
                }
                for i in 0..d {
                    f.add_mul_assign(&mut out[off + l * d + i], a, &y[off + m * d + i]);
                }
            }
        }
        off += d * d;
    }
    out
}

/// The identity tuple of maps on spaces of the given dimensions.
pub fn identity_maps<F: Field>(f: &F, sizes: &[usize]) -> Vec<F::Elem> {
    let total: usize = sizes.iter().map(|d| d * d).sum();
    let mut v = vec![f.zero(); total];
    let mut off = 0;
    for &d in sizes {
        for l in 0..d {
            v[off + l * d + l] = f.one();
        }
        off += d * d;
    }
    v
}

/// The algebra of a space of tuples of linear maps closed under composition (a centroid),
/// with a basis in reduced form: structure constants read at the pivots only (k^3 d work
/// instead of k^2 d^3). The caller knows the space is closed under composition.
pub fn map_algebra<F: Field>(f: &F, sub: &Subspace<F::Elem>, sizes: &[usize]) -> Alg<F> {
    let k = sub.dim();
    // position -> (offset of its block, d, l, i)
    let mut where_: Vec<(usize, usize, usize, usize)> = Vec::with_capacity(sub.ambient);
    let mut off = 0;
    for &d in sizes {
        for l in 0..d {
            for i in 0..d {
                where_.push((off, d, l, i));
            }
        }
        off += d * d;
    }
    Alg::from_products(f, k, |a, b| {
        let (x, y) = (&sub.basis[a], &sub.basis[b]);
        sub.pivots
            .iter()
            .map(|&pos| {
                let (off, d, l, i) = where_[pos];
                let mut s = f.zero();
                for m in 0..d {
                    let u = &x[off + l * d + m];
                    if !f.is_zero(u) {
                        f.add_mul_assign(&mut s, u, &y[off + m * d + i]);
                    }
                }
                s
            })
            .collect()
    })
}

/// The span of the products `e_i e_j` (rows of the result flattening).
pub fn products_span<F: Field>(
    f: &F,
    t: &Tensor,
    params: &SolveParams,
) -> Result<Subspace<F::Elem>> {
    let d = t.dims();
    let tab = t.table(f);
    let rows: Vec<Vec<F::Elem>> = tab
        .products
        .iter()
        .filter(|p| !p.is_empty())
        .map(|p| {
            let mut v = vec![f.zero(); d[2]];
            for (k, c) in p {
                v[*k] = c.clone();
            }
            v
        })
        .collect();
    span(f, &rows, d[2], params)
}
