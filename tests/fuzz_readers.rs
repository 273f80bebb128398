//! A deterministic fuzz suite over every reader: the table format (with brackets,
//! declared symmetries and slices), the grid form, the coordinate JSON form, the arrays
//! (`.npy` bytes, CSV in both layouts, nested JSON lists), the scheme text form, the
//! scheme JSON form, change-of-basis files and search checkpoints.
//!
//! Each case mutates a valid input (byte flips, inserted tokens, deleted ranges, repeated
//! or swapped lines, truncation, splices, invalid UTF-8, random bytes) with a seeded
//! generator and feeds it to the reader in-process. The oracle: no panic; every refusal is
//! an `Error::Parse` at a line and column inside the input (line at most one past the last
//! line), or for a `.npy` file an `Error::Data` at a byte or an element; every accepted
//! input reads back the same after writing it out. A second part
//! runs the real binary on some of the cases and checks the exit code (0, 1 or 2, never a
//! crash) and that a refusal is one `error: FILE:LINE:COL: message` line without a
//! backtrace.
//!
//! CI runs a few thousand cases. For a long run (hours), see DEVELOPERS.md:
//! `BILIN_FUZZ_CASES=2000000 BILIN_FUZZ_SEED=7 cargo test --release --test fuzz_readers -- --nocapture`.

use bilin::error::Error;
use bilin::input::{
    ReadOptions, apply_basis_change, parse_basis_file, parse_csv, parse_json, parse_nested_list,
    parse_npy, parse_table, text_from_bytes, write_grid, write_json, write_slices, write_table,
};
use bilin::scheme::Scheme;
use bilin::search::json::{Checkpoint, checkpoint_to_json, parse_saved, scheme_to_json};
use bilin::tensor::Tensor;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use std::collections::BTreeMap;
use std::panic::{AssertUnwindSafe, catch_unwind};

fn env_u64(name: &str, default: u64) -> u64 {
    std::env::var(name)
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(default)
}

fn file(rel: &str) -> String {
    std::fs::read_to_string(format!("{}/{rel}", env!("CARGO_MANIFEST_DIR"))).unwrap()
}

fn tensor(spec: &str) -> Tensor {
    bilin::generators::generate(spec).unwrap()
}

/// Strings that readers treat specially, inserted at random places.
const TOKENS: &[&str] = &[
    "{",
    "}",
    "[",
    "]",
    "\"",
    ",",
    ":",
    "-",
    "+",
    "/",
    "*",
    "=",
    "(",
    ")",
    "#",
    "\n",
    " ",
    "\t",
    "\r\n",
    "0",
    "1/0",
    "-0",
    "0.",
    ".5",
    "1e9",
    "1E-3",
    "007",
    "99999999999999999999999999",
    "\u{0}",
    "\u{feff}",
    "é",
    "\u{202e}",
    "\\u0000",
    "\\ud800",
    "null",
    "true",
    "false",
    "field GF(4)",
    "field GF(2)",
    "field Q",
    "unit e",
    "grid",
    "end",
    "matrix",
    "matrix left",
    "names",
    "basis",
    "left",
    "right",
    "result",
    "dims 2 2 2",
    "rank 0",
    "\"u\":",
    "\"dims\":",
    "\"schema\":",
    "\"best\":",
    "\"shard\":[0,0]",
    "[0,0,0,\"1\"]",
    "e*e = e",
    "a11",
    "m1 =",
    "x'",
    "_",
    "4096",
    "2049",
    "[a, b] = c",
    "[e0, e1] =",
    "commutative",
    "anticommutative",
    "slice result c0",
    "slice left",
    "i,j,k,value",
    ",,",
    "\"1/3\"",
    "0.1",
    "2.5e-1",
    "1e400",
    "'descr': '<f8'",
    "'fortran_order': True",
    "(2, 2, 2)",
    "NUMPY",
];

