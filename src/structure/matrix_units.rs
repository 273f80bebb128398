//! An explicit splitting of a semisimple algebra A with unit over F (Q or GF(p)) into full
//! matrix algebras `M_k(F)` and fields: for each matrix part a system of matrix units
//! `E_ij` (written in A's basis) and the isomorphism onto `M_k(F)`, for each field part its
//! central primitive idempotent.
//!
//! Theorem (Wedderburn 1908; Curtis and Reiner 1962, Representation Theory of Finite
//! Groups and Associative Algebras, sect. 25-27): A is a product of simple algebras
//! `S_i = A c_i` (`c_i` the primitive idempotents of the centre), `S_i = M_k(D)`. When the
//! centre of `S_i` is F and `S_i` has a left ideal L of dimension `k = sqrt(dim S_i)`, L is
//! minimal, `S_i = M_k(F)`, and left multiplication on L in a basis of L,
//! `rho(s)_(jl) = coordinate j of s l_l`, is an isomorphism `S_i -> M_k(F)`; the matrix
//! units are `E_jl = rho^-1(e_jl)` (common practice).
//!
//! Method. The centre is the kernel of the commutators with the basis; its field
//! components ([`super::fields::split_into_fields`]) give the `c_i`. A part with centre of
//! degree `dim S_i` is a field. For a part with centre F, the left ideal L starts as `S_i`
//! and shrinks: an element y of `S_i` whose minimal polynomial (with unit `c_i`) has two
//! distinct irreducible factors gives orthogonal idempotents `e_j` by the Chinese remainder
//! theorem in `F[y]`, and L is replaced by `L ∩ A e_j` when that is a smaller nonzero left
//! ideal. An element with a simple rational eigenvalue gives a minimal left ideal at once.
//! Candidates for y are the products `b c_i` for the table's basis vectors b, sums and
//! differences of two, then seeded random combinations: a table's own basis vectors are the
//! likeliest to have small entries in a matrix basis, and so a rational eigenvalue. Over
//! GF(p) such y abound. Over Q the split is found when the table's basis has small entries
//! in some matrix basis (a random element of `M_k(Z)` with small entries often has a
//! rational eigenvalue), rarely when it has large ones; a division algebra part (the
//! quaternions) has no such element, and the answer is then `None`.
//!
//! Invariant: every part returned passed its exact check: the matrix units satisfy
//! `E_ij E_jl = E_il` and `E_ii E_jj = 0` for `i != j` (in an associative algebra these give
//! all relations `E_ij E_lm = δ_jl E_im`), and the parts' units sum to 1. The algebra's
//! associativity is the caller's to know (a scheme built on the split is verified against
//! the table in the end).

use super::algebra::Alg;
use super::fields::{crt_idempotents, split_into_fields};
use crate::error::Result;
use crate::invariants::{ElementSpace, element_space};
use crate::linalg::Matrix;
use crate::linalg::modular::inverse_exact;
use crate::linalg::nullspace::SolveParams;
use crate::linalg::subspace::{Subspace, field_spec, intersect, reduce, span};
use crate::poly;
use crate::scalar::Field;
use crate::tensor::IntegralTensor;
use rand::{Rng, SeedableRng};

/// Parameters of [`split_semisimple`].
#[derive(Clone, Debug)]
pub struct SplitParams {
    pub solve: SolveParams,
    /// Seed of the random candidates for splitting elements.
    pub seed: u64,
    /// Candidates tried per simple part before giving up.
    pub tries: usize,
}

impl Default for SplitParams {
    fn default() -> Self {
        SplitParams {
            solve: SolveParams::default(),
            seed: 1,
            tries: 400,
        }
    }
}

/// One simple part of a split semisimple algebra.
#[derive(Clone, Debug, PartialEq)]
pub enum SimplePart<E> {
    /// `M_k(F)`: the matrix units, `units[j k + l] = E_jl`, and the minimal left ideal
    /// (basis in reduced form) that defines the isomorphism ([`SimplePart::matrix_of`]),
    /// in A's coordinates.
    Matrix {
        size: usize,
        units: Vec<Vec<E>>,
        ideal: Subspace<E>,
    },
    /// A field of degree `degree` over F: the part `e A`, e its unit (a central primitive
    /// idempotent, in A's coordinates).
    Field { idempotent: Vec<E>, degree: usize },
}

