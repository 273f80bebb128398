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
//! Then the keys that separate the classified ranges of the catalog (nilpotent and solvable
//! Lie algebras, group algebras), up to `max_dim_series`:
//! - `nilpotency.class` (when the lower central series reaches 0: its length);
//! - `upper.central`: dims of `Z_1 ⊂ Z_2 ⊂ ...` ([`crate::invariants::central`]);
//! - `lower.central.annihilators`, `lower.central.centres`: for each term `A^k`, k >= 2, of
//!   the lower central series, the dimension of its annihilator in A (for a Lie algebra its
//!   centraliser) and of its own centre; `derived.annihilators`, `derived.centres` the same
//!   for the terms of the derived series;
//! - `lower.central.products`: `dim (A^i A^j + A^j A^i)` for `2 <= i <= j` (for a Lie
//!   algebra the brackets of the terms, `[L^i, L^j]`);
//! - `derivations.form.rank`, `derivations.form.signature`, `derivations.form.discriminant`:
//!   the trace form `tr(D D')` on the derivation algebra; `centroid.form.*` the same on the
//!   centroid (for `L_{6,22}(e)`, whose centroid holds the field `Q[t]/(t^2 - e)`, its
//!   discriminant is the class of e);
//! - `centre.fields`, `centre.trace.signature`, `centre.trace.discriminant`: for a unital
//!   algebra over Q with a semisimple centre, the degrees of the centre's component fields
//!   and the trace form of the centre ([`crate::structure::centre`]).
//!
//! More keys can be appended without changing the comparison rules.
//!
//! Every value comes from the shared engines: the laws from [`crate::laws`] (stopping at
//! a first failure), the subspaces and algebras of maps from [`crate::invariants`], the
//! series from [`crate::invariants::spans`] and the trace forms from
//! [`crate::invariants::forms`]; all of them exact. A value that cannot be computed within
//! the engines' limits is left out (comparisons use the keys present on both sides).

use crate::invariants::central::upper_central_dims;
use crate::invariants::forms::{
    FormInvariants, form_invariants, map_trace_form, same_square_class, square_class_text,
    trace_form,
};
use crate::invariants::spans::{
    Term, annihilator_of_term, derived_terms, lower_central_terms, products_dim, squares_dim,
    term_centre_dim,
};
use crate::invariants::{ElementSpace, SolveParams, centroid, derivations, element_space};
use crate::laws::{self, Law};
use crate::scalar::{FieldSpec, Q};
use crate::structure::centre::{ComponentParams, centre_components};
use crate::tensor::{IntegralTensor, Kind, Tensor, flattening_ranks, rank_over, slices};
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
    /// Skip the keys of the series terms, the upper central series and the centre's
    /// components above this dimension.
    pub max_dim_series: usize,
    /// Parameters of the linear-system engine.
    pub solve: SolveParams,
}

