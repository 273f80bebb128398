//! One entry's page: description, shape, sources, stored facts with their sources and
//! whether bilin recomputes them, the invariants bilin computes, the picture of the
//! structure tensor, the table, and the stored schemes with their pictures.

use super::EntryView;
use super::html::{code_list, esc, law_badges, page};
use crate::catalog::FactCheck;
use std::fmt::Write;

/// Tables with more nonzero coefficients than this are not printed on the page.
pub const MAX_TABLE_NNZ: usize = 400;

fn fact_status(c: &Option<FactCheck>) -> String {
    match c {
        Some(FactCheck::Agrees) => "<span class=\"agrees\">recomputed: agrees</span>".into(),
        Some(FactCheck::Disagrees(v)) => format!(
            "<span class=\"disagrees\">recomputed: bilin finds {}</span>",
            esc(v)
        ),
        Some(FactCheck::NotComputable(why)) => {
            format!("<span class=\"open\">not recomputed ({})</span>", esc(why))
        }
        None => {
            "<span class=\"open\">rank bound: checked by <code>bilin catalog check</code></span>"
                .into()
        }
    }
}

/// The page of `views[at]` (the neighbours give the previous / next links).
pub fn entry_page(views: &[EntryView], at: usize) -> String {
    let v = &views[at];
    let m = &v.e.meta;
    let mut b = String::new();
    let _ = writeln!(
        b,
        "<nav><a href=\"../index.html\">catalog</a> / family \
         <a href=\"../index.html#family={fam_url}\">{fam}</a></nav>\n<h1>{name}</h1>\n<p>{about}</p>",
        fam_url = esc(&url_component(&m.family)),
        fam = esc(&m.family),
        name = esc(&m.name),
        about = esc(&m.about)
    );
    b.push_str("<dl class=\"facts\">\n");
    let mut item = |k: &str, val: String| {
        let _ = writeln!(b, "<dt>{k}</dt><dd>{val}</dd>");
    };
    item("shape", esc(&v.shape));
    item("field", v.t.field().name());
    item("nonzero coefficients", v.t.nnz().to_string());
    if !m.aliases.is_empty() {
        item("aliases", code_list(&m.aliases));
    }
    if let Some(g) = &m.generate {
        item("built by", format!("<code>{}</code>", esc(g)));
    }
    if !v.laws.is_empty() {
        item("laws that hold", law_badges(&v.laws));
    }
    item(
        "use it",
        format!(
            "<code>bilin analyze {0}</code>, <code>bilin catalog show {0}</code>",
            esc(&m.name)
        ),
    );
    b.push_str("</dl>\n<h2>Sources</h2>\n<ul>\n");
    for s in &m.sources {
        let _ = writeln!(b, "<li>{}</li>", esc(s));
    }
    b.push_str("</ul>\n");

    let _ = writeln!(
        b,
        "<h2>Structure tensor</h2>\n<figure><a href=\"../pictures/{slug}.svg\">\
         <img src=\"../pictures/{slug}.svg\" alt=\"the slices of the structure tensor of {name}\"></a>\n\
         <figcaption>Blue: positive, orange: negative, darker: larger; a corner mark: not an \
         integer. Make it with <code>bilin draw tensor {name}</code>.</figcaption></figure>",
        slug = v.slug,
        name = esc(&m.name)
    );

    if !m.facts.is_empty() {
        b.push_str(
            "<h2>Stored facts</h2>\n<table class=\"facts-table\">\n<thead><tr><th>fact</th>\
             <th>value</th><th>over</th><th>source</th><th>bilin</th></tr></thead>\n<tbody>\n",
        );
        for (f, c) in m.facts.iter().zip(&v.checks) {
            let _ = writeln!(
                b,
                "<tr><td><code>{}</code></td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
                esc(&f.key),
                esc(&f.value),
                esc(f.domain.as_deref().unwrap_or("")),
                esc(&f.source),
                fact_status(c)
            );
        }
        b.push_str("</tbody>\n</table>\n");
    }

    b.push_str(
        "<h2>Invariants computed by bilin</h2>\n<p>Exact values, unchanged by a change of basis \
         (<code>bilin identify</code> compares them).</p>\n<table class=\"invariants\">\n<tbody>\n",
    );
    for (k, val) in &v.fingerprint.entries {
        let _ = writeln!(
            b,
            "<tr><td><code>{}</code></td><td>{}</td></tr>",
            esc(k),
            esc(&val.to_string())
        );
    }
    b.push_str("</tbody>\n</table>\n");

    b.push_str("<h2>Table</h2>\n");
    match &m.generate {
        None => {
            let _ = writeln!(b, "<pre>{}</pre>", esc(v.e.table_text().trim_end()));
        }
        Some(g) if v.t.nnz() <= MAX_TABLE_NNZ => {
            let _ = writeln!(
                b,
                "<p>Built by the generator <code>{}</code>:</p>\n<pre>{}</pre>",
                esc(g),
                esc(crate::input::write_table(&v.t).trim_end())
            );
        }
        Some(g) => {
            let _ = writeln!(
                b,
                "<p>Built by the generator <code>{}</code>; {} nonzero coefficients, printed by \
                 <code>bilin convert {}</code>.</p>",
                esc(g),
                v.t.nnz(),
                esc(&m.name)
            );
        }
    }

    if !v.schemes.is_empty() {
        b.push_str("<h2>Stored schemes</h2>\n");
        for (st, s) in &v.schemes {
            let file = format!("{}.{}", v.slug, st.label);
            let _ = writeln!(
                b,
                "<h3>{label}: rank {rank}</h3>\n<p>{source}</p>\n<figure><a href=\"../pictures/{file}.svg\">\
                 <img src=\"../pictures/{file}.svg\" alt=\"the factor matrices of the scheme {label}\"></a>\n\
                 <figcaption>Verified exactly. The file: <a href=\"../schemes/{file}.txt\">{file}.txt</a> \
                 (<code>bilin verify {name} {file}.txt</code>).</figcaption></figure>\n<pre>{text}</pre>",
                label = esc(st.label),
                rank = s.rank(),
                source = esc(st.source()),
                name = esc(&m.name),
                text = esc(st.text.trim_end()),
            );
        }
    }

    b.push_str("<nav class=\"pager\">");
    let link = |i: usize, rel: &str| {
        format!(
            "<a rel=\"{rel}\" href=\"{}.html\">{}</a>",
            views[i].slug,
            esc(&views[i].e.meta.name)
        )
    };
    b.push_str(&if at > 0 {
        format!("<span>previous: {}</span>", link(at - 1, "prev"))
    } else {
        "<span></span>".into()
    });
    b.push_str("<a href=\"../index.html\">all entries</a>");
    b.push_str(&if at + 1 < views.len() {
        format!("<span>next: {}</span>", link(at + 1, "next"))
    } else {
        "<span></span>".into()
    });
    b.push_str("</nav>\n");
    page(&format!("{} - the bilin catalog", m.name), "../", &b)
}

/// Percent-encode a value for an address fragment (letters, digits and `-._~` stay).
pub fn url_component(s: &str) -> String {
    let mut out = String::new();
    for byte in s.bytes() {
        if byte.is_ascii_alphanumeric() || b"-._~".contains(&byte) {
            out.push(byte as char);
        } else {
            let _ = write!(out, "%{byte:02X}");
        }
    }
    out
}
