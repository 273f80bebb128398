//! Small matrices over GF(2) packed in machine words, for the exhaustive rank proofs.
//!
//! An `a x b` matrix X over GF(2) with `a b <= 64` is one `u64`, entry `(i, j)` at bit
//! `i b + j`; a vector of length at most 64 is one `u64`. A [`Span`] is a subspace of
//! GF(2)^64 held in fully reduced echelon form: rows sorted by their leading (highest) bit,
//! each leading bit cleared in every other row. That form is unique, so two spans are
//! equal exactly when their rows are (common practice).
//!
//! Also here: the rank-one matrices `u v^T` of a shape ([`rank_ones`]) and the left
//! stabilizer of a space of matrices ([`left_stabilizer`]), the group of invertible P with
//! `P S = S`, which the proofs use to cut the first branching by symmetry.

use std::collections::HashSet;

/// A subspace of GF(2)^64 in fully reduced echelon form (see the module documentation).
#[derive(Clone, Debug, Default, PartialEq, Eq, Hash)]
pub struct Span {
    /// Rows with distinct leading bits, sorted by leading bit, highest first.
    pub rows: Vec<u64>,
}

fn lead(x: u64) -> u32 {
    63 - x.leading_zeros()
}

impl Span {
    /// The span of some vectors. Cost: O(n dim) word operations.
    pub fn of(vectors: impl IntoIterator<Item = u64>) -> Span {
        let mut s = Span::default();
        for v in vectors {
            s.insert(v);
        }
        s
    }

    pub fn dim(&self) -> usize {
        self.rows.len()
    }

    /// The canonical representative of `x + span` (zero exactly when x is in the span).
    pub fn reduce(&self, mut x: u64) -> u64 {
        for &r in &self.rows {
            if x >> lead(r) & 1 == 1 {
                x ^= r;
            }
        }
        x
    }

    pub fn contains(&self, x: u64) -> bool {
        self.reduce(x) == 0
    }

    /// Add a vector; `false` when it was already in the span.
    pub fn insert(&mut self, x: u64) -> bool {
        let r = self.reduce(x);
        if r == 0 {
            return false;
        }
        let l = lead(r);
        for row in self.rows.iter_mut() {
            if *row >> l & 1 == 1 {
                *row ^= r;
            }
        }
        let at = self.rows.partition_point(|&row| lead(row) > l);
        self.rows.insert(at, r);
        true
    }
}

/// Bit i of x.
pub fn bit(x: u64, i: usize) -> bool {
    x >> i & 1 == 1
}

/// The matrix `u v^T` (u of length a, v of length b) packed as in the module documentation.
pub fn outer(u: u64, v: u64, b: usize) -> u64 {
    (0..64)
        .filter(|&i| bit(u, i))
        .fold(0, |acc, i| acc | v << (i * b))
}

/// Every rank-one `a x b` matrix over GF(2) as `(u, v, u v^T)`, u in the outer loop.
/// There are `(2^a - 1)(2^b - 1)`. Needs `a b <= 64`.
pub fn rank_ones(a: usize, b: usize) -> Vec<(u64, u64, u64)> {
    let mut out = Vec::with_capacity(((1usize << a) - 1) * ((1usize << b) - 1));
    for u in 1..1u64 << a {
        for v in 1..1u64 << b {
            out.push((u, v, outer(u, v, b)));
        }
    }
    out
}

/// The transpose of an `a x b` matrix (a `b x a` matrix).
pub fn transpose(x: u64, a: usize, b: usize) -> u64 {
    let mut out = 0;
    for i in 0..a {
        for j in 0..b {
            if bit(x, i * b + j) {
                out |= 1 << (j * a + i);
            }
        }
    }
    out
}

/// `P x` for an `n x n` matrix P (bit `i n + i'`) and a vector x of length n.
pub fn apply(p: u64, n: usize, x: u64) -> u64 {
    let row_mask = if n == 64 { u64::MAX } else { (1u64 << n) - 1 };
    (0..n).fold(0, |acc, i| {
        acc | ((((p >> (i * n)) & row_mask & x).count_ones() as u64 & 1) << i)
    })
}

/// `P X` for an `a x a` matrix P and an `a x b` matrix X.
pub fn left_multiply(p: u64, x: u64, a: usize, b: usize) -> u64 {
    let row = |m: u64, i: usize| (m >> (i * b)) & ((1u64 << b) - 1);
    let mut out = 0;
    for i in 0..a {
        for k in 0..a {
            if bit(p, i * a + k) {
                out ^= row(x, k) << (i * b);
            }
        }
    }
    out
}

/// The rank of an `n x n` matrix (rows of n bits).
pub fn square_rank(p: u64, n: usize) -> usize {
    let mask = (1u64 << n) - 1;
    Span::of((0..n).map(|i| (p >> (i * n)) & mask)).dim()
}

/// The product `P Q` of two `n x n` matrices.
pub fn multiply_square(p: u64, q: u64, n: usize) -> u64 {
    left_multiply(p, q, n, n)
}

