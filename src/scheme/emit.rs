//! Code out: a verified scheme as a straight-line function in C, Rust or Python, or as a
//! LaTeX `align*` environment.
//!
//! The functions take the coordinate vectors `a` (left, length d0) and `b` (right, length
//! d1) in the tensor's basis order and write/return `c` (length d2). The additions follow
//! the greedy CSE programs of [`super::cost`], so the emitted code performs exactly the
//! counted additions. Over Q: C and Rust use `double`/`f64`; rational coefficients become
//! `(p.0 / q.0)` (the nearest double, rounded once) and the header warns that fast schemes
//! can have a larger rounding error than the schoolbook method. Python is exact: integers
//! stay integers, other coefficients are `Fraction`s. Over GF(p): inputs and outputs are
//! integers in `0..p`, every operation is reduced mod p (C/Rust use 64-bit unsigned words
//! and need p < 2^31; larger p is refused). The emitter verifies the scheme first and
//! refuses one that does not verify.

use super::cost::{Form, LinearProgram, count_cost, programs};
use super::{Scheme, verify};
use crate::error::Error;
use crate::scalar::{FieldSpec, Q, q_to_string};
use crate::tensor::Tensor;
use num_traits::{One, Signed};

/// Target language.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Lang {
    C,
    Rust,
    Python,
    Latex,
}

impl Lang {
    /// `c`, `rust`, `python` (or `py`), `latex` (or `tex`).
    pub fn parse(s: &str) -> Result<Lang, Error> {
        match s.to_ascii_lowercase().as_str() {
            "c" => Ok(Lang::C),
            "rust" | "rs" => Ok(Lang::Rust),
            "python" | "py" => Ok(Lang::Python),
            "latex" | "tex" => Ok(Lang::Latex),
            _ => Err(Error::Invalid(format!(
                "unknown language `{s}` (expected c, rust, python or latex)"
            ))),
        }
    }
}

/// Parameters of [`emit`].
#[derive(Clone, Debug)]
pub struct EmitParams {
    /// The function name.
    pub function: String,
    /// A description of the tensor for the header (e.g. `matmul:2,2,2`).
    pub title: String,
}

impl Default for EmitParams {
    fn default() -> Self {
        EmitParams {
            function: "bilin_mul".into(),
            title: String::new(),
        }
    }
}

/// Emit a scheme for `t` in `lang`. Verifies first (exactly) and refuses a scheme that
/// does not verify. Cost: verification plus the CSE of [`count_cost`].
pub fn emit(s: &Scheme, t: &Tensor, lang: Lang, params: &EmitParams) -> Result<String, Error> {
    if let Err(m) = verify(s, t) {
        return Err(Error::Invalid(format!(
            "the scheme does not verify ({} wrong coefficients); refusing to emit code",
            m.count
        )));
    }
    if let FieldSpec::Prime(p) = s.field
        && p >= 1 << 31
        && matches!(lang, Lang::C | Lang::Rust)
    {
        return Err(Error::Invalid(format!(
            "C and Rust output over GF({p}) needs p < 2^31"
        )));
    }
    let cost = count_cost(s);
    let d = s.dims;
    let mut head = vec![
        format!(
            "Bilinear algorithm for {} (dims {} x {} -> {}), over {}.",
            describe(params, t),
            d[0],
            d[1],
            d[2],
            s.field.name()
        ),
        format!(
            "Rank {}: {} multiplications, {} additions ({} before common-subexpression elimination), {} scalar multiplications.",
            s.rank(),
            s.rank(),
            cost.total(),
            cost.naive_total(),
            cost.scalings_total()
        ),
        "Verified exactly against the structure tensor before emission.".to_string(),
    ];
    match s.field {
        FieldSpec::Rational if lang != Lang::Latex && lang != Lang::Python => {
            head.push(
                "Floating point: fast schemes can have a larger rounding error than the schoolbook"
                    .into(),
            );
            head.push("method; rational coefficients are rounded to the nearest double.".into());
        }
        FieldSpec::Rational => {}
        FieldSpec::Prime(p) => head.push(format!(
            "Arithmetic modulo p = {p}: inputs and outputs are integers in 0..p."
        )),
    }
    Ok(match lang {
        Lang::Latex => super::latex::emit_latex(s, t, &head),
        _ => emit_code(s, t, lang, params, &head),
    })
}

