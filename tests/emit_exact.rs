//! Emitted exact code, compiled and run: C, Rust and Python functions from `bilin emit`
//! equal the schoolbook product (computed in the same program from the tensor's structure
//! constants, in 128-bit or unbounded integers) on 10^5 seeded random integer inputs each,
//! one in eight of them at the bound stated in the header. Skips with a note when a
//! compiler or Python is missing.
//!
//! Schemes: Strassen 1969 (`matmul:2,2,2`, from memory); Toom-3 (Toom 1963, Cook 1966:
//! evaluation at 0, 1, -1, 2, infinity, coefficients 1/2, 1/3, 1/6); a rank-6 scheme for
//! `poly:3,4` (evaluation at 0, +-1, +-2, infinity, denominators up to 24); Winograd's
//! variant over GF(7).

mod common;

use common::{assert_no_mismatches, build_and_run, have, run as bilin, tmpdir};

const CASES: u64 = 100_000;

struct Case {
    input: &'static str,
    scheme: &'static str,
    field: Option<&'static str>,
    /// An input bound that needs 128-bit code (`--bound`).
    bound: Option<&'static str>,
}

const SCHEMES: &[Case] = &[
    Case {
        input: "matmul:2,2,2",
        scheme: "examples/schemes/strassen.txt",
        field: None,
        bound: None,
    },
    Case {
        input: "poly:3,3",
        scheme: "examples/schemes/toom3.txt",
        field: None,
        bound: None,
    },
    Case {
        input: "poly:3,4",
        scheme: "examples/schemes/toom_3x4.txt",
        field: None,
        bound: None,
    },
    Case {
        input: "matmul:2,2,2",
        scheme: "examples/schemes/winograd.txt",
        field: Some("GF(7)"),
        bound: None,
    },
    Case {
        input: "poly:3,4",
        scheme: "examples/schemes/toom_3x4.txt",
        field: None,
        bound: Some("1000000000000"),
    },
];

/// Nonzero structure constants (i, j, k, c).
type Entries = Vec<(usize, usize, usize, i64)>;

/// The structure constants of an input, dims, and the field's p (0 for Q).
fn tensor(input: &str, field: Option<&str>) -> (Entries, [usize; 3], u64) {
    let f = field.map(|f| bilin::scalar::FieldSpec::parse(f).unwrap());
    let t = bilin::input::load_input(input, f).unwrap();
    let entries = t
        .entries()
        .map(|(i, j, k, c)| {
            assert!(c.is_integer());
            (i, j, k, c.to_integer().try_into().unwrap())
        })
        .collect();
    (entries, t.dims(), t.field().characteristic())
}

/// Emit with the binary; returns the code and the stated input bound.
fn emit(c: &Case, lang: &str, function: &str) -> (String, Option<String>) {
    let mut args = vec![
        "emit",
        c.input,
        c.scheme,
        "--lang",
        lang,
        "--function",
        function,
    ];
    if let Some(f) = c.field {
        args.extend(["--field", f]);
    }
    if let Some(b) = c.bound {
        args.extend(["--bound", b]);
    }
    let (code, out, err) = bilin(&args);
    assert_eq!(code, 0, "{err}");
    let bound = out.lines().find_map(|l| {
        let rest = l.split("|b[j]| <= ").nth(1)?;
        Some(rest.split_whitespace().next()?.to_string())
    });
    (out, bound)
}

#[derive(Clone, Copy, PartialEq, Eq)]
enum Target {
    C,
    Rust,
    Python,
}

impl Target {
    fn lang(self) -> &'static str {
        match self {
            Target::C => "c",
            Target::Rust => "rust",
            Target::Python => "python",
        }
    }
}

