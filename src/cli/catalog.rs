//! `bilin catalog`: list, show, check and document the embedded catalog.

use super::{EXIT_FALSE, EXIT_OK, EXIT_USAGE};
use bilin::catalog::{self, Entry, FactCheck, FingerprintParams};
use bilin::site::{self, SiteParams};
use clap::{Args, Subcommand};
use std::path::Path;

#[derive(Args)]
pub struct CatalogArgs {
    #[command(subcommand)]
    action: Action,
}

#[derive(Subcommand)]
enum Action {
    /// List the entries, optionally filtered.
    List {
        /// Only entries of this family (e.g. lie, matmul, cayley-dickson) or of this
        /// classified range (nilpotent-lie, solvable-lie, group-algebra; see `catalog
        /// ranges`).
        #[arg(long)]
        family: Option<String>,
        /// Only entries of this dimension (algebras) or with this left dimension.
        #[arg(long)]
        dim: Option<usize>,
        /// Only entries with the stored fact `LAW = yes` (e.g. associative, lie, jordan).
        #[arg(long)]
        law: Option<String>,
        /// Only entries with this stored fact, `KEY=VALUE` (e.g. `centre=2`,
        /// `lower.central=5,2,1,0`, `nilpotent=no`); may repeat (all must hold).
        #[arg(long, value_name = "KEY=VALUE")]
        fact: Vec<String>,
    },
    /// The classified ranges: sources, published counts, and the entries per dimension.
    Ranges,
    /// For every pair of entries of a classified range and of one dimension: the first
    /// fingerprint key that separates them, or an explicit isomorphism; exit 1 if a pair is
    /// neither separated nor decided.
    Pairs {
        /// The range (default: all ranges).
        range: Option<String>,
        /// List every pair, not only the summary and the undecided pairs.
        #[arg(long)]
        all: bool,
    },
    /// Show one entry: description, sources, facts and table.
    Show {
        /// Entry name or alias.
        name: String,
        /// Also recompute the facts bilin can compute.
        #[arg(long)]
        check: bool,
    },
    /// Recompute every stored fact that bilin can compute (all entries, or one).
    Check {
        /// Entry name or alias (default: all entries).
        name: Option<String>,
    },
    /// Print the reference page docs/catalog.md.
    Doc,
    /// Write the catalog as a folder of HTML pages with pictures, for a browser (works
    /// from the local disk, no server, no network); open DIR/index.html.
    Site {
        /// The folder to write (created if missing; an existing folder must be empty or
        /// hold an earlier site).
        dir: String,
        /// Only these entries, comma-separated (default: all).
        #[arg(long)]
        only: Option<String>,
        /// Seed of the randomized invariants shown on the pages.
        #[arg(long, default_value_t = 1)]
        seed: u64,
    },
}

/// Run `bilin catalog ...`; returns the exit code.
pub fn run(args: CatalogArgs) -> i32 {
    let all = match catalog::all_entries() {
        Ok(a) => a,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_FALSE;
        }
    };
    match args.action {
        Action::List {
            family,
            dim,
            law,
            fact,
        } => list(all, family, dim, law, fact),
        Action::Ranges => ranges(),
        Action::Pairs { range, all } => pairs(range, all),
        Action::Show { name, check } => match catalog::find_entry(&name) {
            Some(e) => show(e, check),
            None => unknown(&name),
        },
        Action::Check { name } => {
            let chosen: Vec<&Entry> = match &name {
                Some(n) => match catalog::find_entry(n) {
                    Some(e) => vec![e],
                    None => return unknown(n),
                },
                None => all.iter().collect(),
            };
            check(&chosen)
        }
        Action::Site { dir, only, seed } => site(&dir, only, seed),
        Action::Doc => match catalog::doc::render_markdown() {
            Ok(s) => {
                print!("{s}");
                EXIT_OK
            }
            Err(e) => {
                eprintln!("error: {e}");
                EXIT_FALSE
            }
        },
    }
}

