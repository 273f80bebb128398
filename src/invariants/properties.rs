//! Property and differential tests of the invariants (seeded, quick in debug mode).

use super::testing::*;
use super::*;
use crate::linalg::Matrix;
use crate::scalar::Q;
use crate::tensor::{IntegralTensor, Tensor, change_basis_algebra, random_invertible};
use num_traits::Zero;

fn dims_of(t: &Tensor) -> Vec<usize> {
    let it = IntegralTensor::from_tensor(t);
    let p = SolveParams::default();
    let mut out = Vec::new();
    for w in [
        ElementSpace::CommutativeCentre,
        ElementSpace::Centre,
        ElementSpace::LeftNucleus,
        ElementSpace::MiddleNucleus,
        ElementSpace::RightNucleus,
        ElementSpace::LeftAnnihilator,
        ElementSpace::RightAnnihilator,
    ] {
        out.push(element_space(&it, w, &p).unwrap().dim());
    }
    out.push(centroid(t, &it, &p, None).unwrap().space.dim());
    out.push(derivations(&it, &p).unwrap().dim());
    out.push(adjoint_algebra(t, &it, &p, None).unwrap().dim());
    out.push(unit(&it, &p).unwrap().is_some() as usize);
    out
}

/// Apply a map given as a vector (entries `l n + i`) to a coordinate vector.
fn apply(v: &[Q], n: usize, x: &[Q]) -> Vec<Q> {
    let m = Matrix {
        rows: n,
        cols: n,
        data: v[..n * n].to_vec(),
    };
    m.mul_vec(&crate::scalar::Rationals, x)
}

fn unit_vec(n: usize, i: usize) -> Vec<Q> {
    let mut v = vec![Q::zero(); n];
    v[i] = Q::from_integer(1.into());
    v
}

#[test]
fn dimensions_invariant_under_change_of_basis() {
    // Invariants are defined basis-free, so their dimensions cannot depend on the basis
    // (common practice).
    let samples = [
        quaternions(),
        upper_triangular_2(),
        heisenberg3(),
        random_algebra(3, 7),
    ];
    for (s, t) in samples.iter().enumerate() {
        let n = t.dim();
        let p = random_invertible(n, 2, 100 + s as u64);
        let t2 = change_basis_algebra(t, &p).unwrap();
        assert_eq!(dims_of(t), dims_of(&t2), "sample {s}");
    }
    let t = octonions();
    let t2 = change_basis_algebra(&t, &random_invertible(8, 1, 5)).unwrap();
    let it2 = IntegralTensor::from_tensor(&t2);
    assert_eq!(
        derivations(&it2, &SolveParams::default()).unwrap().dim(),
        14
    );
}

#[test]
fn bases_satisfy_their_definitions() {
    // Independent check by direct evaluation with Tensor::multiply, not with the systems.
    for t in [
        octonions(),
        upper_triangular_2(),
        random_algebra(3, 11),
        heisenberg3(),
    ] {
        let n = t.dim();
        let it = IntegralTensor::from_tensor(&t);
        let p = SolveParams::default();
        let e: Vec<Vec<Q>> = (0..n).map(|i| unit_vec(n, i)).collect();
        let der = derivations(&it, &p).unwrap();
        for d in &der.dense_basis() {
            for i in 0..n {
                for j in 0..n {
                    let lhs = apply(d, n, &t.multiply(&e[i], &e[j]));
                    let a = t.multiply(&apply(d, n, &e[i]), &e[j]);
                    let b = t.multiply(&e[i], &apply(d, n, &e[j]));
                    let rhs: Vec<Q> = a.iter().zip(&b).map(|(x, y)| x + y).collect();
                    assert_eq!(lhs, rhs);
                }
            }
        }
        let cen = centroid(&t, &it, &p, None).unwrap();
        for x in &cen.space.dense_basis() {
            for i in 0..n {
                for j in 0..n {
                    let lhs = apply(x, n, &t.multiply(&e[i], &e[j]));
                    assert_eq!(lhs, t.multiply(&apply(x, n, &e[i]), &e[j]));
                    assert_eq!(lhs, t.multiply(&e[i], &apply(x, n, &e[j])));
                }
            }
        }
        let z = element_space(&it, ElementSpace::Centre, &p).unwrap();
        for v in &z.dense_basis() {
            for a in &e {
                assert_eq!(t.multiply(v, a), t.multiply(a, v));
            }
        }
        // independence: rank of each basis equals its length
        for sp in [&der, &cen.space, &z] {
            if !sp.basis.is_empty() {
                let m = Matrix::from_rows(sp.dense_basis(), sp.unknowns);
                assert_eq!(crate::linalg::rank_q(&m), sp.dim());
            }
        }
    }
}

