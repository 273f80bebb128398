//! Flip-graph random walk over GF(2) (Kauers and Moosbauer 2022, "Flip graphs for matrix
//! multiplication"), with rank-raising escapes (plus transitions; Arai, Ichikawa and
//! Hukushima 2024, "Adaptive flip graph algorithm for matrix multiplication").
//!
//! The walker keeps a scheme over GF(2) with factors packed in `W` 64-bit words per axis
//! ([`Walker<W>`], W = 1, 2 or 4: axes up to 64, 128 or 256 basis vectors; see
//! [`super::bits`]). The three axes are separate contiguous arrays; for the ranks of
//! interest (up to a few hundred terms) a linear scan of one array finds every term
//! sharing a factor faster than a hash index can be kept up to date. Beside each factor
//! the walker keeps its *partner count*, the number of other terms with the same factor on
//! that axis, updated by one scan of the axis whenever a factor changes: a flip attempt on
//! a term without a partner (most attempts at low rank) is then rejected in O(1), and a
//! term with fewer than two axes with partners cannot share two factors with another.
//!
//! Moves (each preserves `sum_t u_t (x) v_t (x) w_t`):
//! - flip: two terms sharing the factor on axis x, `(a, b, c) + (a, b', c')` becomes
//!   `(a, b + b', c) + (a, b', c' - c)` (with the roles of the two other axes chosen at
//!   random);
//! - reduction, applied after every move: two terms sharing two factors merge into one
//!   (`(a, b, c) + (a, b, c') = (a, b, c + c')`), a term with a zero factor is dropped;
//! - plus transition (rank + 1): `(a, b, c) + (a', b', c')` becomes
//!   `(a + a', b, c) + (a', b + b', c) + (a', b', c + c')`.
//!
//! [`walk_state`] drives any [`WalkState`] (this walker, the GF(p) walker of
//! [`super::flip_p`], the symmetric walker of [`super::cyclic`]) with plateau handling.
//!
//! Invariant: after every public method returns, no term has a zero factor, no two terms
//! share two factors, and every partner count is exact.

pub use super::bits::{BitScheme, bits_of, tensor_bits};
use super::bits::{check_dims, words};
use crate::error::Result;

/// A small fast generator (SplitMix64) for the inner loop; seeded from the worker's RNG.
#[derive(Clone, Debug)]
pub struct FastRng(u64);

impl FastRng {
    pub fn new(seed: u64) -> Self {
        FastRng(seed)
    }

    /// The two axes other than `x` (of three), in a random order.
    pub fn other_axes(&mut self, x: usize) -> (usize, usize) {
        if self.next_u64() & 1 == 0 {
            ((x + 1) % 3, (x + 2) % 3)
        } else {
            ((x + 2) % 3, (x + 1) % 3)
        }
    }
    /// Two distinct indices in `0..n` (n >= 2), uniform among ordered pairs.
    pub fn distinct_pair(&mut self, n: usize) -> (usize, usize) {
        let s = self.below(n);
        let t = self.below(n - 1);
        (s, if t >= s { t + 1 } else { t })
    }
    #[inline(always)]
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform in `0..n` (n > 0), by the multiply-shift method.
    #[inline(always)]
    pub fn below(&mut self, n: usize) -> usize {
        (((self.next_u64() >> 32) * n as u64) >> 32) as usize
    }
}

/// A factor of `W` words.
pub type Mask<const W: usize> = [u64; W];

#[inline(always)]
pub(crate) fn xor_into<const W: usize>(a: &mut Mask<W>, b: &Mask<W>) {
    for (x, y) in a.iter_mut().zip(b) {
        *x ^= y;
    }
}

#[inline(always)]
pub(crate) fn is_zero<const W: usize>(a: &Mask<W>) -> bool {
    a.iter().all(|&x| x == 0)
}

/// A mask of a bit scheme widened to `W` words.
pub(crate) fn widen<const W: usize>(m: &[u64]) -> Mask<W> {
    let mut out = [0u64; W];
    out[..m.len()].copy_from_slice(m);
    out
}

/// The number of terms of `f` (factors by axis) that share at least two factors with
/// `term` (`term` itself included when it is one of them). A branch-free pass that
/// vectorises: the reductions run it first, since most terms share two factors with none.
/// Cost: O(r W).
#[inline]
pub(crate) fn count_sharing_two<const W: usize>(f: &[Vec<Mask<W>>; 3], term: &[Mask<W>; 3]) -> u32 {
    let [a, b, c] = term;
    f[0].iter()
        .zip(&f[1])
        .zip(&f[2])
        .map(|((x, y), z)| ((x == a) as u32 + (y == b) as u32 + (z == c) as u32 >= 2) as u32)
        .sum()
}

