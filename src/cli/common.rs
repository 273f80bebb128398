//! Helpers shared by subcommands: loading an input with error rendering.

use super::EXIT_USAGE;
use bilin::error::Error;
use bilin::input::{Rationalize, ReadOptions, load_input_with};
use bilin::scalar::FieldSpec;
use bilin::tensor::Tensor;

/// Print an error as `error: file:line:col: message` (or `error: file: message`, or
/// `error: message`) on stderr and return the exit code for bad input (2).
pub fn report_error(e: &Error) -> i32 {
    eprintln!("error: {e}");
    EXIT_USAGE
}

/// Print `error: OPTION: message` for a bad command-line value and return 2.
pub fn usage_error(option: &str, message: impl std::fmt::Display) -> i32 {
    eprintln!("error: {option}: {message}");
    EXIT_USAGE
}

/// Print `warning: message` on stderr.
pub fn warn(message: &str) {
    eprintln!("warning: {message}");
}

/// Print `note: message` on stderr (progress and outcomes of long commands).
pub fn note(message: impl std::fmt::Display) {
    eprintln!("note: {message}");
}

/// How array files are read (`.npy`, CSV, nested JSON lists): the options shared by the
/// commands that take an input.
#[derive(clap::Args, Debug, Clone, Default)]
pub struct ReadArgs {
    /// Read a 3-way array (.npy, CSV, nested JSON list) as an algebra (n x n x n), not as a
    /// bilinear map.
    #[arg(long)]
    pub as_algebra: bool,
    /// Round every float in an array or JSON file that is not exactly what it says (such
    /// as 0.1) to the simplest fraction within TOLERANCE whose denominator is at most
    /// MAX_DENOMINATOR, e.g. `1e-9,1000` (by default such a float is refused).
    #[arg(long, value_name = "TOLERANCE,MAX_DENOMINATOR")]
    pub rationalize: Option<String>,
}

impl ReadArgs {
    /// The library's read options, or the exit code of a bad value.
    pub fn options(&self) -> Result<ReadOptions, i32> {
        let rationalize = match &self.rationalize {
            None => None,
            Some(s) => match Rationalize::parse(s) {
                Ok(r) => Some(r),
                Err(m) => return Err(usage_error("--rationalize", m)),
            },
        };
        Ok(ReadOptions {
            algebra: self.as_algebra,
            rationalize,
        })
    }
}

/// The input of a command and how to read it.
#[derive(clap::Args, Debug, Default)]
pub struct SourceArgs {
    /// A file (table format, JSON, .npy, .csv), a generator spec such as `octonions` or
    /// `matmul:2,2,2`, or a catalog name.
    pub input: String,
    /// Read the input over this field (`Q` or `GF(p)`).
    #[arg(long)]
    pub field: Option<String>,
    #[command(flatten)]
    pub read: ReadArgs,
}

impl SourceArgs {
    /// The tensor, or the exit code of a reported error.
    pub fn load(&self) -> Result<Tensor, i32> {
        load_with(&self.input, self.field.as_deref(), &self.read)
    }
}

/// Load an input (file, generator spec or catalog name), optionally over another field
/// given as text (`Q`, `GF(7)`). Errors are printed; the `Err` holds the exit code (2).
pub fn load(spec: &str, field: Option<&str>) -> Result<Tensor, i32> {
    load_with(spec, field, &ReadArgs::default())
}

/// [`load`] with the array-reading options.
pub fn load_with(spec: &str, field: Option<&str>, read: &ReadArgs) -> Result<Tensor, i32> {
    let field = match field {
        None => None,
        Some(f) => match FieldSpec::parse(f) {
            Ok(f) => Some(f),
            Err(m) => return Err(usage_error("--field", m)),
        },
    };
    let opts = read.options()?;
    load_input_with(spec, field, &opts).map_err(|e| report_error(&e))
}

/// The generator list for `--help` texts.
pub fn generators_help() -> String {
    let mut s = String::from("Built-in generators (usable wherever an input is expected):\n");
    for (spec, what) in bilin::generators::generator_names() {
        s.push_str(&format!("  {spec:<22} {what}\n"));
    }
    s
}

/// Run `work` with a progress callback that shows the current step on stderr when stderr
/// is a terminal (one overwritten line, cleared at the end), and does nothing otherwise.
pub fn with_progress<T>(work: impl FnOnce(&mut dyn FnMut(&str)) -> T) -> T {
    use std::io::IsTerminal;
    let tty = std::io::stderr().is_terminal();
    let mut progress = |msg: &str| {
        if tty {
            eprint!("\r\x1b[K{msg} ...");
        }
    };
    let out = work(&mut progress);
    if tty {
        eprint!("\r\x1b[K");
    }
    out
}

/// Write a generated file (a picture, a page) by the rules of [`bilin::output`]: a file is
/// replaced atomically, a device or FIFO written through, anything else refused. Errors
/// are printed; the `Err` holds the exit code (2).
pub fn write_output(path: &str, text: &str) -> Result<(), i32> {
    bilin::output::Target::resolve(path)
        .and_then(|t| t.replace(|_| Ok(Some(text.to_string()))))
        .map(|_| ())
        .map_err(|e| report_error(&e))
}

/// Print a generated document to `out` if given, else to standard output.
pub fn emit_output(out: Option<&str>, text: &str) -> Result<(), i32> {
    match out {
        Some(path) => write_output(path, text),
        None => {
            print!("{text}");
            Ok(())
        }
    }
}

/// Reads a memory size such as `512M`, `2G`, `1.5GiB` or `1073741824` (bytes); the
/// suffixes K, M, G and T are powers of 1024 (`B` and `iB` after them are optional).
pub fn parse_memory(text: &str) -> Result<usize, String> {
    let t = text.trim();
    let lower = t.to_ascii_lowercase();
    let number_end = lower
        .find(|c: char| !(c.is_ascii_digit() || c == '.'))
        .unwrap_or(lower.len());
    let (number, unit) = lower.split_at(number_end);
    let shift = match unit.trim() {
        "" | "b" => 0,
        "k" | "kb" | "kib" => 10,
        "m" | "mb" | "mib" => 20,
        "g" | "gb" | "gib" => 30,
        "t" | "tb" | "tib" => 40,
        other => {
            return Err(format!(
                "unknown unit `{other}` in `{t}`: expected a size such as 512M, 2G or 1073741824"
            ));
        }
    };
    let value: f64 = number
        .parse()
        .map_err(|_| format!("expected a size such as 512M, 2G or 1073741824, found `{t}`"))?;
    let bytes = value * (1u64 << shift) as f64;
    if !(1.0..1e19).contains(&bytes) {
        return Err(format!("memory size `{t}` is out of range"));
    }
    Ok(bytes as usize)
}
