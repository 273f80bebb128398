//! Arrays as data tools write them, and the examples of docs/formats.md.
//!
//! - Every example file under `examples/inputs/` appears verbatim in docs/formats.md and
//!   reads; the four forms of the same array (`.npy`, CSV slices, CSV long form, nested
//!   JSON list) read back equal.
//! - A planted tensor (seeded, with integers, halves and a 2^64 entry) is written by
//!   numpy (int64, float64 in Fortran order, float32, big-endian), by Python's `csv`
//!   module (both layouts) and by `json.dump` of a nested list, from its coordinate JSON
//!   form; every file reads back equal to the coordinate JSON (numpy, common practice as
//!   the reference writer of `.npy`). Skipped with a note when Python or numpy is missing.

use bilin::input::{ReadOptions, load_input, load_input_with, parse_json, write_json};
use bilin::scalar::{FieldSpec, Q};
use bilin::tensor::{Kind, Tensor};
use num_bigint::BigInt;
use rand::{Rng, SeedableRng};
use std::path::PathBuf;
use std::process::Command;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn example(name: &str) -> String {
    root()
        .join("examples/inputs")
        .join(name)
        .to_string_lossy()
        .into_owned()
}

/// The lines of a text without line ends and surrounding spaces, empty lines dropped.
fn trimmed(s: &str) -> Vec<String> {
    s.lines()
        .map(|l| l.trim().to_string())
        .filter(|l| !l.is_empty())
        .collect()
}

#[test]
fn the_documented_examples_read_and_appear_in_the_docs() {
    let doc = std::fs::read_to_string(root().join("docs/formats.md")).unwrap();
    let doc_lines = trimmed(&doc);
    let mut names: Vec<String> = std::fs::read_dir(root().join("examples/inputs"))
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    assert!(names.len() >= 8, "{names:?}");
    for name in &names {
        assert!(
            doc.contains(&format!("examples/inputs/{name}")),
            "docs/formats.md does not name {name}"
        );
        let t = load_input(&example(name), None).unwrap_or_else(|e| panic!("{name}: {e}"));
        assert!(t.nnz() > 0, "{name}");
        if name.ends_with(".npy") {
            continue;
        }
        let want = trimmed(&std::fs::read_to_string(example(name)).unwrap());
        let found = doc_lines
            .windows(want.len())
            .any(|w| w.iter().zip(&want).all(|(a, b)| a == b));
        assert!(found, "docs/formats.md does not show {name} verbatim");
    }
    // one array in four forms
    let npy = load_input(&example("counts.npy"), None).unwrap();
    assert_eq!(npy.kind(), Kind::Bilinear);
    assert_eq!(npy.dims(), [2, 3, 2]);
    for other in ["counts_slices.csv", "counts_long.csv", "counts_nested.json"] {
        assert_eq!(load_input(&example(other), None).unwrap(), npy, "{other}");
    }
    // the table form with slices holds the same numbers under other names
    let sl = load_input(&example("counts_slices.bilin"), None).unwrap();
    assert_eq!(
        sl.entries()
            .map(|(i, j, k, v)| (i, j, k, v.clone()))
            .collect::<Vec<_>>(),
        npy.entries()
            .map(|(i, j, k, v)| (i, j, k, v.clone()))
            .collect::<Vec<_>>()
    );
    // brackets give the full table
    let sl2 = load_input(&example("sl2_brackets.bilin"), None).unwrap();
    let full = "basis h e f\nh*e = 2e\ne*h = -2e\nh*f = -2f\nf*h = 2f\ne*f = h\nf*e = -h\n";
    assert_eq!(sl2, bilin::input::parse_table(full, "full").unwrap());
}

/// The python snippet of docs/formats.md writes the committed `counts.npy`, byte for byte.
#[test]
fn the_documented_numpy_snippet_writes_the_example() {
    let Some(dir) = python_dir("snippet") else {
        return;
    };
    let doc = std::fs::read_to_string(root().join("docs/formats.md")).unwrap();
    let start = doc.find("```python\n").expect("a python block") + 10;
    let end = start + doc[start..].find("```").unwrap();
    let code: String = doc[start..end]
        .lines()
        .map(|l| l.trim_start())
        .collect::<Vec<_>>()
        .join("\n");
    assert!(run_python(&dir, &code));
    let ours = std::fs::read(dir.join("counts.npy")).unwrap();
    let committed = std::fs::read(example("counts.npy")).unwrap();
    assert_eq!(ours, committed);
}