impl<E: Clone + PartialEq> SimplePart<E> {
    /// The dimension of the part over F.
    pub fn dim(&self) -> usize {
        match self {
            SimplePart::Matrix { size, .. } => size * size,
            SimplePart::Field { degree, .. } => *degree,
        }
    }

    /// For a matrix part, the `k x k` matrix (row-major) of the projection of `x` (any
    /// element of A) onto the part: `x c = sum_jl m_jl E_jl` with
    /// `m_jl = coordinate j of x l_l` in the ideal's reduced basis; `None` for a field
    /// part. Cost: k products in A.
    pub fn matrix_of<F: Field<Elem = E>>(&self, a: &Alg<F>, x: &[E]) -> Option<Vec<E>> {
        let SimplePart::Matrix { size, ideal, .. } = self else {
            return None;
        };
        let k = *size;
        let mut m = vec![a.f.zero(); k * k];
        for (l, v) in ideal.basis.iter().enumerate() {
            for (j, cj) in ideal.coords(&a.mul(x, v)).into_iter().enumerate() {
                m[j * k + l] = cj;
            }
        }
        Some(m)
    }
}

/// The split of the algebra `a` with unit `one` into matrix algebras over F and fields
/// (see the module documentation), or `None` when some part is not of these kinds (a
/// division algebra, a matrix algebra over a larger field or a division algebra), when
/// the algebra is not semisimple, or when no minimal left ideal was found within
/// `params.tries` candidates. Errors: those of the engine. Cost: the centre (a kernel of
/// `n^2` equations in n unknowns); per candidate one minimal polynomial (O(n) products and
/// a kernel), one factorisation and per idempotent n products and one intersection; per
/// matrix part one inverse of size `dim S_i` and `k^3` products for the check.
pub fn split_semisimple<F: Field>(
    a: &Alg<F>,
    one: &[F::Elem],
    params: &SplitParams,
) -> Result<Option<Vec<SimplePart<F::Elem>>>> {
    let f = &a.f;
    let sp = &params.solve;
    let centre = centre_of(a, sp)?;
    let z = Alg::subalgebra(f, &centre, |x, y| a.mul(x, y), false)?;
    let Ok(fields) = split_into_fields(&z, &centre.coords(one), sp, params.seed) else {
        return Ok(None);
    };
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(params.seed);
    let mut parts = Vec::new();
    for field in fields {
        let c = centre.combine(f, &field.idempotent);
        let prods: Vec<Vec<F::Elem>> = (0..a.n).map(|m| a.mul(&a.basis(m), &c)).collect();
        let comp = span(f, &prods, a.n, sp)?;
        if field.degree == comp.dim() {
            parts.push(SimplePart::Field {
                idempotent: c,
                degree: field.degree,
            });
            continue;
        }
        let k = num_integer::Roots::sqrt(&comp.dim());
        if field.degree > 1 || k * k != comp.dim() {
            return Ok(None);
        }
        let Some(ideal) = minimal_left_ideal(a, &c, &comp, k, params, &mut rng)? else {
            return Ok(None);
        };
        let Some(units) = units_of(a, &comp, &ideal) else {
            return Ok(None);
        };
        parts.push(SimplePart::Matrix {
            size: k,
            units,
            ideal,
        });
    }
    // the parts' units sum to 1
    let mut sum = a.zero();
    for p in &parts {
        match p {
            SimplePart::Field { idempotent, .. } => sum = a.add(&sum, idempotent),
            SimplePart::Matrix { size, units, .. } => {
                for i in 0..*size {
                    sum = a.add(&sum, &units[i * size + i]);
                }
            }
        }
    }
    if sum != one {
        return Ok(None);
    }
    parts.sort_by_key(|p| (matches!(p, SimplePart::Matrix { .. }), p.dim()));
    Ok(Some(parts))
}

/// The centre as a subspace, by the invariants engine ([`element_space`]). Cost: that of
/// [`element_space`] on the algebra's table.
fn centre_of<F: Field>(a: &Alg<F>, sp: &SolveParams) -> Result<Subspace<F::Elem>> {
    let f = &a.f;
    let it = IntegralTensor::from_tensor(&a.to_tensor("e"));
    let z = element_space(&it, ElementSpace::Centre, sp)?;
    let basis = (0..z.dim())
        .map(|i| {
            z.dense(i)
                .iter()
                .map(|x| f.from_rational(x).expect("in the field"))
                .collect()
        })
        .collect();
    Ok(reduce(f, a.n, basis))
}