/// The words of a walker for a shape: 1, 2 or 4 (the widest axis decides).
pub fn walker_words(dims: [usize; 3]) -> Result<usize> {
    check_dims(dims)?;
    Ok(match dims.iter().map(|&d| words(d)).max().unwrap_or(1) {
        1 => 1,
        2 => 2,
        _ => 4,
    })
}

/// Run `$body` with the const `$w` bound to the walker width of `$dims` (1, 2 or 4).
#[macro_export]
#[doc(hidden)]
macro_rules! with_words {
    ($words:expr, $w:ident => $body:expr) => {
        match $words {
            1 => {
                const $w: usize = 1;
                $body
            }
            2 => {
                const $w: usize = 2;
                $body
            }
            _ => {
                const $w: usize = 4;
                $body
            }
        }
    };
}

/// The state of one walk: the current scheme and the move machinery.
#[derive(Clone, Debug)]
pub struct Walker<const W: usize> {
    dims: [usize; 3],
    f: [Vec<Mask<W>>; 3],
    /// `partners[a][t]`: the number of terms u != t with `f[a][u] == f[a][t]`.
    partners: [Vec<u32>; 3],
    rng: FastRng,
    work: Vec<usize>,
}

impl<const W: usize> Walker<W> {
    /// Start a walk at `start` (reductions are applied at once). Panics if an axis of
    /// `start` needs more than `W` words (use [`walker_words`]).
    pub fn new(start: &BitScheme, seed: u64) -> Walker<W> {
        assert!(
            start.dims.iter().all(|&d| words(d) <= W),
            "walker too narrow"
        );
        let mut w = Walker {
            dims: start.dims,
            f: [Vec::new(), Vec::new(), Vec::new()],
            partners: [Vec::new(), Vec::new(), Vec::new()],
            rng: FastRng::new(seed),
            work: Vec::new(),
        };
        w.load(start);
        w
    }

    /// Replace the current scheme (reductions are applied at once).
    pub fn load(&mut self, s: &BitScheme) {
        for a in 0..3 {
            self.f[a] = s.terms.iter().map(|t| widen(&t[a])).collect();
            let col = &self.f[a];
            self.partners[a] = col
                .iter()
                .map(|v| col.iter().filter(|u| *u == v).count() as u32 - 1)
                .collect();
        }
        self.work.clear();
        self.work.extend(0..self.f[0].len());
        self.settle();
    }

    /// The dimensions of the three axes.
    pub fn dims(&self) -> [usize; 3] {
        self.dims
    }

    /// The factor of term t on axis a (its `words(dims[a])` significant words).
    pub fn factor(&self, a: usize, t: usize) -> &[u64] {
        &self.f[a][t][..super::bits::words(self.dims[a])]
    }

    pub(crate) fn factor_mask(&self, a: usize, t: usize) -> &Mask<W> {
        &self.f[a][t]
    }

    /// Add `m` to the factor of term t on axis a (no reduction is applied).
    pub(crate) fn add_to_factor(&mut self, a: usize, t: usize, m: &Mask<W>) {
        let mut v = self.f[a][t];
        xor_into(&mut v, m);
        self.set_factor(a, t, v);
    }

    /// Set the factor of term t on axis a to `v`, keeping the partner counts exact.
    /// Cost: one scan of the axis.
    #[inline]
    fn set_factor(&mut self, a: usize, t: usize, v: Mask<W>) {
        let old = self.f[a][t];
        if old == v {
            return;
        }
        let mut n = 0u32;
        for (u, c) in self.f[a].iter().zip(self.partners[a].iter_mut()) {
            let gain = (*u == v) as u32;
            n += gain;
            *c = c.wrapping_add(gain).wrapping_sub((*u == old) as u32);
        }
        self.f[a][t] = v;
        self.partners[a][t] = n;
    }

    /// Append a term, keeping the partner counts exact. Cost: one scan of each axis.
    fn push_term(&mut self, term: [Mask<W>; 3]) {
        for (a, v) in term.into_iter().enumerate() {
            let mut n = 0u32;
            for (u, c) in self.f[a].iter().zip(self.partners[a].iter_mut()) {
                let gain = (*u == v) as u32;
                n += gain;
                *c += gain;
            }
            self.f[a].push(v);
            self.partners[a].push(n);
        }
    }

