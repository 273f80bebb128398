//! The sandwich symmetry of matrix multiplication schemes, one elementary move at a time.
//!
//! For invertible X (n x n), Y (m x m), Z (p x p), `tr(A B G^T)` is unchanged under
//! `A -> X A Y^-1`, `B -> Y B Z^-1`, `G -> X^-T G Z^T`; hence a scheme `(U_t, V_t, W_t)` for
//! <n,m,p> (factors read as n x m, m x p, n x p matrices, row-major as in the generator)
//! gives the scheme `(X^T U_t Y^-T, Y^T V_t Z^-T, X^-1 W_t Z)` of the same rank.
//! A [`Move`] is one elementary matrix on one side: `I + c E_ab` (a != b, a transvection)
//! or `I + (c - 1) E_aa` (a == b, scaling row/column a by c != 0). The search that uses
//! them is [`super::polish`]; callers re-verify.

use super::{Scheme, red};
use crate::linalg::Matrix;
use crate::scalar::{Field, FieldSpec, Q, Rationals};
use num_traits::Zero;

/// Which of X, Y, Z a move changes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Side {
    X,
    Y,
    Z,
}

/// An elementary move: the matrix `I + c E_ab` (a != b) or `I + (c - 1) E_aa` on one side.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Move {
    pub side: Side,
    pub a: usize,
    pub b: usize,
    pub c: Q,
}

/// `row[dst] += c * row[src]` of a rows x cols matrix stored row-major.
fn add_row(f: FieldSpec, m: &mut [Q], cols: usize, dst: usize, src: usize, c: &Q) {
    for j in 0..cols {
        let s = &m[src * cols + j];
        if !s.is_zero() {
            m[dst * cols + j] = red(f, &m[dst * cols + j] + c * s);
        }
    }
}

/// `col[dst] += c * col[src]`.
fn add_col(f: FieldSpec, m: &mut [Q], rows: usize, cols: usize, dst: usize, src: usize, c: &Q) {
    for i in 0..rows {
        let s = &m[i * cols + src];
        if !s.is_zero() {
            m[i * cols + dst] = red(f, &m[i * cols + dst] + c * s);
        }
    }
}

/// `row[r] *= c`.
fn scale_row(f: FieldSpec, m: &mut [Q], cols: usize, r: usize, c: &Q) {
    for x in &mut m[r * cols..(r + 1) * cols] {
        *x = red(f, &*x * c);
    }
}

/// `col[k] *= c`.
fn scale_col(f: FieldSpec, m: &mut [Q], cols: usize, k: usize, c: &Q) {
    for x in m.iter_mut().skip(k).step_by(cols) {
        *x = red(f, &*x * c);
    }
}

/// Apply one move to a scheme for <n,m,p> (see the module docs for the formulas); a
/// scaling move needs c != 0 in the scheme's field. Cost: O(r (n + m + p) max(n, m, p)).
pub fn apply_move(s: &Scheme, [n, m, p]: [usize; 3], mv: &Move) -> Scheme {
    let f = s.field;
    let mut out = s.clone();
    let (a, b) = (mv.a, mv.b);
    let c = red(f, mv.c.clone());
    if a == b {
        let ci = red(f, Q::from_integer(1.into()) / &c);
        for t in 0..s.rank() {
            match mv.side {
                Side::X => {
                    scale_row(f, &mut out.u[t], m, a, &c); // X^T U
                    scale_row(f, &mut out.w[t], p, a, &ci); // X^-1 W
                }
                Side::Y => {
                    scale_col(f, &mut out.u[t], m, a, &ci); // U Y^-T
                    scale_row(f, &mut out.v[t], p, a, &c); // Y^T V
                }
                Side::Z => {
                    scale_col(f, &mut out.v[t], p, a, &ci); // V Z^-T
                    scale_col(f, &mut out.w[t], p, a, &c); // W Z
                }
            }
        }
        return out;
    }
    let mc = red(f, -mv.c.clone());
    for t in 0..s.rank() {
        match mv.side {
            Side::X => {
                add_row(f, &mut out.u[t], m, b, a, &c); // X^T U
                add_row(f, &mut out.w[t], p, a, b, &mc); // X^-1 W
            }
            Side::Y => {
                add_col(f, &mut out.u[t], n, m, a, b, &mc); // U Y^-T
                add_row(f, &mut out.v[t], p, b, a, &c); // Y^T V
            }
            Side::Z => {
                add_col(f, &mut out.v[t], m, p, a, b, &mc); // V Z^-T
                add_col(f, &mut out.w[t], n, p, b, a, &c); // W Z
            }
        }
    }
    out
}

