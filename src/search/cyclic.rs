//! The flip walk restricted to schemes of a square format <n,n,n> that are invariant under
//! the cyclic symmetry of matrix multiplication (Moosbauer and Poole 2025, "Flip graphs
//! with symmetry and new matrix multiplication schemes"), over GF(2).
//!
//! With C = AB stored row-major, `sum a_il b_lj c_ij` is invariant under
//! `sigma(u, v, w) = (v, w^T, u^T)` (u, v, w read as n x n matrices), a map of order 3. An
//! invariant scheme is a union of *orbits* `{x, sigma x, sigma^2 x}`. The walker stores
//! every orbit as three slots `3o + k` holding `sigma^k` of its representative. An orbit
//! whose three terms are equal (`x = (a, a, a^T)`) is *degenerate*: over GF(2) its three
//! equal terms add up to one term, so it counts 1 towards the rank (3 otherwise).
//!
//! Moves act on whole orbits: a flip (or plus transition, or reduction) between slots s and
//! t of two different orbits is applied together with its images on the slot pairs
//! `(sigma^j s, sigma^j t)`, where axis a of a term is axis `a - j (mod 3)` of its image.
//! The three moves touch six different slots, and sigma is linear, so the sum of the
//! scheme is preserved and every orbit stays an orbit.
//!
//! Invariant: after every public method, slot `3o + k` is `sigma^k` of slot `3o`, no slot
//! has a zero factor, and `rank` is the rank of the expanded scheme.

use super::bits::{BitScheme, bit, words};
use super::flip::{
    FastRng, Mask, Snapshot, WalkState, count_sharing_two, is_zero, widen, xor_into,
};
use crate::error::{Error, Result};

/// A cyclic-invariant scheme over GF(2): orbit representatives of <n,n,n>.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CyclicScheme {
    pub n: usize,
    /// `orbits[o][a]`: the factor on axis a of the representative (n^2 bits, row-major).
    pub orbits: Vec<[Vec<u64>; 3]>,
}

/// The transpose of an n x n matrix mask.
fn transpose_bits(m: &[u64], n: usize) -> Vec<u64> {
    let mut out = vec![0u64; m.len()];
    for i in 0..n {
        for j in 0..n {
            if bit(m, i * n + j) {
                let k = j * n + i;
                out[k / 64] |= 1 << (k % 64);
            }
        }
    }
    out
}

/// `sigma(u, v, w) = (v, w^T, u^T)`.
fn sigma(t: &[Vec<u64>; 3], n: usize) -> [Vec<u64>; 3] {
    [
        t[1].clone(),
        transpose_bits(&t[2], n),
        transpose_bits(&t[0], n),
    ]
}

impl CyclicScheme {
    /// The standard algorithm of <n,n,n> as orbits: the term `a_il b_lj c_ij` for the
    /// index triple (i, l, j) has image (l, j, i); the n triples (i, i, i) are degenerate.
    pub fn standard(n: usize) -> Result<CyclicScheme> {
        if n == 0 || n * n > super::bits::MAX_DIM {
            return Err(Error::Invalid(format!(
                "the symmetric walk needs a square format <n,n,n> with 1 <= n <= 16, not n = {n}"
            )));
        }
        let wd = words(n * n);
        let unit = |i: usize| super::bits::unit_mask(wd, i);
        let mut orbits = Vec::new();
        for i in 0..n {
            for l in 0..n {
                for j in 0..n {
                    // one representative per orbit: the lexicographically smallest rotation
                    if (i, l, j) <= (l, j, i) && (i, l, j) <= (j, i, l) {
                        orbits.push([unit(i * n + l), unit(l * n + j), unit(i * n + j)]);
                    }
                }
            }
        }
        Ok(CyclicScheme { n, orbits })
    }