/// A scratch directory when python3 with numpy runs, else `None` with a note.
fn python_dir(tag: &str) -> Option<PathBuf> {
    let ok = Command::new("python3")
        .args(["-c", "import numpy"])
        .output()
        .map(|o| o.status.success())
        .unwrap_or(false);
    if !ok {
        eprintln!("note: python3 with numpy is not available; skipping the numpy test ({tag})");
        return None;
    }
    let dir = std::env::temp_dir().join(format!("bilin-arrays-{tag}-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    Some(dir)
}

fn run_python(dir: &PathBuf, code: &str) -> bool {
    let o = Command::new("python3")
        .arg("-c")
        .arg(code)
        .current_dir(dir)
        .output()
        .unwrap();
    if !o.status.success() {
        eprintln!("{}", String::from_utf8_lossy(&o.stderr));
    }
    o.status.success()
}

/// A planted 3 x 4 x 5 tensor: sparse integers and halves, one entry 2^64 (kept for the
/// exact forms only).
fn planted(big: bool) -> Tensor {
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(17);
    let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [3, 4, 5], None);
    for i in 0..3 {
        for j in 0..4 {
            for k in 0..5 {
                if rng.gen_bool(0.4) {
                    let n: i64 = rng.gen_range(-40..=40);
                    let d: i64 = if rng.gen_bool(0.3) { 2 } else { 1 };
                    t.set(i, j, k, Q::new(n.into(), d.into()));
                }
            }
        }
    }
    if big {
        t.set(2, 3, 4, Q::from_integer(BigInt::from(1u8) << 64));
    }
    t
}

#[test]
fn numpy_csv_and_nested_lists_read_back_the_planted_tensor() {
    let Some(dir) = python_dir("planted") else {
        return;
    };
    for (big, files) in [
        (
            false,
            vec![
                "t_f8_fortran.npy",
                "t_f4_big_endian.npy",
                "t_slices.csv",
                "t_long.csv",
                "t_nested.json",
                "t_nested_float.json",
            ],
        ),
        (true, vec!["t_long.csv", "t_slices.csv", "t_nested.json"]),
    ] {
        let t = planted(big);
        std::fs::write(dir.join("t.json"), write_json(&t)).unwrap();
        let code = r#"
import csv, json
from fractions import Fraction
import numpy as np
src = json.load(open("t.json"))
a, b, c = src["dims"]
exact = [[[Fraction(0)] * c for _ in range(b)] for _ in range(a)]
for i, j, k, v in src["entries"]:
    exact[i][j][k] = Fraction(v)
ints = all(exact[i][j][k].denominator == 1 for i in range(a) for j in range(b) for k in range(c))
small = all(abs(exact[i][j][k]) < 2**52 for i in range(a) for j in range(b) for k in range(c))
if small:
    T = np.array([[[float(x) for x in row] for row in m] for m in exact])
    np.save("t_f8_fortran.npy", np.asfortranarray(T))
    np.save("t_f4_big_endian.npy", T.astype(">f4"))
    if ints:
        np.save("t_i8.npy", T.astype(np.int64))
    json.dump(T.tolist(), open("t_nested_float.json", "w"))
def cell(x):
    return str(x.numerator) if x.denominator == 1 else str(x)
with open("t_slices.csv", "w", newline="") as f:
    w = csv.writer(f)
    for k in range(c):
        if k:
            w.writerow([])
        for i in range(a):
            w.writerow([cell(exact[i][j][k]) for j in range(b)])
with open("t_long.csv", "w", newline="") as f:
    w = csv.writer(f)
    w.writerow(["i", "j", "k", "value"])
    for i in range(a):
        for j in range(b):
            for k in range(c):
                if exact[i][j][k] != 0 or (i, j, k) == (a - 1, b - 1, c - 1):
                    w.writerow([i, j, k, cell(exact[i][j][k])])
nested = [[[(int(x) if x.denominator == 1 else str(x)) for x in row] for row in m] for m in exact]
json.dump(nested, open("t_nested.json", "w"))
"#;
        assert!(run_python(&dir, code));
        let want = parse_json(&std::fs::read_to_string(dir.join("t.json")).unwrap(), "t").unwrap();
        for f in files {
            let path = dir.join(f);
            let got =
                load_input(path.to_str().unwrap(), None).unwrap_or_else(|e| panic!("{f}: {e}"));
            assert_eq!(got, want, "{f}");
        }
        if !big {
            // integers only: the int64 form, read as an algebra it needs equal dimensions
            let e = load_input_with(
                dir.join("t_f8_fortran.npy").to_str().unwrap(),
                None,
                &ReadOptions {
                    algebra: true,
                    ..Default::default()
                },
            )
            .unwrap_err()
            .to_string();
            assert!(e.contains("--as-algebra needs an n x n x n array"), "{e}");
        }
    }
    std::fs::remove_dir_all(&dir).ok();
}
