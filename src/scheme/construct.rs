//! New schemes from old: Kronecker (tensor) products, direct sums, permutations of the
//! axes, the symmetries of matrix multiplication, restriction to sub-bases, relabelling.
//!
//! Conventions. The Kronecker product of tensors T (dims d) and T' (dims d') has index
//! `x * d'[a] + x'` on axis a, names `x_y`, and `c[(i,i'),(j,j'),(k,k')] = c[i,j,k] c'[i',j',k']`;
//! the product of schemes pairs every term of one with every term of the other
//! (`R(T (x) T') <= R(T) R(T')`). Matrix multiplication <n,m,p>: A is n x m, B is m x p,
//! C = AB is n x p, `a_ij` at index `i*m + j`, `b_jk` at `j*p + k`, `c_ik` at `i*p + k`.
//! [`matmul_kron_order`] maps the Kronecker indices of <n,m,p> (x) <n',m',p'> to this
//! order for <nn', mm', pp'> (block index major). Every construction returns a scheme
//! for the constructed tensor; tests verify them exactly.

use super::{Scheme, reduce_into};
use crate::error::Error;
use crate::scalar::Q;
use crate::tensor::{Kind, Tensor};
use num_traits::Zero;

fn same_field(a: &Scheme, b: &Scheme) -> Result<(), Error> {
    if a.field != b.field {
        return Err(Error::Invalid(format!(
            "the schemes are over different fields ({} and {})",
            a.field.name(),
            b.field.name()
        )));
    }
    Ok(())
}

fn kron_vec(field: crate::scalar::FieldSpec, x: &[Q], y: &[Q]) -> Vec<Q> {
    let mut out = Vec::with_capacity(x.len() * y.len());
    for a in x {
        for b in y {
            let p = a * b;
            out.push(reduce_into(field, &p).unwrap_or(p));
        }
    }
    out
}

/// The Kronecker product of two tensors over the same field (an algebra when both are).
/// Cost: O(nnz(T) nnz(T')).
pub fn kron_tensor(t1: &Tensor, t2: &Tensor) -> Result<Tensor, Error> {
    if t1.field() != t2.field() {
        return Err(Error::Invalid(
            "the tensors are over different fields".into(),
        ));
    }
    let (d1, d2) = (t1.dims(), t2.dims());
    let dims = [d1[0] * d2[0], d1[1] * d2[1], d1[2] * d2[2]];
    if let Err(m) = crate::tensor::check_shape(dims) {
        return Err(Error::Invalid(format!("the product is too large: {m}")));
    }
    let names = [0, 1, 2].map(|a| {
        let mut v = Vec::new();
        for x in &t1.names()[a] {
            for y in &t2.names()[a] {
                v.push(format!("{x}_{y}"));
            }
        }
        v
    });
    let kind = if t1.kind() == Kind::Algebra && t2.kind() == Kind::Algebra {
        Kind::Algebra
    } else {
        Kind::Bilinear
    };
    let mut t = Tensor::zero(t1.field(), kind, dims, Some(names));
    for (i, j, k, c) in t1.entries() {
        for (i2, j2, k2, c2) in t2.entries() {
            t.set(i * d2[0] + i2, j * d2[1] + j2, k * d2[2] + k2, c * c2);
        }
    }
    Ok(t)
}

/// The Kronecker product of schemes: rank r r', a scheme for [`kron_tensor`].
/// Cost: O(r r' (d0 d0' + d1 d1' + d2 d2')).
pub fn kron(s1: &Scheme, s2: &Scheme) -> Result<Scheme, Error> {
    same_field(s1, s2)?;
    let f = s1.field;
    let dims = [0, 1, 2].map(|a| s1.dims[a] * s2.dims[a]);
    let mut s = Scheme::empty(f, dims);
    for t in 0..s1.rank() {
        for t2 in 0..s2.rank() {
            s.push(
                kron_vec(f, &s1.u[t], &s2.u[t2]),
                kron_vec(f, &s1.v[t], &s2.v[t2]),
                kron_vec(f, &s1.w[t], &s2.w[t2]),
            );
        }
    }
    Ok(s)
}

