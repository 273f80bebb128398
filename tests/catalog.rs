//! The catalog as a test suite: every entry parses and has sources, every stored fact that
//! bilin can compute is recomputed and must agree (the others are counted), the embedded
//! list matches the directory, docs/catalog.md is current, and `identify` finds each
//! algebra again after a seeded random change of basis.

use bilin::catalog::{self, FactCheck, FingerprintParams, IdentifyParams, IsoOutcome};
use bilin::tensor::{Kind, change_basis, change_basis_algebra, random_invertible};

#[test]
fn embedded_list_matches_directory() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("catalog");
    let mut files: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .filter(|f| f.ends_with(".bilin"))
        .collect();
    files.sort();
    let embedded: Vec<String> = catalog::embedded_files()
        .into_iter()
        .map(String::from)
        .collect();
    assert_eq!(files, embedded, "regenerate src/catalog/entries.rs");
}

#[test]
fn every_entry_parses_builds_and_has_sources() {
    let all = catalog::all_entries().unwrap();
    assert!(all.len() >= 50, "the catalog has {} entries", all.len());
    for e in all {
        let m = &e.meta;
        assert_eq!(format!("{}.bilin", m.name), e.file, "name matches the file");
        assert!(
            !m.sources.is_empty(),
            "{}: a source for the definition",
            m.name
        );
        for f in &m.facts {
            assert!(
                !f.source.trim().is_empty(),
                "{}: fact {} has a source",
                m.name,
                f.key
            );
        }
        e.tensor().unwrap_or_else(|err| panic!("{}: {err}", m.name));
    }
}

#[test]
fn names_and_aliases_are_unique() {
    let all = catalog::all_entries().unwrap();
    let mut seen = std::collections::HashMap::new();
    for e in all {
        for n in std::iter::once(&e.meta.name).chain(&e.meta.aliases) {
            let k = n.to_lowercase();
            assert!(
                seen.insert(k.clone(), e.meta.name.clone()).is_none(),
                "`{n}` names two entries"
            );
        }
    }
    assert!(catalog::catalog_tensor("H").is_some());
    assert!(catalog::catalog_tensor("no-such-entry").is_none());
}

/// Recompute every stored fact; print the counts. Each fact's source is in its entry file.
#[test]
fn stored_facts_agree_with_bilin() {
    let all = catalog::all_entries().unwrap();
    let (mut agree, mut not_comp) = (0, 0);
    let mut bad = Vec::new();
    for e in all {
        let t = e.tensor().unwrap();
        let fp = catalog::compute_fingerprint(&t, &FingerprintParams::default());
        for f in &e.meta.facts {
            match catalog::check_fact(f, &fp, &t) {
                FactCheck::Agrees => agree += 1,
                FactCheck::Disagrees(v) => bad.push(format!(
                    "{}: {} stored {} computed {v} (source: {})",
                    e.meta.name, f.key, f.value, f.source
                )),
                FactCheck::NotComputable(_) => not_comp += 1,
            }
        }
    }
    println!(
        "catalog facts: {agree} recomputed and agree, {} disagree, {not_comp} not computable by bilin",
        bad.len()
    );
    assert!(bad.is_empty(), "{bad:#?}");
    assert!(agree > 200);
}

#[test]
fn docs_page_is_current() {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/catalog.md");
    let on_disk = std::fs::read_to_string(path).unwrap_or_default();
    let generated = catalog::doc::render_markdown().unwrap();
    assert!(
        on_disk == generated,
        "docs/catalog.md is stale: run `bilin catalog doc > docs/catalog.md`"
    );
}

/// Largest algebra dimension the identification test covers: 16 in release builds, 6 in
/// debug builds (exact rational arithmetic in a random basis is slow without optimisation).
const MAX_IDENTIFY_DIM: usize = if cfg!(debug_assertions) { 6 } else { 16 };

