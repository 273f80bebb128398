//! SVG pictures of tensors, schemes and block decompositions: well-formed XML (parsed),
//! byte-deterministic, with the content the caption promises; the `draw` command end to
//! end. Pictures made here are kept under target/test-pictures/ for a look.

mod common;

use bilin::catalog::{catalog_tensor, stored_schemes};
use bilin::generators::generate;
use bilin::input::load_input;
use bilin::picture::{
    BlockLayout, SchemePictureParams, TensorPictureParams, View, blocks_svg, count_inside,
    scheme_svg, tensor_svg,
};
use bilin::scalar::{FieldSpec, q};
use bilin::scheme::construct::{direct_sum_tensor, relabel_tensor};
use bilin::tensor::{Tensor, change_basis_algebra, random_invertible};
use common::run as bilin;

/// The number of filled shapes of an SVG document: closed subpaths of filled paths (cells
/// are grouped by colour into one path each).
fn shapes(svg: &str) -> usize {
    let doc = roxmltree::Document::parse(svg).expect("well-formed XML");
    doc.descendants()
        .filter(|n| n.has_tag_name("path") && n.attribute("fill").is_some_and(|f| f != "none"))
        .map(|n| n.attribute("d").unwrap().matches('z').count())
        .sum()
}

/// Parse an SVG document; returns (width, height, number of elements by tag name).
fn parse_svg(svg: &str) -> (f64, f64, std::collections::BTreeMap<String, usize>) {
    let doc = roxmltree::Document::parse(svg).expect("well-formed XML");
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(
        root.tag_name().namespace(),
        Some("http://www.w3.org/2000/svg")
    );
    let num = |a: &str| root.attribute(a).unwrap().parse::<f64>().unwrap();
    let mut tags = std::collections::BTreeMap::new();
    for n in doc.descendants().filter(|n| n.is_element()) {
        *tags.entry(n.tag_name().name().to_string()).or_insert(0) += 1;
    }
    (num("width"), num("height"), tags)
}

fn keep(name: &str, svg: &str) {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/target/test-pictures");
    let _ = std::fs::create_dir_all(dir);
    let _ = std::fs::write(format!("{dir}/{name}"), svg);
}

/// A tensor in a user's basis: a seeded random change of basis with entries up to 40,
/// which gives large rational coefficients.
fn scrambled(t: &Tensor, seed: u64) -> Tensor {
    change_basis_algebra(t, &random_invertible(t.dim(), 40, seed)).unwrap()
}

#[test]
fn tensor_pictures_are_well_formed_deterministic_and_mark_fractions() {
    let oct = catalog_tensor("octonions").unwrap();
    let user = scrambled(&catalog_tensor("quaternions").unwrap(), 11);
    let gf3 = load_input("matrix:2", Some(FieldSpec::Prime(3))).unwrap();
    for (name, t) in [
        ("octonions", &oct),
        ("quaternions-user", &user),
        ("m2-gf3", &gf3),
    ] {
        let p = TensorPictureParams {
            title: Some(name.into()),
            ..Default::default()
        };
        let a = tensor_svg(t, &p).unwrap();
        assert_eq!(a, tensor_svg(t, &p).unwrap(), "same input, same bytes");
        keep(&format!("{name}.svg"), &a);
        let (w, h, _) = parse_svg(&a);
        assert!(w > 100.0 && h > 100.0);
        // one square per nonzero coefficient, one corner mark per fraction
        let fractions = t.entries().filter(|(_, _, _, v)| !v.is_integer()).count();
        assert_eq!(shapes(&a), t.nnz() + fractions, "{name}");
        assert_eq!(a.contains("not an integer"), fractions > 0, "{name}");
        assert!(a.contains(&format!("{} nonzero coefficients", t.nnz())));
    }
    // a change of basis with entries up to 40 gives fractions and large magnitudes
    assert!(user.entries().any(|(_, _, _, v)| !v.is_integer()));
    // over GF(3) the residue 2 is drawn as -1 (balanced), in the negative colours
    let a = tensor_svg(&gf3, &TensorPictureParams::default()).unwrap();
    assert!(a.contains("balanced, from -1 to 1"));
    // every axis, and a chosen subset of slices
    for axis in 0..3 {
        let p = TensorPictureParams {
            axis,
            slices: Some(vec![1, 0]),
            ..Default::default()
        };
        let svg = tensor_svg(&oct, &p).unwrap();
        parse_svg(&svg);
        assert!(svg.contains("(2 of 8 slices shown)"));
    }
    let bad = TensorPictureParams {
        slices: Some(vec![8]),
        ..Default::default()
    };
    assert!(tensor_svg(&oct, &bad).is_err());
}

