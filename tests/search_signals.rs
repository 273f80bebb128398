//! Long searches and the user's files: stop signals (SIGTERM, SIGHUP) and kill -9 during a
//! search followed by `--resume`, output paths that are not plain files, results that are
//! never replaced by worse ones, and a closed standard output.
//!
//! The searches run on `matmul:3,3,3` with the unreachable target rank 20 (the best known
//! rank is 23, Laderman 1976, "A noncommutative algorithm for multiplying 3x3 matrices
//! using 23 multiplications"), so they run until they are stopped.

mod common;

use std::path::{Path, PathBuf};
use std::process::{Child, Command, Stdio};
use std::time::{Duration, Instant};

const BIN: &str = env!("CARGO_BIN_EXE_bilin");

fn scratch(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("bilin-signals-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn s(p: &Path) -> &str {
    p.to_str().unwrap()
}

/// A search of matmul:3,3,3 that runs until stopped, checkpointing every 0.2 s.
fn start_search(out: &Path, extra: &[&str]) -> Child {
    Command::new(BIN)
        .args([
            "search",
            "matmul:3,3,3",
            "--rank",
            "20",
            "--threads",
            "1",
            "--time",
            "60",
            "--checkpoint-every",
            "0.2",
            "--out",
            s(out),
        ])
        .args(extra)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap()
}

/// The rank recorded in a scheme or checkpoint file, if it holds a scheme.
fn rank_in(path: &Path) -> Option<usize> {
    let text = std::fs::read_to_string(path).ok()?;
    let at = text.find("\"rank\":")? + 7;
    text[at..]
        .trim_start()
        .split(|c: char| !c.is_ascii_digit())
        .next()?
        .parse()
        .ok()
}

/// Wait until `path` holds a scheme (at most 30 s).
fn wait_for_scheme(path: &Path) -> usize {
    let t0 = Instant::now();
    loop {
        if let Some(r) = rank_in(path) {
            return r;
        }
        assert!(
            t0.elapsed() < Duration::from_secs(30),
            "no scheme in {path:?}"
        );
        std::thread::sleep(Duration::from_millis(50));
    }
}

fn signal(child: &Child, sig: i32) {
    // SAFETY: kill(2) on the process id of a child we own and have not reaped.
    assert_eq!(unsafe { libc::kill(child.id() as i32, sig) }, 0);
}

/// Wait for a child (at most 20 s); its exit code (-1 when killed) and stderr.
fn finish(mut child: Child) -> (i32, String) {
    let t0 = Instant::now();
    loop {
        if let Some(st) = child.try_wait().unwrap() {
            let o = child.wait_with_output().unwrap();
            return (
                st.code().unwrap_or(-1),
                String::from_utf8_lossy(&o.stderr).into_owned(),
            );
        }
        assert!(
            t0.elapsed() < Duration::from_secs(20),
            "the search did not stop"
        );
        std::thread::sleep(Duration::from_millis(20));
    }
}

/// `bilin search poly:2,2 --rank 3 --threads 1 EXTRA...` (Karatsuba's rank 3, Karatsuba
/// and Ofman 1962, is found at once).
fn search_poly(extra: &[&str]) -> (i32, String, String) {
    let mut args = vec!["search", "poly:2,2", "--rank", "3", "--threads", "1"];
    args.extend(extra);
    common::run(&args)
}

fn verifies(path: &Path) {
    let (code, out, err) = common::run(&["verify", "matmul:3,3,3", s(path)]);
    assert_eq!(code, 0, "{path:?} does not verify: {out}{err}");
}

fn temporaries(dir: &Path) -> Vec<String> {
    std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.contains(".bilin-tmp-"))
        .collect()
}

/// Resume from `ckpt` for one second; the result in `out` must verify and not be worse
/// than `before`; seed and shard come from the checkpoint.
fn resume_and_check(out: &Path, ckpt: &Path, before: usize) {
    let (code, _, err) = common::run(&[
        "search",
        "matmul:3,3,3",
        "--rank",
        "20",
        "--threads",
        "1",
        "--time",
        "1",
        "--resume",
        s(ckpt),
        "--out",
        s(out),
    ]);
    assert_eq!(code, 1, "{err}");
    verifies(out);
    let after = rank_in(out).unwrap();
    assert!(
        after <= before,
        "rank {after} after resuming, {before} before"
    );
    let text = std::fs::read_to_string(ckpt).unwrap();
    assert!(
        text.contains("\"seed\":5") && text.contains("\"shard\":[1,3]"),
        "{text}"
    );
}

