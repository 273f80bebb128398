//! The speed and memory targets of the exact engine, measured on whole commands.
//!
//! Each row runs the release binary (`analyze`, `invariants`, `identify`) as a user would,
//! and records its wall time and peak resident memory (from `wait4`). The inputs include
//! what users have: tables in a basis of their own (a seeded random change of basis, also
//! with entries up to 10^6) and dense random tables, not only the sparse generators.
//!
//! Run: `cargo bench --bench targets` (builds the release binary first).
//! Options, by environment:
//! - `BILIN_BEFORE=/path/to/bilin`: also time another build of the tool on the same rows,
//!   pair by pair, and print the ratio (before / now);
//! - `BILIN_REFERENCE=/path/to/reference/scripts`: also run the dense rank baselines
//!   (`derivations_flint.py`, `centroid_flint.py`) on the same tensors and print the ratio;
//! - `BILIN_TIMEOUT=seconds` (default 120): a run that takes longer is stopped and shown
//!   as `> timeout`;
//! - `BILIN_ROWS=substring`: run only the rows whose name contains it.
use bilin::input::write_json;
use bilin::tensor::{Tensor, change_basis_algebra, random_algebra, random_invertible};
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

/// One measured run: wall seconds and peak memory in MB, or `None` when stopped at the
/// timeout; `ok` is the exit status (0 or 1 count as a finished analysis).
struct Run {
    seconds: Option<f64>,
    peak_mb: f64,
    ok: bool,
}

/// Runs a command to the end (or the timeout) and reads its resource use.
fn run(program: &Path, args: &[String], timeout: Duration) -> Run {
    let start = Instant::now();
    let child = Command::new(program)
        .args(args)
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn();
    let Ok(child) = child else {
        return Run {
            seconds: None,
            peak_mb: 0.0,
            ok: false,
        };
    };
    let pid = child.id() as libc::pid_t;
    let mut status = 0;
    // SAFETY: rusage is plain data; wait4 fills it for our own child.
    let mut usage: libc::rusage = unsafe { std::mem::zeroed() };
    loop {
        // SAFETY: pid is our child; the pointers are valid for the call.
        let r = unsafe { libc::wait4(pid, &mut status, libc::WNOHANG, &mut usage) };
        if r == pid {
            let code = libc::WEXITSTATUS(status);
            return Run {
                seconds: Some(start.elapsed().as_secs_f64()),
                peak_mb: usage.ru_maxrss as f64 / 1024.0,
                ok: libc::WIFEXITED(status) && code <= 1,
            };
        }
        if start.elapsed() > timeout {
            // SAFETY: pid is our live child.
            unsafe {
                libc::kill(pid, libc::SIGKILL);
                libc::wait4(pid, &mut status, 0, &mut usage);
            }
            return Run {
                seconds: None,
                peak_mb: usage.ru_maxrss as f64 / 1024.0,
                ok: false,
            };
        }
        std::thread::sleep(Duration::from_millis(5));
    }
}

fn show(r: &Run) -> String {
    match r.seconds {
        Some(s) if r.ok => format!("{s:.2} s"),
        Some(s) => format!("failed after {s:.2} s"),
        None => "> timeout".to_string(),
    }
}

/// Writes a tensor in the JSON form and returns its path as an argument.
fn write(dir: &Path, name: &str, t: &Tensor) -> String {
    let path = dir.join(name);
    std::fs::write(&path, write_json(t)).expect("write bench input");
    path.display().to_string()
}

/// A target row: a name, the command arguments, the time target (seconds) and the memory
/// target (MB), if any.
struct Row {
    name: String,
    args: Vec<String>,
    seconds: f64,
    megabytes: Option<f64>,
}

fn row(name: &str, args: &[&str], seconds: f64, megabytes: Option<f64>) -> Row {
    Row {
        name: name.to_string(),
        args: args.iter().map(|s| s.to_string()).collect(),
        seconds,
        megabytes,
    }
}

fn binary() -> PathBuf {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let status = Command::new(env!("CARGO"))
        .args(["build", "--release", "--quiet", "--bin", "bilin"])
        .current_dir(&root)
        .status()
        .expect("cargo build");
    assert!(status.success(), "release build failed");
    root.join("target/release/bilin")
}

