//! The text form of a scheme, in the usual notation of the trade:
//!
//! ```text
//! # Strassen 1969
//! field Q
//! m1 = (a11 + a22)*(b11 + b22)
//! m2 = (a21 + a22)*b11
//! c11 = m1 + m4 - m5 + m7
//! ```
//!
//! A *product line* `label = (left combination)*(right combination)` defines one
//! multiplication; left names resolve in the tensor's left basis, right names in its right
//! basis. An *output line* `name = combination of labels` (the name is a result basis name)
//! gives the column of W for that result coordinate; result names not listed are zero.
//! Optional header lines: `field Q` / `field GF(p)`, `dims a b c`, `rank r` (checked).
//! Coefficients are rationals (`1/2 a11`, `-a12`, `3*b2`). Errors carry line and column.
//! See docs/schemes.md.

use super::{Scheme, reduce_into};
use crate::error::{Error, Position};
use crate::scalar::{FieldSpec, Q, parse_rational};
use crate::tensor::Tensor;
use num_traits::{One, Zero};
use std::collections::HashMap;

mod write;

pub(crate) use write::display_coef;
pub use write::{
    output_line, product_labels, product_line, product_prefix, write_combination, write_text,
};

/// A parsed term: coefficient, name (None for a bare number), column.
type Term = (Q, Option<String>, usize);

#[derive(Clone, Debug, PartialEq)]
enum Tok {
    Name(String),
    Num(Q),
    Plus,
    Minus,
    Star,
    LParen,
    RParen,
    Eq,
}

struct Lexed {
    toks: Vec<(Tok, usize)>, // token and 1-based column
    end_col: usize,
}

fn is_name_start(c: char) -> bool {
    c.is_alphabetic() || c == '_'
}
fn is_name_char(c: char) -> bool {
    c.is_alphanumeric() || c == '_' || c == '\'' || c == '.'
}

fn lex(line: &str, err: &dyn Fn(usize, String) -> Error) -> Result<Lexed, Error> {
    let chars: Vec<char> = line.chars().collect();
    let mut toks = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        let col = i + 1;
        if c == '#' {
            break;
        }
        if c.is_whitespace() {
            i += 1;
            continue;
        }
        let single = match c {
            '+' => Some(Tok::Plus),
            '-' => Some(Tok::Minus),
            '*' => Some(Tok::Star),
            '(' => Some(Tok::LParen),
            ')' => Some(Tok::RParen),
            '=' => Some(Tok::Eq),
            _ => None,
        };
        if let Some(t) = single {
            toks.push((t, col));
            i += 1;
        } else if c.is_ascii_digit() || c == '.' {
            let start = i;
            while i < chars.len() && (chars[i].is_ascii_digit() || chars[i] == '.') {
                i += 1;
            }
            if i < chars.len() && chars[i] == '/' {
                i += 1;
                while i < chars.len() && chars[i].is_ascii_digit() {
                    i += 1;
                }
            }
            let s: String = chars[start..i].iter().collect();
            if !is_number_text(&s) {
                return Err(err(
                    col,
                    format!("expected a number such as `3`, `1/2` or `0.25`, found `{s}`"),
                ));
            }
            if s.split(['.', '/'])
                .any(|d| d.len() > crate::input::MAX_DIGITS)
            {
                return Err(err(
                    col,
                    format!(
                        "a number with more than {} digits: coefficients have at most {} digits",
                        crate::input::MAX_DIGITS,
                        crate::input::MAX_DIGITS
                    ),
                ));
            }
            let v = parse_rational(&s).map_err(|m| err(col, m))?;
            toks.push((Tok::Num(v), col));
        } else if is_name_start(c) {
            let start = i;
            while i < chars.len() && is_name_char(chars[i]) {
                i += 1;
            }
            toks.push((Tok::Name(chars[start..i].iter().collect()), col));
        } else {
            return Err(err(col, format!("unexpected character `{c}`")));
        }
    }
    Ok(Lexed {
        toks,
        end_col: chars.len() + 1,
    })
}

/// The documented number forms: `123`, `1/2`, `0.25` (digits on both sides).
fn is_number_text(s: &str) -> bool {
    let digits = |x: &str| !x.is_empty() && x.bytes().all(|b| b.is_ascii_digit());
    if let Some((n, d)) = s.split_once('/') {
        return digits(n) && digits(d);
    }
    match s.split_once('.') {
        Some((i, f)) => digits(i) && digits(f),
        None => digits(s),
    }
}

