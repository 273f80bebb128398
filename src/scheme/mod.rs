//! Bilinear algorithms (schemes) for a structure tensor.
//!
//! A scheme of rank r is r rank-one terms `u_t (x) v_t (x) w_t` with
//! `sum_t u_t[i] v_t[j] w_t[k] = c[i][j][k]` for all (i, j, k) (the Brent equations).
//! Read as an algorithm: `m_t = (sum_i u_t[i] a_i)(sum_j v_t[j] b_j)`,
//! `c_k = sum_t w_t[k] m_t`.
//!
//! Invariants: every factor vector has the length of its axis; over GF(p) the entries are
//! integers in `0..p`.

pub mod build;
pub mod construct;
pub mod cost;
pub mod diagnose;
pub mod emit;
pub mod equiv;
pub mod json;
pub mod polish;
pub mod sandwich;
pub mod symmetry;
pub mod terms;
#[cfg(test)]
pub(crate) mod testkit;
pub mod text;
mod verify;

pub use verify::{Mismatch, Wrong, scheme_tensor, verify, wrong_coefficients};

use crate::scalar::{FieldSpec, Q};

/// A bilinear algorithm: the three factor matrices, one row per multiplication.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Scheme {
    /// The field the coefficients live in.
    pub field: FieldSpec,
    /// Dimensions of the left, right and result spaces.
    pub dims: [usize; 3],
    /// `u[t]` has length `dims[0]`: the left linear form of multiplication t.
    pub u: Vec<Vec<Q>>,
    /// `v[t]` has length `dims[1]`.
    pub v: Vec<Vec<Q>>,
    /// `w[t]` has length `dims[2]`: where product t is added into the result.
    pub w: Vec<Vec<Q>>,
    /// The user's names of the products (`p0`, `pinf`, ...), kept from the text form into
    /// written schemes and emitted code; empty when the products carry the default names
    /// `m1..mr`. When not empty it has one entry per product.
    pub labels: Vec<String>,
}

impl Scheme {
    /// The empty scheme (rank 0) for a shape.
    pub fn empty(field: FieldSpec, dims: [usize; 3]) -> Self {
        Scheme {
            field,
            dims,
            u: Vec::new(),
            v: Vec::new(),
            w: Vec::new(),
            labels: Vec::new(),
        }
    }

    /// The name of product t: the user's label, or `{prefix}{t+1}` when the scheme has no
    /// labels (see [`text::product_prefix`] for the prefix of a tensor).
    pub fn label(&self, t: usize, prefix: &str) -> String {
        match self.labels.get(t) {
            Some(l) if self.labels.len() == self.rank() => l.clone(),
            _ => format!("{prefix}{}", t + 1),
        }
    }

    /// The number of multiplications.
    pub fn rank(&self) -> usize {
        self.u.len()
    }

    /// Append a rank-one term. A labelled scheme loses its labels (the new product has
    /// none); use [`Scheme::push_labelled`] to keep them.
    pub fn push(&mut self, u: Vec<Q>, v: Vec<Q>, w: Vec<Q>) {
        assert_eq!(u.len(), self.dims[0]);
        assert_eq!(v.len(), self.dims[1]);
        assert_eq!(w.len(), self.dims[2]);
        self.u.push(u);
        self.v.push(v);
        self.w.push(w);
        self.labels.clear();
    }

    /// Append a rank-one term with a label (kept only while every product has one).
    pub fn push_labelled(&mut self, u: Vec<Q>, v: Vec<Q>, w: Vec<Q>, label: Option<String>) {
        let mut labels = std::mem::take(&mut self.labels);
        let keep = labels.len() == self.rank() && label.is_some();
        self.push(u, v, w);
        if keep {
            labels.extend(label);
            self.labels = labels;
        }
    }

    /// The same scheme over another field: over GF(p) every coefficient is reduced to
    /// `0..p`; a rational coefficient whose denominator vanishes mod p is an error, and so
    /// is turning a GF(p) scheme into a scheme over another field.
    pub fn with_field(&self, field: FieldSpec) -> crate::Result<Scheme> {
        if self.field == field {
            return Ok(self.clone());
        }
        if self.field != FieldSpec::Rational {
            return Err(crate::Error::Invalid(format!(
                "a scheme over {} cannot be read over {}",
                self.field.name(),
                field.name()
            )));
        }
        let conv = |rows: &[Vec<Q>]| -> crate::Result<Vec<Vec<Q>>> {
            rows.iter()
                .map(|r| r.iter().map(|x| reduce_into(field, x)).collect())
                .collect()
        };
        Ok(Scheme {
            field,
            dims: self.dims,
            u: conv(&self.u)?,
            v: conv(&self.v)?,
            w: conv(&self.w)?,
            labels: self.labels.clone(),
        })
    }

