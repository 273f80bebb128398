//! Resolving a command-line input: an existing file (a `.npy` array by its magic bytes, a
//! CSV array by the extension `.csv`, coordinate JSON if its first non-space character is
//! `{`, a nested JSON list if it is `[`, else the table format), then a generator spec,
//! then the registered resolvers (the catalog hook in `resolve.rs`); finally an optional
//! change of field.

use super::{
    NPY_MAGIC, ReadOptions, parse_csv, parse_json_with, parse_nested_list, parse_npy, parse_table,
    resolve_registered,
};
use crate::error::{Error, Position, Result};
use crate::generators::{generate, generator_names, is_generator_family};
use crate::scalar::FieldSpec;
use crate::tensor::Tensor;
use std::io::Read;
use std::path::Path;

/// Every input file (tables, JSON, schemes, change-of-basis files, checkpoints) is read
/// through [`read_text_file`] and refused above this size (64 MiB), before it is read whole.
pub const MAX_FILE_BYTES: u64 = 64 << 20;

/// Read a text file: at most [`MAX_FILE_BYTES`] (also from a device or a pipe, which are
/// read up to the limit and no further), valid UTF-8 (a binary file gives an
/// [`Error::Parse`] at the first invalid byte). A directory is refused.
pub fn read_text_file(path: &str) -> Result<String> {
    text_from_bytes(read_binary_file(path)?, path)
}

/// Read a file's bytes: at most [`MAX_FILE_BYTES`] (also from a device or a pipe, which
/// are read up to the limit and no further). A directory is refused.
pub fn read_binary_file(path: &str) -> Result<Vec<u8>> {
    let file = std::fs::File::open(path).map_err(|e| Error::read_failed(path, &e))?;
    let meta = file.metadata().map_err(|e| Error::read_failed(path, &e))?;
    if meta.is_dir() {
        return Err(Error::Io {
            path: path.to_string(),
            message: "cannot read: it is a directory, expected a file".into(),
        });
    }
    let too_big = || Error::Io {
        path: path.to_string(),
        message: format!(
            "cannot read: the file is larger than the limit of {} MiB for input files",
            MAX_FILE_BYTES >> 20
        ),
    };
    if meta.len() > MAX_FILE_BYTES {
        return Err(too_big());
    }
    let mut bytes = Vec::new();
    file.take(MAX_FILE_BYTES + 1)
        .read_to_end(&mut bytes)
        .map_err(|e| Error::read_failed(path, &e))?;
    if bytes.len() as u64 > MAX_FILE_BYTES {
        return Err(too_big());
    }
    Ok(bytes)
}

/// The bytes of an input as text: valid UTF-8, or an [`Error::Parse`] at the line and
/// column of the first invalid byte. Cost: linear.
pub fn text_from_bytes(bytes: Vec<u8>, path: &str) -> Result<String> {
    String::from_utf8(bytes).map_err(|e| {
        let good = e.utf8_error().valid_up_to();
        let bytes = e.as_bytes();
        let prefix = std::str::from_utf8(&bytes[..good]).unwrap_or("");
        let line = prefix.matches('\n').count() + 1;
        let column = prefix[prefix.rfind('\n').map_or(0, |p| p + 1)..]
            .chars()
            .count()
            + 1;
        Error::Parse {
            at: Position {
                source: path.to_string(),
                line,
                column,
            },
            message: format!(
                "the input is not UTF-8 text (invalid byte 0x{:02X}): it looks like binary data, \
                 expected a text file",
                bytes[good]
            ),
        }
    })
}

/// Parse a text, choosing JSON when its first non-space character is `{`.
pub fn parse_any(text: &str, source: &str) -> Result<Tensor> {
    parse_any_with(text, source, &ReadOptions::default())
}

/// Parse a text: coordinate JSON when its first non-space character is `{`, a nested JSON
/// list when it is `[`, else the table format.
pub fn parse_any_with(text: &str, source: &str, opts: &ReadOptions) -> Result<Tensor> {
    let start = text.trim_start_matches('\u{feff}').trim_start();
    if start.starts_with('{') {
        parse_json_with(text, source, opts)
    } else if start.starts_with('[') {
        parse_nested_list(text, source, opts)
    } else {
        parse_table(text, source)
    }
}

/// Parse a file's bytes by its content and name: a `.npy` array (magic bytes), a CSV
/// array (`.csv`), else text by [`parse_any_with`].
pub fn parse_bytes(bytes: Vec<u8>, source: &str, opts: &ReadOptions) -> Result<Tensor> {
    if bytes.starts_with(NPY_MAGIC) {
        return parse_npy(&bytes, source, opts);
    }
    let named = |ext: &str| {
        Path::new(source)
            .extension()
            .is_some_and(|e| e.eq_ignore_ascii_case(ext))
    };
    let refuse = |message: String| Error::Data {
        file: source.to_string(),
        at: "byte 0".into(),
        message,
    };
    if bytes.starts_with(b"PK\x03\x04") || bytes.starts_with(b"PK\x05\x06") {
        return Err(refuse(
            "a zip archive (such as numpy's .npz) is not read: save the one 3-way array \
             with np.save(\"t.npy\", array) and give that file"
                .into(),
        ));
    }
    if named("npy") {
        let first: Vec<String> = bytes.iter().take(6).map(|b| format!("{b:02X}")).collect();
        return Err(refuse(format!(
            "not a .npy file: expected the bytes 93 4E 55 4D 50 59 (\\x93NUMPY) that open \
             every file written by np.save, found {}",
            if first.is_empty() {
                "an empty file".to_string()
            } else {
                first.join(" ")
            }
        )));
    }
    let csv = named("csv");
    let text = text_from_bytes(bytes, source)?;
    if csv {
        parse_csv(&text, source, opts)
    } else {
        parse_any_with(&text, source, opts)
    }
}

/// Resolve `spec` (file path, generator spec or registered name) and, if `field` is given,
/// read the tensor over that field. A tensor over GF(p) cannot be moved to another field;
/// a rational tensor moves to GF(p) when no denominator is divisible by p.
pub fn load_input(spec: &str, field: Option<FieldSpec>) -> Result<Tensor> {
    load_input_with(spec, field, &ReadOptions::default())
}

/// [`load_input`] with the options of the array readers.
pub fn load_input_with(spec: &str, field: Option<FieldSpec>, opts: &ReadOptions) -> Result<Tensor> {
    let path = Path::new(spec);
    let t = if path.is_file() {
        parse_bytes(read_binary_file(spec)?, spec, opts)?
    } else if path.is_dir() {
        return Err(Error::Invalid(format!(
            "`{spec}` is a directory; expected a file, a generator or a catalog name"
        )));
    } else if is_generator_family(spec) {
        generate(spec)?
    } else if let Some(r) = resolve_registered(spec) {
        r?
    } else {
        let families: Vec<&str> = generator_names().iter().map(|(s, _)| *s).collect();
        return Err(Error::Invalid(format!(
            "no file, generator or catalog entry named `{spec}` (generators: {})",
            families.join(", ")
        )));
    };
    match field {
        None => Ok(t),
        Some(f) if f == t.field() => Ok(t),
        Some(f) => {
            if let FieldSpec::Prime(_) = t.field() {
                return Err(Error::Invalid(format!(
                    "`{spec}` is defined over {}; it cannot be read over {f}",
                    t.field()
                )));
            }
            t.with_field(f)
                .map_err(|m| Error::Invalid(format!("cannot read `{spec}` over {f}: {m}")))
        }
    }
}
