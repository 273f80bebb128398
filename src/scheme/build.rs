//! Schemes of matrix formats built from schemes of smaller formats.
//!
//! Definitions (the format <n,m,p> is the product of an n x m by an m x p matrix, bases
//! row-major as in the generator `matmul:n,m,p`):
//! - *Product* (Strassen 1969, applied to blocks): schemes of ranks r and s for <a,b,c> and
//!   <d,e,f> give a scheme of rank r s for <ad,be,cf>: the matrices of the big format are
//!   read as a x b (b x c, a x c) matrices of d x e (e x f, d x f) blocks; the outer scheme
//!   multiplies blocks, each block product by the inner scheme ([`matmul_product`]).
//! - *Direct sum along one axis*: schemes of ranks r and s for <a,b,c> and <a,b,c'> give one
//!   of rank r + s for <a,b,c+c'> (B and C split into column blocks, A shared); likewise
//!   <a,b,c> + <a',b,c> = <a+a',b,c> (A and C split into row blocks) and
//!   <a,b,c> + <a,b',c> = <a,b+b',c> (A split by columns, B by rows, C the sum of both
//!   products) ([`matmul_join`]).
//! - *Symmetries*: a scheme of <n,m,p> gives schemes of the same rank for every permutation
//!   of (n,m,p), by the cyclic map <n,m,p> -> <m,p,n> and the transposition
//!   <n,m,p> -> <p,m,n> ([`super::construct::matmul_cyclic`],
//!   [`super::construct::matmul_transpose`]; [`to_format`]).
//!
//! [`build_matmul`] finds, by dynamic programming over the formats below the requested one
//! (splits along each axis, factorisations into products, the six permutations, the
//! schoolbook scheme and the given base schemes), the lowest rank these rules reach from
//! the bases, builds that scheme and verifies it exactly against the matrix multiplication
//! tensor over the requested field. Ties go to a base scheme, then to the schoolbook scheme
//! (fewest additions), then to products, then to splits.
//!
//! Invariant: every scheme [`build_matmul`] returns has passed `verify`.

use super::construct::{kron, matmul_cyclic, matmul_kron_order, matmul_transpose, relabel};
use super::{Scheme, verify};
use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::Tensor;
use num_traits::Zero;
use std::collections::HashMap;

/// A scheme of a matrix format usable as a building block, with a short name for the
/// description of what is built from it.
#[derive(Clone, Debug)]
pub struct BaseScheme {
    pub format: [usize; 3],
    pub scheme: Scheme,
    pub name: String,
}

/// A verified scheme built by [`build_matmul`].
#[derive(Clone, Debug)]
pub struct Built {
    pub format: [usize; 3],
    pub scheme: Scheme,
    /// How it was built, e.g. `(matmul222.strassen (x) matmul222.strassen)`.
    pub how: String,
}

fn fmt3(f: [usize; 3]) -> String {
    format!("<{},{},{}>", f[0], f[1], f[2])
}

fn check_format(s: &Scheme, f: [usize; 3]) -> Result<()> {
    let want = [f[0] * f[1], f[1] * f[2], f[0] * f[2]];
    if s.dims != want {
        return Err(Error::Invalid(format!(
            "the scheme has shape {}x{}x{}, not that of {} ({}x{}x{})",
            s.dims[0],
            s.dims[1],
            s.dims[2],
            fmt3(f),
            want[0],
            want[1],
            want[2]
        )));
    }
    Ok(())
}

/// The product of a scheme `s1` of <a,b,c> and a scheme `s2` of <d,e,f>: a scheme of
/// <ad,be,cf> of rank `r1 r2` (see the module docs), in the generator's basis order.
/// Cost: O(r1 r2 (ab de + bc ef + ac df)).
pub fn matmul_product(s1: &Scheme, f1: [usize; 3], s2: &Scheme, f2: [usize; 3]) -> Result<Scheme> {
    check_format(s1, f1)?;
    check_format(s2, f2)?;
    let k = kron(s1, s2)?;
    relabel(&k, &matmul_kron_order(f1, f2))
}

/// Place an `r x c` matrix (row-major) at rows `r0..`, columns `c0..` of a zero matrix with
/// `cols` columns and `len` entries.
fn embed(x: &[Q], c: usize, r0: usize, c0: usize, cols: usize, len: usize) -> Vec<Q> {
    let mut out = vec![Q::zero(); len];
    for (idx, v) in x.iter().enumerate() {
        out[(r0 + idx / c) * cols + c0 + idx % c] = v.clone();
    }
    out
}

