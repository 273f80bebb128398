//! Structure tensors of bilinear maps U x V -> W.
//!
//! A [`Tensor`] holds the exact coefficients `c[i][j][k]` with `u_i * v_j = sum_k c[i][j][k]
//! w_k`, the field they live in, the basis names of the three spaces, and whether it is an
//! *algebra* (U = V = W, one basis) or a general *bilinear* map.
//!
//! Invariants: coefficients are stored sparsely per product `(i, j)`, sorted by `k`, with no
//! zeros; over GF(p) every stored coefficient is an integer in `1..p`. For an algebra the
//! three dimensions and name lists are equal.

mod basis;
pub mod flatten;
pub mod integral;
pub mod products;
mod random;
mod table;

pub use basis::{change_basis, change_basis_algebra, random_invertible};
pub use flatten::{flattening, flattening_ranks, others, rank_over, slice, slices};
pub use integral::{IntegralTensor, ModTable, prefers_dense};
pub use random::random_algebra;
pub use table::Table;

use crate::scalar::{Field, FieldSpec, PrimeField, Q, q_to_string};
use num_traits::Zero;

/// Dimensions above this are refused by the parsers and generators (documented limit).
pub const MAX_DIM: usize = 4096;

/// At most this many products `(i, j)`: `dims[0] * dims[1] <= 2^22` (the tensor keeps one
/// vector per product, so this bounds the memory of an empty tensor to about 100 MB).
pub const MAX_PRODUCTS: usize = 1 << 22;

/// At most this many nonzero coefficients in a tensor read from a file: every coefficient
/// is held exactly (about 100 bytes each with its big integers), so this bounds the memory
/// of an input to about 400 MB. Readers count before they store and refuse the first
/// coefficient beyond the limit.
pub const MAX_NONZERO: usize = 1 << 22;

/// Check a count of nonzero coefficients against [`MAX_NONZERO`]; the `Err` is a message
/// for the user. Cost: O(1).
pub fn check_nonzero(count: usize) -> Result<(), String> {
    if count <= MAX_NONZERO {
        return Ok(());
    }
    Err(format!(
        "more than 2^22 = {MAX_NONZERO} nonzero coefficients (this is coefficient number \
         {count}): every coefficient is held exactly, and larger inputs are refused before \
         they fill the memory"
    ))
}

/// The largest algebra dimension allowed by [`MAX_PRODUCTS`]: `2048 * 2048 = 2^22`.
pub const MAX_ALGEBRA_DIM: usize = 2048;

/// Check a shape against the documented limits: each dimension in `1..=MAX_DIM` and
/// `dims[0] * dims[1] <= MAX_PRODUCTS`. The `Err` is a message for the user. Cost: O(1).
pub fn check_shape(dims: [usize; 3]) -> Result<(), String> {
    if let Some(d) = dims.iter().find(|&&d| d > MAX_DIM) {
        return Err(format!(
            "dimension {d} is above the limit of {MAX_DIM} per axis"
        ));
    }
    match dims[0].checked_mul(dims[1]) {
        Some(n) if n <= MAX_PRODUCTS => Ok(()),
        _ => Err(format!(
            "{} x {} = {} products is above the limit of 2^22 = {MAX_PRODUCTS} products \
             (an algebra has dimension at most {MAX_ALGEBRA_DIM}, a map at most {MAX_DIM} per axis)",
            dims[0],
            dims[1],
            dims[0] as u128 * dims[1] as u128
        )),
    }
}

/// Whether a tensor is an algebra (one space) or a bilinear map between three spaces.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Kind {
    Algebra,
    Bilinear,
}

/// The three axes of a tensor.
pub const AXES: [&str; 3] = ["left", "right", "result"];

/// The six permutations of the three axes, in the convention of
/// [`Tensor::permute_axes`] (new axis `i` is old axis `perm[i]`), the identity first.
pub const AXIS_PERMUTATIONS: [[usize; 3]; 6] = [
    [0, 1, 2],
    [1, 2, 0],
    [2, 0, 1],
    [1, 0, 2],
    [0, 2, 1],
    [2, 1, 0],
];

