//! `bilin bounds INPUT [--json] [--scheme FILE]... [--out FILE] [--proof-out FILE]
//! [--check-proof FILE]`: proven lower bounds for the tensor rank, the interval
//! `lower <= R <= upper` with a verified scheme for the upper side, and the certificates of
//! exhaustive proofs over GF(2).

use super::scheme_io::fail;
use super::{EXIT_FALSE, EXIT_OK};
use bilin::error::{Error, Position};
use bilin::ranks::exhaustive::ExhaustiveParams;
use bilin::ranks::rank_proof::{Certificate, check};
use bilin::ranks::{BoundsParams, lower_bounds};
use bilin::tensor::Tensor;

#[derive(clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// Print JSON.
    #[arg(long)]
    pub json: bool,
    /// Seed of the random slice combinations.
    #[arg(long, default_value_t = 1)]
    pub seed: u64,
    /// A scheme for the tensor (text or JSON form; repeatable): verified exactly, then
    /// counted among the upper bounds.
    #[arg(long, value_name = "FILE")]
    pub scheme: Vec<String>,
    /// Write the scheme attaining the upper bound to this file (text form for `.txt`,
    /// JSON otherwise).
    #[arg(long, value_name = "FILE")]
    pub out: Option<String>,
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
    let t = match a.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    if let Some(path) = &a.check_proof {
        return check_file(&t, path);
    }
    let mut given = Vec::new();
    for path in &a.scheme {
        match super::scheme_io::load_scheme(path, &t) {
            Ok(s) => given.push((path.clone(), s)),
            Err(e) => return fail(&e),
        }
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
    let iv = bilin::report::interval::interval_of(
        &t,
        &b,
        &bilin::interval::UpperParams {
            simultaneous: bilin::decompose::SimultaneousParams {
                seed: a.seed,
                ..Default::default()
            },
            ..Default::default()
        },
        &given,
    );
    if let Some(path) = &a.out {
        let target = match bilin::output::Target::resolve(path) {
            Ok(x) => x,
            Err(e) => return fail(&e),
        };
        if !super::outputs::emit_result(Some(&target), iv.scheme(), &t, false) {
            return super::EXIT_USAGE;
        }
    }
    if a.json {
        let v = serde_json::json!({
            "interval": iv.to_json(),
            "input": a.source.input,
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
        a.source.input,
        d[0],
        d[1],
        d[2],
        t.field().name()
    );
    for line in bilin::report::sections::bounds_lines(&b) {
        println!("  {line}");
    }
    println!("rank interval:");
    for line in iv.lines() {
        println!("  {line}");
    }
    EXIT_OK
}
