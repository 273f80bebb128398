//! Upper bounds for the tensor rank, each carried by a scheme verified exactly against the
//! tensor: a scheme of rank r is an exact decomposition into r rank-one terms, so
//! `R(T) <= r`. Sources: the slice decomposition, simultaneous diagonalisation and, when
//! the latter does not apply, the pencil bound (slices paired as pencils, over Q), the
//! interpolation scheme of a commutative algebra with one generator, the sum of the parts'
//! schemes of a semisimple algebra split into matrix algebras and fields, and the
//! evaluation scheme of a product of polynomials ([`crate::decompose`]), the schemes stored with the
//! catalog whose shape matches (each verified against this tensor, whatever its name), and
//! schemes the caller supplies (a `--scheme` file, a search result).

use crate::catalog::schemes::STORED_SCHEMES;
use crate::decompose::evaluation::{EvaluationParams, evaluation_scheme};
use crate::decompose::matrix_product::matrix_product_scheme;
use crate::decompose::monogenic::{MonogenicParams, monogenic_scheme};
use crate::decompose::semisimple::{PartShape, SemisimpleParams, semisimple_scheme};
use crate::decompose::{
    PencilParams, SimultaneousParams, Uniqueness, decompose, pencil_decomposition,
};
use crate::scheme::{Scheme, verify};
use crate::structure::matrix_frame::FrameParams;
use crate::tensor::Tensor;
use serde::Serialize;

/// One upper bound `R(T) <= value` with its verified scheme.
#[derive(Clone, Debug, Serialize)]
pub struct Upper {
    pub value: usize,
    /// Short name: `slices`, `simultaneous diagonalisation`, `pencils`, `interpolation`,
    /// `semisimple`, `evaluation`, `catalog`, `built`, `given scheme`.
    pub name: String,
    /// Where the scheme comes from and what it shows.
    pub detail: String,
    #[serde(skip)]
    pub scheme: Scheme,
}

/// Parameters of [`upper_bounds`].
#[derive(Clone, Debug, Default)]
pub struct UpperParams {
    pub simultaneous: SimultaneousParams,
    pub pencil: PencilParams,
    /// Leave out the catalog's stored schemes.
    pub no_catalog: bool,
}

/// What [`upper_bounds`] found.
#[derive(Clone, Debug)]
pub struct UpperBounds {
    /// Every upper bound, lowest first.
    pub uppers: Vec<Upper>,
    /// Kruskal's verdict when simultaneous diagonalisation succeeded.
    pub uniqueness: Option<Uniqueness>,
    pub notes: Vec<String>,
    /// `[n, m, p]` when the tensor was proven to be the matrix product `<n,m,p>` in some
    /// bases: the standard basis, a frame found exactly, or a semisimple algebra with one
    /// part `M_n` (`<n,n,n>`); the proof is the verified scheme carried through it.
    pub matrix_format: Option<[usize; 3]>,
}

