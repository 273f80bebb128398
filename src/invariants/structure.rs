//! Structural properties of an algebra that users claim: solvable, nilpotent (with its
//! class) and semisimple, each decided exactly by the engines that exist for it, with a
//! witness where it fails.
//!
//! - **solvable**: the derived series `A, A^2 = AA, (A^2)(A^2), ...` reaches 0
//!   ([`super::spans::derived_series_terms`]); the witness of a failure is its last term,
//!   a nonzero subspace `S` with `SS = S`. Holding, the derived length is reported.
//! - **nilpotent**: the series `A^1 = A, A^{k+1} = A A^k + A^k A` reaches 0
//!   ([`super::spans::lower_central_series_terms`]; for a Lie or associative algebra the
//!   lower central series, and for any algebra it reaches 0 exactly when every product of
//!   enough elements vanishes); the class is the least c with `A^{c+1} = 0`; the witness of
//!   a failure is the last, nonzero term `S = A S + S A`.
//! - **semisimple**: for a Lie algebra over Q, Cartan's criterion (the Killing form
//!   `tr(ad_x ad_y)` is nondegenerate; Jacobson 1962, Lie Algebras, ch. III); for an
//!   associative algebra over Q, the radical is zero (Wedderburn; the radical by Dickson's
//!   trace-form criterion, [`super::radical`]). The witness of a failure is a basis of the
//!   Killing form's kernel (an ideal, nonzero) or of the radical. Otherwise (another kind
//!   of algebra, or GF(p), where these criteria fail) the property is undecided.
//!
//! Every witness is exact: a basis of a subspace, in reduced echelon form.
//! Cost: that of the series, of one trace form and of the radical's linear system.

use super::forms::trace_form;
use super::radical::radical;
use super::spans::{Series, derived_series_terms, lower_central_series_terms};
use crate::error::Result;
use crate::linalg::nullspace::SolveParams;
use crate::linalg::{Matrix, nullspace};
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::{IntegralTensor, Tensor};
use serde::Serialize;

/// The properties decided here.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Property {
    Solvable,
    Nilpotent,
    Semisimple,
}

impl Property {
    /// All properties, in report order.
    pub const ALL: [Property; 3] = [
        Property::Solvable,
        Property::Nilpotent,
        Property::Semisimple,
    ];

    /// The name used by `--laws` and `--expect`.
    pub fn name(self) -> &'static str {
        match self {
            Property::Solvable => "solvable",
            Property::Nilpotent => "nilpotent",
            Property::Semisimple => "semisimple",
        }
    }

    /// Parse a name, in any case.
    pub fn parse(s: &str) -> Option<Property> {
        Property::ALL
            .into_iter()
            .find(|p| p.name().eq_ignore_ascii_case(s))
    }
}

/// The verdict on one property.
#[derive(Clone, Debug, Serialize)]
pub struct PropertyResult {
    pub property: Property,
    /// `Some(true)`: proven; `Some(false)`: fails, with a witness; `None`: undecided.
    pub holds: Option<bool>,
    /// The nilpotency class (nilpotent) or the derived length (solvable) when it holds.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub class: Option<usize>,
    /// What was computed (`derived series dims 3, 1, 0`).
    pub detail: String,
    /// How it was decided.
    pub method: String,
    /// Where it fails: a subspace, described, with a basis.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub witness: Option<SubspaceWitness>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub notes: Vec<String>,
}

/// A nonzero subspace that shows a property fails.
#[derive(Clone, Debug, Serialize)]
pub struct SubspaceWitness {
    /// What the subspace is.
    pub description: String,
    /// Its basis, exact coordinates in the algebra's basis (reduced echelon form).
    #[serde(skip)]
    pub basis: Vec<Vec<Q>>,
    /// The same basis written with the basis names.
    pub vectors: Vec<String>,
}

/// The laws a property's method depends on (decided by the law engine by the caller).
#[derive(Clone, Copy, Debug, Default)]
pub struct KnownLaws {
    pub lie: Option<bool>,
    pub associative: Option<bool>,
}

fn dims_text(d: &[usize]) -> String {
    d.iter()
        .map(|x| x.to_string())
        .collect::<Vec<_>>()
        .join(", ")
}

