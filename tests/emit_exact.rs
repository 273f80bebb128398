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

use common::run as bilin;
use std::process::Command;

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

fn tmpdir(tag: &str) -> std::path::PathBuf {
    let d = std::env::temp_dir().join(format!("bilin-emit-exact-{tag}-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn have(cmd: &str, arg: &str) -> bool {
    Command::new(cmd)
        .arg(arg)
        .output()
        .is_ok_and(|o| o.status.success())
}

/// Mismatch counts printed by a harness, one line `name mismatches N`.
fn check_output(out: &std::process::Output, expect: usize) {
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success(),
        "{text}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), expect, "{text}");
    for l in lines {
        assert!(l.ends_with("mismatches 0"), "{l}");
    }
}

#[test]
fn emitted_c_is_exact() {
    if !have("cc", "--version") {
        eprintln!("note: no C compiler (cc); skipping the emitted C test");
        return;
    }
    let mut prog = String::from("#include <stdio.h>\n#include <stdint.h>\n");
    let mut main = String::from(
        "static uint64_t st = 0x9E3779B97F4A7C15ULL;\n\
         static uint64_t next(void) { st ^= st << 13; st ^= st >> 7; st ^= st << 17; return st; }\n\
         /* uniform in [-x, x], one in eight draws exactly -x or x */\n\
         static int64_t draw(int64_t x) { uint64_t r = next();\n\
           if ((r & 7) == 0) return (r & 8) ? x : -x;\n\
           return (int64_t)((unsigned __int128)next() % (unsigned __int128)(2 * (__int128)x + 1) - (__int128)x); }\n\
         int main(void) {\n",
    );
    for (n, c) in SCHEMES.iter().enumerate() {
        let f = format!("scheme{n}");
        let (code, bound) = emit(c, "c", &f);
        let (entries, d, p) = tensor(c.input, c.field);
        // one P per program: the only modular scheme defines it
        prog.push_str(&code.replace("#include <stdint.h>", ""));
        let wide = code.contains("__int128 *c");
        let (in_ty, out_ty) = match (p, wide) {
            (0, false) => ("int64_t", "int64_t"),
            (0, true) => ("int64_t", "__int128"),
            _ => ("uint64_t", "uint64_t"),
        };
        let x = match p {
            0 => bound.expect("the header states the bound"),
            p => (p - 1).to_string(),
        };
        main.push_str(&format!(
            "  {{ long bad = 0; {in_ty} a[{}], b[{}]; {out_ty} c[{}]; __int128 r[{}];\n\
               for (long it = 0; it < {CASES}; it++) {{\n",
            d[0], d[1], d[2], d[2]
        ));
        if p == 0 {
            main.push_str(&format!(
                "    for (int i = 0; i < {}; i++) a[i] = draw({x}LL);\n\
                     for (int j = 0; j < {}; j++) b[j] = draw({x}LL);\n",
                d[0], d[1]
            ));
        } else {
            main.push_str(&format!(
                "    for (int i = 0; i < {}; i++) a[i] = (next() & 7) == 0 ? {x} : next() % {p};\n\
                     for (int j = 0; j < {}; j++) b[j] = (next() & 7) == 0 ? {x} : next() % {p};\n",
                d[0], d[1]
            ));
        }
        main.push_str(&format!(
            "    for (int k = 0; k < {}; k++) r[k] = 0;\n",
            d[2]
        ));
        for (i, j, k, v) in &entries {
            main.push_str(&format!(
                "    r[{k}] += (__int128){v} * (__int128)a[{i}] * (__int128)b[{j}];\n"
            ));
        }
        main.push_str(&format!(
            "    {f}(a, b, c);\n    for (int k = 0; k < {}; k++) {{\n",
            d[2]
        ));
        if p == 0 {
            main.push_str("      if ((__int128)c[k] != r[k]) bad++;\n");
        } else {
            main.push_str(&format!(
                "      __int128 m = r[k] % {p}; if (m < 0) m += {p};\n      if ((__int128)c[k] != m) bad++;\n"
            ));
        }
        main.push_str(&format!(
            "    }}\n  }}\n  printf(\"{f} mismatches %ld\\n\", bad); }}\n"
        ));
    }
    main.push_str("  return 0;\n}\n");
    let dir = tmpdir("c");
    std::fs::write(dir.join("t.c"), format!("{prog}\n{main}")).unwrap();
    let st = Command::new("cc")
        .current_dir(&dir)
        .args(["-O1", "-Wall", "-Werror", "-o", "t", "t.c"])
        .status()
        .unwrap();
    assert!(st.success(), "the emitted C does not compile cleanly");
    check_output(
        &Command::new(dir.join("t")).output().unwrap(),
        SCHEMES.len(),
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn emitted_rust_is_exact() {
    if !have("rustc", "--version") {
        eprintln!("note: no rustc; skipping the emitted Rust test");
        return;
    }
    let mut prog = String::new();
    let mut main = String::from(
        "struct Rng(u64);\n\
         impl Rng { fn next(&mut self) -> u64 { let mut x = self.0; x ^= x << 13; x ^= x >> 7; x ^= x << 17; self.0 = x; x }\n\
           fn draw(&mut self, x: i64) -> i64 { let r = self.next();\n\
             if r & 7 == 0 { return if r & 8 != 0 { x } else { -x }; }\n\
             ((self.next() as u128 % (2 * x as u128 + 1)) as i128 - x as i128) as i64 } }\n\
         fn main() {\n    let mut g = Rng(0x9E3779B97F4A7C15);\n",
    );
    for (n, c) in SCHEMES.iter().enumerate() {
        let f = format!("scheme{n}");
        let (code, bound) = emit(c, "rust", &f);
        let (entries, d, p) = tensor(c.input, c.field);
        prog.push_str(&format!("mod m{n} {{\n{code}}}\nuse m{n}::{f};\n"));
        let wide = code.contains("c: &mut [i128]");
        let (in_ty, out_ty) = match (p, wide) {
            (0, false) => ("i64", "i64"),
            (0, true) => ("i64", "i128"),
            _ => ("u64", "u64"),
        };
        main.push_str(&format!(
            "    {{ let mut bad = 0u64; let mut a = [0 as {in_ty}; {}]; let mut b = [0 as {in_ty}; {}]; let mut c = [0 as {out_ty}; {}];\n\
               for _ in 0..{CASES} {{\n",
            d[0], d[1], d[2]
        ));
        if p == 0 {
            let x = bound.expect("the header states the bound");
            main.push_str(&format!(
                "        for v in a.iter_mut() {{ *v = g.draw({x}); }}\n        for v in b.iter_mut() {{ *v = g.draw({x}); }}\n"
            ));
        } else {
            main.push_str(&format!(
                "        for v in a.iter_mut() {{ *v = if g.next() & 7 == 0 {{ {} }} else {{ g.next() % {p} }}; }}\n\
                         for v in b.iter_mut() {{ *v = if g.next() & 7 == 0 {{ {} }} else {{ g.next() % {p} }}; }}\n",
                p - 1,
                p - 1
            ));
        }
        main.push_str(&format!("        let mut r = [0i128; {}];\n", d[2]));
        for (i, j, k, v) in &entries {
            main.push_str(&format!(
                "        r[{k}] += {v}i128 * a[{i}] as i128 * b[{j}] as i128;\n"
            ));
        }
        main.push_str(&format!(
            "        {f}(&a, &b, &mut c);\n        for k in 0..{} {{\n",
            d[2]
        ));
        if p == 0 {
            main.push_str("            if c[k] as i128 != r[k] { bad += 1; }\n");
        } else {
            main.push_str(&format!(
                "            if c[k] as i128 != r[k].rem_euclid({p}) {{ bad += 1; }}\n"
            ));
        }
        main.push_str(&format!(
            "        }}\n    }}\n    println!(\"{f} mismatches {{}}\", bad); }}\n"
        ));
    }
    main.push_str("}\n");
    let dir = tmpdir("rs");
    std::fs::write(dir.join("t.rs"), format!("{prog}\n{main}")).unwrap();
    let o = Command::new("rustc")
        .current_dir(&dir)
        .args([
            "--edition",
            "2021",
            "-O",
            "-D",
            "warnings",
            "-o",
            "t",
            "t.rs",
        ])
        .output()
        .unwrap();
    assert!(
        o.status.success(),
        "the emitted Rust does not compile cleanly:\n{}",
        String::from_utf8_lossy(&o.stderr)
    );
    check_output(
        &Command::new(dir.join("t")).output().unwrap(),
        SCHEMES.len(),
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn emitted_python_is_exact() {
    if !have("python3", "--version") {
        eprintln!("note: python3 not found; skipping the emitted Python test");
        return;
    }
    let mut prog = String::from("import random\n\n");
    let mut main = String::from("rng = random.Random(2024)\n");
    for (n, c) in SCHEMES.iter().enumerate() {
        let f = format!("scheme{n}");
        let (code, _) = emit(c, "python", &f);
        let (_, c_bound) = emit(c, "c", &format!("c{n}"));
        let (entries, d, p) = tensor(c.input, c.field);
        // one modular scheme: its `P` is the only one in the program
        prog.push_str(&code);
        prog.push('\n');
        // Python ints are unbounded: draw at the C bound and far beyond it
        let x = match p {
            0 => format!("max({}, 10**30)", c_bound.expect("bound")),
            p => (p - 1).to_string(),
        };
        let draw = if p == 0 {
            format!("(rng.choice([-{x}, {x}]) if rng.random() < 0.125 else rng.randint(-{x}, {x}))")
        } else {
            format!("({x} if rng.random() < 0.125 else rng.randrange({p}))")
        };
        main.push_str(&format!(
            "bad = 0\nfor _ in range({CASES}):\n    a = [{draw} for _ in range({})]\n    b = [{draw} for _ in range({})]\n    r = [0] * {}\n",
            d[0], d[1], d[2]
        ));
        for (i, j, k, v) in &entries {
            main.push_str(&format!("    r[{k}] += {v} * a[{i}] * b[{j}]\n"));
        }
        if p != 0 {
            main.push_str(&format!("    r = [x % {p} for x in r]\n"));
        }
        main.push_str(&format!(
            "    if {f}(a, b) != r:\n        bad += 1\nprint('{f} mismatches', bad)\n"
        ));
    }
    let dir = tmpdir("py");
    std::fs::write(dir.join("t.py"), format!("{prog}\n{main}")).unwrap();
    check_output(
        &Command::new("python3")
            .arg(dir.join("t.py"))
            .output()
            .unwrap(),
        SCHEMES.len(),
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn default_is_exact_and_float_states_its_rounding() {
    // Toom-3 in C: exact integers by default, doubles only on request
    let (code, out, _) = bilin(&[
        "emit",
        "poly:3,3",
        "examples/schemes/toom3.txt",
        "--lang",
        "c",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("int64_t") && !out.contains("double"), "{out}");
    assert!(out.contains("no intermediate value overflows"), "{out}");
    let (code, out, _) = bilin(&[
        "emit",
        "poly:3,3",
        "examples/schemes/toom3.txt",
        "--lang",
        "c",
        "--arith",
        "float",
    ]);
    assert_eq!(code, 0);
    assert!(
        out.contains("double") && out.contains("rounded once"),
        "{out}"
    );
    // the product labels of the file survive
    assert!(out.contains("pinf"), "{out}");
    // a bound beyond 128 bits is refused with exit 2
    let (code, _, err) = bilin(&[
        "emit",
        "poly:3,3",
        "examples/schemes/toom3.txt",
        "--lang",
        "rust",
        "--bound",
        "100000000000000000000000000000000000",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("128-bit"), "{err}");
}
