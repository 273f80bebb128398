//! Block code benchmark: does a scheme beat the schoolbook product, and from which size?
//!
//! Emits recursive block code in C (`bilin emit --blocks`) for Strassen's scheme,
//! Winograd's variant, the rank-23 <3,3,3> and the rank-49 <4,4,4> schemes of
//! examples/schemes/, against a reference: the schoolbook product by recursive halving,
//! accumulating into C, with the same base kernel, cutoff, compiler and flags. One C program
//! per element type (int64_t, double) times every kernel at N x N sizes, interleaved, as
//! the minimum process CPU time over repetitions, and checks every product against the
//! reference (integers in [-1000, 1000]: equal; doubles uniform in [-1, 1): the largest
//! difference is reported). Prints per scheme the
//! crossover size (the smallest measured size from which the scheme is faster at every
//! larger measured size) and the speed ratio (reference time / scheme time) at the largest
//! size, as a markdown table.
//!
//! Run: `cargo bench --bench blocks` (sizes 128..4096, several minutes);
//! `SIZES=128,256,512 cargo bench --bench blocks` for a quick run; `CC`, `CFLAGS` and
//! `CUTOFF` override the compiler, flags (default `-O3 -march=native`) and cutoff (64).

use bilin::scheme::emit::{BlockParams, EmitParams, Lang, emit};
use bilin::scheme::{Scheme, parse_scheme};

use std::process::Command;

const SCHEMES: &[(&str, &str, &str)] = &[
    ("Strassen <2,2,2>, rank 7", "matmul:2,2,2", "strassen.txt"),
    ("Winograd <2,2,2>, rank 7", "matmul:2,2,2", "winograd.txt"),
    ("bilin <3,3,3>, rank 23", "matmul:3,3,3", "matmul333_23.txt"),
    ("bilin <4,4,4>, rank 49", "matmul:4,4,4", "matmul444_49.txt"),
];

fn env_or(k: &str, d: &str) -> String {
    std::env::var(k).unwrap_or_else(|_| d.to_string())
}

fn format_of(input: &str) -> [usize; 3] {
    let v: Vec<usize> = input["matmul:".len()..]
        .split(',')
        .map(|x| x.parse().expect("format"))
        .collect();
    [v[0], v[1], v[2]]
}

fn block_code(s: &Scheme, input: &str, f: &str, cutoff: usize) -> String {
    let t = bilin::input::load_input(input, None).expect("input");
    let p = EmitParams {
        function: f.into(),
        title: input.into(),
        blocks: Some(BlockParams {
            format: format_of(input),
            cutoff,
        }),
        ..EmitParams::default()
    };
    emit(s, &t, Lang::C, &p).expect("emit")
}

/// Kernel 0, the reference: the schoolbook product by recursive halving (uneven halves
/// for odd sizes) that accumulates straight into C, with the same base kernel and cutoff
/// as the schemes' block code.
fn reference(cutoff: usize) -> String {
    format!(
        "static void k0_rec(size_t N, size_t M, size_t P, const BILIN_T *A, size_t lda,\n\
         \x20   const BILIN_T *B, size_t ldb, BILIN_T *C, size_t ldc, int acc) {{\n\
         \x20 if (N / 2 < {cutoff} || M / 2 < {cutoff} || P / 2 < {cutoff}) {{ k1_base(N, M, P, A, lda, B, ldb, C, ldc, acc); return; }}\n\
         \x20 size_t n[2] = {{N / 2, N - N / 2}}, m[2] = {{M / 2, M - M / 2}}, p[2] = {{P / 2, P - P / 2}};\n\
         \x20 for (int i = 0; i < 2; i++) for (int k = 0; k < 2; k++) for (int j = 0; j < 2; j++)\n\
         \x20   k0_rec(n[i], m[j], p[k], A + i * n[0] * lda + j * m[0], lda, B + j * m[0] * ldb + k * p[0], ldb,\n\
         \x20          C + i * n[0] * ldc + k * p[0], ldc, acc || j > 0);\n}}\n\
         void k0(size_t N, size_t M, size_t P, const BILIN_T *A, size_t lda, const BILIN_T *B,\n\
         \x20   size_t ldb, BILIN_T *C, size_t ldc) {{ k0_rec(N, M, P, A, lda, B, ldb, C, ldc, 0); }}\n"
    )
}

