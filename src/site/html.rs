//! The HTML skeleton shared by the catalog pages: escaping, the page frame and the style
//! sheet. Pages are plain HTML5 with relative links only, so the folder works from the
//! local disk (file://) without a server or a network.

use crate::picture::svg::escape;

/// The marker every page carries; the command line recognises an earlier site by it
/// before writing over a folder.
pub const GENERATOR: &str = r#"<meta name="generator" content="bilin catalog site">"#;

/// Escape text for HTML element content and attribute values.
pub fn esc(s: &str) -> String {
    escape(s)
}

/// The laws that hold, as badges.
pub fn law_badges(laws: &[String]) -> String {
    laws.iter()
        .map(|l| format!("<span class=\"law\">{}</span>", esc(l)))
        .collect()
}

/// Names as code, separated by commas.
pub fn code_list(names: &[String]) -> String {
    let items: Vec<String> = names
        .iter()
        .map(|x| format!("<code>{}</code>", esc(x)))
        .collect();
    items.join(", ")
}

/// A complete page: `root` is the relative path from the page to the site's top folder
/// (`""` or `"../"`).
pub fn page(title: &str, root: &str, body: &str) -> String {
    format!(
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n\
         <meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n\
         {GENERATOR}\n<title>{}</title>\n<link rel=\"stylesheet\" href=\"{root}style.css\">\n\
         </head>\n<body>\n{body}</body>\n</html>\n",
        esc(title)
    )
}

/// The style sheet of the site (`style.css`).
pub const STYLE: &str = "\
:root { --ink: #1f1f1c; --muted: #5d5b53; --line: #dedbd0; --accent: #1854a6; --paper: #fdfcf8; }
* { box-sizing: border-box; }
body { margin: 0 auto; max-width: 76rem; padding: 1.2rem 1.5rem 3rem; color: var(--ink);
  background: var(--paper); font: 15px/1.5 'DejaVu Sans', 'Helvetica Neue', Arial, sans-serif; }
a { color: var(--accent); }
h1 { font-size: 1.6rem; margin: 0.4rem 0; }
h2 { font-size: 1.15rem; margin: 1.8rem 0 0.6rem; border-bottom: 1px solid var(--line); }
h3 { font-size: 1rem; margin: 1.2rem 0 0.4rem; }
nav { font-size: 0.9rem; color: var(--muted); }
nav.pager { display: flex; justify-content: space-between; margin-top: 2rem; }
code, pre, .mono { font-family: 'DejaVu Sans Mono', Menlo, Consolas, monospace; font-size: 0.85rem; }
pre { background: #f4f2ea; border: 1px solid var(--line); padding: 0.6rem 0.8rem; overflow-x: auto; }
table { border-collapse: collapse; width: 100%; margin: 0.4rem 0; }
th, td { text-align: left; vertical-align: top; padding: 0.25rem 0.5rem; border-bottom: 1px solid var(--line); }
th { font-size: 0.8rem; text-transform: uppercase; letter-spacing: 0.04em; color: var(--muted); }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 0.15rem 1rem; }
dl.facts dt { color: var(--muted); }
dl.facts dd { margin: 0; }
.law { display: inline-block; font-size: 0.75rem; padding: 0 0.35rem; margin: 0 0.15rem 0.15rem 0;
  border: 1px solid #b9c6da; border-radius: 0.6rem; background: #eef2f8; }
.agrees { color: #1d5e2a; } .disagrees { color: #9b2c00; font-weight: bold; } .open { color: var(--muted); }
form.filters { display: flex; flex-wrap: wrap; gap: 0.6rem 1.2rem; align-items: end; margin: 1rem 0 0.4rem;
  padding: 0.6rem 0.8rem; border: 1px solid var(--line); background: #f7f5ee; }
form.filters label { display: flex; flex-direction: column; font-size: 0.8rem; color: var(--muted); }
form.filters select, form.filters input { font: inherit; padding: 0.15rem 0.3rem; min-width: 9rem; }
#count { font-size: 0.9rem; color: var(--muted); }
table.invariants { width: auto; }
table.invariants td:first-child { padding-right: 2.5rem; }
figure { margin: 0.6rem 0; }
figure img { max-width: 100%; height: auto; border: 1px solid var(--line); background: #fff; }
figcaption { font-size: 0.85rem; color: var(--muted); }
";
