use bilin::catalog;
use bilin::invariants::*;
use bilin::tensor::{IntegralTensor, change_basis_algebra, random_invertible};
fn main() {
    let name = std::env::args().nth(1).unwrap();
    let b: i64 = std::env::args()
        .nth(2)
        .map(|s| s.parse().unwrap())
        .unwrap_or(1_000_000);
    let t = catalog::find_entry(&name).unwrap().tensor().unwrap();
    let u = change_basis_algebra(&t, &random_invertible(t.dim(), b, 5)).unwrap();
    let it = IntegralTensor::from_tensor(&u);
    let sp = SolveParams::default();
    let tm = |s: &str, f: &mut dyn FnMut()| {
        let t0 = std::time::Instant::now();
        f();
        println!("{s}: {:?}", t0.elapsed());
    };
    tm("laws", &mut || {
        let _ = bilin::laws::check_laws(
            &u,
            &bilin::laws::Params {
                stop_first: true,
                ..Default::default()
            },
        );
    });
    tm("unit", &mut || {
        let _ = bilin::laws::find_unit(&it, &sp);
    });
    tm("centre", &mut || {
        let _ = element_space(&it, ElementSpace::Centre, &sp);
    });
    tm("nucleus", &mut || {
        let _ = element_space(&it, ElementSpace::Nucleus, &sp);
    });
    let mut der = None;
    tm("derivations", &mut || {
        der = derivations(&it, &sp).ok();
    });
    tm("centroid", &mut || {
        let _ = centroid(&u, &it, &sp, None);
    });
    tm("der form", &mut || {
        let d = der.as_ref().unwrap();
        let g = bilin::invariants::forms::map_trace_form(d, u.dim(), None);
        let _ = bilin::invariants::forms::form_invariants(u.field(), &g);
    });
    tm("lower terms", &mut || {
        let _ = bilin::invariants::spans::lower_central_terms(&it, &sp);
    });
    tm("upper", &mut || {
        let _ = bilin::invariants::central::upper_central_dims(&it, &sp);
    });
    tm("components", &mut || {
        let _ = bilin::structure::centre::centre_components(&u, &it, &Default::default());
    });
    tm("trace forms", &mut || {
        let _ = bilin::invariants::forms::form_invariants(
            u.field(),
            &bilin::invariants::forms::trace_form(&it, true),
        );
    });
    tm("fingerprint", &mut || {
        let _ = catalog::compute_fingerprint(&u, &Default::default());
    });
}