fn describe(params: &EmitParams, t: &Tensor) -> String {
    if params.title.is_empty() {
        format!("a {:?} tensor", t.kind()).to_lowercase()
    } else {
        params.title.clone()
    }
}

fn coef_literal(field: FieldSpec, lang: Lang, c: &Q) -> String {
    match (field, lang) {
        (FieldSpec::Prime(_), Lang::Python) => q_to_string(c),
        (FieldSpec::Prime(_), _) => format!("{}u64", q_to_string(c))
            .replace("u64", if lang == Lang::C { "ULL" } else { "u64" }),
        (FieldSpec::Rational, Lang::Python) => {
            if c.is_integer() {
                q_to_string(c)
            } else {
                format!("Fraction({}, {})", c.numer(), c.denom())
            }
        }
        (FieldSpec::Rational, _) => {
            let small = |x: &num_bigint::BigInt| x.bits() <= 53;
            if c.is_integer() && small(c.numer()) {
                format!("{}.0", c.numer())
            } else if small(c.numer()) && small(c.denom()) {
                format!("({}.0 / {}.0)", c.numer(), c.denom())
            } else {
                format!("{:e}", crate::scalar::q_to_f64(c))
            }
        }
    }
}

/// The expression of a form whose variables are named by `var`.
fn expr(field: FieldSpec, lang: Lang, f: &Form, var: &dyn Fn(usize) -> String) -> String {
    if f.is_empty() {
        return match (field, lang) {
            (FieldSpec::Rational, Lang::C | Lang::Rust) => "0.0".into(),
            _ => "0".into(),
        };
    }
    if let FieldSpec::Prime(_) = field {
        let terms: Vec<String> = f
            .iter()
            .map(|(i, c)| {
                if c.is_one() {
                    var(*i)
                } else {
                    format!("{} * {} % P", coef_literal(field, lang, c), var(*i))
                }
            })
            .collect();
        return format!("({}) % P", terms.join(" + "));
    }
    let mut s = String::new();
    for (i, c) in f {
        let neg = c.is_negative();
        let a = c.abs();
        let term = if a.is_one() {
            var(*i)
        } else {
            format!("{} * {}", coef_literal(field, lang, &a), var(*i))
        };
        if s.is_empty() {
            s = if neg { format!("-{term}") } else { term };
        } else {
            s.push_str(if neg { " - " } else { " + " });
            s.push_str(&term);
        }
    }
    s
}

/// Parenthesise an expression unless it is a single unsigned term.
fn paren(e: &str) -> String {
    if e.contains(' ') || e.starts_with('-') {
        format!("({e})")
    } else {
        e.to_string()
    }
}

