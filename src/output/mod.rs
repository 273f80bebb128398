//! Safe output files: what sits at an output path, a check before long work that the path
//! can be written, and a replacement that never loses a file by accident.
//!
//! The rules (docs/search.md, "Output files"):
//! - a missing path or a regular file is replaced atomically: the new text goes to a hidden
//!   temporary file in the same directory (`.NAME.bilin-tmp-PID-N`), is flushed to disk and
//!   renamed over the path; the temporary file is removed on every error, and temporary
//!   files left by a killed process (whose PID is gone) are removed by the next write;
//! - a symbolic link is followed: its target is replaced and the link stays a link; a link
//!   to a missing file is refused;
//! - a character device (`/dev/null`, a terminal) or a FIFO is written through: opened for
//!   writing without creating, truncating or renaming anything (a FIFO must have a reader);
//! - a directory, a block device, a socket, and a path in a missing directory are refused;
//! - [`Target::replace`] reads the current text and decides on the new one under an
//!   exclusive lock on the file, so concurrent writers (several jobs, one path) see each
//!   other's results: a read-modify-write, never a blind overwrite.
//!
//! Invariant: at every moment the path holds either its old complete text or the new
//! complete text. Nothing here prints or exits.

mod replace;

use crate::error::{Error, Result};
use std::os::unix::fs::FileTypeExt;
use std::path::{Path, PathBuf};

pub use replace::Replaced;

/// What an output path designates.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    /// Nothing yet (the directory exists).
    Missing,
    /// A regular file (possibly reached through symbolic links).
    Regular,
    /// A character device or a FIFO: written through, never replaced.
    Stream,
}

/// A checked output path.
#[derive(Clone, Debug)]
pub struct Target {
    /// The path as the user gave it (for messages).
    pub path: String,
    /// The path written: symbolic links resolved.
    real: PathBuf,
    pub kind: Kind,
}

fn refuse(path: &str, message: impl Into<String>) -> Error {
    Error::Io {
        path: path.to_string(),
        message: message.into(),
    }
}

/// The kind of an existing, non-link file, or the reason it is refused.
fn classify(path: &str, ft: std::fs::FileType) -> Result<Kind> {
    if ft.is_file() {
        Ok(Kind::Regular)
    } else if ft.is_char_device() || ft.is_fifo() {
        Ok(Kind::Stream)
    } else if ft.is_dir() {
        Err(refuse(
            path,
            "cannot write: it is a directory, expected a file name",
        ))
    } else if ft.is_block_device() {
        Err(refuse(
            path,
            "cannot write: it is a block device; refusing to write a result over it",
        ))
    } else {
        Err(refuse(
            path,
            "cannot write: it is a socket or another special file, expected a regular file",
        ))
    }
}

impl Target {
    /// Look at what is at `path` and decide how it will be written (see the module rules).
    /// Cost: a few system calls.
    pub fn resolve(path: &str) -> Result<Target> {
        if path.is_empty() {
            return Err(refuse("''", "cannot write: the file name is empty"));
        }
        let p = Path::new(path);
        match std::fs::symlink_metadata(p) {
            Ok(m) if m.file_type().is_symlink() => {
                let real = std::fs::canonicalize(p).map_err(|_| {
                    let to = std::fs::read_link(p)
                        .map(|t| t.display().to_string())
                        .unwrap_or_else(|_| "?".into());
                    refuse(
                        path,
                        format!(
                            "cannot write: it is a symbolic link to `{to}`, which does not exist; \
                             give the target's path instead"
                        ),
                    )
                })?;
                let meta = std::fs::metadata(&real).map_err(|e| Error::write_failed(path, &e))?;
                Ok(Target {
                    path: path.to_string(),
                    kind: classify(path, meta.file_type())?,
                    real,
                })
            }
            Ok(m) => Ok(Target {
                path: path.to_string(),
                kind: classify(path, m.file_type())?,
                real: p.to_path_buf(),
            }),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => {
                let dir = directory_of(p);
                match std::fs::metadata(&dir) {
                    Ok(m) if m.is_dir() => Ok(Target {
                        path: path.to_string(),
                        kind: Kind::Missing,
                        real: p.to_path_buf(),
                    }),
                    Ok(_) => Err(refuse(
                        path,
                        format!("cannot write: `{}` is not a directory", dir.display()),
                    )),
                    Err(_) => Err(refuse(
                        path,
                        format!(
                            "cannot write: the directory `{}` does not exist",
                            dir.display()
                        ),
                    )),
                }
            }
            Err(e) => Err(Error::write_failed(path, &e)),
        }
    }