/// For one axis holding r x c matrices (Kronecker partner r' x c'): Kronecker index
/// `(a*c + b)*(r'c') + (a'*c' + b')` -> block-major index `(a*r' + a')*(c c') + (b*c' + b')`.
fn block_order(r: usize, c: usize, r2: usize, c2: usize) -> Vec<usize> {
    let mut perm = vec![0; r * c * r2 * c2];
    for a in 0..r {
        for b in 0..c {
            for a2 in 0..r2 {
                for b2 in 0..c2 {
                    perm[(a * c + b) * (r2 * c2) + a2 * c2 + b2] =
                        (a * r2 + a2) * (c * c2) + b * c2 + b2;
                }
            }
        }
    }
    perm
}

/// The basis permutation taking <n,m,p> (x) <n',m',p'> (Kronecker order) to the matrix
/// multiplication order of <nn', mm', pp'>: `perm[axis][kron_index] = matmul_index`.
pub fn matmul_kron_order(f1: [usize; 3], f2: [usize; 3]) -> [Vec<usize>; 3] {
    let ([n, m, p], [n2, m2, p2]) = (f1, f2);
    [
        block_order(n, m, n2, m2),
        block_order(m, p, m2, p2),
        block_order(n, p, n2, p2),
    ]
}

/// True when `list` holds an index `>= dim` or the same index twice. Cost O(dim + len).
fn has_bad_index(list: &[usize], dim: usize) -> bool {
    let mut seen = vec![false; dim];
    list.iter()
        .any(|&x| x >= dim || std::mem::replace(&mut seen[x], true))
}

fn check_perm(perm: &[Vec<usize>; 3], dims: [usize; 3]) -> Result<(), Error> {
    for a in 0..3 {
        if perm[a].len() != dims[a] || has_bad_index(&perm[a], dims[a]) {
            return Err(Error::Invalid(format!(
                "not a permutation of the {} basis",
                crate::tensor::AXES[a]
            )));
        }
    }
    Ok(())
}

/// Renumber the bases: basis vector `x` of axis a becomes `perm[a][x]` (names move along).
pub fn relabel_tensor(t: &Tensor, perm: &[Vec<usize>; 3]) -> Result<Tensor, Error> {
    check_perm(perm, t.dims())?;
    let names = [0, 1, 2].map(|a| {
        let mut v = vec![String::new(); t.dims()[a]];
        for (x, n) in t.names()[a].iter().enumerate() {
            v[perm[a][x]] = n.clone();
        }
        v
    });
    let algebra = t.kind() == Kind::Algebra && perm[0] == perm[1] && perm[1] == perm[2];
    let kind = if algebra {
        Kind::Algebra
    } else {
        Kind::Bilinear
    };
    let mut out = Tensor::zero(t.field(), kind, t.dims(), Some(names));
    for (i, j, k, c) in t.entries() {
        out.set(perm[0][i], perm[1][j], perm[2][k], c.clone());
    }
    Ok(out)
}

/// The scheme for [`relabel_tensor`] with the same permutation.
pub fn relabel(s: &Scheme, perm: &[Vec<usize>; 3]) -> Result<Scheme, Error> {
    check_perm(perm, s.dims)?;
    let mv = |x: &[Q], p: &[usize]| {
        let mut y = vec![Q::zero(); x.len()];
        for (i, c) in x.iter().enumerate() {
            y[p[i]] = c.clone();
        }
        y
    };
    let mut out = Scheme::empty(s.field, s.dims);
    for t in 0..s.rank() {
        out.push(
            mv(&s.u[t], &perm[0]),
            mv(&s.v[t], &perm[1]),
            mv(&s.w[t], &perm[2]),
        );
    }
    Ok(out)
}

fn sum_names(a: &[String], b: &[String]) -> Vec<String> {
    if a.iter().any(|x| b.contains(x)) {
        a.iter()
            .map(|x| format!("{x}_1"))
            .chain(b.iter().map(|x| format!("{x}_2")))
            .collect()
    } else {
        a.iter().chain(b).cloned().collect()
    }
}

