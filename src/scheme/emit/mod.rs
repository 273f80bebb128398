//! Code out: a verified scheme as a straight-line function in C, Rust or Python, as
//! recursive block code for matrix formats, or as a LaTeX `align*` environment.
//!
//! Straight-line functions take the coordinate vectors `a` (left, length d0) and `b`
//! (right, length d1) in the tensor's basis order and write/return `c` (length d2). The
//! additions follow the CSE programs of [`super::cost`]; the products carry the user's
//! labels. Arithmetic ([`Arith`], see [`plan`]):
//! - *exact* (the default): over Q, integer code (C `int64_t` or `__int128`, Rust `i64` or
//!   `i128`, Python `int`) with rational coefficients cleared by common denominators and an
//!   exact division at the end; the header states the input range free of overflow, and a
//!   requested input bound chooses 64 or 128 bits. Over GF(p), residues in `0..p` reduced
//!   after every operation (C and Rust: 64-bit words, p < 2^32).
//! - *float* (on request, over Q): `double`/`f64`/`float` with the coefficients rounded
//!   once, as the header states.
//!
//! The emitter verifies the scheme first and refuses one that does not verify.

mod blocks;
mod latex;
pub mod plan;
mod straight;
mod syntax;
#[cfg(test)]
mod tests;

pub use blocks::{BlockParams, block_growth};
pub use plan::{Arith, Plan, signed_max};
pub use syntax::product_names;

use super::{Scheme, verify};
use crate::error::Error;
use crate::scalar::FieldSpec;
use crate::tensor::Tensor;
use num_bigint::BigInt;
use syntax::Num;

/// Target language.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Lang {
    C,
    Rust,
    Python,
    Latex,
}

impl Lang {
    /// `c`, `rust`, `python` (or `py`), `latex` (or `tex`).
    pub fn parse(s: &str) -> Result<Lang, Error> {
        match s.to_ascii_lowercase().as_str() {
            "c" => Ok(Lang::C),
            "rust" | "rs" => Ok(Lang::Rust),
            "python" | "py" => Ok(Lang::Python),
            "latex" | "tex" => Ok(Lang::Latex),
            _ => Err(Error::Invalid(format!(
                "unknown language `{s}` (expected c, rust, python or latex)"
            ))),
        }
    }
}

/// Parameters of [`emit`].
#[derive(Clone, Debug)]
pub struct EmitParams {
    /// The function name.
    pub function: String,
    /// A description of the tensor for the header (e.g. `matmul:2,2,2`).
    pub title: String,
    pub arith: Arith,
    /// Exact integer code in C or Rust: the largest input magnitude the caller needs;
    /// chooses 64-bit or 128-bit arithmetic (an error if neither suffices).
    pub bound: Option<BigInt>,
    /// Recursive block code for a matrix format instead of one evaluation.
    pub blocks: Option<BlockParams>,
}

impl Default for EmitParams {
    fn default() -> Self {
        EmitParams {
            function: "bilin_mul".into(),
            title: String::new(),
            arith: Arith::Exact,
            bound: None,
            blocks: None,
        }
    }
}

fn describe(params: &EmitParams, t: &Tensor) -> String {
    if params.title.is_empty() {
        format!("a {:?} tensor", t.kind()).to_lowercase()
    } else {
        params.title.clone()
    }
}