/// One mutation of `base` (bytes), drawing from `rng`; `other` is another seed to splice.
fn mutate(base: &[u8], other: &[u8], rng: &mut ChaCha8Rng) -> Vec<u8> {
    let mut v = base.to_vec();
    let rounds = 1 + rng.gen_range(0..4);
    for _ in 0..rounds {
        let n = v.len();
        let at = if n == 0 { 0 } else { rng.gen_range(0..=n) };
        match rng.gen_range(0..10) {
            0 if n > 0 => {
                let i = rng.gen_range(0..n);
                v[i] = rng.r#gen();
            }
            1 | 2 => {
                let t = TOKENS[rng.gen_range(0..TOKENS.len())].as_bytes();
                v.splice(at..at, t.iter().copied());
            }
            3 if n > 0 => {
                let end = (at + rng.gen_range(1..16)).min(n);
                v.drain(at.min(end)..end);
            }
            4 => {
                // repeat or swap whole lines
                let text = String::from_utf8_lossy(&v).into_owned();
                let mut lines: Vec<&str> = text.lines().collect();
                if !lines.is_empty() {
                    let i = rng.gen_range(0..lines.len());
                    let j = rng.gen_range(0..lines.len());
                    if rng.gen_bool(0.5) {
                        lines.insert(j, lines[i]);
                    } else {
                        lines.swap(i, j);
                    }
                }
                v = lines.join("\n").into_bytes();
            }
            5 => v.truncate(at),
            6 if !other.is_empty() => {
                let s = rng.gen_range(0..other.len());
                let e = (s + rng.gen_range(1..64)).min(other.len());
                v.splice(at..at, other[s..e].iter().copied());
            }
            7 => {
                let bytes: Vec<u8> = (0..rng.gen_range(1..8)).map(|_| rng.r#gen()).collect();
                v.splice(at..at, bytes);
            }
            8 if n > 0 => {
                // a digit run made long or a digit changed
                let i = rng.gen_range(0..n);
                if v[i].is_ascii_digit() {
                    let extra = vec![b'9'; rng.gen_range(1..6000)];
                    v.splice(i..i, extra);
                }
            }
            _ => {
                let len = rng.gen_range(0..64);
                v = (0..len).map(|_| rng.r#gen()).collect();
            }
        }
    }
    v
}

/// What a reader did with one input.
enum Verdict {
    Accepted,
    Refused(Error),
}

/// A reader under test: a name, its valid seed inputs, and a function that reads the
/// bytes of a file (checking its own round trip when it accepts).
struct Reader {
    name: &'static str,
    seeds: Vec<Vec<u8>>,
    read: ReadFn,
    /// The command line that reads such a file (`{}` is the file), for the binary part.
    cli: &'static [&'static str],
    /// The file name's ending in the binary part (`.csv` selects the CSV reader).
    suffix: &'static str,
}

/// A reader of text: the bytes must be UTF-8 (located refusal otherwise).
/// A reader of a file's bytes.
type ReadFn = Box<dyn Fn(&[u8]) -> Verdict>;

fn text(read: impl Fn(&str) -> Verdict + 'static) -> ReadFn {
    Box::new(move |b: &[u8]| match text_from_bytes(b.to_vec(), "in") {
        Err(e) => Verdict::Refused(e),
        Ok(s) => read(&s),
    })
}

fn bytes(v: Vec<String>) -> Vec<Vec<u8>> {
    v.into_iter().map(String::into_bytes).collect()
}

/// A `.npy` file as numpy writes it (format 1.0), of little-endian 8-byte values.
fn npy(descr: &str, fortran: bool, shape: [usize; 3], values: &[u64]) -> Vec<u8> {
    let mut h = format!(
        "{{'descr': '{descr}', 'fortran_order': {}, 'shape': ({}, {}, {}), }}",
        if fortran { "True" } else { "False" },
        shape[0],
        shape[1],
        shape[2]
    );
    while (10 + h.len() + 1) % 64 != 0 {
        h.push(' ');
    }
    h.push('\n');
    let mut out = b"\x93NUMPY\x01\x00".to_vec();
    out.extend((h.len() as u16).to_le_bytes());
    out.extend(h.as_bytes());
    for v in values {
        out.extend(v.to_le_bytes());
    }
    out
}

fn verdict<T>(r: Result<T, Error>, round_trip: impl FnOnce(&T)) -> Verdict {
    match r {
        Ok(x) => {
            round_trip(&x);
            Verdict::Accepted
        }
        Err(e) => Verdict::Refused(e),
    }
}

fn tensor_round_trip(t: &Tensor) {
    assert_eq!(&parse_table(&write_table(t), "rt").unwrap(), t, "table");
    assert_eq!(&parse_json(&write_json(t), "rt").unwrap(), t, "json");
}

fn scheme_round_trip(s: &Scheme) {
    let text = scheme_to_json(s).to_string();
    assert_eq!(
        &bilin::scheme::json::parse_json(&text, "rt").unwrap(),
        s,
        "scheme json"
    );
}

fn readers() -> Vec<Reader> {
    let m222 = tensor("matmul:2,2,2");
    let schemes: Vec<String> = ["strassen", "winograd"]
        .iter()
        .map(|n| file(&format!("examples/schemes/{n}.txt")))
        .collect();
    let parsed: Vec<Scheme> = schemes
        .iter()
        .map(|s| bilin::scheme::parse_scheme(s, "seed", &m222).unwrap())
        .collect();
    let table_seeds = vec![
        file("examples/inputs/sl2_brackets.bilin"),
        file("examples/inputs/jordan_spin.bilin"),
        file("examples/inputs/counts_slices.bilin"),
        write_slices(&tensor("matmul:2,1,2"), 0),
        "field GF(5)\nbasis h e f\nanticommutative\nh*e = 2e\nh*f = -2f\ne*f = h\n".to_string(),
        file("tests/data/quaternions.bilin"),
        file("tests/data/poly2x2.bilin"),
        file("tests/data/gf2_field4.bilin"),
        file("tests/data/laws_map.bilin"),
        write_table(&tensor("matmul:2,2,2")),
        write_table(&tensor("cd:3")),
    ];
    let grid_seeds = vec![
        file("tests/data/quaternions_grid.bilin"),
        write_grid(&tensor("cd:3")).unwrap(),
        write_grid(&tensor("cyclic:3")).unwrap(),
    ];
    let json_seeds = vec![
        file("examples/inputs/heisenberg.json"),
        file("tests/data/complex.json"),
        write_json(&tensor("matmul:2,2,1")),
        write_json(&tensor("cd:2")),
    ];
    let scheme_json_seeds: Vec<String> = parsed
        .iter()
        .map(bilin::scheme::json::write_json)
        .chain(parsed.iter().map(|s| scheme_to_json(s).to_string()))
        .collect();
    let checkpoint_seeds: Vec<String> = parsed
        .iter()
        .map(|s| {
            checkpoint_to_json(&Checkpoint {
                seed: 7,
                shard: (1, 4),
                next_run: 12,
                best: Some(s.clone()),
            })
            .to_string()
        })
        .chain(std::iter::once(
            checkpoint_to_json(&Checkpoint {
                seed: 0,
                shard: (0, 1),
                next_run: 0,
                best: None,
            })
            .to_string(),
        ))
        .collect();
    let basis_seeds = vec![
        file("tests/data/basis_quaternions.txt"),
        file("tests/data/basis_quaternions_inverse.txt"),
        "matrix left\n1 0 0 0\n0 1 0 0\n0 0 1 0\n0 0 0 1\nend\nmatrix right\n1 1 0 0\n0 1 0 0\n\
         0 0 1 0\n0 0 0 -1\nend\nmatrix result\n2 0 0 0\n0 1/2 0 0\n0 0 1 0\n0 0 0 1\nend\n\
         names left x y z w\n"
            .to_string(),
    ];
    let quaternions = parse_table(&file("tests/data/quaternions.bilin"), "q").unwrap();
    let t2 = m222.clone();
    let csv_seeds = vec![
        file("examples/inputs/counts_slices.csv"),
        file("examples/inputs/counts_long.csv"),
        "1,0.5,\"-3/4\"\n2,1e3,0\n\n0,0,1\n-2.5E-1,0,7\n".to_string(),
        "i,j,k,value\n3,1,0,-1\n0,0,2,18446744073709551616\n".to_string(),
    ];
    let nested_seeds = vec![
        file("examples/inputs/counts_nested.json"),
        "[[[1, 0.5], [\"1/3\", -2]], [[0, 0], [1e2, 3]]]".to_string(),
    ];
    let counts = std::fs::read(format!(
        "{}/examples/inputs/counts.npy",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap();
    let halves: Vec<u64> = (0..8)
        .map(|x| (f64::from(x) / 2.0 - 1.0).to_bits())
        .collect();
    let npy_seeds = vec![
        counts,
        npy("<f8", true, [2, 2, 2], &halves),
        npy("<i8", false, [1, 2, 3], &[0, 1, 2, u64::MAX, 4, 5]),
    ];
    let opts = ReadOptions::default();
    let (o1, o2, o3) = (opts.clone(), opts.clone(), opts);
    vec![
        Reader {
            name: "table",
            seeds: bytes(table_seeds),
            read: text(|s| verdict(parse_table(s, "in"), tensor_round_trip)),
            cli: &["convert", "{}"],
            suffix: "",
        },
        Reader {
            name: "grid",
            seeds: bytes(grid_seeds),
            read: text(|s| verdict(parse_table(s, "in"), tensor_round_trip)),
            cli: &["convert", "{}"],
            suffix: "",
        },
        Reader {
            name: "json",
            seeds: bytes(json_seeds),
            read: text(|s| verdict(parse_json(s, "in"), tensor_round_trip)),
            cli: &["convert", "{}", "--to", "json"],
            suffix: "",
        },
        Reader {
            name: "csv",
            seeds: bytes(csv_seeds),
            read: text(move |s| verdict(parse_csv(s, "in", &o1), tensor_round_trip)),
            cli: &["convert", "{}", "--to", "grid"],
            suffix: ".csv",
        },
        Reader {
            name: "nested-json",
            seeds: bytes(nested_seeds),
            read: text(move |s| verdict(parse_nested_list(s, "in", &o2), tensor_round_trip)),
            cli: &["analyze", "{}", "--no-invariants", "--no-bounds"],
            suffix: "",
        },
        Reader {
            name: "npy",
            seeds: npy_seeds,
            read: Box::new(move |b| verdict(parse_npy(b, "in", &o3), tensor_round_trip)),
            cli: &["convert", "{}", "--to", "json"],
            suffix: "",
        },
        Reader {
            name: "scheme-text",
            seeds: bytes(schemes),
            read: text(move |s| {
                verdict(
                    bilin::scheme::parse_scheme(s, "in", &m222),
                    scheme_round_trip,
                )
            }),
            cli: &["verify", "matmul:2,2,2", "{}"],
            suffix: "",
        },
        Reader {
            name: "scheme-json",
            seeds: bytes(scheme_json_seeds),
            read: text(move |s| {
                verdict(bilin::scheme::parse_scheme(s, "in", &t2), scheme_round_trip)
            }),
            cli: &["verify", "matmul:2,2,2", "{}"],
            suffix: "",
        },
        Reader {
            name: "basis",
            seeds: bytes(basis_seeds),
            read: text(move |s| {
                // the file is checked against an input as `bilin transform` does
                let r = parse_basis_file(s, "in")
                    .and_then(|b| apply_basis_change(&quaternions, &b).map(|_| ()));
                verdict(r, |_| {})
            }),
            cli: &["transform", "quaternions", "--basis", "{}"],
            suffix: "",
        },
        Reader {
            name: "checkpoint",
            seeds: bytes(checkpoint_seeds),
            read: text(|s| {
                verdict(parse_saved(s, "in"), |saved| {
                    let again = match saved {
                        bilin::search::json::Saved::Checkpoint(c) => checkpoint_to_json(c),
                        bilin::search::json::Saved::Scheme(s) => scheme_to_json(s),
                    };
                    assert_eq!(&parse_saved(&again.to_string(), "rt").unwrap(), saved);
                })
            }),
            cli: &["merge", "--tensor", "matmul:2,2,2", "{}"],
            suffix: "",
        },
    ]
}

/// The refusal is located inside the input.
fn check_located(e: &Error, text: &str, source: &str, input: &[u8]) {
    match e {
        Error::Parse { at, message } => {
            let lines = text.split('\n').count().max(1);
            assert_eq!(at.source, source);
            assert!(
                at.line >= 1 && at.line <= lines + 1 && at.column >= 1,
                "position {at} outside the input ({lines} lines): {message}\ninput: {:?}",
                String::from_utf8_lossy(input)
            );
            assert!(!message.trim().is_empty());
        }
        Error::Data { file, at, message } => {
            assert_eq!(file, source);
            assert!(
                at.starts_with("byte ") || at.starts_with("element ["),
                "not located: {at}"
            );
            assert!(!message.trim().is_empty());
        }
        other => panic!(
            "an unlocated refusal: {other}\ninput: {:?}",
            String::from_utf8_lossy(input)
        ),
    }
}

#[derive(Default)]
struct Tally {
    cases: u64,
    accepted: u64,
    refused: u64,
    panics: u64,
}

#[test]
fn every_reader_survives_mutated_inputs() {
    let readers = readers();
    let per_reader = env_u64("BILIN_FUZZ_CASES", 3500) / readers.len() as u64;
    let seed = env_u64("BILIN_FUZZ_SEED", 20_240_611);
    let mut tallies: BTreeMap<&str, Tally> = BTreeMap::new();
    let mut failures = Vec::new();
    // silence the default panic message; panics are counted and reported below
    let hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(|_| {}));
    for (ri, r) in readers.iter().enumerate() {
        let mut rng = ChaCha8Rng::seed_from_u64(seed ^ (ri as u64).wrapping_mul(0x9E37_79B9));
        let tally = tallies.entry(r.name).or_default();
        for case in 0..per_reader {
            let base = &r.seeds[rng.gen_range(0..r.seeds.len())];
            let other = &r.seeds[rng.gen_range(0..r.seeds.len())];
            let input = mutate(base, other, &mut rng);
            tally.cases += 1;
            let outcome = catch_unwind(AssertUnwindSafe(|| match (r.read)(&input) {
                Verdict::Accepted => true,
                Verdict::Refused(e) => {
                    check_located(&e, &String::from_utf8_lossy(&input), "in", &input);
                    false
                }
            }));
            match outcome {
                Ok(true) => tally.accepted += 1,
                Ok(false) => tally.refused += 1,
                Err(p) => {
                    tally.panics += 1;
                    let msg = p
                        .downcast_ref::<String>()
                        .cloned()
                        .or_else(|| p.downcast_ref::<&str>().map(|s| s.to_string()))
                        .unwrap_or_default();
                    if failures.len() < 5 {
                        failures.push(format!("{} case {case}: {msg}", r.name));
                    }
                }
            }
        }
    }
    std::panic::set_hook(hook);
    let mut total = Tally::default();
    eprintln!("fuzz seed {seed}: reader, cases, accepted, refused (exit 2), panics");
    for (name, t) in &tallies {
        eprintln!(
            "  {name:<12} {:>8} {:>8} {:>8} {:>3}",
            t.cases, t.accepted, t.refused, t.panics
        );
        total.cases += t.cases;
        total.accepted += t.accepted;
        total.refused += t.refused;
        total.panics += t.panics;
    }
    eprintln!(
        "  {:<12} {:>8} {:>8} {:>8} {:>3}",
        "all", total.cases, total.accepted, total.refused, total.panics
    );
    assert!(failures.is_empty(), "{}", failures.join("\n"));
    // the mutations reach both outcomes of every reader
    for (name, t) in &tallies {
        assert!(
            t.accepted > 0 && t.refused > 0,
            "{name}: {} accepted, {} refused",
            t.accepted,
            t.refused
        );
    }
}

#[test]
fn the_binary_exits_cleanly_on_mutated_files() {
    let all = readers();
    let per_reader = env_u64("BILIN_FUZZ_CLI_CASES", 140) / all.len() as u64;
    let seed = env_u64("BILIN_FUZZ_SEED", 20_240_611) ^ 0xC11;
    let dir = std::env::temp_dir().join(format!("bilin-fuzz-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let mut exits: BTreeMap<i32, u64> = BTreeMap::new();
    let mut cases = 0;
    for (ri, r) in all.iter().enumerate() {
        let mut rng = ChaCha8Rng::seed_from_u64(seed ^ (ri as u64).wrapping_mul(0x9E37_79B9));
        for case in 0..per_reader {
            let base = &r.seeds[rng.gen_range(0..r.seeds.len())];
            let other = &r.seeds[rng.gen_range(0..r.seeds.len())];
            let input = mutate(base, other, &mut rng);
            let path = dir.join(format!("{}-{case}{}", r.name, r.suffix));
            std::fs::write(&path, &input).unwrap();
            let p = path.to_str().unwrap();
            let args: Vec<&str> = r
                .cli
                .iter()
                .map(|a| if *a == "{}" { p } else { a })
                .collect();
            let o = std::process::Command::new(env!("CARGO_BIN_EXE_bilin"))
                .args(&args)
                .output()
                .unwrap();
            cases += 1;
            let code = o.status.code().unwrap_or(-1);
            *exits.entry(code).or_default() += 1;
            let err = String::from_utf8_lossy(&o.stderr);
            let shown = String::from_utf8_lossy(&input);
            assert!(
                [0, 1, 2].contains(&code),
                "{args:?} exited {code}: {err}\ninput: {shown:?}"
            );
            assert!(
                !err.contains("panicked")
                    && !err.contains("backtrace")
                    && !err.contains("internal error"),
                "{args:?}: {err}"
            );
            if code == 2 {
                let first = err.lines().next().unwrap_or("");
                assert!(
                    first.starts_with(&format!("error: {p}:")),
                    "{args:?}: not located: {err}\ninput: {shown:?}"
                );
            }
        }
    }
    std::fs::remove_dir_all(&dir).ok();
    eprintln!("binary: {cases} files, exits by code: {exits:?}");
}
