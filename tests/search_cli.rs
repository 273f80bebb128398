//! The `bilin search` and `bilin merge` command lines: exit codes and output files.

mod common;

use common::run as bilin;

/// Karatsuba: 2-term polynomials multiply with 3 multiplications (Karatsuba and Ofman 1962,
/// "Multiplication of many-digital numbers by automatic computers").
#[test]
fn search_writes_a_verified_scheme_and_merge_keeps_it() {
    let dir = std::env::temp_dir().join(format!("bilin-search-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("k.json");
    let out_s = out.to_str().unwrap();
    let (code, _, err) = bilin(&[
        "search",
        "poly:2,2",
        "--rank",
        "3",
        "--threads",
        "1",
        "--out",
        out_s,
    ]);
    assert_eq!(code, 0, "{err}");
    let text = std::fs::read_to_string(&out).unwrap();
    assert!(text.contains("\"schema\":\"bilin.scheme/1\"") && text.contains("\"rank\":3"));
    assert!(dir.join("k.json.checkpoint.json").exists());
    let (code, stdout, err) = bilin(&["merge", "--tensor", "poly:2,2", out_s]);
    assert_eq!(code, 0, "{err}");
    assert!(stdout.contains("\"rank\":3"));
    // a scheme for another tensor does not verify: nothing to keep
    let (code, _, _) = bilin(&["merge", "--tensor", "poly:2,3", out_s]);
    assert_eq!(code, 1);
    std::fs::remove_dir_all(&dir).ok();
}

/// A search for rank 2 of the 2 x 2 -> 3 polynomial product, which needs 3 (below).
const OUT_OF_REACH: [&str; 6] = ["search", "poly:2,2", "--rank", "2", "--threads", "1"];

/// A search that runs until its time is up: rank 10 for the product of 2 x 2 and 2 x 3
/// matrices, above the lower bound bilin proves (9, Koszul-Young) and below the known rank
/// 11 (Alekseyev 1985, "On the complexity of some algorithms of matrix multiplication",
/// J. Algorithms 6, from memory).
const RUNS_OUT: [&str; 8] = [
    "search",
    "matmul:2,2,3",
    "--rank",
    "10",
    "--threads",
    "1",
    "--method",
    "flip",
];

#[test]
fn unreachable_rank_exits_1_and_bad_input_exits_2() {
    // rank 2 is impossible: the result flattening of this tensor has rank 3, a lower bound
    // for the tensor rank (common practice)
    let (code, stdout, _) = bilin(&[&OUT_OF_REACH[..], &["--time", "0.3"]].concat());
    assert_eq!(code, 1);
    assert!(
        stdout.contains("\"rank\":3"),
        "the best scheme is still written"
    );
    assert_eq!(
        bilin(&["search", "poly:2,2", "--method", "nope", "--rank", "3"]).0,
        2
    );
    assert_eq!(
        bilin(&["search", "poly:2,2", "--shard", "5/2", "--rank", "3"]).0,
        2
    );
    assert_eq!(bilin(&["search", "no-such-input", "--rank", "3"]).0, 2);
    assert_eq!(
        bilin(&["search", "poly:2,2"]).0,
        2,
        "no rank, no time: refused"
    );
}

/// A batch job's log gets a progress line every few seconds (standard error is a pipe
/// here), with the best rank, the moves per second and the time elapsed; `--quiet` keeps
/// it silent.
#[test]
fn progress_lines_in_a_log_and_quiet() {
    let args = [&RUNS_OUT[..], &["--time", "1.6", "--progress-every", "0.4"]].concat();
    let (code, _, err) = bilin(&args);
    assert_eq!(code, 1, "rank 10 is out of reach");
    let lines: Vec<&str> = err.lines().filter(|l| l.contains("moves/s")).collect();
    assert!(lines.len() >= 2, "{err}");
    assert!(lines[0].starts_with("bilin search: best rank "), "{err}");
    assert!(lines.iter().all(|l| l.contains(" elapsed ")));
    let (code, _, err) = bilin(&[&args[..9], &["0.3", "--quiet"]].concat());
    assert_eq!(code, 1);
    assert!(!err.contains("moves/s"), "{err}");
    assert!(
        err.contains("best verified rank 11"),
        "the result line stays: {err}"
    );
    let (code, _, err) = bilin(&[&args[..11], &["0"]].concat());
    assert_eq!(code, 2);
    assert!(err.contains("--progress-every"), "{err}");
}

/// `--ring Z`: <2,2,3> at rank 11 (Hopcroft and Kerr 1971, "On minimizing the number of
/// multiplications necessary for matrix multiplication") with integer coefficients, the
/// closing line saying so; a tensor over GF(2) or a ring other than Z and Q is refused.
#[test]
fn search_over_the_integers() {
    let (code, stdout, err) = bilin(&[
        "search",
        "matmul:2,2,3",
        "--rank",
        "11",
        "--ring",
        "Z",
        "--seed",
        "1",
        "--threads",
        "1",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("over Z"), "{err}");
    assert!(stdout.contains("\"rank\":11"), "{stdout}");
    // every coefficient an integer: no quoted fraction besides the schema name
    let fractions = stdout
        .split('"')
        .filter(|x| x.contains('/') && *x != "bilin.scheme/1")
        .count();
    assert_eq!(fractions, 0, "{stdout}");
    // <2,5,5>: the stored integer scheme of rank 40 (Hopcroft and Kerr 1971: 40), answered
    // at once over Z
    let (code, _, err) = bilin(&["search", "matmul:2,5,5", "--rank", "40", "--ring", "Z"]);
    assert_eq!(code, 0, "{err}");
    assert!(
        err.contains("answered at once") && err.contains("rank 40 over Z"),
        "{err}"
    );
    for ring in ["Z", "N"] {
        let (code, _, err) = bilin(&[
            "search",
            "matmul:2,2,3",
            "--rank",
            "11",
            "--field",
            if ring == "Z" { "GF(2)" } else { "Q" },
            "--ring",
            ring,
        ]);
        assert_eq!(code, 2, "{err}");
        assert!(err.contains("--ring"), "{err}");
    }
}

/// A scheme over GF(2) given to a search over Q is where the walks start, its lift tried
/// first: Karatsuba's three products (Karatsuba and Ofman 1962) found over GF(2) in the text
/// form lift back to Q at once; walks over GF(3) cannot start from it (exit 2).
#[test]
fn search_over_q_starts_from_a_scheme_over_gf2() {
    let dir = std::env::temp_dir().join(format!("bilin-search-walk-from-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let gf2 = dir.join("k2.txt");
    let gf2_s = gf2.to_str().unwrap();
    let (code, _, err) = bilin(&[
        "search",
        "poly:2,2",
        "--field",
        "GF(2)",
        "--rank",
        "3",
        "--threads",
        "1",
        "--out",
        gf2_s,
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(std::fs::read_to_string(&gf2).unwrap().contains("GF(2)"));
    let (code, stdout, err) = bilin(&[
        "search",
        "poly:2,2",
        "--resume",
        gf2_s,
        "--rank",
        "3",
        "--threads",
        "1",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        err.contains("holds over GF(2), not over Q: the walks start from it"),
        "{err}"
    );
    assert!(stdout.contains("\"rank\":3"), "{stdout}");
    let (code, _, err) = bilin(&[
        "search", "poly:2,2", "--resume", gf2_s, "--rank", "3", "--prime", "3",
    ]);
    assert_eq!(code, 2, "{err}");
    std::fs::remove_dir_all(&dir).ok();
}

/// A scheme over GF(p) that cannot lift: the quaternions split modulo 3 (M_2(GF(3)), rank
/// 7, Strassen 1969), while their rank over R, hence over Q, is 8 (de Groote 1978, "On
/// varieties of optimal algorithms for the computation of bilinear mappings II", Theoret.
/// Comput. Sci. 7; from memory). A search over Q for rank 7 with walks over GF(3) reaches 7
/// there, which no lift can bring to Q whatever the time: the search keeps that scheme over
/// GF(3) next to its result, verified, and `verify --field GF(3)` accepts it.
#[test]
fn search_over_q_keeps_the_walks_scheme_over_gf2() {
    let dir = std::env::temp_dir().join(format!("bilin-search-gfp-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let out = dir.join("run.json");
    let (code, _, err) = bilin(&[
        "search",
        "quaternions",
        "--rank",
        "7",
        "--prime",
        "3",
        "--seed",
        "1",
        "--threads",
        "1",
        "--time",
        "8",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert_eq!(code, 1, "not reached over Q: {err}");
    assert!(err.contains("over GF(3), which did not lift to Q"), "{err}");
    let gf3 = dir.join("run.gf3.json");
    let (code, stdout, err) = bilin(&[
        "verify",
        "quaternions",
        gf3.to_str().unwrap(),
        "--field",
        "GF(3)",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(stdout.contains("verified: rank 7"), "{stdout}");
    std::fs::remove_dir_all(&dir).ok();
}

/// A cyclic convolution written in a basis of the user's own: `search` answers at once at
/// 2n - t (Winograd 1977, Math. Systems Theory 10, from memory: x^5 - 1 has two
/// irreducible factors over Q, so 8 for length 5), `bounds` closes the interval on it, and
/// the scheme written by `search` verifies against the table.
#[test]
fn a_convolution_in_the_users_basis_is_answered_at_its_rank() {
    let dir = common::tmpdir("convolution-basis");
    let (code, table, err) = bilin(&["transform", "C5", "--random", "7"]);
    assert_eq!(code, 0, "{err}");
    let table_path = dir.join("c5.txt");
    std::fs::write(&table_path, table).unwrap();
    let t = table_path.to_str().unwrap();
    let out = dir.join("c5.json");
    let (code, _, err) = bilin(&[
        "search",
        t,
        "--rank",
        "8",
        "--time",
        "30",
        "--out",
        out.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("best verified rank 8 over Q"), "{err}");
    let (code, stdout, err) = bilin(&["verify", t, out.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    assert!(stdout.contains("verified: rank 8"), "{stdout}");
    let (code, stdout, err) = bilin(&["bounds", t]);
    assert_eq!(code, 0, "{err}");
    assert!(stdout.contains("R = 8 over Q"), "{stdout}");
    assert!(stdout.contains("interpolation"), "{stdout}");
    std::fs::remove_dir_all(&dir).ok();
}