#[test]
fn large_tensors_switch_to_the_density_view() {
    let t = generate("matmul:9,9,9").unwrap(); // 81 x 81 -> 81, above 64
    let svg = tensor_svg(&t, &TensorPictureParams::default()).unwrap();
    keep("matmul999-density.svg", &svg);
    parse_svg(&svg);
    assert!(svg.contains("density view"));
    // at most 41 x 41 squares per panel (2 x 2 index pairs per square), three panels
    assert!(shapes(&svg) <= 3 * 41 * 41);
    let slices = TensorPictureParams {
        view: View::Slices,
        slices: Some(vec![0, 80]),
        ..Default::default()
    };
    let s = tensor_svg(&t, &slices).unwrap();
    assert!(!s.contains("density view") && s.contains("(2 of 81 slices shown)"));
    parse_svg(&s);
    // all 121 slices of 121 x 121 are above the size limit of the slices view
    let all = TensorPictureParams {
        view: View::Slices,
        ..Default::default()
    };
    let big = generate("matmul:11,11,11").unwrap();
    let err = tensor_svg(&big, &all).unwrap_err().to_string();
    assert!(err.contains("choose fewer slices"), "{err}");
    // dimension 64 is still drawn as slices
    let t64 = generate("matmul:8,8,8").unwrap();
    let s = tensor_svg(&t64, &TensorPictureParams::default()).unwrap();
    assert!(!s.contains("density view"));
    parse_svg(&s);
}

#[test]
fn scheme_pictures_state_rank_additions_field_and_verification() {
    let t = catalog_tensor("matmul222").unwrap();
    let s = stored_schemes("matmul222")[0].read().unwrap();
    let p = SchemePictureParams {
        title: Some("Strassen".into()),
    };
    let svg = scheme_svg(&s, &t, &p).unwrap();
    assert_eq!(svg, scheme_svg(&s, &t, &p).unwrap());
    keep("strassen.svg", &svg);
    parse_svg(&svg);
    // Strassen 1969: 7 multiplications, 18 additions without reusing sums
    assert!(svg.contains("rank 7 over Q"), "{svg}");
    assert!(svg.contains("(18 before common subexpressions)"));
    assert!(svg.contains("verified exactly"));
    assert_eq!(shapes(&svg), s.nnz());
    // fractions in the Toom-3 outputs get the mark
    let toom = stored_schemes("polymul3")[0].read().unwrap();
    let svg = scheme_svg(&toom, &catalog_tensor("polymul3").unwrap(), &p).unwrap();
    let fractions = toom.w.iter().flatten().filter(|x| !x.is_integer()).count();
    assert_eq!(shapes(&svg), toom.nnz() + fractions);
    assert!(svg.contains("not an integer"));
    // a wrong scheme is drawn with the verdict in the caption
    let mut wrong = s.clone();
    wrong.u[0][0] = q(2, 1);
    let svg = scheme_svg(&wrong, &t, &p).unwrap();
    assert!(svg.contains("does NOT verify"));
    let other = catalog_tensor("matmul223").unwrap();
    assert!(scheme_svg(&s, &other, &p).is_err());
}

