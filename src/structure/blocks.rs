//! The decomposition of an algebra or a bilinear map into indecomposable blocks, with the
//! change of basis, the tensor in the new basis, and a certificate for every block.
//!
//! Theory. A decomposition `A = A_1 (+) A_2` into ideals with `A_1 A_2 = A_2 A_1 = 0` is the
//! same as an idempotent of the centroid `C(A) = {X : X(ab) = X(a)b = aX(b)}` (the
//! projection onto A_1); for a map `T : U x V -> W` the same holds for the centroid of the
//! triple `{(X, Y, Z) : T(Xu, v) = T(u, Yv) = Z T(u, v)}` and decompositions of U, V, W
//! with `T(U_i, V_j) = 0` for i != j and `T(U_i, V_i) ⊆ W_i`. A decomposition into
//! indecomposable blocks is a complete set of primitive orthogonal idempotents of the
//! centroid; by the Krull-Schmidt theorem the blocks are unique up to isomorphism and order
//! (Jacobson 1980, Basic Algebra II, sect. 3.4; the centroid: Jacobson 1962, Lie Algebras,
//! ch. X). A block is indecomposable exactly when its centroid is local (no idempotent but
//! 0 and 1).
//!
//! Method.
//! 1. *Support components*: indices joined by a nonzero coefficient `c[i][j][k]` (i, j, k
//!    in one class) give a block-diagonal splitting by a permutation; each class is
//!    treated alone.
//! 2. *Degenerate parts*: for a map, the left radical `{u : T(u, V) = 0}`, the right
//!    radical and a complement of `span T(U, V)` in W split off as one-dimensional blocks
//!    (shapes 1x0x0, 0x1x0, 0x0x1); for an algebra, a complement of `Ann(A) ∩ A^2` in the
//!    annihilator `Ann(A)` splits off as one-dimensional zero algebras. What remains has a
//!    centroid whose commutators generate a square-zero ideal (they map A into
//!    `Ann(A) ∩ A^2` and kill A^2), so the centroid modulo its radical is commutative.
//! 3. *Idempotents*: the centroid C (a proven basis from the engine), its radical
//!    ([`crate::invariants::radical`]), the field components of `C / rad C`
//!    ([`super::fields`]), lifted back to orthogonal idempotents of C
//!    ([`super::algebra::Alg::lift_idempotent`], one after the other inside
//!    `(1 - e_1 - ...) C (1 - e_1 - ...)`). Their images are the blocks.
//! 4. *Checks*: the tensor is changed to the new basis exactly
//!    ([`crate::tensor::change_basis`]) and every nonzero coefficient is checked to lie in
//!    a diagonal block; every block of dimension above one has its centroid recomputed and
//!    shown local (its quotient by the radical is a field, [`super::fields::field_decision`]).
//!
//! Cost: the centroid systems (n^2 unknowns for an algebra of dimension n,
//! a^2 + b^2 + c^2 for a map) dominate; then small computations in the centroid, and one
//! exact change of basis per support component that splits.

use super::algebra::{Alg, identity_maps, map_algebra, products_span};
use super::fields::{FieldDecision, field_decision, split_into_fields};
use crate::error::{Error, Result};
use crate::invariants::quotient::{QuotientMap, quotient_in};
use crate::invariants::{ElementSpace, MapInvariant, centroid, element_space, map_invariant};
use crate::linalg::Matrix;
use crate::linalg::nullspace::{SolveParams, Space};
use crate::linalg::subspace::{Subspace, reduce, span, unit_vector};
use crate::scalar::{Field, Q};
use crate::tensor::{IntegralTensor, Kind, Tensor, change_basis};

/// Parameters of [`decompose`].
#[derive(Clone, Debug)]
pub struct BlockParams {
    pub solve: SolveParams,
    /// Seed of the random elements used to split and certify field components.
    pub seed: u64,
    /// Recompute every block's centroid and show it local (indecomposable).
    pub certify: bool,
}

impl Default for BlockParams {
    fn default() -> Self {
        BlockParams {
            solve: SolveParams::default(),
            seed: 1,
            certify: true,
        }
    }
}