/// The C driver: times every kernel (k0 is the reference) at every size.
fn driver(kernels: usize, sizes: &[usize]) -> String {
    let list: Vec<String> = sizes.iter().map(|s| s.to_string()).collect();
    let mut d = String::from(
        "#include <stdio.h>\n#include <time.h>\n#include <math.h>\n#include <string.h>\n\
         typedef void (*mm_t)(size_t, size_t, size_t, const BILIN_T *, size_t, const BILIN_T *, size_t, BILIN_T *, size_t);\n\
         static double cpu(void) { struct timespec t; clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t); return t.tv_sec + 1e-9 * t.tv_nsec; }\n\
         static uint64_t st = 0x9E3779B97F4A7C15ULL;\n\
         /* integers in [-1000, 1000]; doubles uniform in [-1, 1) */\n\
         static BILIN_T draw(void) { st ^= st << 13; st ^= st >> 7; st ^= st << 17;\n\
           if ((BILIN_T)0.5 == 0) return (BILIN_T)((int64_t)(st % 2001) - 1000);\n\
           return (BILIN_T)((double)(st >> 11) * 0x1.0p-52 - 1.0); }\n\
         int main(void) {\n",
    );
    let names: Vec<String> = (0..kernels).map(|k| format!("k{k}")).collect();
    d.push_str(&format!(
        "  mm_t ks[] = {{{}}};\n  const int nk = {kernels};\n  size_t sizes[] = {{{}}};\n",
        names.join(", "),
        list.join(", ")
    ));
    d.push_str(&format!(
        "  for (int si = 0; si < {}; si++) {{\n\
           size_t n = sizes[si];\n\
           BILIN_T *A = malloc(n * n * sizeof *A), *B = malloc(n * n * sizeof *B);\n\
           BILIN_T *R = malloc(n * n * sizeof *R), *C = malloc(n * n * sizeof *C);\n\
           for (size_t i = 0; i < n * n; i++) {{ A[i] = draw(); B[i] = draw(); }}\n\
           double best[16]; for (int k = 0; k < nk; k++) best[k] = 1e300;\n\
           double work = (double)n * n * n; int reps = work > 4e9 ? 1 : (int)(4e9 / work); if (reps > 9) reps = 9;\n\
           for (int r = 0; r < reps; r++)\n\
             for (int j = 0; j < nk; j++) {{\n\
               int k = (j + r) % nk;\n\
               double t0 = cpu(); ks[k](n, n, n, A, n, B, n, k == 0 ? R : C, n); double dt = cpu() - t0;\n\
               if (dt < best[k]) best[k] = dt;\n\
             }}\n\
           /* check every kernel against the reference, once more, untimed */\n\
           printf(\"size %zu ref %.6f\", n, best[0]);\n\
           for (int k = 1; k < nk; k++) {{\n\
             ks[k](n, n, n, A, n, B, n, C, n);\n\
             double err = 0; long bad = 0;\n\
             for (size_t i = 0; i < n * n; i++) {{ double e = fabs((double)C[i] - (double)R[i]); if (e > err) err = e; bad += C[i] != R[i]; }}\n\
             printf(\" | k%d %.6f mismatches %ld maxerr %.3g\", k, best[k], bad, err);\n\
           }}\n\
           printf(\"\\n\"); fflush(stdout);\n\
           free(A); free(B); free(R); free(C);\n\
         }}\n  return 0;\n}}\n",
        sizes.len()
    ));
    d
}

struct Row {
    size: usize,
    reference: f64,
    times: Vec<f64>,
    mismatches: Vec<u64>,
    errors: Vec<f64>,
}

fn parse(out: &str) -> Vec<Row> {
    out.lines()
        .filter(|l| l.starts_with("size "))
        .map(|l| {
            let parts: Vec<&str> = l.split(" | ").collect();
            let head: Vec<&str> = parts[0].split_whitespace().collect();
            let mut r = Row {
                size: head[1].parse().expect("size"),
                reference: head[3].parse().expect("time"),
                times: Vec::new(),
                mismatches: Vec::new(),
                errors: Vec::new(),
            };
            for p in &parts[1..] {
                let w: Vec<&str> = p.split_whitespace().collect();
                r.times.push(w[1].parse().expect("time"));
                r.mismatches.push(w[3].parse().expect("count"));
                r.errors.push(w[5].parse().expect("error"));
            }
            r
        })
        .collect()
}