fn unknown(name: &str) -> i32 {
    eprintln!("error: no catalog entry named `{name}` (see `bilin catalog list`)");
    EXIT_USAGE
}

fn list(
    all: &[Entry],
    family: Option<String>,
    dim: Option<usize>,
    law: Option<String>,
    facts: Vec<String>,
) -> i32 {
    let mut wanted = Vec::new();
    for f in &facts {
        match f.split_once('=') {
            Some((k, v)) if !k.trim().is_empty() && !v.trim().is_empty() => {
                wanted.push((k.trim().to_string(), v.trim().to_string()))
            }
            _ => {
                eprintln!("error: --fact: expected KEY=VALUE, found `{f}`");
                return EXIT_USAGE;
            }
        }
    }
    println!(
        "{:<20} {:<26} {:<7} {:<10} aliases",
        "name", "family", "field", "dims"
    );
    for e in all {
        let m = &e.meta;
        if family.as_ref().is_some_and(|f| {
            !m.family.eq_ignore_ascii_case(f)
                && !m.classes.iter().any(|(r, _)| r.eq_ignore_ascii_case(f))
        }) {
            continue;
        }
        if !wanted.iter().all(|(k, v)| {
            m.facts.iter().any(|f| {
                f.key.eq_ignore_ascii_case(k) && f.value.replace(' ', "") == v.replace(' ', "")
            })
        }) {
            continue;
        }
        if let Some(l) = &law
            && !m
                .facts
                .iter()
                .any(|f| f.key.eq_ignore_ascii_case(l) && f.value == "yes")
        {
            continue;
        }
        let Ok(t) = e.tensor() else {
            eprintln!("warning: the entry {} cannot be built", m.name);
            continue;
        };
        if dim.is_some_and(|d| t.dims()[0] != d) {
            continue;
        }
        let d = t.dims();
        let dims = if t.kind() == bilin::tensor::Kind::Algebra {
            d[0].to_string()
        } else {
            format!("{}x{}->{}", d[0], d[1], d[2])
        };
        println!(
            "{:<20} {:<26} {:<7} {:<10} {}",
            m.name,
            m.family,
            t.field().name(),
            dims,
            m.aliases.join(", ")
        );
    }
    EXIT_OK
}

fn ranges() -> i32 {
    for r in catalog::classes::RANGES {
        println!(
            "{} ({})\n  {}\n  source: {}",
            r.id, r.title, r.note, r.source
        );
        let have = match catalog::classes::labels_per_dimension(r.id) {
            Ok(h) => h,
            Err(e) => {
                eprintln!("error: {e}");
                return EXIT_FALSE;
            }
        };
        let members = catalog::classes::members(r.id).unwrap_or_default();
        for (d, count, what, _) in r.published {
            let what = match what {
                catalog::classes::Counted::Classes => "classes",
                catalog::classes::Counted::Labels => "labels",
            };
            let entries = members
                .iter()
                .filter(|(e, _)| e.tensor().is_ok_and(|t| t.dims()[0] == *d))
                .count();
            println!(
                "  dimension {d}: published {count} {what}, the catalog has {} labels in {entries} entries",
                have.get(d).copied().unwrap_or(0)
            );
        }
    }
    EXIT_OK
}

