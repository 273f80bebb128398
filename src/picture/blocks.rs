//! Block layouts: a reordering of each basis and a split of each reordered basis into
//! consecutive blocks, the shape of a direct-sum decomposition `T = T_1 (+) ... (+) T_b`.
//!
//! Invariants of a checked layout: `order[a]` is a permutation of `0..dims[a]` (position p
//! of the new basis holds old basis vector `order[a][p]`), `sizes[a]` are positive and add
//! up to `dims[a]`, and the three axes have the same number of blocks. A coefficient
//! c[i][j][k] lies *inside* the blocks when i, j and k fall in blocks with the same index.

use crate::error::{Error, Result};
use crate::tensor::Tensor;

/// A reordered basis per axis and its block sizes. See the module documentation.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct BlockLayout {
    /// `order[a][p]`: the old index of the basis vector at new position p on axis a.
    pub order: [Vec<usize>; 3],
    /// Block sizes on each axis, in the new order.
    pub sizes: [Vec<usize>; 3],
}

impl BlockLayout {
    /// The same reordering and block sizes on all three axes (an algebra).
    pub fn same_on_all_axes(order: Vec<usize>, sizes: Vec<usize>) -> Self {
        BlockLayout {
            order: [order.clone(), order.clone(), order],
            sizes: [sizes.clone(), sizes.clone(), sizes],
        }
    }

    /// Blocks of the given sizes on each axis, keeping the basis order.
    pub fn in_place(dims: [usize; 3], sizes: [Vec<usize>; 3]) -> Self {
        BlockLayout {
            order: dims.map(|d| (0..d).collect()),
            sizes,
        }
    }

    /// The number of blocks.
    pub fn blocks(&self) -> usize {
        self.sizes[0].len()
    }

    /// Check the invariants against a shape; the error says what is wrong.
    pub fn check(&self, dims: [usize; 3]) -> Result<()> {
        const AXIS: [&str; 3] = ["left", "right", "result"];
        for a in 0..3 {
            let d = dims[a];
            let mut seen = vec![false; d];
            if self.order[a].len() != d {
                return Err(Error::Invalid(format!(
                    "the {} order has {} entries, the axis has dimension {d}",
                    AXIS[a],
                    self.order[a].len()
                )));
            }
            for &x in &self.order[a] {
                if x >= d || std::mem::replace(&mut seen[x], true) {
                    return Err(Error::Invalid(format!(
                        "the {} order is not a permutation of 0..{d} (at {x})",
                        AXIS[a]
                    )));
                }
            }
            if self.sizes[a].contains(&0) || self.sizes[a].iter().sum::<usize>() != d {
                return Err(Error::Invalid(format!(
                    "the {} block sizes {:?} must be positive and add up to {d}",
                    AXIS[a], self.sizes[a]
                )));
            }
            if self.sizes[a].len() != self.sizes[0].len() {
                return Err(Error::Invalid(format!(
                    "the {} axis has {} blocks but the left axis has {}",
                    AXIS[a],
                    self.sizes[a].len(),
                    self.sizes[0].len()
                )));
            }
        }
        Ok(())
    }

    /// For each axis, the block index of every new position.
    pub fn block_of_position(&self) -> [Vec<usize>; 3] {
        [0, 1, 2].map(|a| {
            self.sizes[a]
                .iter()
                .enumerate()
                .flat_map(|(b, &n)| std::iter::repeat_n(b, n))
                .collect()
        })
    }

    /// For each axis, the new positions where a block other than the first starts.
    pub fn cuts(&self) -> [Vec<usize>; 3] {
        [0, 1, 2].map(|a| {
            let mut at = 0;
            let mut v = Vec::new();
            for &n in &self.sizes[a][..self.sizes[a].len().saturating_sub(1)] {
                at += n;
                v.push(at);
            }
            v
        })
    }

    /// The tensor in the new basis order (names move along). The layout must be checked.
    pub fn reorder(&self, t: &Tensor) -> Result<Tensor> {
        self.check(t.dims())?;
        crate::scheme::construct::relabel_tensor(t, &self.positions())
    }

    /// For each axis, the new position of every old basis vector (the inverse of `order`).
    pub fn positions(&self) -> [Vec<usize>; 3] {
        [0, 1, 2].map(|a| {
            let mut p = vec![0; self.order[a].len()];
            for (new, &old) in self.order[a].iter().enumerate() {
                p[old] = new;
            }
            p
        })
    }
}

/// Count the nonzero coefficients of `t` inside and outside the blocks of a layout:
/// `(inside, outside)`. Cost: O(nnz).
pub fn count_inside(t: &Tensor, layout: &BlockLayout) -> Result<(usize, usize)> {
    layout.check(t.dims())?;
    let blocks = layout.block_of_position();
    let pos = layout.positions();
    let (mut inside, mut outside) = (0, 0);
    for (i, j, k, _) in t.entries() {
        let b = [
            blocks[0][pos[0][i]],
            blocks[1][pos[1][j]],
            blocks[2][pos[2][k]],
        ];
        if b[0] == b[1] && b[1] == b[2] {
            inside += 1;
        } else {
            outside += 1;
        }
    }
    Ok((inside, outside))
}
