//! Certificates of exhaustive rank proofs over GF(2), and their checker.
//!
//! A certificate claims `R(T) > r` over GF(2) for a tensor T. It records the slices of T
//! along one axis (`a x b` matrices, spanning S of dimension d), the symmetry generators
//! used on the first level, and for each level i = 0 .. m - 1 (m = r - d) the list of
//! spaces `S + <E_1..E_i>`, each given by its rank-one matrices `E = u v^T`. The JSON form
//! (format `bilin rank proof`, version 1) is documented in `docs/rank-proofs.md`.
//!
//! [`check`] re-derives the proof from the tensor alone (not through the search code):
//!
//! 1. the recorded slices are those of the tensor; the claim has m = r - d >= 0 and r < ab;
//! 2. every symmetry generator P (Q) is invertible and maps S into S on the left (right);
//! 3. every listed space is S plus i independent rank-one matrices;
//! 4. coverage: for every space W of level i < m - 1 and every rank-one E outside W, the
//!    space `W + E` is listed at level i + 1; on level 0 (when m >= 2) it is enough that
//!    some E' in the orbit of E under the generators has `S + E'` listed;
//! 5. closure: for every space W of level m - 1 and every rank-one E outside W, the
//!    rank-one elements of `W + E` span less than `W + E` (over GF(2) they are the
//!    rank-one elements of W and of the coset `E + W`); for m = 0, the rank-one elements of
//!    S span less than S.
//!
//! Together these say that no space of dimension r holding S is spanned by rank-one
//! matrices, so `R(T) > r` ([`super::exhaustive`] has the theorem). A removed space, an
//! altered coefficient or a wrong claim fails one of the steps.

use super::exhaustive::SliceSpace;
use super::gf2::{self, Span, from_bits, outer, to_bits};
use crate::scalar::FieldSpec;
use crate::tensor::{AXES, Tensor, others};
use std::collections::HashSet;

/// The format name written in every certificate.
pub const FORMAT: &str = "bilin rank proof";
/// The version of the JSON form.
pub const VERSION: u64 = 1;

/// One listed space `S + <u_1 v_1^T, ..., u_i v_i^T>`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Node {
    pub factors: Vec<(u64, u64)>,
}

/// The spaces of one level.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Level {
    pub nodes: Vec<Node>,
}

/// A certificate of `R(T) > rank_above` over GF(2) (see the module documentation).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Certificate {
    pub space: SliceSpace,
    pub rank_above: usize,
    /// Generators of the left and right symmetry groups (`a x a`, `b x b` matrices).
    pub left: Vec<u64>,
    pub right: Vec<u64>,
    pub levels: Vec<Level>,
}

/// The slices of a tensor over GF(2) along `axis`, packed (rows: the first other axis).
pub fn slices_of(t: &Tensor, axis: usize) -> Result<SliceSpace, String> {
    if t.field() != FieldSpec::Prime(2) {
        return Err(format!(
            "exhaustive proofs run over GF(2), the tensor is over {}",
            t.field().name()
        ));
    }
    let d = t.dims();
    let (o1, o2) = others(axis);
    let (a, b) = (d[o1], d[o2]);
    if a * b > 64 || a > 8 || b > 8 {
        return Err(format!(
            "the slices along the {} axis are {a} x {b}: exhaustive proofs need at most 8 x 8 \
             and 64 entries",
            AXES[axis]
        ));
    }
    let mut slices = vec![0u64; d[axis]];
    for (i, j, k, _) in t.entries() {
        let idx = [i, j, k];
        slices[idx[axis]] |= 1 << (idx[o1] * b + idx[o2]);
    }
    Ok(SliceSpace { axis, a, b, slices })
}

impl Certificate {
    /// The JSON form.
    pub fn to_json(&self, t: &Tensor) -> serde_json::Value {
        let (a, b) = (self.space.a, self.space.b);
        let node = |n: &Node| -> Vec<[String; 2]> {
            n.factors
                .iter()
                .map(|&(u, v)| [to_bits(u, a), to_bits(v, b)])
                .collect()
        };
        serde_json::json!({
            "format": FORMAT,
            "version": VERSION,
            "field": "GF(2)",
            "dims": t.dims(),
            "claim": format!("rank > {}", self.rank_above),
            "rank_above": self.rank_above,
            "axis": AXES[self.space.axis],
            "slice_shape": [a, b],
            "slices": self.space.slices.iter().map(|&x| to_bits(x, a * b)).collect::<Vec<_>>(),
            "symmetry": {
                "left": self.left.iter().map(|&p| to_bits(p, a * a)).collect::<Vec<_>>(),
                "right": self.right.iter().map(|&q| to_bits(q, b * b)).collect::<Vec<_>>(),
            },
            "levels": self.levels.iter().map(|l| l.nodes.iter().map(node).collect::<Vec<_>>()).collect::<Vec<_>>(),
        })
    }