/// After a stop: `out` verifies with a rank at most `bound` (what was checkpointed before
/// the stop), and resuming from `ckpt` does not make it worse.
fn written_then_resumed(out: &Path, ckpt: &Path, bound: usize) {
    verifies(out);
    let written = rank_in(out).unwrap();
    assert!(
        written <= bound,
        "rank {written} written, {bound} before the stop"
    );
    resume_and_check(out, ckpt, written);
}

#[test]
fn sigterm_and_sighup_stop_the_search_and_write_everything() {
    let dir = scratch("term");
    let runs: Vec<(i32, PathBuf, Child)> = [(libc::SIGTERM, "term"), (libc::SIGHUP, "hup")]
        .into_iter()
        .map(|(sig, name)| {
            let out = dir.join(format!("{name}.json"));
            let child = start_search(&out, &["--seed", "5", "--shard", "1/3"]);
            (sig, out, child)
        })
        .collect();
    for (sig, out, child) in runs {
        let ckpt = PathBuf::from(format!("{}.checkpoint.json", s(&out)));
        let before = wait_for_scheme(&ckpt);
        signal(&child, sig);
        let (code, err) = finish(child);
        assert_eq!(code, 1, "signal {sig}: the target is not reached: {err}");
        assert!(err.contains("stop requested"), "{err}");
        assert!(err.contains("stopped by a signal"), "{err}");
        written_then_resumed(&out, &ckpt, before);
    }
    assert!(temporaries(&dir).is_empty(), "{:?}", temporaries(&dir));
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn kill_9_loses_nothing_that_was_written() {
    let dir = scratch("kill");
    let out = dir.join("r.json");
    let ckpt = dir.join("r.json.checkpoint.json");
    let child = start_search(&out, &["--seed", "5", "--shard", "1/3"]);
    wait_for_scheme(&ckpt);
    let before = wait_for_scheme(&out);
    std::thread::sleep(Duration::from_millis(300));
    signal(&child, libc::SIGKILL);
    let (code, _) = finish(child);
    assert_eq!(code, -1);
    // both files are complete (written by rename), the result verifies
    written_then_resumed(&out, &ckpt, before);
    assert!(temporaries(&dir).is_empty(), "{:?}", temporaries(&dir));
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn resume_refuses_a_conflicting_seed_or_shard() {
    let dir = scratch("conflict");
    let out = dir.join("r.json");
    let (code, _, err) = search_poly(&["--seed", "4", "--shard", "2/5", "--out", s(&out)]);
    assert!(code == 0 || code == 1, "{err}");
    let ckpt = format!("{}.checkpoint.json", s(&out));
    for (args, want) in [
        (
            vec!["--seed", "3"],
            "--seed 3 conflicts with the checkpoint",
        ),
        (
            vec!["--shard", "1/5"],
            "--shard 1/5 conflicts with the checkpoint",
        ),
    ] {
        let mut all = vec!["search", "poly:2,2", "--rank", "3", "--resume", &ckpt];
        all.extend(args);
        let (code, _, err) = common::run(&all);
        assert_eq!(code, 2, "{err}");
        assert!(
            err.starts_with("error: --resume: ") && err.contains(want),
            "{err}"
        );
    }
    // the same values, or none, continue the checkpoint
    let (code, _, err) = search_poly(&["--seed", "4", "--resume", &ckpt, "--out", s(&out)]);
    assert!(code == 0 || code == 1, "{err}");
    let text = std::fs::read_to_string(&ckpt).unwrap();
    assert!(
        text.contains("\"seed\":4") && text.contains("\"shard\":[2,5]"),
        "{text}"
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn outputs_that_are_not_plain_files_are_never_replaced() {
    let dir = scratch("paths");
    // a device is written through and stays a device; no checkpoint beside it
    let (code, _, err) = search_poly(&["--out", "/dev/null"]);
    assert_eq!(code, 0, "{err}");
    use std::os::unix::fs::FileTypeExt;
    assert!(
        std::fs::metadata("/dev/null")
            .unwrap()
            .file_type()
            .is_char_device()
    );
    assert!(!Path::new("/dev/null.checkpoint.json").exists());
    // a symbolic link stays a link; its target gets the result
    let target = dir.join("target.json");
    let link = dir.join("link.json");
    std::os::unix::fs::symlink(&target, &link).unwrap();
    std::fs::write(&target, "").unwrap();
    let (code, _, err) = search_poly(&["--out", s(&link)]);
    assert_eq!(code, 0, "{err}");
    assert!(
        std::fs::symlink_metadata(&link)
            .unwrap()
            .file_type()
            .is_symlink()
    );
    assert_eq!(rank_in(&target), Some(3));
    // a directory, and a path in a missing directory, are refused before any work
    for bad in [s(&dir).to_string(), format!("{}/no/such/r.json", s(&dir))] {
        let t0 = Instant::now();
        let (code, _, err) = common::run(&[
            "search",
            "matmul:3,3,3",
            "--rank",
            "20",
            "--time",
            "30",
            "--out",
            &bad,
        ]);
        assert_eq!(code, 2, "{err}");
        assert!(
            err.starts_with(&format!("error: {bad}: cannot write")),
            "{err}"
        );
        assert!(t0.elapsed() < Duration::from_secs(10));
    }
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_better_or_foreign_file_is_kept() {
    let dir = scratch("keep");
    let out = dir.join("best.json");
    // Strassen's rank 7 (Strassen 1969, "Gaussian elimination is not optimal") is there
    let (code, strassen, err) = common::run(&[
        "scheme",
        "convert",
        "matmul:2,2,2",
        "examples/schemes/strassen.txt",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    std::fs::write(&out, &strassen).unwrap();
    // a search for rank 8 ends with a scheme of rank 8 or 7: the file keeps its scheme
    let (code, _, err) = common::run(&[
        "search",
        "matmul:2,2,2",
        "--rank",
        "8",
        "--threads",
        "1",
        "--out",
        s(&out),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("holds a verified rank-7 scheme"), "{err}");
    assert_eq!(std::fs::read_to_string(&out).unwrap(), strassen);
    // merge into it: the same
    let (code, _, err) = common::run(&[
        "merge",
        "--tensor",
        "matmul:2,2,2",
        s(&out),
        "--out",
        s(&out),
    ]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(std::fs::read_to_string(&out).unwrap(), strassen);
    // a file that is not a result for the tensor is refused before work, or replaced with
    // --overwrite
    let other = dir.join("notes.md");
    std::fs::write(&other, "my notes\n").unwrap();
    let (code, _, err) = search_poly(&["--out", s(&other)]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("refusing to use it as --out"), "{err}");
    assert_eq!(std::fs::read_to_string(&other).unwrap(), "my notes\n");
    let (code, _, err) = search_poly(&["--out", s(&other), "--overwrite"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(rank_in(&other), Some(3));
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_result_that_cannot_be_written_goes_to_standard_output() {
    let dir = scratch("lost");
    let sub = dir.join("sub");
    std::fs::create_dir_all(&sub).unwrap();
    let out = sub.join("r.json");
    let child = Command::new(BIN)
        .args([
            "search",
            "matmul:2,2,3",
            "--rank",
            "10",
            "--threads",
            "1",
            "--time",
            "1.5",
            "--checkpoint-every",
            "100",
            "--out",
            s(&out),
        ])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    // the directory disappears while the search runs
    std::thread::sleep(Duration::from_millis(300));
    std::fs::remove_dir_all(&sub).unwrap();
    let o = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    let stdout = String::from_utf8_lossy(&o.stdout);
    assert_eq!(o.status.code(), Some(2), "{err}");
    assert!(
        err.contains("was not written to") && err.contains("standard output"),
        "{err}"
    );
    assert!(stdout.contains("\"schema\":\"bilin.scheme/1\""), "{stdout}");
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_closed_standard_output_ends_quietly() {
    // more output than a pipe holds, and the reader goes away at once
    let mut child = Command::new(BIN)
        .args(["convert", "matrix:20"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let o = child.wait_with_output().unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(0), "{err}");
    assert!(err.is_empty(), "{err}");
}