/// The number style of straight-line code, with the header lines on its arithmetic.
fn choose_num(plan: &Plan, lang: Lang, params: &EmitParams) -> Result<(Num, Vec<String>), Error> {
    let mut head = Vec::new();
    if let FieldSpec::Prime(p) = plan.field {
        head.push(format!(
            "Arithmetic modulo p = {p}: a and b hold integers in 0..{} (the range free of overflow), c is reduced into 0..{}.",
            p - 1,
            p - 1
        ));
        return Ok((Num::Mod(p), head));
    }
    if plan.arith == Arith::Float {
        head.push(
            "Floating point: coefficients are rounded once to the nearest double, and fast schemes"
                .into(),
        );
        head.push(
            "can have a larger rounding error than the schoolbook method (the exact form is the default)."
                .into(),
        );
        return Ok((Num::Float, head));
    }
    let rational = plan.out_div.iter().any(|d| *d != BigInt::from(1));
    let (num, line) = if lang == Lang::Python {
        (
            Num::Int { wide: false },
            "Exact integer arithmetic on Python int (no overflow): a and b hold integers.".into(),
        )
    } else {
        if plan.largest_constant() > signed_max(64) {
            return Err(Error::Invalid(
                "a coefficient of this scheme does not fit in 64 bits; emit Python for unbounded integers"
                    .into(),
            ));
        }
        let x64 = plan.max_input(&signed_max(64));
        let x128 = plan.max_input(&signed_max(128)).min(signed_max(64));
        let one = BigInt::from(1);
        let wide = match &params.bound {
            None if x64 < one && x128 >= one => true,
            None if x64 < one => {
                return Err(Error::Invalid(
                    "no input range is free of overflow in 128-bit integers for this scheme; emit Python for unbounded integers"
                        .into(),
                ));
            }
            None => false,
            Some(b) if *b <= x64 => false,
            Some(b) if *b <= x128 => true,
            Some(b) => {
                return Err(Error::Invalid(format!(
                    "inputs up to {b} can overflow 128-bit integers in this scheme (the largest safe bound is {x128}); emit Python for unbounded integers"
                )));
            }
        };
        let (x, ty) = if wide {
            (x128, if lang == Lang::C { "__int128" } else { "i128" })
        } else {
            (x64, if lang == Lang::C { "int64_t" } else { "i64" })
        };
        (
            Num::Int { wide },
            format!(
                "Exact integer arithmetic ({ty}): for integers with |a[i]|, |b[j]| <= {x} no intermediate value overflows and c is exact."
            ),
        )
    };
    head.push(line);
    if rational {
        head.push(
            "Rational coefficients are cleared by scaling with common denominators; outputs are divided exactly (no remainder)."
                .into(),
        );
    }
    if plan.out_scale.iter().any(|d| *d != BigInt::from(1)) {
        let list: Vec<String> = plan.out_scale.iter().map(|d| d.to_string()).collect();
        head.push(format!(
            "The tensor has non-integral constants: c[k] holds den[k] times the result, den = [{}].",
            list.join(", ")
        ));
    }
    Ok((num, head))
}

/// Emit a scheme for `t` in `lang` (see the module docs). Verifies first (exactly) and
/// refuses a scheme that does not verify. Cost: verification plus the CSE of
/// [`super::cost::programs`].
pub fn emit(s: &Scheme, t: &Tensor, lang: Lang, params: &EmitParams) -> Result<String, Error> {
    if let Err(m) = verify(s, t) {
        return Err(Error::Invalid(format!(
            "the scheme does not verify ({} wrong coefficients); refusing to emit code",
            m.count
        )));
    }
    if params.arith == Arith::Float && s.field != FieldSpec::Rational {
        return Err(Error::Invalid(format!(
            "floating-point code is for schemes over Q, not over {}",
            s.field.name()
        )));
    }
    if let FieldSpec::Prime(p) = s.field
        && p >= 1 << 32
        && matches!(lang, Lang::C | Lang::Rust)
    {
        return Err(Error::Invalid(format!(
            "C and Rust output over GF({p}) needs p < 2^32 (Python has no limit)"
        )));
    }
    let d = s.dims;
    let mut head = vec![format!(
        "Bilinear algorithm for {} (dims {} x {} -> {}), over {}.",
        describe(params, t),
        d[0],
        d[1],
        d[2],
        s.field.name()
    )];
    if lang == Lang::Latex {
        if params.blocks.is_some() {
            return Err(Error::Invalid(
                "block code is emitted for C, Rust and Python".into(),
            ));
        }
        let c = super::cost::count_cost(s);
        head.push(format!(
            "Rank {}: {} additions after common-subexpression elimination ({} before), {} multiplications by constants other than +-1.",
            s.rank(),
            c.total(),
            c.naive_total(),
            c.scalings_total()
        ));
        head.push("Verified exactly against the structure tensor before emission.".into());
        return Ok(latex::emit_latex(s, t, &head));
    }
    let plan = Plan::new(s, t, params.arith);
    let (adds, scal) = plan.operation_counts();
    let divs = plan.divisions();
    head.push(format!(
        "Rank {}: {} multiplications, {} additions, {} multiplications by constants other than +-1{}.",
        s.rank(),
        s.rank(),
        adds,
        scal,
        if divs > 0 {
            format!(", {divs} exact divisions")
        } else {
            String::new()
        }
    ));
    head.push("Verified exactly against the structure tensor before emission.".into());
    let labels = super::text::product_labels(s, t);
    let names = product_names(&labels);
    if names != labels {
        let pairs: Vec<String> = labels
            .iter()
            .zip(&names)
            .filter(|(l, n)| l != n)
            .map(|(l, n)| format!("{l} -> {n}"))
            .collect();
        head.push(format!(
            "Products renamed for the language: {}.",
            pairs.join(", ")
        ));
    }
    if let Some(bp) = &params.blocks {
        return emit_blocks(s, &plan, lang, params, bp, head, &names);
    }
    let (num, arith_head) = choose_num(&plan, lang, params)?;
    head.extend(arith_head);
    let body = straight::write_straight(&plan, t, lang, num, &params.function, &names);
    Ok(format!("{}{}", syntax::header(&head, lang), body))
}

