//! Linear combinations `2 z - 1/3 w`, `-w`, `3/2*e1 + e2`, `0`, `i+2j`: the right-hand
//! sides of product lines and the cells of a grid.
//!
//! Grammar: `[sign] term {(+|-) term}` with `term = coef | name | coef [*] name`, whitespace
//! allowed between tokens. A bare coefficient is a multiple of the declared unit.

use super::cursor::{Cursor, is_name_start};
use crate::error::Error;
use crate::scalar::Q;
use num_traits::One;

/// One term of a combination, with the byte offset where it starts. The name borrows the
/// input line (no allocation per term).
#[derive(Clone, Debug)]
pub(crate) struct Term<'a> {
    /// The basis name, or `None` for a bare number (a multiple of the unit).
    pub name: Option<&'a str>,
    pub coef: Q,
    pub pos: usize,
}

/// Parse the combination at the cursor up to its end.
pub(crate) fn parse_combination<'a>(cur: &mut Cursor<'a>) -> Result<Vec<Term<'a>>, Error> {
    let mut terms = Vec::new();
    cur.skip_ws();
    if cur.at_end() {
        return Err(cur.expected("a combination such as `2 x - y` or `0`"));
    }
    let mut negative = cur.take_sign();
    loop {
        cur.skip_ws();
        let pos = cur.pos;
        let (coef, name) = match cur.peek() {
            Some(c) if c.is_ascii_digit() => {
                let coef = cur.number()?;
                cur.skip_ws();
                let mut star = false;
                if cur.peek() == Some('*') {
                    cur.bump();
                    cur.skip_ws();
                    star = true;
                }
                match cur.name() {
                    Some(n) => (coef, Some(n)),
                    None if star => return Err(cur.expected("a basis name after `*`")),
                    None => (coef, None),
                }
            }
            Some(c) if is_name_start(c) => (Q::one(), cur.name()),
            _ => return Err(cur.expected("a coefficient or a basis name")),
        };
        terms.push(Term {
            name,
            coef: if negative { -coef } else { coef },
            pos,
        });
        cur.skip_ws();
        match cur.peek() {
            None => break,
            Some('+') => negative = false,
            Some('-') => negative = true,
            Some(_) => {
                return Err(cur.expected("`+`, `-` or the end of the combination"));
            }
        }
        cur.bump();
    }
    Ok(terms)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::cursor::LineRef;
    use crate::scalar::q;

    fn parse(s: &str) -> Result<Vec<(Option<String>, Q)>, String> {
        let line = LineRef {
            source: "t",
            text: s,
            number: 1,
        };
        let mut c = Cursor::new(line, 0, s.len());
        parse_combination(&mut c)
            .map(|v| {
                v.into_iter()
                    .map(|t| (t.name.map(str::to_string), t.coef))
                    .collect()
            })
            .map_err(|e| e.to_string())
    }

    #[test]
    fn forms() {
        let n = |s: &str| Some(s.to_string());
        assert_eq!(
            parse("2 z - 1/3 w").unwrap(),
            vec![(n("z"), q(2, 1)), (n("w"), q(-1, 3))]
        );
        assert_eq!(parse("-w").unwrap(), vec![(n("w"), q(-1, 1))]);
        assert_eq!(
            parse("3/2*e1 + e2").unwrap(),
            vec![(n("e1"), q(3, 2)), (n("e2"), q(1, 1))]
        );
        assert_eq!(parse("0").unwrap(), vec![(None, q(0, 1))]);
        assert_eq!(
            parse("i+2j").unwrap(),
            vec![(n("i"), q(1, 1)), (n("j"), q(2, 1))]
        );
        assert_eq!(parse("-1/2e").unwrap(), vec![(n("e"), q(-1, 2))]);
        assert_eq!(parse("0.25 x'").unwrap(), vec![(n("x'"), q(1, 4))]);
        assert_eq!(parse("2e1").unwrap(), vec![(n("e1"), q(2, 1))]);
    }

    #[test]
    fn errors() {
        assert!(
            parse("")
                .unwrap_err()
                .contains("t:1:1: expected a combination")
        );
        assert!(
            parse("1/0 x")
                .unwrap_err()
                .contains("t:1:3: division by zero")
        );
        assert!(
            parse("x y")
                .unwrap_err()
                .contains("t:1:3: expected `+`, `-`")
        );
        assert!(parse("2* ").unwrap_err().contains("basis name after `*`"));
        assert!(
            parse("x + ")
                .unwrap_err()
                .contains("expected a coefficient or a basis name")
        );
        assert!(parse("2.x").unwrap_err().contains("decimal point"));
        let long = "9".repeat(5000);
        assert!(parse(&long).unwrap_err().contains("at most 4096 digits"));
    }
}
