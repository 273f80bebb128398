//! A strict JSON reader (RFC 8259) that keeps the position of every value, so that every
//! JSON form of bilin (tensors, schemes, checkpoints) reports errors at a line, a column
//! and a JSON path such as `$.u[2][1]`.
//!
//! Accepted: exactly the JSON grammar (one value, whitespace around it, an optional UTF-8
//! byte-order mark). Refused, each with its position: a duplicate key in an object,
//! nesting deeper than [`MAX_DEPTH`], control characters in strings, lone surrogates,
//! numbers outside the JSON grammar, an empty input and text after the value. Numbers are
//! kept as their text; [`Json::as_index`] reads the integers the formats need.
//! Cost: linear in the input.

use crate::error::{Error, Position, Result};

/// Deepest nesting of arrays and objects accepted (bilin's forms need four).
pub const MAX_DEPTH: usize = 64;

/// A JSON value with the byte offset where it starts.
#[derive(Clone, Debug, PartialEq)]
pub struct Json {
    pub at: usize,
    pub value: JValue,
}

/// The JSON values; numbers keep their text.
#[derive(Clone, Debug, PartialEq)]
pub enum JValue {
    Null,
    Bool(bool),
    Number(String),
    Str(String),
    Array(Vec<Json>),
    Object(Vec<Member>),
}

/// An object member with the position of its key.
#[derive(Clone, Debug, PartialEq)]
pub struct Member {
    pub key: String,
    pub key_at: usize,
    pub value: Json,
}

/// A JSON text with the name it is reported under.
#[derive(Clone, Copy)]
pub struct JsonDoc<'a> {
    pub text: &'a str,
    pub source: &'a str,
}

impl JsonDoc<'_> {
    /// The line and column (1-based, in characters) of byte offset `byte`.
    pub fn pos(&self, byte: usize) -> Position {
        let mut byte = byte.min(self.text.len());
        while !self.text.is_char_boundary(byte) {
            byte -= 1;
        }
        let before = &self.text[..byte];
        let line = before.matches('\n').count() + 1;
        let col_start = before.rfind('\n').map_or(0, |p| p + 1);
        Position {
            source: self.source.to_string(),
            line,
            column: before[col_start..].chars().count() + 1,
        }
    }

    /// An error at byte `at` about the value at JSON path `path`.
    pub fn error(&self, at: usize, path: &str, message: impl std::fmt::Display) -> Error {
        Error::Parse {
            at: self.pos(at),
            message: format!("{path}: {message}"),
        }
    }

    /// Parse the whole text as one JSON value.
    pub fn parse(&self) -> Result<Json> {
        let mut p = Parser {
            doc: *self,
            b: self.text.as_bytes(),
            i: 0,
        };
        if self.text.starts_with('\u{feff}') {
            p.i = 3;
        }
        p.ws();
        if p.i >= p.b.len() {
            return Err(
                self.error_plain(p.i, "the input is empty: expected a JSON object `{ ... }`")
            );
        }
        let v = p.value(0)?;
        p.ws();
        if p.i < p.b.len() {
            return Err(p.fail("unexpected text after the JSON value"));
        }
        Ok(v)
    }

    fn error_plain(&self, at: usize, message: impl Into<String>) -> Error {
        Error::Parse {
            at: self.pos(at),
            message: message.into(),
        }
    }
}

struct Parser<'a> {
    doc: JsonDoc<'a>,
    b: &'a [u8],
    i: usize,
}

