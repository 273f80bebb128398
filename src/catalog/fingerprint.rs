//! An invariant fingerprint of a structure tensor: a list of (key, value) pairs that do not
//! change under a change of basis (for an algebra: one basis change on all three axes; for a
//! bilinear map: independent changes on the three spaces).
//!
//! Equal fingerprints are evidence of isomorphism, not a proof. Keys (algebras and maps):
//! `kind`, `field`, `dims`, `flattening` (the three flattening ranks), `slice.generic` (the
//! largest rank of a combination of slices along each axis, from seeded random
//! combinations: a lower bound equal to the generic value with high probability).
//! Algebras also get: `commutative`, `anticommutative`, `associative`, `alternative`,
//! `flexible`, `lie`, `jordan` (characteristic 0 or > 3), `unital`, `annihilator`,
//! `commutant`, `nucleus`, `centre`, `derivations`, `centroid`, `squares`, `derived.series`,
//! `lower.central`, `trace.rank`, `trace.signature`, `trace.discriminant`, `rtrace.rank`.
//! More keys can be appended without changing the comparison rules.

use super::checks;
use super::dense::Dense;
use super::spaces;
use super::traceform::{self, same_square_class, square_class_text};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{Kind, Tensor, flattening_ranks, rank_over, slices};
use num_traits::Zero;

/// One fingerprint value; equality of square classes is up to squares.
#[derive(Clone, Debug)]
pub enum Value {
    Bool(bool),
    Int(usize),
    Ints(Vec<usize>),
    Text(String),
    /// A discriminant, compared up to rational squares.
    SquareClass(Q),
}

impl PartialEq for Value {
    fn eq(&self, other: &Value) -> bool {
        match (self, other) {
            (Value::Bool(a), Value::Bool(b)) => a == b,
            (Value::Int(a), Value::Int(b)) => a == b,
            (Value::Ints(a), Value::Ints(b)) => a == b,
            (Value::Text(a), Value::Text(b)) => a == b,
            (Value::SquareClass(a), Value::SquareClass(b)) => same_square_class(a, b),
            _ => false,
        }
    }
}

impl std::fmt::Display for Value {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Value::Bool(b) => f.write_str(if *b { "yes" } else { "no" }),
            Value::Int(n) => write!(f, "{n}"),
            Value::Ints(v) => f.write_str(
                &v.iter()
                    .map(|x| x.to_string())
                    .collect::<Vec<_>>()
                    .join(","),
            ),
            Value::Text(s) => f.write_str(s),
            Value::SquareClass(q) => f.write_str(&square_class_text(q)),
        }
    }
}

/// An ordered list of invariant (key, value) pairs.
#[derive(Clone, Debug, Default)]
pub struct Fingerprint {
    pub entries: Vec<(String, Value)>,
}

impl Fingerprint {
    /// The value of a key, if computed.
    pub fn get(&self, key: &str) -> Option<&Value> {
        self.entries.iter().find(|(k, _)| k == key).map(|(_, v)| v)
    }

    fn push(&mut self, key: &str, v: Value) {
        self.entries.push((key.to_string(), v));
    }

    /// The keys present in both fingerprints whose values differ, in this one's order.
    pub fn differences(&self, other: &Fingerprint) -> Vec<String> {
        self.entries
            .iter()
            .filter(|(k, v)| other.get(k).is_some_and(|w| w != v))
            .map(|(k, _)| k.clone())
            .collect()
    }
}

/// Parameters of [`compute_fingerprint`].
#[derive(Clone, Debug)]
pub struct FingerprintParams {
    /// Seed of the random slice combinations.
    pub seed: u64,
    /// How many random combinations per axis for `slice.generic`.
    pub slice_trials: usize,
    /// Skip the derivation and centroid algebras above this dimension (their systems have
    /// n^3 and 2 n^3 rows, n^2 columns).
    pub max_dim_derivations: usize,
}

impl Default for FingerprintParams {
    fn default() -> Self {
        FingerprintParams {
            seed: 1,
            slice_trials: 3,
            max_dim_derivations: 16,
        }
    }
}

/// The largest rank among seeded random combinations of the slices along `axis`.
fn generic_slice_rank(t: &Tensor, axis: usize, params: &FingerprintParams) -> usize {
    use rand::{Rng, SeedableRng};
    let sl = slices(t, axis);
    if sl.is_empty() {
        return 0;
    }
    let mut rng =
        rand_chacha::ChaCha8Rng::seed_from_u64(params.seed ^ ((axis as u64 + 1) * 0x9e37_79b9));
    let bound: i64 = match t.field() {
        FieldSpec::Rational => 1000,
        FieldSpec::Prime(p) => (p as i64 - 1).clamp(1, 1000),
    };
    let mut best = 0;
    for _ in 0..params.slice_trials.max(1) {
        let mut m = sl[0].map(|_| Q::zero());
        for s in &sl {
            let l = Q::from_integer(rng.gen_range(-bound..=bound).into());
            for (x, y) in m.data.iter_mut().zip(&s.data) {
                if !y.is_zero() {
                    *x += &l * y;
                }
            }
        }
        best = best.max(rank_over(t.field(), &m));
    }
    best
}

