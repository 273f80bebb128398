//! Recursive block code from `bilin emit --blocks`, compiled and run: C, Rust and Python
//! (numpy) products of integer matrices at sizes 64 to 300, divisible by the format or not,
//! equal the schoolbook product exactly. Schemes: Strassen 1969 and Winograd's variant
//! (from memory) for <2,2,2>, a rank-23 scheme for <3,3,3> found and polished by bilin
//! (Laderman 1976 showed rank 23 is reachable). Skips with a note when a compiler, Python
//! or numpy is missing.

mod common;

use common::{assert_no_mismatches, build_and_run, have, run as bilin, tmpdir};

const SCHEMES: &[(&str, &str)] = &[
    ("matmul:2,2,2", "examples/schemes/strassen.txt"),
    ("matmul:2,2,2", "examples/schemes/winograd.txt"),
    ("matmul:3,3,3", "examples/schemes/matmul333_23.txt"),
];

/// (N, M, P): square and rectangular, divisible by 2 or 3 or neither.
const SIZES: &[[usize; 3]] = &[
    [64, 64, 64],
    [65, 67, 70],
    [100, 128, 99],
    [127, 127, 127],
    [243, 81, 150],
    [300, 300, 300],
];

fn emit(input: &str, scheme: &str, lang: &str, function: &str, cutoff: &str) -> String {
    let (code, out, err) = bilin(&[
        "emit",
        input,
        scheme,
        "--lang",
        lang,
        "--blocks",
        "--cutoff",
        cutoff,
        "--function",
        function,
    ]);
    assert_eq!(code, 0, "{err}");
    out
}

#[test]
fn block_code_in_c_is_exact() {
    if !have("cc", &["--version"]) {
        eprintln!("note: no C compiler (cc); skipping the block code test in C");
        return;
    }
    let mut prog = String::from("#include <stdio.h>\n");
    for (n, (input, scheme)) in SCHEMES.iter().enumerate() {
        prog.push_str(&emit(input, scheme, "c", &format!("mm{n}"), "8"));
    }
    prog.push_str(
        "static uint64_t st = 0x2545F4914F6CDD1DULL;\n\
         static int64_t draw(void) { st ^= st << 13; st ^= st >> 7; st ^= st << 17; return (int64_t)(st % 2001) - 1000; }\n\
         int main(void) {\n",
    );
    let sizes: Vec<String> = SIZES
        .iter()
        .map(|s| format!("{{{}, {}, {}}}", s[0], s[1], s[2]))
        .collect();
    prog.push_str(&format!(
        "  static const size_t sz[][3] = {{{}}};\n\
           for (int s = 0; s < {}; s++) {{\n\
             size_t N = sz[s][0], M = sz[s][1], P = sz[s][2];\n\
             int64_t *A = malloc(N * M * 8), *B = malloc(M * P * 8), *C = malloc(N * P * 8), *R = malloc(N * P * 8);\n\
             for (size_t i = 0; i < N * M; i++) A[i] = draw();\n\
             for (size_t i = 0; i < M * P; i++) B[i] = draw();\n\
             for (size_t i = 0; i < N; i++) for (size_t j = 0; j < P; j++) {{\n\
               int64_t x = 0; for (size_t k = 0; k < M; k++) x += A[i * M + k] * B[k * P + j]; R[i * P + j] = x; }}\n",
        sizes.join(", "),
        SIZES.len()
    ));
    for n in 0..SCHEMES.len() {
        prog.push_str(&format!(
            "    {{ long bad = 0; mm{n}(N, M, P, A, M, B, P, C, P);\n\
                  for (size_t i = 0; i < N * P; i++) bad += C[i] != R[i];\n\
                  printf(\"mm{n} %zux%zux%zu mismatches %ld\\n\", N, M, P, bad); }}\n"
        ));
    }
    prog.push_str("    free(A); free(B); free(C); free(R);\n  }\n  return 0;\n}\n");
    let dir = tmpdir("blocks-c");
    let out = build_and_run(&dir, "c", &prog);
    assert_no_mismatches(&out, SCHEMES.len() * SIZES.len());
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn block_code_in_rust_is_exact() {
    if !have("rustc", &["--version"]) {
        eprintln!("note: no rustc; skipping the block code test in Rust");
        return;
    }
    let mut prog = String::new();
    for (n, (input, scheme)) in SCHEMES.iter().enumerate() {
        let code = emit(input, scheme, "rust", "mm", "8");
        prog.push_str(&format!("mod m{n} {{\n{code}}}\n"));
    }
    let sizes: Vec<String> = SIZES
        .iter()
        .map(|s| format!("[{}, {}, {}]", s[0], s[1], s[2]))
        .collect();
    prog.push_str(&format!(
        "fn main() {{\n    let mut st: u64 = 0x2545F4914F6CDD1D;\n\
         let mut draw = || {{ st ^= st << 13; st ^= st >> 7; st ^= st << 17; (st % 2001) as i64 - 1000 }};\n\
         for [n, m, p] in [{}] {{\n\
           let a: Vec<i64> = (0..n * m).map(|_| draw()).collect();\n\
           let b: Vec<i64> = (0..m * p).map(|_| draw()).collect();\n\
           let mut r = vec![0i64; n * p];\n\
           for i in 0..n {{ for k in 0..m {{ for j in 0..p {{ r[i * p + j] += a[i * m + k] * b[k * p + j]; }} }} }}\n",
        sizes.join(", ")
    ));
    for n in 0..SCHEMES.len() {
        prog.push_str(&format!(
            "    let mut c = vec![0i64; n * p];\n    m{n}::mm(n, m, p, &a, m, &b, p, &mut c, p);\n\
                 println!(\"mm{n} {{n}}x{{m}}x{{p}} mismatches {{}}\", c.iter().zip(&r).filter(|(x, y)| x != y).count());\n"
        ));
    }
    prog.push_str("    }\n}\n");
    let dir = tmpdir("blocks-rs");
    let out = build_and_run(&dir, "rust", &prog);
    assert_no_mismatches(&out, SCHEMES.len() * SIZES.len());
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn block_code_in_python_is_exact() {
    if !have("python3", &["-c", "import numpy"]) {
        eprintln!("note: python3 with numpy not found; skipping the block code test in Python");
        return;
    }
    let mut prog = String::from("import numpy as np\n");
    for (n, (input, scheme)) in SCHEMES.iter().enumerate() {
        prog.push_str(&emit(input, scheme, "python", &format!("mm{n}"), "16"));
        prog.push('\n');
    }
    let sizes: Vec<String> = SIZES
        .iter()
        .map(|s| format!("({}, {}, {})", s[0], s[1], s[2]))
        .collect();
    prog.push_str(&format!(
        "rng = np.random.default_rng(7)\nfor n, m, p in [{}]:\n\
         \x20   A = rng.integers(-1000, 1001, size=(n, m), dtype=np.int64)\n\
         \x20   B = rng.integers(-1000, 1001, size=(m, p), dtype=np.int64)\n\
         \x20   R = A @ B\n",
        sizes.join(", ")
    ));
    for n in 0..SCHEMES.len() {
        prog.push_str(&format!(
            "    C = mm{n}(A, B)\n    print(f'mm{n} {{n}}x{{m}}x{{p}} mismatches', int((C != R).sum()))\n"
        ));
    }
    let dir = tmpdir("blocks-py");
    let out = build_and_run(&dir, "python", &prog);
    assert_no_mismatches(&out, SCHEMES.len() * SIZES.len());
    let _ = std::fs::remove_dir_all(&dir);
}