/// The program header: a seeded xorshift generator with `draw(x)` (uniform in [-x, x],
/// one draw in eight exactly -x or x) and `residue(p)` (in 0..p, one in eight p - 1).
fn prelude(t: Target) -> &'static str {
    match t {
        Target::C => {
            "#include <stdio.h>\n#include <stdint.h>\n\
             static uint64_t st = 0x9E3779B97F4A7C15ULL;\n\
             static uint64_t next(void) { st ^= st << 13; st ^= st >> 7; st ^= st << 17; return st; }\n\
             static int64_t draw(int64_t x) { uint64_t r = next();\n\
               if ((r & 7) == 0) return (r & 8) ? x : -x;\n\
               return (int64_t)((unsigned __int128)next() % (unsigned __int128)(2 * (__int128)x + 1) - (__int128)x); }\n\
             static uint64_t residue(uint64_t p) { return (next() & 7) == 0 ? p - 1 : next() % p; }\n"
        }
        Target::Rust => {
            "struct Rng(u64);\n\
             impl Rng { fn next(&mut self) -> u64 { let mut x = self.0; x ^= x << 13; x ^= x >> 7; x ^= x << 17; self.0 = x; x }\n\
               fn draw(&mut self, x: i64) -> i64 { let r = self.next();\n\
                 if r & 7 == 0 { return if r & 8 != 0 { x } else { -x }; }\n\
                 ((self.next() as u128 % (2 * x as u128 + 1)) as i128 - x as i128) as i64 }\n\
               fn residue(&mut self, p: u64) -> u64 { if self.next() & 7 == 0 { p - 1 } else { self.next() % p } } }\n"
        }
        Target::Python => {
            "import random\nrng = random.Random(2024)\n\
             def draw(x):\n    return rng.choice([-x, x]) if rng.random() < 0.125 else rng.randint(-x, x)\n\
             def residue(p):\n    return p - 1 if rng.random() < 0.125 else rng.randrange(p)\n"
        }
    }
}

/// One test program: every scheme of SCHEMES emitted for `t` and checked against the
/// schoolbook product on CASES inputs; prints `schemeN mismatches K` per scheme.
fn harness(t: Target) -> String {
    let (mut prog, mut main) = (prelude(t).to_string(), String::new());
    for (n, c) in SCHEMES.iter().enumerate() {
        let f = format!("scheme{n}");
        let (code, bound) = emit(c, t.lang(), &f);
        let (entries, d, p) = tensor(c.input, c.field);
        let wide = code.contains("__int128 *c") || code.contains("c: &mut [i128]");
        match t {
            Target::C => prog.push_str(&code.replace("#include <stdint.h>", "")),
            Target::Rust => prog.push_str(&format!("mod m{n} {{\n{code}}}\nuse m{n}::{f};\n")),
            Target::Python => prog.push_str(&code),
        }
        // inputs: at the stated bound (Python: also far beyond the 64-bit one)
        let input = match (p, t) {
            (0, Target::Python) => {
                let x = emit(c, "c", "c_bound").1.expect("bound");
                format!("draw(max({x}, 10**30))")
            }
            (0, Target::Rust) => format!("g.draw({})", bound.expect("bound")),
            (0, _) => format!("draw({}LL)", bound.expect("bound")),
            (p, Target::Rust) => format!("g.residue({p})"),
            (p, _) => format!("residue({p})"),
        };
        let (ity, oty) = match (p, wide, t) {
            (0, false, Target::C) => ("int64_t", "int64_t"),
            (0, true, Target::C) => ("int64_t", "__int128"),
            (_, _, Target::C) => ("uint64_t", "uint64_t"),
            (0, false, _) => ("i64", "i64"),
            (0, true, _) => ("i64", "i128"),
            _ => ("u64", "u64"),
        };
        main.push_str(&match t {
            Target::C => format!(
                "  {{ long bad = 0; {ity} a[{0}], b[{1}]; {oty} c[{2}]; __int128 r[{2}];\n\
                   for (long it = 0; it < {CASES}; it++) {{\n\
                     for (int i = 0; i < {0}; i++) a[i] = {input};\n\
                     for (int j = 0; j < {1}; j++) b[j] = {input};\n\
                     for (int k = 0; k < {2}; k++) r[k] = 0;\n",
                d[0], d[1], d[2]
            ),
            Target::Rust => format!(
                "    {{ let mut bad = 0u64; let mut a = [0 as {ity}; {}]; let mut b = [0 as {ity}; {}]; let mut c = [0 as {oty}; {}];\n\
                     for _ in 0..{CASES} {{\n\
                       for v in a.iter_mut() {{ *v = {input}; }}\n\
                       for v in b.iter_mut() {{ *v = {input}; }}\n\
                       let mut r = [0i128; {}];\n",
                d[0], d[1], d[2], d[2]
            ),
            Target::Python => format!(
                "bad = 0\nfor _ in range({CASES}):\n    a = [{input} for _ in range({})]\n    b = [{input} for _ in range({})]\n    r = [0] * {}\n",
                d[0], d[1], d[2]
            ),
        });
        // the schoolbook product from the structure constants, in wide integers
        for (i, j, k, v) in &entries {
            main.push_str(&match t {
                Target::C => format!("    r[{k}] += (__int128){v} * a[{i}] * (__int128)b[{j}];\n"),
                Target::Rust => {
                    format!("        r[{k}] += {v}i128 * a[{i}] as i128 * b[{j}] as i128;\n")
                }
                Target::Python => format!("    r[{k}] += {v} * a[{i}] * b[{j}]\n"),
            });
        }
        // over GF(p) the reference is reduced into 0..p
        let reduce = |e: &str| match (p, t) {
            (0, _) => e.to_string(),
            (_, Target::Rust) => format!("{e}.rem_euclid({p})"),
            (_, Target::C) => format!("(({e}) % {p} + {p}) % {p}"),
            _ => format!("({e}) % {p}"),
        };
        main.push_str(&match t {
            Target::C => format!(
                "    {f}(a, b, c);\n    for (int k = 0; k < {}; k++) if ((__int128)c[k] != {}) bad++;\n\
                   }}\n  printf(\"{f} mismatches %ld\\n\", bad); }}\n",
                d[2],
                reduce("r[k]")
            ),
            Target::Rust => format!(
                "        {f}(&a, &b, &mut c);\n        for k in 0..{} {{ if c[k] as i128 != {} {{ bad += 1; }} }}\n\
                     }}\n    println!(\"{f} mismatches {{}}\", bad); }}\n",
                d[2],
                reduce("r[k]")
            ),
            Target::Python => format!(
                "    if {f}(a, b) != [{} for x in r]:\n        bad += 1\nprint('{f} mismatches', bad)\n",
                reduce("x")
            ),
        });
    }
    match t {
        Target::C => format!("{prog}\nint main(void) {{\n{main}  return 0;\n}}\n"),
        Target::Rust => {
            format!("{prog}\nfn main() {{\n    let mut g = Rng(0x9E3779B97F4A7C15);\n{main}}}\n")
        }
        Target::Python => format!("{prog}\n{main}"),
    }
}

