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

mod pieces;
mod support;
mod vectors;

use pieces::{certify, degenerate_pieces, split_algebra, split_map};
use support::{restrict, support_components};
use vectors::{columns_matrix, from_space, primitive_vector, through, to_q};

/// Parameters of [`decompose`].
#[derive(Clone, Debug)]
pub struct BlockParams {
    pub solve: SolveParams,
    /// Seed of the random elements used to split and certify field components.
    pub seed: u64,
    /// Recompute every block's centroid and show it local (indecomposable).
    pub certify: bool,
    /// The centroid of an algebra already computed by the caller, as a proven basis of
    /// maps (`[l][i]` at `l n + i`): used wherever that very algebra (same table) needs
    /// its centroid, instead of solving for it again.
    pub known_centroid: Option<std::sync::Arc<(Tensor, Space)>>,
}

impl BlockParams {
    /// The known centroid of `t`, if the caller gave one for this very table.
    fn known_centroid_of(&self, t: &Tensor) -> Option<Space> {
        self.known_centroid
            .as_ref()
            .filter(|k| k.0 == *t)
            .map(|k| k.1.clone())
    }
}

impl Default for BlockParams {
    fn default() -> Self {
        BlockParams {
            solve: SolveParams::default(),
            seed: 1,
            certify: true,
            known_centroid: None,
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;

    #[test]
    fn a_known_centroid_gives_the_same_blocks() {
        // the group algebra Q[C_6] splits into the fields Q, Q, Q(zeta_3), Q(zeta_6)
        // (Perlis and Walker 1950; common practice); octonions form one block
        for spec in ["cyclic:6", "octonions", "matrix:2"] {
            let t = generate(spec).unwrap();
            let it = IntegralTensor::from_tensor(&t);
            let sp = SolveParams::default();
            let c = centroid(&t, &it, &sp, None).unwrap().space;
            let plain = decompose(&t, &BlockParams::default()).unwrap();
            let known = BlockParams {
                known_centroid: Some(std::sync::Arc::new((t.clone(), c))),
                ..Default::default()
            };
            let with = decompose(&t, &known).unwrap();
            assert_eq!(format!("{with:?}"), format!("{plain:?}"), "{spec}");
        }
        let t = generate("cyclic:6").unwrap();
        assert_eq!(
            decompose(&t, &BlockParams::default()).unwrap().blocks.len(),
            4
        );
    }
}