    /// Total number of nonzero coefficients in the three factor matrices.
    pub fn nnz(&self) -> usize {
        use num_traits::Zero;
        [&self.u, &self.v, &self.w]
            .iter()
            .flat_map(|m| m.iter().flatten())
            .filter(|x| !x.is_zero())
            .count()
    }

    /// The standard scheme: one multiplication per nonzero structure constant
    /// (`u = e_i`, `v = e_j`, `w = c[i][j][k] e_k`); for matrix multiplication this is the
    /// schoolbook algorithm.
    pub fn standard(t: &crate::tensor::Tensor) -> Self {
        use num_traits::{One, Zero};
        let d = t.dims();
        let mut s = Scheme::empty(t.field(), d);
        let unit = |n: usize, i: usize| {
            let mut e = vec![Q::zero(); n];
            e[i] = Q::one();
            e
        };
        for (i, j, k, c) in t.entries() {
            let mut w = vec![Q::zero(); d[2]];
            w[k] = c.clone();
            s.push(unit(d[0], i), unit(d[1], j), w);
        }
        s
    }
}

/// `x` reduced into `field` (over Q: itself); a value whose denominator vanishes mod p
/// is returned unchanged (callers only reduce values that are defined).
pub(crate) fn red(field: FieldSpec, x: Q) -> Q {
    reduce_into(field, &x).unwrap_or(x)
}

/// A rational number as an element of `field`, written as a rational (over GF(p): the
/// integer in `0..p`). Errors when the denominator vanishes mod p.
pub fn reduce_into(field: FieldSpec, x: &Q) -> crate::Result<Q> {
    use crate::scalar::{Field, PrimeField};
    match field {
        FieldSpec::Rational => Ok(x.clone()),
        FieldSpec::Prime(p) => {
            let f = PrimeField::new(p)
                .ok_or_else(|| crate::Error::Invalid(format!("{p} is not a prime")))?;
            f.from_rational(x)
                .map(|e| f.to_rational(&e))
                .ok_or_else(|| {
                    crate::Error::Invalid(format!(
                        "the coefficient {} has a denominator divisible by {p}",
                        crate::scalar::q_to_string(x)
                    ))
                })
        }
    }
}

/// Read a scheme file in either documented form (JSON when the text starts with `{`,
/// the text form otherwise), resolve it against `t` and bring it to the tensor's field.
/// Every refusal is an [`crate::Error::Parse`] at a line and column of `source` (a JSON
/// path too for the JSON form); an input with no statement at all is refused.
pub fn parse_scheme(text: &str, source: &str, t: &crate::tensor::Tensor) -> crate::Result<Scheme> {
    parse_scheme_located(text, source, t).map(|x| x.0)
}

/// [`parse_scheme`], also returning the lines of a text-form file (`None` for JSON).
pub fn parse_scheme_located(
    text: &str,
    source: &str,
    t: &crate::tensor::Tensor,
) -> crate::Result<(Scheme, Option<text::LineMap>)> {
    if text
        .trim_start_matches('\u{feff}')
        .trim_start()
        .starts_with('{')
    {
        let doc = crate::input::json_tree::JsonDoc { text, source };
        let root = doc.parse()?;
        let s = json::from_node(&doc, &root, "$", Some(t.field()))?;
        if s.dims != t.dims() {
            let at = root.get("dims").map_or(root.at, |d| d.at);
            return Err(doc.error(
                at,
                "$.dims",
                format!(
                    "the scheme has format {}x{}x{} but the tensor has {}x{}x{}",
                    s.dims[0],
                    s.dims[1],
                    s.dims[2],
                    t.dims()[0],
                    t.dims()[1],
                    t.dims()[2]
                ),
            ));
        }
        Ok((s, None))
    } else {
        let (s, lines) = text::parse_text_located(text, source, t)?;
        Ok((s, Some(lines)))
    }
}

/// The text of a scheme for a file named `path`: the text form (with `title` as comment
/// lines) when the name ends in `.txt`, the JSON form on one line otherwise.
pub fn write_for_path(path: &str, s: &Scheme, t: &crate::tensor::Tensor, title: &str) -> String {
    let is_text = std::path::Path::new(path)
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("txt"));
    if is_text {
        text::write_text(s, t, title)
    } else {
        format!("{}\n", json::to_json(s))
    }
}
