//! The exact check of a complete term matching (step 2 of the module docs of
//! [`super`]): solve the conditions over the scheme's field, choose invertible maps, make
//! every term land on its match with scalars of product one, check that the maps fix the
//! tensor, and for matrix formats recover the sandwich X, Y, Z and check it by applying it.

use super::Transformation;
use crate::linalg::{Matrix, determinant, inverse, nullspace};
use crate::scalar::{Field, FieldSpec, Q};
use crate::scheme::Scheme;
use crate::scheme::red;
use crate::tensor::Tensor;
use num_traits::{One, Zero};
use rand::{Rng, SeedableRng};

/// The exact conditions of a matching on one side, solved: a basis of the maps P with
/// `P x_t` on the line of `y_{sigma(t)}` for every t.
fn exact_maps(field: FieldSpec, xs: &[Vec<Q>], ys: &[Vec<Q>], sigma: &[usize]) -> Vec<Vec<Q>> {
    let d = xs.first().map_or(0, |x| x.len());
    let mut rows: Vec<Vec<Q>> = Vec::new();
    for (t, &s) in sigma.iter().enumerate() {
        let (u, u2) = (&xs[t], &ys[s]);
        let Some(q) = u2.iter().position(|c| !c.is_zero()) else {
            continue;
        };
        for x in (0..d).filter(|&x| x != q) {
            let mut row = vec![Q::zero(); d * d];
            for y in 0..d {
                row[x * d + y] = red(field, &u2[q] * &u[y]);
                row[q * d + y] = red(field, -(&u2[x] * &u[y]));
            }
            rows.push(row);
        }
    }
    if rows.is_empty() {
        let mut id = Vec::new();
        for k in 0..d * d {
            let mut e = vec![Q::zero(); d * d];
            e[k] = Q::one();
            id.push(e);
        }
        return id;
    }
    crate::with_field!(field, f => {
        let m = Matrix::from_rows(
            rows.iter()
                .map(|r| r.iter().map(|x| f.from_rational(x).expect("reduced")).collect())
                .collect(),
            d * d,
        );
        nullspace(f, &m)
            .iter()
            .map(|v| v.iter().map(|e| f.to_rational(e)).collect())
            .collect()
    })
}

fn mat_vec(field: FieldSpec, m: &Matrix<Q>, x: &[Q]) -> Vec<Q> {
    (0..m.rows)
        .map(|i| {
            red(
                field,
                m.row(i)
                    .iter()
                    .zip(x)
                    .map(|(a, b)| a * b)
                    .fold(Q::zero(), |s, y| s + y),
            )
        })
        .collect()
}

fn det_nonzero(field: FieldSpec, m: &Matrix<Q>) -> bool {
    crate::with_field!(field, f => {
        let e = m.map(|x| f.from_rational(x).expect("reduced"));
        !f.is_zero(&determinant(f, &e))
    })
}

/// `y = a x` with a nonzero: `Some(a)`; both zero: `Some(1)`.
fn ratio(field: FieldSpec, x: &[Q], y: &[Q]) -> Option<Q> {
    match x.iter().position(|c| !c.is_zero()) {
        None => y.iter().all(|c| c.is_zero()).then(Q::one),
        Some(i) => {
            let a = red(field, &y[i] / &x[i]);
            (!a.is_zero() && x.iter().zip(y).all(|(p, q)| red(field, p * &a) == *q)).then_some(a)
        }
    }
}

/// Solve `M x_t = y_t` for every t exactly (M is d x d, row-major): a particular
/// solution and a basis of the solutions of the homogeneous system.
fn solve_images(field: FieldSpec, xs: &[&Vec<Q>], ys: &[Vec<Q>]) -> Option<(Vec<Q>, Vec<Vec<Q>>)> {
    let d = xs.first().map_or(0, |x| x.len());
    let mut rows = Vec::new();
    let mut rhs = Vec::new();
    for (x, y) in xs.iter().zip(ys) {
        for r in 0..d {
            let mut row = vec![Q::zero(); d * d];
            row[r * d..(r + 1) * d].clone_from_slice(x);
            rows.push(row);
            rhs.push(y[r].clone());
        }
    }
    crate::with_field!(field, f => {
        let conv = |v: &Q| f.from_rational(v).expect("reduced");
        let m = Matrix::from_rows(
            rows.iter().map(|r| r.iter().map(conv).collect()).collect(),
            d * d,
        );
        let b: Vec<_> = rhs.iter().map(conv).collect();
        let back = |v: &[_]| -> Vec<Q> { v.iter().map(|e| f.to_rational(e)).collect() };
        let x = crate::linalg::solve(f, &m, &b)?;
        let null = nullspace(f, &m);
        Some((back(&x), null.iter().map(|v| back(v)).collect()))
    })
}