/// What kind of block.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum BlockKind {
    /// A block with a nonzero product.
    Product,
    /// A one-dimensional zero algebra (a line in the annihilator).
    ZeroAlgebra,
    /// A vector u of the left space with `T(u, V) = 0` (shape 1 x 0 x 0).
    LeftRadical,
    /// A vector v of the right space with `T(U, v) = 0` (shape 0 x 1 x 0).
    RightRadical,
    /// A result vector outside `span T(U, V)` (shape 0 x 0 x 1).
    Cokernel,
}

/// Why a block does not split further.
#[derive(Clone, Debug, PartialEq)]
pub struct Certificate {
    /// Dimension of the block's centroid.
    pub centroid_dim: usize,
    /// Dimension of the radical of the centroid.
    pub centroid_radical_dim: usize,
    /// The field `C / rad C`: its degree over the ground field and a defining polynomial.
    pub residue_degree: usize,
    pub residue_poly: Vec<Q>,
}

/// One indecomposable block.
#[derive(Clone, Debug)]
pub struct Block {
    pub kind: BlockKind,
    /// Dimensions on the left, right and result axes (equal for an algebra).
    pub dims: [usize; 3],
    /// The new basis vectors of the block on each axis, in old coordinates (for an algebra
    /// the three lists are equal).
    pub basis: [Vec<Vec<Q>>; 3],
    /// The block's own tensor in its basis.
    pub tensor: Tensor,
    /// `None` for one-dimensional degenerate blocks (nothing to split).
    pub certificate: Option<Certificate>,
}

/// A decomposition into indecomposable blocks (see the module documentation).
#[derive(Clone, Debug)]
pub struct Decomposition {
    pub blocks: Vec<Block>,
    /// The change of basis per axis: columns are the new basis vectors in old coordinates
    /// (for an algebra the three matrices are equal).
    pub change: [Matrix<Q>; 3],
    /// The tensor in the new basis (block diagonal).
    pub tensor: Tensor,
    /// Classes of indices joined by nonzero coefficients (step 1).
    pub support_components: usize,
    /// Nonzero coefficients of the new tensor outside the diagonal blocks: 0 (checked).
    pub outside: usize,
}

/// A block found in one support component, vectors in the component's coordinates.
struct Piece<E> {
    kind: BlockKind,
    vecs: [Vec<Vec<E>>; 3],
    certificate: Option<Certificate>,
}

/// Decompose a tensor into indecomposable blocks (see the module documentation).
/// Errors: those of the engine (memory budget, GF(p) with p >= 2^28).
pub fn decompose(t: &Tensor, params: &BlockParams) -> Result<Decomposition> {
    crate::with_field!(t.field(), f => decompose_in(f, t, params))
}

/// Index classes per axis joined by nonzero coefficients.
fn support_components(t: &Tensor) -> Vec<[Vec<usize>; 3]> {
    let d = t.dims();
    let alg = t.kind() == Kind::Algebra;
    let off = if alg {
        [0, 0, 0]
    } else {
        [0, d[0], d[0] + d[1]]
    };
    let total = if alg { d[0] } else { d[0] + d[1] + d[2] };
    let mut parent: Vec<usize> = (0..total).collect();
    fn find(p: &mut [usize], mut x: usize) -> usize {
        while p[x] != x {
            p[x] = p[p[x]];
            x = p[x];
        }
        x
    }
    for (i, j, k, _) in t.entries() {
        let a = find(&mut parent, off[0] + i);
        for y in [off[1] + j, off[2] + k] {
            let (ra, rb) = (find(&mut parent, a), find(&mut parent, y));
            if ra != rb {
                parent[ra.max(rb)] = ra.min(rb);
            }
        }
    }
    let mut comp_of = vec![usize::MAX; total];
    let mut comps: Vec<[Vec<usize>; 3]> = Vec::new();
    for x in 0..total {
        let r = find(&mut parent, x);
        if comp_of[r] == usize::MAX {
            comp_of[r] = comps.len();
            comps.push([Vec::new(), Vec::new(), Vec::new()]);
        }
        let c = comp_of[r];
        if alg {
            for axis in comps[c].iter_mut() {
                axis.push(x);
            }
        } else {
            let axis = if x < off[1] {
                0
            } else if x < off[2] {
                1
            } else {
                2
            };
            comps[c][axis].push(x - off[axis]);
        }
    }
    comps
}

