//! Support components of a tensor: index classes per axis joined by nonzero coefficients
//! (a block-diagonal splitting by a permutation), and the restriction to one class.

use super::*;

/// Index classes per axis joined by nonzero coefficients.
pub(super) fn support_components(t: &Tensor) -> Vec<[Vec<usize>; 3]> {
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
pub(super) fn restrict(t: &Tensor, idx: &[Vec<usize>; 3]) -> Tensor {
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
