//! Laws of an algebra (associative, alternative, Lie, Jordan, ...), decided exactly.
//!
//! Input: an algebra, or a square bilinear map read as an algebra on its left basis.
//! Every law is an identity `P = 0` in the product. Multilinear identities (associativity,
//! commutativity, Jacobi) are decided on all basis tuples. Identities of degree `d > 1` in
//! a repeated variable `x` (x*x = 0, alternative, flexible, third and fourth powers,
//! Jordan) are decided through their linearization: the coefficient of each monomial in
//! the coordinates of `x` is the sum of `P` over the distinct orderings of a multiset of
//! basis elements (see [`check`]). This is exact, with no division, in every
//! characteristic, and decides the law as a **polynomial identity** (holding in every
//! extension field). Over Q, and over GF(p) with `p >= d`, that is the same as holding
//! for every element; over GF(p) with `p < d` (GF(2) and degree 3 or 4, GF(3) and degree
//! 4) a law reported as failing may still hold for every element of the algebra over GF(p)
//! itself, and the result then carries a note saying so; when GF(p)^n is small
//! (`Params::max_pointwise_elements`) the note settles the question by checking every
//! element ([`pointwise`]).
//!
//! Over Q the instances are evaluated modulo word-size primes on the integer-scaled table,
//! with as many primes as a coefficient bound requires for an exact decision (see
//! [`modular`]); the witness's value is recovered exactly. No big-integer arithmetic runs in
//! the inner loops, whatever the basis the table is written in.
//!
//! Every failure comes with a witness: the basis tuple, the substituted expression and its
//! exact nonzero value written with the basis names.

pub mod check;
pub mod expr;
pub mod identities;
pub mod modular;
mod plans;
pub mod pointwise;
mod unit;

pub use check::{Check, Witness};
pub use unit::{find_unit, find_unit_direct, find_unit_in};

use crate::error::{Error, Result};
use crate::scalar::Field;
use crate::tensor::{IntegralTensor, Table, Tensor};
use expr::format_combination;
use identities::{Component, Def, Product, def, identity_text, method_text, notation};
use serde::Serialize;

/// The laws bilin decides.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Law {
    /// `(xy)z = x(yz)`.
    Associative,
    /// `xy = yx`.
    Commutative,
    /// `x x = 0` (hence `xy = -yx`); in characteristic 2 this is the alternating law.
    Anticommutative,
    /// `(xy)z + (yz)x + (zx)y = 0`.
    Jacobi,
    /// Anticommutative and Jacobi.
    Lie,
    /// Anticommutative and `J(x,y,xz) = J(x,y,z)x`, `J` the Jacobian (Sagle 1961).
    Malcev,
    /// `(xx)y = x(xy)`.
    LeftAlternative,
    /// `(yx)x = y(xx)`.
    RightAlternative,
    /// Left and right alternative.
    Alternative,
    /// `(xy)x = x(yx)`.
    Flexible,
    /// Third and fourth powers: `(xx)x = x(xx)` and `(xx)(xx) = ((xx)x)x`.
    PowerAssociative,
    /// Commutative and `((xx)y)x = (xx)(yx)`.
    Jordan,
    /// The commutator algebra `[x,y] = xy - yx` satisfies Jacobi.
    LieAdmissible,
    /// The algebra with `{x,y} = xy + yx` is Jordan.
    JordanAdmissible,
    /// There is a two-sided unit.
    Unital,
}

impl Law {
    /// All laws, in report order.
    pub const ALL: [Law; 15] = [
        Law::Associative,
        Law::Commutative,
        Law::Anticommutative,
        Law::Jacobi,
        Law::Lie,
        Law::Malcev,
        Law::LeftAlternative,
        Law::RightAlternative,
        Law::Alternative,
        Law::Flexible,
        Law::PowerAssociative,
        Law::Jordan,
        Law::LieAdmissible,
        Law::JordanAdmissible,
        Law::Unital,
    ];

