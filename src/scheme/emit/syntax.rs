//! The pieces of emitted code shared by straight-line and block code: number literals,
//! signed sums, variable names made from the user's product labels, comment headers.

use super::Lang;
use crate::scalar::Q;
use crate::scheme::cost::Form;
use num_traits::{One, Signed};
use std::collections::HashSet;

/// How numbers are written: exact integers, doubles, or residues mod p.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Num {
    /// Integer arithmetic; `wide` is 128-bit (C `__int128`, Rust `i128`).
    Int {
        wide: bool,
    },
    Float,
    Mod(u64),
}

/// A language with a number style.
#[derive(Clone, Copy, Debug)]
pub struct Style {
    pub lang: Lang,
    pub num: Num,
    /// Block code: Rust literals are cast to the element type `T`.
    pub generic: bool,
}

impl Style {
    /// The literal of a positive coefficient.
    pub fn literal(&self, c: &Q) -> String {
        match self.num {
            Num::Int { .. } | Num::Mod(_) => {
                let s = c.numer().to_string();
                if self.generic && self.lang == Lang::Rust {
                    format!("({s} as T)")
                } else {
                    s
                }
            }
            Num::Float => {
                let small = |x: &num_bigint::BigInt| x.bits() <= 53;
                let lit = if c.is_integer() && small(c.numer()) {
                    format!("{}.0", c.numer())
                } else if small(c.numer()) && small(c.denom()) {
                    format!("({}.0 / {}.0)", c.numer(), c.denom())
                } else {
                    format!("{:e}", crate::scalar::q_to_f64(c))
                };
                if self.generic && self.lang == Lang::Rust {
                    format!("({lit} as T)")
                } else {
                    lit
                }
            }
        }
    }

    /// The zero of the style.
    pub fn zero(&self) -> String {
        match (self.num, self.generic, self.lang) {
            (_, true, Lang::Rust) => "T::default()".into(),
            (Num::Float, _, Lang::C | Lang::Rust) => "0.0".into(),
            _ => "0".into(),
        }
    }

