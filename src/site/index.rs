//! The index page: one table row per entry, filters by family, law, dimension and name in
//! a small inline script. The filter state lives in the address fragment
//! (`index.html#family=lie&law=associative&dim=3&q=sl`), so a filtered view can be
//! bookmarked and linked; without scripts every row stays visible.

use super::EntryView;
use super::html::{esc, law_badges, page};
use std::collections::BTreeSet;
use std::fmt::Write;

/// The filter script. Rows carry `data-family`, `data-laws` (space separated),
/// `data-dim` and `data-names` (name and aliases, lower case).
const SCRIPT: &str = r#"
(function () {
  var keys = ['family', 'law', 'dim', 'q'];
  var field = {};
  keys.forEach(function (k) { field[k] = document.getElementById('f-' + k); });
  var rows = Array.prototype.slice.call(document.querySelectorAll('#entries tbody tr'));
  var count = document.getElementById('count');
  function matches(r) {
    var fam = field.family.value, law = field.law.value, dim = field.dim.value;
    var q = field.q.value.trim().toLowerCase();
    return (!fam || r.getAttribute('data-family') === fam) &&
      (!law || (' ' + r.getAttribute('data-laws') + ' ').indexOf(' ' + law + ' ') >= 0) &&
      (!dim || r.getAttribute('data-dim') === dim) &&
      (!q || r.getAttribute('data-names').indexOf(q) >= 0);
  }
  function apply() {
    var shown = 0;
    rows.forEach(function (r) { var ok = matches(r); r.hidden = !ok; if (ok) { shown++; } });
    count.textContent = shown + ' of ' + rows.length + ' entries';
    var parts = [];
    keys.forEach(function (k) {
      if (field[k].value) { parts.push(k + '=' + encodeURIComponent(field[k].value)); }
    });
    var hash = parts.length ? '#' + parts.join('&') : '';
    if (location.hash !== hash) {
      try { history.replaceState(null, '', hash || location.pathname); } catch (e) { /* file: pages may refuse */ }
    }
  }
  function load() {
    keys.forEach(function (k) { field[k].value = ''; });
    location.hash.slice(1).split('&').forEach(function (p) {
      var i = p.indexOf('=');
      var k = p.slice(0, i), v = decodeURIComponent(p.slice(i + 1));
      if (i > 0 && field[k]) { field[k].value = v; }
    });
    apply();
  }
  ['family', 'law', 'dim'].forEach(function (k) { field[k].addEventListener('change', apply); });
  field.q.addEventListener('input', apply);
  document.getElementById('f-reset').addEventListener('click', function (ev) {
    ev.preventDefault(); keys.forEach(function (k) { field[k].value = ''; }); apply();
  });
  window.addEventListener('hashchange', load);
  load();
})();
"#;

fn select(id: &str, label: &str, all: &str, options: &[String]) -> String {
    let mut s = format!(
        "<label for=\"f-{id}\">{label}<select id=\"f-{id}\">\n<option value=\"\">{all}</option>\n"
    );
    for o in options {
        let _ = writeln!(s, "<option value=\"{0}\">{0}</option>", esc(o));
    }
    s.push_str("</select></label>\n");
    s
}

/// The index page. `views` are in catalog order.
pub fn index_page(views: &[EntryView]) -> String {
    let families: BTreeSet<String> = views.iter().map(|v| v.e.meta.family.clone()).collect();
    let laws: BTreeSet<String> = views.iter().flat_map(|v| v.laws.iter().cloned()).collect();
    let mut dims: Vec<usize> = views.iter().map(|v| v.t.dims()[0]).collect();
    dims.sort_unstable();
    dims.dedup();
    let families: Vec<String> = families.into_iter().collect();
    let laws: Vec<String> = laws.into_iter().collect();
    let dims: Vec<String> = dims.iter().map(|d| d.to_string()).collect();

    let mut b = String::new();
    let _ = writeln!(
        b,
        "<header>\n<h1>The bilin catalog</h1>\n<p>{} known algebras and bilinear maps, each with \
         its table, its stored facts and their sources, the invariants bilin recomputes, \
         pictures of its structure tensor and any stored schemes. Every page works from the \
         local disk. Made by <code>bilin catalog site</code>.</p>\n</header>",
        views.len()
    );
    b.push_str("<form class=\"filters\" id=\"filters\">\n");
    b.push_str(&select("family", "family", "all families", &families));
    b.push_str(&select("law", "law that holds", "any", &laws));
    b.push_str(&select("dim", "dimension (left)", "any dimension", &dims));
    b.push_str(
        "<label for=\"f-q\">name or alias<input id=\"f-q\" type=\"search\" placeholder=\"e.g. sl\"></label>\n\
         <button id=\"f-reset\" type=\"button\">show all</button>\n</form>\n",
    );
    let _ = writeln!(b, "<p id=\"count\">{0} of {0} entries</p>", views.len());
    b.push_str(
        "<table id=\"entries\">\n<thead><tr><th>name</th><th>family</th><th>field</th>\
         <th>shape</th><th>laws that hold</th><th>about</th></tr></thead>\n<tbody>\n",
    );
    for v in views {
        let m = &v.e.meta;
        let mut names = vec![m.name.to_lowercase()];
        names.extend(m.aliases.iter().map(|a| a.to_lowercase()));
        let _ = writeln!(
            b,
            "<tr data-family=\"{fam}\" data-laws=\"{laws_attr}\" data-dim=\"{dim}\" data-names=\"{names}\">\
             <td><a href=\"entries/{slug}.html\">{name}</a></td><td>{fam}</td><td>{field}</td>\
             <td class=\"mono\">{shape}</td><td>{laws}</td><td>{about}</td></tr>",
            laws = law_badges(&v.laws),
            fam = esc(&m.family),
            laws_attr = esc(&v.laws.join(" ")),
            dim = v.t.dims()[0],
            names = esc(&names.join(" ")),
            slug = v.slug,
            name = esc(&m.name),
            field = v.t.field().name(),
            shape = esc(&v.short_shape),
            about = esc(&m.about),
        );
    }
    b.push_str("</tbody>\n</table>\n");
    let _ = writeln!(b, "<script>{SCRIPT}</script>");
    page("The bilin catalog", "", &b)
}
