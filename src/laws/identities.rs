//! The identities behind the laws: each law is one or more *components*, an identity
//! `sum of product trees = 0` with a degree in a repeated variable x and further linear
//! variables, written in the original product, its commutator or its anticommutator.
//! This module states them as expression trees (for rendering and for the exact one-instance
//! evaluator) and their shapes (for the plans of [`super::plans`]).

use super::expr::{self, Identity, Notation, mul, render, var};

/// The identities behind the laws.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Component {
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
    /// `J(x,y,xz) = J(x,y,z)x` with `J(a,b,c) = (ab)c + (bc)a + (ca)b` (Sagle 1961).
    MalcevId,
}

impl Component {
    /// Every component.
    pub const ALL: [Component; 13] = [
        Component::Assoc,
        Component::Comm,
        Component::Anti,
        Component::Jacobi,
        Component::LeftAlt,
        Component::RightAlt,
        Component::Flex,
        Component::Power3,
        Component::Power4,
        Component::JordanId,
        Component::CommutatorJacobi,
        Component::AnticommutatorJordan,
        Component::MalcevId,
    ];
}

/// Which product an identity is written in.
#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Product {
    Original,
    Commutator,
    Anticommutator,
}

pub struct Def {
    pub id: Identity,
    /// degree in the repeated variable (0: multilinear).
    pub degree: usize,
    pub product: Product,
}

pub fn def(c: Component) -> Def {
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
    // Malcev: variables 0 and 1 are x, 2 is y, 3 is z:
    // J(x,y,xz) - J(x,y,z)x with J(a,b,c) = (ab)c + (bc)a + (ca)b
    let malcev = || {
        let (x0, x1, y, z) = (var(0), var(1), var(2), var(3));
        let x1z = mul(x1.clone(), z.clone());
        vec![
            (1, mul(mul(x0.clone(), y.clone()), x1z.clone())),
            (1, mul(mul(y.clone(), x1z.clone()), x0.clone())),
            (1, mul(mul(x1z, x0.clone()), y.clone())),
            (
                -1,
                mul(mul(mul(x0.clone(), y.clone()), z.clone()), x1.clone()),
            ),
            (
                -1,
                mul(mul(mul(y.clone(), z.clone()), x0.clone()), x1.clone()),
            ),
            (-1, mul(mul(mul(z, x0), y), x1)),
        ]
    };
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
        MalcevId => (malcev(), 4, 2, Product::Original),
    };
    Def {
        id: Identity { terms, nvars },
        degree,
        product,
    }
}

type Expr3 = expr::Expr;

pub fn notation(p: Product) -> Notation {
    match p {
        Product::Original => Notation::Product,
        Product::Commutator => Notation::Commutator,
        Product::Anticommutator => Notation::Anticommutator,
    }
}

/// The identity written with variables: the repeated variable is `x`, the linear ones
/// `y, z, w` (or `x, y, z` when multilinear).
pub fn identity_text(d: &Def) -> String {
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

pub fn method_text(d: &Def) -> String {
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

impl Component {
    /// `(d, m)`: the degree in the repeated variable and the number of linear variables.
    pub fn shape(self) -> (usize, usize) {
        let d = def(self);
        (d.degree, d.id.nvars - d.degree)
    }

    /// The number of products in each term (every identity is homogeneous).
    pub fn products(self) -> u32 {
        fn count(e: &expr::Expr) -> u32 {
            match e {
                expr::Expr::Var(_) => 0,
                expr::Expr::Mul(a, b) => 1 + count(a) + count(b),
            }
        }
        count(&def(self).id.terms[0].1)
    }

    /// The sum of the absolute values of the terms' coefficients.
    pub fn coefficient_sum(self) -> u64 {
        def(self)
            .id
            .terms
            .iter()
            .map(|(c, _)| c.unsigned_abs())
            .sum()
    }
}
