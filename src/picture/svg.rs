//! A small SVG writer: shapes and text with integer coordinates, text escaped for XML.
//!
//! Invariants: the output is a complete, well-formed SVG 1.1 document; every coordinate is
//! an integer (no floating point reaches the bytes), so equal inputs give equal bytes on
//! every machine.

use std::fmt::Write;

/// How a text line is anchored at its x coordinate.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Anchor {
    Start,
    Middle,
    End,
}

impl Anchor {
    fn attr(self) -> &'static str {
        match self {
            Anchor::Start => "start",
            Anchor::Middle => "middle",
            Anchor::End => "end",
        }
    }
}

/// Escape `&`, `<`, `>`, `"` and `'` for XML text and attribute values; drop control
/// characters that XML 1.0 does not allow.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && c != '\t' && c != '\n' && c != '\r' => {}
            c => out.push(c),
        }
    }
    out
}

/// The width in pixels of `s` at font size `size` (monospace: 0.6 em per character,
/// rounded up).
pub fn text_width(s: &str, size: i64) -> i64 {
    (s.chars().count() as i64 * size * 3 + 4) / 5
}

/// Shorten `s` to at most `max` characters, marking a cut with `~`.
pub fn shorten(s: &str, max: usize) -> String {
    if s.chars().count() <= max || max == 0 {
        return s.to_string();
    }
    let mut t: String = s.chars().take(max.saturating_sub(1)).collect();
    t.push('~');
    t
}

/// Filled shapes grouped by colour: one `<path>` per colour instead of one element per
/// shape, so that a dense 64 x 64 x 64 tensor stays a light document. Colours are written
/// in sorted order (deterministic bytes).
#[derive(Default)]
pub struct Batch {
    by_fill: std::collections::BTreeMap<String, String>,
}

impl Batch {
    /// An axis-parallel rectangle.
    pub fn rect(&mut self, fill: &str, x: i64, y: i64, w: i64, h: i64) {
        let d = self.by_fill.entry(fill.to_string()).or_default();
        let _ = write!(d, "M{x} {y}h{w}v{h}h{}z", -w);
    }

    /// A right triangle in the top-right corner of the box at (x, y) of width w, legs m.
    pub fn corner(&mut self, fill: &str, x: i64, y: i64, w: i64, m: i64) {
        let d = self.by_fill.entry(fill.to_string()).or_default();
        let _ = write!(d, "M{} {y}h{m}v{m}z", x + w - m);
    }

    /// Write the grouped shapes into the document and empty the batch.
    pub fn flush(&mut self, svg: &mut Svg) {
        for (fill, d) in std::mem::take(&mut self.by_fill) {
            let _ = writeln!(svg.body, r#"<path d="{d}" fill="{fill}"/>"#);
        }
    }
}

/// The body of an SVG document under construction.
#[derive(Default)]
pub struct Svg {
    body: String,
}

impl Svg {
    pub fn new() -> Self {
        Svg::default()
    }

    /// A filled rectangle without outline.
    pub fn rect(&mut self, x: i64, y: i64, w: i64, h: i64, fill: &str) {
        let _ = writeln!(
            self.body,
            r#"<rect x="{x}" y="{y}" width="{w}" height="{h}" fill="{fill}"/>"#
        );
    }

    /// A rectangle with an outline (`fill` may be `none`).
    pub fn rect_outlined(
        &mut self,
        (x, y, w, h): (i64, i64, i64, i64),
        fill: &str,
        stroke: &str,
        stroke_width: i64,
    ) {
        let _ = writeln!(
            self.body,
            r#"<rect x="{x}" y="{y}" width="{w}" height="{h}" fill="{fill}" stroke="{stroke}" stroke-width="{stroke_width}"/>"#
        );
    }

    /// A closed polygon through integer points.
    pub fn polygon(&mut self, points: &[(i64, i64)], fill: &str) {
        let pts: Vec<String> = points.iter().map(|(x, y)| format!("{x},{y}")).collect();
        let _ = writeln!(
            self.body,
            r#"<polygon points="{}" fill="{fill}"/>"#,
            pts.join(" ")
        );
    }

    /// A path of straight segments (`d` in SVG path syntax, integers only), stroked.
    pub fn path(&mut self, d: &str, stroke: &str, stroke_width: i64) {
        if d.is_empty() {
            return;
        }
        let _ = writeln!(
            self.body,
            r#"<path d="{d}" fill="none" stroke="{stroke}" stroke-width="{stroke_width}"/>"#
        );
    }

    /// One line of text with its baseline at y, in the class `class` of the style sheet.
    pub fn text(&mut self, x: i64, y: i64, anchor: Anchor, class: &str, s: &str) {
        let _ = writeln!(
            self.body,
            r#"<text x="{x}" y="{y}" text-anchor="{}" class="{class}">{}</text>"#,
            anchor.attr(),
            escape(s)
        );
    }

    /// Text rotated by -90 degrees about (x, y), read from bottom to top; it starts at y
    /// and goes up.
    pub fn text_up(&mut self, x: i64, y: i64, class: &str, s: &str) {
        let _ = writeln!(
            self.body,
            r#"<text x="{x}" y="{y}" transform="rotate(-90 {x} {y})" class="{class}">{}</text>"#,
            escape(s)
        );
    }

    /// The complete document: size, title and description for screen readers, the style
    /// sheet, a white background and the body.
    pub fn finish(self, width: i64, height: i64, title: &str, desc: &str, style: &str) -> String {
        let mut out = String::with_capacity(self.body.len() + 600);
        let _ = writeln!(
            out,
            r##"<?xml version="1.0" encoding="UTF-8"?>
<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="{width}" height="{height}" viewBox="0 0 {width} {height}" role="img" aria-labelledby="title desc">
<title id="title">{}</title>
<desc id="desc">{}</desc>
<style>{style}</style>
<rect x="0" y="0" width="{width}" height="{height}" fill="#ffffff"/>"##,
            escape(title),
            escape(desc)
        );
        out.push_str(&self.body);
        out.push_str("</svg>\n");
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_markup_and_measures_text() {
        assert_eq!(escape("a<b & \"c\"'"), "a&lt;b &amp; &quot;c&quot;&apos;");
        assert_eq!(escape("x\u{1}y"), "xy");
        assert_eq!(text_width("abcde", 10), 30);
        assert_eq!(shorten("abcdefgh", 4), "abc~");
        assert_eq!(shorten("ab", 4), "ab");
    }
}
