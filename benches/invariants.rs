//! Invariants (derivations, centroid, all parts) of M_4, the octonions and M_8.
//! Target: every invariant of a dimension-64 algebra within seconds on one core.
use bilin::input::load_input;
use bilin::invariants::{SolveParams, centroid, derivations};
use bilin::report::invariants::{InvariantParams, invariants_report};
use bilin::tensor::IntegralTensor;
use criterion::{Criterion, criterion_group, criterion_main};

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("invariants");
    g.sample_size(10);
    let p = SolveParams::default();
    for spec in ["matrix:4", "octonions", "matrix:8", "clifford:0,6"] {
        let t = load_input(spec, None).expect("generator");
        let it = IntegralTensor::from_tensor(&t);
        g.bench_function(format!("derivations {spec}"), |b| {
            b.iter(|| derivations(&it, &p))
        });
        g.bench_function(format!("centroid {spec}"), |b| {
            b.iter(|| centroid(&t, &it, &p, None))
        });
    }
    let t = load_input("matrix:4", None).expect("generator");
    let params = InvariantParams {
        omit_bases: true,
        ..Default::default()
    };
    g.bench_function("all invariants matrix:4", |b| {
        b.iter(|| invariants_report(&t, &params, &mut |_| {}))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