    /// The kebab-case name (`left-alternative`).
    pub fn name(self) -> &'static str {
        match self {
            Law::Associative => "associative",
            Law::Commutative => "commutative",
            Law::Anticommutative => "anticommutative",
            Law::Jacobi => "jacobi",
            Law::Lie => "lie",
            Law::Malcev => "malcev",
            Law::LeftAlternative => "left-alternative",
            Law::RightAlternative => "right-alternative",
            Law::Alternative => "alternative",
            Law::Flexible => "flexible",
            Law::PowerAssociative => "power-associative",
            Law::Jordan => "jordan",
            Law::LieAdmissible => "lie-admissible",
            Law::JordanAdmissible => "jordan-admissible",
            Law::Unital => "unital",
        }
    }

    /// Parse a kebab-case name, in any case (`lie`, `Lie`, `LEFT-ALTERNATIVE`).
    pub fn parse(s: &str) -> Option<Law> {
        Law::ALL
            .into_iter()
            .find(|l| l.name().eq_ignore_ascii_case(s))
    }

    fn components(self) -> &'static [Component] {
        use Component::*;
        match self {
            Law::Associative => &[Assoc],
            Law::Commutative => &[Comm],
            Law::Anticommutative => &[Anti],
            Law::Jacobi => &[Jacobi],
            Law::Lie => &[Anti, Jacobi],
            Law::Malcev => &[Anti, MalcevId],
            Law::LeftAlternative => &[LeftAlt],
            Law::RightAlternative => &[RightAlt],
            Law::Alternative => &[LeftAlt, RightAlt],
            Law::Flexible => &[Flex],
            Law::PowerAssociative => &[Power3, Power4],
            Law::Jordan => &[Comm, JordanId],
            Law::LieAdmissible => &[CommutatorJacobi],
            Law::JordanAdmissible => &[AnticommutatorJordan],
            Law::Unital => &[],
        }
    }
}

/// Options of [`check_laws`].
#[derive(Clone, Debug)]
pub struct Params {
    /// The laws to decide (default: all of [`Law::ALL`]).
    pub laws: Vec<Law>,
    /// Stop each identity at its first failure (then `failures` is at most 1).
    pub stop_first: bool,
    /// An identity whose estimated number of multiply-adds (for the first prime) exceeds
    /// this is skipped: reported undecided, never guessed.
    pub max_work: f64,
    /// Failing instances are counted in full only while the estimated multiply-adds of an
    /// identity (first prime) stay below this; above it the identity stops at its first
    /// failure and says so (the verdict and the witness do not change).
    pub count_work: f64,
    /// Over GF(p) with p below an identity's degree, a failing identity is also checked on
    /// every element when there are at most this many (p^n).
    pub max_pointwise_elements: u64,
}

impl Default for Params {
    fn default() -> Self {
        Params {
            laws: Law::ALL.to_vec(),
            stop_first: false,
            max_work: 2e11,
            count_work: 5e7,
            max_pointwise_elements: 1 << 14,
        }
    }
}

/// The verdict on one law.
#[derive(Clone, Debug, Serialize)]
pub struct LawResult {
    pub law: Law,
    /// `Some(true)`: proven to hold; `Some(false)`: a witness is given; `None`: skipped.
    pub holds: Option<bool>,
    /// The identities decided, with variables (`(x*y)*z - x*(y*z) = 0`).
    pub identity: String,
    /// How it was decided.
    pub method: String,
    /// Instances examined.
    pub checked: u64,
    /// Failing instances.
    pub failures: u64,
    /// The first failing instance.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub witness: Option<Witness>,
    /// For `unital`: the unit as a combination of basis names.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub unit: Option<String>,
    /// Caveats (characteristic, skipped parts).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub notes: Vec<String>,
}

/// The verdicts on the requested laws.
#[derive(Clone, Debug, Serialize)]
pub struct LawReport {
    /// `Q` or `GF(p)`.
    pub field: String,
    pub dimension: usize,
    pub results: Vec<LawResult>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub notes: Vec<String>,
}

impl LawReport {
    /// The result for one law, if it was requested.
    pub fn get(&self, law: Law) -> Option<&LawResult> {
        self.results.iter().find(|r| r.law == law)
    }

    /// Shorthand: `Some(verdict)` of a requested and decided law.
    pub fn holds(&self, law: Law) -> Option<bool> {
        self.get(law).and_then(|r| r.holds)
    }