/// Decide the requested properties of an algebra (a square map is read on its left basis
/// by the caller). `names` writes the witnesses. Cost: see the module documentation; the
/// series are computed once each.
pub fn decide_properties(
    t: &Tensor,
    props: &[Property],
    known: KnownLaws,
    params: &SolveParams,
) -> Result<Vec<PropertyResult>> {
    let it = IntegralTensor::from_tensor(t);
    let names = &t.names()[0];
    let witness = |description: String, basis: Vec<Vec<Q>>| SubspaceWitness {
        vectors: basis
            .iter()
            .map(|v| crate::laws::expr::format_combination(&Rationals, &sparse(v), names))
            .collect(),
        description,
        basis,
    };
    let mut out = Vec::new();
    for &p in props {
        let r = match p {
            Property::Solvable => {
                let s = derived_series_terms(&it, params)?;
                series_result(p, &s, "derived series", |last| {
                    witness(
                        format!(
                            "the derived series stops at a nonzero term S of dimension {} \
                             with SS = S",
                            last.len()
                        ),
                        last,
                    )
                })
            }
            Property::Nilpotent => {
                let s = lower_central_series_terms(&it, params)?;
                series_result(p, &s, "lower central series", |last| {
                    witness(
                        format!(
                            "the lower central series stops at a nonzero term S of dimension \
                             {} with AS + SA = S",
                            last.len()
                        ),
                        last,
                    )
                })
            }
            Property::Semisimple => semisimple(t, &it, known, params, &witness)?,
        };
        out.push(r);
    }
    Ok(out)
}

fn sparse(v: &[Q]) -> Vec<(usize, Q)> {
    v.iter()
        .cloned()
        .enumerate()
        .filter(|(_, x)| *x != Q::from_integer(0.into()))
        .collect()
}

fn series_result(
    p: Property,
    s: &Series,
    what: &str,
    witness: impl FnOnce(Vec<Vec<Q>>) -> SubspaceWitness,
) -> PropertyResult {
    let reaches_zero = s.dims.last() == Some(&0);
    let class = reaches_zero.then(|| s.dims.len() - 1);
    let detail = match (p, class) {
        (Property::Nilpotent, Some(c)) => {
            format!("{what} dims {}: nilpotent of class {c}", dims_text(&s.dims))
        }
        (_, Some(c)) => format!("{what} dims {}: derived length {c}", dims_text(&s.dims)),
        _ => format!("{what} dims {} (does not reach 0)", dims_text(&s.dims)),
    };
    let method = if p == Property::Solvable {
        "A^(k+1) = A^(k) A^(k) until it stabilises; dimensions exact (spans of products, \
         proven by the multi-modular solver)"
    } else {
        "A^(k+1) = A A^(k) + A^(k) A until it stabilises; dimensions exact (spans of \
         products, proven by the multi-modular solver)"
    };
    PropertyResult {
        property: p,
        holds: Some(reaches_zero),
        class,
        detail,
        method: method.into(),
        witness: (!reaches_zero).then(|| witness(s.last.clone())),
        notes: Vec::new(),
    }
}