/// The restriction of a tensor to index lists (kept in order), with their names.
fn restrict(t: &Tensor, idx: &[Vec<usize>; 3]) -> Tensor {
    let pos: Vec<std::collections::HashMap<usize, usize>> = idx
        .iter()
        .map(|v| v.iter().enumerate().map(|(p, &i)| (i, p)).collect())
        .collect();
    let dims = [idx[0].len(), idx[1].len(), idx[2].len()];
    let names = [0, 1, 2].map(|a| idx[a].iter().map(|&i| t.name(a, i).to_string()).collect());
    let mut out = Tensor::zero(t.field(), t.kind(), dims, Some(names));
    for (a, &i) in idx[0].iter().enumerate() {
        for (b, &j) in idx[1].iter().enumerate() {
            let row: Vec<(usize, Q)> = t
                .product(i, j)
                .iter()
                .filter_map(|(k, c)| pos[2].get(k).map(|&p| (p, c.clone())))
                .collect();
            if !row.is_empty() {
                out.set_product(a, b, row);
            }
        }
    }
    out
}

fn to_q<F: Field>(f: &F, v: &[F::Elem]) -> Vec<Q> {
    v.iter().map(|x| f.to_rational(x)).collect()
}

fn from_space<F: Field>(f: &F, sp: &Space) -> Vec<Vec<F::Elem>> {
    (0..sp.dim())
        .map(|i| {
            sp.dense(i)
                .iter()
                .map(|x| f.from_rational(x).expect("in the field"))
                .collect()
        })
        .collect()
}

/// A square matrix over Q whose columns are the given vectors.
fn columns_matrix<F: Field>(f: &F, cols: &[Vec<F::Elem>], n: usize) -> Matrix<Q> {
    let mut m = Matrix::filled(n, n, Q::default());
    for (j, c) in cols.iter().enumerate() {
        for (i, x) in c.iter().enumerate() {
            m[(i, j)] = f.to_rational(x);
        }
    }
    m
}

/// `sum_i c_i cols_i` in the old coordinates.
fn through<F: Field>(f: &F, v: &[F::Elem], cols: &[Vec<F::Elem>], n: usize) -> Vec<F::Elem> {
    let mut out = vec![f.zero(); n];
    for (c, col) in v.iter().zip(cols) {
        if f.is_zero(c) {
            continue;
        }
        for (o, x) in out.iter_mut().zip(col) {
            f.add_mul_assign(o, c, x);
        }
    }
    out
}

fn decompose_in<F: Field>(f: &F, t: &Tensor, params: &BlockParams) -> Result<Decomposition> {
    let alg = t.kind() == Kind::Algebra;
    let comps = support_components(t);
    let mut pieces_all: Vec<(usize, Piece<F::Elem>)> = Vec::new();
    let mut comp_tensors = Vec::new();
    for (ci, comp) in comps.iter().enumerate() {
        let sub = restrict(t, comp);
        let mut pieces = if sub.nnz() == 0 {
            degenerate_pieces(f, &sub, alg)
        } else if alg {
            split_algebra(f, &sub, params)?
        } else {
            split_map(f, &sub, params)?
        };
        for p in pieces.iter_mut() {
            for vs in p.vecs.iter_mut() {
                for v in vs.iter_mut() {
                    *v = primitive_vector(f, v);
                }
            }
        }
        // the component's tensor in its new basis
        let is_identity = pieces.len() == 1
            && (0..3).all(|a| {
                pieces[0].vecs[a]
                    .iter()
                    .enumerate()
                    .all(|(i, v)| *v == unit_vector(f, sub.dims()[a], i))
            });
        let new_sub = if is_identity || sub.nnz() == 0 {
            sub.clone()
        } else {
            let mats: Vec<Matrix<Q>> = (0..3)
                .map(|a| {
                    let cols: Vec<Vec<F::Elem>> = pieces
                        .iter()
                        .flat_map(|p| p.vecs[a].iter().cloned())
                        .collect();
                    columns_matrix(f, &cols, sub.dims()[a])
                })
                .collect();
            change_basis(&sub, &mats[0], &mats[1], &mats[2]).ok_or_else(|| {
                Error::Invalid("internal error: the block basis is not invertible".into())
            })?
        };
        comp_tensors.push((comp.clone(), new_sub, is_identity));
        for p in pieces {
            pieces_all.push((ci, p));
        }
    }
    assemble(f, t, comps.len(), pieces_all, comp_tensors, params)
}