impl Parser<'_> {
    fn fail(&self, message: impl Into<String>) -> Error {
        self.doc.error_plain(self.i, message)
    }

    fn found(&self) -> String {
        match self.doc.text.get(self.i..).and_then(|s| s.chars().next()) {
            None => "the end of the input".into(),
            Some(c) if c.is_control() => format!("the control character U+{:04X}", c as u32),
            Some(c) => format!("`{c}`"),
        }
    }

    fn expected(&self, what: &str) -> Error {
        self.fail(format!(
            "invalid JSON: expected {what}, found {}",
            self.found()
        ))
    }

    fn ws(&mut self) {
        while self.i < self.b.len() && matches!(self.b[self.i], b' ' | b'\t' | b'\n' | b'\r') {
            self.i += 1;
        }
    }

    fn value(&mut self, depth: usize) -> Result<Json> {
        let at = self.i;
        let value = match self.b.get(self.i) {
            Some(b'{') => self.object(depth)?,
            Some(b'[') => self.array(depth)?,
            Some(b'"') => JValue::Str(self.string()?),
            Some(b'-' | b'0'..=b'9') => JValue::Number(self.number()?),
            Some(b't') => self.word("true", JValue::Bool(true))?,
            Some(b'f') => self.word("false", JValue::Bool(false))?,
            Some(b'n') => self.word("null", JValue::Null)?,
            _ => return Err(self.expected("a value")),
        };
        Ok(Json { at, value })
    }

    fn word(&mut self, w: &str, v: JValue) -> Result<JValue> {
        if self.b[self.i..].starts_with(w.as_bytes()) {
            self.i += w.len();
            Ok(v)
        } else {
            Err(self.expected(
                "a value (`true`, `false`, `null`, a number, a string, a list or an object)",
            ))
        }
    }

    fn enter(&self, depth: usize) -> Result<()> {
        if depth >= MAX_DEPTH {
            return Err(self.fail(format!(
                "invalid JSON: nesting deeper than {MAX_DEPTH} levels"
            )));
        }
        Ok(())
    }

    fn array(&mut self, depth: usize) -> Result<JValue> {
        self.enter(depth)?;
        self.i += 1;
        let mut items = Vec::new();
        self.ws();
        if self.b.get(self.i) == Some(&b']') {
            self.i += 1;
            return Ok(JValue::Array(items));
        }
        loop {
            self.ws();
            items.push(self.value(depth + 1)?);
            self.ws();
            match self.b.get(self.i) {
                Some(b',') => self.i += 1,
                Some(b']') => {
                    self.i += 1;
                    return Ok(JValue::Array(items));
                }
                _ => return Err(self.expected("`,` or `]`")),
            }
        }
    }

    fn object(&mut self, depth: usize) -> Result<JValue> {
        self.enter(depth)?;
        self.i += 1;
        let mut members: Vec<Member> = Vec::new();
        self.ws();
        if self.b.get(self.i) == Some(&b'}') {
            self.i += 1;
            return Ok(JValue::Object(members));
        }
        loop {
            self.ws();
            if self.b.get(self.i) != Some(&b'"') {
                return Err(self.expected("a key in double quotes"));
            }
            let key_at = self.i;
            let key = self.string()?;
            if let Some(first) = members.iter().find(|m| m.key == key) {
                let p = self.doc.pos(first.key_at);
                return Err(self.doc.error_plain(
                    key_at,
                    format!(
                        "duplicate key \"{key}\" (first given at line {}, column {})",
                        p.line, p.column
                    ),
                ));
            }
            self.ws();
            if self.b.get(self.i) != Some(&b':') {
                return Err(self.expected("`:` after the key"));
            }
            self.i += 1;
            self.ws();
            let value = self.value(depth + 1)?;
            members.push(Member { key, key_at, value });
            self.ws();
            match self.b.get(self.i) {
                Some(b',') => self.i += 1,
                Some(b'}') => {
                    self.i += 1;
                    return Ok(JValue::Object(members));
                }
                _ => return Err(self.expected("`,` or `}`")),
            }
        }
    }

    fn hex4(&mut self) -> Result<u32> {
        let h = self
            .doc
            .text
            .get(self.i..self.i + 4)
            .filter(|h| h.bytes().all(|c| c.is_ascii_hexdigit()))
            .ok_or_else(|| self.expected("four hexadecimal digits after `\\u`"))?;
        self.i += 4;
        Ok(u32::from_str_radix(h, 16).unwrap_or(0))
    }

    fn string(&mut self) -> Result<String> {
        self.i += 1; // the opening quote
        let mut out = String::new();
        loop {
            let start = self.i;
            while self.i < self.b.len() && !matches!(self.b[self.i], b'"' | b'\\' | 0..=0x1F) {
                self.i += 1;
            }
            out.push_str(&self.doc.text[start..self.i]);
            match self.b.get(self.i) {
                None => return Err(self.fail("invalid JSON: a string is not closed")),
                Some(b'"') => {
                    self.i += 1;
                    return Ok(out);
                }
                Some(b'\\') => {
                    self.i += 1;
                    let c = match self.b.get(self.i) {
                        Some(b'"') => '"',
                        Some(b'\\') => '\\',
                        Some(b'/') => '/',
                        Some(b'b') => '\u{8}',
                        Some(b'f') => '\u{c}',
                        Some(b'n') => '\n',
                        Some(b'r') => '\r',
                        Some(b't') => '\t',
                        Some(b'u') => {
                            let c = self.unicode_escape()?;
                            out.push(c);
                            continue;
                        }
                        _ => {
                            return Err(self.expected(
                                "an escape `\\\"`, `\\\\`, `\\/`, `\\b`, `\\f`, `\\n`, `\\r`, `\\t` or `\\uXXXX`",
                            ));
                        }
                    };
                    out.push(c);
                    self.i += 1;
                }
                Some(_) => {
                    return Err(self.fail(format!(
                        "invalid JSON: {} inside a string (write it as an escape)",
                        self.found()
                    )));
                }
            }
        }
    }

    /// A `\uXXXX` escape (a surrogate pair for characters beyond U+FFFF); the cursor is
    /// at the `u`.
    fn unicode_escape(&mut self) -> Result<char> {
        let esc = self.i - 1;
        let lone = |p: &Parser| {
            p.doc
                .error_plain(esc, "invalid JSON: a lone surrogate `\\u` escape")
        };
        self.i += 1;
        let hi = self.hex4()?;
        let code = if (0xD800..0xDC00).contains(&hi) {
            if !self.b[self.i..].starts_with(b"\\u") {
                return Err(lone(self));
            }
            self.i += 2;
            let lo = self.hex4()?;
            if !(0xDC00..0xE000).contains(&lo) {
                return Err(lone(self));
            }
            0x10000 + ((hi - 0xD800) << 10) + (lo - 0xDC00)
        } else {
            hi
        };
        char::from_u32(code).ok_or_else(|| lone(self))
    }

    fn digits(&mut self) -> usize {
        let s = self.i;
        while self.b.get(self.i).is_some_and(u8::is_ascii_digit) {
            self.i += 1;
        }
        self.i - s
    }

    fn number(&mut self) -> Result<String> {
        let start = self.i;
        if self.b[self.i] == b'-' {
            self.i += 1;
        }
        match self.b.get(self.i) {
            Some(b'0') => self.i += 1,
            Some(b'1'..=b'9') => {
                self.digits();
            }
            _ => return Err(self.expected("a digit")),
        }
        if self.b.get(self.i) == Some(&b'.') {
            self.i += 1;
            if self.digits() == 0 {
                return Err(self.expected("digits after the decimal point"));
            }
        }
        if matches!(self.b.get(self.i), Some(b'e' | b'E')) {
            self.i += 1;
            if matches!(self.b.get(self.i), Some(b'+' | b'-')) {
                self.i += 1;
            }
            if self.digits() == 0 {
                return Err(self.expected("digits in the exponent"));
            }
        }
        Ok(self.doc.text[start..self.i].to_string())
    }
}