/// The permutation that undoes `perm`: `t.permute_axes(perm).permute_axes(inverse) = t`.
pub fn inverse_permutation(perm: [usize; 3]) -> [usize; 3] {
    let mut inv = [0; 3];
    for (i, &p) in perm.iter().enumerate() {
        inv[p] = i;
    }
    inv
}

/// An exact structure tensor. See the module documentation for the invariants.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Tensor {
    field: FieldSpec,
    kind: Kind,
    dims: [usize; 3],
    names: [Vec<String>; 3],
    /// `products[i * dims[1] + j]` = the nonzero `(k, c[i][j][k])`, sorted by k.
    products: Vec<Vec<(usize, Q)>>,
}

/// Default basis names: `e0 e1 ...` for an algebra, `a0.., b0.., c0..` for a map.
pub fn default_names(kind: Kind, dims: [usize; 3]) -> [Vec<String>; 3] {
    let mk = |p: &str, n: usize| (0..n).map(|i| format!("{p}{i}")).collect::<Vec<_>>();
    match kind {
        Kind::Algebra => [mk("e", dims[0]), mk("e", dims[0]), mk("e", dims[0])],
        Kind::Bilinear => [mk("a", dims[0]), mk("b", dims[1]), mk("c", dims[2])],
    }
}

impl Tensor {
    /// The zero tensor with the given shape and names (`None`: default names).
    /// Panics if an algebra is given unequal dimensions (a programming error).
    pub fn zero(
        field: FieldSpec,
        kind: Kind,
        dims: [usize; 3],
        names: Option<[Vec<String>; 3]>,
    ) -> Self {
        if kind == Kind::Algebra {
            assert!(
                dims[0] == dims[1] && dims[1] == dims[2],
                "an algebra has one dimension"
            );
        }
        let names = names.unwrap_or_else(|| default_names(kind, dims));
        for a in 0..3 {
            assert_eq!(names[a].len(), dims[a], "one name per basis vector");
        }
        Tensor {
            field,
            kind,
            dims,
            names,
            products: vec![Vec::new(); dims[0] * dims[1]],
        }
    }

    /// The zero algebra of dimension n with the given names.
    pub fn algebra(field: FieldSpec, names: Vec<String>) -> Self {
        let n = names.len();
        Tensor::zero(
            field,
            Kind::Algebra,
            [n; 3],
            Some([names.clone(), names.clone(), names]),
        )
    }

    pub fn field(&self) -> FieldSpec {
        self.field
    }
    pub fn kind(&self) -> Kind {
        self.kind
    }
    pub fn dims(&self) -> [usize; 3] {
        self.dims
    }
    /// The dimension of an algebra (the left dimension of a map).
    pub fn dim(&self) -> usize {
        self.dims[0]
    }
    pub fn names(&self) -> &[Vec<String>; 3] {
        &self.names
    }
    /// Name of basis vector `i` on axis `axis` (0 left, 1 right, 2 result).
    pub fn name(&self, axis: usize, i: usize) -> &str {
        &self.names[axis][i]
    }
    /// True for an algebra, or a map whose three dimensions agree.
    pub fn is_square(&self) -> bool {
        self.dims[0] == self.dims[1] && self.dims[1] == self.dims[2]
    }

    /// Reinterpret as a general bilinear map (keeps names).
    pub fn as_bilinear(&self) -> Tensor {
        let mut t = self.clone();
        t.kind = Kind::Bilinear;
        t
    }

    /// Reinterpret a square bilinear map as an algebra on the left basis.
    pub fn as_algebra(&self) -> Option<Tensor> {
        if !self.is_square() {
            return None;
        }
        let mut t = self.clone();
        t.kind = Kind::Algebra;
        t.names = [
            self.names[0].clone(),
            self.names[0].clone(),
            self.names[0].clone(),
        ];
        Some(t)
    }

