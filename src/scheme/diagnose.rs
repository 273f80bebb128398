//! Which line of a wrong scheme is most likely at fault.
//!
//! Let `E = T - sum_t u_t (x) v_t (x) w_t` be the error tensor (nonzero exactly at the
//! wrong coefficients). A single line of the text form can explain E in two ways:
//! - the *output line* of result k (the column k of W): E is zero outside slice k and
//!   `E[.,.,k] = sum_t x_t u_t v_t^T` has a solution x (a linear system);
//! - the *product line* of term t (its factors u_t, v_t): `E = M (x) w_t` for a matrix M
//!   with `M + u_t v_t^T` of rank at most one; then `u' v'^T = M + u_t v_t^T` repairs it.
//!
//! When such a line exists, the repaired scheme is checked exactly and returned with it.
//! Otherwise the line that can influence the most wrong coefficients is named (an output
//! line influences slice k; a product line the (i, j, k) with `w_t[k] != 0` and
//! `u_t[i] != 0` or `v_t[j] != 0`), ties going to the line that influences fewer
//! coefficients in all.

use super::{Scheme, Wrong, red, verify};
use crate::linalg::{Matrix, solve};
use crate::scalar::{Field, FieldSpec, Q};
use crate::tensor::Tensor;
use num_traits::Zero;

/// A line of a scheme: the product line of term t, or the output line of result k.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Site {
    Product(usize),
    Output(usize),
}

/// The most likely faulty line.
#[derive(Clone, Debug)]
pub struct Fault {
    pub site: Site,
    /// The scheme with only this line changed, verified exactly, when one line explains
    /// every wrong coefficient.
    pub fix: Option<Scheme>,
    /// How many of the wrong coefficients this line influences.
    pub touches: usize,
}

/// The error tensor `T - S` as a dense array with index `(i * d1 + j) * d2 + k`.
fn error_tensor(d: [usize; 3], wrong: &[Wrong], field: FieldSpec) -> Vec<Q> {
    let mut e = vec![Q::zero(); d[0] * d[1] * d[2]];
    for w in wrong {
        let [i, j, k] = w.index;
        e[(i * d[1] + j) * d[2] + k] = red(field, &w.expected - &w.got);
    }
    e
}

/// Solve `sum_t x_t u_t v_t^T = rhs` (an d0 x d1 matrix, row-major) over the field.
fn solve_column(s: &Scheme, rhs: &[Q]) -> Option<Vec<Q>> {
    let [d0, d1, _] = s.dims;
    let r = s.rank();
    let rows: Vec<Vec<Q>> = (0..d0 * d1)
        .map(|ij| {
            (0..r)
                .map(|t| red(s.field, &s.u[t][ij / d1] * &s.v[t][ij % d1]))
                .collect()
        })
        .collect();
    crate::with_field!(s.field, f => {
        let m = Matrix::from_rows(
            rows.iter()
                .map(|row| row.iter().map(|x| f.from_rational(x).expect("reduced")).collect())
                .collect(),
            r,
        );
        let b: Vec<_> = rhs.iter().map(|x| f.from_rational(x).expect("reduced")).collect();
        solve(f, &m, &b).map(|x| x.iter().map(|e| f.to_rational(e)).collect())
    })
}

/// `N = u' v'^T` for a matrix N (d0 x d1, row-major) of rank at most one; `None` when the
/// rank is larger. Keeps `u` (or else `v`) when N is a multiple of it, so that a fix
/// changes as little as possible.
fn rank_one_factors(
    f: FieldSpec,
    n: &[Q],
    d1: usize,
    u: &[Q],
    v: &[Q],
) -> Option<(Vec<Q>, Vec<Q>)> {
    let d0 = u.len();
    let Some(p) = n.iter().position(|x| !x.is_zero()) else {
        return Some((vec![Q::zero(); d0], v.to_vec()));
    };
    let (pi, pj) = (p / d1, p % d1);
    let col: Vec<Q> = (0..d0).map(|i| n[i * d1 + pj].clone()).collect();
    let row: Vec<Q> = n[pi * d1..(pi + 1) * d1].to_vec();
    let piv = n[p].clone();
    // rank one: n[i][j] * piv = col[i] * row[j]
    for i in 0..d0 {
        for j in 0..d1 {
            if red(f, &n[i * d1 + j] * &piv - &col[i] * &row[j]) != Q::zero() {
                return None;
            }
        }
    }
    let inv = red(f, Q::from_integer(1.into()) / &piv);
    let scaled_col: Vec<Q> = col.iter().map(|c| red(f, c * &inv)).collect();
    // N = scaled_col (x) row; keep v when row = a v (then u' = a scaled_col), else keep u
    // when scaled_col = a u (then v' = a row)
    if let Some(a) = super::terms::proportional(f, v, &row) {
        return Some((
            scaled_col.iter().map(|c| red(f, c * &a)).collect(),
            v.to_vec(),
        ));
    }
    if let Some(a) = super::terms::proportional(f, u, &scaled_col) {
        return Some((u.to_vec(), row.iter().map(|c| red(f, c * &a)).collect()));
    }
    Some((scaled_col, row))
}

/// A repaired scheme when the output line of result k explains E (see the module docs).
fn fix_output(s: &Scheme, t: &Tensor, e: &[Q], k: usize) -> Option<Scheme> {
    let [d0, d1, d2] = s.dims;
    let slice: Vec<Q> = (0..d0 * d1).map(|ij| e[ij * d2 + k].clone()).collect();
    let delta = solve_column(s, &slice)?;
    let mut fixed = s.clone();
    for (tt, dx) in delta.iter().enumerate() {
        fixed.w[tt][k] = red(s.field, &fixed.w[tt][k] + dx);
    }
    verify(&fixed, t).is_ok().then_some(fixed)
}

