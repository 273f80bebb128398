//! A cursor over one line of input with byte positions and character columns, shared by
//! the table and grid parsers. Columns are 1-based and counted in characters.

use crate::error::{Error, Position};
use crate::scalar::Q;
use num_bigint::BigInt;
use num_traits::Zero;

pub(crate) fn is_name_start(c: char) -> bool {
    c.is_alphabetic() || c == '_'
}

pub(crate) fn is_name_char(c: char) -> bool {
    c.is_alphanumeric() || c == '_' || c == '\'' || c == '.'
}

/// Where a line sits in its source.
#[derive(Clone, Copy)]
pub(crate) struct LineRef<'a> {
    pub source: &'a str,
    pub text: &'a str,
    pub number: usize,
}

impl LineRef<'_> {
    /// The position of byte offset `b` of the line.
    pub fn pos(&self, b: usize) -> Position {
        let b = b.min(self.text.len());
        let column = self.text.get(..b).map_or(b, |s| s.chars().count()) + 1;
        Position {
            source: self.source.to_string(),
            line: self.number,
            column,
        }
    }

    pub fn err(&self, b: usize, message: impl Into<String>) -> Error {
        Error::Parse {
            at: self.pos(b),
            message: message.into(),
        }
    }
}

/// Describe what was found at a position for error messages.
pub(crate) fn found(rest: &str) -> String {
    match rest.chars().next() {
        None => "the end of the line".to_string(),
        Some(_) => {
            let tok: String = rest
                .chars()
                .take_while(|c| !c.is_whitespace())
                .take(20)
                .collect();
            format!("`{tok}`")
        }
    }
}

/// A cursor over `line.text[pos..end]`.
pub(crate) struct Cursor<'a> {
    pub line: LineRef<'a>,
    pub pos: usize,
    pub end: usize,
}

impl<'a> Cursor<'a> {
    pub fn new(line: LineRef<'a>, pos: usize, end: usize) -> Self {
        Cursor { line, pos, end }
    }

    #[inline]
    pub fn rest(&self) -> &'a str {
        &self.line.text[self.pos..self.end]
    }

    #[inline]
    pub fn peek(&self) -> Option<char> {
        if self.pos >= self.end {
            return None;
        }
        let b = self.line.text.as_bytes()[self.pos];
        if b.is_ascii() {
            return Some(b as char);
        }
        self.rest().chars().next()
    }

    #[inline]
    pub fn bump(&mut self) -> Option<char> {
        let c = self.peek()?;
        self.pos += c.len_utf8();
        Some(c)
    }

    /// Consume an optional leading sign `+` or `-`; true when it was `-`.
    pub fn take_sign(&mut self) -> bool {
        match self.peek() {
            Some('-') => {
                self.bump();
                true
            }
            Some('+') => {
                self.bump();
                false
            }
            _ => false,
        }
    }

    #[inline]
    pub fn skip_ws(&mut self) {
        while self.peek().is_some_and(char::is_whitespace) {
            self.bump();
        }
    }

    #[inline]
    pub fn at_end(&self) -> bool {
        self.pos >= self.end
    }

    pub fn err(&self, message: impl Into<String>) -> Error {
        self.line.err(self.pos, message)
    }

    /// An error "expected X, found Y" at the cursor.
    pub fn expected(&self, what: &str) -> Error {
        self.err(format!("expected {what}, found {}", found(self.rest())))
    }

    /// Read a basis name (the cursor must be at a name start).
    pub fn name(&mut self) -> Option<&'a str> {
        let start = self.pos;
        if !self.peek().is_some_and(is_name_start) {
            return None;
        }
        self.bump();
        // ASCII fast path, then characters for the rest.
        let bytes = self.line.text.as_bytes();
        while self.pos < self.end {
            let c = bytes[self.pos];
            if c.is_ascii_alphanumeric() || c == b'_' || c == b'\'' || c == b'.' {
                self.pos += 1;
            } else if c.is_ascii() {
                break;
            } else if self.peek().is_some_and(is_name_char) {
                self.bump();
            } else {
                break;
            }
        }
        Some(&self.line.text[start..self.pos])
    }

    fn digits(&mut self) -> Result<&'a str, Error> {
        let start = self.pos;
        while self.peek().is_some_and(|c| c.is_ascii_digit()) {
            self.bump();
        }
        let d = &self.line.text[start..self.pos];
        if d.len() > super::MAX_DIGITS {
            return Err(self.line.err(
                start,
                format!(
                    "a number with {} digits: coefficients have at most {} digits",
                    d.len(),
                    super::MAX_DIGITS
                ),
            ));
        }
        Ok(d)
    }

    /// Read an unsigned coefficient: `123`, `1.25` or `3/4` (the cursor is at a digit).
    pub fn number(&mut self) -> Result<Q, Error> {
        let start = self.pos;
        let int = self.digits()?;
        let int_val = parse_digits(int);
        if self.peek() == Some('.') {
            self.bump();
            if !self.peek().is_some_and(|c| c.is_ascii_digit()) {
                return Err(self.expected("digits after the decimal point"));
            }
            let frac = self.digits()?;
            if int.len() + frac.len() > super::MAX_DIGITS {
                return Err(self.line.err(
                    start,
                    format!("a decimal with more than {} digits", super::MAX_DIGITS),
                ));
            }
            let num: BigInt = format!("{int}{frac}").parse().unwrap_or_default();
            let den = num_traits::pow(BigInt::from(10), frac.len());
            return Ok(Q::new(num, den));
        }
        if self.peek() == Some('/') {
            self.bump();
            if !self.peek().is_some_and(|c| c.is_ascii_digit()) {
                return Err(self.expected("a denominator (digits) after `/`"));
            }
            let den_pos = self.pos;
            let den = parse_digits(self.digits()?);
            if den.is_zero() {
                return Err(self.line.err(
                    den_pos,
                    format!("division by zero in `{}`", &self.line.text[start..self.pos]),
                ));
            }
            return Ok(Q::new(int_val, den));
        }
        Ok(Q::from_integer(int_val))
    }
}

/// The value of a string of ASCII digits (fast path without allocation of a temporary for
/// up to 18 digits).
fn parse_digits(d: &str) -> BigInt {
    if d.len() <= 18 {
        let v = d
            .bytes()
            .fold(0u64, |acc, c| acc * 10 + u64::from(c - b'0'));
        return BigInt::from(v);
    }
    d.parse().unwrap_or_default()
}

/// Whitespace-separated tokens of a line with their byte offsets.
pub(crate) fn tokens(text: &str) -> Vec<(usize, &str)> {
    let mut out = Vec::new();
    let mut start = None;
    for (b, c) in text.char_indices() {
        match (c.is_whitespace(), start) {
            (true, Some(s)) => {
                out.push((s, &text[s..b]));
                start = None;
            }
            (false, None) => start = Some(b),
            _ => {}
        }
    }
    if let Some(s) = start {
        out.push((s, &text[s..]));
    }
    out
}