/// A cursor over one line's tokens.
struct Cur<'a> {
    lx: &'a Lexed,
    pos: usize,
    err: &'a dyn Fn(usize, String) -> Error,
}

impl Cur<'_> {
    fn peek(&self) -> Option<&Tok> {
        self.lx.toks.get(self.pos).map(|t| &t.0)
    }
    fn col(&self) -> usize {
        self.lx.toks.get(self.pos).map_or(self.lx.end_col, |t| t.1)
    }
    fn fail<T>(&self, msg: impl Into<String>) -> Result<T, Error> {
        Err((self.err)(self.col(), msg.into()))
    }
    fn eat(&mut self, t: &Tok) -> bool {
        if self.peek() == Some(t) {
            self.pos += 1;
            true
        } else {
            false
        }
    }
    fn done(&self) -> bool {
        self.pos == self.lx.toks.len()
    }

    /// `[coef [*]] name` or a bare coefficient; returns (coefficient, name or None, column).
    fn term(&mut self) -> Result<Term, Error> {
        let col = self.col();
        let mut c = Q::one();
        let mut had_num = false;
        if let Some(Tok::Num(v)) = self.peek() {
            c = v.clone();
            had_num = true;
            self.pos += 1;
            if self.peek() == Some(&Tok::Star)
                && matches!(self.lx.toks.get(self.pos + 1), Some((Tok::Name(_), _)))
            {
                self.pos += 1;
            }
        }
        if let Some(Tok::Name(n)) = self.peek() {
            let n = n.clone();
            self.pos += 1;
            return Ok((c, Some(n), col));
        }
        if had_num {
            return Ok((c, None, col));
        }
        self.fail("expected a coefficient or a name")
    }

    /// A combination `t1 +- t2 ...`; a bare `0` is allowed.
    fn combination(&mut self, stop: &[Tok]) -> Result<Vec<Term>, Error> {
        let mut out = Vec::new();
        let mut sign = Q::one();
        if self.eat(&Tok::Minus) {
            sign = -sign;
        } else {
            self.eat(&Tok::Plus);
        }
        loop {
            let (c, n, col) = self.term()?;
            out.push((sign * c, n, col));
            match self.peek() {
                Some(Tok::Plus) => {
                    self.pos += 1;
                    sign = Q::one();
                }
                Some(Tok::Minus) => {
                    self.pos += 1;
                    sign = -Q::one();
                }
                None => break,
                Some(t) if stop.contains(t) => break,
                Some(_) => return self.fail("expected `+`, `-` or the end of the combination"),
            }
        }
        Ok(out)
    }

    /// A factor: `( combination )` or a single signed term.
    fn factor(&mut self) -> Result<Vec<Term>, Error> {
        if self.eat(&Tok::LParen) {
            let c = self.combination(&[Tok::RParen])?;
            if !self.eat(&Tok::RParen) {
                return self.fail("expected `)`");
            }
            Ok(c)
        } else {
            let neg = self.eat(&Tok::Minus);
            let (c, n, col) = self.term()?;
            Ok(vec![(if neg { -c } else { c }, n, col)])
        }
    }
}

/// Parse the text form against a tensor (names resolve in its three bases). The scheme is
/// over the declared field (default: the tensor's field); coefficients over GF(p) are
/// reduced to `0..p`. Product labels other than the default `m1..mr` are kept in
/// [`Scheme::labels`]. Errors: [`Error::Parse`] with line and column. Cost: linear in the
/// text plus O(r (d0 + d1 + d2)).
pub fn parse_text(text: &str, source: &str, t: &Tensor) -> Result<Scheme, Error> {
    parse_text_located(text, source, t).map(|(s, _)| s)
}

/// Where each part of a scheme was read: the 1-based line of every product line and of
/// every output line (`None` for a result coordinate without one).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LineMap {
    pub products: Vec<usize>,
    pub outputs: Vec<Option<usize>>,
}

