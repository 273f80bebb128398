//! The static catalog site: every link and picture reference resolves to a file of the
//! site (no network addresses), every entry has its page, the pictures are well-formed
//! SVG, the same catalog gives the same bytes, and the command refuses to write into a
//! folder it did not make.

mod common;

use bilin::catalog::{STORED_SCHEMES, all_entries};
use bilin::site::{SiteParams, build_site};
use common::run as bilin;
use std::path::{Path, PathBuf};

/// The values of `href="..."` and `src="..."` attributes in an HTML text.
fn references(html: &str) -> Vec<String> {
    let mut out = Vec::new();
    for attr in ["href=\"", "src=\""] {
        let mut rest = html;
        while let Some(at) = rest.find(attr) {
            rest = &rest[at + attr.len()..];
            let end = rest.find('"').expect("closed attribute");
            out.push(rest[..end].replace("&amp;", "&"));
            rest = &rest[end..];
        }
    }
    out
}

fn files_under(dir: &Path) -> Vec<PathBuf> {
    let mut out = Vec::new();
    for e in std::fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        if p.is_dir() {
            out.extend(files_under(&p));
        } else {
            out.push(p);
        }
    }
    out.sort();
    out
}

fn fresh(name: &str) -> PathBuf {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("target")
        .join(name);
    let _ = std::fs::remove_dir_all(&dir);
    dir
}

#[test]
fn every_link_of_the_site_resolves_to_a_file() {
    let dir = fresh("test-site");
    let (code, out, err) = bilin(&["catalog", "site", dir.to_str().unwrap()]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(out.contains("open"), "{out}");
    let files = files_under(&dir);
    let pages: Vec<&PathBuf> = files
        .iter()
        .filter(|p| p.extension().is_some_and(|e| e == "html"))
        .collect();
    let all = all_entries().unwrap();
    assert_eq!(
        pages.len(),
        all.len() + 1,
        "an index and one page per entry"
    );
    let mut checked = 0;
    for page in &pages {
        let html = std::fs::read_to_string(page).unwrap();
        assert!(html.starts_with("<!DOCTYPE html>"));
        for r in references(&html) {
            assert!(
                !r.contains("://") && !r.starts_with("//"),
                "{}: `{r}` leaves the local disk",
                page.display()
            );
            let path = r.split(['#', '?']).next().unwrap();
            if path.is_empty() {
                continue; // a link within the page
            }
            let target = page.parent().unwrap().join(path);
            assert!(
                target.is_file(),
                "{}: `{r}` does not resolve",
                page.display()
            );
            checked += 1;
        }
    }
    // every entry is linked from the index, every picture is well-formed SVG
    let index = std::fs::read_to_string(dir.join("index.html")).unwrap();
    for e in all {
        assert!(index.contains(&format!("href=\"entries/{}.html\"", e.meta.name)));
    }
    let svgs: Vec<&PathBuf> = files
        .iter()
        .filter(|p| p.extension().is_some_and(|e| e == "svg"))
        .collect();
    assert_eq!(svgs.len(), all.len() + STORED_SCHEMES.len());
    for s in svgs {
        let text = std::fs::read_to_string(s).unwrap();
        roxmltree::Document::parse(&text)
            .unwrap_or_else(|e| panic!("{}: not well-formed: {e}", s.display()));
    }
    assert!(checked > 5 * all.len());
    // a stored scheme is on its entry's page with its picture and file
    let page = std::fs::read_to_string(dir.join("entries/matmul222.html")).unwrap();
    assert!(
        page.contains("strassen: rank 7") && page.contains("../schemes/matmul222.strassen.txt")
    );
    // Cartan 1914: the derivation algebra of the octonions is G2, of dimension 14 (from memory)
    let page = std::fs::read_to_string(dir.join("entries/octonions.html")).unwrap();
    assert!(page.contains("<code>derivations</code></td><td>14</td>"));
    assert!(!page.contains("disagrees\">"), "a stored fact disagrees");

    // writing again over the same site is allowed
    assert_eq!(bilin(&["catalog", "site", dir.to_str().unwrap()]).0, 0);
}

#[test]
fn the_site_is_deterministic_and_the_command_guards_its_folder() {
    let params = SiteParams {
        only: Some(vec!["quaternions".into(), "polymul3".into()]),
        ..Default::default()
    };
    let a = build_site(&params).unwrap();
    assert_eq!(a, build_site(&params).unwrap(), "same catalog, same bytes");
    let paths: Vec<&str> = a.iter().map(|f| f.path.as_str()).collect();
    assert!(paths.contains(&"entries/polymul3.html"));
    assert!(paths.contains(&"pictures/polymul3.toom3.svg"));
    assert!(paths.contains(&"schemes/polymul3.toom3.txt"));
    assert!(!paths.iter().any(|p| p.contains("octonions")));

    let (code, _, err) = bilin(&["catalog", "site", "src"]);
    assert_eq!(code, 2);
    assert!(
        err.contains("neither empty nor an earlier catalog site"),
        "{err}"
    );
    let (code, _, err) = bilin(&["catalog", "site", "Cargo.toml"]);
    assert_eq!(code, 2);
    assert!(err.contains("not a folder"), "{err}");
    let dir = fresh("test-site-only");
    let (code, _, err) = bilin(&[
        "catalog",
        "site",
        dir.to_str().unwrap(),
        "--only",
        "no-such-entry",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("no-such-entry"), "{err}");
}