fn pairs(range: Option<String>, all: bool) -> i32 {
    use catalog::classes::{PairDecision, RANGES, find_range, separate_pairs};
    let chosen: Vec<&catalog::classes::Range> = match &range {
        Some(r) => match find_range(r) {
            Some(x) => vec![x],
            None => {
                let ids: Vec<&str> = RANGES.iter().map(|r| r.id).collect();
                eprintln!(
                    "error: no classified range `{r}` (ranges: {})",
                    ids.join(", ")
                );
                return EXIT_USAGE;
            }
        },
        None => RANGES.iter().collect(),
    };
    let mut undecided_total = 0;
    for r in chosen {
        let out = match separate_pairs(r.id, &Default::default()) {
            Ok(o) => o,
            Err(e) => {
                eprintln!("error: {e}");
                return EXIT_FALSE;
            }
        };
        let mut by_key: std::collections::BTreeMap<String, usize> = Default::default();
        let (mut iso, mut undecided) = (0, 0);
        for p in &out {
            match &p.decision {
                PairDecision::Separated(k, a, b) => {
                    *by_key.entry(k.clone()).or_default() += 1;
                    if all {
                        println!("{} / {} (dim {}): {k} {a} vs {b}", p.first, p.second, p.dim);
                    }
                }
                PairDecision::Isomorphic(_) => {
                    iso += 1;
                    println!(
                        "{} / {} (dim {}): ISOMORPHIC (explicit isomorphism verified)",
                        p.first, p.second, p.dim
                    );
                }
                PairDecision::Undecided => {
                    undecided += 1;
                    println!(
                        "{} / {} (dim {}): UNDECIDED (same fingerprint, no isomorphism found)",
                        p.first, p.second, p.dim
                    );
                }
            }
        }
        let keys: Vec<String> = by_key.iter().map(|(k, n)| format!("{k} {n}")).collect();
        println!(
            "{}: {} pairs of the same dimension: {} separated by an invariant ({}), {iso} isomorphic, {undecided} undecided",
            r.id,
            out.len(),
            out.len() - iso - undecided,
            keys.join(", ")
        );
        undecided_total += undecided;
    }
    if undecided_total > 0 {
        EXIT_FALSE
    } else {
        EXIT_OK
    }
}

fn show(e: &Entry, recompute: bool) -> i32 {
    let m = &e.meta;
    println!("{} ({})", m.name, m.family);
    println!("{}", m.about);
    if !m.aliases.is_empty() {
        println!("aliases: {}", m.aliases.join(", "));
    }
    for s in &m.sources {
        println!("source: {s}");
    }
    let t = match e.tensor() {
        Ok(t) => t,
        Err(err) => {
            eprintln!("error: {err}");
            return EXIT_FALSE;
        }
    };
    let fp = recompute.then(|| catalog::compute_fingerprint(&t, &FingerprintParams::default()));
    println!("\nfacts:");
    let mut bad = false;
    for f in &m.facts {
        let dom = f
            .domain
            .as_ref()
            .map(|d| format!(" over {d}"))
            .unwrap_or_default();
        let status = match &fp {
            Some(fp) => match catalog::check_fact(f, fp, &t) {
                FactCheck::Agrees => "  [recomputed: agrees]".to_string(),
                FactCheck::Disagrees(v) => {
                    bad = true;
                    format!("  [recomputed: DISAGREES, bilin finds {v}]")
                }
                FactCheck::NotComputable(_) => "  [not recomputed]".to_string(),
            },
            None => String::new(),
        };
        println!(
            "  {} = {}{dom}{status}\n      source: {}",
            f.key, f.value, f.source
        );
    }
    let stored = catalog::stored_schemes(&m.name);
    if !stored.is_empty() {
        println!("\nschemes (use the name with emit, verify, scheme cost):");
    }
    for s in &stored {
        let name = s.file.trim_end_matches(".txt");
        match s.read() {
            Ok(sc) => println!(
                "  {name}: rank {}, over {}, verified exactly\n      source: {}",
                sc.rank(),
                sc.field.name(),
                s.source()
            ),
            Err(err) => {
                bad = true;
                println!("  {name}: DOES NOT VERIFY: {err}");
            }
        }
    }
    let best_stored = stored
        .iter()
        .filter_map(|s| s.read().ok().map(|x| x.rank()))
        .min();
    if let Some(f) = bilin::scheme::build::matmul_format_of(&t)
        && let Ok(b) = catalog::schemes::best_matmul_scheme(f, t.field())
        && best_stored.is_none_or(|r| b.scheme.rank() < r)
    {
        println!(
            "\nbuilt from the stored schemes (`bilin scheme build matmul:{},{},{}`): rank {}, \
             over {}, verified exactly\n      as {}",
            f[0],
            f[1],
            f[2],
            b.scheme.rank(),
            b.scheme.field.name(),
            b.how
        );
    }
    match &m.generate {
        Some(g) => {
            let d = t.dims();
            println!(
                "\nbuilt by the generator `{g}`: dims {} x {} -> {}, {} nonzero coefficients",
                d[0],
                d[1],
                d[2],
                t.nnz()
            );
        }
        None => println!("\ntable:\n{}", e.table_text()),
    }
    if bad { EXIT_FALSE } else { EXIT_OK }
}

