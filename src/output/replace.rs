//! The write half of [`super::Target`]: temporary files, the lock protocol of
//! [`super::Target::replace`], and writing through devices and FIFOs.

use super::{Kind, Target, directory_of};
use crate::error::{Error, Result};
use std::fs::{File, OpenOptions};
use std::io::Write;
use std::os::unix::fs::{FileTypeExt, MetadataExt, OpenOptionsExt};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

/// What [`super::Target::replace`] did.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Replaced {
    /// The new text is in place.
    Written,
    /// The decision was to keep the current content.
    Unchanged,
}

const TMP_MARK: &str = ".bilin-tmp-";

/// The prefix of the temporary files of `real`: `.NAME.bilin-tmp-`.
fn temp_prefix(real: &Path) -> String {
    let name = real
        .file_name()
        .map_or_else(|| "out".into(), |n| n.to_string_lossy().into_owned());
    format!(".{name}{TMP_MARK}")
}

/// Remove temporary files of `real` left by processes that no longer run (killed while
/// writing). Only on systems with `/proc`; errors are ignored.
fn remove_stale_temps(real: &Path) {
    if !Path::new("/proc/self").exists() {
        return;
    }
    let prefix = temp_prefix(real);
    let Ok(dir) = std::fs::read_dir(directory_of(real)) else {
        return;
    };
    for entry in dir.flatten() {
        let name = entry.file_name().to_string_lossy().into_owned();
        let Some(rest) = name.strip_prefix(&prefix) else {
            continue;
        };
        let pid = rest.split('-').next().unwrap_or("");
        if !pid.is_empty()
            && pid.bytes().all(|b| b.is_ascii_digit())
            && !Path::new("/proc").join(pid).exists()
        {
            let _ = std::fs::remove_file(entry.path());
        }
    }
}

/// Write `bytes` to a new temporary file beside `real`, flushed to disk; the file is
/// removed again when anything fails. Returns its path.
pub(super) fn write_temp(real: &Path, bytes: &[u8]) -> std::io::Result<PathBuf> {
    static COUNTER: AtomicU64 = AtomicU64::new(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    let tmp = directory_of(real).join(format!("{}{}-{n}", temp_prefix(real), std::process::id()));
    let write = || -> std::io::Result<()> {
        let mut f = OpenOptions::new()
            .write(true)
            .create_new(true)
            .mode(0o644)
            .open(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()
    };
    match write() {
        Ok(()) => Ok(tmp),
        Err(e) => {
            let _ = std::fs::remove_file(&tmp);
            Err(e)
        }
    }
}

/// Open `real` (creating it empty when missing) and take an exclusive lock on it, making
/// sure the locked file is still the one at the path (another writer may have renamed a
/// new file over it meanwhile). Returns the file and whether this call created it.
/// File systems without locks are used without one.
fn open_locked(real: &Path) -> std::io::Result<(File, bool)> {
    loop {
        let (f, created) = match File::open(real) {
            Ok(f) => (f, false),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => {
                match OpenOptions::new()
                    .append(true)
                    .create_new(true)
                    .mode(0o644)
                    .open(real)
                {
                    Ok(f) => (f, true),
                    Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => continue,
                    Err(e) => return Err(e),
                }
            }
            Err(e) => return Err(e),
        };
        if f.lock().is_err() {
            // no locks on this file system: go on without
            return Ok((f, created));
        }
        let same = match (f.metadata(), std::fs::metadata(real)) {
            (Ok(a), Ok(b)) => a.dev() == b.dev() && a.ino() == b.ino(),
            _ => false,
        };
        if same {
            return Ok((f, created));
        }
    }
}

/// Write through a device or a FIFO (which must have a reader: opening a FIFO without one
/// fails at once instead of waiting).
fn write_through(real: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let fifo = std::fs::metadata(real)?.file_type().is_fifo();
    let mut opts = OpenOptions::new();
    opts.write(true);
    if fifo {
        opts.custom_flags(libc::O_NONBLOCK);
    }
    let mut f = opts.open(real).map_err(|e| {
        if e.raw_os_error() == Some(libc::ENXIO) {
            std::io::Error::other("it is a FIFO and no process is reading it")
        } else {
            e
        }
    })?;
    if fifo {
        use std::os::fd::AsRawFd;
        let fd = f.as_raw_fd();
        // SAFETY: fcntl on a file descriptor owned by `f`, which outlives the calls.
        unsafe {
            let flags = libc::fcntl(fd, libc::F_GETFL);
            if flags >= 0 {
                libc::fcntl(fd, libc::F_SETFL, flags & !libc::O_NONBLOCK);
            }
        }
    }
    f.write_all(bytes)?;
    f.flush()
}

pub(super) fn replace(
    t: &Target,
    decide: impl FnOnce(Option<&str>) -> Result<Option<String>>,
) -> Result<Replaced> {
    let failed = |e: std::io::Error| Error::write_failed(&t.path, &e);
    if t.kind == Kind::Stream {
        let Some(text) = decide(None)? else {
            return Ok(Replaced::Unchanged);
        };
        write_through(&t.real, text.as_bytes()).map_err(failed)?;
        return Ok(Replaced::Written);
    }
    remove_stale_temps(&t.real);
    let (lock, created) = open_locked(&t.real).map_err(failed)?;
    let drop_created = || {
        if created && std::fs::metadata(&t.real).is_ok_and(|m| m.len() == 0) {
            let _ = std::fs::remove_file(&t.real);
        }
    };
    let current = if created {
        None
    } else {
        match t.read_current() {
            Ok(c) => c.filter(|s| !s.trim().is_empty()),
            Err(e) => return Err(e),
        }
    };
    let new = match decide(current.as_deref()) {
        Ok(Some(n)) => n,
        Ok(None) => {
            drop_created();
            return Ok(Replaced::Unchanged);
        }
        Err(e) => {
            drop_created();
            return Err(e);
        }
    };
    let tmp = match write_temp(&t.real, new.as_bytes()) {
        Ok(tmp) => tmp,
        Err(e) => {
            drop_created();
            return Err(failed(e));
        }
    };
    if let Ok(m) = lock.metadata()
        && !created
    {
        let _ = std::fs::set_permissions(&tmp, m.permissions());
    }
    if let Err(e) = std::fs::rename(&tmp, &t.real) {
        let _ = std::fs::remove_file(&tmp);
        drop_created();
        return Err(failed(e));
    }
    // make the rename durable (best effort)
    if let Ok(d) = File::open(directory_of(&t.real)) {
        let _ = d.sync_all();
    }
    drop(lock);
    Ok(Replaced::Written)
}
