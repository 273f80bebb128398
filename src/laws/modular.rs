//! Deciding one identity component exactly by evaluation modulo word-size primes.
//!
//! Over GF(q) with q < 2^28 the instances are evaluated in GF(q) itself. Over Q they are
//! evaluated on the integer-scaled table `c' = D c` (see [`IntegralTensor`]): every
//! component is homogeneous of degree k in the product, so an instance's value over Q is
//! `D^-k` times its integer value v for `c'`. With L the row norm of `c'` (`|x y|_1 <=
//! L |x|_1 |y|_1`; 2L for the commutator and anticommutator products), every coordinate of
//! v is bounded by `B = d! * (sum of |coefficients|) * L^k` (d! bounds the distinct
//! orderings). If primes `p_1 .. p_r` with product above `2B` all divide a coordinate, it
//! is 0 (the Chinese remainder theorem); a coordinate nonzero modulo one prime is nonzero.
//! So: an instance fails over Q iff it is nonzero modulo one of those primes. The first
//! prime marks the failing instances it sees; each further prime re-evaluates only the
//! instances not yet marked, and stops early once every instance is marked. The verdict,
//! the number of failing instances and the first failing instance are therefore exact;
//! no big-integer arithmetic runs in the inner loop. The witness's value is recovered
//! exactly by the Chinese remainder theorem from its residues modulo enough primes.
//!
//! Instances are ordered as in [`super::check`] (multiset-major, by first index), split
//! into parts by their first index and evaluated in parallel.
//! Cost per prime: (instances) x (products per instance, [`plans::products_per_instance`])
//! x (one vector-matrix product: n^2 for a dense table, the touched entries for a sparse
//! one); for dense tables and identities with symmetrised pairs, a pair table of
//! n^3 (n+1)/2 words is built first (n^5 / 2 multiply-adds).

use super::check::{next_multiset, next_tuple};
use super::identities::{Component, Product, def};
use super::plans::{self, Scratch};
use crate::linalg::modular::kernel_primes;
use crate::scalar::crt;
use crate::scalar::{FieldSpec, Q};
use crate::tensor::products::{DenseOps, Ops, SparseOps, build_pair_table, pair_table_words};
use crate::tensor::{IntegralTensor, ModTable, prefers_dense};
use num_bigint::BigInt;
use num_traits::Zero;
use rayon::prelude::*;

/// Most words of a pair table (256 MB); larger dense tables evaluate pairs on the fly.
const MAX_PAIR_WORDS: usize = 1 << 26;

/// One decided (or skipped) component.
#[derive(Clone, Debug, Default)]
pub struct Outcome {
    /// Instances examined (all of them unless `stop_first` stopped early).
    pub checked: u64,
    /// Failing instances among them.
    pub failures: u64,
    /// The first failing instance: its sorted multiset and its tuple.
    pub first: Option<(Vec<usize>, Vec<usize>)>,
    /// The exact value of the first failing instance: `(coordinate, value)`, nonzero,
    /// sorted; over GF(q) the representatives in `1..q`.
    pub value: Vec<(usize, Q)>,
    /// Why the component was not decided (work budget), if so.
    pub skipped: Option<String>,
    /// The primes that were needed (1 over GF(q)).
    pub primes: usize,
    /// Why the failures were not all counted (the work was above the counting budget).
    pub partial: Option<String>,
}

/// The residue tables of one tensor, built on demand, shared by the components.
pub struct Images<'a> {
    it: &'a IntegralTensor,
    dense: bool,
    /// (prime, product, table, pair table).
    cache: Vec<(u64, Product, ModTable, Option<Vec<u32>>)>,
}

impl<'a> Images<'a> {
    /// Tables of an algebra's integer-scaled constants (over Q, or GF(q) with q < 2^28).
    pub fn new(it: &'a IntegralTensor) -> Self {
        Images {
            it,
            dense: prefers_dense(it.dims, it.nnz()),
            cache: Vec::new(),
        }
    }

    /// The field supports the word kernels: Q, or GF(q) with q < 2^28.
    pub fn supported(it: &IntegralTensor) -> bool {
        match it.field {
            FieldSpec::Rational => true,
            FieldSpec::Prime(q) => q < 1 << crate::linalg::kernels::KERNEL_PRIME_BITS,
        }
    }

    fn n(&self) -> usize {
        self.it.dims[0]
    }