/// Over Q, the primitive integer vector on the line of v (a nicer basis vector); over
/// GF(p), v itself.
fn primitive_vector<F: Field>(f: &F, v: &[F::Elem]) -> Vec<F::Elem> {
    if f.characteristic() != 0 {
        return v.to_vec();
    }
    let z = crate::poly::integer::primitive(&to_q(f, v));
    if z.is_empty() {
        return v.to_vec();
    }
    // `primitive` makes the last nonzero entry positive; keep the sign of the first
    // nonzero entry of v instead
    let first = v.iter().position(|x| !f.is_zero(x)).expect("nonzero");
    let flip =
        (f.to_rational(&v[first]) < Q::default()) != (z[first] < num_bigint::BigInt::default());
    (0..v.len())
        .map(|i| {
            let x = z.get(i).cloned().unwrap_or_default();
            let x = if flip { -x } else { x };
            f.from_rational(&Q::from_integer(x)).expect("an integer")
        })
        .collect()
}

/// The one-dimensional pieces of a component without coefficients (an isolated index).
fn degenerate_pieces<F: Field>(f: &F, sub: &Tensor, alg: bool) -> Vec<Piece<F::Elem>> {
    let d = sub.dims();
    let mut out = Vec::new();
    for axis in 0..3 {
        for i in 0..d[axis] {
            let v = unit_vector(f, d[axis], i);
            if alg {
                out.push(Piece {
                    kind: BlockKind::ZeroAlgebra,
                    vecs: [vec![v.clone()], vec![v.clone()], vec![v]],
                    certificate: None,
                });
            } else {
                let mut vecs = [Vec::new(), Vec::new(), Vec::new()];
                vecs[axis].push(v);
                let kind = [
                    BlockKind::LeftRadical,
                    BlockKind::RightRadical,
                    BlockKind::Cokernel,
                ][axis];
                out.push(Piece {
                    kind,
                    vecs,
                    certificate: None,
                });
            }
        }
        if alg {
            break;
        }
    }
    out
}