    /// The decided laws with their verdicts, in the order asked (undecided ones left out).
    pub fn verdicts(&self) -> Vec<(Law, bool)> {
        self.results
            .iter()
            .filter_map(|r| r.holds.map(|v| (r.law, v)))
            .collect()
    }
}

/// `xy - yx` (sign -1) or `xy + yx` (sign +1) as a table.
fn symmetrised<F: Field>(f: &F, t: &Table<F::Elem>, sign: i64) -> Table<F::Elem> {
    let n = t.dims[0];
    let s = f.from_i64(sign);
    let mut products = Vec::with_capacity(n * n);
    for i in 0..n {
        for j in 0..n {
            let mut v: Vec<(usize, F::Elem)> = t.product(i, j).to_vec();
            v.extend(t.product(j, i).iter().map(|(k, c)| (*k, f.mul(&s, c))));
            products.push(expr::normalise(f, v));
        }
    }
    Table {
        dims: t.dims,
        products,
    }
}

/// Decide the requested laws for an algebra (or a square bilinear map, read on its left
/// basis). Errors: a non-square map.
///
/// Over Q and over GF(q) with q < 2^28 every identity is decided by the multi-modular
/// engine ([`modular`]): exact verdicts, counts and first witnesses, with word arithmetic
/// in the inner loops; over larger prime fields by direct evaluation in the field
/// ([`check`]). A law that follows from laws already proven (associativity implies the
/// alternative, flexible, power and admissibility laws, ...) is not evaluated again (see
/// [`implied_by`]). Cost per identity: see [`modular`]; for a dense table of dimension n,
/// about n^5 multiply-adds for the degree-3 laws and n^6 for the fourth-power and Jordan
/// identities, times the number of primes the coefficient size needs.
pub fn check_laws(t: &Tensor, params: &Params) -> Result<LawReport> {
    let alg = t.as_algebra().ok_or_else(|| {
        let d = t.dims();
        Error::Invalid(format!(
            "laws need an algebra or a square bilinear map; this map is {} x {} -> {}",
            d[0], d[1], d[2]
        ))
    })?;
    let names = &alg.names()[0];
    let it = IntegralTensor::from_tensor(&alg);
    Ok(crate::with_field!(alg.field(), f => {
        let table = alg.table(f);
        if modular::Images::supported(&it) {
            let mut images = modular::Images::new(&it);
            let mut decide = |c: Component| modular_check(f, &mut images, c, names, params);
            let mut unit = || {
                let u = unit::find_unit(&it, &Default::default()).map_err(|e| e.to_string())?;
                Ok(u.map(|u| {
                    u.iter()
                        .map(|x| f.from_rational(x).expect("a unit in the field"))
                        .collect()
                }))
            };
            assemble(f, &table, names, params, &mut decide, &mut unit)
        } else {
            check_laws_direct(f, &table, names, params)
        }
    }))
}

/// One component by the modular engine, as a [`Check`] with its witness written out.
fn modular_check<F: Field>(
    f: &F,
    images: &mut modular::Images,
    c: Component,
    names: &[String],
    params: &Params,
) -> std::result::Result<Check, String> {
    let d = def(c);
    let o = modular::decide(
        images,
        c,
        params.stop_first,
        params.max_work,
        params.count_work,
    );
    if let Some(why) = o.skipped {
        return Err(why);
    }
    let witness = o.first.as_ref().map(|inst| {
        let value: Vec<(usize, F::Elem)> = o
            .value
            .iter()
            .map(|(k, v)| (*k, f.from_rational(v).expect("a value in the field")))
            .collect();
        check::witness_with_value(f, names, &d.id, inst, &value, notation(d.product))
    });
    Ok(Check {
        checked: o.checked,
        failures: o.failures,
        witness,
        first: o.first,
        partial: o.partial,
    })
}

