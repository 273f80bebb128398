//! Result and checkpoint files of a search: a file's scheme is never replaced by a worse
//! one (unless the caller asks), and a file that holds something else is never replaced
//! silently.
//!
//! A file *holds a result for* a tensor T when it is a scheme or a checkpoint (the JSON
//! forms of [`super::json`]) whose scheme is over T's field, has T's shape and verifies
//! exactly against T (a checkpoint without a scheme counts too). "Better" means a lower
//! rank; on equal ranks the file keeps what it has. Reading, comparing and writing happen
//! under the lock of [`crate::output::Target::replace`], so concurrent writers of one file
//! keep the best of all of them.

use super::json::{Checkpoint, Saved, checkpoint_to_json, parse_saved};
use crate::error::{Error, Result};
use crate::output::{Replaced, Target};
use crate::scheme::{Scheme, verify};
use crate::tensor::Tensor;

/// The progress recorded in a checkpoint (without its scheme).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct CheckpointState {
    pub seed: u64,
    pub shard: (u64, u64),
    pub next_run: u64,
}

/// What an output file holds, judged for a tensor.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Held {
    /// Nothing: a missing or empty file, a device or a FIFO.
    Nothing,
    /// A result for the tensor: its verified scheme (if any) and, for a checkpoint, the
    /// checkpoint.
    Result {
        best: Option<Scheme>,
        checkpoint: Option<CheckpointState>,
    },
    /// Anything else, with the reason (unreadable, another format, a scheme that does not
    /// verify for this tensor).
    Foreign(String),
}

/// Judge the text of a file (`None`: nothing there) for the tensor `goal`.
/// Cost: one parse and at most one exact verification.
pub fn judge(text: Option<&str>, source: &str, goal: &Tensor) -> Held {
    let Some(text) = text.filter(|t| !t.trim().is_empty()) else {
        return Held::Nothing;
    };
    let is_json = text
        .trim_start_matches('\u{feff}')
        .trim_start()
        .starts_with('{');
    let saved = if is_json {
        match parse_saved(text, source) {
            Ok(s) => s,
            Err(e) => return Held::Foreign(format!("not a scheme or checkpoint: {e}")),
        }
    } else {
        // the text form of a scheme (written for an output named X.txt)
        match crate::scheme::parse_scheme(text, source, goal) {
            Ok(s) => Saved::Scheme(s),
            Err(e) => return Held::Foreign(format!("not a scheme or checkpoint: {e}")),
        }
    };
    if let Some(s) = saved.best() {
        if s.field != goal.field() {
            return Held::Foreign(format!(
                "it holds a scheme over {}, this search is over {}",
                s.field.name(),
                goal.field().name()
            ));
        }
        if s.dims != goal.dims() || verify(s, goal).is_err() {
            return Held::Foreign(format!(
                "it holds a rank-{} scheme that does not verify for this tensor",
                s.rank()
            ));
        }
    }
    match saved {
        Saved::Scheme(s) => Held::Result {
            best: Some(s),
            checkpoint: None,
        },
        Saved::Checkpoint(c) => Held::Result {
            checkpoint: Some(CheckpointState {
                seed: c.seed,
                shard: c.shard,
                next_run: c.next_run,
            }),
            best: c.best,
        },
    }
}

/// Judge what `target` holds now for `goal` (an unreadable file is [`Held::Foreign`]).
pub fn inspect(target: &Target, goal: &Tensor) -> Held {
    match target.read_current() {
        Ok(text) => judge(text.as_deref(), &target.path, goal),
        Err(e) => Held::Foreign(e.to_string()),
    }
}

/// What a store did.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Stored {
    /// The new content is in place.
    Written,
    /// The file already held a scheme of this rank or lower and was left as it was.
    KeptBetter { rank: usize },
    /// (Checkpoints) the checkpoint was written with the file's earlier, better scheme
    /// of this rank as its best.
    WrittenKeepingBest { rank: usize },
}

fn refuse_foreign(target: &Target, why: &str) -> Error {
    Error::Io {
        path: target.path.clone(),
        message: format!(
            "not replaced: the file does not hold a result for this tensor ({why}); \
             pass --overwrite to replace it"
        ),
    }
}

/// Write the scheme `s` (a verified scheme for `goal`) as a result file, unless the file
/// holds an equal or better result (then it is kept, [`Stored::KeptBetter`]) or holds
/// something that is not a result for `goal` (then an error). `overwrite` replaces
/// whatever is there. A device or a FIFO is written through.
pub fn store_result(target: &Target, s: &Scheme, goal: &Tensor, overwrite: bool) -> Result<Stored> {
    let mut kept = None;
    let text = crate::scheme::write_for_path(
        &target.path,
        s,
        goal,
        "found by bilin search, verified exactly",
    );
    let r = target.replace(|current| {
        if overwrite {
            return Ok(Some(text));
        }
        match judge(current, &target.path, goal) {
            Held::Nothing => Ok(Some(text)),
            Held::Result { best: Some(b), .. } if b.rank() <= s.rank() => {
                kept = Some(b.rank());
                Ok(None)
            }
            Held::Result { .. } => Ok(Some(text)),
            Held::Foreign(why) => Err(refuse_foreign(target, &why)),
        }
    })?;
    Ok(match (r, kept) {
        (Replaced::Unchanged, Some(rank)) => Stored::KeptBetter { rank },
        _ => Stored::Written,
    })
}