fn emit_code(s: &Scheme, t: &Tensor, lang: Lang, params: &EmitParams, head: &[String]) -> String {
    let field = s.field;
    let progs = programs(s);
    let d = s.dims;
    let fname = &params.function;
    let modp = match field {
        FieldSpec::Prime(p) => Some(p),
        FieldSpec::Rational => None,
    };
    let (ty, cmt) = match (lang, modp) {
        (Lang::C, None) => ("double", "//"),
        (Lang::C, Some(_)) => ("uint64_t", "//"),
        (Lang::Rust, None) => ("f64", "//"),
        (Lang::Rust, Some(_)) => ("u64", "//"),
        _ => ("", "#"),
    };
    let mut out = String::new();
    for h in head {
        out.push_str(&format!("{cmt} {h}\n"));
    }
    let basis = |axis: usize| t.names()[axis].join(" ");
    out.push_str(&format!(
        "{cmt} a = [{}]\n{cmt} b = [{}]\n{cmt} c = [{}]\n",
        basis(0),
        basis(1),
        basis(2)
    ));
    let ind = "    ";
    let decl = |name: &str, e: &str| -> String {
        match lang {
            Lang::C => format!("{ind}const {ty} {name} = {e};\n"),
            Lang::Rust => format!("{ind}let {name} = {e};\n"),
            _ => format!("{ind}{name} = {e}\n"),
        }
    };
    match lang {
        Lang::C => {
            out.push_str("#include <stdint.h>\n\n");
            if let Some(p) = modp {
                out.push_str(&format!("#define P {p}ULL\n\n"));
            }
            out.push_str(&format!(
                "void {fname}(const {ty} *a, const {ty} *b, {ty} *c) {{\n"
            ));
        }
        Lang::Rust => {
            if let Some(p) = modp {
                out.push_str(&format!("const P: u64 = {p};\n\n"));
            }
            out.push_str(&format!(
                "pub fn {fname}(a: &[{ty}], b: &[{ty}], c: &mut [{ty}]) {{\n{ind}assert!(a.len() == {} && b.len() == {} && c.len() == {});\n",
                d[0], d[1], d[2]
            ));
        }
        _ => {
            if modp.is_none() {
                out.push_str("from fractions import Fraction\n\n");
            } else {
                out.push_str(&format!("P = {}\n\n", modp.unwrap_or(0)));
            }
            out.push_str(&format!("def {fname}(a, b):\n"));
            out.push_str(&format!(
                "{ind}\"\"\"Return c (length {}) from a (length {}) and b (length {}).\"\"\"\n",
                d[2], d[0], d[1]
            ));
        }
    }
    let prog_vars =
        |p: &LinearProgram, input: &dyn Fn(usize) -> String, tmp: &str, out: &mut String| {
            let n = p.inputs;
            let var = |i: usize| {
                if i < n {
                    input(i)
                } else {
                    format!("{tmp}{}", i - n)
                }
            };
            for (k, (x, r, y)) in p.temps.iter().enumerate() {
                let f: Form = vec![(*x, Q::one()), (*y, r.clone())];
                out.push_str(&decl(&format!("{tmp}{k}"), &expr(field, lang, &f, &var)));
            }
        };
    let ain = |i: usize| format!("a[{i}]");
    let bin = |i: usize| format!("b[{i}]");
    prog_vars(&progs[0], &ain, "s", &mut out);
    prog_vars(&progs[1], &bin, "r", &mut out);
    for tt in 0..s.rank() {
        let lv = |i: usize| {
            if i < d[0] {
                ain(i)
            } else {
                format!("s{}", i - d[0])
            }
        };
        let rv = |i: usize| {
            if i < d[1] {
                bin(i)
            } else {
                format!("r{}", i - d[1])
            }
        };
        let l = expr(field, lang, &progs[0].forms[tt], &lv);
        let r = expr(field, lang, &progs[1].forms[tt], &rv);
        let e = if modp.is_some() {
            format!("({l}) * ({r}) % P")
        } else {
            format!("{} * {}", paren(&l), paren(&r))
        };
        out.push_str(&decl(&format!("m{tt}"), &e));
    }
    let min = |i: usize| format!("m{i}");
    prog_vars(&progs[2], &min, "o", &mut out);
    let ov = |i: usize| {
        if i < s.rank() {
            min(i)
        } else {
            format!("o{}", i - s.rank())
        }
    };
    let outs: Vec<String> = (0..d[2])
        .map(|k| expr(field, lang, &progs[2].forms[k], &ov))
        .collect();
    match lang {
        Lang::C | Lang::Rust => {
            for (k, e) in outs.iter().enumerate() {
                out.push_str(&format!("{ind}c[{k}] = {e}; // {}\n", t.name(2, k)));
            }
            out.push_str("}\n");
        }
        _ => {
            out.push_str(&format!("{ind}return [\n"));
            for (k, e) in outs.iter().enumerate() {
                out.push_str(&format!("{ind}{ind}{e},  # {}\n", t.name(2, k)));
            }
            out.push_str(&format!("{ind}]\n"));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use num_traits::Zero;
    use rand::{Rng, SeedableRng};
    use std::process::Command;

    fn tmpdir(tag: &str) -> std::path::PathBuf {
        let d = std::env::temp_dir().join(format!("bilin-emit-{tag}-{}", std::process::id()));
        std::fs::create_dir_all(&d).unwrap();
        d
    }

    /// Random small integer inputs and the exact result of the tensor.
    fn cases(t: &Tensor, n: usize, seed: u64) -> Vec<(Vec<i64>, Vec<i64>, Vec<Q>)> {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        let d = t.dims();
        (0..n)
            .map(|_| {
                let a: Vec<i64> = (0..d[0]).map(|_| rng.gen_range(-20..=20)).collect();
                let b: Vec<i64> = (0..d[1]).map(|_| rng.gen_range(-20..=20)).collect();
                let qa: Vec<Q> = a.iter().map(|&x| Q::from_integer(x.into())).collect();
                let qb: Vec<Q> = b.iter().map(|&x| Q::from_integer(x.into())).collect();
                let c = t.multiply(&qa, &qb);
                (a, b, c)
            })
            .collect()
    }

    fn schemes() -> Vec<(Scheme, Tensor)> {
        let t = matmul(2, 2, 2);
        let w = scheme(WINOGRAD, &t);
        let mut frac = scheme(STRASSEN, &t);
        frac.u[0] = frac.u[0]
            .iter()
            .map(|x| x * crate::scalar::q(1, 3))
            .collect();
        frac.w[0] = frac.w[0]
            .iter()
            .map(|x| x * Q::from_integer(3.into()))
            .collect();
        let s = scheme(STRASSEN, &t);
        let k = crate::scheme::construct::kron(&s, &s).unwrap();
        let kt = crate::scheme::construct::kron_tensor(&t, &t).unwrap();
        vec![(w, t.clone()), (frac, t), (k, kt)]
    }

    #[test]
    fn refuses_a_wrong_scheme() {
        let t = matmul(2, 2, 2);
        let mut s = scheme(STRASSEN, &t);
        s.w[0][0] = Q::zero();
        assert!(emit(&s, &t, Lang::C, &EmitParams::default()).is_err());
        let tex = emit(
            &scheme(STRASSEN, &t),
            &t,
            Lang::Latex,
            &EmitParams::default(),
        )
        .unwrap();
        assert!(
            tex.contains("m_{1} &= (a_{11} + a_{22})\\,(b_{11} + b_{22})"),
            "{tex}"
        );
        let rs = emit(
            &scheme(STRASSEN, &t),
            &t,
            Lang::Rust,
            &EmitParams::default(),
        )
        .unwrap();
        assert!(rs.contains("pub fn bilin_mul"));
    }

    /// Compile `code` plus a harness with `compiler` and return the printed outputs.
    fn run_native(lang: Lang, s: &Scheme, t: &Tensor, seed: u64) -> Option<(Vec<f64>, Vec<f64>)> {
        let (compiler, file) = if lang == Lang::C {
            ("cc", "s.c")
        } else {
            ("rustc", "s.rs")
        };
        if Command::new(compiler).arg("--version").output().is_err() {
            eprintln!("note: `{compiler}` not found; skipping the {lang:?} emission test");
            return None;
        }
        let code = emit(s, t, lang, &EmitParams::default()).unwrap();
        let cs = cases(t, 5, seed);
        let d = t.dims();
        let modp = |x: i64| match t.field() {
            FieldSpec::Prime(p) => x.rem_euclid(p as i64),
            FieldSpec::Rational => x,
        };
        let gf = t.field() != FieldSpec::Rational;
        let lit = |x: i64| {
            if gf {
                format!("{}", modp(x))
            } else {
                format!("{x}.0")
            }
        };
        let list = |v: &[i64]| v.iter().map(|&x| lit(x)).collect::<Vec<_>>().join(", ");
        let mut main = String::new();
        if lang == Lang::C {
            let ty = if gf { "uint64_t" } else { "double" };
            main.push_str(&format!(
                "#include <stdio.h>\nint main(void) {{\n  {ty} c[{}];\n",
                d[2]
            ));
            for (a, b, _) in &cs {
                main.push_str(&format!(
                    "  {{ {ty} a[] = {{{}}}; {ty} b[] = {{{}}}; bilin_mul(a, b, c);\n    for (int k = 0; k < {}; k++) printf(\"%.17g\\n\", (double)c[k]); }}\n",
                    list(a), list(b), d[2]
                ));
            }
            main.push_str("  return 0;\n}\n");
        } else {
            let ty = if gf { "u64" } else { "f64" };
            main.push_str(&format!(
                "fn main() {{\n    let mut c = [0 as {ty}; {}];\n",
                d[2]
            ));
            for (a, b, _) in &cs {
                main.push_str(&format!(
                    "    bilin_mul(&[{}], &[{}], &mut c);\n    for x in c {{ println!(\"{{}}\", x as f64); }}\n",
                    list(a), list(b)
                ));
            }
            main.push_str("}\n");
        }
        let dir = tmpdir(&format!("{lang:?}{seed}"));
        std::fs::write(dir.join(file), format!("{code}\n{main}")).unwrap();
        let args: Vec<&str> = if lang == Lang::C {
            vec!["-O1", "-o", "s", file]
        } else {
            vec!["--edition", "2021", "-A", "warnings", "-o", "s", file]
        };
        let st = Command::new(compiler)
            .current_dir(&dir)
            .args(&args)
            .status()
            .unwrap();
        assert!(st.success(), "{lang:?} code did not compile:\n{code}");
        let o = Command::new(dir.join("s")).output().unwrap();
        let got: Vec<f64> = String::from_utf8_lossy(&o.stdout)
            .lines()
            .map(|l| l.parse().unwrap())
            .collect();
        let want: Vec<f64> = cs
            .iter()
            .flat_map(|c| {
                c.2.iter().map(|x| {
                    crate::scalar::q_to_f64(&super::super::reduce_into(t.field(), x).unwrap())
                })
            })
            .collect();
        let _ = std::fs::remove_dir_all(&dir);
        Some((got, want))
    }

    #[test]
    fn emitted_c_and_rust_agree_with_schoolbook() {
        let mut all = schemes();
        let t7 = matmul(2, 2, 2).with_field(FieldSpec::Prime(7)).unwrap();
        let s7 = scheme(WINOGRAD, &matmul(2, 2, 2))
            .with_field(FieldSpec::Prime(7))
            .unwrap();
        all.push((s7, t7));
        for lang in [Lang::C, Lang::Rust] {
            for (n, (s, t)) in all.iter().enumerate() {
                let Some((got, want)) = run_native(lang, s, t, 7 + n as u64) else {
                    return;
                };
                assert_eq!(got.len(), want.len());
                for (g, w) in got.iter().zip(&want) {
                    assert!(
                        (g - w).abs() <= 1e-9 * (1.0 + w.abs()),
                        "{lang:?}: {g} vs {w}"
                    );
                }
            }
        }
    }

    #[test]
    fn emitted_python_agrees_with_schoolbook() {
        if Command::new("python3").arg("--version").output().is_err() {
            eprintln!("note: python3 not found; skipping the Python emission test");
            return;
        }
        let mut all = schemes();
        // over GF(7) as well
        let t7 = matmul(2, 2, 2).with_field(FieldSpec::Prime(7)).unwrap();
        let s7 = scheme(STRASSEN, &matmul(2, 2, 2))
            .with_field(FieldSpec::Prime(7))
            .unwrap();
        all.push((s7, t7));
        for (n, (s, t)) in all.into_iter().enumerate() {
            let code = emit(&s, &t, Lang::Python, &EmitParams::default()).unwrap();
            let cs = cases(&t, 5, 11 + n as u64);
            let mut main = String::from("\n");
            let modp = |x: i64| match t.field() {
                FieldSpec::Prime(p) => x.rem_euclid(p as i64),
                FieldSpec::Rational => x,
            };
            for (a, b, _) in &cs {
                let a: Vec<i64> = a.iter().map(|&x| modp(x)).collect();
                let b: Vec<i64> = b.iter().map(|&x| modp(x)).collect();
                main.push_str(&format!(
                    "for x in bilin_mul({a:?}, {b:?}):\n    print(x)\n"
                ));
            }
            let dir = tmpdir(&format!("py{n}"));
            std::fs::write(dir.join("s.py"), format!("{code}{main}")).unwrap();
            let o = Command::new("python3")
                .arg(dir.join("s.py"))
                .output()
                .unwrap();
            assert!(
                o.status.success(),
                "{}\n{code}",
                String::from_utf8_lossy(&o.stderr)
            );
            let got: Vec<String> = String::from_utf8_lossy(&o.stdout)
                .lines()
                .map(String::from)
                .collect();
            let want: Vec<String> = cs
                .iter()
                .flat_map(|c| {
                    // the tensor's multiply reduces mod p; the inputs were reduced the same way
                    c.2.iter()
                        .map(|x| q_to_string(&super::super::reduce_into(t.field(), x).unwrap()))
                        .collect::<Vec<_>>()
                })
                .collect();
            assert_eq!(got, want, "{code}");
            let _ = std::fs::remove_dir_all(&dir);
        }
    }
}