/// The group `{P in GL(a, 2) : P S = S}` for a span S of `a x b` matrices, as a small
/// generating set, or `None` when its algebra `{P : P S <= S}` has dimension above
/// `max_dim` (too large to list). The algebra is the kernel of a linear map (solved by
/// elimination); its invertible elements are listed and generators picked greedily.
/// Needs `a <= 8` and `a b <= 64`. Cost: `2^dim` rank tests plus the closure of the group.
pub fn left_stabilizer(s: &Span, a: usize, b: usize, max_dim: usize) -> Option<Vec<u64>> {
    if a > 8 || a * b > 64 {
        return None;
    }
    // the image of each unknown P[i][k] on the basis of S, reduced modulo S
    let image = |i: usize, k: usize| -> Vec<u64> {
        s.rows
            .iter()
            .map(|&x| s.reduce(left_multiply(1 << (i * a + k), x, a, b)))
            .collect()
    };
    let mut pivots: Vec<(Vec<u64>, u64)> = Vec::new();
    let mut kernel: Vec<u64> = Vec::new();
    for i in 0..a {
        for k in 0..a {
            let (mut v, mut tag) = (image(i, k), 1u64 << (i * a + k));
            for (pv, pt) in &pivots {
                let (w, l) = first_bit(pv);
                if bit(v[w], l) {
                    v.iter_mut().zip(pv).for_each(|(x, y)| *x ^= y);
                    tag ^= pt;
                }
            }
            if v.iter().all(|&x| x == 0) {
                kernel.push(tag);
            } else {
                pivots.push((v, tag));
            }
        }
    }
    if kernel.len() > max_dim {
        return None;
    }
    let mut gens = Vec::new();
    let mut group: HashSet<u64> = HashSet::from([identity(a)]);
    for c in 1..1u64 << kernel.len() {
        let p = (0..kernel.len())
            .filter(|&i| bit(c, i))
            .fold(0, |acc, i| acc ^ kernel[i]);
        if square_rank(p, a) == a && !group.contains(&p) {
            gens.push(p);
            group = closure(&gens, a);
        }
    }
    Some(gens)
}

/// The `n x n` identity matrix.
pub fn identity(n: usize) -> u64 {
    (0..n).fold(0, |acc, i| acc | 1 << (i * n + i))
}

/// The group generated by some invertible `n x n` matrices (all its elements).
pub fn closure(gens: &[u64], n: usize) -> HashSet<u64> {
    let mut seen = HashSet::from([identity(n)]);
    let mut todo = vec![identity(n)];
    while let Some(g) = todo.pop() {
        for &h in gens {
            let x = multiply_square(h, g, n);
            if seen.insert(x) {
                todo.push(x);
            }
        }
    }
    seen
}

/// The orbits of the nonzero vectors of length n under the group generated by `gens`:
/// `orbit[x]` is the smallest element of the orbit of x (index 0 unused).
pub fn orbit_minima(gens: &[u64], n: usize) -> Vec<u64> {
    let size = 1usize << n;
    let mut min = vec![0u64; size];
    for x in 1..size as u64 {
        if min[x as usize] != 0 {
            continue;
        }
        // x is the smallest element of its orbit (smaller ones were visited first)
        let mut todo = vec![x];
        min[x as usize] = x;
        while let Some(y) = todo.pop() {
            for &g in gens {
                let z = apply(g, n, y);
                if min[z as usize] == 0 {
                    min[z as usize] = x;
                    todo.push(z);
                }
            }
        }
    }
    min
}

fn first_bit(v: &[u64]) -> (usize, usize) {
    let w = v.iter().position(|&x| x != 0).expect("nonzero");
    (w, v[w].trailing_zeros() as usize)
}

/// A vector of length n as a string of 0s and 1s, entry 0 first.
pub fn to_bits(x: u64, n: usize) -> String {
    (0..n).map(|i| if bit(x, i) { '1' } else { '0' }).collect()
}

/// Read a string of 0s and 1s of length n (entry 0 first).
pub fn from_bits(s: &str, n: usize) -> Result<u64, String> {
    if s.len() != n || n > 64 {
        return Err(format!("`{s}` is not a string of {n} bits"));
    }
    s.chars().enumerate().try_fold(0u64, |acc, (i, c)| match c {
        '0' => Ok(acc),
        '1' => Ok(acc | 1 << i),
        _ => Err(format!("`{s}` holds a character other than 0 and 1")),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn spans_are_canonical() {
        let a = Span::of([0b110, 0b011]);
        let b = Span::of([0b101, 0b110]);
        assert_eq!(a, b);
        assert!(a.contains(0b101) && !a.contains(0b001));
        assert_eq!(a.dim(), 2);
    }

    #[test]
    fn rank_ones_and_products() {
        assert_eq!(rank_ones(2, 3).len(), 21);
        assert_eq!(outer(0b11, 0b101, 3), 0b101_101);
        assert_eq!(transpose(0b101_101, 2, 3), 0b11_00_11);
        // the full matrix algebra M_2 acting on the left of 2 x 2 matrices: GL(2, 2) has
        // 6 elements, and it is transitive on the nonzero vectors
        let s = Span::of((0..16).map(|x| x as u64));
        let g = left_stabilizer(&s, 2, 2, 8).unwrap();
        assert_eq!(closure(&g, 2).len(), 6);
        assert_eq!(orbit_minima(&g, 2)[1..], [1, 1, 1]);
        assert_eq!(from_bits(&to_bits(0b1101, 5), 5), Ok(0b1101));
    }
}
