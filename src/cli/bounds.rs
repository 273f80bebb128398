//! `bilin bounds INPUT [--json] [--proof-out FILE] [--check-proof FILE]`: proven lower
//! bounds for the tensor rank, and the certificates of exhaustive proofs over GF(2).

use super::scheme_io::{fail, load_tensor};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::error::{Error, Position};
use bilin::ranks::exhaustive::ExhaustiveParams;
use bilin::ranks::rank_proof::{Certificate, check};
use bilin::ranks::{BoundsParams, lower_bounds};
use bilin::tensor::Tensor;

#[derive(clap::Args)]
pub struct Args {
    /// The tensor: a file, a generator spec such as matmul:3,3,3, or a catalog name.
    pub input: String,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
    /// Read the input over this field (Q or GF(p)).
    #[arg(long)]
    pub field: Option<String>,
    /// Seed of the random slice combinations.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// Work budget of the exhaustive proofs over GF(2), in millions of rank-one matrices
    /// reduced against a space (0 leaves them out).
    #[arg(long, default_value_t = 100, value_name = "MILLIONS")]
    pub exhaustive_work: u64,
    /// Spaces one level of an exhaustive proof may hold (each about 200 bytes).
    #[arg(long, default_value_t = 500_000, value_name = "COUNT")]
    pub exhaustive_spaces: usize,
    /// Write the certificate of the best exhaustive proof to this file (JSON).
    #[arg(long, value_name = "FILE")]
    pub proof_out: Option<String>,
    /// Check a certificate of an exhaustive proof against INPUT instead of computing
    /// bounds: exit 0 when it holds, 1 when it is refuted, 2 when it cannot be read.
    #[arg(long, value_name = "FILE")]
    pub check_proof: Option<String>,
}

/// Read a certificate file (JSON), with the position of a syntax error.
fn read_certificate(path: &str) -> Result<Certificate, Error> {
    let text = bilin::input::read_text_file(path)?;
    let v: serde_json::Value = serde_json::from_str(&text).map_err(|e| Error::Parse {
        at: Position {
            source: path.to_string(),
            line: e.line(),
            column: e.column(),
        },
        message: format!("not valid JSON: {e}"),
    })?;
    Certificate::from_json(&v).map_err(|m| Error::Invalid(format!("{path}: {m}")))
}

/// Write a certificate unless the file already holds a proof of a stronger claim for the
/// same slices (a better result is never written over). Prints what it did.
fn write_certificate(path: &str, cert: &Certificate, t: &Tensor) -> Result<(), i32> {
    let text = serde_json::to_string(&cert.to_json(t)).unwrap_or_default() + "\n";
    let mut kept = None;
    let outcome = bilin::output::Target::resolve(path).and_then(|target| {
        target.replace(|old| {
            let better = old
                .and_then(|o| serde_json::from_str::<serde_json::Value>(o).ok())
                .and_then(|v| Certificate::from_json(&v).ok())
                .filter(|o| o.space == cert.space && o.rank_above >= cert.rank_above);
            match better {
                Some(o) => {
                    kept = Some(o.rank_above);
                    Ok(None)
                }
                None => Ok(Some(text.clone())),
            }
        })
    });
    if let Err(e) = outcome {
        // never lose a proof: print it when it cannot be written
        println!(
            "{}",
            serde_json::to_string(&cert.to_json(t)).unwrap_or_default()
        );
        return Err(fail(&e));
    }
    match kept {
        Some(r) => eprintln!("note: {path} already proves R > {r}; kept it"),
        None => eprintln!(
            "note: certificate of R > {} written to {path}",
            cert.rank_above
        ),
    }
    Ok(())
}

fn check_file(t: &Tensor, path: &str) -> i32 {
    let cert = match read_certificate(path) {
        Ok(c) => c,
        Err(e) => return fail(&e),
    };
    match check(t, &cert) {
        Ok(()) => {
            println!(
                "certificate holds: R > {} over GF(2), so R >= {} (spaces per level {:?})",
                cert.rank_above,
                cert.rank_above + 1,
                cert.level_sizes()
            );
            EXIT_OK
        }
        Err(why) => {
            println!("certificate refuted: {why}");
            EXIT_FALSE
        }
    }
}

pub fn run(a: &Args) -> i32 {
    let t = match load_tensor(&a.input, a.field.as_deref()) {
        Ok(t) => t,
        Err(e) => return fail(&e),
    };
    if let Some(path) = &a.check_proof {
        return check_file(&t, path);
    }
    let exhaustive = (a.exhaustive_work > 0).then(|| ExhaustiveParams {
        max_work: a.exhaustive_work.saturating_mul(1_000_000),
        max_nodes: a.exhaustive_spaces,
        ..ExhaustiveParams::default()
    });
    let b = lower_bounds(
        &t,
        &BoundsParams {
            seed: a.seed,
            exhaustive,
            ..BoundsParams::default()
        },
    );
    if let Some(path) = &a.proof_out {
        match &b.rank_proof {
            Some(cert) => {
                if let Err(code) = write_certificate(path, cert, &t) {
                    return code;
                }
            }
            None => eprintln!(
                "note: no exhaustive proof to write to {path} (they run over GF(2) only; see the notes)"
            ),
        }
    }
    let built = built_upper(&t);
    if a.json {
        let v = serde_json::json!({
            "upper_built": built.as_ref().map(|(f, r, how)| serde_json::json!({
                "format": f, "rank": r, "how": how,
            })),
            "input": a.input,
            "field": t.field().name(),
            "dims": t.dims(),
            "best": b.best(),
            "exhaustive_upper": b.exhaustive_upper,
            "bounds": b.bounds,
            "notes": b.notes,
        });
        println!("{}", serde_json::to_string_pretty(&v).unwrap_or_default());
        return EXIT_OK;
    }
    let d = t.dims();
    println!(
        "lower bounds for the rank of {} ({}x{}x{}, over {}):",
        a.input,
        d[0],
        d[1],
        d[2],
        t.field().name()
    );
    for line in bilin::report::sections::bounds_lines(&b) {
        println!("  {line}");
    }
    if let Some(([n, m, p], r, how)) = built {
        println!(
            "upper bound: R <= {r}, a scheme built as {how}, verified exactly \
             (`bilin scheme build matmul:{n},{m},{p}`)"
        );
    }
    EXIT_OK
}

/// For the matrix multiplication tensor <n,m,p> in the generator's basis: the format, the
/// rank of the best scheme built from the catalog's stored schemes (verified exactly) and
/// how it is built.
fn built_upper(t: &Tensor) -> Option<([usize; 3], usize, String)> {
    let f = bilin::scheme::build::matmul_format_of(t)?;
    let b = bilin::catalog::schemes::best_matmul_scheme(f, t.field()).ok()?;
    Some((f, b.scheme.rank(), b.how))
}