/// The elementary moves polish tries for <n,m,p>: transvections with c = +-1 on every
/// side and scalings of one row or column by each of `scales`.
pub fn elementary_moves(nmp: [usize; 3], scales: &[Q]) -> Vec<Move> {
    let mut out = Vec::new();
    for (side, d) in [(Side::X, nmp[0]), (Side::Y, nmp[1]), (Side::Z, nmp[2])] {
        for a in 0..d {
            for b in 0..d {
                let cs: Vec<Q> = if a == b {
                    scales.to_vec()
                } else {
                    vec![Q::from_integer(1.into()), Q::from_integer((-1).into())]
                };
                for c in cs {
                    out.push(Move { side, a, b, c });
                }
            }
        }
    }
    out
}

/// The sandwich by whole matrices: `(X^T U_t Y^-T, Y^T V_t Z^-T, X^-1 W_t Z)` for every
/// term (see the module docs); `None` when X, Y or Z is not invertible in the scheme's
/// field. Cost: O(r (n + m + p)^3).
pub fn apply_sandwich(
    s: &Scheme,
    [n, m, p]: [usize; 3],
    [x, y, z]: [&Matrix<Q>; 3],
) -> Option<Scheme> {
    let f = s.field;
    let inv = |a: &Matrix<Q>| -> Option<Matrix<Q>> {
        crate::with_field!(f, fl => {
            let e = a.map(|v| fl.from_rational(v).expect("reduced"));
            crate::linalg::inverse(fl, &e).map(|i| i.map(|v| fl.to_rational(v)))
        })
    };
    let mul = |a: &Matrix<Q>, b: &Matrix<Q>| a.mul(&Rationals, b).map(|v| red(f, v.clone()));
    let as_mat = |v: &[Q], r: usize, c: usize| {
        Matrix::from_rows((0..r).map(|i| v[i * c..(i + 1) * c].to_vec()).collect(), c)
    };
    let (xi, yi, zi) = (inv(x)?, inv(y)?, inv(z)?);
    let (xt, yt, yit, zit) = (x.transpose(), y.transpose(), yi.transpose(), zi.transpose());
    let mut out = s.clone();
    for t in 0..s.rank() {
        out.u[t] = mul(&mul(&xt, &as_mat(&s.u[t], n, m)), &yit).data;
        out.v[t] = mul(&mul(&yt, &as_mat(&s.v[t], m, p)), &zit).data;
        out.w[t] = mul(&mul(&xi, &as_mat(&s.w[t], n, p)), z).data;
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use crate::scheme::verify;
    use num_traits::One;

    #[test]
    fn moves_keep_schemes_valid() {
        let t = matmul(2, 3, 2);
        let s = Scheme::standard(&t);
        let mut scrambled = s.clone();
        let moves = [
            Move {
                side: Side::X,
                a: 0,
                b: 1,
                c: Q::one(),
            },
            Move {
                side: Side::Y,
                a: 2,
                b: 0,
                c: -Q::one(),
            },
            Move {
                side: Side::Z,
                a: 1,
                b: 0,
                c: Q::one(),
            },
            Move {
                side: Side::Y,
                a: 1,
                b: 2,
                c: Q::one(),
            },
        ];
        for mv in &moves {
            scrambled = apply_move(&scrambled, [2, 3, 2], mv);
            assert!(verify(&scrambled, &t).is_ok(), "{mv:?}");
        }
        assert!(scrambled.nnz() > s.nnz());
        // a scaling move and its inverse cancel
        let q = crate::scalar::q;
        let once = moved(&s, [2, 3, 2], &[(Side::Y, 1, 1, q(3, 2))]);
        assert!(verify(&once, &t).is_ok());
        let back = moved(&once, [2, 3, 2], &[(Side::Y, 1, 1, q(2, 3))]);
        assert_eq!(back, s);
        // Strassen over GF(5) stays valid under moves
        let t5 = matmul(2, 2, 2).with_field(FieldSpec::Prime(5)).unwrap();
        let s5 = scheme(STRASSEN, &matmul(2, 2, 2))
            .with_field(FieldSpec::Prime(5))
            .unwrap();
        let x = apply_move(
            &s5,
            [2, 2, 2],
            &Move {
                side: Side::Z,
                a: 0,
                b: 1,
                c: -Q::one(),
            },
        );
        assert!(verify(&x, &t5).is_ok());
    }
}