/// The direct sum along `axis` (0: n, 1: m, 2: p) of a scheme `s1` of `f1` and a scheme
/// `s2` of `f2`, which agree on the other two axes: a scheme of rank `r1 + r2` for the
/// format with `f1[axis] + f2[axis]` on that axis (see the module docs). Cost:
/// O((r1 + r2)(nm + mp + np)) of the result.
pub fn matmul_join(
    s1: &Scheme,
    f1: [usize; 3],
    s2: &Scheme,
    f2: [usize; 3],
    axis: usize,
) -> Result<Scheme> {
    check_format(s1, f1)?;
    check_format(s2, f2)?;
    if axis > 2 || (0..3).any(|a| a != axis && f1[a] != f2[a]) {
        return Err(Error::Invalid(format!(
            "{} and {} cannot be joined along axis {axis}",
            fmt3(f1),
            fmt3(f2)
        )));
    }
    if s1.field != s2.field {
        return Err(Error::Invalid(
            "the schemes are over different fields".into(),
        ));
    }
    let mut f = f1;
    f[axis] += f2[axis];
    let mut out = Scheme::empty(s1.field, [f[0] * f[1], f[1] * f[2], f[0] * f[2]]);
    // (row axis, column axis) of A, B and C
    let mats = [(0, 1), (1, 2), (0, 2)];
    for (s, sf, second) in [(s1, f1, false), (s2, f2, true)] {
        let off = |a: usize| if second && a == axis { f1[axis] } else { 0 };
        for t in 0..s.rank() {
            let parts = [&s.u[t], &s.v[t], &s.w[t]];
            let [u, v, w] = [0, 1, 2].map(|x| {
                let (ra, ca) = mats[x];
                embed(parts[x], sf[ca], off(ra), off(ca), f[ca], f[ra] * f[ca])
            });
            out.push(u, v, w);
        }
    }
    Ok(out)
}

/// A scheme of `from` (a permutation of `to`) turned into one of `to` of the same rank by
/// the cyclic map and the transposition. Cost: O(r (nm + mp + np)) per map (at most three).
pub fn to_format(s: &Scheme, from: [usize; 3], to: [usize; 3]) -> Result<Scheme> {
    check_format(s, from)?;
    let cyc = |f: [usize; 3]| [f[1], f[2], f[0]];
    let tr = |f: [usize; 3]| [f[2], f[1], f[0]];
    let (mut x, mut f) = (s.clone(), from);
    for transposed in [false, true] {
        if transposed {
            x = matmul_transpose(s, from)?;
            f = tr(from);
        }
        for _ in 0..3 {
            if f == to {
                return Ok(x);
            }
            x = matmul_cyclic(&x, f)?;
            f = cyc(f);
        }
    }
    Err(Error::Invalid(format!(
        "{} is not a permutation of {}",
        fmt3(to),
        fmt3(from)
    )))
}

fn sorted(mut f: [usize; 3]) -> [usize; 3] {
    f.sort_unstable();
    f
}

/// How the best scheme of a sorted format is made (sub-formats ordered as in the format).
#[derive(Clone, Copy, Debug)]
enum Step {
    Base(usize),
    Schoolbook,
    Product([usize; 3], [usize; 3]),
    Split(usize, [usize; 3], [usize; 3]),
}

/// The dynamic programme over sorted formats: the lowest rank reached and its step.
struct Planner<'a> {
    bases: &'a [BaseScheme],
    /// the lowest-rank base of each sorted format
    base_of: HashMap<[usize; 3], usize>,
    memo: HashMap<[usize; 3], (u128, Step)>,
}

impl<'a> Planner<'a> {
    fn new(bases: &'a [BaseScheme]) -> Self {
        let mut base_of: HashMap<[usize; 3], usize> = HashMap::new();
        for (i, b) in bases.iter().enumerate() {
            let key = sorted(b.format);
            let better = base_of
                .get(&key)
                .is_none_or(|&j| b.scheme.rank() < bases[j].scheme.rank());
            if better {
                base_of.insert(key, i);
            }
        }
        Planner {
            bases,
            base_of,
            memo: HashMap::new(),
        }
    }