fn square(v: &[Q], n: usize) -> Matrix<Q> {
    Matrix::from_rows((0..n).map(|i| v[i * n..(i + 1) * n].to_vec()).collect(), n)
}

/// Check a complete matching exactly (see the module docs, step 2). Two sides take an
/// invertible member of their solution space (the one-dimensional spaces are fixed up to
/// a scalar, others are tried with random members); the third side is then solved
/// exactly so that every term maps onto its match with product of scalars one.
pub(super) fn confirm(
    name: &str,
    s1: &Scheme,
    s2: &Scheme,
    t: &Tensor,
    nmp: Option<[usize; 3]>,
    sigma: &[usize],
    seed: u64,
) -> Option<Transformation> {
    let field = s1.field;
    let d = s1.dims;
    let facs1 = [&s1.u, &s1.v, &s1.w];
    let facs2 = [&s2.u, &s2.v, &s2.w];
    let bases: Vec<Vec<Vec<Q>>> = (0..3)
        .map(|a| exact_maps(field, facs1[a], facs2[a], sigma))
        .collect();
    if bases.iter().any(|b| b.is_empty()) {
        return None;
    }
    // solve the side with the largest solution space exactly
    let solved = (0..3).rev().max_by_key(|&a| bases[a].len()).unwrap_or(2);
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed ^ 0x5eed);
    for attempt in 0..12 {
        let mut maps: Vec<Option<Matrix<Q>>> = vec![None, None, None];
        for a in (0..3).filter(|&a| a != solved) {
            let n = d[a];
            let mut v = vec![Q::zero(); n * n];
            for b in &bases[a] {
                let c = if attempt == 0 {
                    Q::one()
                } else {
                    Q::from_integer(rng.gen_range(-3i64..=3).into())
                };
                for (x, y) in v.iter_mut().zip(b) {
                    *x = red(field, &*x + &c * y);
                }
            }
            maps[a] = Some(square(&v, n));
        }
        if !maps.iter().flatten().all(|m| det_nonzero(field, m)) {
            continue;
        }
        let mut xs = Vec::new();
        let mut ys = Vec::new();
        let mut ok = true;
        for (tt, &s) in sigma.iter().enumerate() {
            let mut prod = Q::one();
            for a in (0..3).filter(|&a| a != solved) {
                let img = mat_vec(field, maps[a].as_ref().expect("set"), &facs1[a][tt]);
                match ratio(field, &img, &facs2[a][s]) {
                    Some(r) => prod = red(field, prod * r),
                    None => ok = false,
                }
            }
            if !ok {
                break;
            }
            // y = prod * (image of x) on the other sides, so the solved side must send
            // its factor to prod * y
            xs.push(&facs1[solved][tt]);
            ys.push(
                facs2[solved][s]
                    .iter()
                    .map(|y| red(field, y * &prod))
                    .collect(),
            );
        }
        if !ok {
            continue;
        }
        let Some((part, null)) = solve_images(field, &xs, &ys) else {
            continue;
        };
        let n = d[solved];
        for tries in 0..4 {
            let mut v = part.clone();
            if tries > 0 {
                for b in &null {
                    let c = Q::from_integer(rng.gen_range(-3i64..=3).into());
                    for (x, y) in v.iter_mut().zip(b) {
                        *x = red(field, &*x + &c * y);
                    }
                }
            }
            let m = square(&v, n);
            if !det_nonzero(field, &m) {
                if null.is_empty() {
                    break;
                }
                continue;
            }
            let mut all = maps.clone();
            all[solved] = Some(m);
            let maps: [Matrix<Q>; 3] = [
                all[0].clone().expect("set"),
                all[1].clone().expect("set"),
                all[2].clone().expect("set"),
            ];
            if !terms_map(field, s1, s2, &maps, sigma) || !fixes_tensor(t, &maps) {
                continue;
            }
            let sandwich = nmp.and_then(|f| sandwich_of(field, &maps, f, s1, s2, sigma));
            return Some(Transformation {
                form: name.to_string(),
                matching: sigma.to_vec(),
                maps,
                sandwich,
            });
        }
    }
    None
}

/// Every term t maps exactly onto term sigma(t): images proportional factor by factor
/// with scalars whose product is one.
fn terms_map(
    field: FieldSpec,
    s1: &Scheme,
    s2: &Scheme,
    maps: &[Matrix<Q>; 3],
    sigma: &[usize],
) -> bool {
    let f1 = [&s1.u, &s1.v, &s1.w];
    let f2 = [&s2.u, &s2.v, &s2.w];
    sigma.iter().enumerate().all(|(tt, &s)| {
        let mut prod = Q::one();
        for a in 0..3 {
            let img = mat_vec(field, &maps[a], &f1[a][tt]);
            match ratio(field, &img, &f2[a][s]) {
                Some(r) => prod = red(field, prod * r),
                None => return false,
            }
        }
        prod.is_one()
    })
}

