//! Straight-line code for one bilinear evaluation `c = f(a, b)` in C, Rust or Python,
//! following a [`Plan`]: left temporaries `s0..`, right temporaries `r0..`, one product
//! per multiplication named after the user's label, output temporaries `o0..`, then the
//! outputs (with an exact division where the plan has one).

use super::Lang;
use super::plan::Plan;
use super::syntax::{Num, Style, paren, scalar_type};
use crate::scheme::cost::LinearProgram;
use crate::tensor::Tensor;
use num_traits::One;

/// Write the function (after the header, which the caller adds).
pub fn write_straight(
    plan: &Plan,
    t: &Tensor,
    lang: Lang,
    num: Num,
    function: &str,
    products: &[String],
) -> String {
    let d = t.dims();
    let st = Style {
        lang,
        num,
        generic: false,
    };
    let ty = scalar_type(lang, num);
    let in_ty = match num {
        Num::Int { .. } => scalar_type(lang, Num::Int { wide: false }),
        _ => ty,
    };
    let wide = matches!(num, Num::Int { wide: true });
    let ind = "    ";
    let mut out = String::new();
    let basis = |axis: usize| t.names()[axis].join(" ");
    let c = st.comment();
    out.push_str(&format!(
        "{c} a = [{}]\n{c} b = [{}]\n{c} c = [{}]\n",
        basis(0),
        basis(1),
        basis(2)
    ));
    let decl = |name: &str, e: &str| -> String {
        match lang {
            Lang::C => format!("{ind}const {ty} {name} = {e};\n"),
            Lang::Rust => format!("{ind}let {name}: {ty} = {e};\n"),
            _ => format!("{ind}{name} = {e}\n"),
        }
    };
    match lang {
        Lang::C => {
            out.push_str("#include <stdint.h>\n\n");
            if let Num::Mod(p) = num {
                out.push_str(&format!("#define P {p}ULL\n\n"));
            }
            out.push_str(&format!(
                "void {function}(const {in_ty} *a, const {in_ty} *b, {ty} *c) {{\n"
            ));
        }
        Lang::Rust => {
            if let Num::Mod(p) = num {
                out.push_str(&format!("const P: u64 = {p};\n\n"));
            }
            out.push_str(&format!(
                "#[allow(non_snake_case, unused_parens, clippy::all)]\npub fn {function}(a: &[{in_ty}], b: &[{in_ty}], c: &mut [{ty}]) {{\n{ind}assert!(a.len() == {} && b.len() == {} && c.len() == {});\n",
                d[0], d[1], d[2]
            ));
        }
        _ => {
            if let Num::Mod(p) = num {
                out.push_str(&format!("P = {p}\n\n"));
            }
            out.push_str(&format!("def {function}(a, b):\n"));
            out.push_str(&format!(
                "{ind}\"\"\"Return c (length {}) from a (length {}) and b (length {}).\"\"\"\n",
                d[2], d[0], d[1]
            ));
        }
    }
    let input = |arr: &str, i: usize| -> String {
        match (lang, wide) {
            (Lang::C, true) => format!("((__int128){arr}[{i}])"),
            (Lang::Rust, true) => format!("({arr}[{i}] as i128)"),
            _ => format!("{arr}[{i}]"),
        }
    };
    let temps = |p: &LinearProgram, inp: &dyn Fn(usize) -> String, tmp: &str, out: &mut String| {
        let n = p.inputs;
        let var = |i: usize| {
            if i < n {
                inp(i)
            } else {
                format!("{tmp}{}", i - n)
            }
        };
        for (k, f) in p.temps.iter().enumerate() {
            out.push_str(&decl(&format!("{tmp}{k}"), &st.sum(f, &var)));
        }
    };
    let ain = |i: usize| input("a", i);
    let bin = |i: usize| input("b", i);
    temps(&plan.left, &ain, "s", &mut out);
    temps(&plan.right, &bin, "r", &mut out);
    let side_var = |p: &LinearProgram, inp: &dyn Fn(usize) -> String, tmp: &str, i: usize| {
        if i < p.inputs {
            inp(i)
        } else {
            format!("{tmp}{}", i - p.inputs)
        }
    };
    for (tt, name) in products.iter().enumerate() {
        let l = st.sum(&plan.left.forms[tt], &|i| {
            side_var(&plan.left, &ain, "s", i)
        });
        let r = st.sum(&plan.right.forms[tt], &|i| {
            side_var(&plan.right, &bin, "r", i)
        });
        let e = if let Num::Mod(_) = num {
            format!("{} * {} % P", paren(&l), paren(&r))
        } else {
            format!("{} * {}", paren(&l), paren(&r))
        };
        out.push_str(&decl(name, &e));
    }
    let min = |i: usize| products[i].clone();
    temps(&plan.out, &min, "o", &mut out);
    let ov = |i: usize| side_var(&plan.out, &min, "o", i);
    let outs: Vec<String> = (0..d[2])
        .map(|k| {
            let e = st.sum(&plan.out.forms[k], &ov);
            let (mul, div) = (&plan.out_mul[k], &plan.out_div[k]);
            let mut e = e;
            if !mul.is_one() {
                e = format!("{} * {}", paren(&e), mul);
            }
            if !div.is_one() {
                let op = if lang == Lang::Python { "//" } else { "/" };
                e = format!("{} {op} {}", paren(&e), div);
            }
            e
        })
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