    /// The table of `product` modulo p, with a pair table when asked for (and dense).
    fn get(&mut self, p: u64, product: Product, pairs: bool) -> usize {
        let pos = match self
            .cache
            .iter()
            .position(|(q, pr, _, _)| *q == p && *pr == product)
        {
            Some(pos) => pos,
            None => {
                // keep the tables of one prime at a time
                self.cache.retain(|(q, _, _, _)| *q == p);
                let base = match self.cache.iter().find(|e| e.1 == Product::Original) {
                    Some(e) => e.2.clone(),
                    None => self.it.image(p, self.dense),
                };
                let t = match product {
                    Product::Original => base,
                    Product::Commutator => base.symmetrised(true),
                    Product::Anticommutator => base.symmetrised(false),
                };
                self.cache.push((p, product, t, None));
                self.cache.len() - 1
            }
        };
        if pairs && self.dense && self.cache[pos].3.is_none() {
            let v = build_pair_table(&self.cache[pos].2);
            self.cache[pos].3 = Some(v);
        }
        pos
    }

    /// The primes to evaluate with, and the bits of the bound B (0 over GF(q)).
    fn primes_for(&self, c: Component) -> (Vec<u64>, u64) {
        if let FieldSpec::Prime(q) = self.it.field {
            return (vec![q], 0);
        }
        let (d, _) = c.shape();
        let fact: u64 = (1..=d as u64).product::<u64>().max(1);
        let k = c.products();
        let l_bits = self.it.row_norm_bits()
            + u64::from(def(c).product != Product::Original && self.it.row_norm_bits() > 0);
        let bits = 64 - fact.leading_zeros() as u64
            + (64 - c.coefficient_sum().leading_zeros() as u64)
            + k as u64 * l_bits
            + 1;
        // kernel primes exceed 2^27.99
        let count = (bits as f64 / 27.99).ceil().max(1.0) as usize;
        (kernel_primes(count), bits)
    }
}

/// `C(top, r)` saturating.
fn choose(top: u64, r: u64) -> u128 {
    let mut c: u128 = 1;
    for i in 0..r {
        c = c.saturating_mul((top - i) as u128) / (i as u128 + 1);
    }
    c
}

/// Instances whose first index is `a`.
fn part_count(n: usize, d: usize, m: usize, a: usize) -> u128 {
    let tuples = (n as u128).saturating_pow(m as u32);
    if d == 0 {
        (n as u128).saturating_pow(m as u32 - 1)
    } else {
        // multisets of size d - 1 from {a, .., n-1}
        choose((n - a + d - 2) as u64, (d - 1) as u64).saturating_mul(tuples)
    }
}

/// Visit the instances of part `a` in order; `f(local index, ms, free)` returns false to
/// stop.
fn for_each_instance(
    n: usize,
    d: usize,
    m: usize,
    a: usize,
    mut f: impl FnMut(u64, &[usize], &[usize]) -> bool,
) {
    let mut local = 0u64;
    let mut ms = vec![a; d];
    loop {
        let mut free = vec![0usize; m];
        if d == 0 {
            free[0] = a;
        }
        loop {
            if !f(local, &ms, &free) {
                return;
            }
            local += 1;
            if !next_tuple(&mut free, n) || (d == 0 && free[0] != a) {
                break;
            }
        }
        if d == 0 || !next_multiset(&mut ms, n) || ms[0] != a {
            break;
        }
    }
}

/// Evaluate the marked-or-not instances of one part modulo one prime; sets the marks of
/// the failing ones. With `stop_first`, returns at the first failure.
fn run_part<O: Ops>(
    o: &O,
    c: Component,
    (n, d, m): (usize, usize, usize),
    a: usize,
    marks: &mut [u64],
    stop_first: bool,
) -> Option<u64> {
    let mut acc = o.new_acc();
    let mut s = Scratch::new(o);
    let mut out = o.new_vec();
    let mut first = None;
    for_each_instance(n, d, m, a, |local, ms, free| {
        let (w, b) = ((local / 64) as usize, local % 64);
        if marks[w] >> b & 1 == 1 {
            if stop_first {
                first = Some(local);
                return false;
            }
            return true;
        }
        plans::eval_instance(o, c, ms, free, &mut acc, &mut s, &mut out);
        if !o.is_zero(&out) {
            marks[w] |= 1 << b;
            if first.is_none() {
                first = Some(local);
            }
            if stop_first {
                return false;
            }
        }
        true
    });
    first
}