    /// Drop term k, then apply the plain reductions to the terms `touched` (indices before
    /// the removal) until none applies.
    pub(crate) fn remove_and_settle(&mut self, k: usize, touched: &[usize]) {
        self.work.extend_from_slice(touched);
        self.remove(k);
        self.settle();
    }

    /// The current rank.
    #[inline]
    pub fn rank(&self) -> usize {
        self.f[0].len()
    }

    /// A copy of the current scheme.
    pub fn scheme(&self) -> BitScheme {
        let wd = self.dims.map(words);
        let terms = (0..self.rank())
            .map(|t| [0, 1, 2].map(|a| self.f[a][t][..wd[a]].to_vec()))
            .collect();
        BitScheme {
            dims: self.dims,
            terms,
        }
    }

    /// Remove term i (swap with the last); fix the indices on the work list.
    fn remove(&mut self, i: usize) {
        let last = self.rank() - 1;
        for a in 0..3 {
            let v = self.f[a][i];
            for (u, c) in self.f[a].iter().zip(self.partners[a].iter_mut()) {
                *c = c.wrapping_sub((*u == v) as u32);
            }
            self.f[a].swap_remove(i);
            self.partners[a].swap_remove(i);
        }
        for w in self.work.iter_mut() {
            if *w == i {
                *w = usize::MAX;
            } else if *w == last {
                *w = i;
            }
        }
    }

    /// Apply reductions to the terms on the work list until none applies.
    fn settle(&mut self) {
        while let Some(i) = self.work.pop() {
            if i >= self.rank() {
                continue;
            }
            if (0..3).any(|a| is_zero(&self.f[a][i])) {
                self.remove(i);
                continue;
            }
            // a term sharing two factors with another has partners on two axes
            if (0..3).filter(|&a| self.partners[a][i] > 0).count() < 2 {
                continue;
            }
            let (a, b, c) = (self.f[0][i], self.f[1][i], self.f[2][i]);
            if count_sharing_two(&self.f, &[a, b, c]) < 2 {
                continue; // only term i itself
            }
            let mut partner = None;
            for u in 0..self.rank() {
                if u == i {
                    continue;
                }
                let e = [self.f[0][u] == a, self.f[1][u] == b, self.f[2][u] == c];
                let n = e.iter().filter(|&&x| x).count();
                if n >= 2 {
                    partner = Some((u, e));
                    break;
                }
            }
            let Some((u, e)) = partner else { continue };
            match e.iter().position(|&x| !x) {
                None => {
                    // identical terms cancel over GF(2)
                    let (hi, lo) = if u > i { (u, i) } else { (i, u) };
                    self.remove(hi);
                    self.remove(lo);
                }
                Some(m) => {
                    let fi = self.f[m][i];
                    self.add_to_factor(m, u, &fi);
                    let last = self.rank() - 1;
                    self.remove(i);
                    let u2 = if u == last { i } else { u };
                    self.work.push(u2);
                }
            }
        }
    }

    /// Attempt one random flip: pick a term and an axis, and a random partner sharing that
    /// factor. Returns false when the chosen term has no partner on that axis.
    /// Cost: O(1) when it has none, else O(r W) word comparisons.
    #[inline]
    pub fn flip(&mut self) -> bool {
        let r = self.rank();
        if r < 2 {
            return false;
        }
        let s = self.rng.below(r);
        let x = self.rng.below(3);
        let cnt = self.partners[x][s] as usize;
        if cnt == 0 {
            return false;
        }
        let key = self.f[x][s];
        let col = &self.f[x];
        let mut k = self.rng.below(cnt);
        let mut t = usize::MAX;
        for (i, v) in col.iter().enumerate() {
            if *v == key && i != s {
                if k == 0 {
                    t = i;
                    break;
                }
                k -= 1;
            }
        }
        let (y, z) = self.rng.other_axes(x);
        let ty = self.f[y][t];
        self.add_to_factor(y, s, &ty);
        let sz = self.f[z][s];
        self.add_to_factor(z, t, &sz);
        self.work.push(s);
        self.work.push(t);
        self.settle();
        true
    }