/// [`parse_text`], also returning the line of every product and output.
pub fn parse_text_located(
    text: &str,
    source: &str,
    t: &Tensor,
) -> Result<(Scheme, LineMap), Error> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let dims = t.dims();
    let index = |axis: usize| -> HashMap<&str, usize> {
        t.names()[axis]
            .iter()
            .enumerate()
            .map(|(i, n)| (n.as_str(), i))
            .collect()
    };
    let idx = [index(0), index(1), index(2)];
    let field = t.field();
    let mut declared_rank: Option<(usize, usize)> = None;
    let mut labels: HashMap<String, usize> = HashMap::new();
    let mut label_list: Vec<String> = Vec::new();
    let mut lines = LineMap {
        products: Vec::new(),
        outputs: vec![None; dims[2]],
    };
    let mut scheme = Scheme::empty(field, dims);
    // output lines kept until all labels are known: (line, result index, terms)
    let mut outputs: Vec<(usize, usize, Vec<Term>)> = Vec::new();
    let mut seen_out = vec![false; dims[2]];
    let mut seen_any = false;
    let mut seen_statement = false;
    for (ln, line) in text.lines().enumerate() {
        let ln = ln + 1;
        let err = move |col: usize, message: String| Error::Parse {
            at: Position {
                source: source.to_string(),
                line: ln,
                column: col,
            },
            message,
        };
        let lx = lex(line, &err)?;
        if lx.toks.is_empty() {
            continue;
        }
        seen_statement = true;
        let mut cur = Cur {
            lx: &lx,
            pos: 0,
            err: &err,
        };
        let Some(Tok::Name(head)) = cur.peek().cloned() else {
            return cur
                .fail("expected a header (`field`, `dims`, `rank`), a product or an output line");
        };
        let is_assign = lx.toks.get(1).map(|t| &t.0) == Some(&Tok::Eq);
        if !is_assign {
            let rest = line.split('#').next().unwrap_or("").trim()[head.len()..].trim();
            match head.as_str() {
                "field" => {
                    if seen_any {
                        return cur.fail("`field` must come before the first product");
                    }
                    let declared = FieldSpec::parse(rest).map_err(|m| err(lx.toks[0].1, m))?;
                    // a scheme over Q reads over GF(p) (reduced coefficient by coefficient);
                    // a scheme over GF(p) only over GF(p)
                    if declared != t.field() && declared != FieldSpec::Rational {
                        return Err(err(
                            lx.toks[0].1,
                            format!(
                                "a scheme over {} cannot be read for a tensor over {} (read the tensor over {0}: --field '{0}')",
                                declared.name(),
                                t.field().name()
                            ),
                        ));
                    }
                }
                "dims" | "format" => {
                    let parts: Vec<&str> = rest
                        .split(|c: char| c.is_whitespace() || c == 'x' || c == ',')
                        .filter(|s| !s.is_empty())
                        .collect();
                    let parsed: Vec<usize> = parts.iter().filter_map(|p| p.parse().ok()).collect();
                    if parsed.len() != 3 || parts.len() != 3 {
                        return Err(err(
                            lx.toks[0].1,
                            format!("expected `dims a b c`, found `{rest}`"),
                        ));
                    }
                    if parsed != dims {
                        return Err(err(
                            lx.toks[0].1,
                            format!(
                                "the scheme declares dims {} {} {} but the tensor has {} {} {}",
                                parsed[0], parsed[1], parsed[2], dims[0], dims[1], dims[2]
                            ),
                        ));
                    }
                }
                "rank" => {
                    let r: usize = rest.parse().map_err(|_| {
                        err(lx.toks[0].1, format!("expected `rank r`, found `{rest}`"))
                    })?;
                    declared_rank = Some((r, ln));
                }
                _ => {
                    return cur.fail(format!(
                        "unknown statement `{head}` (expected `name = ...`)"
                    ));
                }
            }
            continue;
        }
        seen_any = true;
        cur.pos = 2;
        if let Some(&k) = idx[2].get(head.as_str()) {
            if seen_out[k] {
                return Err(err(
                    lx.toks[0].1,
                    format!("the output `{head}` is given twice"),
                ));
            }
            seen_out[k] = true;
            lines.outputs[k] = Some(ln);
            let terms = cur.combination(&[])?;
            outputs.push((ln, k, terms));
            continue;
        }
        if labels.contains_key(&head) {
            return Err(err(
                lx.toks[0].1,
                format!("the product `{head}` is defined twice"),
            ));
        }
        let left = cur.factor()?;
        let had_star = cur.eat(&Tok::Star);
        if !had_star && cur.peek() != Some(&Tok::LParen) {
            return cur.fail("expected `*` between the two factors of a product");
        }
        let right = cur.factor()?;
        if !cur.done() {
            return cur.fail("unexpected text after the product");
        }
        let mut vecs = Vec::new();
        for (axis, terms) in [(0usize, &left), (1, &right)] {
            let mut vec = vec![Q::zero(); dims[axis]];
            for (c, n, col) in terms {
                let c = reduce_into(field, c).map_err(|e| err(*col, e.to_string()))?;
                match n {
                    Some(n) => {
                        let Some(&i) = idx[axis].get(n.as_str()) else {
                            return Err(err(
                                *col,
                                format!(
                                    "`{n}` is not in the {} basis ({})",
                                    crate::tensor::AXES[axis],
                                    preview(&t.names()[axis])
                                ),
                            ));
                        };
                        vec[i] = reduce_into(field, &(&vec[i] + c))
                            .map_err(|e| err(*col, e.to_string()))?;
                        crate::input::check_digits(&vec[i]).map_err(|m| err(*col, m))?;
                    }
                    None if c.is_zero() => {}
                    None => return Err(err(*col, "a bare number in a factor must be 0".into())),
                }
            }
            vecs.push(vec);
        }
        labels.insert(head.clone(), scheme.rank());
        label_list.push(head);
        lines.products.push(ln);
        let w = vec![Q::zero(); dims[2]];
        let v = vecs.pop().expect("two factors");
        let u = vecs.pop().expect("two factors");
        scheme.push(u, v, w);
    }
    for (ln, k, terms) in outputs {
        for (c, n, col) in terms {
            let err = |m: String| Error::Parse {
                at: Position {
                    source: source.to_string(),
                    line: ln,
                    column: col,
                },
                message: m,
            };
            let c = reduce_into(field, &c).map_err(|e| err(e.to_string()))?;
            match n {
                Some(n) => {
                    let Some(&tt) = labels.get(&n) else {
                        return Err(err(format!(
                            "`{n}` is not a product defined in this scheme"
                        )));
                    };
                    let x = &scheme.w[tt][k] + c;
                    scheme.w[tt][k] = reduce_into(field, &x).map_err(|e| err(e.to_string()))?;
                    crate::input::check_digits(&scheme.w[tt][k]).map_err(err)?;
                }
                None if c.is_zero() => {}
                None => return Err(err("a bare number in an output line must be 0".into())),
            }
        }
    }
    if !seen_statement {
        let lines = text.lines().count();
        return Err(Error::Parse {
            at: Position {
                source: source.to_string(),
                line: lines.max(1),
                column: 1,
            },
            message: "the input is empty (no header, product or output line): expected a \
                      scheme such as `m1 = (a11 + a22)*(b11 + b22)`"
                .into(),
        });
    }
    if let Some((r, ln)) = declared_rank
        && r != scheme.rank()
    {
        return Err(Error::Parse {
            at: Position {
                source: source.to_string(),
                line: ln,
                column: 1,
            },
            message: format!(
                "declared rank {r} but {} products are defined",
                scheme.rank()
            ),
        });
    }
    let pre = product_prefix(t);
    let default = label_list
        .iter()
        .enumerate()
        .all(|(i, l)| *l == format!("{pre}{}", i + 1));
    if !default {
        scheme.labels = label_list;
    }
    Ok((scheme, lines))
}