    /// The lowest rank for the format `f` (any order). Cost: O(n m p (n + m + p + divisor
    /// triples)) over all sub-formats, once each.
    fn rank(&mut self, f: [usize; 3]) -> u128 {
        let key = sorted(f);
        if let Some(&(r, _)) = self.memo.get(&key) {
            return r;
        }
        let mut best = (
            key.iter().map(|&x| x as u128).product::<u128>(),
            Step::Schoolbook,
        );
        if let Some(&i) = self.base_of.get(&key) {
            let r = self.bases[i].scheme.rank() as u128;
            if r <= best.0 {
                best = (r, Step::Base(i));
            }
        }
        let divisors = |x: usize| (1..=x).filter(move |d| x.is_multiple_of(*d));
        for d0 in divisors(key[0]) {
            for d1 in divisors(key[1]) {
                for d2 in divisors(key[2]) {
                    let a = [d0, d1, d2];
                    let b = [key[0] / d0, key[1] / d1, key[2] / d2];
                    if a == [1, 1, 1] || b == [1, 1, 1] {
                        continue;
                    }
                    let r = self.rank(a) * self.rank(b);
                    if r < best.0 {
                        best = (r, Step::Product(a, b));
                    }
                }
            }
        }
        for axis in 0..3 {
            for k in 1..=key[axis] / 2 {
                let (mut a, mut b) = (key, key);
                a[axis] = k;
                b[axis] = key[axis] - k;
                let r = self.rank(a) + self.rank(b);
                if r < best.0 {
                    best = (r, Step::Split(axis, a, b));
                }
            }
        }
        self.memo.insert(key, best);
        best.0
    }

    /// The scheme for `f` (any order) following the recorded steps, with its description.
    fn build(&mut self, f: [usize; 3], field: FieldSpec) -> Result<(Scheme, String)> {
        let key = sorted(f);
        self.rank(key);
        let step = self.memo[&key].1;
        let (s, how) = match step {
            Step::Base(i) => {
                let b = &self.bases[i];
                let s = b.scheme.with_field(field)?;
                (to_format(&s, b.format, key)?, b.name.clone())
            }
            Step::Schoolbook => {
                let t = crate::generators::matmul(key[0], key[1], key[2])?;
                let s = Scheme::standard(&t).with_field(field)?;
                (s, format!("schoolbook {}", fmt3(f)))
            }
            Step::Product(a, b) => {
                let (sa, ha) = self.build(a, field)?;
                let (sb, hb) = self.build(b, field)?;
                (matmul_product(&sa, a, &sb, b)?, format!("({ha} (x) {hb})"))
            }
            Step::Split(axis, a, b) => {
                let (sa, ha) = self.build(a, field)?;
                let (sb, hb) = self.build(b, field)?;
                let name = ["n", "m", "p"][axis];
                (
                    matmul_join(&sa, a, &sb, b, axis)?,
                    format!("({ha} + {hb} along {name})"),
                )
            }
        };
        Ok((to_format(&s, key, f)?, how))
    }
}

/// [`build_matmul`] refuses schemes with more coefficients (rank times the sum of the three
/// dimensions) than this, before building them: each is held exactly.
pub const MAX_COEFFICIENTS: u128 = 1 << 22;

/// The lowest rank [`build_matmul`] reaches for `<n,m,p>` from `bases`, without building
/// the scheme (`u128`: the schoolbook rank of any format fits). Cost: the dynamic
/// programme of [`build_matmul`].
pub fn built_rank(nmp: [usize; 3], bases: &[BaseScheme]) -> u128 {
    Planner::new(bases).rank(nmp)
}