/// Split one support component of an algebra (see the module documentation, step 2-3).
fn split_algebra<F: Field>(
    f: &F,
    sub: &Tensor,
    params: &BlockParams,
) -> Result<Vec<Piece<F::Elem>>> {
    let n = sub.dim();
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(sub);
    let ann = reduce(
        f,
        n,
        from_space(f, &element_space(&it, ElementSpace::Annihilator, sp)?),
    );
    if ann.dim() > 0 {
        let sq = products_span(f, sub, sp)?;
        // lines of the annihilator independent modulo A^2
        let mut chosen: Vec<Vec<F::Elem>> = Vec::new();
        let mut current = sq.clone();
        for z in &ann.basis {
            if !current.contains(f, z) {
                chosen.push(z.clone());
                let mut all = current.basis.clone();
                all.push(z.clone());
                current = span(f, &all, n, sp)?;
            }
        }
        if !chosen.is_empty() {
            // A' = A^2 + complement coordinates; the new basis is [A', Z0]
            let mut cols: Vec<Vec<F::Elem>> = sq.basis.clone();
            cols.extend(current.non_pivots().iter().map(|&i| unit_vector(f, n, i)));
            let core_dim = cols.len();
            cols.extend(chosen.iter().cloned());
            let p = columns_matrix(f, &cols, n);
            let changed = change_basis(sub, &p, &p, &p).ok_or_else(|| {
                Error::Invalid("internal error: the annihilator split is not invertible".into())
            })?;
            let idx: Vec<usize> = (0..core_dim).collect();
            let core = restrict(&changed, &[idx.clone(), idx.clone(), idx]);
            let mut out = Vec::new();
            for piece in split_algebra(f, &core, params)? {
                let v: Vec<Vec<F::Elem>> = piece.vecs[0]
                    .iter()
                    .map(|x| through(f, x, &cols[..core_dim], n))
                    .collect();
                out.push(Piece {
                    kind: piece.kind,
                    vecs: [v.clone(), v.clone(), v],
                    certificate: piece.certificate,
                });
            }
            for z in chosen {
                out.push(Piece {
                    kind: BlockKind::ZeroAlgebra,
                    vecs: [vec![z.clone()], vec![z.clone()], vec![z]],
                    certificate: None,
                });
            }
            return Ok(out);
        }
    }
    let c = centroid(sub, &it, sp, None)?;
    let csub = reduce(f, n * n, from_space(f, &c.space));
    let images = centroid_blocks(f, &csub, &[n], params)?;
    Ok(images
        .into_iter()
        .map(|(vecs, certificate)| {
            let v = vecs.into_iter().next().expect("one space");
            Piece {
                kind: BlockKind::Product,
                vecs: [v.clone(), v.clone(), v],
                certificate,
            }
        })
        .collect())
}

/// Split one support component of a bilinear map (see the module documentation).
fn split_map<F: Field>(f: &F, sub: &Tensor, params: &BlockParams) -> Result<Vec<Piece<F::Elem>>> {
    let d = sub.dims();
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(sub);
    let lrad = reduce(
        f,
        d[0],
        from_space(f, &map_invariant(&it, MapInvariant::LeftRadical, sp)?),
    );
    let rrad = reduce(
        f,
        d[1],
        from_space(f, &map_invariant(&it, MapInvariant::RightRadical, sp)?),
    );
    let image = products_span(f, sub, sp)?;
    if lrad.dim() > 0 || rrad.dim() > 0 || image.dim() < d[2] {
        let pu: Vec<Vec<F::Elem>> = lrad
            .non_pivots()
            .iter()
            .map(|&i| unit_vector(f, d[0], i))
            .chain(lrad.basis.iter().cloned())
            .collect();
        let pv: Vec<Vec<F::Elem>> = rrad
            .non_pivots()
            .iter()
            .map(|&i| unit_vector(f, d[1], i))
            .chain(rrad.basis.iter().cloned())
            .collect();
        let pw: Vec<Vec<F::Elem>> = image
            .basis
            .iter()
            .cloned()
            .chain(image.non_pivots().iter().map(|&i| unit_vector(f, d[2], i)))
            .collect();
        let core_dims = [d[0] - lrad.dim(), d[1] - rrad.dim(), image.dim()];
        let changed = change_basis(
            sub,
            &columns_matrix(f, &pu, d[0]),
            &columns_matrix(f, &pv, d[1]),
            &columns_matrix(f, &pw, d[2]),
        )
        .ok_or_else(|| Error::Invalid("internal error: a degenerate split failed".into()))?;
        let core = restrict(&changed, &core_dims.map(|k| (0..k).collect()));
        let bases = [&pu, &pv, &pw];
        let mut out = Vec::new();
        if core.nnz() > 0 {
            for piece in split_map(f, &core, params)? {
                let vecs = [0, 1, 2].map(|a| {
                    piece.vecs[a]
                        .iter()
                        .map(|x| through(f, x, &bases[a][..core_dims[a]], d[a]))
                        .collect()
                });
                out.push(Piece { vecs, ..piece });
            }
        }
        let degenerate = [
            (0, BlockKind::LeftRadical, &pu[core_dims[0]..]),
            (1, BlockKind::RightRadical, &pv[core_dims[1]..]),
            (2, BlockKind::Cokernel, &pw[core_dims[2]..]),
        ];
        for (axis, kind, vs) in degenerate {
            for v in vs {
                let mut vecs = [Vec::new(), Vec::new(), Vec::new()];
                vecs[axis].push(v.clone());
                out.push(Piece {
                    kind,
                    vecs,
                    certificate: None,
                });
            }
        }
        return Ok(out);
    }
    let c = map_invariant(&it, MapInvariant::CentroidTriples, sp)?;
    let total = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
    let csub = reduce(f, total, from_space(f, &c));
    Ok(centroid_blocks(f, &csub, &d, params)?
        .into_iter()
        .map(|(vecs, certificate)| {
            let mut it = vecs.into_iter();
            let vecs = [0, 1, 2].map(|_| it.next().expect("three spaces"));
            Piece {
                kind: BlockKind::Product,
                vecs,
                certificate,
            }
        })
        .collect())
}

