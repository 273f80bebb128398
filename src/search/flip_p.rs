//! Flip-graph walk over a small prime field GF(p), 2 < p < 2^16 (the GF(2) walk of
//! [`super::flip`] generalised; Kauers and Moosbauer 2022, "Flip graphs for matrix
//! multiplication", also walk over GF(p)).
//!
//! Over GF(p) two terms share a factor when their factors on an axis are proportional, so
//! each factor is indexed by a hash of its normalised form (first nonzero entry 1).
//! Moves, for terms s, t whose axis-x factors satisfy `a_s = alpha a_t`:
//! - flip with a random `mu != 0`: `(a_t, alpha b_s + mu b_t, c_s) + (a_t, b_t, c_t - mu c_s)`;
//! - reduction: terms sharing two factors (up to scalars) merge; zero factors drop a term;
//! - plus transition: `(a, b, c) + (a', b', c')` becomes
//!   `(a - a', b, c) + (a', b + b', c) + (a', b', c' - c)`.
//!
//! Invariant: after every public method, no term has a zero factor and no two terms share
//! two factors up to scalars; `key[x][t]` is the hash of the normalised factor `f[x][t]`.

use super::flip::{FastRng, FlipParams, Snapshot, WalkEvent, WalkState, walk_state};
use crate::error::{Error, Result};
use crate::scalar::{Field, FieldSpec, PrimeField, Q};
use crate::scheme::Scheme;
use crate::tensor::Tensor;
use num_bigint::BigInt;

/// A scheme over GF(p): `terms[t][a]` is the factor on axis a, entries in `0..p`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct PScheme {
    pub p: u32,
    pub dims: [usize; 3],
    pub terms: Vec<[Vec<u32>; 3]>,
}

impl PScheme {
    /// The standard scheme of a tensor over GF(p).
    pub fn standard(t: &Tensor) -> Result<PScheme> {
        let FieldSpec::Prime(p) = t.field() else {
            return Err(Error::Invalid(
                "the GF(p) flip walk needs a tensor over GF(p)".into(),
            ));
        };
        if !(3..1 << 16).contains(&p) {
            return Err(Error::Invalid(format!(
                "the GF(p) flip walk supports 2 < p < 65536, not {p}"
            )));
        }
        let f = PrimeField::new(p).expect("prime");
        let d = t.dims();
        let unit = |n: usize, i: usize, v: u32| {
            let mut e = vec![0u32; n];
            e[i] = v;
            e
        };
        let terms = t
            .entries()
            .map(|(i, j, k, c)| {
                let c = f.from_rational(c).expect("tensor over GF(p)") as u32;
                [unit(d[0], i, 1), unit(d[1], j, 1), unit(d[2], k, c)]
            })
            .collect();
        Ok(PScheme {
            p: p as u32,
            dims: d,
            terms,
        })
    }

    pub fn rank(&self) -> usize {
        self.terms.len()
    }

    /// A scheme over Q or GF(p) reduced into GF(p) (denominators prime to p); terms with
    /// a zero factor mod p are dropped.
    pub fn from_scheme(s: &Scheme, p: u64) -> Result<PScheme> {
        if !(3..1 << 16).contains(&p) {
            return Err(Error::Invalid(format!(
                "the GF(p) flip walk supports 2 < p < 65536, not {p}"
            )));
        }
        let red = s.with_field(FieldSpec::Prime(p))?;
        let f = PrimeField::new(p).expect("prime");
        let conv = |v: &[Q]| -> Vec<u32> {
            v.iter()
                .map(|x| f.from_rational(x).expect("reduced") as u32)
                .collect()
        };
        let terms = (0..red.rank())
            .map(|t| [conv(&red.u[t]), conv(&red.v[t]), conv(&red.w[t])])
            .filter(|tr| tr.iter().all(|v| v.iter().any(|&x| x != 0)))
            .collect();
        Ok(PScheme {
            p: p as u32,
            dims: s.dims,
            terms,
        })
    }

    /// The scheme with entries in `0..p` as rationals, labelled GF(p).
    pub fn to_scheme(&self) -> Scheme {
        let conv = |v: &Vec<u32>| {
            v.iter()
                .map(|&x| Q::from_integer(BigInt::from(x)))
                .collect::<Vec<_>>()
        };
        let mut s = Scheme::empty(FieldSpec::Prime(self.p as u64), self.dims);
        for tr in &self.terms {
            s.push(conv(&tr[0]), conv(&tr[1]), conv(&tr[2]));
        }
        s
    }
}

/// The walk state over GF(p).
#[derive(Clone, Debug)]
pub struct PWalker {
    p: u32,
    dims: [usize; 3],
    f: [Vec<Vec<u32>>; 3],
    key: [Vec<u64>; 3],
    inv: Vec<u32>,
    rng: FastRng,
    work: Vec<usize>,
}