/// The best scheme of `<n,m,p>` over `field` that products, direct sums along an axis and
/// the symmetries build from `bases` and schoolbook schemes (see the module docs),
/// verified exactly. Bases whose shape does not match their format, or whose coefficients
/// do not reduce into `field`, are left out. Errors: a format with a zero side, or one past
/// the size limits of a tensor. Cost: the dynamic programme over the at most n m p
/// sub-formats, the construction (linear in the size of the scheme) and one exact
/// verification, O(sum of nnz(u_t) nnz(v_t) nnz(w_t)).
pub fn build_matmul(nmp: [usize; 3], field: FieldSpec, bases: &[BaseScheme]) -> Result<Built> {
    let t = crate::generators::matmul(nmp[0], nmp[1], nmp[2])?;
    let goal: Tensor = if field == t.field() {
        t
    } else {
        t.with_field(field).map_err(Error::Invalid)?
    };
    let usable: Vec<BaseScheme> = bases
        .iter()
        .filter(|b| check_format(&b.scheme, b.format).is_ok())
        .filter_map(|b| {
            Some(BaseScheme {
                scheme: b.scheme.with_field(field).ok()?,
                ..b.clone()
            })
        })
        .collect();
    let mut planner = Planner::new(&usable);
    let rank = planner.rank(nmp);
    let slots = rank.saturating_mul((nmp[0] * nmp[1] + nmp[1] * nmp[2] + nmp[0] * nmp[2]) as u128);
    if slots > MAX_COEFFICIENTS {
        return Err(Error::Invalid(format!(
            "the best scheme built for {} has rank {rank} and {slots} coefficients, above the \
             limit of 2^22 = {MAX_COEFFICIENTS} held exactly",
            fmt3(nmp)
        )));
    }
    let (mut scheme, how) = planner.build(nmp, field)?;
    scheme.labels.clear();
    if let Err(m) = verify(&scheme, &goal) {
        return Err(Error::Invalid(format!(
            "the scheme built for {} ({how}) does not verify: {} wrong coefficients",
            fmt3(nmp),
            m.count
        )));
    }
    Ok(Built {
        format: nmp,
        scheme,
        how,
    })
}

