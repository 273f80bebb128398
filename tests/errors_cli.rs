//! Errors as the user sees them: one line `error: FILE:LINE:COL: message` (with the JSON
//! path in JSON files), the same prefix for every command, exit code 2, and only the
//! documented spellings accepted.

mod common;

use common::run as bilin;

fn scratch(name: &str, content: &[u8]) -> String {
    let d = std::env::temp_dir().join(format!("bilin-errors-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    let p = d.join(name);
    std::fs::write(&p, content).unwrap();
    p.to_str().unwrap().to_string()
}

/// Run `bilin ARGS` (with `{}` replaced by a file holding `content`) and check exit 2 and
/// that standard error starts with `error: FILE:` + `at` and contains `msg`.
fn refused(name: &str, content: &[u8], args: &[&str], at: &str, msg: &str) {
    let f = scratch(name, content);
    let args: Vec<&str> = args
        .iter()
        .map(|a| if *a == "{}" { f.as_str() } else { a })
        .collect();
    let (code, _, err) = bilin(&args);
    assert_eq!(code, 2, "{args:?}: {err}");
    let want = format!("error: {f}:{at}");
    assert!(
        err.starts_with(&want),
        "{args:?}: want `{want}`, got `{err}`"
    );
    assert!(err.contains(msg), "{args:?}: want `{msg}` in `{err}`");
    assert_eq!(err.lines().count(), 1, "{err}");
}

const VERIFY: &[&str] = &["verify", "matmul:2,2,2", "{}"];

#[test]
fn scheme_files_get_located_errors() {
    // empty and comment-only files
    refused("empty.txt", b"", VERIFY, "1:1:", "the input is empty");
    refused(
        "comment.txt",
        b"# nothing\n\n",
        VERIFY,
        "2:1:",
        "the input is empty",
    );
    refused("ws.json", b"   ", VERIFY, "1:1:", "the input is empty");
    // invalid UTF-8, on line 2
    refused(
        "bin.txt",
        b"field Q\nm1 = \xff",
        VERIFY,
        "2:6:",
        "not UTF-8",
    );
    // semantic errors in JSON point at the value, with its path
    refused(
        "coef.json",
        b"{\"dims\": [4, 4, 4],\n \"u\": [[\"1\", \"0\", \"x\", \"1\"]], \"v\": [], \"w\": []}",
        VERIFY,
        "2:19:",
        "$.u[0][2]: expected a coefficient",
    );
    refused(
        "dims.json",
        b"{\"dims\": [4, 4, 2], \"u\": [], \"v\": [], \"w\": []}",
        VERIFY,
        "1:10:",
        "$.dims: the scheme has format 4x4x2 but the tensor has 4x4x4",
    );
    refused(
        "rows.json",
        b"{\"dims\": [4, 4, 4], \"u\": [[\"1\"]], \"v\": [], \"w\": []}",
        VERIFY,
        "1:27:",
        "$.u[0]: 1 coefficients, expected 4",
    );
    // spellings outside the documented grammar
    refused(
        "dup.json",
        b"{\"dims\": [4, 4, 4], \"dims\": [4, 4, 4], \"u\": [], \"v\": [], \"w\": []}",
        VERIFY,
        "1:21:",
        "duplicate key \"dims\"",
    );
    refused(
        "exp.json",
        b"{\"dims\": [4, 4, 4], \"u\": [[\"1e9\", \"0\", \"0\", \"0\"]], \"v\": [[1, 0, 0, 0]], \"w\": [[1, 0, 0, 0]]}",
        VERIFY,
        "1:28:",
        "found the string \"1e9\"",
    );
    refused(
        "unknown.json",
        b"{\"dims\": [4, 4, 4], \"u\": [], \"v\": [], \"w\": [], \"cost\": 3}",
        VERIFY,
        "1:48:",
        "unknown key \"cost\"",
    );
    refused(
        "gf.txt",
        b"field GF 7\n",
        VERIFY,
        "1:1:",
        "expected a field `Q` or `GF(p)`",
    );
    refused(
        "gfl.txt",
        b"field QQ\n",
        VERIFY,
        "1:1:",
        "expected a field `Q` or `GF(p)`",
    );
    refused(
        "dot.txt",
        b"m1 = .5 a11 * b11\n",
        VERIFY,
        "1:6:",
        "expected a number",
    );
    // a GF(p) scheme for a tensor over Q, at its field line
    refused(
        "field.txt",
        b"# a comment\nfield GF(2)\nm1 = a11*b11\n",
        VERIFY,
        "2:1:",
        "a scheme over GF(2) cannot be read for a tensor over Q",
    );
}

#[test]
fn tensor_files_and_basis_files_get_located_errors() {
    refused(
        "dup.json",
        b"{\"kind\": \"algebra\", \"kind\": \"algebra\", \"dims\": [1, 1, 1], \"entries\": []}",
        &["convert", "{}"],
        "1:21:",
        "duplicate key \"kind\"",
    );
    refused(
        "gf.bilin",
        b"field GF 7\nbasis e\ne*e = e\n",
        &["convert", "{}"],
        "1:7:",
        "expected a field `Q` or `GF(p)`",
    );
    refused(
        "empty.bilin",
        b"",
        &["convert", "{}"],
        "1:1:",
        "empty input",
    );
    refused(
        "basis.txt",
        b"\n\n",
        &["transform", "quaternions", "--basis", "{}"],
        "3:1:",
        "no `matrix` block",
    );
}

#[test]
fn checkpoints_get_located_errors_and_every_command_the_same_prefix() {
    let ck = b"{\"schema\": \"bilin.search-checkpoint/1\", \"seed\": 1, \"shard\": [0, 1],\n \"next_run\": -1, \"best\": null}";
    refused(
        "ck.json",
        ck,
        &["search", "poly:2,2", "--rank", "3", "--resume", "{}"],
        "2:14:",
        "$.next_run: expected a non-negative integer",
    );
    refused(
        "ck2.json",
        ck,
        &["merge", "--tensor", "poly:2,2", "{}"],
        "2:14:",
        "$.next_run",
    );
    // option errors name the option, after the same prefix
    for args in [
        vec!["search", "poly:2,2", "--rank", "3", "--shard", "3/2"],
        vec!["search", "poly:2,2", "--rank", "3", "--method", "other"],
        vec!["analyze", "quaternions", "--field", "GF 7"],
    ] {
        let (code, _, err) = bilin(&args);
        assert_eq!(code, 2, "{args:?}: {err}");
        assert!(err.starts_with("error: --"), "{args:?}: {err}");
    }
    let (code, _, err) = bilin(&["verify", "matmul:2,2,2", "/dev/zero"]);
    assert_eq!(code, 2);
    assert!(
        err.starts_with(
            "error: /dev/zero: cannot read: the file is larger than the limit of 64 MiB"
        ),
        "{err}"
    );
}