    /// True when the path is replaced as a file (missing or regular), false when it is
    /// written through (a device or a FIFO).
    pub fn is_file(&self) -> bool {
        self.kind != Kind::Stream
    }

    /// The path actually written (symbolic links resolved).
    pub fn real_path(&self) -> &Path {
        &self.real
    }

    /// True when `self` and `other` end at the same file.
    pub fn same_file(&self, other: &Target) -> bool {
        let canon = |t: &Target| {
            let dir = std::fs::canonicalize(directory_of(&t.real)).ok();
            (dir, t.real.file_name().map(|n| n.to_os_string()))
        };
        self.real == other.real || canon(self) == canon(other)
    }

    /// Check now, before long work, that the result can be written: for a file, a
    /// temporary file of `probe_bytes` bytes is created in its directory, flushed to disk
    /// and removed (this finds a missing permission, a read-only or a full disk); a device
    /// is opened for writing; a FIFO is not touched (opening it would wait for a reader).
    pub fn check_writable(&self, probe_bytes: usize) -> Result<()> {
        match self.kind {
            Kind::Stream => {
                let is_fifo = std::fs::metadata(&self.real)
                    .map(|m| m.file_type().is_fifo())
                    .unwrap_or(false);
                if !is_fifo {
                    std::fs::OpenOptions::new()
                        .write(true)
                        .open(&self.real)
                        .map_err(|e| Error::write_failed(&self.path, &e))?;
                }
                Ok(())
            }
            Kind::Missing | Kind::Regular => {
                let probe = vec![b'\n'; probe_bytes];
                replace::write_temp(&self.real, &probe)
                    .map(|tmp| {
                        let _ = std::fs::remove_file(tmp);
                    })
                    .map_err(|e| Error::write_failed(&self.path, &e))
            }
        }
    }

    /// The current text of a regular file (at most the input size limit; `None` for a
    /// missing file or a device).
    pub fn read_current(&self) -> Result<Option<String>> {
        match self.kind {
            Kind::Regular | Kind::Missing if self.real.is_file() => {
                crate::input::read_text_file(&self.real.to_string_lossy())
                    .map(Some)
                    .map_err(|e| rename_source(e, &self.path))
            }
            _ => Ok(None),
        }
    }

    /// Replace the content: `decide` gets the current text (`None` for a missing or empty
    /// file, a device or a FIFO) and returns the new text, or `None` to leave the file as
    /// it is. For a file the read and the replacement happen under an exclusive lock on
    /// the file (so two writers never both act on the same old text); a device or a FIFO is
    /// written through. Cost: one read and one write of the file.
    pub fn replace(
        &self,
        decide: impl FnOnce(Option<&str>) -> Result<Option<String>>,
    ) -> Result<Replaced> {
        replace::replace(self, decide)
    }
}

/// The directory a path lives in (`.` for a bare file name).
fn directory_of(p: &Path) -> PathBuf {
    match p.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

/// Report errors of a resolved path under the name the user gave.
fn rename_source(e: Error, path: &str) -> Error {
    match e {
        Error::Io { message, .. } => Error::Io {
            path: path.to_string(),
            message,
        },
        Error::Parse { mut at, message } => {
            at.source = path.to_string();
            Error::Parse { at, message }
        }
        other => other,
    }
}

#[cfg(test)]
mod tests;