    /// Plus transition (rank + 1): two random terms not sharing the factor on a random axis
    /// x become three terms. Returns false if the chosen pair shares that factor.
    pub fn plus(&mut self) -> bool {
        let r = self.rank();
        if r < 2 {
            return false;
        }
        let (s, t) = self.rng.distinct_pair(r);
        let x = self.rng.below(3);
        if self.f[x][s] == self.f[x][t] {
            return false;
        }
        let (y, z) = self.rng.other_axes(x);
        // (a,b,c) + (a',b',c') = (a+a',b,c) + (a',b+b',c) + (a',b',c+c')
        let mut new = [[0u64; W]; 3];
        new[x] = self.f[x][t];
        new[y] = self.f[y][s];
        xor_into(&mut new[y], &self.f[y][t]);
        new[z] = self.f[z][s];
        let at = self.f[x][t];
        self.add_to_factor(x, s, &at);
        let cs = self.f[z][s];
        self.add_to_factor(z, t, &cs);
        self.push_term(new);
        self.work.extend([s, t, r]);
        self.settle();
        true
    }
}

/// Settings of a flip walk.
#[derive(Clone, Debug)]
pub struct FlipParams {
    /// Moves without a new lowest rank before a plus transition (or a reset).
    pub plateau: u64,
    /// Plus transitions may raise the rank to at most (lowest rank of this walk) + this.
    pub max_excess: usize,
    /// While at or below the target, offer the current scheme again every this many moves
    /// (e.g. to retry a failed Hensel lift with another scheme of the same rank).
    pub retry_every: u64,
}

impl Default for FlipParams {
    fn default() -> Self {
        FlipParams {
            plateau: 200_000,
            max_excess: 2,
            retry_every: 20_000,
        }
    }
}

impl FlipParams {
    /// The settings the search draws from, one per walk: the default, short walks
    /// returned often to their start (plateau 3 000, at most one plus transition), and
    /// plus transitions every 10 000 moves that never return (excess up to 100).
    pub fn mix() -> Vec<FlipParams> {
        let d = FlipParams::default();
        vec![
            d.clone(),
            FlipParams {
                plateau: 3_000,
                max_excess: 1,
                ..d.clone()
            },
            FlipParams {
                plateau: 10_000,
                max_excess: 100,
                ..d
            },
        ]
    }
}

/// What the walk reports to its caller.
pub enum WalkEvent<'a, S> {
    /// A scheme of a rank lower than any before in this walk, or (at or below the target)
    /// another scheme offered for acceptance. Return true to end the walk with it.
    Candidate(&'a S),
    /// Moves done since the last report (for throughput); return true to stop.
    Moves(u64),
}

/// A copy of a walk's scheme.
pub trait Snapshot: Clone + Send + Sync {
    /// Its rank.
    fn rank(&self) -> usize;
    /// The scheme over the walk's field GF(p) (entries in `0..p`).
    fn to_scheme(&self) -> crate::scheme::Scheme;
}

impl Snapshot for BitScheme {
    fn rank(&self) -> usize {
        BitScheme::rank(self)
    }
    fn to_scheme(&self) -> crate::scheme::Scheme {
        BitScheme::to_scheme(self, crate::scalar::FieldSpec::Prime(2))
    }
}

/// A walk state on a flip graph (over GF(2) bit-packed, over GF(p), or restricted to
/// schemes with a symmetry).
pub trait WalkState {
    /// A copy of the current scheme.
    type Snap: Snapshot;
    /// One attempted flip; false when the random choice had no partner.
    fn flip(&mut self) -> bool;
    /// One attempted plus transition (rank + 1).
    fn plus(&mut self) -> bool;
    fn rank(&self) -> usize;
    fn snap(&self) -> Self::Snap;
    fn restore(&mut self, s: &Self::Snap);
    /// Reductions beyond those of every move (dependent products, [`super::dependent`]);
    /// true when the rank went down. None by default.
    fn reduce_more(&mut self) -> bool {
        false
    }
}

impl<const W: usize> WalkState for Walker<W> {
    type Snap = BitScheme;
    fn flip(&mut self) -> bool {
        Walker::flip(self)
    }
    fn plus(&mut self) -> bool {
        Walker::plus(self)
    }
    fn rank(&self) -> usize {
        Walker::rank(self)
    }
    fn snap(&self) -> BitScheme {
        self.scheme()
    }
    fn restore(&mut self, s: &BitScheme) {
        self.load(s)
    }
    fn reduce_more(&mut self) -> bool {
        self.reduce_products()
    }
}

/// Walk from `start` over GF(2) until `budget` moves in a row bring no new lowest rank;
/// see [`walk_state`].
/// Fails when an axis has more than [`super::bits::MAX_DIM`] basis vectors.
pub fn walk(
    start: &BitScheme,
    target: usize,
    params: &FlipParams,
    seed: u64,
    budget: u64,
    event: &mut dyn FnMut(WalkEvent<BitScheme>) -> bool,
) -> Result<Option<BitScheme>> {
    let n = walker_words(start.dims)?;
    Ok(with_words!(n, W => {
        let mut w = Walker::<W>::new(start, seed);
        walk_state(&mut w, target, params, budget, event)
    }))
}

