//! The metadata of a catalog entry: the `#:` comment lines of a `.bilin` file.
//!
//! The table parser ignores every line starting with `#`, so an entry file is at the same
//! time a valid table and a record of where the table and its facts come from. Keys (one
//! per line, `#: key value`):
//!
//! | key | meaning |
//! |---|---|
//! | `name` | the entry's name (required, equal to the file stem) |
//! | `aliases` | other names, separated by a comma and a space (names may contain commas) |
//! | `family` | a family label such as `cayley-dickson`, `lie`, `matmul` (required) |
//! | `about` | one sentence saying what the product is (required) |
//! | `source` | a published source for the definition (at least one; may repeat) |
//! | `generate` | a generator spec that builds the tensor instead of the table body |
//! | `class` | `RANGE LABEL`: the entry belongs to a classified range (see [`super::classes`]) under the published label (may repeat) |
//! | `fact` | `key = value ; [domain FIELD ;] source TEXT`: a stored fact and its source |
//!
//! Invariant of a parsed [`Meta`]: name, family and about are nonempty, there is at least
//! one source, and every fact has a key, a value and a nonempty source.

use crate::error::{Error, Position};

/// One stored fact of an entry, e.g. `derivations = 14`, with its source.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Fact {
    /// The fact's key, e.g. `associative`, `centre`, `rank.upper`.
    pub key: String,
    /// The stored value, as written (`yes`, `no`, `14`, `4,4,4`).
    pub value: String,
    /// The field the fact refers to when it depends on it (`Q`, `GF(2)`), if stated.
    pub domain: Option<String>,
    /// The published source (or `common practice`), with `(from memory)` where recalled.
    pub source: String,
}

/// The metadata of one catalog entry.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Meta {
    pub name: String,
    pub aliases: Vec<String>,
    pub family: String,
    pub about: String,
    pub sources: Vec<String>,
    /// A generator spec (`matmul:3,3,3`) replacing the table body, if any.
    pub generate: Option<String>,
    /// The classified ranges the entry belongs to: (range id, the published label).
    pub classes: Vec<(String, String)>,
    pub facts: Vec<Fact>,
}

impl Meta {
    /// True if `name` is the entry's name or one of its aliases (case-insensitive).
    pub fn is_named(&self, name: &str) -> bool {
        self.name.eq_ignore_ascii_case(name)
            || self.aliases.iter().any(|a| a.eq_ignore_ascii_case(name))
    }

    /// The stored facts with a given key.
    pub fn facts_with_key<'a>(&'a self, key: &'a str) -> impl Iterator<Item = &'a Fact> + 'a {
        self.facts.iter().filter(move |f| f.key == key)
    }

    /// The published label of the entry in a classified range, if it belongs to it.
    pub fn label_in(&self, range: &str) -> Option<&str> {
        self.classes
            .iter()
            .find(|(r, _)| r == range)
            .map(|(_, l)| l.as_str())
    }

    /// The first stored fact with a given key.
    pub fn fact(&self, key: &str) -> Option<&Fact> {
        self.facts.iter().find(|f| f.key == key)
    }
}