/// Compute the fingerprint of a tensor (see the module documentation for the keys).
/// Cost: dominated, for an algebra of dimension n, by the associators (O(n^5) worst case)
/// and the derivation system (an n^3 x n^2 exact rank).
pub fn compute_fingerprint(t: &Tensor, params: &FingerprintParams) -> Fingerprint {
    let mut fp = Fingerprint::default();
    let kind = match t.kind() {
        Kind::Algebra => "algebra",
        Kind::Bilinear => "bilinear",
    };
    fp.push("kind", Value::Text(kind.into()));
    fp.push("field", Value::Text(t.field().name()));
    fp.push("dims", Value::Ints(t.dims().to_vec()));
    fp.push("flattening", Value::Ints(flattening_ranks(t).to_vec()));
    fp.push(
        "slice.generic",
        Value::Ints((0..3).map(|a| generic_slice_rank(t, a, params)).collect()),
    );
    if t.kind() != Kind::Algebra {
        return fp;
    }
    let d = Dense::new_integral(t);
    let assoc = d.associators();
    fp.push("commutative", Value::Bool(checks::is_commutative(&d)));
    fp.push(
        "anticommutative",
        Value::Bool(checks::is_anticommutative(&d)),
    );
    fp.push(
        "associative",
        Value::Bool(checks::is_associative(&d, &assoc)),
    );
    fp.push(
        "alternative",
        Value::Bool(checks::is_alternative(&d, &assoc)),
    );
    fp.push("flexible", Value::Bool(checks::is_flexible(&d, &assoc)));
    fp.push("lie", Value::Bool(checks::is_lie(&d)));
    if let Some(j) = checks::is_jordan(&d) {
        fp.push("jordan", Value::Bool(j));
    }
    fp.push("unital", Value::Bool(spaces::unit_element(&d).is_some()));
    fp.push("annihilator", Value::Int(spaces::annihilator_dim(&d)));
    fp.push("commutant", Value::Int(spaces::commutant_dim(&d)));
    fp.push("nucleus", Value::Int(spaces::nucleus_dim(&d, &assoc)));
    fp.push("centre", Value::Int(spaces::centre_dim(&d, &assoc)));
    // derivations and centroid: from the invariants layer (proven bases, sparse integer
    // systems) when the constants fit its integer tables, otherwise by the catalog's own
    // dense systems (up to `max_dim_derivations`)
    let it = crate::invariants::IntTable::from_tensor(t).ok();
    let sp = crate::invariants::SolveParams::default();
    let der = it
        .as_ref()
        .and_then(|it| crate::invariants::derivations(it, &sp).ok());
    let cen = it
        .as_ref()
        .and_then(|it| crate::invariants::centroid(t, it, &sp).ok());
    let small = d.n <= params.max_dim_derivations;
    match der {
        Some(s) => fp.push("derivations", Value::Int(s.dim())),
        None if small => fp.push("derivations", Value::Int(spaces::derivations_dim(&d))),
        None => {}
    }
    match cen {
        Some(c) => fp.push("centroid", Value::Int(c.space.dim())),
        None if small => fp.push("centroid", Value::Int(spaces::centroid_dim(&d))),
        None => {}
    }
    fp.push("squares", Value::Int(spaces::squares_dim(&d)));
    fp.push("derived.series", Value::Ints(spaces::derived_series(&d)));
    fp.push(
        "lower.central",
        Value::Ints(spaces::lower_central_series(&d)),
    );
    let tl = traceform::form_invariants(&d, &traceform::trace_form(&d, true));
    fp.push("trace.rank", Value::Int(tl.rank));
    if let Some((p, m)) = tl.signature {
        fp.push("trace.signature", Value::Ints(vec![p, m]));
    }
    if let Some(disc) = tl.discriminant {
        fp.push("trace.discriminant", Value::SquareClass(disc));
    }
    let tr = traceform::form_invariants(&d, &traceform::trace_form(&d, false));
    fp.push("rtrace.rank", Value::Int(tr.rank));
    fp
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use crate::tensor::{change_basis_algebra, random_invertible};

    /// Hamilton's quaternions by hand (Hamilton 1844, On quaternions).
    fn quaternions() -> Tensor {
        let names = ["one", "i", "j", "k"].map(String::from).to_vec();
        let mut t = Tensor::algebra(FieldSpec::Rational, names);
        let tab = [
            [(0, 1), (1, 1), (2, 1), (3, 1)],
            [(1, 1), (0, -1), (3, 1), (2, -1)],
            [(2, 1), (3, -1), (0, -1), (1, 1)],
            [(3, 1), (2, 1), (1, -1), (0, -1)],
        ];
        for (i, row) in tab.iter().enumerate() {
            for (j, &(k, s)) in row.iter().enumerate() {
                t.set(i, j, k, q(s, 1));
            }
        }
        t
    }

    #[test]
    fn quaternion_fingerprint_is_invariant() {
        let t = quaternions();
        let p = FingerprintParams::default();
        let a = compute_fingerprint(&t, &p);
        // Hamilton 1844: associative, not commutative, unital; centre Q (Pierce 1982,
        // Associative Algebras; from memory); derivations: the 3 inner ones (Schafer 1966).
        assert_eq!(a.get("associative"), Some(&Value::Bool(true)));
        assert_eq!(a.get("commutative"), Some(&Value::Bool(false)));
        assert_eq!(a.get("centre"), Some(&Value::Int(1)));
        assert_eq!(a.get("derivations"), Some(&Value::Int(3)));
        // trace form 4 diag(1,-1,-1,-1): signature (1,3), discriminant -1 mod squares
        assert_eq!(a.get("trace.signature"), Some(&Value::Ints(vec![1, 3])));
        assert_eq!(a.get("trace.discriminant").unwrap().to_string(), "-1");
        let u = change_basis_algebra(&t, &random_invertible(4, 2, 7)).unwrap();
        let b = compute_fingerprint(&u, &p);
        assert!(a.differences(&b).is_empty(), "{:?}", a.differences(&b));
    }
}