impl Json {
    /// The member `key` of an object.
    pub fn member(&self, key: &str) -> Option<&Member> {
        match &self.value {
            JValue::Object(m) => m.iter().find(|m| m.key == key),
            _ => None,
        }
    }

    /// The value of member `key` of an object.
    pub fn get(&self, key: &str) -> Option<&Json> {
        self.member(key).map(|m| &m.value)
    }

    /// A non-negative integer written in plain JSON integer form (`12`, not `12.0` or
    /// `1.2e1`) that fits in a `u64`.
    pub fn as_index(&self) -> Option<u64> {
        match &self.value {
            JValue::Number(n) if n.bytes().all(|b| b.is_ascii_digit()) => n.parse().ok(),
            _ => None,
        }
    }

    /// What the value is, for "found ..." in messages.
    pub fn describe(&self) -> String {
        match &self.value {
            JValue::Null => "null".into(),
            JValue::Bool(b) => b.to_string(),
            JValue::Number(n) => format!("the number {}", clip(n)),
            JValue::Str(s) => format!("the string \"{}\"", clip(s)),
            JValue::Array(a) => format!("a list of {} items", a.len()),
            JValue::Object(_) => "an object".into(),
        }
    }
}

fn clip(s: &str) -> String {
    if s.chars().count() > 40 {
        format!("{}...", s.chars().take(40).collect::<String>())
    } else {
        s.to_string()
    }
}

