//! Recursive block code for matrix multiplication schemes `<n,m,p>`.
//!
//! `C = A B` for an `N x M` matrix A and an `M x P` matrix B, both row-major with row
//! strides (C and Rust) or numpy arrays (Python). One level splits A into `n x m` blocks of
//! size `(N/n) x (M/m)`, B into `m x p` and C into `n x p` blocks, and runs the scheme's
//! three programs ([`Plan`]) on blocks: temporaries and factors are block sums (a factor
//! that is a single block is used in place), each product is a recursive call, the outputs
//! are written into C's blocks (with the exact division of the plan). Below the cutoff
//! (a block side smaller than `CUTOFF`) the schoolbook product runs instead (Python: numpy
//! `@`). Sizes that do not divide are *peeled*: the scheme runs on the leading
//! `(n N') x (m M') x (p P')` part and the schoolbook product adds the leftover strips.
//!
//! Exact code uses integer coefficients (any integer or floating element type gives the
//! same formulas); float code uses the rational coefficients as doubles.

use super::Lang;
use super::plan::Plan;
use super::syntax::{Num, Style};
use crate::scheme::cost::LinearProgram;
use num_bigint::BigInt;
use num_traits::One;

/// Block code settings.
#[derive(Clone, Debug)]
pub struct BlockParams {
    /// The format `<n,m,p>` of the scheme.
    pub format: [usize; 3],
    /// Default cutoff (a block side below it runs the schoolbook product).
    pub cutoff: usize,
}

/// A variable of the block program: an expression for its element `(i, j)`.
struct View {
    ptr: String,
    ld: String,
}

impl View {
    fn at(&self, lang: Lang) -> String {
        match lang {
            Lang::Python => self.ptr.clone(),
            _ => format!("{}[i * {} + j]", self.ptr, self.ld),
        }
    }
}

fn block_name(prefix: char, r: usize, c: usize) -> String {
    if r < 9 && c < 9 {
        format!("{prefix}{}{}", r + 1, c + 1)
    } else {
        format!("{prefix}{}_{}", r + 1, c + 1)
    }
}

/// Element-wise assignment `dst = expr` over a `rows x cols` block.
fn loop_assign(lang: Lang, rows: &str, cols: &str, dst: &str, expr: &str, ind: &str) -> String {
    match lang {
        Lang::C => format!(
            "{ind}for (size_t i = 0; i < {rows}; i++)\n{ind}    for (size_t j = 0; j < {cols}; j++)\n{ind}        {dst} = {expr};\n"
        ),
        Lang::Rust => format!(
            "{ind}for i in 0..{rows} {{\n{ind}    for j in 0..{cols} {{\n{ind}        {dst} = {expr};\n{ind}    }}\n{ind}}}\n"
        ),
        _ => format!("{ind}{dst} = {expr}\n"),
    }
}

struct Writer<'a> {
    lang: Lang,
    st: Style,
    out: String,
    buffers: Vec<(String, &'a str)>, // (name, size expression) in allocation order
}

impl Writer<'_> {
    fn alloc(&mut self, name: &str, size: &'static str) {
        self.buffers.push((name.to_string(), size));
    }
}

