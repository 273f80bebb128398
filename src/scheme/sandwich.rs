//! The sandwich symmetry of matrix multiplication schemes, and a greedy search with it.
//!
//! For invertible X (n x n), Y (m x m), Z (p x p), `tr(A B G^T)` is unchanged under
//! `A -> X A Y^-1`, `B -> Y B Z^-1`, `G -> X^-T G Z^T`; hence a scheme `(U_t, V_t, W_t)` for
//! <n,m,p> (factors read as n x m, m x p, n x p matrices, row-major as in the generator)
//! gives the scheme `(X^T U_t Y^-T, Y^T V_t Z^-T, X^-1 W_t Z)` of the same rank.
//! The greedy search applies elementary moves (X, Y or Z = I + c E_ab, c = +-1) while one
//! lowers (number of nonzero coefficients, number of coefficients other than +-1).
//! Callers re-verify (see [`super::polish`]).

use super::{Scheme, reduce_into};
use crate::scalar::{FieldSpec, Q};
use num_traits::{One, Zero};

/// Which of X, Y, Z a move changes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Side {
    X,
    Y,
    Z,
}

/// An elementary move: the matrix `I + c E_ab` on one side.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Move {
    pub side: Side,
    pub a: usize,
    pub b: usize,
    pub c: Q,
}

fn red(f: FieldSpec, x: Q) -> Q {
    reduce_into(f, &x).unwrap_or(x)
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

/// Apply one move to a scheme for <n,m,p> (see the module docs for the formulas).
/// Cost: O(r (n + m + p) max(n, m, p)).
pub fn apply_move(s: &Scheme, [n, m, p]: [usize; 3], mv: &Move) -> Scheme {
    let f = s.field;
    let mut out = s.clone();
    let (a, b) = (mv.a, mv.b);
    let c = red(f, mv.c.clone());
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

/// (nonzeros, coefficients other than +-1): the quantity the search lowers.
pub fn score(s: &Scheme) -> (usize, usize) {
    (s.nnz(), super::polish::count_nonunit(s))
}

/// Greedy descent with elementary sandwich moves, at most `max_steps` moves. Returns the
/// improved scheme and the moves applied. Cost per step: O(moves * r * d^2) with
/// 2 (n^2 + m^2 + p^2) candidate moves.
pub fn sandwich_greedy(s: &Scheme, nmp: [usize; 3], max_steps: usize) -> (Scheme, Vec<Move>) {
    let [n, m, p] = nmp;
    let mut cur = s.clone();
    let mut cur_score = score(&cur);
    let mut applied = Vec::new();
    for _ in 0..max_steps {
        let mut best: Option<(Scheme, (usize, usize), Move)> = None;
        for (side, d) in [(Side::X, n), (Side::Y, m), (Side::Z, p)] {
            for a in 0..d {
                for b in 0..d {
                    if a == b {
                        continue;
                    }
                    for c in [Q::one(), -Q::one()] {
                        let mv = Move { side, a, b, c };
                        let next = apply_move(&cur, nmp, &mv);
                        let sc = score(&next);
                        if sc < best.as_ref().map_or(cur_score, |x| x.1) {
                            best = Some((next, sc, mv));
                        }
                    }
                }
            }
        }
        match best {
            Some((next, sc, mv)) => {
                cur = next;
                cur_score = sc;
                applied.push(mv);
            }
            None => break,
        }
    }
    (cur, applied)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scheme::testkit::*;
    use crate::scheme::verify;

    #[test]
    fn moves_keep_schemes_valid_and_greedy_undoes_scrambling() {
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
        assert!(score(&scrambled) > score(&s));
        let (back, _) = sandwich_greedy(&scrambled, [2, 3, 2], 50);
        assert!(verify(&back, &t).is_ok());
        assert!(score(&back) < score(&scrambled));
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