    /// Rename the basis of one axis (for an algebra: of all three).
    pub fn set_names(&mut self, axis: usize, names: Vec<String>) {
        assert_eq!(names.len(), self.dims[axis]);
        if self.kind == Kind::Algebra {
            self.names = [names.clone(), names.clone(), names];
        } else {
            self.names[axis] = names;
        }
    }

    fn normalise(&self, v: Q) -> Q {
        match self.field {
            FieldSpec::Rational => v,
            FieldSpec::Prime(p) => {
                let f = PrimeField::new(p).expect("tensor field is a prime field");
                let r = f.from_rational(&v).expect("coefficient defined mod p");
                f.to_rational(&r)
            }
        }
    }

    /// The coefficient `c[i][j][k]`.
    pub fn get(&self, i: usize, j: usize, k: usize) -> Q {
        let row = &self.products[i * self.dims[1] + j];
        match row.binary_search_by_key(&k, |e| e.0) {
            Ok(pos) => row[pos].1.clone(),
            Err(_) => Q::zero(),
        }
    }

    /// Set `c[i][j][k] = v` (reduced into the field; over GF(p) the caller guarantees
    /// that the denominator of v is prime to p).
    pub fn set(&mut self, i: usize, j: usize, k: usize, v: Q) {
        let v = self.normalise(v);
        let row = &mut self.products[i * self.dims[1] + j];
        match row.binary_search_by_key(&k, |e| e.0) {
            Ok(pos) => {
                if v.is_zero() {
                    row.remove(pos);
                } else {
                    row[pos].1 = v;
                }
            }
            Err(pos) => {
                if !v.is_zero() {
                    row.insert(pos, (k, v));
                }
            }
        }
    }

    /// Replace the whole product `u_i * v_j` by `sum c_k w_k` given as `(k, c_k)` pairs
    /// (any order, distinct k, every k < dims[2]); values are reduced into the field and
    /// zeros dropped. Cost: O(m log m) for m pairs, no copy of the values over Q.
    pub fn set_product(&mut self, i: usize, j: usize, mut row: Vec<(usize, Q)>) {
        if let FieldSpec::Prime(_) = self.field {
            row = row
                .into_iter()
                .map(|(k, v)| (k, self.normalise(v)))
                .collect();
        }
        row.retain(|(_, v)| !v.is_zero());
        row.sort_unstable_by_key(|e| e.0);
        debug_assert!(row.windows(2).all(|w| w[0].0 < w[1].0));
        debug_assert!(row.last().is_none_or(|e| e.0 < self.dims[2]));
        self.products[i * self.dims[1] + j] = row;
    }

    /// `c[i][j][k] += v`.
    pub fn add(&mut self, i: usize, j: usize, k: usize, v: &Q) {
        let cur = self.get(i, j, k);
        self.set(i, j, k, cur + v);
    }

    /// The product of basis vectors `u_i * v_j` as sparse `(k, coefficient)` pairs.
    pub fn product(&self, i: usize, j: usize) -> &[(usize, Q)] {
        &self.products[i * self.dims[1] + j]
    }