/// The images of the primitive idempotents of a centroid (tuples of maps on spaces of the
/// given sizes): per idempotent, a basis of the image on each space; with a certificate
/// when the centroid is local (one block).
#[allow(clippy::type_complexity)]
fn centroid_blocks<F: Field>(
    f: &F,
    csub: &Subspace<F::Elem>,
    sizes: &[usize],
    params: &BlockParams,
) -> Result<Vec<(Vec<Vec<Vec<F::Elem>>>, Option<Certificate>)>> {
    let calg = map_algebra(f, csub, sizes);
    let one = csub.coords(&identity_maps(f, sizes));
    let (idems, cert) = primitive_idempotents(&calg, &one, params)?;
    if idems.len() == 1 {
        let whole: Vec<Vec<Vec<F::Elem>>> = sizes
            .iter()
            .map(|&d| (0..d).map(|i| unit_vector(f, d, i)).collect())
            .collect();
        return Ok(vec![(whole, cert)]);
    }
    let mut out = Vec::new();
    for e in &idems {
        let x = csub.combine(f, e);
        let mut off = 0;
        let mut spaces = Vec::new();
        for &d in sizes {
            // the columns X e_i of the map on this space
            let cols: Vec<Vec<F::Elem>> = (0..d)
                .map(|i| (0..d).map(|l| x[off + l * d + i].clone()).collect())
                .collect();
            spaces.push(span(f, &cols, d, &params.solve)?.basis);
            off += d * d;
        }
        out.push((spaces, None));
    }
    Ok(out)
}

/// Primitive orthogonal idempotents, with the certificate of a local algebra.
pub type Idempotents<E> = (Vec<Vec<E>>, Option<Certificate>);

/// A complete set of primitive orthogonal idempotents of an associative algebra with unit
/// whose quotient by the radical is commutative (see the module documentation, step 3);
/// when there is only one (the algebra is local), also its certificate.
pub fn primitive_idempotents<F: Field>(
    c: &Alg<F>,
    one: &[F::Elem],
    params: &BlockParams,
) -> Result<Idempotents<F::Elem>> {
    let f = &c.f;
    let k = c.n;
    if k == 1 {
        return Ok((
            vec![one.to_vec()],
            Some(Certificate {
                centroid_dim: 1,
                centroid_radical_dim: 0,
                residue_degree: 1,
                residue_poly: vec![Q::default(), Q::from_integer(1.into())],
            }),
        ));
    }
    let tc = c.to_tensor("c");
    let itc = IntegralTensor::from_tensor(&tc);
    let rad = crate::invariants::radical(&tc, &itc, &params.solve)?
        .ok_or_else(|| Error::Invalid("no radical over this field".into()))?;
    let qm = QuotientMap::new(f, k, &from_space(f, &rad.space));
    let q = Alg::from_tensor(f, &quotient_in(f, &tc, &qm));
    let qone = qm.project(f, one);
    if !q.is_commutative() {
        return Err(Error::Invalid(
            "the centroid modulo its radical is not commutative: this decomposition is not \
             supported"
                .into(),
        ));
    }
    let parts = split_into_fields(&q, &qone, &params.solve, params.seed)?;
    if parts.len() == 1 {
        return Ok((
            vec![one.to_vec()],
            Some(Certificate {
                centroid_dim: k,
                centroid_radical_dim: rad.space.dim(),
                residue_degree: parts[0].degree,
                residue_poly: parts[0].poly.clone(),
            }),
        ));
    }
    let mut idems: Vec<Vec<F::Elem>> = Vec::new();
    let mut rest = one.to_vec();
    for part in &parts[..parts.len() - 1] {
        let x = qm.lift(f, &part.idempotent);
        let x = c.mul(&c.mul(&rest, &x), &rest);
        let e = c.lift_idempotent(&x)?;
        rest = c.sub(&rest, &e);
        idems.push(e);
    }
    idems.push(rest);
    // exact check: orthogonal idempotents summing to 1
    let mut sum = c.zero();
    for (i, a) in idems.iter().enumerate() {
        sum = c.add(&sum, a);
        for (j, b) in idems.iter().enumerate() {
            let p = c.mul(a, b);
            let ok = if i == j { p == *a } else { c.is_zero(&p) };
            if !ok || c.is_zero(a) {
                return Err(Error::Invalid(
                    "internal error: lifted idempotents are not orthogonal".into(),
                ));
            }
        }
    }
    if sum != one {
        return Err(Error::Invalid(
            "internal error: lifted idempotents do not add up to 1".into(),
        ));
    }
    Ok((idems, None))
}

