//! A population of schemes at the lowest rank reached, from which flip walks restart
//! (Kauers and Moosbauer 2022, "Flip graphs for matrix multiplication", walk from a pool
//! of schemes of the current rank and keep those one rank lower).
//!
//! The pool has a *level* L, the rank its walks start from, and up to `size` members of
//! rank L. A walk that reaches a rank r < L hands its scheme in; the level moves down to
//! the lowest such rank once `size` schemes of it are in, or once `patience` further walks
//! have ended since the first one was found (so a rare success does not wait forever).
//! A walk that ends at rank L may replace a random member (`diversify`), which spreads the
//! pool over the plateau of rank L.
//!
//! Invariant: every member of `members` has rank `level`; every scheme in `lower` has a
//! rank below `level`.

use std::collections::BTreeMap;

/// Settings of the pool.
#[derive(Clone, Debug)]
pub struct PoolParams {
    /// Schemes kept per rank (0: no pool, every walk starts from the start scheme).
    pub size: usize,
    /// Walks after the first scheme of a lower rank before the level moves down anyway.
    pub patience: u64,
    /// Walks that end at the level replace a random member.
    pub diversify: bool,
    /// Searches over Q: a scheme of a lower rank joins the pool only when it lifts to Q.
    pub lifted_only: bool,
}

impl Default for PoolParams {
    fn default() -> Self {
        PoolParams {
            size: 16,
            patience: 32,
            diversify: true,
            lifted_only: true,
        }
    }
}

/// The pool (see the module documentation).
#[derive(Clone, Debug)]
pub struct Pool<S> {
    params: PoolParams,
    level: usize,
    members: Vec<S>,
    lower: BTreeMap<usize, Vec<S>>,
    /// walks ended since the first scheme of the lowest rank in `lower` arrived
    waited: u64,
}

impl<S: Clone> Pool<S> {
    /// A pool holding only `start` (of rank `rank`).
    pub fn new(start: S, rank: usize, params: PoolParams) -> Self {
        Pool {
            params,
            level: rank,
            members: vec![start],
            lower: BTreeMap::new(),
            waited: 0,
        }
    }

    /// The rank walks start from.
    pub fn level(&self) -> usize {
        self.level
    }

    /// The lowest rank of any scheme in the pool.
    pub fn lowest(&self) -> usize {
        self.lower.keys().next().copied().unwrap_or(self.level)
    }

    /// Member `pick % len` of the current level (the caller draws `pick` at random).
    pub fn pick(&self, pick: u64) -> S {
        self.members[(pick % self.members.len() as u64) as usize].clone()
    }

    /// A scheme of rank `rank` found by a walk; `pick` chooses the member it replaces
    /// when its rank's list is full.
    pub fn offer(&mut self, s: S, rank: usize, pick: u64) {
        if rank >= self.level {
            return;
        }
        let size = self.params.size.max(1);
        let list = self.lower.entry(rank).or_default();
        if list.len() < size {
            list.push(s);
        } else {
            list[(pick % size as u64) as usize] = s;
        }
        if rank == self.lowest() && self.lower[&rank].len() == 1 {
            self.waited = 0;
        }
        self.advance();
    }

    /// A walk ended at `end` of rank `rank`.
    pub fn finish(&mut self, end: Option<(S, usize)>, pick: u64) {
        if let Some((s, r)) = end
            && r == self.level
            && self.params.diversify
        {
            let size = self.params.size.max(1);
            if self.members.len() < size {
                self.members.push(s);
            } else {
                self.members[(pick % size as u64) as usize] = s;
            }
        }
        if !self.lower.is_empty() {
            self.waited += 1;
        }
        self.advance();
    }

    fn advance(&mut self) {
        let Some((&r, list)) = self.lower.iter().next() else {
            return;
        };
        if list.len() >= self.params.size.max(1) || self.waited >= self.params.patience {
            self.level = r;
            self.members = self.lower.remove(&r).unwrap_or_default();
            self.lower.clear();
            self.waited = 0;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_level_moves_down_when_full_or_after_patience() {
        let p = PoolParams {
            size: 2,
            patience: 3,
            diversify: true,
            lifted_only: true,
        };
        let mut pool = Pool::new("a", 10, p);
        pool.offer("b", 9, 0);
        assert_eq!((pool.level(), pool.lowest()), (10, 9));
        pool.offer("c", 9, 0);
        assert_eq!(pool.level(), 9);
        assert!(["b", "c"].contains(&pool.pick(5)));
        pool.offer("d", 7, 0);
        for _ in 0..2 {
            pool.finish(None, 0);
            assert_eq!(pool.level(), 9);
        }
        pool.finish(Some(("e", 9)), 1);
        assert_eq!(pool.level(), 7);
        assert_eq!(pool.pick(0), "d");
        // a walk ending at the level diversifies the members
        pool.finish(Some(("f", 7)), 0);
        assert_eq!(pool.pick(1), "f");
    }
}
