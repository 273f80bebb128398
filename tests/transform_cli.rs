//! Runs the real binary's `transform` subcommand: a change of basis of the quaternions
//! checked against a hand computation, a round trip through the inverse matrix, a seeded
//! random change, and the exit code 2 with a position for bad basis files.

mod common;

use common::{bilin, stderr, stdout};

const Q: &str = "tests/data/quaternions.bilin";

#[test]
fn quaternions_in_a_new_basis() {
    // New basis one = 1, x = i + j, y = j, z = k. By hand with Hamilton's rules
    // i^2 = j^2 = k^2 = -1, ij = k, jk = i, ki = j (Hamilton 1843):
    //   x x = i^2 + ij + ji + j^2 = -2
    //   x y = ij + j^2 = k - 1 = -one + z
    //   y x = ji + j^2 = -k - 1 = -one - z
    //   x z = ik + jk = -j + i = x - 2y   (i = x - y)
    //   z x = ki + kj = j - i = -x + 2y
    //   y z = jk = i = x - y,  z y = -i = -x + y,  y y = z z = -1.
    let o = bilin(&[
        "transform",
        Q,
        "--basis",
        "tests/data/basis_quaternions.txt",
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let t = stdout(&o);
    for line in [
        "basis one x y z",
        "x*x = -2 one",
        "x*y = -one + z",
        "y*x = -one - z",
        "x*z = x - 2 y",
        "z*x = -x + 2 y",
        "y*z = x - y",
        "z*y = -x + y",
        "y*y = -one",
        "z*z = -one",
        "one*x = x",
    ] {
        assert!(t.lines().any(|l| l == line), "missing `{line}` in\n{t}");
    }
}

#[test]
fn transform_back_by_the_inverse_gives_the_original() {
    let o = bilin(&[
        "transform",
        Q,
        "--basis",
        "tests/data/basis_quaternions.txt",
    ]);
    let dir = std::env::temp_dir().join(format!("bilin-transform-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let mid = dir.join("mid.bilin");
    std::fs::write(&mid, stdout(&o)).unwrap();
    let back = bilin(&[
        "transform",
        mid.to_str().unwrap(),
        "--basis",
        "tests/data/basis_quaternions_inverse.txt",
        "--to",
        "json",
    ]);
    assert_eq!(back.status.code(), Some(0), "{}", stderr(&back));
    let orig = bilin(&["convert", Q, "--to", "json"]);
    assert_eq!(stdout(&back), stdout(&orig));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn random_change_is_seeded() {
    let a = bilin(&["transform", "quaternions", "--random", "11", "--to", "json"]);
    let b = bilin(&["transform", "quaternions", "--random", "11", "--to", "json"]);
    assert_eq!(a.status.code(), Some(0), "{}", stderr(&a));
    assert_eq!(stdout(&a), stdout(&b));
    let c = bilin(&["transform", "quaternions", "--random", "12", "--to", "json"]);
    assert_ne!(stdout(&a), stdout(&c));
    // A bilinear map gets one matrix per axis.
    let m = bilin(&["transform", "matmul:2,2,2", "--random", "1"]);
    assert_eq!(m.status.code(), Some(0), "{}", stderr(&m));
    assert!(stdout(&m).starts_with("field Q\nleft a11 a12 a21 a22\n"));
}

#[test]
fn bad_basis_files_exit_2_with_positions() {
    for (file, pos, msg) in [
        ("bad_basis_singular.txt", "2:1", "singular over Q"),
        ("bad_basis_syntax.txt", "4:7", "expected a rational number"),
    ] {
        let path = format!("tests/data/{file}");
        let o = bilin(&["transform", Q, "--basis", &path]);
        let e = stderr(&o);
        assert_eq!(o.status.code(), Some(2), "{file}: {e}");
        assert!(
            e.starts_with(&format!("error: {path}:{pos}: ")),
            "{file}: {e}"
        );
        assert!(e.contains(msg), "{file}: {e}");
        assert!(stdout(&o).is_empty());
    }
    // A 4 x 4 matrix does not fit <1,2,1> (dimensions [2, 2, 1]).
    let o = bilin(&[
        "transform",
        "matmul:1,2,1",
        "--basis",
        "tests/data/basis_quaternions.txt",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("one `matrix` fits an algebra"));
    let o = bilin(&["transform", Q]);
    assert_eq!(o.status.code(), Some(2));
    let o = bilin(&["transform", Q, "--basis", "no/such/file"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("no/such/file: cannot read: No such file"));
}