/// Certify a block: its centroid is local (see the module documentation, step 4).
fn certify<F: Field>(f: &F, t: &Tensor, params: &BlockParams) -> Result<Certificate> {
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(t);
    let d = t.dims();
    let (space, sizes) = if t.kind() == Kind::Algebra {
        (centroid(t, &it, sp, None)?.space, vec![d[0]])
    } else {
        (
            map_invariant(&it, MapInvariant::CentroidTriples, sp)?,
            d.to_vec(),
        )
    };
    let total: usize = sizes.iter().map(|x| x * x).sum();
    let csub = reduce(f, total, from_space(f, &space));
    let calg = map_algebra(f, &csub, &sizes);
    let one = csub.coords(&identity_maps(f, &sizes));
    if calg.n == 1 {
        return Ok(Certificate {
            centroid_dim: 1,
            centroid_radical_dim: 0,
            residue_degree: 1,
            residue_poly: vec![Q::default(), Q::from_integer(1.into())],
        });
    }
    let tc = calg.to_tensor("c");
    let itc = IntegralTensor::from_tensor(&tc);
    let rad = crate::invariants::radical(&tc, &itc, sp)?
        .ok_or_else(|| Error::Invalid("no radical over this field".into()))?;
    let qm = QuotientMap::new(f, calg.n, &from_space(f, &rad.space));
    let q = Alg::from_tensor(f, &quotient_in(f, &tc, &qm));
    match field_decision(&q, &qm.project(f, &one), sp)? {
        FieldDecision::Field { degree, poly } => Ok(Certificate {
            centroid_dim: calg.n,
            centroid_radical_dim: rad.space.dim(),
            residue_degree: degree,
            residue_poly: poly,
        }),
        FieldDecision::NotField(why) => Err(Error::Invalid(format!(
            "internal error: a block splits further (its centroid modulo the radical: {why})"
        ))),
    }
}