/// Emit block code (after the header, which the caller adds).
pub fn write_blocks(
    plan: &Plan,
    lang: Lang,
    function: &str,
    products: &[String],
    bp: &BlockParams,
) -> String {
    let [n, m, p] = bp.format;
    let num = if plan.integral() {
        Num::Int { wide: false }
    } else {
        Num::Float
    };
    let st = Style {
        lang,
        num,
        generic: true,
    };
    let mut w = Writer {
        lang,
        st,
        out: String::new(),
        buffers: Vec::new(),
    };
    let ind = "    ";
    let f = function;
    let default_t = if plan.integral() { "int64_t" } else { "double" };
    // prologue
    match lang {
        Lang::C => {
            w.out.push_str(&format!(
                "#include <stddef.h>\n#include <stdint.h>\n#include <stdlib.h>\n\n\
                 #ifndef BILIN_T\n#define BILIN_T {default_t}\n#endif\n\
                 #ifndef BILIN_CUTOFF\n#define BILIN_CUTOFF {}\n#endif\n\n\
                 /* C = A B (acc = 0) or C += A B (acc = 1): the schoolbook product. */\n\
                 static void {f}_base(size_t N, size_t M, size_t P, const BILIN_T *A, size_t lda,\n\
                 {ind}const BILIN_T *B, size_t ldb, BILIN_T *C, size_t ldc, int acc) {{\n\
                 {ind}for (size_t i = 0; i < N; i++) {{\n\
                 {ind}{ind}BILIN_T *c = C + i * ldc;\n\
                 {ind}{ind}if (!acc)\n{ind}{ind}{ind}for (size_t j = 0; j < P; j++) c[j] = 0;\n\
                 {ind}{ind}for (size_t k = 0; k < M; k++) {{\n\
                 {ind}{ind}{ind}const BILIN_T a = A[i * lda + k];\n\
                 {ind}{ind}{ind}const BILIN_T *b = B + k * ldb;\n\
                 {ind}{ind}{ind}for (size_t j = 0; j < P; j++) c[j] += a * b[j];\n\
                 {ind}{ind}}}\n{ind}}}\n}}\n\n\
                 /* C (N x P, row stride ldc) = A (N x M, stride lda) B (M x P, stride ldb). */\n\
                 void {f}(size_t N, size_t M, size_t P, const BILIN_T *A, size_t lda,\n\
                 {ind}const BILIN_T *B, size_t ldb, BILIN_T *C, size_t ldc) {{\n\
                 {ind}const size_t bn = N / {n}, bm = M / {m}, bp = P / {p};\n\
                 {ind}if (bn < BILIN_CUTOFF || bm < BILIN_CUTOFF || bp < BILIN_CUTOFF) {{\n\
                 {ind}{ind}{f}_base(N, M, P, A, lda, B, ldb, C, ldc, 0);\n{ind}{ind}return;\n{ind}}}\n",
                bp.cutoff
            ));
        }
        Lang::Rust => {
            let rt = if plan.integral() { "i64" } else { "f64" };
            w.out.push_str(&format!(
                "/// The element type (any integer or float type with `as` casts from integers).\n\
                 pub type T = {rt};\n\
                 /// A block side below this runs the schoolbook product.\n\
                 pub const CUTOFF: usize = {};\n\n\
                 /// `c = a b` (or `c += a b` with `acc`): the schoolbook product on strided blocks.\n\
                 #[allow(clippy::too_many_arguments)]\n\
                 fn {f}_base(n: usize, m: usize, p: usize, a: &[T], lda: usize, b: &[T], ldb: usize,\n\
                 {ind}c: &mut [T], ldc: usize, acc: bool) {{\n\
                 {ind}for i in 0..n {{\n\
                 {ind}{ind}let ci = &mut c[i * ldc..i * ldc + p];\n\
                 {ind}{ind}if !acc {{\n{ind}{ind}{ind}ci.iter_mut().for_each(|x| *x = T::default());\n{ind}{ind}}}\n\
                 {ind}{ind}for k in 0..m {{\n\
                 {ind}{ind}{ind}let aik = a[i * lda + k];\n\
                 {ind}{ind}{ind}let bk = &b[k * ldb..k * ldb + p];\n\
                 {ind}{ind}{ind}for (x, y) in ci.iter_mut().zip(bk) {{\n{ind}{ind}{ind}{ind}*x += aik * *y;\n{ind}{ind}{ind}}}\n\
                 {ind}{ind}}}\n{ind}}}\n}}\n\n\
                 /// `c` (n x p, row stride ldc) = `a` (n x m, stride lda) `b` (m x p, stride ldb).\n\
                 #[allow(clippy::too_many_arguments, clippy::all, non_snake_case, unused_parens)]\n\
                 pub fn {f}(n: usize, m: usize, p: usize, a: &[T], lda: usize, b: &[T], ldb: usize,\n\
                 {ind}c: &mut [T], ldc: usize) {{\n\
                 {ind}let (bn, bm, bp) = (n / {n}, m / {m}, p / {p});\n\
                 {ind}if bn < CUTOFF || bm < CUTOFF || bp < CUTOFF {{\n\
                 {ind}{ind}return {f}_base(n, m, p, a, lda, b, ldb, c, ldc, false);\n{ind}}}\n",
                bp.cutoff
            ));
        }
        _ => {
            w.out.push_str(&format!(
                "import numpy as np\n\nCUTOFF = {}\n\n\n\
                 def _div(x, d):\n{ind}\"\"\"Exact division for integer and object arrays, true division otherwise.\"\"\"\n\
                 {ind}return x // d if x.dtype.kind in \"iuO\" else x / d\n\n\n\
                 def {f}(A, B, cutoff=CUTOFF):\n\
                 {ind}\"\"\"Return A @ B for 2-D arrays A (N x M) and B (M x P).\"\"\"\n\
                 {ind}N, M = A.shape\n{ind}P = B.shape[1]\n\
                 {ind}bn, bm, bp = N // {n}, M // {m}, P // {p}\n\
                 {ind}if min(bn, bm, bp) < cutoff:\n{ind}{ind}return A @ B\n",
                bp.cutoff
            ));
        }
    }
    // block views of A and B: (name, rows, cols of the block grid, block sizes, stride)
    let a_name = |idx: usize| block_name('A', idx / m, idx % m);
    let b_name = |idx: usize| block_name('B', idx / p, idx % p);
    for (mat, rows, cols, (br, bc), ld) in [
        ('A', n, m, ("bn", "bm"), "lda"),
        ('B', m, p, ("bm", "bp"), "ldb"),
    ] {
        let arr = mat.to_ascii_lowercase();
        for idx in 0..rows * cols {
            let (r, c) = (idx / cols, idx % cols);
            let name = block_name(mat, r, c);
            w.out.push_str(&match lang {
                Lang::C => format!(
                    "{ind}const BILIN_T *{name} = {mat} + {r} * {br} * {ld} + {c} * {bc};\n"
                ),
                Lang::Rust => {
                    format!("{ind}let {name} = &{arr}[{r} * {br} * {ld} + {c} * {bc}..];\n")
                }
                _ => format!(
                    "{ind}{name} = {mat}[{r} * {br}:{} * {br}, {c} * {bc}:{} * {bc}]\n",
                    r + 1,
                    c + 1
                ),
            });
        }
    }
    if lang == Lang::C {
        w.out.push_str(&format!(
            "{ind}const size_t la = bn * bm, lb = bm * bp, lc = bn * bp;\n\
             {ind}BILIN_T *buf = (BILIN_T *)malloc(BUFFER_SIZE * sizeof(BILIN_T));\n\
             {ind}if (!buf) {{ /* out of memory: the schoolbook product needs none */\n\
             {ind}{ind}{f}_base(N, M, P, A, lda, B, ldb, C, ldc, 0);\n{ind}{ind}return;\n{ind}}}\n"
        ));
    }
    // one side's temporaries and factor blocks
    let side = |w: &mut Writer,
                prog: &LinearProgram,
                inputs: &dyn Fn(usize) -> View,
                tmp: &str,
                fac: &str,
                rows: &'static str,
                cols: &'static str,
                size: &'static str|
     -> Vec<View> {
        let mut vars: Vec<View> = (0..prog.inputs).map(inputs).collect();
        let fresh = |w: &mut Writer, name: &str| -> View {
            w.alloc(name, size);
            View {
                ptr: name.to_string(),
                ld: cols.to_string(),
            }
        };
        let emit = |w: &mut Writer, dst: &View, f: &crate::scheme::cost::Form, vars: &[View]| {
            let e = w.st.sum(f, &|i| vars[i].at(w.lang));
            let code = loop_assign(w.lang, rows, cols, &dst.at(w.lang), &e, ind);
            w.out.push_str(&code);
        };
        for (k, f) in prog.temps.iter().enumerate() {
            let v = fresh(w, &format!("{tmp}{k}"));
            emit(w, &v, f, &vars);
            vars.push(v);
        }
        let mut factors = Vec::new();
        for (t, f) in prog.forms.iter().enumerate() {
            if f.len() == 1 && f[0].1.is_one() {
                let v = &vars[f[0].0];
                factors.push(View {
                    ptr: v.ptr.clone(),
                    ld: v.ld.clone(),
                });
                continue;
            }
            let v = fresh(w, &format!("{fac}{t}"));
            emit(w, &v, f, &vars);
            factors.push(v);
        }
        factors
    };
    let ld_in = |lang: Lang, what: &str| -> String {
        if lang == Lang::Python {
            String::new()
        } else {
            what.to_string()
        }
    };
    let a_views = |i: usize| View {
        ptr: a_name(i),
        ld: ld_in(lang, "lda"),
    };
    let b_views = |i: usize| View {
        ptr: b_name(i),
        ld: ld_in(lang, "ldb"),
    };
    let lf = side(
        &mut w, &plan.left, &a_views, "s", "L", "bn", "bm", "bn * bm",
    );
    let rf = side(
        &mut w,
        &plan.right,
        &b_views,
        "r",
        "R",
        "bm",
        "bp",
        "bm * bp",
    );
    // products
    for (t, name) in products.iter().enumerate() {
        let (l, r) = (&lf[t], &rf[t]);
        match lang {
            Lang::C => {
                w.alloc(name, "bn * bp");
                w.out.push_str(&format!(
                    "{ind}{f}(bn, bm, bp, {}, {}, {}, {}, {name}, bp);\n",
                    l.ptr, l.ld, r.ptr, r.ld
                ));
            }
            Lang::Rust => {
                w.out.push_str(&format!(
                    "{ind}let mut {name} = vec![T::default(); bn * bp];\n\
                     {ind}{f}(bn, bm, bp, &{}, {}, &{}, {}, &mut {name}, bp);\n",
                    l.ptr, l.ld, r.ptr, r.ld
                ));
            }
            _ => w.out.push_str(&format!(
                "{ind}{name} = {f}({}, {}, cutoff)\n",
                l.ptr, r.ptr
            )),
        }
    }
    // outputs
    let mut ovars: Vec<View> = products
        .iter()
        .map(|nm| View {
            ptr: nm.clone(),
            ld: ld_in(lang, "bp"),
        })
        .collect();
    for (k, f) in plan.out.temps.iter().enumerate() {
        let name = format!("o{k}");
        w.alloc(&name, "bn * bp");
        let v = View {
            ptr: name,
            ld: ld_in(lang, "bp"),
        };
        let e = w.st.sum(f, &|i| ovars[i].at(lang));
        let code = loop_assign(lang, "bn", "bp", &v.at(lang), &e, ind);
        w.out.push_str(&code);
        ovars.push(v);
    }
    if lang == Lang::Python {
        w.out.push_str(&format!(
            "{ind}C = np.empty((N, P), dtype=np.result_type(A, B))\n"
        ));
    }
    for (k, f) in plan.out.forms.iter().enumerate() {
        let (r, c) = (k / p, k % p);
        let mut e = w.st.sum(f, &|i| ovars[i].at(lang));
        let (mul, div) = (&plan.out_mul[k], &plan.out_div[k]);
        let lit = |x: &BigInt| w.st.literal(&crate::scalar::Q::from_integer(x.clone()));
        if !mul.is_one() {
            e = format!("({e}) * {}", lit(mul));
        }
        let dst = match lang {
            Lang::C => format!("C[({r} * bn + i) * ldc + {c} * bp + j]"),
            Lang::Rust => format!("c[({r} * bn + i) * ldc + {c} * bp + j]"),
            _ => format!("C[{r} * bn:{} * bn, {c} * bp:{} * bp]", r + 1, c + 1),
        };
        if !div.is_one() {
            e = if lang == Lang::Python {
                format!("_div({e}, {div})")
            } else {
                format!("({e}) / {}", lit(div))
            };
        }
        let code = loop_assign(lang, "bn", "bp", &dst, &e, ind);
        w.out.push_str(&code);
    }
    // buffers (C: carve the one allocation) and peeling
    let mut body = std::mem::take(&mut w.out);
    if lang == Lang::C {
        // sizes of the three kinds of blocks, and each buffer's offset as counts of them
        let kind = |size: &str| match size {
            "bn * bm" => 0,
            "bm * bp" => 1,
            _ => 2,
        };
        let names = ["la", "lb", "lc"];
        let sum = |counts: &[usize; 3]| -> String {
            let parts: Vec<String> = (0..3)
                .filter(|&k| counts[k] > 0)
                .map(|k| format!("{} * {}", counts[k], names[k]))
                .collect();
            if parts.is_empty() {
                "0".into()
            } else {
                parts.join(" + ")
            }
        };
        let mut counts = [0usize; 3];
        let mut decls = String::new();
        for (name, size) in &w.buffers {
            decls.push_str(&format!("{ind}BILIN_T *{name} = buf + {};\n", sum(&counts)));
            counts[kind(size)] += 1;
        }
        let total = if w.buffers.is_empty() {
            "1".to_string()
        } else {
            sum(&counts)
        };
        body = body.replace("malloc(BUFFER_SIZE", &format!("malloc(({total})"));
        let marker = format!("{ind}{ind}return;\n{ind}}}\n");
        let pos = body
            .rfind(&marker)
            .map(|p| p + marker.len())
            .unwrap_or(body.len());
        body.insert_str(pos, &decls);
    } else if lang == Lang::Rust {
        let mut decls = String::new();
        for (name, size) in &w.buffers {
            decls.push_str(&format!(
                "{ind}let mut {name} = vec![T::default(); {size}];\n"
            ));
        }
        let marker = "..];\n";
        let pos = body
            .rfind(marker)
            .map(|p| p + marker.len())
            .unwrap_or(body.len());
        body.insert_str(pos, &decls);
    }
    w.out = body;
    let peel = match lang {
        Lang::C => format!(
            "{ind}free(buf);\n\
             {ind}/* peeling: the strips left over when the sizes do not divide */\n\
             {ind}const size_t N0 = bn * {n}, M0 = bm * {m}, P0 = bp * {p};\n\
             {ind}if (M0 < M) {f}_base(N0, M - M0, P0, A + M0, lda, B + M0 * ldb, ldb, C, ldc, 1);\n\
             {ind}if (P0 < P) {f}_base(N0, M, P - P0, A, lda, B + P0, ldb, C + P0, ldc, 0);\n\
             {ind}if (N0 < N) {f}_base(N - N0, M, P, A + N0 * lda, lda, B, ldb, C + N0 * ldc, ldc, 0);\n}}\n"
        ),
        Lang::Rust => format!(
            "{ind}// peeling: the strips left over when the sizes do not divide\n\
             {ind}let (n_main, m_main, p_main) = (bn * {n}, bm * {m}, bp * {p});\n\
             {ind}if m_main < m {{\n{ind}{ind}{f}_base(n_main, m - m_main, p_main, &a[m_main..], lda, &b[m_main * ldb..], ldb, c, ldc, true);\n{ind}}}\n\
             {ind}if p_main < p {{\n{ind}{ind}{f}_base(n_main, m, p - p_main, a, lda, &b[p_main..], ldb, &mut c[p_main..], ldc, false);\n{ind}}}\n\
             {ind}if n_main < n {{\n{ind}{ind}{f}_base(n - n_main, m, p, &a[n_main * lda..], lda, b, ldb, &mut c[n_main * ldc..], ldc, false);\n{ind}}}\n}}\n"
        ),
        _ => format!(
            "{ind}# peeling: the strips left over when the sizes do not divide\n\
             {ind}N0, M0, P0 = bn * {n}, bm * {m}, bp * {p}\n\
             {ind}if M0 < M:\n{ind}{ind}C[:N0, :P0] += A[:N0, M0:] @ B[M0:, :P0]\n\
             {ind}if P0 < P:\n{ind}{ind}C[:N0, P0:] = A[:N0, :] @ B[:, P0:]\n\
             {ind}if N0 < N:\n{ind}{ind}C[N0:, :] = A[N0:, :] @ B\n\
             {ind}return C\n"
        ),
    };
    w.out.push_str(&peel);
    w.out
}

/// Bounds for exact block code on square sizes: the largest magnitude of an intermediate,
/// in units of X^2 for entries `|a|, |b| <= X` (X >= 1), for an `size x size` product with
/// the given cutoff. A schoolbook base of inner size M reaches M X^2; a level of the
/// scheme feeds its recursive calls entries up to `|L| X` and `|R| X` (the factor bounds of
/// the plan) and combines products of inner size bm with the output bound K2.
pub fn block_growth(plan: &Plan, format: [usize; 3], cutoff: usize, size: [usize; 3]) -> BigInt {
    let [n, m, p] = format;
    let [bn, bm, bp] = [size[0] / n, size[1] / m, size[2] / p];
    let base = BigInt::from(size[1].max(1));
    if n * m * p < 2 || bn < cutoff.max(1) || bm < cutoff.max(1) || bp < cutoff.max(1) {
        return base;
    }
    let lmax = plan.left_norms.iter().max().cloned().unwrap_or_default();
    let rmax = plan.right_norms.iter().max().cloned().unwrap_or_default();
    let inner = block_growth(plan, format, cutoff, [bn, bm, bp]) * &lmax * &rmax;
    let level = BigInt::from(bm) * &plan.k2;
    base.max(inner).max(level).max(plan.k1.clone())
}