/// Refuse any member of the object `obj` (at JSON path `path`) whose key is not in
/// `allowed`, at the key's position.
pub fn check_keys(doc: &JsonDoc, obj: &Json, path: &str, allowed: &[&str]) -> Result<()> {
    if let JValue::Object(members) = &obj.value {
        for m in members {
            if !allowed.contains(&m.key.as_str()) {
                return Err(doc.error(
                    m.key_at,
                    path,
                    format!(
                        "unknown key \"{}\" (expected {})",
                        m.key,
                        allowed.join(", ")
                    ),
                ));
            }
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parse(text: &str) -> Result<Json> {
        JsonDoc { text, source: "t" }.parse()
    }

    fn err(text: &str) -> String {
        parse(text).unwrap_err().to_string()
    }

    #[test]
    fn values_and_positions() {
        let v = parse("\u{feff} {\"a\": [1, -2.5e3, \"x\\u00e9\\ud83d\\ude00\"],\n \"b\": null}")
            .unwrap();
        let a = v.get("a").unwrap();
        let JValue::Array(items) = &a.value else {
            panic!()
        };
        assert_eq!(items[0].as_index(), Some(1));
        assert_eq!(items[1].value, JValue::Number("-2.5e3".into()));
        assert_eq!(items[1].as_index(), None);
        assert_eq!(items[2].value, JValue::Str("x\u{e9}\u{1F600}".into()));
        let doc = JsonDoc {
            text: "{\"a\": 1,\n \"b\": null}",
            source: "t",
        };
        let v = doc.parse().unwrap();
        assert_eq!(doc.pos(v.member("b").unwrap().key_at).to_string(), "t:2:2");
    }

    #[test]
    fn refusals_are_located() {
        for (text, want) in [
            ("", "t:1:1: the input is empty"),
            ("  \n ", "t:2:2: the input is empty"),
            (
                "{\"a\":1,\n \"a\":2}",
                "t:2:2: duplicate key \"a\" (first given at line 1, column 2)",
            ),
            ("[1,]", "t:1:4: invalid JSON: expected a value, found `]`"),
            (
                "{\"a\":01}",
                "t:1:7: invalid JSON: expected `,` or `}`, found `1`",
            ),
            (
                "[1.]",
                "t:1:4: invalid JSON: expected digits after the decimal point",
            ),
            (
                "\"a\tb\"",
                "t:1:3: invalid JSON: the control character U+0009 inside a string",
            ),
            ("\"\\ud800x\"", "t:1:2: invalid JSON: a lone surrogate"),
            ("{} x", "t:1:4: unexpected text after the JSON value"),
            ("\"abc", "t:1:5: invalid JSON: a string is not closed"),
            ("nul", "t:1:1: invalid JSON: expected a value"),
            ("[+1]", "t:1:2: invalid JSON: expected a value, found `+`"),
        ] {
            let e = err(text);
            assert!(e.starts_with(want), "{text:?}: {e}");
        }
        let deep = "[".repeat(MAX_DEPTH + 1);
        assert!(err(&deep).contains("nesting deeper than 64"));
        let ok = format!("{}{}", "[".repeat(MAX_DEPTH), "]".repeat(MAX_DEPTH));
        assert!(parse(&ok).is_ok());
    }

    #[test]
    fn agrees_with_serde_on_valid_json() {
        // every value serde_json writes reads back with the same structure
        let v = serde_json::json!({"x": [1, 2, {"y": "z\n\"", "w": [true, false, null]}],
                                  "n": -0.5, "e": 1e300, "u": "\u{1F600}"});
        for text in [v.to_string(), serde_json::to_string_pretty(&v).unwrap()] {
            let j = parse(&text).unwrap();
            assert_eq!(to_serde(&j), v);
        }
    }

    fn to_serde(j: &Json) -> serde_json::Value {
        use serde_json::Value;
        match &j.value {
            JValue::Null => Value::Null,
            JValue::Bool(b) => Value::Bool(*b),
            JValue::Number(n) => serde_json::from_str(n).unwrap(),
            JValue::Str(s) => Value::String(s.clone()),
            JValue::Array(a) => Value::Array(a.iter().map(to_serde).collect()),
            JValue::Object(m) => Value::Object(
                m.iter()
                    .map(|m| (m.key.clone(), to_serde(&m.value)))
                    .collect(),
            ),
        }
    }
}