/// The direct sum T (+) T' (block diagonal; the second tensor's indices are shifted by
/// the first one's dimensions; clashing names get suffixes `_1`, `_2`).
pub fn direct_sum_tensor(t1: &Tensor, t2: &Tensor) -> Result<Tensor, Error> {
    if t1.field() != t2.field() {
        return Err(Error::Invalid(
            "the tensors are over different fields".into(),
        ));
    }
    let (d1, d2) = (t1.dims(), t2.dims());
    let dims = [d1[0] + d2[0], d1[1] + d2[1], d1[2] + d2[2]];
    let names = [0, 1, 2].map(|a| sum_names(&t1.names()[a], &t2.names()[a]));
    let kind = if t1.kind() == Kind::Algebra && t2.kind() == Kind::Algebra {
        Kind::Algebra
    } else {
        Kind::Bilinear
    };
    let mut t = Tensor::zero(t1.field(), kind, dims, Some(names));
    for (i, j, k, c) in t1.entries() {
        t.set(i, j, k, c.clone());
    }
    for (i, j, k, c) in t2.entries() {
        t.set(d1[0] + i, d1[1] + j, d1[2] + k, c.clone());
    }
    Ok(t)
}

/// The direct sum of schemes (rank r + r'), a scheme for [`direct_sum_tensor`].
pub fn direct_sum(s1: &Scheme, s2: &Scheme) -> Result<Scheme, Error> {
    same_field(s1, s2)?;
    let (d1, d2) = (s1.dims, s2.dims);
    let mut s = Scheme::empty(s1.field, [d1[0] + d2[0], d1[1] + d2[1], d1[2] + d2[2]]);
    let pad = |x: &[Q], before: usize, after: usize| {
        let mut v = vec![Q::zero(); before];
        v.extend_from_slice(x);
        v.extend(std::iter::repeat_n(Q::zero(), after));
        v
    };
    for t in 0..s1.rank() {
        s.push(
            pad(&s1.u[t], 0, d2[0]),
            pad(&s1.v[t], 0, d2[1]),
            pad(&s1.w[t], 0, d2[2]),
        );
    }
    for t in 0..s2.rank() {
        s.push(
            pad(&s2.u[t], d1[0], 0),
            pad(&s2.v[t], d1[1], 0),
            pad(&s2.w[t], d1[2], 0),
        );
    }
    Ok(s)
}

/// Permute the axes as [`Tensor::permute_axes`] does (`perm[a]` = old axis that becomes
/// new axis a): a scheme for `t.permute_axes(perm)` of the same rank.
pub fn permute_axes(s: &Scheme, perm: [usize; 3]) -> Result<Scheme, Error> {
    let mut sorted = perm;
    sorted.sort_unstable();
    if sorted != [0, 1, 2] {
        return Err(Error::Invalid(format!(
            "{perm:?} is not a permutation of the axes 0, 1, 2"
        )));
    }
    let dims = perm.map(|a| s.dims[a]);
    let mut out = Scheme::empty(s.field, dims);
    for t in 0..s.rank() {
        let f = [&s.u[t], &s.v[t], &s.w[t]];
        out.push(f[perm[0]].clone(), f[perm[1]].clone(), f[perm[2]].clone());
    }
    Ok(out)
}

fn check_matmul(s: &Scheme, [n, m, p]: [usize; 3]) -> Result<(), Error> {
    if s.dims != [n * m, m * p, n * p] {
        return Err(Error::Invalid(format!(
            "the scheme has format {:?}, not that of <{n},{m},{p}> ({:?})",
            s.dims,
            [n * m, m * p, n * p]
        )));
    }
    Ok(())
}

/// The transpose of a `rows x cols` matrix stored row-major: `out[c * rows + r] = x[r * cols + c]`.
fn transposed(x: &[Q], rows: usize, cols: usize) -> Vec<Q> {
    let mut out = vec![Q::zero(); rows * cols];
    for r in 0..rows {
        for c in 0..cols {
            out[c * rows + r] = x[r * cols + c].clone();
        }
    }
    out
}

/// Cyclic symmetry: a scheme for <n,m,p> gives one for <m,p,n> of the same rank, from
/// `tr(ABC^T)`-style invariance: `u'[(j,k)] = v[(j,k)]`, `v'[(k,i)] = w[(i,k)]`,
/// `w'[(j,i)] = u[(i,j)]` (the transposes keep C = AB row-major).
pub fn matmul_cyclic(s: &Scheme, nmp: [usize; 3]) -> Result<Scheme, Error> {
    check_matmul(s, nmp)?;
    let [n, m, p] = nmp;
    let mut out = Scheme::empty(s.field, [m * p, p * n, m * n]);
    for t in 0..s.rank() {
        out.push(
            s.v[t].clone(),
            transposed(&s.w[t], n, p),
            transposed(&s.u[t], n, m),
        );
    }
    Ok(out)
}

