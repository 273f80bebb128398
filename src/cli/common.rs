//! Helpers shared by subcommands: loading an input with error rendering.
//! (Placeholder until the input loader is merged: generators only.)

use super::EXIT_USAGE;
use bilin::error::Error;
use bilin::scalar::FieldSpec;
use bilin::tensor::Tensor;

/// Print an error on stderr and return the exit code for bad input (2).
pub fn report_error(e: &Error) -> i32 {
    eprintln!("error: {e}");
    EXIT_USAGE
}

/// Load a generator spec, optionally over another field.
pub fn load(spec: &str, field: Option<&str>) -> Result<Tensor, i32> {
    let t = bilin::generators::generate(spec).map_err(|e| report_error(&e))?;
    match field {
        None => Ok(t),
        Some(f) => {
            let f = FieldSpec::parse(f).map_err(|m| {
                eprintln!("error: --field: {m}");
                EXIT_USAGE
            })?;
            t.with_field(f).map_err(|m| {
                eprintln!("error: {m}");
                EXIT_USAGE
            })
        }
    }
}

/// The generator list for `--help` texts.
pub fn generators_help() -> String {
    let mut s = String::from("Built-in generators (usable wherever an input is expected):\n");
    for (spec, what) in bilin::generators::generator_names() {
        s.push_str(&format!("  {spec:<22} {what}\n"));
    }
    s
}
