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
//! Over Q the checks run in GF(2^61 - 1) on the integer-scaled table when a coefficient
//! bound proves that this decides every instance exactly (see `fast`); witnesses are
//! always recomputed over the algebra's own field.
//!
//! Every failure comes with a witness: the basis tuple, the substituted expression and its
//! exact nonzero value written with the basis names.

pub mod check;
pub mod expr;
mod fast;
pub mod pointwise;
mod unit;

pub use check::{Check, Witness};
pub use unit::find_unit;

use crate::error::{Error, Result};
use crate::scalar::Field;
use crate::tensor::{Table, Tensor};
use expr::{Identity, Notation, format_combination, mul, render, var};
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
    pub const ALL: [Law; 14] = [
        Law::Associative,
        Law::Commutative,
        Law::Anticommutative,
        Law::Jacobi,
        Law::Lie,
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

    /// Parse a kebab-case name.
    pub fn parse(s: &str) -> Option<Law> {
        Law::ALL.into_iter().find(|l| l.name() == s)
    }

    fn components(self) -> &'static [Component] {
        use Component::*;
        match self {
            Law::Associative => &[Assoc],
            Law::Commutative => &[Comm],
            Law::Anticommutative => &[Anti],
            Law::Jacobi => &[Jacobi],
            Law::Lie => &[Anti, Jacobi],
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
    /// An identity whose estimated number of term evaluations exceeds this is skipped
    /// (reported undecided, never guessed).
    pub max_work: u128,
    /// Over GF(p) with p below an identity's degree, a failing identity is also checked on
    /// every element when there are at most this many (p^n).
    pub max_pointwise_elements: u64,
}

impl Default for Params {
    fn default() -> Self {
        Params {
            laws: Law::ALL.to_vec(),
            stop_first: false,
            max_work: 40_000_000,
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
}

/// The identities behind the laws.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
enum Component {
    Assoc,
    Comm,
    Anti,
    Jacobi,
    LeftAlt,
    RightAlt,
    Flex,
    Power3,
    Power4,
    JordanId,
    CommutatorJacobi,
    AnticommutatorJordan,
}

/// Which product an identity is written in.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Product {
    Original,
    Commutator,
    Anticommutator,
}

struct Def {
    id: Identity,
    /// degree in the repeated variable (0: multilinear).
    degree: usize,
    product: Product,
}

fn def(c: Component) -> Def {
    use Component::*;
    let (x, y, z, w) = (var(0), var(1), var(2), var(3));
    let assoc = |a: &Expr3, b: &Expr3, c: &Expr3| {
        vec![
            (1, mul(mul(a.clone(), b.clone()), c.clone())),
            (-1, mul(a.clone(), mul(b.clone(), c.clone()))),
        ]
    };
    let jacobi = vec![
        (1, mul(mul(x.clone(), y.clone()), z.clone())),
        (1, mul(mul(y.clone(), z.clone()), x.clone())),
        (1, mul(mul(z.clone(), x.clone()), y.clone())),
    ];
    // Jordan: variables 0..3 are x, 3 is y: ((x x) y) x - (x x)(y x)
    let jordan = vec![
        (1, mul(mul(mul(x.clone(), y.clone()), w.clone()), z.clone())),
        (
            -1,
            mul(mul(x.clone(), y.clone()), mul(w.clone(), z.clone())),
        ),
    ];
    let (terms, nvars, degree, product) = match c {
        Assoc => (assoc(&x, &y, &z), 3, 0, Product::Original),
        Comm => (
            vec![(1, mul(x.clone(), y.clone())), (-1, mul(y, x))],
            2,
            0,
            Product::Original,
        ),
        Anti => (vec![(1, mul(x, y))], 2, 2, Product::Original),
        Jacobi => (jacobi, 3, 0, Product::Original),
        LeftAlt => (assoc(&x, &y, &z), 3, 2, Product::Original),
        RightAlt => (assoc(&z, &x, &y), 3, 2, Product::Original),
        Flex => (assoc(&x, &z, &y), 3, 2, Product::Original),
        Power3 => (assoc(&x, &y, &z), 3, 3, Product::Original),
        Power4 => (
            vec![
                (1, mul(mul(x.clone(), y.clone()), mul(z.clone(), w.clone()))),
                (-1, mul(mul(mul(x, y), z), w)),
            ],
            4,
            4,
            Product::Original,
        ),
        JordanId => (jordan, 4, 3, Product::Original),
        CommutatorJacobi => (jacobi, 3, 0, Product::Commutator),
        AnticommutatorJordan => (jordan, 4, 3, Product::Anticommutator),
    };
    Def {
        id: Identity { terms, nvars },
        degree,
        product,
    }
}

type Expr3 = expr::Expr;

fn notation(p: Product) -> Notation {
    match p {
        Product::Original => Notation::Product,
        Product::Commutator => Notation::Commutator,
        Product::Anticommutator => Notation::Anticommutator,
    }
}

/// The identity written with variables: the repeated variable is `x`, the linear ones
/// `y, z, w` (or `x, y, z` when multilinear).
fn identity_text(d: &Def) -> String {
    let names: Vec<&str> = if d.degree == 0 {
        ["x", "y", "z", "w"][..d.id.nvars].to_vec()
    } else {
        let mut v = vec!["x"; d.degree];
        v.extend(["y", "z", "w"][..d.id.nvars - d.degree].iter());
        v
    };
    let terms: Vec<(i64, String)> =
        d.id.terms
            .iter()
            .map(|(c, e)| (*c, render(e, &names, notation(d.product))))
            .collect();
    format!("{} = 0", expr::render_sum(&terms))
}

fn method_text(d: &Def) -> String {
    let m = d.id.nvars - d.degree;
    if d.degree == 0 {
        format!("all basis {}-tuples (the identity is {}-linear)", m, m)
    } else if m == 0 {
        format!(
            "linearized: each multiset of {} basis elements, summed over its distinct orderings",
            d.degree
        )
    } else {
        format!(
            "linearized: each multiset of {} basis elements (summed over its distinct \
             orderings) with each basis {}",
            d.degree,
            if m == 1 {
                "element".to_string()
            } else {
                format!("{m}-tuple")
            }
        )
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
/// basis). Errors: a non-square map. Cost: see [`check`]; the most expensive default law is
/// the fourth-power identity, `C(n+3, 4)` multisets of up to 24 orderings.
pub fn check_laws(t: &Tensor, params: &Params) -> Result<LawReport> {
    let alg = t.as_algebra().ok_or_else(|| {
        let d = t.dims();
        Error::Invalid(format!(
            "laws need an algebra or a square bilinear map; this map is {} x {} -> {}",
            d[0], d[1], d[2]
        ))
    })?;
    Ok(
        crate::with_field!(alg.field(), f => check_laws_in(f, &alg.table(f), &alg.names()[0], params)),
    )
}

/// [`check_laws`] on a structure table over a field context.
pub fn check_laws_in<F: Field>(
    f: &F,
    t: &Table<F::Elem>,
    names: &[String],
    params: &Params,
) -> LawReport {
    let n = t.dims[0];
    let p = f.characteristic();
    let mut cache: Vec<(Component, Option<Check>, Vec<String>)> = Vec::new();
    let mut tables: [Option<Table<F::Elem>>; 2] = [None, None];
    let mut results = Vec::new();
    for &law in &params.laws {
        if law == Law::Unital {
            results.push(unital(f, t, names));
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
            if !cache.iter().any(|e| e.0 == c) {
                let mut notes = Vec::new();
                let work = check::work_estimate(n, &d.id, d.degree);
                let res = if work > params.max_work {
                    notes.push(format!(
                        "`{}` skipped: about {work} term evaluations exceed the budget {}",
                        identity_text(&d),
                        params.max_work
                    ));
                    None
                } else {
                    let table = match d.product {
                        Product::Original => t,
                        Product::Commutator => {
                            tables[0].get_or_insert_with(|| symmetrised(f, t, -1))
                        }
                        Product::Anticommutator => {
                            tables[1].get_or_insert_with(|| symmetrised(f, t, 1))
                        }
                    };
                    let nt = notation(d.product);
                    Some(fast::check_identity_fast(
                        f,
                        table,
                        names,
                        &d.id,
                        d.degree,
                        nt,
                        params.stop_first,
                    ))
                };
                if let Some(res) = &res
                    && res.failures > 0
                    && p > 0
                    && p < d.degree as u64
                {
                    let table = match d.product {
                        Product::Original => t,
                        Product::Commutator => tables[0].as_ref().expect("built"),
                        Product::Anticommutator => tables[1].as_ref().expect("built"),
                    };
                    notes.push(char_note(f, table, names, &d, params));
                }
                cache.push((c, res, notes));
            }
            let (_, res, notes) = cache.iter().find(|e| e.0 == c).expect("cached");
            r.notes.extend(notes.iter().cloned());
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

fn unital<F: Field>(f: &F, t: &Table<F::Elem>, names: &[String]) -> LawResult {
    let n = t.dims[0];
    let u = find_unit(f, t);
    let unit = u.as_ref().map(|u| {
        let sparse: Vec<(usize, F::Elem)> = u
            .iter()
            .cloned()
            .enumerate()
            .filter(|(_, c)| !f.is_zero(c))
            .collect();
        format_combination(f, &sparse, names)
    });
    LawResult {
        law: Law::Unital,
        holds: Some(u.is_some()),
        identity: "u*x = x = x*u for some u".into(),
        method: format!(
            "exact solution of the {} linear equations in {} unknowns",
            2 * n * n,
            n
        ),
        checked: 1,
        failures: u.is_none() as u64,
        witness: None,
        unit,
        notes: if u.is_none() {
            vec!["the linear system u*e_j = e_j = e_j*u has no solution".into()]
        } else {
            Vec::new()
        },
    }
}

#[cfg(test)]
mod tests;