/// After a seeded random change of basis every algebra of dimension <= MAX_IDENTIFY_DIM
/// (and every bilinear map up to 12 x 12 -> 12, with three independent changes) is
/// identified as its own entry; in dimension <= 4 an explicit isomorphism is found and
/// verified.
#[test]
fn identify_finds_each_entry_after_a_change_of_basis() {
    let all = catalog::all_entries().unwrap();
    let mut params = IdentifyParams::default();
    let mut found_iso = 0;
    for (s, e) in all.iter().enumerate() {
        let t = e.tensor().unwrap();
        let d = t.dims();
        let seed = 1000 + s as u64;
        let u = if t.kind() == Kind::Algebra {
            if d[0] > MAX_IDENTIFY_DIM {
                continue;
            }
            // a matrix invertible over the entry's field (over GF(2) some are singular)
            (0..100)
                .find_map(|k| {
                    change_basis_algebra(&t, &random_invertible(d[0], 1, seed + 7919 * k))
                })
                .unwrap()
        } else {
            if d.iter().max().unwrap() > &12 {
                continue;
            }
            let m = |k: usize, sd: u64| random_invertible(d[k], 1, sd);
            change_basis(&t, &m(0, seed), &m(1, seed + 1), &m(2, seed + 2)).unwrap()
        };
        params.search_isomorphism = t.kind() == Kind::Algebra && d[0] <= 4;
        let id = catalog::identify(&u, &params).unwrap();
        let hit = id.matches.iter().find(|m| m.name == e.meta.name);
        let hit =
            hit.unwrap_or_else(|| panic!("{} not identified; near: {:?}", e.meta.name, id.near));
        if params.search_isomorphism {
            assert!(
                matches!(hit.iso, IsoOutcome::Found(_)),
                "{}: no isomorphism found",
                e.meta.name
            );
            found_iso += 1;
        }
    }
    println!("explicit isomorphisms found and verified: {found_iso}");
}

#[test]
#[ignore]
fn time_identify_per_entry() {
    let all = catalog::all_entries().unwrap();
    let params = IdentifyParams::default();
    for (s, e) in all.iter().enumerate() {
        let t = e.tensor().unwrap();
        if t.kind() != Kind::Algebra {
            continue;
        }
        let n = t.dim();
        let u = (0..100)
            .find_map(|k| change_basis_algebra(&t, &random_invertible(n, 1, s as u64 + 7919 * k)))
            .unwrap();
        let t0 = std::time::Instant::now();
        let fp = catalog::compute_fingerprint(&u, &FingerprintParams::default());
        let t1 = t0.elapsed();
        let _ = catalog::identify(&u, &params).unwrap();
        println!(
            "{:<20} n={n:<3} fingerprint {:?} identify {:?} keys {}",
            e.meta.name,
            t1,
            t0.elapsed(),
            fp.entries.len()
        );
    }
}

/// Cross-check of the hand-written tables against the generators: an entry whose alias is a
/// generator spec has the same fingerprint as the generated tensor (and, in dimension <= 4,
/// an explicit isomorphism is found). common practice: two constructions of one algebra.
#[test]
fn tables_agree_with_generators() {
    let params = FingerprintParams::default();
    let mut compared = 0;
    for e in catalog::all_entries().unwrap() {
        for a in &e.meta.aliases {
            let Ok(g) = bilin::generators::generate(a) else {
                continue;
            };
            let t = e.tensor().unwrap();
            if t.dims()[0] > MAX_IDENTIFY_DIM || g.field() != t.field() {
                continue;
            }
            let (ft, fg) = (
                catalog::compute_fingerprint(&t, &params),
                catalog::compute_fingerprint(&g, &params),
            );
            assert!(
                ft.differences(&fg).is_empty(),
                "{} vs generator {a}: {:?}",
                e.meta.name,
                ft.differences(&fg)
            );
            if t.kind() == Kind::Algebra && t.dim() <= 4 {
                let iso = catalog::find_isomorphism(
                    &g,
                    &t,
                    &catalog::IsoParams {
                        coord_bound: 2,
                        ..Default::default()
                    },
                );
                assert!(
                    iso.is_some(),
                    "{} vs generator {a}: no isomorphism found",
                    e.meta.name
                );
            }
            compared += 1;
        }
    }
    println!("entries cross-checked against a generator: {compared}");
    assert!(compared >= 30);
}

/// The input loader resolves catalog names once the catalog's resolver is registered
/// (files first, then generators, then catalog names: docs/formats.md).
#[test]
fn catalog_names_are_inputs() {
    catalog::register_input_resolver();
    let t = bilin::input::load_input("Q8", None).unwrap();
    assert_eq!(t.dims(), [8, 8, 8]);
    let t = bilin::input::load_input("GF8", None).unwrap();
    assert_eq!(t.field(), bilin::scalar::FieldSpec::Prime(2));
    assert!(bilin::input::load_input("no-such-entry", None).is_err());
}
