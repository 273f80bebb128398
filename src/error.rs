//! Typed errors of the library. The command line adds context and maps them to exit codes
//! (2 for bad input).

use thiserror::Error;

/// A position in an input text (1-based line and column, in characters).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Position {
    /// The file name, or a description such as `<built-in octonions>`.
    pub source: String,
    pub line: usize,
    pub column: usize,
}

impl std::fmt::Display for Position {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}:{}:{}", self.source, self.line, self.column)
    }
}

/// Errors of the library.
#[derive(Debug, Error)]
pub enum Error {
    /// Input text that does not follow a documented format.
    #[error("{at}: {message}")]
    Parse { at: Position, message: String },
    /// Binary input (an array file) that does not follow its format, located by a byte
    /// offset or an array index (`byte 12`, `element [2, 0, 1]`).
    #[error("{file}: {at}: {message}")]
    Data {
        file: String,
        at: String,
        message: String,
    },
    /// A request that is well-formed but not meaningful (wrong shape, unknown name, ...).
    #[error("{0}")]
    Invalid(String),
    /// A computation that would need more memory than allowed; the message names the size
    /// of the input, the memory needed and the limit (`--max-memory`).
    #[error("{0}")]
    TooLarge(String),
    /// Reading or writing a file failed; `message` says which (`cannot read: ...`).
    #[error("{path}: {message}")]
    Io { path: String, message: String },
}

impl Error {
    /// A failed read of `path`.
    pub fn read_failed(path: &str, e: &std::io::Error) -> Error {
        Error::Io {
            path: path.to_string(),
            message: format!("cannot read: {}", describe_io(e)),
        }
    }

    /// A failed write of `path`.
    pub fn write_failed(path: &str, e: &std::io::Error) -> Error {
        Error::Io {
            path: path.to_string(),
            message: format!("cannot write: {}", describe_io(e)),
        }
    }
}

/// An I/O error in plain words, without the `(os error N)` suffix.
pub fn describe_io(e: &std::io::Error) -> String {
    let s = e.to_string();
    match s.find(" (os error") {
        Some(p) => s[..p].to_string(),
        None => s,
    }
}

/// Shorthand result type.
pub type Result<T> = std::result::Result<T, Error>;
