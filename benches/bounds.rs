//! Lower bounds: exhaustive proofs over GF(2) (search and the separate check of its
//! certificate) and the Koszul-Young / Strassen border-rank bounds, on generator tables
//! and on the same tensors in a random basis (dense, large entries over Q; a random basis
//! over GF(2)), and the Alder-Strassen bound with the interpolation scheme that meets it
//! for cyclic group algebras (generator basis and a random basis of the algebra).
//! Reference in the same run: the flattening bound of the same tensor.
//! Targets: <2,2,2> and GF(2^k), k <= 4, proven over GF(2) in seconds; <3,3,3> reaches 15.
use bilin::catalog::find_entry;
use bilin::input::load_input;
use bilin::ranks::exhaustive::{ExhaustiveParams, Outcome, decide_rank};
use bilin::ranks::rank_proof::{check, slices_of};
use bilin::ranks::{BoundsParams, flattening, koszul_young, strassen};
use bilin::scalar::FieldSpec;
use bilin::tensor::{Tensor, change_basis, random_invertible};
use criterion::{Criterion, criterion_group, criterion_main};

fn gf2(spec: &str) -> Tensor {
    match find_entry(spec) {
        Some(e) => e.tensor().expect("entry"),
        None => load_input(spec, Some(FieldSpec::Prime(2))).expect("generator"),
    }
    .with_field(FieldSpec::Prime(2))
    .expect("GF(2)")
}

/// `t` in a random basis with entries up to `b` (over GF(2): reduced, still invertible).
fn scrambled(t: &Tensor, b: i64, seed: u64) -> Tensor {
    let d = t.dims();
    let field = t.field();
    let q = t.with_field(FieldSpec::Rational).expect("integer tensor");
    for s in seed.. {
        let [p, r, w] = [0, 1, 2].map(|i| random_invertible(d[i], b, s * 3 + i as u64));
        let u = change_basis(&q, &p, &r, &w).expect("invertible");
        // over GF(2) the change must stay invertible: the rank of each flattening is kept
        if let Ok(v) = u.with_field(field)
            && bilin::tensor::flattening_ranks(&v) == bilin::tensor::flattening_ranks(t)
            && v.nnz() > 0
        {
            return v;
        }
    }
    unreachable!()
}

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("bounds");
    g.sample_size(10);
    for (name, t, axis, r) in [
        ("matmul:2,2,2 R>6", gf2("matmul:2,2,2"), 0, 6),
        ("GF16 R>8", gf2("GF16"), 0, 8),
        ("GF16 random basis R>8", scrambled(&gf2("GF16"), 1, 7), 0, 8),
        ("matmul:2,2,3 R>9", gf2("matmul:2,2,3"), 1, 9),
    ] {
        let sp = slices_of(&t, axis).expect("small slices");
        let p = ExhaustiveParams {
            max_work: 2_000_000_000,
            max_nodes: 2_000_000,
            ..ExhaustiveParams::default()
        };
        let Outcome::Proven(cert) = decide_rank(&sp, r, &p) else {
            panic!("{name}: not proven");
        };
        g.bench_function(format!("exhaustive {name}"), |b| {
            b.iter(|| decide_rank(&sp, r, &p))
        });
        g.bench_function(format!("check {name}"), |b| b.iter(|| check(&t, &cert)));
        g.bench_function(format!("reference: flattening {name}"), |b| {
            b.iter(|| flattening::bound(&t))
        });
    }
    let bp = BoundsParams::default();
    let m333 = load_input("matmul:3,3,3", None).expect("generator");
    let dense = scrambled(&m333, 1_000_000, 1);
    for (name, t) in [
        ("matmul:3,3,3", &m333),
        ("matmul:3,3,3 random basis", &dense),
    ] {
        g.bench_function(format!("Koszul-Young {name}"), |b| {
            b.iter(|| koszul_young::bound(t, &bp))
        });
        g.bench_function(format!("Strassen commutator {name}"), |b| {
            b.iter(|| strassen::bound(t, &bp))
        });
        g.bench_function(format!("reference: flattening {name}"), |b| {
            b.iter(|| flattening::bound(t))
        });
    }
    // commutative algebras: the Alder-Strassen bound (t exact by factoring over Q) and
    // the interpolation scheme of rank 2n - t that meets it, in the generator's basis and
    // in a random basis of the algebra with entries up to 10^6
    let mp = bilin::decompose::monogenic::MonogenicParams::default();
    for n in [8usize, 16] {
        let c = bilin::generators::cyclic_group_algebra(n).expect("generator");
        let p = random_invertible(n, 1_000_000, 5);
        let dense = bilin::tensor::change_basis_algebra(&c, &p).expect("invertible");
        for (name, t) in [
            (format!("C{n}"), &c),
            (format!("C{n} random basis"), &dense),
        ] {
            g.bench_function(format!("Alder-Strassen {name}"), |b| {
                b.iter(|| bilin::ranks::alder_strassen::alder_strassen(t, &bp))
            });
            g.bench_function(format!("interpolation scheme {name}"), |b| {
                b.iter(|| bilin::decompose::monogenic::monogenic_scheme(t, &mp))
            });
            g.bench_function(format!("reference: flattening {name}"), |b| {
                b.iter(|| flattening::bound(t))
            });
        }
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
