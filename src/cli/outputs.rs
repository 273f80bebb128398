//! The result and checkpoint files of `bilin search` and `bilin merge`, as the command
//! line sees them: checked before any work, written through `bilin::search::store`, and a
//! result that cannot be written where asked goes to standard output (to standard error
//! when standard output fails too), so a found scheme is never lost.

use super::common::{note, report_error, warn};
use bilin::output::Target;
use bilin::scheme::Scheme;
use bilin::search::json::{Checkpoint, scheme_to_json};
use bilin::search::store::{Held, Stored, inspect, store_checkpoint, store_result};
use bilin::tensor::Tensor;
use std::io::Write;
use std::sync::Mutex;

/// The output files of a search.
pub struct OutputFiles {
    out: Option<Target>,
    checkpoint: Option<Target>,
    overwrite: bool,
    /// The rank last written to `out` during the search.
    out_rank: Mutex<Option<usize>>,
    /// The last warning printed (repeated failures are reported once).
    last_warning: Mutex<String>,
}

/// Bytes written by the writability probe: about the size of the standard scheme's JSON
/// (a result is smaller), at most 1 MiB.
fn probe_size(t: &Tensor) -> usize {
    let d = t.dims();
    (t.nnz() * (d[0] + d[1] + d[2]) * 4 + 256).min(1 << 20)
}

/// Resolve and check one output path: refused kinds, a missing directory, no permission
/// or no space are reported now, before any work.
fn check(path: &str, t: &Tensor) -> Result<Target, i32> {
    let target = Target::resolve(path).map_err(|e| report_error(&e))?;
    target
        .check_writable(probe_size(t))
        .map_err(|e| report_error(&e))?;
    Ok(target)
}

fn refuse_foreign(path: &str, why: &str, what: &str) -> i32 {
    eprintln!(
        "error: {path}: refusing to use it as {what}: it does not hold a result for this \
         tensor ({why}); choose another file or pass --overwrite"
    );
    super::EXIT_USAGE
}

impl OutputFiles {
    /// Check `--out` and the checkpoint file (default `OUT.checkpoint.json` when `--out`
    /// is a file) before the search starts. Errors are printed; `Err` holds the exit code.
    pub fn open(
        out: Option<&str>,
        checkpoint: Option<&str>,
        resume: Option<&str>,
        t: &Tensor,
        overwrite: bool,
    ) -> Result<OutputFiles, i32> {
        let out = out.map(|p| check(p, t)).transpose()?;
        let ck_path = match (checkpoint, &out) {
            (Some(c), _) => Some(c.to_string()),
            (None, Some(o)) if o.is_file() => Some(format!("{}.checkpoint.json", o.path)),
            _ => None,
        };
        let ck = ck_path.as_deref().map(|p| check(p, t)).transpose()?;
        if let (Some(o), Some(c)) = (&out, &ck)
            && o.is_file()
            && o.same_file(c)
        {
            eprintln!(
                "error: --checkpoint: {} is also the --out file; give two different files",
                c.path
            );
            return Err(super::EXIT_USAGE);
        }
        if let Some(o) = out.as_ref().filter(|o| o.is_file()) {
            match inspect(o, t) {
                Held::Foreign(why) if !overwrite => {
                    return Err(refuse_foreign(&o.path, &why, "--out"));
                }
                Held::Result { best: Some(b), .. } if !overwrite => note(format!(
                    "{} holds a verified rank-{} scheme; only a better one will replace it",
                    o.path,
                    b.rank()
                )),
                _ => {}
            }
        }
        if let Some(c) = ck.as_ref().filter(|c| c.is_file()) {
            let resuming_it = resume
                .and_then(|r| Target::resolve(r).ok())
                .is_some_and(|r| r.same_file(c));
            match inspect(c, t) {
                Held::Foreign(why) if !overwrite => {
                    return Err(refuse_foreign(&c.path, &why, "the checkpoint"));
                }
                Held::Result {
                    checkpoint: Some(old),
                    ..
                } if !resuming_it => note(format!(
                    "{} holds the checkpoint of another search (seed {}, shard {}/{}, runs \
                     before {} done); this search replaces it{}; to continue that search \
                     instead, pass --resume {}",
                    c.path,
                    old.seed,
                    old.shard.0,
                    old.shard.1,
                    old.next_run,
                    if overwrite {
                        ""
                    } else {
                        " (keeping its better scheme, if any)"
                    },
                    c.path
                )),
                _ => {}
            }
        }
        Ok(OutputFiles {
            out,
            checkpoint: ck,
            overwrite,
            out_rank: Mutex::new(None),
            last_warning: Mutex::new(String::new()),
        })
    }

    fn warn_once(&self, msg: String) {
        let mut last = self.last_warning.lock().unwrap_or_else(|e| e.into_inner());
        if *last != msg {
            warn(&msg);
            *last = msg;
        }
    }

    /// During the search: write the checkpoint, and the best scheme to `--out` (a file)
    /// when it improved since the last write. Failures are warnings (the search goes on).
    pub fn save_progress(&self, c: &Checkpoint, t: &Tensor) {
        if let Some(ck) = &self.checkpoint
            && let Err(e) = store_checkpoint(ck, c, t, self.overwrite)
        {
            self.warn_once(format!("checkpoint not written: {e}"));
        }
        let (Some(out), Some(best)) = (&self.out, &c.best) else {
            return;
        };
        let mut last = self.out_rank.lock().unwrap_or_else(|e| e.into_inner());
        if !out.is_file() || last.is_some_and(|r| r <= best.rank()) {
            return;
        }
        match store_result(out, best, t, self.overwrite) {
            Ok(_) => *last = Some(best.rank()),
            Err(e) => self.warn_once(format!("result not written yet: {e}")),
        }
    }