/// Every upper bound found, lowest first, and Kruskal's verdict when simultaneous
/// diagonalisation succeeded. `given` schemes that do not verify are left out and named in
/// the notes. Cost: that of [`decompose`] and [`pencil_decomposition`] plus one exact
/// verification per candidate scheme.
pub fn upper_bounds(t: &Tensor, params: &UpperParams, given: &[(String, Scheme)]) -> UpperBounds {
    let mut out = Vec::new();
    let mut notes = Vec::new();
    let d = decompose(t, &params.simultaneous);
    notes.extend(d.note.clone());
    let slices_only = d.uniqueness.is_none();
    out.push(Upper {
        value: d.scheme.rank(),
        name: d.method.into(),
        detail: d.detail,
        scheme: d.scheme,
    });
    // general data: groups of slices split together, below the slice bound
    if slices_only {
        match pencil_decomposition(t, &params.pencil) {
            Err(why) => notes.push(why),
            Ok(Some((s, axis, groups))) if s.rank() < out[0].value => match verify(&s, t) {
                Ok(()) => out.push(Upper {
                    value: s.rank(),
                    name: "pencils".into(),
                    detail: format!(
                        "{groups} {} of {} slices (pairs: matrix pencils) split by evaluation \
                         at rational points, verified exactly (Ja'Ja' 1979, Optimal evaluation \
                         of pairs of bilinear forms, SIAM J. Comput. 8, from memory)",
                        if groups == 1 { "group" } else { "groups" },
                        crate::tensor::AXES[axis]
                    ),
                    scheme: s,
                }),
                Err(_) => notes.push("the pencil scheme does not verify; left out".into()),
            },
            Ok(_) => {}
        }
    }
    // a commutative algebra with one generator: 2n - t by the Chinese remainder theorem
    // and interpolation, in the table's own basis
    let monogenic = monogenic_scheme(t, &MonogenicParams::default());
    let monogenic_found = monogenic.is_some();
    if let Some(m) = monogenic {
        out.push(Upper {
            value: m.scheme.rank(),
            name: "interpolation".into(),
            detail: format!(
                "a generator with minimal polynomial {} ({} distinct irreducible {}): \
                 products of residues by interpolation, joined by the Chinese remainder \
                 theorem (Winograd 1977, Some bilinear forms whose multiplicative \
                 complexity depends on the field of constants, Math. Systems Theory 10, \
                 from memory), verified exactly",
                crate::poly::to_text(&m.minimal_polynomial, "x"),
                m.factors.len(),
                if m.factors.len() == 1 {
                    "factor"
                } else {
                    "factors"
                }
            ),
            scheme: m.scheme,
        });
    }
    // the best scheme of a matrix format (the schoolbook one without the catalog), the
    // model that the semisimple parts and the matrix product below carry into the table
    let field = t.field();
    let format = crate::scheme::build::matmul_format_of(t);
    let mut matrix_format = format;
    let model = |f: [usize; 3]| {
        if params.no_catalog {
            let m =
                crate::generators::generate(&format!("matmul:{},{},{}", f[0], f[1], f[2])).ok()?;
            Scheme::standard(&m).with_field(field).ok()
        } else {
            crate::catalog::schemes::best_matmul_scheme(f, field)
                .ok()
                .map(|b| b.scheme)
        }
    };
    // a semisimple algebra split into matrix algebras and fields: the sum of the parts'
    // schemes through explicit matrix units (a commutative one has its interpolation
    // scheme above, a matrix format its stored scheme below)
    if !monogenic_found && format.is_none() {
        let matrix = |k: usize| model([k, k, k]);
        if let Some(s) = semisimple_scheme(t, &SemisimpleParams::default(), &matrix) {
            if let [(PartShape::Matrix(k), _)] = s.parts[..]
                && k > 1
            {
                matrix_format = Some([k, k, k]);
            }
            out.push(Upper {
                value: s.scheme.rank(),
                name: "semisimple".into(),
                detail: format!(
                    "a semisimple algebra {} (Wedderburn 1908), split by explicit matrix units: \
                     the sum of a scheme per part ({}), carried through the isomorphism, \
                     verified exactly",
                    s.parts_text(&field.name()),
                    s.parts
                        .iter()
                        .map(|(p, r)| match p {
                            PartShape::Matrix(k) if *k > 1 => format!("M_{k}: {r}"),
                            PartShape::Field(d) if *d > 1 => format!("degree {d}: {r}"),
                            _ => format!("{}: 1", field.name()),
                        })
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
                scheme: s.scheme,
            });
        }
    }
    // a matrix product in bases of its own: the best stored scheme of its format, carried
    // into those bases
    if format.is_none()
        && let Some(mp) = matrix_product_scheme(t, &FrameParams::default(), &model)
    {
        let [n, m, p] = mp.format;
        matrix_format = Some(mp.format);
        out.push(Upper {
            value: mp.scheme.rank(),
            name: "matrix product".into(),
            detail: format!(
                "the matrix product <{n},{m},{p}> in bases of its own, found exactly (the left \
                 multipliers, a full matrix algebra, split through a simple module cut out by \
                 kernels); the best scheme of <{n},{m},{p}> carried into those bases, verified \
                 exactly"
            ),
            scheme: mp.scheme,
        });
    }
    // a product of polynomials: m + n - 1 by evaluation and interpolation
    if let Some(e) = evaluation_scheme(t, &EvaluationParams::default()) {
        let (m, n) = e.factors;
        out.push(Upper {
            value: e.scheme.rank(),
            name: "evaluation".into(),
            detail: format!(
                "a product of polynomials of degrees below {m} and {n}: evaluation at {} \
                 and interpolation (Toom 1963, The complexity of a scheme of functional \
                 elements realizing the multiplication of integers, Soviet Math. Doklady 3; \
                 Cook 1966, On the minimum computation time of functions, thesis; from \
                 memory), verified exactly",
                points_text(&e.points)
            ),
            scheme: e.scheme,
        });
    }
    if !params.no_catalog {
        // a matrix multiplication tensor: the best scheme built from the stored ones
        // (tensor products, direct sums, symmetries), verified against this tensor
        if let Some(f) = format
            && let Ok(b) = crate::catalog::schemes::best_matmul_scheme(f, t.field())
            && let Some(s) = verified_over(&b.scheme, t)
        {
            out.push(Upper {
                value: s.rank(),
                name: "built".into(),
                detail: format!("a scheme built as {}, verified exactly", b.how),
                scheme: s,
            });
        }
        for stored in STORED_SCHEMES {
            if stored.dims() != Some(t.dims()) {
                continue;
            }
            let Ok(s) = stored.read() else { continue };
            if let Some(s) = verified_over(&s, t) {
                out.push(Upper {
                    value: s.rank(),
                    name: "catalog".into(),
                    detail: format!("stored scheme {} ({})", stored.file, stored.source()),
                    scheme: s,
                });
            }
        }
    }
    for (name, s) in given {
        match verified_over(s, t) {
            Some(s) => out.push(Upper {
                value: s.rank(),
                name: "given scheme".into(),
                detail: format!("{name}, verified exactly"),
                scheme: s,
            }),
            None => notes.push(format!("{name}: the scheme does not verify; left out")),
        }
    }
    out.sort_by_key(|u| u.value);
    UpperBounds {
        uppers: out,
        uniqueness: d.uniqueness,
        notes,
        matrix_format,
    }
}

/// `s` read over the tensor's field, when it verifies there.
fn verified_over(s: &Scheme, t: &Tensor) -> Option<Scheme> {
    let s = if s.field == t.field() {
        s.clone()
    } else {
        s.with_field(t.field()).ok()?
    };
    (s.dims == t.dims() && verify(&s, t).is_ok()).then_some(s)
}

/// The evaluation points as text: `0, infinity, 1, -1, 2, -2, 1/2, -1/2` (past eight
/// points: the first six, `...`, the last and the count). Cost: O(points).
fn points_text(points: &[(i64, i64)]) -> String {
    let one = |&(a, b): &(i64, i64)| match b {
        0 => "infinity".to_string(),
        1 => a.to_string(),
        _ => format!("{a}/{b}"),
    };
    let all: Vec<String> = points.iter().map(one).collect();
    match all.len() {
        0..=8 => all.join(", "),
        n => format!("{}, ..., {} ({n} points)", all[..6].join(", "), all[n - 1]),
    }
}