fn main() {
    let sizes: Vec<usize> = env_or("SIZES", "128,256,512,1024,2048,4096")
        .split(',')
        .filter_map(|x| x.trim().parse().ok())
        .collect();
    let cc = env_or("CC", "cc");
    let cflags = env_or("CFLAGS", "-O3 -march=native");
    let cutoff: usize = env_or("CUTOFF", "64").parse().expect("CUTOFF");
    let dir = std::env::temp_dir().join(format!("bilin-bench-blocks-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temp dir");
    let mut code = String::new();
    for (k, (_, input, file)) in SCHEMES.iter().enumerate() {
        let t = bilin::input::load_input(input, None).expect("input");
        let path = format!("examples/schemes/{file}");
        let text = std::fs::read_to_string(&path).expect("example scheme");
        let s = parse_scheme(&text, &path, &t).expect("scheme");
        code.push_str(&block_code(&s, input, &format!("k{}", k + 1), cutoff));
    }
    code.push_str(&reference(cutoff));
    let version = Command::new(&cc)
        .arg("--version")
        .output()
        .map(|o| {
            String::from_utf8_lossy(&o.stdout)
                .lines()
                .next()
                .unwrap_or("")
                .to_string()
        })
        .unwrap_or_default();
    println!(
        "compiler: {version}; flags: {cflags}; cutoff {cutoff}; sizes {sizes:?}; times: minimum process CPU time"
    );
    for ty in ["int64_t", "double"] {
        let src = dir.join(format!("bench_{ty}.c"));
        std::fs::write(
            &src,
            format!(
                "#define BILIN_T {ty}\n{code}\n{}",
                driver(SCHEMES.len() + 1, &sizes)
            ),
        )
        .expect("write");
        let exe = dir.join(format!("bench_{ty}"));
        let mut args: Vec<String> = cflags.split_whitespace().map(String::from).collect();
        args.extend([
            "-o".into(),
            exe.to_string_lossy().into_owned(),
            src.to_string_lossy().into_owned(),
            "-lm".into(),
        ]);
        let st = Command::new(&cc)
            .args(&args)
            .status()
            .expect("run the C compiler");
        assert!(st.success(), "compilation failed");
        let out = Command::new(&exe).output().expect("run");
        let text = String::from_utf8_lossy(&out.stdout);
        eprintln!("{text}");
        let rows = parse(&text);
        println!("\n### {ty}\n");
        let mut head = String::from("| scheme | crossover | ratio at the largest size |");
        let mut sep = String::from("|---|---|---|");
        for r in &rows {
            head.push_str(&format!(" {} |", r.size));
            sep.push_str("---|");
        }
        println!("{head}\n{sep}");
        for (k, (name, _, _)) in SCHEMES.iter().enumerate() {
            let ratios: Vec<f64> = rows.iter().map(|r| r.reference / r.times[k]).collect();
            let cross = (0..rows.len())
                .find(|&i| ratios[i..].iter().all(|&x| x > 1.0))
                .map_or(
                    format!("none up to {}", rows.last().map_or(0, |r| r.size)),
                    |i| rows[i].size.to_string(),
                );
            let mut line = format!(
                "| {name} | {cross} | {:.2} |",
                ratios.last().copied().unwrap_or(f64::NAN)
            );
            for x in &ratios {
                line.push_str(&format!(" {x:.2} |"));
            }
            println!("{line}");
            let bad: u64 = rows.iter().map(|r| r.mismatches[k]).sum();
            let err = rows.iter().map(|r| r.errors[k]).fold(0.0, f64::max);
            if ty == "int64_t" {
                assert_eq!(bad, 0, "{name}: the block code is not exact");
            } else {
                println!(
                    "<!-- {name}: largest absolute difference from the reference {err:.3e} -->"
                );
            }
        }
        let refs: Vec<String> = rows
            .iter()
            .map(|r| format!("{}: {:.3} s", r.size, r.reference))
            .collect();
        println!(
            "\nreference (schoolbook, recursive) times: {}",
            refs.join(", ")
        );
    }
    let _ = std::fs::remove_dir_all(&dir);
}