    /// The orbits of an invariant scheme (`None` when `b` is not invariant).
    pub fn from_bits(b: &BitScheme, n: usize) -> Option<CyclicScheme> {
        if b.dims != [n * n; 3] {
            return None;
        }
        let mut left: Vec<[Vec<u64>; 3]> = b.terms.clone();
        let mut orbits = Vec::new();
        while let Some(t) = left.pop() {
            let s1 = sigma(&t, n);
            if s1 == t {
                orbits.push(t);
                continue;
            }
            let s2 = sigma(&s1, n);
            for img in [s1, s2] {
                let at = left.iter().position(|x| *x == img)?;
                left.swap_remove(at);
            }
            orbits.push(t);
        }
        Some(CyclicScheme { n, orbits })
    }

    /// The expanded scheme (a degenerate orbit is one term).
    pub fn to_bits(&self) -> BitScheme {
        let mut terms = Vec::new();
        for o in &self.orbits {
            let s1 = sigma(o, self.n);
            if s1 == *o {
                terms.push(o.clone());
            } else {
                let s2 = sigma(&s1, self.n);
                terms.extend([o.clone(), s1, s2]);
            }
        }
        BitScheme {
            dims: [self.n * self.n; 3],
            terms,
        }
    }

    /// The rank of the expanded scheme.
    pub fn rank(&self) -> usize {
        self.orbits
            .iter()
            .map(|o| if sigma(o, self.n) == *o { 1 } else { 3 })
            .sum()
    }
}

impl Snapshot for CyclicScheme {
    fn rank(&self) -> usize {
        CyclicScheme::rank(self)
    }
    fn to_scheme(&self) -> crate::scheme::Scheme {
        self.to_bits().to_scheme(crate::scalar::FieldSpec::Prime(2))
    }
}

/// The walk state on invariant schemes.
#[derive(Clone, Debug)]
pub struct CyclicWalker<const W: usize> {
    n: usize,
    f: [Vec<Mask<W>>; 3],
    degenerate: Vec<bool>,
    rank: usize,
    rng: FastRng,
    work: Vec<usize>,
}

/// Axis a of a term is axis `a - j (mod 3)` of its j-th image.
#[inline(always)]
fn shift(a: usize, j: usize) -> usize {
    (a + 3 - j) % 3
}

impl<const W: usize> CyclicWalker<W> {
    /// Start at `start` (reductions are applied at once). Panics if n^2 needs more than W
    /// words.
    pub fn new(start: &CyclicScheme, seed: u64) -> Self {
        assert!(words(start.n * start.n) <= W, "walker too narrow");
        let mut w = CyclicWalker {
            n: start.n,
            f: [Vec::new(), Vec::new(), Vec::new()],
            degenerate: Vec::new(),
            rank: 0,
            rng: FastRng::new(seed),
            work: Vec::new(),
        };
        w.load(start);
        w
    }

    /// Replace the current scheme.
    pub fn load(&mut self, s: &CyclicScheme) {
        for a in 0..3 {
            self.f[a].clear();
        }
        for o in &s.orbits {
            let s1 = sigma(o, s.n);
            let s2 = sigma(&s1, s.n);
            for t in [o, &s1, &s2] {
                for (fa, ta) in self.f.iter_mut().zip(t) {
                    fa.push(widen(ta));
                }
            }
        }
        let orbits = s.orbits.len();
        self.degenerate = vec![false; orbits];
        self.rank = 3 * orbits;
        for o in 0..orbits {
            self.refresh(o);
        }
        self.work.clear();
        self.work.extend(0..3 * orbits);
        self.settle();
    }

    /// A copy of the current scheme.
    pub fn scheme(&self) -> CyclicScheme {
        let wd = words(self.n * self.n);
        let orbits = (0..self.degenerate.len())
            .map(|o| [0, 1, 2].map(|a| self.f[a][3 * o][..wd].to_vec()))
            .collect();
        CyclicScheme { n: self.n, orbits }
    }

    pub fn rank(&self) -> usize {
        self.rank
    }

    fn slots(&self) -> usize {
        self.f[0].len()
    }

    /// Recompute whether orbit o is degenerate (its slots equal) and fix the rank.
    fn refresh(&mut self, o: usize) {
        let s = 3 * o;
        let deg = (0..3).all(|a| self.f[a][s] == self.f[a][s + 1]);
        if deg != self.degenerate[o] {
            self.degenerate[o] = deg;
            if deg {
                self.rank -= 2;
            } else {
                self.rank += 2;
            }
        }
    }

