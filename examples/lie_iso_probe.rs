use bilin::catalog::{self, LieIsoParams, find_nilpotent_isomorphism};
use bilin::tensor::{change_basis_algebra, random_invertible};
fn main() {
    let args: Vec<String> = std::env::args().collect();
    let e = catalog::find_entry(&args[1]).unwrap();
    let t = e.tensor().unwrap();
    let seed: u64 = args.get(2).map_or(7, |s| s.parse().unwrap());
    let u = change_basis_algebra(&t, &random_invertible(t.dim(), 1_000_000, seed)).unwrap();
    let t0 = std::time::Instant::now();
    let m = find_nilpotent_isomorphism(&u, &t, &LieIsoParams::default());
    println!("{}: {} {:?}", args[1], m.is_some(), t0.elapsed());
}