impl PWalker {
    pub fn new(start: &PScheme, seed: u64) -> PWalker {
        let p = start.p;
        let f = PrimeField::new(p as u64).expect("prime");
        let inv = (0..p)
            .map(|a| f.inv(&(a as u64)).unwrap_or(0) as u32)
            .collect();
        let mut w = PWalker {
            p,
            dims: start.dims,
            f: [Vec::new(), Vec::new(), Vec::new()],
            key: [Vec::new(), Vec::new(), Vec::new()],
            inv,
            rng: FastRng::new(seed),
            work: Vec::new(),
        };
        w.load(start);
        w
    }

    pub fn load(&mut self, s: &PScheme) {
        for a in 0..3 {
            self.f[a] = s.terms.iter().map(|t| t[a].clone()).collect();
            self.key[a] = self.f[a].iter().map(|v| self.hash(v)).collect();
        }
        self.work.clear();
        self.work.extend(0..s.rank());
        self.settle();
    }

    pub fn rank(&self) -> usize {
        self.f[0].len()
    }

    pub fn scheme(&self) -> PScheme {
        let terms = (0..self.rank())
            .map(|t| {
                [
                    self.f[0][t].clone(),
                    self.f[1][t].clone(),
                    self.f[2][t].clone(),
                ]
            })
            .collect();
        PScheme {
            p: self.p,
            dims: self.dims,
            terms,
        }
    }

    fn first_nz(v: &[u32]) -> Option<usize> {
        v.iter().position(|&x| x != 0)
    }

    /// Hash of the normalised vector (0 for the zero vector).
    fn hash(&self, v: &[u32]) -> u64 {
        let Some(i0) = Self::first_nz(v) else {
            return 0;
        };
        let s = self.inv[v[i0] as usize] as u64;
        let mut h = 0xcbf2_9ce4_8422_2325u64;
        for &x in v {
            h = (h ^ (x as u64 * s % self.p as u64)).wrapping_mul(0x100_0000_01b3);
        }
        h | 1
    }

    /// alpha with `a = alpha b` (a, b proportional and nonzero).
    fn ratio(&self, a: &[u32], b: &[u32]) -> u32 {
        let i0 = Self::first_nz(b).expect("nonzero");
        ((a[i0] as u64 * self.inv[b[i0] as usize] as u64) % self.p as u64) as u32
    }

    /// `x <- alpha x + beta y` entrywise mod p.
    fn combine(&self, x: &mut [u32], alpha: u32, y: &[u32], beta: u32) {
        let p = self.p as u64;
        for (a, &b) in x.iter_mut().zip(y) {
            *a = ((*a as u64 * alpha as u64 + b as u64 * beta as u64) % p) as u32;
        }
    }

    fn rekey(&mut self, a: usize, t: usize) {
        self.key[a][t] = self.hash(&self.f[a][t]);
    }

    fn remove(&mut self, i: usize) {
        let last = self.rank() - 1;
        for a in 0..3 {
            self.f[a].swap_remove(i);
            self.key[a].swap_remove(i);
        }
        for w in self.work.iter_mut() {
            if *w == i {
                *w = usize::MAX;
            } else if *w == last {
                *w = i;
            }
        }
    }

    fn settle(&mut self) {
        while let Some(i) = self.work.pop() {
            if i >= self.rank() {
                continue;
            }
            if (0..3).any(|a| self.key[a][i] == 0) {
                self.remove(i);
                continue;
            }
            let partner = (0..self.rank()).find_map(|u| {
                if u == i {
                    return None;
                }
                let e = [0, 1, 2].map(|a| self.key[a][u] == self.key[a][i]);
                (e.iter().filter(|&&x| x).count() >= 2).then_some((u, e))
            });
            let Some((u, e)) = partner else { continue };
            // the two shared axes pa, pb; merge along the third m
            let m = e.iter().position(|&x| !x).unwrap_or(2);
            let (pa, pb) = match m {
                0 => (1, 2),
                1 => (0, 2),
                _ => (0, 1),
            };
            let al = self.ratio(&self.f[pa][i], &self.f[pa][u]);
            let be = self.ratio(&self.f[pb][i], &self.f[pb][u]);
            let ab = ((al as u64 * be as u64) % self.p as u64) as u32;
            let fi = self.f[m][i].clone();
            let mut fu = std::mem::take(&mut self.f[m][u]);
            self.combine(&mut fu, 1, &fi, ab);
            self.f[m][u] = fu;
            self.rekey(m, u);
            let last = self.rank() - 1;
            self.remove(i);
            self.work.push(if u == last { i } else { u });
        }
    }

