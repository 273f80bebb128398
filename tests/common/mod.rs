//! Helpers shared by the command-line integration tests: run the real binary from the
//! package root and read its output.
#![allow(dead_code)]

use std::process::{Command, Output};

/// Run `bilin ARGS` in the package root and return its raw output.
pub fn bilin(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_bilin"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("run bilin")
}

/// Standard output as text.
pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

/// Standard error as text.
pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// Run `bilin ARGS`; returns (exit code, or -1 when killed by a signal; stdout; stderr).
pub fn run(args: &[&str]) -> (i32, String, String) {
    let o = bilin(args);
    (o.status.code().unwrap_or(-1), stdout(&o), stderr(&o))
}

/// A fresh temporary directory for one test (`tag` and the process id in its name).
pub fn tmpdir(tag: &str) -> std::path::PathBuf {
    let d = std::env::temp_dir().join(format!("bilin-test-{tag}-{}", std::process::id()));
    std::fs::create_dir_all(&d).expect("temp dir");
    d
}

/// `bilin transform SPEC --random SEED` (with `--to json` when `name` ends in `.json`)
/// written to `dir/name`: a table in a seeded random basis of its own; the file's path.
pub fn random_basis_file(dir: &std::path::Path, spec: &str, seed: &str, name: &str) -> String {
    let mut args = vec!["transform", spec, "--random", seed];
    if name.ends_with(".json") {
        args.extend(["--to", "json"]);
    }
    let (code, out, err) = run(&args);
    assert_eq!(code, 0, "{err}");
    let file = dir.join(name);
    std::fs::write(&file, out).expect("write the table");
    file.to_str().expect("a path in UTF-8").to_string()
}

/// True when `cmd ARGS` runs and succeeds (the tool is installed).
pub fn have(cmd: &str, args: &[&str]) -> bool {
    Command::new(cmd)
        .args(args)
        .output()
        .is_ok_and(|o| o.status.success())
}

/// Write `source` to `dir`, compile it (`c`: `cc -O2`, `rust`: `rustc -O`, warnings as
/// errors) and run it; `python`: run it with python3. Panics with the compiler's message
/// when it does not compile.
pub fn build_and_run(dir: &std::path::Path, lang: &str, source: &str) -> Output {
    let (file, compiler, args): (&str, &str, Vec<&str>) = match lang {
        "c" => (
            "t.c",
            "cc",
            vec!["-O2", "-Wall", "-Werror", "-o", "t", "t.c"],
        ),
        "rust" => (
            "t.rs",
            "rustc",
            vec![
                "--edition",
                "2021",
                "-O",
                "-D",
                "warnings",
                "-o",
                "t",
                "t.rs",
            ],
        ),
        _ => ("t.py", "", Vec::new()),
    };
    std::fs::write(dir.join(file), source).expect("write the program");
    if compiler.is_empty() {
        return Command::new("python3")
            .arg(dir.join(file))
            .output()
            .expect("run python3");
    }
    let o = Command::new(compiler)
        .current_dir(dir)
        .args(&args)
        .output()
        .expect("run the compiler");
    assert!(
        o.status.success(),
        "the {lang} program does not compile cleanly:\n{}",
        String::from_utf8_lossy(&o.stderr)
    );
    Command::new(dir.join("t"))
        .output()
        .expect("run the program")
}

/// A harness printed `lines` lines, each ending in `mismatches 0`.
pub fn assert_no_mismatches(out: &Output, lines: usize) {
    let text = stdout(out);
    assert!(out.status.success(), "{text}\n{}", stderr(out));
    let got: Vec<&str> = text.lines().collect();
    assert_eq!(got.len(), lines, "{text}");
    for l in got {
        assert!(l.ends_with("mismatches 0"), "{l}");
    }
}