    /// All nonzero coefficients as `(i, j, k, value)`, in lexicographic order.
    pub fn entries(&self) -> impl Iterator<Item = (usize, usize, usize, &Q)> + '_ {
        let b = self.dims[1];
        self.products
            .iter()
            .enumerate()
            .flat_map(move |(ij, row)| row.iter().map(move |(k, v)| (ij / b, ij % b, *k, v)))
    }

    /// Number of nonzero coefficients.
    pub fn nnz(&self) -> usize {
        self.products.iter().map(Vec::len).sum()
    }

    /// The bilinear map on coordinate vectors: `x * y` (exact, reduced into the field).
    /// Cost: O(nnz) over the support of x and y.
    pub fn multiply(&self, x: &[Q], y: &[Q]) -> Vec<Q> {
        let mut out = vec![Q::zero(); self.dims[2]];
        for (i, xi) in x.iter().enumerate().filter(|(_, v)| !v.is_zero()) {
            for (j, yj) in y.iter().enumerate().filter(|(_, v)| !v.is_zero()) {
                let s = xi * yj;
                for (k, c) in self.product(i, j) {
                    out[*k] += &s * c;
                }
            }
        }
        out.into_iter().map(|v| self.normalise(v)).collect()
    }

    /// The screening field and the table reduced to it: the table itself over GF(p); over
    /// Q, modulo the first word prime that divides no denominator (a cheap field for
    /// screens whose failure is a proof: a law that fails mod p fails over Q). Cost: one
    /// reduction of every entry.
    pub fn screening(&self) -> Option<(PrimeField, Tensor)> {
        match self.field() {
            FieldSpec::Prime(p) => Some((PrimeField::new(p)?, self.clone())),
            FieldSpec::Rational => crate::scalar::word_primes(8).into_iter().find_map(|p| {
                let tp = self.with_field(FieldSpec::Prime(p)).ok()?;
                Some((PrimeField::new(p)?, tp))
            }),
        }
    }

    /// The same table over another field. Over GF(p) every coefficient must have a
    /// denominator prime to p; otherwise the `Err` names the first offending product.
    pub fn with_field(&self, field: FieldSpec) -> Result<Tensor, String> {
        let mut t = Tensor::zero(field, self.kind, self.dims, Some(self.names.clone()));
        let fp = match field {
            FieldSpec::Rational => None,
            FieldSpec::Prime(p) => Some(PrimeField::new(p).expect("prime")),
        };
        for (idx, row) in self.products.iter().enumerate() {
            let mut out = Vec::with_capacity(row.len());
            for (k, v) in row {
                let Some(f) = &fp else {
                    out.push((*k, v.clone()));
                    continue;
                };
                // None exactly when the denominator vanishes mod p
                let Some(r) = f.from_rational(v) else {
                    let p = f.modulus();
                    return Err(format!(
                        "the coefficient {} of {} in {}*{} has a denominator divisible by {p}",
                        q_to_string(v),
                        self.names[2][*k],
                        self.names[0][idx / self.dims[1]],
                        self.names[1][idx % self.dims[1]]
                    ));
                };
                if r != 0 {
                    out.push((*k, f.to_rational(&r)));
                }
            }
            t.products[idx] = out;
        }
        Ok(t)
    }

    /// The structure constants mapped into a field context `f` (which must match
    /// [`Tensor::field`]): the generic view used by laws and invariants.
    pub fn table<F: Field>(&self, f: &F) -> Table<F::Elem> {
        Table::from_tensor(self, f)
    }

    /// Permute the three axes: `perm[a]` is the old axis that becomes new axis `a`.
    /// Coefficient `c'[x_0][x_1][x_2] = c[old indices]`. The result is a bilinear map.
    pub fn permute_axes(&self, perm: [usize; 3]) -> Tensor {
        let dims = [self.dims[perm[0]], self.dims[perm[1]], self.dims[perm[2]]];
        let names = [
            self.names[perm[0]].clone(),
            self.names[perm[1]].clone(),
            self.names[perm[2]].clone(),
        ];
        let mut t = Tensor::zero(self.field, Kind::Bilinear, dims, Some(names));
        for (i, j, k, v) in self.entries() {
            let old = [i, j, k];
            t.set(old[perm[0]], old[perm[1]], old[perm[2]], v.clone());
        }
        t
    }
}

/// Run `$body` with `$f` bound to a reference to the field context of a [`FieldSpec`]:
/// `with_field!(t.field(), f => rank(f, &m))`.
#[macro_export]
macro_rules! with_field {
    ($spec:expr, $f:ident => $body:expr) => {
        match $spec {
            $crate::scalar::FieldSpec::Rational => {
                let $f = &$crate::scalar::Rationals;
                $body
            }
            $crate::scalar::FieldSpec::Prime(p) => {
                let $f = &$crate::scalar::PrimeField::new(p).expect("a prime field");
                $body
            }
        }
    };
}