/// Transposition: (AB)^T = B^T A^T turns a scheme for <n,m,p> into one for <p,m,n>.
pub fn matmul_transpose(s: &Scheme, nmp: [usize; 3]) -> Result<Scheme, Error> {
    check_matmul(s, nmp)?;
    let [n, m, p] = nmp;
    let mut out = Scheme::empty(s.field, [p * m, m * n, p * n]);
    for t in 0..s.rank() {
        out.push(
            transposed(&s.v[t], m, p),
            transposed(&s.u[t], n, m),
            transposed(&s.w[t], n, p),
        );
    }
    Ok(out)
}

fn check_keep(keep: &[Vec<usize>; 3], dims: [usize; 3]) -> Result<(), Error> {
    for a in 0..3 {
        if has_bad_index(&keep[a], dims[a]) {
            return Err(Error::Invalid(format!(
                "bad index list for the {} axis",
                crate::tensor::AXES[a]
            )));
        }
    }
    Ok(())
}

/// The restriction of a tensor to sub-bases `keep[a]` (indices kept, in that order):
/// `c'[x][y][z] = c[keep0[x]][keep1[y]][keep2[z]]`.
pub fn restrict_tensor(t: &Tensor, keep: &[Vec<usize>; 3]) -> Result<Tensor, Error> {
    check_keep(keep, t.dims())?;
    let dims = [keep[0].len(), keep[1].len(), keep[2].len()];
    let names = [0, 1, 2].map(|a| keep[a].iter().map(|&x| t.names()[a][x].clone()).collect());
    let mut out = Tensor::zero(t.field(), Kind::Bilinear, dims, Some(names));
    for (x, &i) in keep[0].iter().enumerate() {
        for (y, &j) in keep[1].iter().enumerate() {
            for (k, c) in t.product(i, j) {
                if let Some(z) = keep[2].iter().position(|kk| kk == k) {
                    out.set(x, y, z, c.clone());
                }
            }
        }
    }
    Ok(out)
}

/// The scheme for [`restrict_tensor`]: setting the other inputs to zero and ignoring the
/// other outputs. Terms that become zero are dropped, so the rank may fall.
pub fn restrict(s: &Scheme, keep: &[Vec<usize>; 3]) -> Result<Scheme, Error> {
    check_keep(keep, s.dims)?;
    let mut out = Scheme::empty(s.field, [keep[0].len(), keep[1].len(), keep[2].len()]);
    let pick = |x: &[Q], k: &[usize]| k.iter().map(|&i| x[i].clone()).collect::<Vec<_>>();
    for t in 0..s.rank() {
        let (u, v, w) = (
            pick(&s.u[t], &keep[0]),
            pick(&s.v[t], &keep[1]),
            pick(&s.w[t], &keep[2]),
        );
        if [&u, &v, &w].iter().all(|x| x.iter().any(|c| !c.is_zero())) {
            out.push(u, v, w);
        }
    }
    Ok(out)
}

