//! `bilin identify INPUT`: the invariant fingerprint of an input and the catalog entries
//! it matches, nearly matches, and explicit isomorphisms where found; as text or JSON
//! (`--json`, schema `bilin.identify/2`).

use super::{EXIT_OK, EXIT_USAGE};
use bilin::catalog::{IdentifyParams, IsoOutcome, identify};
use bilin::linalg::Matrix;
use bilin::report::identify::{identify_report, render_identify_json};
use bilin::scalar::Q;
use clap::Args;

#[derive(Args)]
pub struct IdentifyArgs {
    #[command(flatten)]
    pub source: super::common::SourceArgs,
    /// Do not search for explicit isomorphisms.
    #[arg(long)]
    no_iso: bool,
    /// Integer coordinate bound of the isomorphism search.
    #[arg(long, default_value_t = 1)]
    bound: i64,
    /// Seed of the randomized fingerprint keys.
    #[arg(long, default_value_t = 1)]
    seed: u64,
    /// Print the report as JSON (schema `bilin.identify/2`, see docs/identify-json.md).
    #[arg(long)]
    json: bool,
}

/// Run `bilin identify`; returns the exit code.
pub fn run(args: IdentifyArgs) -> i32 {
    let t = match args.source.load() {
        Ok(t) => t,
        Err(code) => return code,
    };
    let mut params = IdentifyParams {
        search_isomorphism: !args.no_iso,
        ..Default::default()
    };
    params.iso.coord_bound = args.bound;
    params.fingerprint.seed = args.seed;
    let id = match identify(&t, &params) {
        Ok(id) => id,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_USAGE;
        }
    };
    if args.json {
        let r = identify_report(&args.source.input, &t, &id, args.bound);
        println!("{}", render_identify_json(&r));
        return EXIT_OK;
    }
    println!("fingerprint of {}:", args.source.input);
    for (k, v) in &id.fingerprint.entries {
        println!("  {k:<20} {v}");
    }
    println!();
    if id.matches.is_empty() {
        println!("no catalog entry has this fingerprint.");
        if let Some(p) = &id.matrix_product {
            let [n, m, q] = p.format;
            println!(
                "  a matrix product <{n},{m},{q}> in bases of its own, ISOMORPHIC to the generator \
                 matmul:{n},{m},{q}, verified exactly{}; each basis vector of the input (left) \
                 is, in the generator's bases (right),",
                match &p.entry {
                    Some(e) => format!(
                        " (catalog entry {e} holds the rank facts of every order of its sides: \
                         the rank is invariant under permuting n, m, p)"
                    ),
                    None => String::new(),
                }
            );
            let model = bilin::generators::generate(&format!("matmul:{n},{m},{q}")).ok();
            print_maps(&p.maps, &t, model.as_ref());
        }
    } else {
        println!(
            "catalog entries with the same fingerprint (evidence of isomorphism, not a proof):"
        );
    }
    let nilpotent_lie = id.fingerprint.get("nilpotency.class").is_some()
        && id
            .fingerprint
            .get("lie")
            .is_some_and(|v| v.to_string() == "yes");
    for m in &id.matches {
        match &m.iso {
            IsoOutcome::Found(mat) => {
                println!(
                    "  {}: ISOMORPHIC, verified exactly: each basis vector of the input (left) \
                     is, in the entry's basis (right),",
                    m.name
                );
                let entry = bilin::catalog::catalog_tensor(&m.name);
                print_images(mat, &t.names()[0], entry.as_ref().map(|e| &e.names()[0]));
            }
            IsoOutcome::FoundMaps(maps) => {
                println!(
                    "  {}: ISOMORPHIC, verified exactly: each basis vector of the input (left) \
                     is, in the entry's bases (right),",
                    m.name
                );
                let entry = bilin::catalog::catalog_tensor(&m.name);
                print_maps(maps, &t, entry.as_ref());
            }
            IsoOutcome::NotFound if nilpotent_lie => println!(
                "  {}: fingerprint matches; the solver along the lower central series found no isomorphism (not a proof either way)",
                m.name
            ),
            IsoOutcome::NotFound => println!(
                "  {}: fingerprint matches; no isomorphism with coordinates in -{b}..{b} found (not a proof either way)",
                m.name,
                b = args.bound
            ),
            IsoOutcome::NotAttempted(why) => println!(
                "  {}: fingerprint matches; isomorphism search not attempted ({why})",
                m.name
            ),
        }
    }
    if !id.near.is_empty() {
        println!(
            "\nnear matches (same kind, field and dimensions), and the invariants that separate them:"
        );
        for n in &id.near {
            let d: Vec<String> = n
                .differences
                .iter()
                .map(|(k, a, b)| format!("{k}: input {a}, entry {b}"))
                .collect();
            println!("  {}: {}", n.name, d.join("; "));
        }
    }
    EXIT_OK
}

/// The three maps of an isomorphism of bilinear maps, axis by axis ([`print_images`]),
/// with the basis names of the target where known.
fn print_maps(
    maps: &[Matrix<Q>; 3],
    t: &bilin::tensor::Tensor,
    target: Option<&bilin::tensor::Tensor>,
) {
    for (axis, mat) in maps.iter().enumerate() {
        println!("    {} axis:", bilin::tensor::AXES[axis]);
        print_images(mat, &t.names()[axis], target.map(|e| &e.names()[axis]));
    }
}

/// One line per basis vector of the input: its image, column j of `mat`, in the entry's
/// basis (the entry's names when they fit, else `f0, f1, ...`).
fn print_images(mat: &Matrix<Q>, ours: &[String], entry_names: Option<&Vec<String>>) {
    let entry_names: Vec<String> = match entry_names {
        Some(names) if names.len() == mat.rows => names.clone(),
        _ => (0..mat.rows).map(|i| format!("f{i}")).collect(),
    };
    let w = ours.iter().map(|s| s.chars().count()).max().unwrap_or(1);
    for (j, name) in ours.iter().enumerate().take(mat.cols) {
        let col: Vec<Q> = (0..mat.rows).map(|i| mat[(i, j)].clone()).collect();
        println!(
            "      {name:<w$} -> {}",
            bilin::report::invariants::combination(&col, &entry_names)
        );
    }
}