impl Default for FingerprintParams {
    fn default() -> Self {
        FingerprintParams {
            seed: 1,
            slice_trials: 3,
            max_dim_derivations: 64,
            max_dim_series: 32,
            solve: SolveParams::default(),
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
    algebra_keys(t, params, &mut fp);
    fp
}

/// The keys of an algebra (see the module documentation).
fn algebra_keys(t: &Tensor, params: &FingerprintParams, fp: &mut Fingerprint) {
    let it = IntegralTensor::from_tensor(t);
    let sp = &params.solve;
    let ch = t.field().characteristic();
    let mut asked = vec![
        Law::Commutative,
        Law::Anticommutative,
        Law::Associative,
        Law::Alternative,
        Law::Flexible,
        Law::Lie,
    ];
    if ch != 2 && ch != 3 {
        asked.push(Law::Jordan);
    }
    let lp = laws::Params {
        laws: asked.clone(),
        stop_first: true,
        ..Default::default()
    };
    if let Ok(r) = laws::check_laws(t, &lp) {
        for law in asked {
            if let Some(h) = r.holds(law) {
                fp.push(law.name(), Value::Bool(h));
            }
        }
    }
    let mut unital = false;
    if let Ok(u) = laws::find_unit(&it, sp) {
        unital = u.is_some();
        fp.push("unital", Value::Bool(unital));
    }
    let mut centre_space = None;
    for (key, which) in [
        ("annihilator", ElementSpace::Annihilator),
        ("commutant", ElementSpace::CommutativeCentre),
        ("nucleus", ElementSpace::Nucleus),
        ("centre", ElementSpace::Centre),
    ] {
        if let Ok(s) = element_space(&it, which, sp) {
            fp.push(key, Value::Int(s.dim()));
            if which == ElementSpace::Centre {
                centre_space = Some(s);
            }
        }
    }
    // The centroid form: tr(X Y) on the centroid. In a unital algebra every centroid map is
    // multiplication by a central element c = X(1) and conversely (X(a) = X(1 a) = c a =
    // a c, and X(ab) = c(ab) = (ca)b = a(cb) puts c in the nucleus), so the centroid is the
    // centre, its form the trace form tr(L_z L_w) restricted to the centre, and the large
    // centroid system is not needed.
    let mut centroid_form = None;
    if t.dim() <= params.max_dim_derivations {
        if let Ok(s) = derivations(&it, sp) {
            fp.push("derivations", Value::Int(s.dim()));
        }
        match (&centre_space, unital) {
            (Some(z), true) => {
                fp.push("centroid", Value::Int(z.dim()));
                centroid_form = Some(restricted_form(&trace_form(&it, true), z, it.modulus()));
            }
            _ => {
                if let Ok(c) = centroid(t, &it, sp, None) {
                    fp.push("centroid", Value::Int(c.space.dim()));
                    centroid_form = Some(map_trace_form(&c.space, t.dim(), it.modulus()));
                }
            }
        }
    }
    if let Ok(d) = squares_dim(&it, sp) {
        fp.push("squares", Value::Int(d));
    }
    let derived = derived_terms(&it, sp).ok();
    let lower = lower_central_terms(&it, sp).ok();
    let dims = |v: &[Term]| Value::Ints(v.iter().map(|x| x.dim).collect());
    if let Some(v) = &derived {
        fp.push("derived.series", dims(v));
    }
    if let Some(v) = &lower {
        fp.push("lower.central", dims(v));
    }
    let tl = form_invariants(t.field(), &trace_form(&it, true));
    fp.push("trace.rank", Value::Int(tl.rank));
    if let Some((p, m)) = tl.signature {
        fp.push("trace.signature", Value::Ints(vec![p, m]));
    }
    if let Some(disc) = tl.discriminant {
        fp.push("trace.discriminant", Value::SquareClass(disc));
    }
    let tr = form_invariants(t.field(), &trace_form(&it, false));
    fp.push("rtrace.rank", Value::Int(tr.rank));
    if t.dim() <= params.max_dim_series {
        series_keys(&it, lower.as_deref(), derived.as_deref(), params, fp);
        if t.dim() <= params.max_dim_derivations
            && let Ok(s) = derivations(&it, sp)
        {
            let f = form_invariants(t.field(), &map_trace_form(&s, t.dim(), it.modulus()));
            form_keys(fp, "derivations.form", &f);
        }
        if let Some(g) = &centroid_form {
            form_keys(fp, "centroid.form", &form_invariants(t.field(), g));
        }
        let cp = ComponentParams {
            seed: params.seed,
            solve: sp.clone(),
            ..Default::default()
        };
        if let Ok(Some(c)) = centre_components(t, &it, &cp) {
            fp.push("centre.fields", Value::Ints(c.degrees));
            if let Some((p, m)) = c.trace.signature {
                fp.push("centre.trace.signature", Value::Ints(vec![p, m]));
            }
            if let Some(d) = c.trace.discriminant {
                fp.push("centre.trace.discriminant", Value::SquareClass(d));
            }
        }
    }
}

/// The Gram matrix `B^T G B` of a form restricted to a subspace (B: the subspace's basis
/// scaled to integers, a congruence).
fn restricted_form(
    g: &[Vec<num_bigint::BigInt>],
    space: &crate::invariants::Space,
    modulus: Option<u64>,
) -> Vec<Vec<num_bigint::BigInt>> {
    use crate::invariants::central::integer_vector;
    use num_integer::Integer;
    let b: Vec<Vec<num_bigint::BigInt>> = space
        .dense_basis()
        .iter()
        .map(|v| integer_vector(v))
        .collect();
    let gb: Vec<Vec<num_bigint::BigInt>> = b
        .iter()
        .map(|v| {
            (0..g.len())
                .map(|i| g[i].iter().zip(v).map(|(x, y)| x * y).sum())
                .collect()
        })
        .collect();
    b.iter()
        .map(|u| {
            gb.iter()
                .map(|w| {
                    let s: num_bigint::BigInt = u.iter().zip(w).map(|(x, y)| x * y).sum();
                    match modulus {
                        Some(q) => s.mod_floor(&num_bigint::BigInt::from(q)),
                        None => s,
                    }
                })
                .collect()
        })
        .collect()
}

/// `KEY.rank`, `KEY.signature`, `KEY.discriminant` of a form.
fn form_keys(fp: &mut Fingerprint, key: &str, f: &FormInvariants) {
    fp.push(&format!("{key}.rank"), Value::Int(f.rank));
    if let Some((p, m)) = f.signature {
        fp.push(&format!("{key}.signature"), Value::Ints(vec![p, m]));
    }
    if let Some(d) = &f.discriminant {
        fp.push(
            &format!("{key}.discriminant"),
            Value::SquareClass(d.clone()),
        );
    }
}

/// The keys of the series terms and the upper central series (module documentation).
fn series_keys(
    it: &IntegralTensor,
    lower: Option<&[Term]>,
    derived: Option<&[Term]>,
    params: &FingerprintParams,
    fp: &mut Fingerprint,
) {
    let sp = &params.solve;
    if let Some(l) = lower
        && l.last().is_some_and(|x| x.dim == 0)
    {
        fp.push("nilpotency.class", Value::Int(l.len() - 1));
    }
    if let Ok(v) = upper_central_dims(it, sp) {
        fp.push("upper.central", Value::Ints(v));
    }
    for (name, terms) in [("lower.central", lower), ("derived", derived)] {
        let Some(terms) = terms else { continue };
        let inner: Vec<&Term> = terms.iter().skip(1).filter(|x| x.dim > 0).collect();
        let ann: Option<Vec<usize>> = inner
            .iter()
            .map(|x| annihilator_of_term(it, x, sp).ok().map(|s| s.dim()))
            .collect();
        let cen: Option<Vec<usize>> = inner
            .iter()
            .map(|x| term_centre_dim(it, x, sp).ok())
            .collect();
        if let (Some(a), Some(c)) = (ann, cen) {
            fp.push(&format!("{name}.annihilators"), Value::Ints(a));
            fp.push(&format!("{name}.centres"), Value::Ints(c));
        }
        if name == "lower.central" {
            let mut prods = Vec::new();
            for (i, s) in inner.iter().enumerate() {
                for u in &inner[i..] {
                    match products_dim(it, s, u, sp) {
                        Ok(d) => prods.push(d),
                        Err(_) => return,
                    }
                }
            }
            fp.push("lower.central.products", Value::Ints(prods));
        }
    }
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