#[test]
fn block_picture_of_a_scrambled_direct_sum() {
    // quaternions (+) complex numbers, then the basis shuffled by a fixed permutation
    let sum = direct_sum_tensor(
        &catalog_tensor("quaternions").unwrap(),
        &catalog_tensor("complex").unwrap(),
    )
    .unwrap();
    let perm = vec![3, 5, 0, 2, 4, 1]; // basis vector x moves to position perm[x]
    let shuffled = relabel_tensor(&sum, &[perm.clone(), perm.clone(), perm.clone()]).unwrap();
    // the order that undoes the shuffle: position x holds the shuffled vector perm[x]
    let layout = BlockLayout::same_on_all_axes(perm.clone(), vec![4, 2]);
    assert_eq!(layout.reorder(&shuffled).unwrap(), sum);
    assert_eq!(count_inside(&shuffled, &layout).unwrap(), (sum.nnz(), 0));
    let svg = blocks_svg(&shuffled, &layout, &TensorPictureParams::default()).unwrap();
    assert_eq!(
        svg,
        blocks_svg(&shuffled, &layout, &TensorPictureParams::default()).unwrap()
    );
    keep("direct-sum-blocks.svg", &svg);
    parse_svg(&svg);
    assert!(svg.contains(&format!(
        "all {} nonzero coefficients lie inside the blocks",
        sum.nnz()
    )));
    assert!(svg.contains("block 1: 4 x 4 x 4") && svg.contains("block 2: 2 x 2 x 2"));
    // the shuffled order as it is: coefficients fall outside the blocks and are ringed
    let as_is = BlockLayout::in_place([6; 3], [vec![4, 2], vec![4, 2], vec![4, 2]]);
    let (inside, outside) = count_inside(&shuffled, &as_is).unwrap();
    assert!(outside > 0 && inside + outside == sum.nnz());
    let svg = blocks_svg(&shuffled, &as_is, &TensorPictureParams::default()).unwrap();
    keep("direct-sum-unsorted.svg", &svg);
    assert!(svg.contains(&format!("{outside} of {} nonzero", sum.nnz())));
    let ring = r##"fill="none" stroke="#202020" stroke-width="2"/>"##;
    let rings = svg
        .lines()
        .filter(|l| l.starts_with("<rect") && l.ends_with(ring));
    assert_eq!(rings.count(), outside);
    // invalid layouts are refused with a reason
    for bad in [
        BlockLayout::same_on_all_axes(vec![0, 1, 2, 3, 4, 4], vec![4, 2]),
        BlockLayout::same_on_all_axes((0..6).collect(), vec![4, 1]),
        BlockLayout::same_on_all_axes((0..6).collect(), vec![6, 0]),
    ] {
        assert!(blocks_svg(&shuffled, &bad, &TensorPictureParams::default()).is_err());
    }
}

#[test]
fn draw_command_writes_the_same_bytes_and_refuses_bad_requests() {
    let (c1, a, _) = bilin(&["draw", "tensor", "octonions"]);
    let (c2, b, _) = bilin(&["draw", "tensor", "octonions"]);
    assert_eq!((c1, c2), (0, 0));
    assert_eq!(a, b, "two runs, same bytes");
    parse_svg(&a);
    let (code, out, _) = bilin(&[
        "draw",
        "scheme",
        "matmul222",
        "catalog/schemes/matmul222.strassen.txt",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("rank 7 over Q"));
    let (code, out, _) = bilin(&["draw", "blocks", "quaternions", "--sizes", "1,3"]);
    assert_eq!(code, 0);
    assert!(out.contains("lie outside the blocks"));
    // `--svg` of analyze and verify writes the same pictures
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/target/test-pictures");
    std::fs::create_dir_all(dir).unwrap();
    let path = format!("{dir}/analyze-octonions.svg");
    let (code, _, err) = bilin(&["analyze", "octonions", "--no-invariants", "--svg", &path]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(std::fs::read_to_string(&path).unwrap(), a);
    let path = format!("{dir}/verify-strassen.svg");
    let scheme = "catalog/schemes/matmul222.strassen.txt";
    let (code, _, err) = bilin(&["verify", "matmul:2,2,2", scheme, "--svg", &path]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(shapes(&std::fs::read_to_string(&path).unwrap()), 36);
    let (code, _, err) = bilin(&["draw", "tensor", "octonions", "--axis", "up"]);
    assert_eq!(code, 2);
    assert!(err.contains("unknown axis"), "{err}");
    let (code, _, err) = bilin(&["draw", "tensor", "octonions", "--out", "src"]);
    assert_eq!(code, 2);
    assert!(err.contains("is a directory"), "{err}");
    let (code, _, err) = bilin(&["draw", "blocks", "quaternions", "--sizes", "1,2"]);
    assert_eq!(code, 2);
    assert!(err.contains("add up to 4"), "{err}");
}

#[test]
fn the_committed_readme_picture_is_current() {
    let (code, svg, _) = bilin(&["draw", "tensor", "octonions"]);
    assert_eq!(code, 0);
    let committed = include_str!("../docs/pictures/octonions.svg");
    assert_eq!(
        svg, committed,
        "regenerate with: bilin draw tensor octonions --out docs/pictures/octonions.svg"
    );
}