    /// At the end: write the result (see [`emit_result`]) unless this very scheme's rank
    /// is already in `--out` from a write during the search. Returns false when the result
    /// could not go where it was asked.
    pub fn save_result(&self, s: &Scheme, t: &Tensor) -> bool {
        let written = *self.out_rank.lock().unwrap_or_else(|e| e.into_inner());
        if self.out.as_ref().is_some_and(Target::is_file) && written == Some(s.rank()) {
            return true;
        }
        emit_result(self.out.as_ref(), s, t, self.overwrite)
    }

    /// At the end of a search over Q: keep the walks' scheme over GF(p) that did not lift
    /// (`w`, below the best over Q) in `OUT` with `.gfP` before its extension, next to
    /// the result (a better scheme there is kept; a failed write prints it on standard
    /// output). Without `--out` the note says how to keep it. Returns false when it could
    /// not go where it was asked.
    pub fn save_walk_scheme(&self, w: &Scheme, t: &Tensor) -> bool {
        let bilin::scalar::FieldSpec::Prime(p) = w.field else {
            return true;
        };
        let Some(out) = self.out.as_ref().filter(|o| o.is_file()) else {
            note(format!(
                "the walks reached rank {} over GF({p}), which did not lift to Q; pass --out FILE \
                 to keep that scheme (as FILE with .gf{p} before its extension)",
                w.rank()
            ));
            return true;
        };
        let path = walk_scheme_path(&out.path, p);
        let Ok(goal) = t.with_field(w.field) else {
            return true;
        };
        let target = match bilin::output::Target::resolve(&path) {
            Ok(target) => target,
            Err(e) => {
                report_error(&e);
                print_result(w);
                return false;
            }
        };
        let ok = emit_result(Some(&target), w, &goal, self.overwrite);
        if ok {
            note(format!(
                "the walks reached rank {} over GF({p}), which did not lift to Q: that scheme \
                 is in {path} (verified over GF({p}))",
                w.rank()
            ));
        }
        ok
    }

    /// At the end: write the checkpoint (failures are warnings).
    pub fn save_checkpoint(&self, c: &Checkpoint, t: &Tensor) {
        let Some(ck) = &self.checkpoint else {
            return;
        };
        match store_checkpoint(ck, c, t, self.overwrite) {
            Ok(Stored::WrittenKeepingBest { rank }) => note(format!(
                "{} keeps its earlier rank-{rank} scheme as the checkpoint's best",
                ck.path
            )),
            Ok(_) => {}
            Err(e) => warn(&format!("checkpoint not written: {e}")),
        }
    }
}

/// Write a verified result to `out` (keeping a better one already there unless
/// `overwrite`), or to standard output without `out`. When the write fails, say so and
/// print the scheme to standard output instead. Returns false when the result could not
/// go where it was asked.
pub fn emit_result(out: Option<&Target>, s: &Scheme, t: &Tensor, overwrite: bool) -> bool {
    let Some(target) = out else {
        print_result(s);
        return true;
    };
    match store_result(target, s, t, overwrite) {
        Ok(Stored::KeptBetter { rank }) => {
            note(format!(
                "{} already holds a verified rank-{rank} scheme, not worse than this rank-{} \
                 one: kept it (--overwrite replaces it)",
                target.path,
                s.rank()
            ));
            true
        }
        Ok(_) => true,
        Err(e) => {
            report_error(&e);
            eprintln!(
                "error: the rank-{} scheme was not written to {}; it follows on standard output",
                s.rank(),
                target.path
            );
            print_result(s);
            false
        }
    }
}

/// Print a scheme's JSON on standard output; if that fails (a closed pipe, a full disk),
/// on standard error, so that it is not lost.
fn print_result(s: &Scheme) {
    let text = format!("{}\n", scheme_to_json(s));
    let mut stdout = std::io::stdout().lock();
    if let Err(e) = stdout
        .write_all(text.as_bytes())
        .and_then(|_| stdout.flush())
    {
        eprintln!(
            "error: cannot write to standard output ({}); the scheme follows on standard error",
            bilin::error::describe_io(&e)
        );
        eprint!("{text}");
    }
}

/// `OUT` with `.gfP` before its extension (`run.json` -> `run.gf2.json`; `run` ->
/// `run.gf2`).
fn walk_scheme_path(out: &str, p: u64) -> String {
    let name_start = out.rfind('/').map_or(0, |i| i + 1);
    match out[name_start..].rfind('.') {
        Some(dot) if dot > 0 => {
            let at = name_start + dot;
            format!("{}.gf{p}{}", &out[..at], &out[at..])
        }
        _ => format!("{out}.gf{p}"),
    }
}

#[cfg(test)]
mod tests {
    #[test]
    fn walk_scheme_paths() {
        assert_eq!(super::walk_scheme_path("run.json", 2), "run.gf2.json");
        assert_eq!(super::walk_scheme_path("a.b/run", 5), "a.b/run.gf5");
        assert_eq!(super::walk_scheme_path("dir/.hidden", 2), "dir/.hidden.gf2");
        assert_eq!(super::walk_scheme_path("x/run.txt", 11), "x/run.gf11.txt");
    }
}
