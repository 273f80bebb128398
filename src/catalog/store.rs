//! The embedded catalog: every entry's metadata parsed once, lookup by name or alias, and
//! the entry's tensor (its table parsed by the table parser, or its generator run).

use super::entries::ENTRIES;
use super::meta::{Meta, parse_meta};
use crate::error::Error;
use crate::tensor::Tensor;
use std::sync::OnceLock;

/// One catalog entry: its file name, its full text and its metadata.
#[derive(Clone, Debug)]
pub struct Entry {
    pub file: &'static str,
    pub text: &'static str,
    pub meta: Meta,
}

impl Entry {
    /// The entry's structure tensor: the generator named by `#: generate`, otherwise the
    /// table in the file. Cost: one parse (or generation).
    pub fn tensor(&self) -> Result<Tensor, Error> {
        match &self.meta.generate {
            Some(spec) => crate::generators::generate(spec),
            None => crate::input::parse_table(self.text, &format!("<catalog {}>", self.meta.name)),
        }
    }

    /// The table part of the file (every line that is not a `#:` metadata line).
    pub fn table_text(&self) -> String {
        self.text
            .lines()
            .filter(|l| !l.trim_start().starts_with("#:"))
            .map(|l| format!("{l}\n"))
            .collect()
    }
}

static ENTRIES_PARSED: OnceLock<Result<Vec<Entry>, String>> = OnceLock::new();

/// All catalog entries in file-name order. An `Err` reports a malformed embedded entry
/// (a defect the test suite catches).
pub fn all_entries() -> Result<&'static [Entry], Error> {
    let parsed = ENTRIES_PARSED.get_or_init(|| {
        ENTRIES
            .iter()
            .map(|(file, text)| {
                let meta = parse_meta(text, file).map_err(|e| e.to_string())?;
                Ok(Entry { file, text, meta })
            })
            .collect()
    });
    parsed
        .as_deref()
        .map_err(|e| Error::Invalid(format!("malformed catalog entry: {e}")))
}

/// The entry with this name or alias (case-insensitive), if any.
pub fn find_entry(name: &str) -> Option<&'static Entry> {
    let all = all_entries().ok()?;
    all.iter()
        .find(|e| e.meta.name.eq_ignore_ascii_case(name))
        .or_else(|| all.iter().find(|e| e.meta.is_named(name)))
}

/// The entry of the matrix format with the sides of `format` in increasing order (found by
/// its alias `matmul:n,m,p`): it holds the rank facts of every order of the sides, since
/// the rank of `<n,m,p>` is invariant under permuting n, m, p (Buergisser, Clausen and
/// Shokrollahi 1997, Algebraic Complexity Theory, ch. 15, from memory).
pub fn matmul_entry(format: [usize; 3]) -> Option<&'static Entry> {
    let mut s = format;
    s.sort_unstable();
    find_entry(&format!("matmul:{},{},{}", s[0], s[1], s[2]))
}

/// The tensor of the catalog entry with this name or alias. `None` if there is no such
/// entry or it cannot be built.
pub fn catalog_tensor(name: &str) -> Option<Tensor> {
    find_entry(name)?.tensor().ok()
}

/// The input resolver for catalog names: `None` for an unknown name, otherwise the entry's
/// tensor (or the error building it).
pub fn resolve_catalog_name(name: &str) -> Option<Result<Tensor, Error>> {
    find_entry(name).map(Entry::tensor)
}

/// Register [`resolve_catalog_name`] with the input loader, so that
/// [`crate::input::load_input`] accepts catalog names (after files and generators).
/// Idempotent.
pub fn register_input_resolver() {
    crate::input::register_resolver(resolve_catalog_name);
}