/// [`check_laws`] by direct evaluation of every instance in the field (the reference the
/// modular engine is tested against; used over prime fields with p >= 2^28).
/// Cost: see [`check`].
pub fn check_laws_direct<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    params: &Params,
) -> LawReport {
    let mut tables: [Option<Table<F::Elem>>; 2] = [None, None];
    let mut decide = |c: Component| {
        let d = def(c);
        let work = check::work_estimate(t.dims[0], &d.id, d.degree);
        if work as f64 > params.max_work {
            return Err(format!(
                "about {work} term evaluations, above the work budget"
            ));
        }
        let table = in_product(f, t, d.product, &mut tables);
        Ok(check::check_identity(
            f,
            table,
            names,
            &d.id,
            d.degree,
            notation(d.product),
            params.stop_first,
        ))
    };
    let mut unit = || Ok(unit::find_unit_direct(f, t));
    assemble(f, t, names, params, &mut decide, &mut unit)
}

/// The table of the product an identity is written in.
fn in_product<'t, F: Field>(
    f: &F,
    t: &'t Table<F::Elem>,
    product: Product,
    tables: &'t mut [Option<Table<F::Elem>>; 2],
) -> &'t Table<F::Elem> {
    match product {
        Product::Original => t,
        Product::Commutator => tables[0].get_or_insert_with(|| symmetrised(f, t, -1)),
        Product::Anticommutator => tables[1].get_or_insert_with(|| symmetrised(f, t, 1)),
    }
}

/// The components whose joint validity implies a component in characteristic `p` (0 for
/// Q), each as a polynomial identity (so that every instance of the implied one vanishes):
/// - associativity implies the alternative, flexible, third and fourth power laws (their
///   instances are sums of associators), the Jacobi identity of the commutator and the
///   Jordan identity of the anticommutator (identities of the free associative ring);
/// - associativity implies the Jordan identity `((xy)x)x = (xy)(xx)` (both sides are the
///   word xyxx);
/// - anticommutative and Jacobi imply the Jacobi identity of the commutator (`[x,y] = 2xy`);
/// - left alternative implies third powers (`(x,x,x)` is an instance of it), and so does
///   flexibility (the linearized third power is a sum of linearized flexible instances
///   `(a,m,b) + (b,m,a)`, one per middle factor m);
/// - left and right alternative imply flexible (`(x,y,x) = -(x,x,y)`);
/// - commutative and Jordan imply the Jordan identity of `xy + yx = 2xy`;
/// - the Jacobi identity implies the Malcev identity (both of its sides are Jacobians);
/// - in characteristic 0 or at least 5, flexible and Jordan-admissible imply the Jordan
///   identity `(x^2 y) x = x^2 (y x)`: such an algebra is a noncommutative Jordan algebra
///   (Schafer 1966, ch. V.1); and they imply fourth powers: with `x^3 = x^2 x = x x^2`
///   (flexible), the Jordan identity of `A^+` at `y = x` gives `x^2 x^2 = (x^3 x + x x^3)/2`,
///   and flexibility at `y = x^2` gives `x^3 x = x x^3`.
///
/// (Schafer 1966, An Introduction to Nonassociative Algebras, ch. I-III and V; common
/// practice.)
pub fn implied_by(c: Component, p: u64) -> &'static [&'static [Component]] {
    use Component::*;
    let noncommutative_jordan = p == 0 || p >= 5;
    match c {
        LeftAlt | RightAlt => &[&[Assoc]],
        Power4 | JordanId if noncommutative_jordan => &[&[Assoc], &[Flex, AnticommutatorJordan]],
        Power4 | JordanId => &[&[Assoc]],
        Flex => &[&[Assoc], &[LeftAlt, RightAlt]],
        Power3 => &[&[Assoc], &[LeftAlt], &[Flex]],
        CommutatorJacobi => &[&[Assoc], &[Anti, Jacobi]],
        AnticommutatorJordan => &[&[Assoc], &[Comm, JordanId]],
        MalcevId => &[&[Jacobi]],
        Assoc | Comm | Anti | Jacobi => &[],
    }
}

/// A decided component's verdict: `Some(true)` proven, `Some(false)` failed or not
/// decidable; `None` not decided yet.
fn verdict(cache: &[(Component, Option<Check>, Vec<String>)], c: Component) -> Option<bool> {
    cache
        .iter()
        .find(|e| e.0 == c)
        .map(|(_, res, _)| res.as_ref().is_some_and(|r| r.failures == 0))
}