fn semisimple(
    t: &Tensor,
    it: &IntegralTensor,
    known: KnownLaws,
    params: &SolveParams,
    witness: &dyn Fn(String, Vec<Vec<Q>>) -> SubspaceWitness,
) -> Result<PropertyResult> {
    let mut r = PropertyResult {
        property: Property::Semisimple,
        holds: None,
        class: None,
        detail: String::new(),
        method: String::new(),
        witness: None,
        notes: Vec::new(),
    };
    let n = t.dim();
    if t.field() != FieldSpec::Rational {
        r.detail = "undecided over GF(p)".into();
        r.notes.push(
            "semisimplicity is decided over Q only: Cartan's criterion (Lie algebras) and the \
             trace-form radical (associative algebras) need characteristic 0"
                .into(),
        );
        return Ok(r);
    }
    if known.lie == Some(true) {
        r.method = "Cartan's criterion: the Killing form tr(ad_x ad_y) is nondegenerate \
                    (Jacobson 1962, Lie Algebras, ch. III)"
            .into();
        let g = trace_form(it, true);
        let m = Matrix::from_rows(
            g.iter()
                .map(|row| row.iter().map(|x| Q::from_integer(x.clone())).collect())
                .collect(),
            n,
        );
        let kernel = nullspace(&Rationals, &m);
        let rank = n - kernel.len();
        r.holds = Some(kernel.is_empty() && n > 0);
        r.detail = format!("Killing form of rank {rank} on dimension {n}");
        if !kernel.is_empty() {
            let mut km = Matrix::from_rows(kernel, n);
            let piv = crate::linalg::rref(&Rationals, &mut km);
            let basis: Vec<Vec<Q>> = (0..piv.len()).map(|i| km.row(i).to_vec()).collect();
            r.witness = Some(witness(
                format!(
                    "the kernel of the Killing form, an ideal of dimension {}",
                    basis.len()
                ),
                basis,
            ));
        }
        return Ok(r);
    }
    if known.associative == Some(true) {
        r.method = "the radical is zero (Wedderburn); the radical by the trace form \
                    Tr(L_xy) (Dickson's criterion, characteristic 0)"
            .into();
        if let Some(rad) = radical(t, it, params)? {
            let dim = rad.space.dim();
            r.holds = Some(dim == 0 && n > 0);
            r.detail = format!("radical of dimension {dim}");
            if dim > 0 {
                let basis: Vec<Vec<Q>> = (0..dim).map(|i| rad.space.dense(i)).collect();
                r.witness = Some(witness(
                    format!("the radical, a nilpotent ideal of dimension {dim}"),
                    basis,
                ));
            }
        }
        return Ok(r);
    }
    r.detail = "undecided: neither a Lie nor an associative algebra".into();
    r.notes.push(
        "semisimplicity is decided for Lie algebras (Cartan's criterion) and associative \
         algebras (the radical) over Q"
            .into(),
    );
    Ok(r)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::invariants::testing::{
        heisenberg3, matrix_algebra, octonions, sl2, upper_triangular_2,
    };
    use crate::laws::{self, Law};

    fn decide(t: &Tensor) -> Vec<PropertyResult> {
        let lp = laws::Params {
            laws: vec![Law::Lie, Law::Associative],
            ..Default::default()
        };
        let lr = laws::check_laws(t, &lp).unwrap();
        let known = KnownLaws {
            lie: lr.holds(Law::Lie),
            associative: lr.holds(Law::Associative),
        };
        decide_properties(t, &Property::ALL, known, &Default::default()).unwrap()
    }

    /// The upper triangular n x n matrices under the commutator (basis E_ij, i <= j).
    fn upper_triangular_lie(n: usize) -> Tensor {
        let idx: Vec<(usize, usize)> = (0..n).flat_map(|i| (i..n).map(move |j| (i, j))).collect();
        let names = idx
            .iter()
            .map(|(i, j)| format!("E{}{}", i + 1, j + 1))
            .collect();
        let mut t = Tensor::algebra(FieldSpec::Rational, names);
        let pos = |a: usize, b: usize| idx.iter().position(|&x| x == (a, b)).unwrap();
        for (x, &(i, j)) in idx.iter().enumerate() {
            for (y, &(k, l)) in idx.iter().enumerate() {
                // [E_ij, E_kl] = delta_jk E_il - delta_li E_kj
                if j == k {
                    t.add(x, y, pos(i, l), &Q::from_integer(1.into()));
                }
                if l == i {
                    t.add(x, y, pos(k, j), &Q::from_integer((-1).into()));
                }
            }
        }
        t
    }

    /// Heisenberg: nilpotent of class 2, solvable; sl_2 semisimple, not solvable; the upper
    /// triangular matrices solvable, not nilpotent (their derived algebra is the strictly
    /// upper triangular one), not semisimple (Jacobson 1962, Lie Algebras, ch. I-III;
    /// common practice).
    #[test]
    fn lie_algebras() {
        let h = decide(&heisenberg3());
        assert_eq!(
            (h[0].holds, h[1].holds, h[1].class),
            (Some(true), Some(true), Some(2))
        );
        assert_eq!(h[2].holds, Some(false));
        let s = decide(&sl2());
        assert_eq!(
            (s[0].holds, s[1].holds, s[2].holds),
            (Some(false), Some(false), Some(true))
        );
        let w = s[0].witness.as_ref().unwrap();
        assert_eq!(
            w.basis.len(),
            3,
            "sl_2 is perfect: the last derived term is sl_2"
        );
        let b = decide(&upper_triangular_lie(3));
        assert_eq!(
            (b[0].holds, b[1].holds, b[2].holds),
            (Some(true), Some(false), Some(false))
        );
        // the lower central series of b_3 stops at the strictly upper triangular part
        let w = b[1].witness.as_ref().unwrap();
        assert_eq!(w.basis.len(), 3, "{:?}", w.vectors);
        let kernel = b[2].witness.as_ref().unwrap();
        assert!(!kernel.basis.is_empty());
        // the octonions: neither Lie nor associative, so semisimplicity is undecided;
        // O^2 = O, so neither solvable nor nilpotent
        let o = decide(&octonions());
        assert_eq!(
            (o[0].holds, o[1].holds, o[2].holds),
            (Some(false), Some(false), None)
        );
    }

    /// M_2(Q) is simple; the upper triangular 2 x 2 matrices have the radical Q E12
    /// (Wedderburn; Pierce 1982, Associative Algebras).
    #[test]
    fn associative_algebras() {
        let m = decide(&matrix_algebra(2));
        assert_eq!(m[2].holds, Some(true));
        let u = decide(&upper_triangular_2());
        assert_eq!(u[2].holds, Some(false));
        assert_eq!(u[2].witness.as_ref().unwrap().basis.len(), 1);
    }
}