fn check(entries: &[&Entry]) -> i32 {
    let (mut agree, mut disagree, mut not_comp) = (0usize, 0usize, 0usize);
    for e in entries {
        let t = match e.tensor() {
            Ok(t) => t,
            Err(err) => {
                eprintln!("{}: cannot build: {err}", e.meta.name);
                disagree += 1;
                continue;
            }
        };
        let fp = catalog::compute_fingerprint(&t, &FingerprintParams::default());
        for f in &e.meta.facts {
            match catalog::check_fact(f, &fp, &t) {
                FactCheck::Agrees => agree += 1,
                FactCheck::Disagrees(v) => {
                    disagree += 1;
                    println!(
                        "{}: stored {} = {}, bilin computes {v}",
                        e.meta.name, f.key, f.value
                    );
                }
                FactCheck::NotComputable(_) => not_comp += 1,
            }
        }
    }
    println!(
        "{} entries: {agree} facts recomputed and agree, {disagree} disagree, {not_comp} not computable by bilin",
        entries.len()
    );
    if disagree > 0 { EXIT_FALSE } else { EXIT_OK }
}

/// Whether `dir` may receive a site: missing, empty, or holding an earlier site.
fn site_folder_ok(dir: &Path) -> Result<(), String> {
    match std::fs::metadata(dir) {
        Err(_) => Ok(()),
        Ok(m) if !m.is_dir() => Err("exists and is not a folder".into()),
        Ok(_) => {
            let empty = std::fs::read_dir(dir)
                .map_err(|e| e.to_string())?
                .next()
                .is_none();
            let earlier = std::fs::read_to_string(dir.join("index.html"))
                .is_ok_and(|s| s.contains(site::html::GENERATOR));
            if empty || earlier {
                Ok(())
            } else {
                Err(
                    "is a folder that is neither empty nor an earlier catalog site; \
                     choose another folder"
                        .into(),
                )
            }
        }
    }
}

fn site(dir: &str, only: Option<String>, seed: u64) -> i32 {
    let root = Path::new(dir);
    if let Err(why) = site_folder_ok(root) {
        eprintln!("error: {dir}: {why}");
        return EXIT_USAGE;
    }
    let params = SiteParams {
        fingerprint: FingerprintParams {
            seed,
            ..FingerprintParams::default()
        },
        only: only.map(|s| s.split(',').map(|x| x.trim().to_string()).collect()),
    };
    let files = match site::build_site(&params) {
        Ok(f) => f,
        Err(e) => return super::common::report_error(&e),
    };
    for f in &files {
        let path = root.join(&f.path);
        if let Some(parent) = path.parent()
            && let Err(e) = std::fs::create_dir_all(parent)
        {
            eprintln!("error: {}: {e}", parent.display());
            return EXIT_USAGE;
        }
        if let Err(code) = super::common::write_output(&path.to_string_lossy(), &f.contents) {
            return code;
        }
    }
    let pages = files.iter().filter(|f| f.path.ends_with(".html")).count();
    println!(
        "wrote {} files ({pages} pages) to {dir}; open {} in a browser",
        files.len(),
        root.join("index.html").display()
    );
    EXIT_OK
}
