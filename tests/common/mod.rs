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
