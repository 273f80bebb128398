//! Unit tests of the emitters; compiled-and-run checks live in `tests/emit_exact.rs`.

use super::*;
use crate::scalar::Q;
use crate::scheme::testkit::*;
use num_traits::Zero;

#[test]
fn refuses_a_wrong_scheme_and_keeps_labels() {
    let t = matmul(2, 2, 2);
    let mut s = scheme(STRASSEN, &t);
    s.w[0][0] = Q::zero();
    assert!(emit(&s, &t, Lang::C, &EmitParams::default()).is_err());
    let good = scheme(STRASSEN, &t);
    let tex = emit(&good, &t, Lang::Latex, &EmitParams::default()).unwrap();
    assert!(
        tex.contains("m_{1} &= (a_{11} + a_{22})\\,(b_{11} + b_{22})"),
        "{tex}"
    );
    // the user's labels survive into every target
    let k = polymul(2);
    let lab = scheme(
        "p0 = a0*b0\npinf = a1*b1\np1 = (a0 + a1)*(b0 + b1)\nc0 = p0\nc1 = p1 - p0 - pinf\nc2 = pinf\n",
        &k,
    );
    assert_eq!(lab.labels, ["p0", "pinf", "p1"]);
    for lang in [Lang::C, Lang::Rust, Lang::Python] {
        let code = emit(&lab, &k, lang, &EmitParams::default()).unwrap();
        assert!(
            code.contains("pinf = ") || code.contains("let pinf:"),
            "{code}"
        );
        assert!(!code.contains("m1"), "{code}");
    }
    let tex = emit(&lab, &k, Lang::Latex, &EmitParams::default()).unwrap();
    assert!(tex.contains("pinf &= a_{1}"), "{tex}");
}

#[test]
fn exact_is_the_default_and_float_is_on_request() {
    // Toom-style halves: exact code scales and divides, float code rounds
    let t = polymul(2);
    let s = scheme(
        "m1 = a0*b0\nm2 = a1*b1\nm3 = (1/2 a0 + 1/2 a1)*(b0 + b1)\nc0 = m1\nc1 = 2 m3 - m1 - m2\nc2 = m2\n",
        &t,
    );
    let c = emit(&s, &t, Lang::C, &EmitParams::default()).unwrap();
    assert!(c.contains("int64_t") && !c.contains("double"), "{c}");
    assert!(c.contains("no intermediate value overflows"), "{c}");
    let f = EmitParams {
        arith: Arith::Float,
        ..EmitParams::default()
    };
    let c = emit(&s, &t, Lang::C, &f).unwrap();
    assert!(c.contains("double") && c.contains("rounded"), "{c}");
    // a bound beyond 64 bits switches to 128-bit integers; beyond that it is refused
    let big = EmitParams {
        bound: Some(BigInt::from(1u64) << 40),
        ..EmitParams::default()
    };
    let c = emit(&s, &t, Lang::C, &big).unwrap();
    assert!(c.contains("__int128"), "{c}");
    let r = emit(&s, &t, Lang::Rust, &big).unwrap();
    assert!(r.contains("i128"), "{r}");
    let huge = EmitParams {
        bound: Some(BigInt::from(1u64) << 70),
        ..EmitParams::default()
    };
    assert!(emit(&s, &t, Lang::C, &huge).is_err());
    assert!(emit(&s, &t, Lang::Python, &huge).is_ok());
    // float over GF(p) is refused, big p refused for C
    let t7 = t.with_field(FieldSpec::Prime(7)).unwrap();
    let s7 = s.with_field(FieldSpec::Prime(7)).unwrap();
    assert!(emit(&s7, &t7, Lang::C, &f).is_err());
    let c7 = emit(&s7, &t7, Lang::C, &EmitParams::default()).unwrap();
    assert!(c7.contains("% P"), "{c7}");
}

#[test]
fn block_code_needs_a_matching_format() {
    let t = matmul(2, 2, 2);
    let s = scheme(WINOGRAD, &t);
    let bp = |format| EmitParams {
        blocks: Some(BlockParams { format, cutoff: 8 }),
        ..EmitParams::default()
    };
    for lang in [Lang::C, Lang::Rust, Lang::Python] {
        let code = emit(&s, &t, lang, &bp([2, 2, 2])).unwrap();
        assert!(code.contains("peel"), "{code}");
    }
    assert!(emit(&s, &t, Lang::C, &bp([2, 2, 3])).is_err());
    assert!(emit(&s, &t, Lang::Latex, &bp([2, 2, 2])).is_err());
}