    /// The expression of a form whose variables are named by `var`. Over GF(p) the value
    /// is reduced into `0..p` (a coefficient p - 1 is a subtraction `P - x`).
    pub fn sum(&self, f: &Form, var: &dyn Fn(usize) -> String) -> String {
        if f.is_empty() {
            return self.zero();
        }
        if let Num::Mod(p) = self.num {
            if f.len() == 1 && f[0].1.is_one() {
                return var(f[0].0);
            }
            let pm1 = Q::from_integer((p - 1).into());
            let terms: Vec<String> = f
                .iter()
                .map(|(i, c)| {
                    if c.is_one() {
                        var(*i)
                    } else if *c == pm1 {
                        format!("P - {}", var(*i))
                    } else {
                        format!("{} * {} % P", self.literal(c), var(*i))
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
                format!("{} * {}", self.literal(&a), var(*i))
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

    /// The comment marker of the language.
    pub fn comment(&self) -> &'static str {
        comment(self.lang)
    }
}

/// `//` for C and Rust, `#` for Python, `%` for LaTeX.
pub fn comment(lang: Lang) -> &'static str {
    match lang {
        Lang::C | Lang::Rust => "//",
        Lang::Python => "#",
        Lang::Latex => "%",
    }
}

/// True when `e` is one parenthesised group `( ... )`.
fn wrapped(e: &str) -> bool {
    if !e.starts_with('(') {
        return false;
    }
    let mut depth = 0i32;
    for (i, ch) in e.char_indices() {
        match ch {
            '(' => depth += 1,
            ')' => {
                depth -= 1;
                if depth == 0 {
                    return i == e.len() - 1;
                }
            }
            _ => {}
        }
    }
    false
}

/// Parenthesise an expression unless it is a single unsigned term or already one group.
pub fn paren(e: &str) -> String {
    if (e.contains(' ') || e.starts_with('-')) && !wrapped(e) {
        format!("({e})")
    } else {
        e.to_string()
    }
}

/// The header lines as comments.
pub fn header(lines: &[String], lang: Lang) -> String {
    let c = comment(lang);
    lines.iter().map(|h| format!("{c} {h}\n")).collect()
}

const RESERVED: &[&str] = &[
    "a", "b", "c", "P", "T", "i", "j", "k", "n", "m", "p", "N", "M", "A", "B", "C", "as", "break",
    "case", "char", "const", "continue", "def", "do", "double", "else", "enum", "extern", "fn",
    "for", "if", "in", "int", "is", "let", "long", "loop", "match", "mod", "move", "mut", "not",
    "or", "pub", "ref", "return", "self", "short", "signed", "sizeof", "static", "struct",
    "switch", "type", "union", "unsigned", "use", "void", "while", "with", "and", "del", "from",
    "global", "import", "lambda", "pass", "raise", "try", "yield", "None", "True", "False", "np",
    "buf", "len", "bn", "bm", "bp", "cutoff", "lda", "ldb", "ldc", "acc", "N0", "M0", "P0",
    "n_main", "m_main", "p_main", "CUTOFF", "free", "malloc", "size_t",
];

/// Identifiers for the products from the user's labels: characters other than letters,
/// digits and `_` become `_`; names that are reserved words of a target, clash with the
/// generated names (`a`, `b`, `c`, `s0`, `r0`, `o0`, ...) or repeat get an `m_` prefix and
/// if need be a number.
pub fn product_names(labels: &[String]) -> Vec<String> {
    let generated = |s: &str| {
        let mut cs = s.chars();
        matches!(
            cs.next(),
            Some('s' | 'r' | 'o' | 'A' | 'B' | 'C' | 'L' | 'R')
        ) && cs.clone().next().is_some()
            && cs.all(|c| c.is_ascii_digit() || c == '_')
    };
    let mut seen = HashSet::new();
    labels
        .iter()
        .enumerate()
        .map(|(t, l)| {
            let mut s: String = l
                .chars()
                .map(|c| if c.is_ascii_alphanumeric() { c } else { '_' })
                .collect();
            if s.is_empty()
                || s.starts_with(|c: char| c.is_ascii_digit())
                || RESERVED.contains(&s.as_str())
                || generated(&s)
                || s.starts_with("bilin")
            {
                s = format!("m_{s}");
            }
            if !seen.insert(s.clone()) {
                s = format!("m_{s}_{}", t + 1);
                seen.insert(s.clone());
            }
            s
        })
        .collect()
}

/// The scalar type of a style in a language (straight-line code).
pub fn scalar_type(lang: Lang, num: Num) -> &'static str {
    match (lang, num) {
        (Lang::C, Num::Int { wide: false }) => "int64_t",
        (Lang::C, Num::Int { wide: true }) => "__int128",
        (Lang::C, Num::Float) => "double",
        (Lang::C, Num::Mod(_)) => "uint64_t",
        (Lang::Rust, Num::Int { wide: false }) => "i64",
        (Lang::Rust, Num::Int { wide: true }) => "i128",
        (Lang::Rust, Num::Float) => "f64",
        (Lang::Rust, Num::Mod(_)) => "u64",
        _ => "",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn product_names_are_identifiers() {
        let l: Vec<String> = ["p0", "pinf", "a", "s1", "x'", "x_", "if", "2x"]
            .iter()
            .map(|s| s.to_string())
            .collect();
        let n = product_names(&l);
        assert_eq!(n[0], "p0");
        assert_eq!(n[1], "pinf");
        assert_eq!(n[2], "m_a");
        assert_eq!(n[3], "m_s1");
        assert_eq!(n[4], "x_");
        assert_eq!(n[5], "m_x__6");
        assert_eq!(n[6], "m_if");
        assert_eq!(n[7], "m_2x");
    }
}