/// Write a checkpoint. When the file already holds a strictly better scheme for `goal`
/// (an earlier search's), the checkpoint is written with that scheme as its best, so the
/// file's best is never lost ([`Stored::WrittenKeepingBest`]). A file holding something
/// else is refused unless `overwrite`.
pub fn store_checkpoint(
    target: &Target,
    c: &Checkpoint,
    goal: &Tensor,
    overwrite: bool,
) -> Result<Stored> {
    let mut kept = None;
    target.replace(|current| {
        let mut c = c.clone();
        match judge(current, &target.path, goal) {
            Held::Foreign(why) if !overwrite => return Err(refuse_foreign(target, &why)),
            Held::Result { best: Some(b), .. }
                if !overwrite && c.best.as_ref().is_none_or(|m| b.rank() < m.rank()) =>
            {
                kept = Some(b.rank());
                c.best = Some(b);
            }
            _ => {}
        }
        Ok(Some(format!("{}\n", checkpoint_to_json(&c))))
    })?;
    Ok(match kept {
        Some(rank) => Stored::WrittenKeepingBest { rank },
        None => Stored::Written,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::generators::generate;
    use crate::scalar::FieldSpec;
    use crate::search::json::scheme_to_json;

    fn scratch(name: &str) -> std::path::PathBuf {
        let d = std::env::temp_dir().join(format!("bilin-store-{name}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&d);
        std::fs::create_dir_all(&d).unwrap();
        d
    }

    /// Strassen's rank-7 scheme (Strassen 1969, "Gaussian elimination is not optimal").
    fn strassen(t: &Tensor) -> Scheme {
        let text = std::fs::read_to_string(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/examples/schemes/strassen.txt"
        ))
        .unwrap();
        crate::scheme::parse_scheme(&text, "strassen", t).unwrap()
    }

    #[test]
    fn a_better_result_is_kept_and_foreign_files_are_refused() {
        let t = generate("matmul:2,2,2").unwrap();
        let d = scratch("keep");
        let path = d.join("r.json").to_str().unwrap().to_string();
        let target = Target::resolve(&path).unwrap();
        let good = strassen(&t);
        let worse = Scheme::standard(&t);
        assert_eq!(
            store_result(&target, &worse, &t, false).unwrap(),
            Stored::Written
        );
        assert_eq!(
            store_result(&target, &good, &t, false).unwrap(),
            Stored::Written
        );
        assert_eq!(
            store_result(&target, &worse, &t, false).unwrap(),
            Stored::KeptBetter { rank: 7 }
        );
        assert!(
            matches!(inspect(&target, &t), Held::Result { best: Some(b), .. } if b.rank() == 7)
        );
        // a checkpoint written to a file with a better scheme keeps that scheme
        let ck = Checkpoint {
            seed: 1,
            shard: (0, 1),
            next_run: 5,
            best: Some(worse.clone()),
        };
        assert_eq!(
            store_checkpoint(&target, &ck, &t, false).unwrap(),
            Stored::WrittenKeepingBest { rank: 7 }
        );
        let Held::Result { best, checkpoint } = inspect(&target, &t) else {
            panic!()
        };
        assert_eq!(best.unwrap().rank(), 7);
        assert_eq!(checkpoint.unwrap().next_run, 5);
        // --overwrite replaces even a better result
        assert_eq!(
            store_result(&target, &worse, &t, true).unwrap(),
            Stored::Written
        );
        // another tensor's scheme, or any other text, is not replaced
        let other = generate("matmul:2,2,3").unwrap();
        let e = store_result(&target, &Scheme::standard(&other), &other, false).unwrap_err();
        assert!(
            e.to_string().contains("does not verify for this tensor"),
            "{e}"
        );
        std::fs::write(&path, "basis e\n").unwrap();
        let e = store_result(&target, &good, &t, false)
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("not replaced") && e.contains("--overwrite"),
            "{e}"
        );
        assert_eq!(std::fs::read_to_string(&path).unwrap(), "basis e\n");
        let gf2 = t.with_field(FieldSpec::Prime(2)).unwrap();
        assert!(matches!(
            judge(Some(&format!("{}", scheme_to_json(&good))), "x", &gf2),
            Held::Foreign(_)
        ));
        std::fs::remove_dir_all(&d).ok();
    }
}