    /// One attempted flip. Cost: O(r + d) operations.
    pub fn flip(&mut self) -> bool {
        let r = self.rank();
        if r < 2 {
            return false;
        }
        let s = self.rng.below(r);
        let x = self.rng.below(3);
        let key = self.key[x][s];
        let cnt = self.key[x].iter().filter(|&&v| v == key).count() - 1;
        if cnt == 0 {
            return false;
        }
        let k = self.rng.below(cnt);
        let t = (0..r)
            .filter(|&i| i != s && self.key[x][i] == key)
            .nth(k)
            .expect("partner");
        let (y, z) = self.rng.other_axes(x);
        let mu = 1 + self.rng.below(self.p as usize - 1) as u32;
        let alpha = self.ratio(&self.f[x][s], &self.f[x][t]);
        self.f[x][s] = self.f[x][t].clone();
        let ft = self.f[y][t].clone();
        let mut fs = std::mem::take(&mut self.f[y][s]);
        self.combine(&mut fs, alpha, &ft, mu);
        self.f[y][s] = fs;
        let fzs = self.f[z][s].clone();
        let mut fzt = std::mem::take(&mut self.f[z][t]);
        self.combine(&mut fzt, 1, &fzs, self.p - mu);
        self.f[z][t] = fzt;
        self.rekey(x, s);
        self.rekey(y, s);
        self.rekey(z, t);
        self.work.push(s);
        self.work.push(t);
        self.settle();
        true
    }

    /// One attempted plus transition (rank + 1).
    pub fn plus(&mut self) -> bool {
        let r = self.rank();
        if r < 2 {
            return false;
        }
        let (s, t) = self.rng.distinct_pair(r);
        let x = self.rng.below(3);
        if self.key[x][s] == self.key[x][t] {
            return false;
        }
        let (y, z) = self.rng.other_axes(x);
        let p = self.p;
        // (a,b,c) + (a',b',c') = (a - a', b, c) + (a', b + b', c) + (a', b', c' - c)
        let mut new: [Vec<u32>; 3] = [Vec::new(), Vec::new(), Vec::new()];
        new[x] = self.f[x][t].clone();
        let mut ny = self.f[y][s].clone();
        self.combine(&mut ny, 1, &self.f[y][t], 1);
        new[y] = ny;
        new[z] = self.f[z][s].clone();
        let at = self.f[x][t].clone();
        let mut fxs = std::mem::take(&mut self.f[x][s]);
        self.combine(&mut fxs, 1, &at, p - 1);
        self.f[x][s] = fxs;
        let cs = self.f[z][s].clone();
        let mut fzt = std::mem::take(&mut self.f[z][t]);
        self.combine(&mut fzt, 1, &cs, p - 1);
        self.f[z][t] = fzt;
        self.rekey(x, s);
        self.rekey(z, t);
        for (a, v) in new.into_iter().enumerate() {
            let h = self.hash(&v);
            self.f[a].push(v);
            self.key[a].push(h);
        }
        self.work.extend([s, t, r]);
        self.settle();
        true
    }
}

impl Snapshot for PScheme {
    fn rank(&self) -> usize {
        PScheme::rank(self)
    }
    fn to_scheme(&self) -> Scheme {
        PScheme::to_scheme(self)
    }
}

impl WalkState for PWalker {
    type Snap = PScheme;
    fn flip(&mut self) -> bool {
        PWalker::flip(self)
    }
    fn plus(&mut self) -> bool {
        PWalker::plus(self)
    }
    fn rank(&self) -> usize {
        PWalker::rank(self)
    }
    fn snap(&self) -> PScheme {
        self.scheme()
    }
    fn restore(&mut self, s: &PScheme) {
        self.load(s)
    }
}

/// Walk over GF(p) from `start`; see [`walk_state`].
pub fn walk_p(
    start: &PScheme,
    target: usize,
    params: &FlipParams,
    seed: u64,
    budget: u64,
    event: &mut dyn FnMut(WalkEvent<PScheme>) -> bool,
) -> Option<PScheme> {
    let mut w = PWalker::new(start, seed);
    walk_state(&mut w, target, params, budget, event)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::verify;

    #[test]
    fn moves_preserve_the_tensor_mod_3() {
        let t = crate::search::tests::matmul(2, 2, 3)
            .with_field(FieldSpec::Prime(3))
            .unwrap();
        let s = PScheme::standard(&t).unwrap();
        let mut w = PWalker::new(&s, 5);
        for step in 0..5000 {
            if step % 401 == 0 {
                w.plus();
            } else {
                w.flip();
            }
            if step % 500 == 0 {
                assert!(verify(&w.scheme().to_scheme(), &t).is_ok(), "step {step}");
            }
        }
        assert!(verify(&w.scheme().to_scheme(), &t).is_ok());
    }
}