/// `(P (x) Q (x) R) T = T`, checked exactly.
pub(super) fn fixes_tensor(t: &Tensor, maps: &[Matrix<Q>; 3]) -> bool {
    let d = t.dims();
    let field = t.field();
    let mut acc = vec![Q::zero(); d[0] * d[1] * d[2]];
    for (i, j, k, c) in t.entries() {
        for x in 0..d[0] {
            let px = &maps[0][(x, i)];
            if px.is_zero() {
                continue;
            }
            for y in 0..d[1] {
                let qy = &maps[1][(y, j)];
                if qy.is_zero() {
                    continue;
                }
                let pq = c * px * qy;
                for z in 0..d[2] {
                    let rz = &maps[2][(z, k)];
                    if !rz.is_zero() {
                        acc[(x * d[1] + y) * d[2] + z] += &pq * rz;
                    }
                }
            }
        }
    }
    (0..d[0]).all(|x| {
        (0..d[1]).all(|y| {
            (0..d[2]).all(|z| red(field, acc[(x * d[1] + y) * d[2] + z].clone()) == t.get(x, y, z))
        })
    })
}

/// A Kronecker factorisation `M = A (x) B` (A r x r, B c x c), up to a scalar.
fn kron_factors(
    field: FieldSpec,
    m: &Matrix<Q>,
    r: usize,
    c: usize,
) -> Option<(Matrix<Q>, Matrix<Q>)> {
    // M[(i,j),(i2,j2)] = A[i][i2] B[j][j2]
    let at = |i: usize, j: usize, i2: usize, j2: usize| &m[(i * c + j, i2 * c + j2)];
    let (mut p0, mut found) = ((0, 0, 0, 0), false);
    'f: for i in 0..r {
        for i2 in 0..r {
            for j in 0..c {
                for j2 in 0..c {
                    if !at(i, j, i2, j2).is_zero() {
                        p0 = (i, j, i2, j2);
                        found = true;
                        break 'f;
                    }
                }
            }
        }
    }
    if !found {
        return None;
    }
    let (i0, j0, i20, j20) = p0;
    let a = Matrix::from_rows(
        (0..r)
            .map(|i| (0..r).map(|i2| at(i, j0, i2, j20).clone()).collect())
            .collect(),
        r,
    );
    let piv = at(i0, j0, i20, j20).clone();
    let b = Matrix::from_rows(
        (0..c)
            .map(|j| {
                (0..c)
                    .map(|j2| red(field, at(i0, j, i20, j2) / &piv))
                    .collect()
            })
            .collect(),
        c,
    );
    Some((a, b))
}

fn transpose(m: &Matrix<Q>) -> Matrix<Q> {
    m.transpose()
}

fn invert(field: FieldSpec, m: &Matrix<Q>) -> Option<Matrix<Q>> {
    crate::with_field!(field, f => {
        let e = m.map(|x| f.from_rational(x).expect("reduced"));
        inverse(f, &e).map(|i| i.map(|x| f.to_rational(x)))
    })
}

/// X, Y, Z with P = X^T (x) Y^-1, Q = Y^T (x) Z^-1, R = X^-1 (x) Z^T (up to scalars),
/// checked by applying the sandwich to `s1` and comparing with `s2` term by term.
fn sandwich_of(
    field: FieldSpec,
    maps: &[Matrix<Q>; 3],
    [n, m, p]: [usize; 3],
    s1: &Scheme,
    s2: &Scheme,
    sigma: &[usize],
) -> Option<[Matrix<Q>; 3]> {
    let (xt, yinv) = kron_factors(field, &maps[0], n, m)?;
    let (_, zinv) = kron_factors(field, &maps[1], m, p)?;
    let x = transpose(&xt);
    let y = invert(field, &yinv)?;
    let z = invert(field, &zinv)?;
    let img = crate::scheme::sandwich::apply_sandwich(s1, [n, m, p], [&x, &y, &z])?;
    let id = |k: usize| {
        Matrix::from_rows(
            (0..k)
                .map(|i| {
                    (0..k)
                        .map(|j| if i == j { Q::one() } else { Q::zero() })
                        .collect()
                })
                .collect(),
            k,
        )
    };
    let ids = [id(s1.dims[0]), id(s1.dims[1]), id(s1.dims[2])];
    terms_map(field, &img, s2, &ids, sigma).then_some([x, y, z])
}
