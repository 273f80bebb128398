//! Exact subspaces of F^n (F = Q or GF(q)) given by a basis in *reduced form*, and the
//! kernels and spans that produce them, all solved by the one engine of
//! [`super::nullspace`] (modular elimination, lifting to Q, exact check).
//!
//! Reduced form: basis vector i has the entry 1 at its *pivot* coordinate `pivots[i]` and
//! 0 at the pivots of the other vectors (the form in which the engine returns every
//! solution space). The coordinates of a vector of the subspace are then simply its
//! entries at the pivots ([`Subspace::coords`]), which makes structure constants of
//! subalgebras and quotients cheap; [`Subspace::contains`] checks membership exactly.
//!
//! Cost: that of [`solve_nullspace`] on the rows given (a span is two kernels:
//! `span(V) = ker(ker(V)^T)`).

use super::echelon::rref;
use super::matrix::Matrix;
use super::nullspace::{SolveParams, solve_nullspace};
use super::system::IntegerRows;
use crate::error::Result;
use crate::scalar::{Field, FieldSpec, Q};
use num_bigint::BigInt;

/// A subspace of `F^ambient` with a basis in reduced form (see the module documentation).
#[derive(Clone, Debug, PartialEq)]
pub struct Subspace<E> {
    pub ambient: usize,
    pub basis: Vec<Vec<E>>,
    pub pivots: Vec<usize>,
}

impl<E: Clone> Subspace<E> {
    /// The zero subspace.
    pub fn zero(ambient: usize) -> Self {
        Subspace {
            ambient,
            basis: Vec::new(),
            pivots: Vec::new(),
        }
    }

    /// The whole space with the standard basis.
    pub fn whole<F: Field<Elem = E>>(f: &F, ambient: usize) -> Self {
        Subspace {
            ambient,
            basis: (0..ambient).map(|i| unit_vector(f, ambient, i)).collect(),
            pivots: (0..ambient).collect(),
        }
    }

    pub fn dim(&self) -> usize {
        self.basis.len()
    }

    /// The coordinates of a vector *of the subspace* (its entries at the pivots).
    pub fn coords(&self, v: &[E]) -> Vec<E> {
        self.pivots.iter().map(|&p| v[p].clone()).collect()
    }

    /// `sum_i c_i b_i`.
    pub fn combine<F: Field<Elem = E>>(&self, f: &F, c: &[E]) -> Vec<E> {
        let mut out = vec![f.zero(); self.ambient];
        for (ci, b) in c.iter().zip(&self.basis) {
            if f.is_zero(ci) {
                continue;
            }
            for (o, x) in out.iter_mut().zip(b) {
                f.add_mul_assign(o, ci, x);
            }
        }
        out
    }

    /// Exact membership: `v` equals the combination of the basis with its own pivot
    /// entries.
    pub fn contains<F: Field<Elem = E>>(&self, f: &F, v: &[E]) -> bool {
        let w = self.combine(f, &self.coords(v));
        w.iter().zip(v).all(|(a, b)| f.is_zero(&f.sub(a, b)))
    }

    /// Coordinates to use for a complement: the positions that are not pivots. The basis
    /// together with the unit vectors at these positions is a basis of the whole space.
    pub fn non_pivots(&self) -> Vec<usize> {
        let mut is_p = vec![false; self.ambient];
        for &p in &self.pivots {
            is_p[p] = true;
        }
        (0..self.ambient).filter(|&c| !is_p[c]).collect()
    }
}

/// The unit vector `e_i` of length n.
pub fn unit_vector<F: Field>(f: &F, n: usize, i: usize) -> Vec<F::Elem> {
    let mut v = vec![f.zero(); n];
    v[i] = f.one();
    v
}

/// The field a context computes in, as data.
pub fn field_spec<F: Field>(f: &F) -> FieldSpec {
    match f.characteristic() {
        0 => FieldSpec::Rational,
        p => FieldSpec::Prime(p),
    }
}

/// A row of field elements as integers: over Q scaled by the lcm of its denominators (the
/// same equation), over GF(q) the representatives.
fn integer_row<F: Field>(f: &F, row: &[F::Elem]) -> Vec<BigInt> {
    let q: Vec<Q> = row.iter().map(|x| f.to_rational(x)).collect();
    super::nullspace::integer_row(&q)
}

/// The pivots of a basis in reduced form, or `None` if it is not in that form.
fn reduced_pivots<F: Field>(f: &F, basis: &[Vec<F::Elem>]) -> Option<Vec<usize>> {
    let n = basis.first().map_or(0, Vec::len);
    basis
        .iter()
        .enumerate()
        .map(|(i, v)| {
            (0..n).find(|&c| {
                f.is_one(&v[c])
                    && basis
                        .iter()
                        .enumerate()
                        .all(|(j, w)| j == i || f.is_zero(&w[c]))
            })
        })
        .collect()
}

/// The same subspace with a basis in reduced form (Gauss-Jordan on the given basis when
/// it is not already in that form).
pub fn reduce<F: Field>(f: &F, ambient: usize, basis: Vec<Vec<F::Elem>>) -> Subspace<F::Elem> {
    if let Some(pivots) = reduced_pivots(f, &basis) {
        return Subspace {
            ambient,
            basis,
            pivots,
        };
    }
    let mut m = Matrix::from_rows(basis, ambient);
    let pivots = rref(f, &mut m);
    Subspace {
        ambient,
        basis: (0..pivots.len()).map(|i| m.row(i).to_vec()).collect(),
        pivots,
    }
}