/// Assemble the global change of basis, the new tensor, the checks and the blocks.
fn assemble<F: Field>(
    f: &F,
    t: &Tensor,
    ncomps: usize,
    pieces: Vec<(usize, Piece<F::Elem>)>,
    comp_tensors: Vec<([Vec<usize>; 3], Tensor, bool)>,
    params: &BlockParams,
) -> Result<Decomposition> {
    let d = t.dims();
    // new positions: pieces in order, per axis
    let mut cols: [Vec<Vec<F::Elem>>; 3] = [Vec::new(), Vec::new(), Vec::new()];
    let mut block_of: [Vec<usize>; 3] = [Vec::new(), Vec::new(), Vec::new()];
    let mut comp_start = vec![[usize::MAX; 3]; ncomps];
    for (b, (ci, p)) in pieces.iter().enumerate() {
        let comp = &comp_tensors[*ci].0;
        for a in 0..3 {
            if comp_start[*ci][a] == usize::MAX {
                comp_start[*ci][a] = cols[a].len();
            }
            for v in &p.vecs[a] {
                let mut full = vec![f.zero(); d[a]];
                for (x, &i) in v.iter().zip(&comp[a]) {
                    full[i] = x.clone();
                }
                cols[a].push(full);
                block_of[a].push(b);
            }
        }
    }
    for a in 0..3 {
        if cols[a].len() != d[a] {
            return Err(Error::Invalid(format!(
                "internal error: the blocks span {} of {} dimensions on an axis",
                cols[a].len(),
                d[a]
            )));
        }
    }
    let names = new_names(f, t, &cols, &block_of);
    let mut out = Tensor::zero(t.field(), t.kind(), d, Some(names));
    for (ci, (_, sub, _)) in comp_tensors.iter().enumerate() {
        let start = comp_start[ci];
        for (i, j, k, c) in sub.entries() {
            out.set(start[0] + i, start[1] + j, start[2] + k, c.clone());
        }
    }
    let outside = out
        .entries()
        .filter(|(i, j, k, _)| {
            !(block_of[0][*i] == block_of[1][*j] && block_of[1][*j] == block_of[2][*k])
        })
        .count();
    if outside > 0 {
        return Err(Error::Invalid(format!(
            "internal error: {outside} coefficients lie outside the blocks"
        )));
    }
    let change = [0, 1, 2].map(|a| columns_matrix(f, &cols[a], d[a]));
    let mut blocks = Vec::new();
    let mut start = [0usize; 3];
    for (_, p) in pieces.into_iter() {
        let dims = [p.vecs[0].len(), p.vecs[1].len(), p.vecs[2].len()];
        let idx = [0, 1, 2].map(|a| (start[a]..start[a] + dims[a]).collect::<Vec<usize>>());
        let tensor = restrict(&out, &idx);
        let basis = [0, 1, 2].map(|a| idx[a].iter().map(|&i| to_q(f, &cols[a][i])).collect());
        let needs = p.kind == BlockKind::Product && dims.iter().sum::<usize>() > 1;
        let certificate = match p.certificate {
            Some(c) => Some(c),
            None if needs && params.certify => Some(certify(f, &tensor, params)?),
            None => None,
        };
        blocks.push(Block {
            kind: p.kind,
            dims,
            basis,
            tensor,
            certificate,
        });
        for a in 0..3 {
            start[a] += dims[a];
        }
    }
    Ok(Decomposition {
        blocks,
        change,
        tensor: out,
        support_components: ncomps,
        outside,
    })
}

/// Names of the new basis: the old name where a new vector is an old basis vector, else
/// `f<block>_<i>` (algebra) or `u`, `v`, `w` + `<block>_<i>` (map), made unique.
fn new_names<F: Field>(
    f: &F,
    t: &Tensor,
    cols: &[Vec<Vec<F::Elem>>; 3],
    block_of: &[Vec<usize>; 3],
) -> [Vec<String>; 3] {
    let alg = t.kind() == Kind::Algebra;
    let prefix = if alg {
        ["f", "f", "f"]
    } else {
        ["u", "v", "w"]
    };
    [0, 1, 2].map(|a| {
        let mut used = std::collections::HashSet::new();
        let mut within = vec![0usize; block_of[a].iter().max().map_or(0, |m| m + 1)];
        cols[a]
            .iter()
            .zip(&block_of[a])
            .map(|(v, &b)| {
                let nz: Vec<usize> = (0..v.len()).filter(|&i| !f.is_zero(&v[i])).collect();
                let mut name = if nz.len() == 1 && f.is_one(&v[nz[0]]) {
                    t.name(a, nz[0]).to_string()
                } else {
                    format!("{}{}_{}", prefix[a], b + 1, within[b] + 1)
                };
                within[b] += 1;
                while !used.insert(name.clone()) {
                    name.push('\'');
                }
                name
            })
            .collect()
    })
}