/// A repaired scheme when the product line of term tt explains E.
fn fix_product(s: &Scheme, t: &Tensor, e: &[Q], tt: usize) -> Option<Scheme> {
    let f = s.field;
    let [d0, d1, d2] = s.dims;
    let w = &s.w[tt];
    let k0 = w.iter().position(|x| !x.is_zero())?;
    let w0inv = red(f, Q::from_integer(1.into()) / &w[k0]);
    // M = E[., ., k0] / w[k0]; E must equal M (x) w
    let m: Vec<Q> = (0..d0 * d1)
        .map(|ij| red(f, &e[ij * d2 + k0] * &w0inv))
        .collect();
    for ij in 0..d0 * d1 {
        for k in 0..d2 {
            if red(f, &m[ij] * &w[k]) != e[ij * d2 + k] {
                return None;
            }
        }
    }
    let n: Vec<Q> = (0..d0 * d1)
        .map(|ij| red(f, &m[ij] + &s.u[tt][ij / d1] * &s.v[tt][ij % d1]))
        .collect();
    let (u2, v2) = rank_one_factors(f, &n, d1, &s.u[tt], &s.v[tt])?;
    let mut fixed = s.clone();
    fixed.u[tt] = u2;
    fixed.v[tt] = v2;
    verify(&fixed, t).is_ok().then_some(fixed)
}

/// The most likely faulty line of `s` given its wrong coefficients (see the module docs);
/// `None` when nothing is wrong. Cost: one linear system of d0 d1 equations in r unknowns
/// per candidate output line, O(r d0 d1 d2) per candidate product line.
pub fn locate_fault(s: &Scheme, t: &Tensor, wrong: &[Wrong]) -> Option<Fault> {
    if wrong.is_empty() || s.dims != t.dims() {
        return None;
    }
    let d = s.dims;
    let e = error_tensor(d, wrong, t.field());
    let mut sites: Vec<(Site, usize, usize)> = Vec::new(); // (site, touches, influence)
    for k in 0..d[2] {
        let touches = wrong.iter().filter(|w| w.index[2] == k).count();
        sites.push((Site::Output(k), touches, d[0] * d[1]));
    }
    for tt in 0..s.rank() {
        let nz = |x: &[Q]| x.iter().filter(|c| !c.is_zero()).count();
        let (nu, nv, nw) = (nz(&s.u[tt]), nz(&s.v[tt]), nz(&s.w[tt]));
        let touches = wrong
            .iter()
            .filter(|w| {
                let [i, j, k] = w.index;
                !s.w[tt][k].is_zero() && (!s.u[tt][i].is_zero() || !s.v[tt][j].is_zero())
            })
            .count();
        let influence = nw * (nu * d[1] + nv * d[0]);
        sites.push((Site::Product(tt), touches, influence));
    }
    // exact single-line repairs first
    let all = wrong.len();
    for &(site, touches, _) in &sites {
        if touches != all {
            continue;
        }
        let fix = match site {
            Site::Output(k) => fix_output(s, t, &e, k),
            Site::Product(tt) => fix_product(s, t, &e, tt),
        };
        if fix.is_some() {
            return Some(Fault { site, fix, touches });
        }
    }
    let best = sites
        .iter()
        .max_by(|a, b| a.1.cmp(&b.1).then_with(|| b.2.cmp(&a.2)))?;
    Some(Fault {
        site: best.0,
        fix: None,
        touches: best.1,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use crate::scheme::wrong_coefficients;

    #[test]
    fn finds_and_repairs_single_line_faults() {
        let t = matmul(2, 2, 2);
        let good = scheme(STRASSEN, &t);
        // an output line with a wrong coefficient: c12 = m3 + 2 m5
        let mut s = good.clone();
        s.w[4][1] = Q::from_integer(2.into());
        let w = wrong_coefficients(&s, &t);
        let f = locate_fault(&s, &t, &w).unwrap();
        assert_eq!(f.site, Site::Output(1));
        assert_eq!(f.fix.unwrap(), good);
        // a product line with a wrong left factor: m6 = (a21 + a11)*(b11 + b12)
        let mut s = good.clone();
        s.u[5][0] = Q::from_integer(1.into());
        let w = wrong_coefficients(&s, &t);
        let f = locate_fault(&s, &t, &w).unwrap();
        assert_eq!(f.site, Site::Product(5));
        assert_eq!(f.fix.unwrap(), good);
        // both factors wrong in one product line
        let mut s = good.clone();
        s.u[0] = vec![Q::from_integer(1.into()), Q::zero(), Q::zero(), Q::zero()];
        s.v[0][0] = Q::from_integer(3.into());
        let w = wrong_coefficients(&s, &t);
        let f = locate_fault(&s, &t, &w).unwrap();
        assert_eq!(f.site, Site::Product(0));
        assert!(verify(f.fix.as_ref().unwrap(), &t).is_ok());
        // over GF(7) as well
        let t7 = t.with_field(FieldSpec::Prime(7)).unwrap();
        let mut s7 = good.with_field(FieldSpec::Prime(7)).unwrap();
        s7.w[2][3] = Q::zero();
        let w = wrong_coefficients(&s7, &t7);
        let f = locate_fault(&s7, &t7, &w).unwrap();
        assert_eq!(f.site, Site::Output(3));
        // two independent faults: no single repair, the line touching most is named
        let mut s = good.clone();
        s.w[4][1] = Q::from_integer(2.into());
        s.w[0][0] = Q::zero();
        let w = wrong_coefficients(&s, &t);
        let f = locate_fault(&s, &t, &w).unwrap();
        assert!(f.fix.is_none());
        assert!(f.touches >= 1);
    }
}