/// The components of `laws`, each once, in the order the laws ask for them.
fn requested_components(laws: &[Law]) -> Vec<Component> {
    let mut requested: Vec<Component> = Vec::new();
    for law in laws {
        for &c in law.components() {
            if !requested.contains(&c) {
                requested.push(c);
            }
        }
    }
    requested
}

fn component_name(c: Component) -> &'static str {
    use Component::*;
    match c {
        Assoc => "associativity",
        Comm => "commutativity",
        Anti => "anticommutativity",
        Jacobi => "the Jacobi identity",
        LeftAlt => "the left alternative law",
        RightAlt => "the right alternative law",
        Flex => "flexibility",
        Power3 => "third-power associativity",
        Power4 => "fourth-power associativity",
        JordanId => "the Jordan identity",
        CommutatorJacobi => "the Jacobi identity of the commutator",
        AnticommutatorJordan => "the Jordan identity of the anticommutator",
        MalcevId => "the Malcev identity",
    }
}

/// The report from a way of deciding components (shared by both engines): components
/// are decided once, in the order the laws ask for them; implied ones are not evaluated.
fn assemble<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    params: &Params,
    decide: &mut dyn FnMut(Component) -> std::result::Result<Check, String>,
    find_unit: &mut UnitFinder<F::Elem>,
) -> LawReport {
    let n = t.dims[0];
    let p = f.characteristic();
    let mut cache: Vec<(Component, Option<Check>, Vec<String>)> = Vec::new();
    let mut tables: [Option<Table<F::Elem>>; 2] = [None, None];
    // Decide the requested components in order; before evaluating one, first settle the
    // other requested components of a set that could imply it (none failed so far), so
    // that an implication is found before a costly evaluation.
    let requested = requested_components(&params.laws);
    let mut stack: Vec<Component> = Vec::new();
    let mut next = requested.iter();
    loop {
        let Some(&c) = stack.last() else {
            match next.next() {
                Some(&c) => {
                    stack.push(c);
                    continue;
                }
                None => break,
            }
        };
        if cache.iter().any(|e| e.0 == c) {
            stack.pop();
            continue;
        }
        let proven = |x: &Component| verdict(&cache, *x) == Some(true);
        let sets = implied_by(c, p);
        let implying = sets.iter().find(|set| set.iter().all(proven));
        if implying.is_none() {
            // a set none of whose members failed, with one not decided yet
            let alive = |x: &Component| {
                requested.contains(x) && !stack.contains(x) && verdict(&cache, *x) != Some(false)
            };
            let first = sets
                .iter()
                .filter(|set| set.iter().all(alive))
                .find_map(|set| set.iter().find(|x| verdict(&cache, **x).is_none()));
            if let Some(&x) = first {
                stack.push(x);
                continue;
            }
        }
        stack.pop();
        let d = def(c);
        let mut notes = Vec::new();
        let res = if let Some(set) = implying {
            let why: Vec<&str> = set.iter().map(|x| component_name(*x)).collect();
            let proof = if why.len() == 1 {
                "proven"
            } else {
                "each proven"
            };
            notes.push(format!("holds: implied by {} ({proof})", why.join(" and ")));
            Some(Check {
                checked: modular::instance_count(n, c) as u64,
                ..Check::default()
            })
        } else {
            match decide(c) {
                Ok(res) => {
                    if let Some(why) = &res.partial {
                        notes.push(format!("`{}`: {why}", identity_text(&d)));
                    }
                    Some(res)
                }
                Err(why) => {
                    notes.push(format!("`{}` not decided: {why}", identity_text(&d)));
                    None
                }
            }
        };
        if let Some(res) = &res
            && res.failures > 0
            && p > 0
            && p < d.degree as u64
        {
            let table = in_product(f, t, d.product, &mut tables);
            notes.push(char_note(f, table, names, &d, params));
        }
        cache.push((c, res, notes));
    }
    let mut results = Vec::new();
    for &law in &params.laws {
        if law == Law::Unital {
            results.push(unital(f, n, names, find_unit));
            continue;
        }
        let mut r = LawResult {
            law,
            holds: Some(true),
            identity: String::new(),
            method: String::new(),
            checked: 0,
            failures: 0,
            witness: None,
            unit: None,
            notes: Vec::new(),
        };
        let mut idents = Vec::new();
        let mut methods = Vec::new();
        for &c in law.components() {
            let d = def(c);
            idents.push(identity_text(&d));
            let m = method_text(&d);
            if !methods.contains(&m) {
                methods.push(m);
            }
            let (_, res, notes) = cache.iter().find(|e| e.0 == c).expect("cached");
            for note in notes {
                if !r.notes.contains(note) {
                    r.notes.push(note.clone());
                }
            }
            match res {
                None => {
                    if r.holds == Some(true) {
                        r.holds = None;
                    }
                }
                Some(res) => {
                    r.checked += res.checked;
                    r.failures += res.failures;
                    if res.failures > 0 {
                        r.holds = Some(false);
                        if r.witness.is_none() {
                            r.witness.clone_from(&res.witness);
                        }
                    }
                }
            }
        }
        r.identity = idents.join(" and ");
        r.method = methods.join("; ");
        if law == Law::JordanAdmissible && p == 2 {
            r.notes.push(
                "in characteristic 2, {x,y} = xy + yx is not the symmetrized product \
                 (1/2 does not exist); the verdict refers to xy + yx"
                    .into(),
            );
        }
        if law == Law::PowerAssociative && r.holds == Some(true) && p == 0 {
            r.notes.push(
                "third and fourth powers suffice for power-associativity in characteristic 0 \
                 (Albert 1948, Power-associative rings)"
                    .into(),
            );
        }
        results.push(r);
    }
    LawReport {
        field: f.name(),
        dimension: n,
        results,
        notes: Vec::new(),
    }
}