/// The format `<n,m,p>` when `t` is the matrix multiplication tensor in the generator's
/// basis (dims `nm, mp, np` and the same coefficients), else `None`. Cost: O(nmp).
pub fn matmul_format_of(t: &Tensor) -> Option<[usize; 3]> {
    let [x, y, z] = t.dims();
    // nm = x, mp = y, np = z: n^2 = xz / y
    let n2 = (x * z).checked_div(y)?;
    let n = (n2 as f64).sqrt().round() as usize;
    if n == 0 || n * n * y != x * z || x % n != 0 || z % n != 0 {
        return None;
    }
    let (m, p) = (x / n, z / n);
    if m * p != y || t.nnz() != n * m * p {
        return None;
    }
    let one = num_traits::One::one();
    for i in 0..n {
        for k in 0..m {
            for j in 0..p {
                let c: Q = t.get(i * m + k, k * p + j, i * p + j);
                if c != one {
                    return None;
                }
            }
        }
    }
    Some([n, m, p])
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::Matrix;
    use crate::scheme::sandwich::apply_sandwich;
    use crate::scheme::testkit::*;
    use proptest::prelude::*;
    use rand::{Rng, SeedableRng};

    fn strassen_base() -> BaseScheme {
        BaseScheme {
            format: [2, 2, 2],
            scheme: scheme(STRASSEN, &matmul(2, 2, 2)),
            name: "strassen".into(),
        }
    }

    /// A scheme of <n,m,p> in a user's basis: the Strassen scheme (for <2,2,2>) or the
    /// schoolbook one, moved by the sandwich `(X, Y, Z)` of random matrices with entries up
    /// to 10^9 (a scheme of the same tensor with dense, big coefficients).
    fn scrambled(f: [usize; 3], seed: u64) -> Scheme {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        let t = matmul(f[0], f[1], f[2]);
        let s = if f == [2, 2, 2] && rng.gen_bool(0.5) {
            scheme(STRASSEN, &t)
        } else {
            Scheme::standard(&t)
        };
        loop {
            let mut big = |n: usize| {
                let rows = (0..n)
                    .map(|_| {
                        (0..n)
                            .map(|_| {
                                Q::from_integer(
                                    rng.gen_range(-1_000_000_000i64..=1_000_000_000).into(),
                                )
                            })
                            .collect()
                    })
                    .collect();
                Matrix::from_rows(rows, n)
            };
            let (x, y, z) = (big(f[0]), big(f[1]), big(f[2]));
            if let Some(out) = apply_sandwich(&s, f, [&x, &y, &z]) {
                return out;
            }
        }
    }

    fn checks(s: &Scheme, f: [usize; 3]) -> bool {
        verify(s, &matmul(f[0], f[1], f[2])).is_ok()
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 16, ..ProptestConfig::default() })]
        /// Products, joins along each axis and the six permutations of schemes in a user's
        /// basis (dense, big coefficients) verify exactly, with ranks r1 r2 and r1 + r2.
        #[test]
        fn products_joins_and_symmetries_verify(
            f1 in prop::array::uniform3(1usize..=2),
            f2 in prop::array::uniform3(1usize..=2),
            axis in 0usize..3,
            seed in 0u64..1000,
        ) {
            let (s1, s2) = (scrambled(f1, seed), scrambled(f2, seed + 1));
            prop_assert!(checks(&s1, f1) && checks(&s2, f2));
            let pf = [f1[0] * f2[0], f1[1] * f2[1], f1[2] * f2[2]];
            let p = matmul_product(&s1, f1, &s2, f2).unwrap();
            prop_assert_eq!(p.rank(), s1.rank() * s2.rank());
            prop_assert!(checks(&p, pf));
            // the second scheme re-made for the format that agrees off the axis
            let mut g = f1;
            g[axis] = f2[axis];
            let s3 = scrambled(g, seed + 2);
            let j = matmul_join(&s1, f1, &s3, g, axis).unwrap();
            let mut jf = f1;
            jf[axis] += g[axis];
            prop_assert_eq!(j.rank(), s1.rank() + s3.rank());
            prop_assert!(checks(&j, jf));
            for to in [[0, 1, 2], [1, 2, 0], [2, 0, 1], [2, 1, 0], [0, 2, 1], [1, 0, 2]] {
                let tf = to.map(|a| f1[a]);
                let x = to_format(&s1, f1, tf).unwrap();
                prop_assert!(checks(&x, tf));
            }
        }
    }

    #[test]
    fn mismatched_formats_are_refused() {
        let s = strassen_base().scheme;
        assert!(matmul_join(&s, [2, 2, 2], &s, [2, 2, 2], 3).is_err());
        let s3 = Scheme::standard(&matmul(2, 3, 2));
        assert!(matmul_join(&s, [2, 2, 2], &s3, [2, 3, 2], 0).is_err());
        assert!(matmul_product(&s, [2, 2, 3], &s, [2, 2, 2]).is_err());
        assert!(to_format(&s3, [2, 3, 2], [2, 3, 3]).is_err());
        assert!(build_matmul([0, 2, 2], FieldSpec::Rational, &[]).is_err());
        // past the coefficient limit: refused before building
        let e = build_matmul([40, 40, 40], FieldSpec::Rational, &[]).unwrap_err();
        assert!(e.to_string().contains("above the limit"), "{e}");
    }

    /// From Strassen's scheme alone: R(<4,4,4>) <= 49 and R(<2,2,2k>) <= 7k (Strassen
    /// 1969), <2,2,3> <= 7 + 4 = 11 (Hopcroft and Kerr 1971 reach 11 too); with nothing,
    /// the schoolbook rank.
    #[test]
    fn best_builds_from_strassen() {
        let bases = [strassen_base()];
        for (f, r) in [
            ([4, 4, 4], 49),
            ([2, 2, 4], 14),
            ([2, 2, 3], 11),
            ([4, 2, 2], 14),
            ([3, 3, 3], 26),
            ([8, 8, 8], 343),
            ([1, 3, 5], 15),
        ] {
            let b = build_matmul(f, FieldSpec::Rational, &bases).unwrap();
            assert_eq!(b.scheme.rank(), r, "{f:?}: {}", b.how);
            assert_eq!(built_rank(f, &bases), r as u128);
            assert!(checks(&b.scheme, f));
        }
        let b = build_matmul([3, 2, 2], FieldSpec::Rational, &[]).unwrap();
        assert_eq!(
            (b.scheme.rank(), b.how.as_str()),
            (12, "schoolbook <3,2,2>")
        );
        // over GF(2) the same construction verifies there
        let b = build_matmul([4, 4, 4], FieldSpec::Prime(2), &bases).unwrap();
        assert_eq!((b.scheme.rank(), b.scheme.field), (49, FieldSpec::Prime(2)));
        // a side of 16: the check accumulates sparsely
        let b = build_matmul([16, 16, 8], FieldSpec::Rational, &bases).unwrap();
        assert_eq!(b.scheme.rank(), 343 * 4);
    }

    #[test]
    fn matmul_format_is_recognised() {
        for f in [[2, 3, 4], [1, 1, 1], [5, 1, 2], [3, 3, 3]] {
            assert_eq!(matmul_format_of(&matmul(f[0], f[1], f[2])), Some(f));
        }
        assert_eq!(matmul_format_of(&polymul(3)), None);
        // the algebra M_2 has the same table as <2,2,2> (E_ij E_jl = E_il)
        assert_eq!(matmul_format_of(&m2_algebra()), Some([2, 2, 2]));
        let mut t = matmul(2, 2, 2);
        t.set(0, 0, 1, Q::from_integer(1.into()));
        assert_eq!(matmul_format_of(&t), None);
    }
}