    /// Read the JSON form (shape only; [`check`] validates the mathematics).
    pub fn from_json(v: &serde_json::Value) -> Result<Certificate, String> {
        if v["format"] != FORMAT {
            return Err(format!("not a certificate: the format is not `{FORMAT}`"));
        }
        if v["version"] != VERSION {
            return Err(format!(
                "unknown version {} (expected {VERSION})",
                v["version"]
            ));
        }
        if v["field"] != "GF(2)" {
            return Err("only certificates over GF(2) are known".into());
        }
        let axis = AXES
            .iter()
            .position(|&x| v["axis"] == x)
            .ok_or("`axis` must be left, right or result")?;
        let num = |key: &str| -> Result<usize, String> {
            v[key]
                .as_u64()
                .map(|x| x as usize)
                .ok_or(format!("`{key}` must be a number"))
        };
        let shape = v["slice_shape"]
            .as_array()
            .filter(|s| s.len() == 2)
            .ok_or("`slice_shape` must be [rows, columns]")?;
        let (a, b) = match (shape[0].as_u64(), shape[1].as_u64()) {
            (Some(a @ 1..=8), Some(b @ 1..=8)) if a * b <= 64 => (a as usize, b as usize),
            _ => return Err("`slice_shape` must be at most 8 x 8 and 64 entries".into()),
        };
        let strings = |x: &serde_json::Value, what: &str, n: usize| -> Result<Vec<u64>, String> {
            x.as_array()
                .ok_or(format!("`{what}` must be a list"))?
                .iter()
                .map(|s| {
                    s.as_str()
                        .ok_or(format!("`{what}` must hold bit strings"))
                        .and_then(|s| from_bits(s, n).map_err(|e| format!("{what}: {e}")))
                })
                .collect()
        };
        let mut levels = Vec::new();
        for (li, level) in v["levels"]
            .as_array()
            .ok_or("`levels` must be a list")?
            .iter()
            .enumerate()
        {
            let mut nodes = Vec::new();
            for node in level.as_array().ok_or("each level must be a list")? {
                let mut factors = Vec::new();
                for pair in node.as_array().ok_or("each space must be a list")? {
                    let pair = pair
                        .as_array()
                        .filter(|p| p.len() == 2)
                        .ok_or("each rank-one matrix must be [u, v]")?;
                    let u = strings(&serde_json::json!([pair[0]]), "u", a)?[0];
                    let w = strings(&serde_json::json!([pair[1]]), "v", b)?[0];
                    factors.push((u, w));
                }
                nodes.push(Node { factors });
            }
            if nodes.is_empty() {
                return Err(format!("level {li} is empty"));
            }
            levels.push(Level { nodes });
        }
        Ok(Certificate {
            space: SliceSpace {
                axis,
                a,
                b,
                slices: strings(&v["slices"], "slices", a * b)?,
            },
            rank_above: num("rank_above")?,
            left: strings(&v["symmetry"]["left"], "symmetry.left", a * a)?,
            right: strings(&v["symmetry"]["right"], "symmetry.right", b * b)?,
            levels,
        })
    }

    /// Spaces listed per level.
    pub fn level_sizes(&self) -> Vec<usize> {
        self.levels.iter().map(|l| l.nodes.len()).collect()
    }
}

