//! The catalog as a static web site: a folder of plain HTML pages, SVG pictures and scheme
//! files that works from the local disk, without a server or a network.
//!
//! Layout (all links relative):
//! - `index.html`: every entry in a table, with filters by family, law, dimension and name;
//! - `entries/<name>.html`: one page per entry (see [`entry`]);
//! - `pictures/<name>.svg`: the structure tensor; `pictures/<name>.<label>.svg`: a stored
//!   scheme; `schemes/<name>.<label>.txt`: the scheme file itself;
//! - `style.css`.
//!
//! [`build_site`] is pure: it returns the files and their contents (deterministic bytes);
//! the command line writes them. Facts come from the catalog's own API: the stored facts
//! of each entry, its fingerprint (the invariants bilin computes) and the recomputation of
//! each stored fact against it; tensor rank bounds are not re-derived here (that needs a
//! search; `bilin catalog check` does it).

pub mod entry;
pub mod html;
pub mod index;

use crate::catalog::fingerprint::{Fingerprint, FingerprintParams, Value};
use crate::catalog::identify::entry_fingerprint;
use crate::catalog::{Entry, FactCheck, StoredScheme, all_entries, check_fact, stored_schemes};
use crate::error::Result;
use crate::picture::{SchemePictureParams, TensorPictureParams, scheme_svg, tensor_svg};
use crate::scheme::Scheme;
use crate::tensor::{Kind, Tensor};

/// Parameters of [`build_site`].
#[derive(Clone, Debug, Default)]
pub struct SiteParams {
    /// The fingerprint (its seed) used for the invariants and the fact checks.
    pub fingerprint: FingerprintParams,
    /// Only these entries (names or aliases); `None`: the whole catalog.
    pub only: Option<Vec<String>>,
}

/// One file of the site: its path relative to the site's folder (`/`-separated) and its
/// contents.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SiteFile {
    pub path: String,
    pub contents: String,
}

/// Everything a page shows about one entry, computed once.
pub struct EntryView<'a> {
    pub e: &'a Entry,
    pub t: Tensor,
    /// The file-name stem of the entry's page and pictures.
    pub slug: String,
    /// `algebra of dimension n` or `map a x b -> c`.
    pub shape: String,
    /// `dim n` or `a x b -> c`, for the index.
    pub short_shape: String,
    /// The properties that hold according to the fingerprint (sorted).
    pub laws: Vec<String>,
    pub fingerprint: Fingerprint,
    /// Per stored fact: its recomputation (`None` for tensor rank bounds).
    pub checks: Vec<Option<FactCheck>>,
    /// The stored schemes, read and verified exactly.
    pub schemes: Vec<(&'static StoredScheme, Scheme)>,
}

/// A file-name stem for an entry name: letters, digits, `-`, `_` and `.` are kept, any
/// other character becomes `_`.
pub fn slug(name: &str) -> String {
    name.chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || "-_.".contains(c) {
                c
            } else {
                '_'
            }
        })
        .collect()
}

fn shape(t: &Tensor) -> (String, String) {
    let d = t.dims();
    match t.kind() {
        Kind::Algebra => (
            format!("algebra of dimension {}", d[0]),
            format!("dim {}", d[0]),
        ),
        Kind::Bilinear => {
            let s = format!("{} x {} -> {}", d[0], d[1], d[2]);
            (format!("bilinear map {s}"), s)
        }
    }
}

fn view<'a>(e: &'a Entry, params: &SiteParams) -> Result<EntryView<'a>> {
    let t = e.tensor()?;
    let fingerprint = entry_fingerprint(e, &params.fingerprint)?;
    let mut laws: Vec<String> = fingerprint
        .entries
        .iter()
        .filter(|(_, v)| matches!(v, Value::Bool(true)))
        .map(|(k, _)| k.clone())
        .collect();
    laws.sort();
    let checks = e
        .meta
        .facts
        .iter()
        .map(|f| (!f.key.starts_with("rank.")).then(|| check_fact(f, &fingerprint, &t)))
        .collect();
    let schemes = stored_schemes(&e.meta.name)
        .into_iter()
        .map(|s| Ok((s, s.read()?)))
        .collect::<Result<Vec<_>>>()?;
    let (shape, short_shape) = shape(&t);
    Ok(EntryView {
        e,
        shape,
        short_shape,
        t,
        slug: slug(&e.meta.name),
        laws,
        fingerprint,
        checks,
        schemes,
    })
}

/// Build the whole site. Cost: one fingerprint per entry (cached per process) and one
/// picture per entry and stored scheme.
pub fn build_site(params: &SiteParams) -> Result<Vec<SiteFile>> {
    let entries: Vec<&Entry> = match &params.only {
        None => all_entries()?.iter().collect(),
        Some(names) => names
            .iter()
            .map(|n| {
                crate::catalog::find_entry(n)
                    .ok_or_else(|| crate::Error::Invalid(format!("no catalog entry named `{n}`")))
            })
            .collect::<Result<_>>()?,
    };
    let views = entries
        .into_iter()
        .map(|e| view(e, params))
        .collect::<Result<Vec<_>>>()?;
    let mut slugs: Vec<&str> = views.iter().map(|v| v.slug.as_str()).collect();
    slugs.sort_unstable();
    if let Some(w) = slugs.windows(2).find(|w| w[0] == w[1]) {
        return Err(crate::Error::Invalid(format!(
            "two entries share the page name `{}`",
            w[0]
        )));
    }
    let mut files = vec![
        SiteFile {
            path: "index.html".into(),
            contents: index::index_page(&views),
        },
        SiteFile {
            path: "style.css".into(),
            contents: html::STYLE.into(),
        },
    ];
    for (at, v) in views.iter().enumerate() {
        files.push(SiteFile {
            path: format!("entries/{}.html", v.slug),
            contents: entry::entry_page(&views, at),
        });
        let p = TensorPictureParams {
            title: Some(v.e.meta.name.clone()),
            ..Default::default()
        };
        files.push(SiteFile {
            path: format!("pictures/{}.svg", v.slug),
            contents: tensor_svg(&v.t, &p)?,
        });
        for (st, s) in &v.schemes {
            let p = SchemePictureParams {
                title: Some(format!("{} for {}", st.label, v.e.meta.name)),
            };
            files.push(SiteFile {
                path: format!("pictures/{}.{}.svg", v.slug, st.label),
                contents: scheme_svg(s, &v.t, &p)?,
            });
            files.push(SiteFile {
                path: format!("schemes/{}.{}.txt", v.slug, st.label),
                contents: st.text.to_string(),
            });
        }
    }
    Ok(files)
}