/// Differential test: derivation and centroid dimensions of random small algebras against
/// an independent rank computation with sympy (exact, over Q) through python3.
#[test]
fn differential_against_sympy() {
    let probe = std::process::Command::new("python3")
        .args(["-c", "import sympy"])
        .output();
    if !matches!(probe, Ok(ref o) if o.status.success()) {
        eprintln!("note: python3 with sympy unavailable; differential test skipped");
        return;
    }
    for seed in 0..3u64 {
        // sparse random algebra of dim 3 with a nontrivial structure (entries 0/±1)
        let mut t = random_algebra(3, seed);
        for (i, j, k) in [(0, 0, 1), (1, 1, 2), (2, 0, 0)] {
            t.set(i, j, k, Q::zero());
        }
        let n = t.dim();
        let ents: Vec<String> = t
            .entries()
            .map(|(i, j, k, v)| format!("({i},{j},{k}):{v}"))
            .collect();
        let script = format!(
            r#"
import sympy
n={n}; c={{{}}}
def C(i,j,k): return c.get((i,j,k),0)
rows=[]
for i in range(n):
  for j in range(n):
    for k in range(n):
      r=[0]*(n*n)
      for m in range(n): r[k*n+m]+=C(i,j,m)
      for l in range(n): r[l*n+i]-=C(l,j,k); r[l*n+j]-=C(i,l,k)
      rows.append(r)
der=n*n-sympy.Matrix(rows).rank()
rows=[]
for i in range(n):
  for j in range(n):
    for k in range(n):
      r=[0]*(n*n); s=[0]*(n*n)
      for m in range(n): r[k*n+m]+=C(i,j,m); s[k*n+m]+=C(i,j,m)
      for l in range(n): r[l*n+i]-=C(l,j,k); s[l*n+j]-=C(i,l,k)
      rows.append(r); rows.append(s)
cen=n*n-sympy.Matrix(rows).rank()
print(der, cen)
"#,
            ents.join(",")
        );
        let out = std::process::Command::new("python3")
            .args(["-c", &script])
            .output()
            .unwrap();
        let text = String::from_utf8_lossy(&out.stdout);
        let v: Vec<usize> = text
            .split_whitespace()
            .map(|x| x.parse().unwrap())
            .collect();
        let it = IntegralTensor::from_tensor(&t);
        let p = SolveParams::default();
        assert_eq!(derivations(&it, &p).unwrap().dim(), v[0], "seed {seed}");
        assert_eq!(
            centroid(&t, &it, &p, None).unwrap().space.dim(),
            v[1],
            "seed {seed}"
        );
    }
}

/// Timing probe (release, ignored): `cargo test --release --lib timing_probe -- --ignored --nocapture`.
#[test]
#[ignore]
fn timing_probe() {
    use crate::report::invariants::{InvariantParams, invariants_report};
    let mut cyc = Tensor::algebra(
        crate::scalar::FieldSpec::Rational,
        (0..64).map(|i| format!("g{i}")).collect(),
    );
    for i in 0..64 {
        for j in 0..64 {
            cyc.set(i, j, (i + j) % 64, Q::from_integer(1.into()));
        }
    }
    for (name, t) in [
        ("M_4", matrix_algebra(4)),
        ("octonions", octonions()),
        ("random 32", random_algebra(32, 1)),
        ("M_8", matrix_algebra(8)),
        ("cyclic 64", cyc),
    ] {
        let s = std::time::Instant::now();
        let r = invariants_report(&t, &InvariantParams::default(), &mut |_| {}).unwrap();
        eprintln!(
            "{name}: total {:.3}s {:?}",
            s.elapsed().as_secs_f64(),
            r.seconds
        );
        eprintln!(
            "  der {} centroid {} centre {}",
            r.derivations.as_ref().unwrap().space.dim,
            r.centroid.as_ref().unwrap().space.dim,
            r.centre.as_ref().unwrap().dim
        );
    }
}

#[test]
fn over_prime_fields() {
    // M_2 over GF(5) and GF(2^31 - 1): central simple, so Der = inner of dim 3 (every
    // derivation of a central simple algebra is inner, over any field: Jacobson 1962, Lie
    // Algebras, ch. I (from memory)); the centre is the ground field. (268435399 is the
    // largest prime below 2^28, the largest field the word kernels take.)
    for p in [5u64, 268_435_399] {
        let t = matrix_algebra(2)
            .with_field(crate::scalar::FieldSpec::Prime(p))
            .unwrap();
        let it = IntegralTensor::from_tensor(&t);
        let sp = SolveParams::default();
        assert_eq!(derivations(&it, &sp).unwrap().dim(), 3, "p = {p}");
        assert_eq!(
            element_space(&it, ElementSpace::Centre, &sp).unwrap().dim(),
            1
        );
        // M_2 is simple over every field: radical 0 (common practice)
        assert_eq!(radical(&t, &it, &sp).unwrap().unwrap().space.dim(), 0);
    }
}