/// Parse the `#:` lines of an entry file. `source` names the file in error positions.
/// Cost: linear in the text.
pub fn parse_meta(text: &str, source: &str) -> Result<Meta, Error> {
    let mut name = None;
    let mut aliases = Vec::new();
    let mut family = None;
    let mut about = None;
    let mut sources = Vec::new();
    let mut generate = None;
    let mut classes = Vec::new();
    let mut facts = Vec::new();
    for (ln, line) in text.lines().enumerate() {
        let Some(rest) = line.trim_start().strip_prefix("#:") else {
            continue;
        };
        let at = |message: String| Error::Parse {
            at: Position {
                source: source.to_string(),
                line: ln + 1,
                column: 1,
            },
            message,
        };
        let rest = rest.trim();
        let (key, value) = rest.split_once(char::is_whitespace).unwrap_or((rest, ""));
        let value = value.trim();
        if value.is_empty() {
            return Err(at(format!("the metadata key `{key}` needs a value")));
        }
        match key {
            "name" => name = Some(value.to_string()),
            "aliases" => aliases.extend(
                value
                    .split(", ")
                    .map(str::trim)
                    .filter(|s| !s.is_empty())
                    .map(String::from),
            ),
            "family" => family = Some(value.to_string()),
            "about" => about = Some(value.to_string()),
            "source" => sources.push(value.to_string()),
            "generate" => generate = Some(value.to_string()),
            "class" => {
                let (range, label) = value
                    .split_once(char::is_whitespace)
                    .map(|(r, l)| (r.trim(), l.trim()))
                    .filter(|(_, l)| !l.is_empty())
                    .ok_or_else(|| {
                        at(format!(
                            "a class line is `#: class RANGE LABEL`, found `{value}`"
                        ))
                    })?;
                classes.push((range.to_string(), label.to_string()));
            }
            "fact" => facts.push(parse_fact(value).map_err(at)?),
            _ => {
                return Err(at(format!(
                    "unknown metadata key `{key}` (expected name, aliases, family, about, source, generate, class or fact)"
                )));
            }
        }
    }
    let missing =
        |k: &str| Error::Invalid(format!("{source}: the catalog entry has no `#: {k}` line"));
    let meta = Meta {
        name: name.ok_or_else(|| missing("name"))?,
        aliases,
        family: family.ok_or_else(|| missing("family"))?,
        about: about.ok_or_else(|| missing("about"))?,
        sources,
        generate,
        classes,
        facts,
    };
    if meta.sources.is_empty() {
        return Err(missing("source"));
    }
    Ok(meta)
}

/// `key = value ; [domain D ;] source TEXT`. The source text may itself contain `;`.
fn parse_fact(text: &str) -> Result<Fact, String> {
    let (key, rest) = text
        .split_once('=')
        .ok_or_else(|| format!("a fact is written `key = value ; source ...`, found `{text}`"))?;
    let mut parts = rest.splitn(2, ';');
    let value = parts.next().unwrap_or("").trim().to_string();
    let mut tail = parts.next().unwrap_or("").trim();
    let mut domain = None;
    if let Some(r) = tail.strip_prefix("domain") {
        let (d, t) = r
            .split_once(';')
            .ok_or_else(|| "a fact's `domain D` must be followed by `; source ...`".to_string())?;
        domain = Some(d.trim().to_string());
        tail = t.trim();
    }
    let source = tail
        .strip_prefix("source")
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .ok_or_else(|| format!("the fact `{}` has no `; source ...`", key.trim()))?;
    let key = key.trim().to_string();
    if key.is_empty() || value.is_empty() {
        return Err(format!("a fact needs a key and a value, found `{text}`"));
    }
    Ok(Fact {
        key,
        value,
        domain,
        source: source.to_string(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_metadata_and_rejects_missing_sources() {
        let text = "#: name x\n#: aliases a, b, m:2,2\n#: family f\n#: about y\n#: source S 1999\n\
                    #: class r L_{2,1}\n#: fact rank.upper = 8 ; domain Q ; source T 2000; p. 3\nfield Q\n";
        let m = parse_meta(text, "x").unwrap();
        assert_eq!(m.aliases, vec!["a", "b", "m:2,2"]);
        assert_eq!(m.facts[0].domain.as_deref(), Some("Q"));
        assert_eq!(m.label_in("r"), Some("L_{2,1}"));
        assert!(parse_meta("#: name x\n#: class r\n", "x").is_err());
        assert_eq!(m.facts[0].source, "T 2000; p. 3");
        assert!(m.is_named("B"));
        assert!(parse_meta("#: name x\n#: family f\n#: about y\n", "x").is_err());
        assert!(parse_meta("#: name x\n#: fact a = 1\n", "x").is_err());
        assert!(parse_meta("#: nme x\n", "x").is_err());
    }
}