fn check_target(t: Target, tool: &str, probe: &[&str]) {
    if !have(tool, probe) {
        eprintln!(
            "note: {tool} not found; skipping the emitted {} test",
            t.lang()
        );
        return;
    }
    let dir = tmpdir(&format!("emit-{}", t.lang()));
    let out = build_and_run(&dir, t.lang(), &harness(t));
    assert_no_mismatches(&out, SCHEMES.len());
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn emitted_c_is_exact() {
    check_target(Target::C, "cc", &["--version"]);
}

#[test]
fn emitted_rust_is_exact() {
    check_target(Target::Rust, "rustc", &["--version"]);
}

#[test]
fn emitted_python_is_exact() {
    check_target(Target::Python, "python3", &["--version"]);
}

#[test]
fn default_is_exact_and_float_states_its_rounding() {
    // Toom-3 in C: exact integers by default, doubles only on request
    let toom3 = |extra: &[&str]| {
        let mut args = vec!["emit", "poly:3,3", "examples/schemes/toom3.txt"];
        args.extend(extra);
        bilin(&args)
    };
    let (code, out, _) = toom3(&["--lang", "c"]);
    assert_eq!(code, 0);
    assert!(out.contains("int64_t") && !out.contains("double"), "{out}");
    assert!(out.contains("no intermediate value overflows"), "{out}");
    let (code, out, _) = toom3(&["--lang", "c", "--arith", "float"]);
    assert_eq!(code, 0);
    assert!(
        out.contains("double") && out.contains("rounded once"),
        "{out}"
    );
    // the product labels of the file survive
    assert!(out.contains("pinf"), "{out}");
    // a bound beyond 128 bits is refused with exit 2
    let (code, _, err) = toom3(&[
        "--lang",
        "rust",
        "--bound",
        "100000000000000000000000000000000000",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("128-bit"), "{err}");
}