    /// Remove orbit o (the last orbit takes its slots).
    fn remove_orbit(&mut self, o: usize) {
        let last = self.degenerate.len() - 1;
        self.rank -= if self.degenerate[o] { 1 } else { 3 };
        for a in 0..3 {
            for k in 0..3 {
                self.f[a][3 * o + k] = self.f[a][3 * last + k];
            }
            self.f[a].truncate(3 * last);
        }
        self.degenerate.swap_remove(o);
        for w in self.work.iter_mut() {
            if *w / 3 == o {
                *w = usize::MAX;
            } else if *w != usize::MAX && *w / 3 == last {
                *w = 3 * o + *w % 3;
            }
        }
    }

    /// Apply the move `f[a][dst] ^= f[a][src]` on slot pairs (dst, src) of orbits
    /// (od, rotation kd) and (os, rotation ks), for the axis a of rotation 0 and its images.
    fn xor_images(&mut self, a: usize, od: usize, kd: usize, os: usize, ks: usize) {
        for j in 0..3 {
            let d = 3 * od + (kd + j) % 3;
            let s = 3 * os + (ks + j) % 3;
            let ax = shift(a, j);
            let v = self.f[ax][s];
            xor_into(&mut self.f[ax][d], &v);
        }
    }

    fn settle(&mut self) {
        while let Some(i) = self.work.pop() {
            if i >= self.slots() {
                continue;
            }
            let o = i / 3;
            if (0..3).any(|a| is_zero(&self.f[a][i])) {
                self.remove_orbit(o);
                continue;
            }
            let (a, b, c) = (self.f[0][i], self.f[1][i], self.f[2][i]);
            // slot i itself is the only slot sharing two factors with it in the common case
            if count_sharing_two(&self.f, &[a, b, c]) < 2 {
                continue;
            }
            let partner = (0..self.slots()).find_map(|u| {
                if u / 3 == o {
                    return None;
                }
                let e = [self.f[0][u] == a, self.f[1][u] == b, self.f[2][u] == c];
                (e.iter().filter(|&&x| x).count() >= 2).then_some((u, e))
            });
            let Some((u, e)) = partner else { continue };
            let ou = u / 3;
            match e.iter().position(|&x| !x) {
                None => {
                    // equal terms: the two orbits are equal and cancel over GF(2)
                    let (hi, lo) = if ou > o { (ou, o) } else { (o, ou) };
                    self.remove_orbit(hi);
                    self.remove_orbit(lo);
                }
                Some(m) => {
                    self.xor_images(m, ou, u % 3, o, i % 3);
                    self.refresh(ou);
                    let last = self.degenerate.len() - 1;
                    self.remove_orbit(o);
                    let ou2 = if ou == last { o } else { ou };
                    self.work.extend([3 * ou2, 3 * ou2 + 1, 3 * ou2 + 2]);
                }
            }
        }
    }

    /// One attempted flip of two orbits sharing a factor (with its two images).
    pub fn flip(&mut self) -> bool {
        let r = self.slots();
        if r < 6 {
            return false;
        }
        let s = self.rng.below(r);
        let x = self.rng.below(3);
        let key = self.f[x][s];
        let os = s / 3;
        let col = &self.f[x];
        // slots with this factor, less those of the orbit of s (a branch-free count)
        let all = col.iter().map(|v| (*v == key) as usize).sum::<usize>();
        let own = (0..3).filter(|k| col[3 * os + k] == key).count();
        let cnt = all - own;
        if cnt == 0 {
            return false;
        }
        let k = self.rng.below(cnt);
        let t = col
            .iter()
            .enumerate()
            .filter(|&(i, v)| *v == key && i / 3 != os)
            .nth(k)
            .map(|(i, _)| i)
            .expect("partner");
        let ot = t / 3;
        let (y, z) = self.rng.other_axes(x);
        // s_y += t_y, then t_z += s_z (s_z is untouched by the first)
        self.xor_images(y, os, s % 3, ot, t % 3);
        self.xor_images(z, ot, t % 3, os, s % 3);
        self.refresh(os);
        self.refresh(ot);
        self.work.extend([3 * os, 3 * os + 1, 3 * os + 2]);
        self.work.extend([3 * ot, 3 * ot + 1, 3 * ot + 2]);
        self.settle();
        true
    }