/// The plan's component for a component written in another product.
fn plan_component(c: Component) -> Component {
    match c {
        Component::AnticommutatorJordan => Component::JordanId,
        other => other,
    }
}

/// Whether the plan of `c` uses products with symmetrised pairs (worth a pair table).
fn uses_pairs(c: Component) -> bool {
    matches!(
        c,
        Component::Power4 | Component::JordanId | Component::AnticommutatorJordan
    )
}

/// The number of instances of a component on an n-dimensional algebra.
pub fn instance_count(n: usize, c: Component) -> u128 {
    let (d, m) = c.shape();
    (0..n).map(|a| part_count(n, d, m, a)).sum()
}

/// The fixed cost of one instance in the work estimate, in dense multiply-adds (measured:
/// about 270 ns per instance of the Jordan identity on a sparse 64-dimensional table).
const INSTANCE_OVERHEAD: f64 = 64.0;

/// Decide one component (see the module documentation). `max_work` bounds the estimated
/// multiply-adds of the first prime; above it the component is skipped, never guessed.
/// Above `count_work` the failing instances are not all counted: the component stops at
/// its first failure, as with `stop_first` (the verdict and the witness are the same).
pub fn decide(
    images: &mut Images,
    c: Component,
    stop_first: bool,
    max_work: f64,
    count_work: f64,
) -> Outcome {
    let n = images.n();
    let (d, m) = c.shape();
    let total = instance_count(n, c);
    let product = def(c).product;
    let (primes, bits) = images.primes_for(c);
    let pc = plan_component(c);
    let mut out = Outcome {
        primes: primes.len(),
        ..Default::default()
    };
    if n == 0 {
        return out;
    }
    let pairs = images.dense && uses_pairs(c) && pair_table_words(n) <= MAX_PAIR_WORDS;
    let row = if images.dense {
        n as f64
    } else {
        (images.it.nnz() as f64 / (n * n).max(1) as f64).max(1.0)
    };
    let per_product = if images.dense {
        (n * n) as f64
    } else {
        row * row
    };
    // plus a fixed cost per instance (enumeration, reduction, the zero test), measured at
    // about the cost of 64 dense multiply-adds: it dominates on sparse tables
    let per_instance = plans::products_per_instance(c, row) * if pairs { 1.0 } else { per_product }
        + INSTANCE_OVERHEAD;
    let work = total as f64 * per_instance + if pairs { (n as f64).powi(5) / 2.0 } else { 0.0 };
    if work > max_work || total > 1 << 34 {
        out.skipped = Some(format!(
            "{total} instances, about {work:.1e} multiply-adds, above the work budget \
             {max_work:.1e}"
        ));
        return out;
    }
    let stop_first = if !stop_first && work > count_work {
        out.partial = Some(format!(
            "stopped at the first failure: counting every failing instance would take about \
             {work:.1e} multiply-adds, above the counting budget {count_work:.1e}"
        ));
        true
    } else {
        stop_first
    };
    let counts: Vec<u64> = (0..n).map(|a| part_count(n, d, m, a) as u64).collect();
    let mut marks: Vec<Vec<u64>> = counts
        .iter()
        .map(|&c| vec![0u64; c.div_ceil(64) as usize])
        .collect();
    let shape = (n, d, m);
    let mut first: Option<(usize, u64)> = None;
    let mut spent = 0.0;
    for (t, &p) in primes.iter().enumerate() {
        if t > 0 {
            // only the instances not yet known to fail are evaluated again
            let marked: u64 = marks.iter().flatten().map(|w| w.count_ones() as u64).sum();
            if marked as u128 == total || (stop_first && first.is_some()) {
                break;
            }
            spent += work * (1.0 - marked as f64 / total as f64);
            if spent > 4.0 * max_work {
                out.skipped = Some(format!(
                    "holds modulo {t} of the {} primes needed (coefficient bound 2^{bits}); \
                     the rest is above the work budget",
                    primes.len()
                ));
                out.checked = total as u64;
                return out;
            }
        }
        let pos = images.get(p, product, pairs);
        let entry = &images.cache[pos];
        let firsts: Vec<Option<u64>> = if images.dense {
            let o = DenseOps::new(&entry.2, entry.3.as_deref().unwrap_or(&[]));
            run_parts(&o, pc, shape, &mut marks, stop_first)
        } else {
            let o = SparseOps::new(&entry.2);
            run_parts(&o, pc, shape, &mut marks, stop_first)
        };
        if let Some((a, l)) = firsts
            .iter()
            .enumerate()
            .find_map(|(a, f)| f.map(|l| (a, l)))
            && first.is_none_or(|f| (a, l) < f)
        {
            first = Some((a, l));
        }
    }
    out.failures = marks.iter().flatten().map(|w| w.count_ones() as u64).sum();
    out.checked = total as u64;
    if first.is_none() {
        out.partial = None;
    }
    if let Some((a, l)) = first {
        if stop_first {
            out.checked = counts[..a].iter().sum::<u64>() + l + 1;
            out.failures = 1;
        }
        let mut inst = None;
        for_each_instance(n, d, m, a, |local, ms, free| {
            if local == l {
                inst = Some((ms.to_vec(), free.to_vec()));
                return false;
            }
            true
        });
        let inst = inst.expect("the instance exists");
        out.value = exact_value(images, c, &inst, &primes);
        out.first = Some(inst);
    }
    out
}