fn main() {
    // `cargo bench` passes `--bench`; any other argument is ignored.
    let bin = binary();
    let timeout = Duration::from_secs(
        std::env::var("BILIN_TIMEOUT")
            .ok()
            .and_then(|s| s.parse().ok())
            .unwrap_or(120),
    );
    let before = std::env::var_os("BILIN_BEFORE").map(PathBuf::from);
    let reference = std::env::var_os("BILIN_REFERENCE").map(PathBuf::from);
    let only = std::env::var("BILIN_ROWS").unwrap_or_default();
    let dir = std::env::temp_dir().join(format!("bilin-targets-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temp dir");

    // Inputs in a user's basis.
    let sedenions = bilin::input::load_input("sedenions", None).expect("generator");
    let change = bilin::input::random_basis_change(&sedenions, 3);
    let sed3 = bilin::input::apply_basis_change(&sedenions, &change).expect("invertible");
    let sed3 = write(&dir, "sedenions-random3.json", &sed3);
    let big = random_invertible(16, 1_000_000, 11);
    let sed_big = change_basis_algebra(&sedenions, &big).expect("invertible");
    let sed_big = write(&dir, "sedenions-big.json", &sed_big);
    let random24 = write(&dir, "random24.json", &random_algebra(24, 2, 1));
    let random32 = write(&dir, "random32.json", &random_algebra(32, 2, 1));
    let random64 = write(&dir, "random64.json", &random_algebra(64, 2, 1));
    let octonions = bilin::input::load_input("octonions", None).expect("generator");
    let oct_big =
        change_basis_algebra(&octonions, &random_invertible(8, 1_000_000, 5)).expect("invertible");
    let oct_big = write(&dir, "octonions-big.json", &oct_big);

    let rows = vec![
        row(
            "analyze sedenions, random basis (transform --random 3)",
            &["analyze", &sed3],
            1.0,
            None,
        ),
        row(
            "analyze sedenions, basis entries up to 10^6",
            &["analyze", &sed_big],
            1.0,
            None,
        ),
        row(
            "analyze octonions, basis entries up to 10^6",
            &["analyze", &oct_big],
            1.0,
            None,
        ),
        row(
            "analyze random dense dim 32",
            &["analyze", &random32],
            2.0,
            None,
        ),
        row(
            "analyze random dense dim 64",
            &["analyze", &random64],
            30.0,
            Some(2048.0),
        ),
        row("analyze matrix:8", &["analyze", "matrix:8"], 1.0, None),
        row(
            "analyze clifford:0,6",
            &["analyze", "clifford:0,6"],
            1.0,
            None,
        ),
        row("analyze cd:6", &["analyze", "cd:6"], 1.0, None),
        row(
            "invariants dihedral:64",
            &["invariants", "dihedral:64"],
            30.0,
            None,
        ),
        row(
            "invariants cyclic:256",
            &["invariants", "cyclic:256"],
            20.0,
            Some(2048.0),
        ),
        row(
            "invariants clifford:0,8",
            &["invariants", "clifford:0,8"],
            20.0,
            Some(2048.0),
        ),
        row(
            "invariants matrix:16",
            &["invariants", "matrix:16"],
            20.0,
            Some(2048.0),
        ),
        row(
            "identify sedenions, random basis",
            &["identify", &sed3],
            2.0,
            None,
        ),
    ];

    println!("| work | target | now | peak memory | met | before | before / now |");
    println!("|---|---|---|---|---|---|---|");
    for r in rows.iter().filter(|r| r.name.contains(&only)) {
        let now = run(&bin, &r.args, timeout);
        let met = now.ok
            && now.seconds.is_some_and(|s| s < r.seconds)
            && r.megabytes.is_none_or(|m| now.peak_mb < m);
        let target = match r.megabytes {
            Some(m) => format!("< {} s, < {} MB", r.seconds, m),
            None => format!("< {} s", r.seconds),
        };
        let (old, ratio) = match &before {
            Some(b) => {
                let old = run(b, &r.args, timeout);
                let ratio = match (old.seconds, now.seconds) {
                    (Some(o), Some(n)) if old.ok => format!("{:.1}", o / n),
                    (None, Some(n)) => format!("> {:.0}", timeout.as_secs_f64() / n),
                    _ => "-".to_string(),
                };
                (show(&old), ratio)
            }
            None => ("-".to_string(), "-".to_string()),
        };
        println!(
            "| {} | {} | {} | {:.0} MB | {} | {} | {} |",
            r.name,
            target,
            show(&now),
            now.peak_mb,
            if met { "yes" } else { "no" },
            old,
            ratio
        );
    }

    if let Some(refdir) = reference {
        println!();
        println!(
            "| work | bilin | reference (dense rank mod a 62-bit prime, total) | reference / bilin |"
        );
        println!("|---|---|---|---|");
        let python = PathBuf::from("python3");
        let cases = [
            (
                "random dim 24",
                random24.clone(),
                vec!["file".to_string(), random24],
            ),
            (
                "random dim 32",
                random32.clone(),
                vec!["file".to_string(), random32],
            ),
            (
                "M_6",
                "matrix:6".to_string(),
                vec!["matalg".to_string(), "6".to_string()],
            ),
        ];
        for (part, script) in [
            ("derivations", "derivations_flint.py"),
            ("centroid", "centroid_flint.py"),
        ] {
            for (label, input, ref_args) in &cases {
                let ours = run(
                    &bin,
                    &["invariants", "--no-bases", "--only", part, input].map(String::from),
                    timeout,
                );
                let mut args = vec![refdir.join(script).display().to_string()];
                args.extend(ref_args.iter().cloned());
                args.extend(["--method", "nmod62", "--reps", "1"].map(String::from));
                let theirs = run(&python, &args, timeout * 10);
                let ratio = match (theirs.seconds, ours.seconds) {
                    (Some(t), Some(o)) if theirs.ok => format!("{:.0}", t / o),
                    _ => "-".to_string(),
                };
                println!(
                    "| {part}, {label} | {} | {} | {ratio} |",
                    show(&ours),
                    show(&theirs)
                );
            }
        }
    }
    let _ = std::fs::remove_dir_all(&dir);
}