    /// One attempted plus transition on two orbits (a new orbit appears).
    pub fn plus(&mut self) -> bool {
        let r = self.slots();
        if r < 6 {
            return false;
        }
        let s = self.rng.below(r);
        let t = self.rng.below(r);
        let (os, ot) = (s / 3, t / 3);
        let x = self.rng.below(3);
        if os == ot || self.f[x][s] == self.f[x][t] {
            return false;
        }
        let (y, z) = self.rng.other_axes(x);
        // new = (t_x, s_y + t_y, s_z) on the axes (x, y, z) of rotation 0, and its images
        let on = self.degenerate.len();
        for j in 0..3 {
            let sj = 3 * os + (s % 3 + j) % 3;
            let tj = 3 * ot + (t % 3 + j) % 3;
            let mut new = [[0u64; W]; 3];
            new[shift(x, j)] = self.f[shift(x, j)][tj];
            new[shift(y, j)] = self.f[shift(y, j)][sj];
            xor_into(&mut new[shift(y, j)], &self.f[shift(y, j)][tj]);
            new[shift(z, j)] = self.f[shift(z, j)][sj];
            for (a, v) in new.into_iter().enumerate() {
                self.f[a].push(v);
            }
        }
        self.degenerate.push(false);
        self.rank += 3;
        // s_x += t_x, t_z += s_z
        self.xor_images(x, os, s % 3, ot, t % 3);
        self.xor_images(z, ot, t % 3, os, s % 3);
        for o in [os, ot, on] {
            self.refresh(o);
            self.work.extend([3 * o, 3 * o + 1, 3 * o + 2]);
        }
        self.settle();
        true
    }
}

impl<const W: usize> WalkState for CyclicWalker<W> {
    type Snap = CyclicScheme;
    fn flip(&mut self) -> bool {
        CyclicWalker::flip(self)
    }
    fn plus(&mut self) -> bool {
        CyclicWalker::plus(self)
    }
    fn rank(&self) -> usize {
        CyclicWalker::rank(self)
    }
    fn snap(&self) -> CyclicScheme {
        self.scheme()
    }
    fn restore(&mut self, s: &CyclicScheme) {
        self.load(s)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::search::flip::tensor_bits;
    use crate::search::tests::matmul;

    #[test]
    fn the_standard_orbits_expand_to_the_schoolbook_product() {
        for n in 2..=4 {
            let c = CyclicScheme::standard(n).unwrap();
            assert_eq!(c.rank(), n * n * n);
            let b = c.to_bits();
            assert_eq!(b.evaluate(), tensor_bits(&matmul(n, n, n)).unwrap());
            assert_eq!(CyclicScheme::from_bits(&b, n).unwrap().rank(), n * n * n);
        }
    }

    #[test]
    fn symmetric_moves_preserve_the_tensor_and_the_symmetry() {
        let want = tensor_bits(&matmul(4, 4, 4)).unwrap();
        let mut w = CyclicWalker::<1>::new(&CyclicScheme::standard(4).unwrap(), 3);
        let mut low = w.rank();
        for step in 0..300_000 {
            if step % 100_000 == 99_999 {
                w.plus();
            } else {
                w.flip();
            }
            low = low.min(w.rank());
            if step % 30_000 == 0 {
                let s = w.scheme();
                assert_eq!(s.rank(), w.rank(), "step {step}");
                let b = s.to_bits();
                assert_eq!(b.rank(), w.rank());
                assert_eq!(b.evaluate(), want, "step {step}");
                assert!(CyclicScheme::from_bits(&b, 4).is_some());
            }
        }
        assert!(low < 64, "the walk reduces");
    }
}