/// The index lists restricting <n,m,p> to its leading sub-format <n',m',p'>.
pub fn matmul_subformat(nmp: [usize; 3], sub: [usize; 3]) -> Result<[Vec<usize>; 3], Error> {
    let ([_, m, p], [n2, m2, p2]) = (nmp, sub);
    if (0..3).any(|a| sub[a] > nmp[a]) {
        return Err(Error::Invalid(format!(
            "<{n2},{m2},{p2}> is not a sub-format of {nmp:?}"
        )));
    }
    let grid = |r: usize, c: usize, cols: usize| -> Vec<usize> {
        (0..r)
            .flat_map(|a| (0..c).map(move |b| a * cols + b))
            .collect()
    };
    Ok([grid(n2, m2, m), grid(m2, p2, p), grid(n2, p2, p)])
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use crate::scheme::verify;

    fn strassen() -> Scheme {
        scheme(STRASSEN, &matmul(2, 2, 2))
    }

    #[test]
    fn kron_strassen_gives_49_for_444() {
        // Strassen 1969: R(<4,4,4>) <= 49 by recursion.
        let t = matmul(2, 2, 2);
        let kt = kron_tensor(&t, &t).unwrap();
        let ks = kron(&strassen(), &strassen()).unwrap();
        assert_eq!(ks.rank(), 49);
        assert!(verify(&ks, &kt).is_ok());
        let perm = matmul_kron_order([2, 2, 2], [2, 2, 2]);
        let rt = relabel_tensor(&kt, &perm).unwrap();
        let rs = relabel(&ks, &perm).unwrap();
        let m444 = matmul(4, 4, 4);
        assert_eq!(
            rt.entries().collect::<Vec<_>>(),
            m444.entries().collect::<Vec<_>>()
        );
        assert!(verify(&rs, &m444).is_ok());
        // mixed formats: <2,2,2> (x) <1,2,3> = <2,4,6>
        let s123 = Scheme::standard(&matmul(1, 2, 3));
        let ks = relabel(
            &kron(&strassen(), &s123).unwrap(),
            &matmul_kron_order([2, 2, 2], [1, 2, 3]),
        )
        .unwrap();
        assert_eq!(ks.rank(), 42);
        assert!(verify(&ks, &matmul(2, 4, 6)).is_ok());
    }

    #[test]
    fn cyclic_and_transpose_symmetries() {
        // Hopcroft and Kerr 1971: R(<2,2,3>) <= 11; built as Strassen on a 2x2x2 block plus
        // the schoolbook <2,2,1> (4 multiplications).
        let s223 = hopcroft_kerr_like();
        assert_eq!(s223.rank(), 11);
        assert!(verify(&s223, &matmul(2, 2, 3)).is_ok());
        let c = matmul_cyclic(&s223, [2, 2, 3]).unwrap();
        assert!(verify(&c, &matmul(2, 3, 2)).is_ok());
        let c2 = matmul_cyclic(&c, [2, 3, 2]).unwrap();
        assert!(verify(&c2, &matmul(3, 2, 2)).is_ok());
        let tr = matmul_transpose(&s223, [2, 2, 3]).unwrap();
        assert!(verify(&tr, &matmul(3, 2, 2)).is_ok());
        assert!(matmul_cyclic(&s223, [2, 3, 2]).is_err());
        // generic axis permutation agrees with the tensor's
        let t = matmul(2, 2, 3);
        for perm in crate::tensor::AXIS_PERMUTATIONS {
            assert!(verify(&permute_axes(&s223, perm).unwrap(), &t.permute_axes(perm)).is_ok());
        }
    }

    /// <2,2,3> = <2,2,2> on columns 0,1 of B and C, plus <2,2,1> on column 2.
    pub fn hopcroft_kerr_like() -> Scheme {
        let s = direct_sum(&strassen(), &Scheme::standard(&matmul(2, 2, 1))).unwrap();
        // direct sum has A twice (a 8-dim left space); fold the two copies of A together
        let mut out = Scheme::empty(s.field, [4, 6, 6]);
        // B index in the sum: <2,2,2> b_jk at j*2+k, <2,2,1> b_j at 4+j -> <2,2,3> j*3+k
        let bmap = [0, 1, 3, 4, 2, 5];
        // C: <2,2,2> c_ik at i*2+k, <2,2,1> c_i at 4+i -> i*3+k
        let cmap = bmap;
        for t in 0..s.rank() {
            let u: Vec<Q> = (0..4).map(|i| &s.u[t][i] + &s.u[t][4 + i]).collect();
            let mut v = vec![Q::zero(); 6];
            let mut w = vec![Q::zero(); 6];
            for x in 0..6 {
                v[bmap[x]] = s.v[t][x].clone();
                w[cmap[x]] = s.w[t][x].clone();
            }
            out.push(u, v, w);
        }
        out
    }

    #[test]
    fn restriction_and_direct_sum() {
        let s = kron(&strassen(), &strassen()).unwrap();
        let s = relabel(&s, &matmul_kron_order([2, 2, 2], [2, 2, 2])).unwrap();
        let keep = matmul_subformat([4, 4, 4], [3, 3, 3]).unwrap();
        let r = restrict(&s, &keep).unwrap();
        assert!(verify(&r, &matmul(3, 3, 3)).is_ok());
        assert!(r.rank() <= 49);
        assert_eq!(
            restrict_tensor(&matmul(4, 4, 4), &keep)
                .unwrap()
                .entries()
                .count(),
            27
        );
        let a = matmul(2, 2, 2);
        let ds = direct_sum(&strassen(), &strassen()).unwrap();
        assert!(verify(&ds, &direct_sum_tensor(&a, &a).unwrap()).is_ok());
        assert!(matmul_subformat([2, 2, 2], [3, 1, 1]).is_err());
    }
}
