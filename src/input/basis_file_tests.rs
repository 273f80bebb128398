//! Tests of the change-of-basis files: parsing, errors with positions, application.

use super::*;
use crate::generators::{cayley_dickson, matmul};
use crate::scalar::q;

fn err(text: &str) -> String {
    parse_basis_file(text, "b").unwrap_err().to_string()
}

#[test]
fn parses_one_matrix_with_names() {
    let c = parse_basis_file(
        "# comment\nnames one x\nmatrix   # two columns\n1 0\n0 -1/2\nend\n",
        "b",
    )
    .unwrap();
    let m = &c.single.as_ref().unwrap().matrix;
    assert_eq!((m.rows, m.cols), (2, 2));
    assert_eq!(m[(1, 1)], q(-1, 2));
    assert_eq!(c.single_names.unwrap().names, vec!["one", "x"]);
    assert_eq!(c.single.unwrap().at.line, 3);
}

#[test]
fn parse_errors_have_positions() {
    assert!(err("matrix\n1 0\n0 x\nend\n").starts_with("b:3:3: expected a rational"));
    assert!(err("matrix\n1 0\n0\nend\n").starts_with("b:3:2: expected 2 numbers"));
    assert!(err("matrix\n1 0\nend\n").starts_with("b:3:1: the matrix is not square"));
    assert!(err("matrix\n1 0\n0 1\n").starts_with("b:1:1: this matrix is not closed"));
    assert!(err("matrix\nend\n").starts_with("b:2:1: an empty matrix"));
    assert!(err("end\n").starts_with("b:1:1: `end` without"));
    assert!(err("matrix up\n").starts_with("b:1:8: expected `left`"));
    assert!(err("# nothing\n").contains("no `matrix` block"));
    assert!(err("matrix\n1/0\nend\n").starts_with("b:2:3: division by zero"));
    assert!(err("names a a\nmatrix\n1 0\n0 1\nend\n").starts_with("b:1:9: duplicate"));
    assert!(err("names 1a\n").starts_with("b:1:7: invalid basis name"));
    assert!(
        err("matrix left\n1\nend\nmatrix right\n1\nend\n").contains("`matrix result` is missing")
    );
    assert!(err("matrix\n1\nend\nmatrix left\n1\nend\n").starts_with("b:4:1: a file gives either"));
    assert!(err("matrix\n1\nend\nmatrix\n1\nend\n").contains("given twice (first on line 1)"));
    assert!(err("widget\n").starts_with("b:1:1: expected `matrix`, `names`"));
}

#[test]
fn applies_to_quaternions() {
    // New basis f0 = 1, f1 = i + j, f2 = j, f3 = k (columns). Hand computation with
    // Hamilton's rules (Hamilton 1843): f1 f1 = (i+j)^2 = -2, f1 f2 = ij + j^2 = k - 1.
    let h = cayley_dickson(2).unwrap();
    let c = parse_basis_file(
        "names one x y z\nmatrix\n1 0 0 0\n0 1 0 0\n0 1 1 0\n0 0 0 1\nend\n",
        "b",
    )
    .unwrap();
    let t = apply_basis_change(&h, &c).unwrap();
    assert_eq!(t.kind(), Kind::Algebra);
    assert_eq!(t.names()[0], vec!["one", "x", "y", "z"]);
    assert_eq!(t.product(1, 1), &[(0, q(-2, 1))]);
    assert_eq!(t.product(1, 2), &[(0, q(-1, 1)), (3, q(1, 1))]);
}

#[test]
fn application_errors() {
    let h = cayley_dickson(2).unwrap();
    let sing = parse_basis_file("matrix\n1 0 0 0\n0 1 1 0\n0 1 1 0\n0 0 0 1\nend\n", "b").unwrap();
    let e = apply_basis_change(&h, &sing).unwrap_err().to_string();
    assert!(
        e.starts_with("b:1:1: the basis matrix is singular over Q"),
        "{e}"
    );
    let small = parse_basis_file("matrix\n1 0\n0 1\nend\n", "b").unwrap();
    let e = apply_basis_change(&h, &small).unwrap_err().to_string();
    assert!(
        e.contains("is 2 x 2, but the basis space has dimension 4"),
        "{e}"
    );
    let names = parse_basis_file(
        "names a b\nmatrix\n1 0 0 0\n0 1 0 0\n0 0 1 0\n0 0 0 1\nend\n",
        "b",
    )
    .unwrap();
    let e = apply_basis_change(&h, &names).unwrap_err().to_string();
    assert!(e.starts_with("b:1:7: 2 new names"), "{e}");
    // Invertible over Q (determinant 2) but singular over GF(2).
    let h2 = h.with_field(FieldSpec::Prime(2)).unwrap();
    let two = parse_basis_file("matrix\n2 0 0 0\n0 1 0 0\n0 0 1 0\n0 0 0 1\nend\n", "b").unwrap();
    assert!(apply_basis_change(&h, &two).is_ok());
    let e = apply_basis_change(&h2, &two).unwrap_err().to_string();
    assert!(e.contains("singular over GF(2)"), "{e}");
    let half =
        parse_basis_file("matrix\n1/2 0 0 0\n0 1 0 0\n0 0 1 0\n0 0 0 1\nend\n", "b").unwrap();
    assert!(
        apply_basis_change(&h2, &half)
            .unwrap_err()
            .to_string()
            .contains("denominator")
    );
    // One matrix does not fit a map with unequal dimensions.
    let m = matmul(1, 2, 1).unwrap();
    let e = apply_basis_change(&m, &small).unwrap_err().to_string();
    assert!(e.contains("one `matrix` fits an algebra"), "{e}");
}

#[test]
fn three_matrices_and_random() {
    // <1,2,1> (dims [2, 2, 1]): scaling the left basis by 2 doubles every coefficient.
    let m = matmul(1, 2, 1).unwrap();
    let c = parse_basis_file(
        "matrix left\n2 0\n0 2\nend\nmatrix right\n0 1\n1 0\nend\nmatrix result\n1\nend\n\
         names result c\n",
        "b",
    )
    .unwrap();
    let t = apply_basis_change(&m, &c).unwrap();
    assert_eq!(t.names()[2], vec!["c"]);
    // a1 b1 -> c with b's swapped: new (0, 1) is old (0, 0) times 2.
    assert_eq!(t.product(0, 1), &[(0, q(2, 1))]);
    assert!(t.product(0, 0).is_empty());
    // Random: deterministic in the seed, and a random change of an algebra keeps the kind.
    let h = cayley_dickson(2).unwrap();
    let a = apply_basis_change(&h, &random_basis_change(&h, 7)).unwrap();
    let b = apply_basis_change(&h, &random_basis_change(&h, 7)).unwrap();
    assert_eq!(a, b);
    assert_eq!(a.kind(), Kind::Algebra);
    let g = h.with_field(FieldSpec::Prime(2)).unwrap();
    assert!(apply_basis_change(&g, &random_basis_change(&g, 3)).is_ok());
    let r = random_basis_change(&m, 1);
    assert!(r.axes.iter().all(Option::is_some));
}