/// `{x in F^cols : r . x = 0 for every row r}`, proven (see the module documentation).
pub fn kernel<F: Field>(
    f: &F,
    rows: &[Vec<F::Elem>],
    cols: usize,
    params: &SolveParams,
) -> Result<Subspace<F::Elem>> {
    let int_rows: Vec<Vec<BigInt>> = rows
        .iter()
        .filter(|r| r.iter().any(|x| !f.is_zero(x)))
        .map(|r| integer_row(f, r))
        .collect();
    if int_rows.is_empty() {
        return Ok(Subspace::whole(f, cols));
    }
    let sys = match field_spec(f) {
        FieldSpec::Rational => IntegerRows::new(cols, int_rows),
        FieldSpec::Prime(q) => IntegerRows::modulo(cols, int_rows, q),
    };
    let space = solve_nullspace(&sys, params)?;
    let basis: Vec<Vec<F::Elem>> = (0..space.dim())
        .map(|i| {
            space
                .dense(i)
                .iter()
                .map(|x| f.from_rational(x).expect("a solution in the field"))
                .collect()
        })
        .collect();
    Ok(reduce(f, cols, basis))
}

/// The span of vectors of `F^ambient`, proven, in reduced form.
pub fn span<F: Field>(
    f: &F,
    vectors: &[Vec<F::Elem>],
    ambient: usize,
    params: &SolveParams,
) -> Result<Subspace<F::Elem>> {
    if vectors.iter().all(|v| v.iter().all(|x| f.is_zero(x))) {
        return Ok(Subspace::zero(ambient));
    }
    let k = kernel(f, vectors, ambient, params)?;
    if k.dim() == 0 {
        return Ok(Subspace::whole(f, ambient));
    }
    kernel(f, &k.basis, ambient, params)
}

/// `x ∩ y` for subspaces of the same space, proven. Cost: a kernel of `ambient`
/// equations in `dim x + dim y` unknowns, then a span.
pub fn intersect<F: Field>(
    f: &F,
    x: &Subspace<F::Elem>,
    y: &Subspace<F::Elem>,
    params: &SolveParams,
) -> Result<Subspace<F::Elem>> {
    let (dx, dy) = (x.dim(), y.dim());
    if dx == 0 || dy == 0 {
        return Ok(Subspace::zero(x.ambient));
    }
    let rows: Vec<Vec<F::Elem>> = (0..x.ambient)
        .map(|i| {
            x.basis
                .iter()
                .map(|v| v[i].clone())
                .chain(y.basis.iter().map(|v| f.neg(&v[i])))
                .collect()
        })
        .collect();
    let ker = kernel(f, &rows, dx + dy, params)?;
    let vecs: Vec<Vec<F::Elem>> = ker.basis.iter().map(|c| x.combine(f, &c[..dx])).collect();
    span(f, &vecs, x.ambient, params)
}

/// `x + y` for subspaces of the same space, proven: the span of both bases. Cost: that
/// of [`span`] on `dim x + dim y` vectors.
pub fn sum<F: Field>(
    f: &F,
    x: &Subspace<F::Elem>,
    y: &Subspace<F::Elem>,
    params: &SolveParams,
) -> Result<Subspace<F::Elem>> {
    let vecs: Vec<Vec<F::Elem>> = x.basis.iter().chain(&y.basis).cloned().collect();
    span(f, &vecs, x.ambient, params)
}

/// The rank of a list of vectors (the dimension of their span).
pub fn rank_of<F: Field>(
    f: &F,
    vectors: &[Vec<F::Elem>],
    ambient: usize,
    params: &SolveParams,
) -> Result<usize> {
    Ok(ambient - kernel(f, vectors, ambient, params)?.dim())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{PrimeField, Rationals, q};

    #[test]
    fn kernels_and_spans() {
        let f = Rationals;
        let p = SolveParams::default();
        // x0 + x1 = 0 in Q^3: kernel of dim 2
        let k = kernel(&f, &[vec![q(1, 1), q(1, 1), q(0, 1)]], 3, &p).unwrap();
        assert_eq!(k.dim(), 2);
        for v in &k.basis {
            assert_eq!(&v[0] + &v[1], q(0, 1));
        }
        // span of (1, 2, 3) and (2, 4, 6): dim 1, contains (1/2, 1, 3/2)
        let s = span(
            &f,
            &[
                vec![q(1, 1), q(2, 1), q(3, 1)],
                vec![q(2, 1), q(4, 1), q(6, 1)],
            ],
            3,
            &p,
        )
        .unwrap();
        assert_eq!(s.dim(), 1);
        assert!(s.contains(&f, &[q(1, 2), q(1, 1), q(3, 2)]));
        assert!(!s.contains(&f, &[q(1, 1), q(0, 1), q(0, 1)]));
        // over GF(3): (1, 1) and (1, 2) span GF(3)^2
        let g = PrimeField::new(3).unwrap();
        assert_eq!(rank_of(&g, &[vec![1, 1], vec![1, 2]], 2, &p).unwrap(), 2);
        assert_eq!(rank_of(&g, &[vec![1, 2], vec![2, 1]], 2, &p).unwrap(), 1);
    }
}