fn preview(names: &[String]) -> String {
    let mut s = names.iter().take(12).cloned().collect::<Vec<_>>().join(" ");
    if names.len() > 12 {
        s.push_str(" ...");
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use crate::scheme::verify;
    use proptest::prelude::*;

    #[test]
    fn strassen_text_parses_and_verifies() {
        // Strassen 1969, "Gaussian elimination is not optimal" (formulas from memory).
        let t = matmul(2, 2, 2);
        let s = parse_text(STRASSEN, "strassen", &t).unwrap();
        assert_eq!(s.rank(), 7);
        assert!(verify(&s, &t).is_ok());
        let back = parse_text(&write_text(&s, &t, "Strassen"), "rt", &t).unwrap();
        assert_eq!(back, s);
    }

    #[test]
    fn errors_have_positions() {
        let t = matmul(2, 2, 2);
        let e = parse_text("m1 = (a11 + x9)*b11\n", "f", &t).unwrap_err();
        match e {
            Error::Parse { at, message } => {
                assert_eq!((at.line, at.column), (1, 13));
                assert!(message.contains("x9"), "{message}");
            }
            other => panic!("{other:?}"),
        }
        for bad in [
            "m1 = (a11 + a22*b11",
            "m1 = a11 b11",
            "c11 = m9",
            "m1 = a11*b11\nm1 = a11*b11",
            "field GF(8)",
            "dims 3 3 3",
            "rank 2\nm1 = a11*b11",
            "m1 = (a11 + 1/0 a12)*b11",
            "foo bar",
            "m1 = (a11 $ a12)*b11",
            "m1 = (3)*b11",
        ] {
            assert!(
                matches!(parse_text(bad, "f", &t), Err(Error::Parse { .. })),
                "{bad}"
            );
        }
    }

    #[test]
    fn syntax_variants() {
        // Karatsuba and Ofman 1962, written with every accepted variation of the notation
        let t = polymul(2);
        let txt = "# comment line\n\nfield Q\nrank 3\nc0 = m1   # output before its product\n\
                   m1 = a0*b0\nm2 = 1*a1 * b1\nm3 = (a0 + a1)(b0 + 0.5 b1 + 1/2*b1)\n\
                   c1 = m3 - m1 - 2/2 m2\nc2 = m2\n";
        let s = parse_text(txt, "k", &t).unwrap();
        assert_eq!(s.rank(), 3);
        assert!(verify(&s, &t).is_ok());
        assert_eq!(s, parse_text(KARATSUBA, "k", &t).unwrap());
    }

    #[test]
    fn labels_survive_text_and_json() {
        // Karatsuba and Ofman 1962 with labels of its own
        let t = polymul(2);
        let txt = "p0 = a0*b0\npinf = a1*b1\np1 = (a0 + a1)*(b0 + b1)\n\
                   c0 = p0\nc1 = p1 - p0 - pinf\nc2 = pinf\n";
        let (s, lines) = parse_text_located(txt, "k", &t).unwrap();
        assert_eq!(s.labels, ["p0", "pinf", "p1"]);
        assert_eq!(lines.products, [1, 2, 3]);
        assert_eq!(lines.outputs, [Some(4), Some(5), Some(6)]);
        let written = write_text(&s, &t, "");
        assert!(written.contains("pinf = a1*b1") && written.contains("c1 = -p0 - pinf + p1"));
        assert_eq!(parse_text(&written, "rt", &t).unwrap(), s);
        let json = crate::scheme::json::write_json(&s);
        assert_eq!(crate::scheme::json::parse_json(&json, "j").unwrap(), s);
        // default labels are not stored
        assert!(scheme(KARATSUBA, &t).labels.is_empty());
    }

    #[test]
    fn gf_p_coefficients_reduce() {
        let t = matmul(1, 1, 1).with_field(FieldSpec::Prime(7)).unwrap();
        let s = parse_text("field GF(7)\nm1 = (1/2 a11)*b11\nc11 = 2 m1\n", "f", &t).unwrap();
        assert_eq!(s.u[0][0], Q::from_integer(4.into()));
        assert!(verify(&s, &t).is_ok());
        let back = parse_text(&write_text(&s, &t, ""), "rt", &t).unwrap();
        assert_eq!(back, s);
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]
        #[test]
        fn text_round_trip(seed in 0u64..10_000, r in 0usize..6) {
            let t = matmul(2, 3, 2);
            let s = random_scheme(&t, r, seed, FieldSpec::Rational);
            let back = parse_text(&write_text(&s, &t, "x"), "rt", &t).unwrap();
            // all-zero terms keep their place; the round trip is exact
            prop_assert_eq!(back, s);
        }

        #[test]
        fn text_round_trip_gf(seed in 0u64..10_000, r in 0usize..6) {
            let t = matmul(2, 2, 3).with_field(FieldSpec::Prime(11)).unwrap();
            let s = random_scheme(&t, r, seed, FieldSpec::Prime(11));
            let back = parse_text(&write_text(&s, &t, ""), "rt", &t).unwrap();
            prop_assert_eq!(back, s);
        }
    }
}