/// Check a certificate against a tensor (see the module documentation). `Ok` means
/// `R(T) > rank_above` over GF(2) is proven. Cost: for each listed space, one reduction
/// of every rank-one `a x b` matrix, plus the orbits of the generators.
pub fn check(t: &Tensor, c: &Certificate) -> Result<(), String> {
    let sp = &c.space;
    let mine = slices_of(t, sp.axis)?;
    if mine != *sp {
        return Err("the recorded slices are not those of the tensor".into());
    }
    let (a, b, r) = (sp.a, sp.b, c.rank_above);
    let s = Span::of(sp.slices.iter().copied());
    let d = s.dim();
    if r >= a * b || r < d {
        return Err(format!(
            "the claim rank > {r} is outside the range {d}..{} this proof covers",
            a * b
        ));
    }
    let m = r - d;
    // every rank-one matrix
    let mut ones = Vec::new();
    for u in 1..1u64 << a {
        for v in 1..1u64 << b {
            ones.push((u, v, outer(u, v, b)));
        }
    }
    if m == 0 {
        if !c.levels.is_empty() {
            return Err("a claim with r = dim S has no levels".into());
        }
        let inside = Span::of(ones.iter().map(|o| o.2).filter(|&x| s.contains(x)));
        return if inside.dim() < d {
            Ok(())
        } else {
            Err("the slices are spanned by rank-one matrices: rank = dim S".into())
        };
    }
    if c.levels.len() != m {
        return Err(format!(
            "the claim rank > {r} with dim S = {d} needs {m} levels, the certificate has {}",
            c.levels.len()
        ));
    }
    // 2. symmetry generators
    let st = Span::of(sp.slices.iter().map(|&x| gf2::transpose(x, a, b)));
    for (gens, n, span, other) in [(&c.left, a, &s, b), (&c.right, b, &st, a)] {
        for &p in gens {
            if gf2::square_rank(p, n) != n {
                return Err("a symmetry generator is not invertible".into());
            }
            if span
                .rows
                .iter()
                .any(|&x| !span.contains(gf2::left_multiply(p, x, n, other)))
            {
                return Err("a symmetry generator does not preserve the span of the slices".into());
            }
        }
    }
    // 3. the listed spaces
    let mut sets: Vec<HashSet<Span>> = Vec::new();
    let mut spaces: Vec<Vec<Span>> = Vec::new();
    for (i, level) in c.levels.iter().enumerate() {
        let mut set = HashSet::new();
        let mut list = Vec::new();
        for node in &level.nodes {
            if node.factors.len() != i {
                return Err(format!(
                    "a space of level {i} does not have {i} rank-one matrices"
                ));
            }
            let mut w = s.clone();
            for &(u, v) in &node.factors {
                if u == 0 || v == 0 || !w.insert(outer(u, v, b)) {
                    return Err(format!(
                        "a space of level {i} has a zero or dependent rank-one matrix"
                    ));
                }
            }
            set.insert(w.clone());
            list.push(w);
        }
        sets.push(set);
        spaces.push(list);
    }
    // 4. coverage
    let orbit = |gens: &[u64], n: usize| gf2::orbit_minima(gens, n);
    let (ou, ov) = (orbit(&c.left, a), orbit(&c.right, b));
    for i in 0..m - 1 {
        if i == 0 {
            // the orbits of rank-one matrices whose representative opens a listed space
            let mut opened: HashSet<(u64, u64)> = HashSet::new();
            for &(u, v, x) in &ones {
                if !s.contains(x) {
                    let mut w = s.clone();
                    w.insert(x);
                    if sets[1].contains(&w) {
                        opened.insert((ou[u as usize], ov[v as usize]));
                    }
                }
            }
            for &(u, v, x) in &ones {
                if !s.contains(x) && !opened.contains(&(ou[u as usize], ov[v as usize])) {
                    return Err(format!(
                        "no listed space of level 1 covers the branch u = {}, v = {}",
                        to_bits(u, a),
                        to_bits(v, b)
                    ));
                }
            }
            continue;
        }
        for w in &spaces[i] {
            for &(u, v, x) in &ones {
                if w.contains(x) {
                    continue;
                }
                let mut child = w.clone();
                child.insert(x);
                if !sets[i + 1].contains(&child) {
                    return Err(format!(
                        "a branch of level {i} (u = {}, v = {}) is not listed at level {}",
                        to_bits(u, a),
                        to_bits(v, b),
                        i + 1
                    ));
                }
            }
        }
    }
    // 5. closure of the last level
    let mut keyed: Vec<(u64, u64)> = Vec::with_capacity(ones.len());
    for w in &spaces[m - 1] {
        keyed.clear();
        keyed.extend(ones.iter().map(|o| (w.reduce(o.2), o.2)));
        keyed.sort_unstable();
        let split = keyed.partition_point(|k| k.0 == 0);
        let inside = Span::of(keyed[..split].iter().map(|k| k.1));
        for coset in keyed[split..].chunk_by(|x, y| x.0 == y.0) {
            let mut u = inside.clone();
            for &(_, x) in coset {
                u.insert(x);
            }
            if u.dim() >= r {
                return Err(format!(
                    "a branch stays open: a space of dimension {r} holding the slices is \
                     spanned by rank-one matrices (one of them outside the listed space: {})",
                    to_bits(coset[0].1, a * b)
                ));
            }
        }
    }
    Ok(())
}