fn emit_blocks(
    s: &Scheme,
    plan: &Plan,
    lang: Lang,
    params: &EmitParams,
    bp: &BlockParams,
    mut head: Vec<String>,
    names: &[String],
) -> Result<String, Error> {
    let [n, m, p] = bp.format;
    if s.field != FieldSpec::Rational {
        return Err(Error::Invalid(format!(
            "block code is emitted for schemes over Q, not over {}",
            s.field.name()
        )));
    }
    if n * m * p < 2 {
        return Err(Error::Invalid(format!(
            "block code needs a format that splits the matrices; <{n},{m},{p}> does not"
        )));
    }
    if s.dims != [n * m, m * p, n * p] {
        return Err(Error::Invalid(format!(
            "the scheme has dims {} x {} -> {}, not those of <{n},{m},{p}>",
            s.dims[0], s.dims[1], s.dims[2]
        )));
    }
    head.push(format!(
        "Recursive block code for <{n},{m},{p}>: C = A B for any sizes; one level splits A, B, C into"
    ));
    head.push(format!(
        "{n} x {m}, {m} x {p}, {n} x {p} blocks; below a block side of CUTOFF (default {}) the schoolbook",
        bp.cutoff
    ));
    head.push(
        "product runs; sizes that do not divide are peeled (the leftover strips use the schoolbook product)."
            .into(),
    );
    if plan.integral() {
        head.push(
            "Exact on integer element types while no intermediate overflows: for N x N inputs with entries"
                .into(),
        );
        let mut row = Vec::new();
        for size in [256usize, 1024, 4096] {
            let g = block_growth(plan, bp.format, bp.cutoff, [size; 3]);
            let x = (signed_max(64) / &g).sqrt();
            row.push(format!("N = {size}: {x}"));
        }
        head.push(format!(
            "|x| <= X, 64-bit integers are exact for X up to ({}).",
            row.join("; ")
        ));
        head.push(
            "Rational coefficients are cleared by scaling; outputs are divided exactly. Doubles compute the same formulas."
                .into(),
        );
    } else {
        head.push("Floating point: coefficients rounded once to the nearest double.".into());
    }
    if lang == Lang::Python {
        head.push(
            "Blocks are numpy arrays multiplied with `@`; use dtype=object for unbounded integers."
                .into(),
        );
    }
    let body = blocks::write_blocks(plan, lang, &params.function, names, bp);
    Ok(format!("{}{}", syntax::header(&head, lang), body))
}
