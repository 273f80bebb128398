//! The deeper layers of a generator image: once its layer-1 part is fixed on a line, each
//! deeper layer is solved from a linear system; what the systems leave unsolved is the
//! obstruction, a polynomial along the line (found by exact interpolation) whose rational
//! roots are the admissible points.

use super::Vector;
use super::search::Search;
use crate::linalg::{Matrix, nullspace, rref, solve};
use crate::scalar::{Q, Rationals};
use num_traits::{One, Zero};

/// The solutions t of `r0 + sum_k t_k columns[k] = 0`: a particular one and a basis of
/// the homogeneous ones; `None` when there is none.
pub(super) fn affine_solutions(
    r0: &[Q],
    columns: &[Vector],
    unknowns: usize,
) -> Option<(Vector, Vec<Vector>)> {
    if r0.is_empty() || unknowns == 0 {
        if !r0.iter().all(Zero::is_zero) {
            return None;
        }
        let free = (0..unknowns)
            .map(|k| {
                let mut v = vec![Q::zero(); unknowns];
                v[k] = Q::one();
                v
            })
            .collect();
        return Some((vec![Q::zero(); unknowns], free));
    }
    let a = Matrix {
        rows: r0.len(),
        cols: unknowns,
        data: (0..r0.len())
            .flat_map(|r| columns.iter().map(move |c| c[r].clone()))
            .collect(),
    };
    let rhs: Vector = r0.iter().map(|v| -v).collect();
    Some((solve(&Rationals, &a, &rhs)?, nullspace(&Rationals, &a)))
}

/// The deeper layers of one image: for each layer k >= 2 the matrix of the layer-(k+1)
/// residuals against the layer-k coordinates of the image (independent of the point on
/// the line: only the other images' leading parts enter it), reduced to independent rows.
pub(super) struct Lifting {
    i: usize,
    /// Per layer k = 2, 3, ...: (the coordinates of layer k, the independent rows, the
    /// matrix on those rows).
    layers: Vec<(Vec<usize>, Vec<usize>, Matrix<Q>)>,
}

impl Lifting {
    pub(super) fn new(
        s: &Search,
        ys: &mut Vec<Vector>,
        i: usize,
        base: &[Q],
        dir: &[Q],
    ) -> Lifting {
        let n = s.x.n;
        let top = s.adapted.layer.iter().copied().max().unwrap_or(1);
        let point: Vector = base.iter().zip(dir).map(|(b, d)| b + d).collect();
        ys.push(point);
        let mut layers = Vec::new();
        for k in 2..top {
            let slots: Vec<usize> = (0..n).filter(|&j| s.adapted.layer[j] == k).collect();
            let r0 = s.layer_residuals(ys, i + 1, k + 1);
            let mut columns = Vec::new();
            for &j in &slots {
                let keep = ys[i].clone();
                for (o, v) in ys[i].iter_mut().zip(&s.adapted.basis[j]) {
                    *o += v;
                }
                let r = s.layer_residuals(ys, i + 1, k + 1);
                columns.push(r.iter().zip(&r0).map(|(a, b)| a - b).collect::<Vector>());
                ys[i] = keep;
            }
            let rows: Vec<Vector> = (0..r0.len())
                .map(|r| columns.iter().map(|c| c[r].clone()).collect())
                .collect();
            // independent rows: the pivots of the transpose
            let mut tr = Matrix::from_rows(
                (0..slots.len())
                    .map(|c| rows.iter().map(|r| r[c].clone()).collect())
                    .collect(),
                rows.len(),
            );
            let keep = if slots.is_empty() {
                Vec::new()
            } else {
                rref(&Rationals, &mut tr)
            };
            let m = Matrix::from_rows(keep.iter().map(|&r| rows[r].clone()).collect(), slots.len());
            layers.push((slots, keep, m));
        }
        ys.pop();
        Lifting { i, layers }
    }

    /// Lift a leading part: solve each layer on its independent rows; the obstruction is
    /// what remains of the residuals (zero exactly when every layer was consistent).
    /// Linear in the residuals, so polynomial along a line.
    pub(super) fn lift(&self, s: &Search, ys: &mut Vec<Vector>, lead: Vector) -> (Vector, Vector) {
        ys.push(lead);
        let mut obstruction = Vec::new();
        for (k, (slots, keep, m)) in self.layers.iter().enumerate() {
            let r = s.layer_residuals(ys, self.i + 1, k + 3);
            if !slots.is_empty() && !keep.is_empty() {
                let rhs: Vector = keep.iter().map(|&j| -&r[j]).collect();
                if let Some(u) = solve(&Rationals, m, &rhs) {
                    for (&j, c) in slots.iter().zip(&u) {
                        for (o, v) in ys[self.i].iter_mut().zip(&s.adapted.basis[j]) {
                            *o += c * v;
                        }
                    }
                }
            }
            obstruction.extend(s.layer_residuals(ys, self.i + 1, k + 3));
        }
        let y = ys.pop().expect("pushed");
        (y, obstruction)
    }

    /// The obstruction along the line as polynomials (one per coordinate, coefficients
    /// from the constant term up), by interpolation at s = 0, 1, ..., checked at two more
    /// points; `None` when no degree up to 48 fits.
    pub(super) fn obstruction_polynomial(
        &self,
        s: &Search,
        ys: &mut Vec<Vector>,
        at: &dyn Fn(&Q) -> Vector,
    ) -> Option<Vec<Vector>> {
        let mut values: Vec<Vector> = Vec::new();
        let mut degree = 4;
        while degree <= 48 {
            while values.len() < degree + 3 {
                let x = Q::from_integer((values.len() as i64).into());
                values.push(self.lift(s, ys, at(&x)).1);
            }
            let coords = values[0].len();
            let polys: Vec<Vector> = (0..coords)
                .map(|c| {
                    let v: Vec<Q> = values[..=degree].iter().map(|o| o[c].clone()).collect();
                    interpolate(&v)
                })
                .collect();
            let fits = (degree + 1..degree + 3).all(|x| {
                let xq = Q::from_integer((x as i64).into());
                polys
                    .iter()
                    .zip(&values[x])
                    .all(|(p, v)| &evaluate(p, &xq) == v)
            });
            if fits {
                return Some(polys);
            }
            degree *= 2;
        }
        None
    }
}

/// The polynomial of degree <= len - 1 through (s, v[s]) for s = 0, 1, ..., coefficients
/// from the constant term up (Newton's divided differences, expanded).
fn interpolate(v: &[Q]) -> Vector {
    let n = v.len();
    let mut d = v.to_vec();
    for k in 1..n {
        for s in (k..n).rev() {
            d[s] = (&d[s] - &d[s - 1]) / Q::from_integer((k as i64).into());
        }
    }
    // p(x) = d0 + (x - 0)(d1 + (x - 1)(d2 + ...)), Horner from the inside
    let mut p: Vector = vec![d[n - 1].clone()];
    for k in (0..n - 1).rev() {
        // p <- p * (x - k) + d[k]
        let mut q = vec![Q::zero(); p.len() + 1];
        let kq = Q::from_integer((k as i64).into());
        for (j, c) in p.iter().enumerate() {
            q[j + 1] += c;
            q[j] -= c * &kq;
        }
        q[0] += &d[k];
        p = q;
    }
    while p.last().is_some_and(Zero::is_zero) {
        p.pop();
    }
    p
}

fn evaluate(p: &[Q], x: &Q) -> Q {
    p.iter().rev().fold(Q::zero(), |acc, c| acc * x + c)
}
