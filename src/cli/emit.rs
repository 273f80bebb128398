//! `bilin emit INPUT SCHEME_FILE --lang c|rust|python|latex`: code out for a verified
//! scheme: exact straight-line code by default, floating point on request, recursive block
//! code for matrix formats with `--blocks`.

use super::scheme_io::{fail, load_scheme, matmul_format};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::error::Error;
use bilin::scheme::emit::{Arith, BlockParams, EmitParams, Lang, emit};

#[derive(clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// The scheme file (text or JSON form), or the name of a scheme stored with the catalog
    /// (`matmul222.strassen`; see `bilin catalog show`).
    pub scheme: String,
    /// Target: c, rust, python or latex.
    #[arg(long)]
    pub lang: String,
    /// Name of the emitted function.
    #[arg(long, default_value = "bilin_mul")]
    pub function: String,
    /// Arithmetic: `exact` (integers over Q, residues over GF(p)) or `float` (doubles,
    /// coefficients rounded once).
    #[arg(long, default_value = "exact")]
    pub arith: String,
    /// Exact C or Rust code: the largest input magnitude you need; chooses 64-bit or
    /// 128-bit integers (refused if neither is free of overflow).
    #[arg(long)]
    pub bound: Option<String>,
    /// Emit recursive block code C = A B for matrices of any size (matrix formats).
    #[arg(long)]
    pub blocks: bool,
    /// The matrix format n,m,p for --blocks (default: from a matmul:n,m,p input).
    #[arg(long)]
    pub format: Option<String>,
    /// Block code: below this block side the schoolbook product runs.
    #[arg(long, default_value_t = 64)]
    pub cutoff: usize,
}

fn params(a: &Args) -> Result<EmitParams, Error> {
    let arith = match a.arith.to_ascii_lowercase().as_str() {
        "exact" => Arith::Exact,
        "float" | "double" => Arith::Float,
        other => {
            return Err(Error::Invalid(format!(
                "--arith: unknown arithmetic `{other}` (expected exact or float)"
            )));
        }
    };
    let bound = match &a.bound {
        None => None,
        Some(b) => Some(
            b.trim()
                .parse::<num_bigint::BigInt>()
                .ok()
                .filter(|x| *x >= num_bigint::BigInt::from(0))
                .ok_or_else(|| {
                    Error::Invalid(format!(
                        "--bound: expected a non-negative integer, found `{b}`"
                    ))
                })?,
        ),
    };
    let blocks = if a.blocks {
        let format = matmul_format(&a.source.input, a.format.as_deref()).ok_or_else(|| {
            Error::Invalid(format!(
                "--blocks needs the matrix format: give --format n,m,p (input `{}` is not matmul:n,m,p)",
                a.source.input
            ))
        })?;
        if a.cutoff == 0 {
            return Err(Error::Invalid("--cutoff must be at least 1".into()));
        }
        Some(BlockParams {
            format,
            cutoff: a.cutoff,
        })
    } else {
        None
    };
    Ok(EmitParams {
        function: a.function.clone(),
        title: a.source.input.clone(),
        arith,
        bound,
        blocks,
    })
}

pub fn run(a: &Args) -> i32 {
    let lang = match Lang::parse(&a.lang) {
        Ok(l) => l,
        Err(e) => return fail(&e),
    };
    let p = match params(a) {
        Ok(p) => p,
        Err(e) => return fail(&e),
    };
    let t = match a.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let s = match load_scheme(&a.scheme, &t) {
        Ok(s) => s,
        Err(e) => return fail(&e),
    };
    if bilin::scheme::verify(&s, &t).is_err() {
        eprintln!(
            "error: the scheme does not verify for {}; run `bilin verify` for details",
            a.source.input
        );
        return EXIT_FALSE;
    }
    match emit(&s, &t, lang, &p) {
        Ok(code) => {
            print!("{code}");
            EXIT_OK
        }
        Err(e) => fail(&e),
    }
}