/// Walk until `max(budget, 2N)` attempted moves in a row bring no new lowest rank, N the
/// moves it took to reach that rank (a walk that keeps going down is not cut short: from a
/// high start it descends to where it stalls, instead of handing a half-way scheme back to
/// a pool that restarts from higher up). `event` sees each new lowest rank and, at or
/// below `target`, a candidate every `retry_every` moves; the walk ends when it returns
/// true for a candidate (returned) or for a `Moves` report (stop). After `plateau` moves
/// without a new lowest rank the walk makes a plus transition, or returns to its best
/// scheme when already `max_excess` above it.
/// Cost: O(r) per move over GF(2), O(r (d0 + d1 + d2)) over GF(p).
pub fn walk_state<Wk: WalkState>(
    w: &mut Wk,
    target: usize,
    params: &FlipParams,
    budget: u64,
    event: &mut dyn FnMut(WalkEvent<Wk::Snap>) -> bool,
) -> Option<Wk::Snap> {
    let mut best = w.snap();
    let mut best_rank = w.rank();
    if best_rank <= target && event(WalkEvent::Candidate(&best)) {
        return Some(best);
    }
    let mut since = 0u64;
    let mut last_try = 0u64;
    let mut unreported = 0u64;
    let mut moves = 0u64;
    let mut best_at = 0u64;
    // a walk that needed N moves to reach its lowest rank gets at least 2N more: descents
    // slow down as the rank falls (on <3,4,5> over GF(2) the gaps between new lowest ranks
    // grow past 1e8 moves), so a fixed budget would cut the deep walks short
    while moves - best_at < budget.max(2 * best_at) {
        w.flip();
        moves += 1;
        since += 1;
        unreported += 1;
        let r = w.rank();
        if r < best_rank {
            best_rank = r;
            best = w.snap();
            since = 0;
            last_try = moves;
            best_at = moves;
            if event(WalkEvent::Candidate(&best)) {
                event(WalkEvent::Moves(unreported));
                return Some(best);
            }
        } else if r <= target && moves - last_try >= params.retry_every {
            last_try = moves;
            let s = w.snap();
            if event(WalkEvent::Candidate(&s)) {
                event(WalkEvent::Moves(unreported));
                return Some(s);
            }
        }
        if since >= params.plateau {
            since = 0;
            if w.reduce_more() {
                continue;
            }
            if r < best_rank + params.max_excess {
                for _ in 0..8 {
                    if w.plus() {
                        break;
                    }
                }
            } else {
                w.restore(&best);
            }
        }
        if unreported >= 1 << 16 {
            if event(WalkEvent::Moves(unreported)) {
                return None;
            }
            unreported = 0;
        }
    }
    event(WalkEvent::Moves(unreported));
    None
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::search::tests::matmul;

    fn preserves<const W: usize>(t: &crate::tensor::Tensor, steps: usize) {
        let s = BitScheme::standard(t).unwrap();
        let want = tensor_bits(t).unwrap();
        let mut w = Walker::<W>::new(&s, 7);
        for step in 0..steps {
            if step % 997 == 0 {
                w.plus();
            } else {
                w.flip();
            }
            if step % 1000 == 0 {
                assert_eq!(w.scheme().evaluate(), want);
                assert_partners_exact(&w);
            }
        }
        assert_eq!(w.scheme().evaluate(), want);
        assert_partners_exact(&w);
        // the reductions by dependent products keep the counts too
        w.reduce_products();
        assert_partners_exact(&w);
    }

    /// Every partner count equals a recount from scratch.
    fn assert_partners_exact<const W: usize>(w: &Walker<W>) {
        for a in 0..3 {
            for t in 0..w.rank() {
                let n = (0..w.rank())
                    .filter(|&u| u != t && w.f[a][u] == w.f[a][t])
                    .count();
                assert_eq!(w.partners[a][t] as usize, n, "axis {a}, term {t}");
            }
        }
    }

    #[test]
    fn moves_preserve_the_tensor() {
        preserves::<1>(&matmul(3, 3, 3), 20_000);
        // <8,9,2>: 72 left coordinates, two words per factor
        preserves::<2>(&matmul(8, 9, 2), 5_000);
    }
}