/// The note on a polynomial identity that fails over GF(p) with p below its degree:
/// settled element-wise when GF(p)^n is small enough.
fn char_note<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    d: &Def,
    params: &Params,
) -> String {
    let p = f.characteristic();
    let head = format!(
        "`{}` is decided as a polynomial identity (in every extension field) and fails; \
         since p = {p} < {} (its degree in x)",
        identity_text(d),
        d.degree
    );
    let max = params.max_pointwise_elements;
    match pointwise::check_pointwise(f, t, names, &d.id, d.degree, notation(d.product), max) {
        Some(pointwise::Pointwise::Holds(k)) => format!(
            "{head}, it was also checked element-wise: it holds for all {k} elements over \
             GF({p}) itself"
        ),
        Some(pointwise::Pointwise::Fails(w)) => format!(
            "{head}, it was also checked element-wise: it fails over GF({p}) itself too: \
             {} = {}",
            w.expression, w.value
        ),
        None => format!(
            "{head}, it may still hold for every element over GF({p}) itself (too many \
             elements to check them all)"
        ),
    }
}

/// The unit as found by `find`, or why it could not be decided.
type UnitFinder<'a, E> = dyn FnMut() -> std::result::Result<Option<Vec<E>>, String> + 'a;

fn unital<F: Field>(
    f: &F,
    n: usize,
    names: &[String],
    find: &mut UnitFinder<F::Elem>,
) -> LawResult {
    let method = format!(
        "exact solution of the {} linear equations in {} unknowns",
        2 * n * n,
        n
    );
    let mut r = LawResult {
        law: Law::Unital,
        holds: None,
        identity: "u*x = x = x*u for some u".into(),
        method,
        checked: 1,
        failures: 0,
        witness: None,
        unit: None,
        notes: Vec::new(),
    };
    match find() {
        Ok(Some(u)) => {
            let sparse: Vec<(usize, F::Elem)> = u
                .iter()
                .cloned()
                .enumerate()
                .filter(|(_, c)| !f.is_zero(c))
                .collect();
            r.unit = Some(format_combination(f, &sparse, names));
            r.holds = Some(true);
        }
        Ok(None) => {
            r.holds = Some(false);
            r.failures = 1;
            r.notes
                .push("the linear system u*e_j = e_j = e_j*u has no solution".into());
        }
        Err(why) => {
            r.checked = 0;
            r.notes.push(format!("not decided: {why}"));
        }
    }
    r
}

#[cfg(test)]
mod tests;