/// A left ideal of dimension k inside the part `comp = A c` (see the module
/// documentation), or `None` within `params.tries` candidates.
fn minimal_left_ideal<F: Field>(
    a: &Alg<F>,
    c: &[F::Elem],
    comp: &Subspace<F::Elem>,
    k: usize,
    params: &SplitParams,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Result<Option<Subspace<F::Elem>>> {
    let f = &a.f;
    let sp = &params.solve;
    let mut ideal = comp.clone();
    if ideal.dim() == k {
        return Ok(Some(ideal));
    }
    for t in 0..params.tries {
        let y = a.mul(&candidate(f, a.n, t, rng), c);
        if a.is_zero(&y) {
            continue;
        }
        let g = a.min_poly(&y, c, comp.dim(), sp)?;
        let fac = poly::factor(field_spec(f), &poly::to_rationals(f, &g))?;
        if fac.factors.len() < 2 {
            continue;
        }
        for e in crt_idempotents(a, &y, c, &g, &fac) {
            let prods: Vec<Vec<F::Elem>> = (0..a.n).map(|m| a.mul(&a.basis(m), &e)).collect();
            let left = span(f, &prods, a.n, sp)?;
            let meet = intersect(f, &ideal, &left, sp)?;
            if meet.dim() > 0 && meet.dim() < ideal.dim() {
                ideal = meet;
            }
            if ideal.dim() == k {
                return Ok(Some(ideal));
            }
        }
    }
    Ok(None)
}

/// Candidate t for a splitting element, in A's basis: the basis vectors, then sums and
/// differences of two, then seeded random combinations with entries growing from -1..=1.
fn candidate<F: Field>(
    f: &F,
    n: usize,
    t: usize,
    rng: &mut rand_chacha::ChaCha8Rng,
) -> Vec<F::Elem> {
    let mut y = vec![f.zero(); n];
    if t < n {
        y[t] = f.one();
        return y;
    }
    let pairs = n * n.saturating_sub(1);
    if t < n + pairs {
        let k = t - n;
        let (i, rest) = (k / (2 * (n - 1)), k % (2 * (n - 1)));
        let j = (i + 1 + rest / 2) % n;
        y[i] = f.one();
        y[j] = f.from_i64(if rest % 2 == 0 { 1 } else { -1 });
        return y;
    }
    let width = 1 + ((t - n - pairs) / 32) as i64;
    for c in &mut y {
        *c = f.from_i64(rng.gen_range(-width..=width));
    }
    y
}

/// The matrix units `E_jl = rho^-1(e_jl)` of the part `comp` from a minimal left ideal
/// (see the module documentation), checked (see the module documentation); `None` when a
/// check fails. Cost: `k dim S` products, one inverse of size `dim S`, `k^3` products.
fn units_of<F: Field>(
    a: &Alg<F>,
    comp: &Subspace<F::Elem>,
    ideal: &Subspace<F::Elem>,
) -> Option<Vec<Vec<F::Elem>>> {
    let f = &a.f;
    let k = ideal.dim();
    let d = comp.dim();
    if d != k * k {
        return None;
    }
    // column m: rho(s_m) for the part's basis s_m, entries (j, l) at j k + l
    let mut r = Matrix::zeros(f, d, d);
    for (m, s) in comp.basis.iter().enumerate() {
        for (l, v) in ideal.basis.iter().enumerate() {
            let image = a.mul(s, v);
            if !ideal.contains(f, &image) {
                return None;
            }
            for (j, x) in ideal.coords(&image).into_iter().enumerate() {
                r[(j * k + l, m)] = x;
            }
        }
    }
    let inv = inverse_exact(f, &r)?;
    let units: Vec<Vec<F::Elem>> = (0..d)
        .map(|jl| {
            let col: Vec<F::Elem> = (0..d).map(|m| inv[(m, jl)].clone()).collect();
            comp.combine(f, &col)
        })
        .collect();
    // `E_ij E_jl = E_il` (k^3 products); `E_ij E_lm = 0` for `j != l` then follows in
    // an associative algebra (`E_ij E_lm = E_ij E_jj E_ll E_lm` and `E_jj E_ll = 0`, checked)
    for i in 0..k {
        for j in 0..k {
            for l in 0..k {
                if a.mul(&units[i * k + j], &units[j * k + l]) != units[i * k + l] {
                    return None;
                }
            }
            if i != j && !a.is_zero(&a.mul(&units[i * k + i], &units[j * k + j])) {
                return None;
            }
        }
    }
    Some(units)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::laws::find_unit_direct;
    use crate::scalar::{FieldSpec, PrimeField, Rationals};
    use crate::tensor::Tensor;

    fn parts_of(t: &Tensor) -> Option<Vec<SimplePart<crate::scalar::Q>>> {
        let f = Rationals;
        let a = Alg::from_tensor(&f, t);
        let one = find_unit_direct(&f, &a.table).expect("a unit");
        split_semisimple(&a, &one, &SplitParams::default()).expect("no engine error")
    }

    fn shape<E>(parts: &[SimplePart<E>]) -> Vec<(char, usize)> {
        parts
            .iter()
            .map(|p| match p {
                SimplePart::Matrix { size, .. } => ('M', *size),
                SimplePart::Field { degree, .. } => ('K', *degree),
            })
            .collect()
    }

    #[test]
    fn matrix_algebras_in_a_random_basis_split() {
        // M_k(Q) in a seeded random basis (entries -2..2): matrix units, checked inside
        for k in 2..=4 {
            let m = crate::generators::generate(&format!("matrix:{k}")).unwrap();
            let p = crate::tensor::random_invertible(k * k, 2, k as u64);
            let t = crate::tensor::change_basis_algebra(&m, &p).unwrap();
            let parts = parts_of(&t).unwrap_or_else(|| panic!("M_{k} did not split"));
            assert_eq!(shape(&parts), vec![('M', k)], "M_{k}");
        }
    }

    #[test]
    fn group_algebras_split_into_their_wedderburn_parts() {
        // Q[S_3] = Q x Q x M_2(Q); Q[D_4] = Q^4 x M_2(Q); Q[A_4] = Q x Q(w) x M_3(Q), A_4
        // generated by the permutations (0 1 2) and (0 1)(2 3)
        // (Serre 1977, Linear Representations of Finite Groups, sect. 5 and 12;
        // from memory)
        for (spec, want) in [
            ("dihedral:3", vec![('K', 1), ('K', 1), ('M', 2)]),
            (
                "dihedral:4",
                vec![('K', 1), ('K', 1), ('K', 1), ('K', 1), ('M', 2)],
            ),
            ("perm:1,2,0,3;1,0,3,2", vec![('K', 1), ('K', 2), ('M', 3)]),
        ] {
            let t = crate::generators::generate(spec).unwrap();
            let got = shape(&parts_of(&t).expect(spec));
            // a one-dimensional part is reported either way: a field of degree 1 or M_1
            let norm = |v: Vec<(char, usize)>| -> Vec<(char, usize)> {
                let mut v: Vec<_> = v
                    .into_iter()
                    .map(|(c, d)| if d == 1 { ('K', 1) } else { (c, d) })
                    .collect();
                v.sort();
                v
            };
            assert_eq!(norm(got), norm(want), "{spec}");
        }
    }

    #[test]
    fn quaternions_do_not_split_over_q_but_do_mod_3() {
        let t = crate::generators::generate("quaternions").unwrap();
        assert_eq!(parts_of(&t), None);
        let t3 = t.with_field(FieldSpec::Prime(3)).unwrap();
        let f = PrimeField::new(3).unwrap();
        let a = Alg::from_tensor(&f, &t3);
        let one = find_unit_direct(&f, &a.table).unwrap();
        let parts = split_semisimple(&a, &one, &SplitParams::default())
            .unwrap()
            .expect("split over GF(3)");
        assert_eq!(shape(&parts), vec![('M', 2)]);
    }

    #[test]
    fn an_algebra_with_a_radical_is_refused() {
        // Q[x]/(x^2): radical of dimension 1
        let t = crate::generators::generate("quotient:0,0,1").unwrap();
        assert_eq!(parts_of(&t), None);
    }
}