fn run_parts<O: Ops>(
    o: &O,
    c: Component,
    shape: (usize, usize, usize),
    marks: &mut [Vec<u64>],
    stop_first: bool,
) -> Vec<Option<u64>> {
    if !stop_first {
        return marks
            .par_iter_mut()
            .enumerate()
            .map(|(a, mk)| run_part(o, c, shape, a, mk, false))
            .collect();
    }
    // in order, a few parts at a time, until a failure
    let mut firsts = vec![None; marks.len()];
    let group = rayon::current_num_threads().max(1);
    let mut start = 0;
    while start < marks.len() {
        let end = (start + group).min(marks.len());
        let got: Vec<Option<u64>> = marks[start..end]
            .par_iter_mut()
            .enumerate()
            .map(|(i, mk)| run_part(o, c, shape, start + i, mk, true))
            .collect();
        let found = got.iter().any(Option::is_some);
        firsts[start..end].copy_from_slice(&got);
        if found {
            break;
        }
        start = end;
    }
    firsts
}

/// The exact value of one instance: over GF(q) its residues; over Q the integer value
/// recovered from its residues modulo the primes (whose product exceeds twice the bound),
/// divided by `D^k`.
fn exact_value(
    images: &mut Images,
    c: Component,
    inst: &(Vec<usize>, Vec<usize>),
    primes: &[u64],
) -> Vec<(usize, Q)> {
    let n = images.n();
    let product = def(c).product;
    let pc = plan_component(c);
    let mut residues: Vec<Vec<u64>> = Vec::with_capacity(primes.len());
    for &p in primes {
        let pos = images.get(p, product, false);
        let entry = &images.cache[pos];
        let mut v = vec![0u64; n];
        let entries = if images.dense {
            let o = DenseOps::new(&entry.2, entry.3.as_deref().unwrap_or(&[]));
            one_instance(&o, pc, inst)
        } else {
            let o = SparseOps::new(&entry.2);
            one_instance(&o, pc, inst)
        };
        for (k, x) in entries {
            v[k] = x;
        }
        residues.push(v);
    }
    if let FieldSpec::Prime(_) = images.it.field {
        return residues[0]
            .iter()
            .enumerate()
            .filter(|(_, x)| **x != 0)
            .map(|(k, &x)| (k, Q::from_integer(BigInt::from(x))))
            .collect();
    }
    let modulus: BigInt = primes.iter().map(|&p| BigInt::from(p)).product();
    let half = &modulus >> 1u32;
    let denom = num_traits::pow(images.it.scale.clone(), c.products() as usize);
    (0..n)
        .filter_map(|k| {
            let rs: Vec<u64> = residues.iter().map(|r| r[k]).collect();
            let mut x = crt(&rs, primes);
            if x > half {
                x -= &modulus;
            }
            (!x.is_zero()).then(|| (k, Q::new(x, denom.clone())))
        })
        .collect()
}

fn one_instance<O: Ops>(o: &O, c: Component, inst: &(Vec<usize>, Vec<usize>)) -> Vec<(usize, u64)> {
    let mut acc = o.new_acc();
    let mut s = Scratch::new(o);
    let mut out = o.new_vec();
    plans::eval_instance(o, c, &inst.0, &inst.1, &mut acc, &mut s, &mut out);
    o.entries(&out)
}
