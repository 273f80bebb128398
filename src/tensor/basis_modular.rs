//! The change of basis of [`super::change_basis`] through word-size primes: the same
//! exact result, without big-integer arithmetic in the O(d^4) contractions.
//!
//! Over Q, write `P = P'/dP`, `R = R'/dR`, `S = S'/dS` and `c = c'/D` with integer
//! matrices and constants (common denominators). Then
//! `c_new[i][j][k] = N[i][j][k] dS / (dP dR D det S')` with the integer tensor
//! `N = sum_{a,b,c} P'[a][i] R'[b][j] c'[a][b][c] adj(S')[k][c]`. N and `det S'` are
//! computed modulo primes (`adj S' = det S' (S')^-1` modulo a prime not dividing the
//! determinant) and recovered by the Chinese remainder theorem: `|N|` is at most
//! `nnz max|P'| max|R'| max|c'| H` and `|det S'| <= H` with Hadamard's bound H (the product
//! of the row norms of S', at least 1 each, bounds every minor), so primes whose product
//! exceeds twice the larger bound determine both exactly. Over GF(q) the contraction runs
//! modulo q itself.
//!
//! Cost: O(nnz d + d0 d1 (d1 + d2) d2) word operations per prime, for the number of primes
//! the bound needs; memory d0 d1 d2 words (used only up to [`MAX_ENTRIES`]).

use super::Tensor;
use crate::linalg::nullspace::cached_primes;
use crate::linalg::{Matrix, determinant, inverse};
use crate::scalar::{Field, FieldSpec, PrimeField, Q};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};

/// The dense result arrays are used up to this many entries (d0 d1 d2).
pub const MAX_ENTRIES: usize = 1 << 24;

/// The change of basis through primes, or `None` when this path does not apply (too many
/// entries, or shapes that do not match: the caller then uses the direct method).
/// `Some(None)`: S is singular.
pub(super) fn change_basis_modular(
    t: &Tensor,
    p: &Matrix<Q>,
    r: &Matrix<Q>,
    s: &Matrix<Q>,
) -> Option<Option<Tensor>> {
    let d = t.dims();
    if d[0] * d[1] * d[2] > MAX_ENTRIES || d.contains(&0) {
        return None;
    }
    match t.field() {
        FieldSpec::Prime(q) => Some(modulo_field(t, p, r, s, q)),
        FieldSpec::Rational => over_q(t, p, r, s),
    }
}

/// The matrix with each column scaled to integers, and the column denominators:
/// `m = m' diag(1 / den)`.
fn integer_columns(m: &Matrix<Q>) -> (Vec<BigInt>, Vec<BigInt>) {
    let dens: Vec<BigInt> = (0..m.cols)
        .map(|j| {
            (0..m.rows).fold(BigInt::one(), |l, i| l.lcm(m[(i, j)].denom()))
        })
        .collect();
    let v = (0..m.rows * m.cols)
        .map(|x| {
            let (i, j) = (x / m.cols, x % m.cols);
            let e = &m[(i, j)];
            e.numer() * (&dens[j] / e.denom())
        })
        .collect();
    (v, dens)
}

fn residue(x: &BigInt, pb: &BigInt, p: u64) -> u64 {
    match x.to_i64() {
        Some(s) => s.rem_euclid(p as i64) as u64,
        None => x.mod_floor(pb).to_u64().expect("reduced"),
    }
}

/// `N` modulo p (see the module documentation), given P', R', c' and `adj S'` (or `S^-1`
/// over GF(q)) modulo p, all dense and row-major.
fn contract(
    f: &PrimeField,
    d: [usize; 3],
    pm: &[u64],
    rm: &[u64],
    c: &[(usize, usize, usize, u64)],
    adj: &[u64],
) -> Vec<u64> {
    let [a0, b0, c0] = d;
    let mul = |x: u64, y: u64| f.mul(&x, &y);
    // t1[i][b][c] = sum_a P[a][i] c[a][b][c]
    let mut t1 = vec![0u64; a0 * b0 * c0];
    for &(a, b, cc, v) in c {
        for i in 0..a0 {
            let x = pm[a * a0 + i];
            if x != 0 {
                let o = &mut t1[(i * b0 + b) * c0 + cc];
                *o = f.add(o, &mul(x, v));
            }
        }
    }
    // t2[i][j][c] = sum_b R[b][j] t1[i][b][c]
    let mut t2 = vec![0u64; a0 * b0 * c0];
    for i in 0..a0 {
        for b in 0..b0 {
            let row = &t1[(i * b0 + b) * c0..(i * b0 + b + 1) * c0];
            if row.iter().all(|&x| x == 0) {
                continue;
            }
            for j in 0..b0 {
                let y = rm[b * b0 + j];
                if y == 0 {
                    continue;
                }
                let out = &mut t2[(i * b0 + j) * c0..(i * b0 + j + 1) * c0];
                for (o, &x) in out.iter_mut().zip(row) {
                    *o = f.add(o, &mul(x, y));
                }
            }
        }
    }
    // n[i][j][k] = sum_c adj[k][c] t2[i][j][c]
    let mut n = vec![0u64; a0 * b0 * c0];
    for ij in 0..a0 * b0 {
        let row = &t2[ij * c0..(ij + 1) * c0];
        if row.iter().all(|&x| x == 0) {
            continue;
        }
        for k in 0..c0 {
            let mut s = 0u64;
            for (cc, &x) in row.iter().enumerate() {
                if x != 0 {
                    s = f.add(&s, &mul(adj[k * c0 + cc], x));
                }
            }
            n[ij * c0 + k] = s;
        }
    }
    n
}

fn modulo_field(t: &Tensor, p: &Matrix<Q>, r: &Matrix<Q>, s: &Matrix<Q>, q: u64) -> Option<Tensor> {
    let f = PrimeField::new(q).expect("a prime field");
    let conv = |m: &Matrix<Q>| m.map(|x| f.from_rational(x).expect("in the field"));
    let sinv = inverse(&f, &conv(s))?;
    let c: Vec<(usize, usize, usize, u64)> = t
        .entries()
        .map(|(a, b, k, v)| (a, b, k, f.from_rational(v).expect("in the field")))
        .collect();
    let d = t.dims();
    let n = contract(&f, d, &conv(p).data, &conv(r).data, &c, &sinv.data);
    Some(fill(t, d, |idx| {
        let v = n[idx];
        (v != 0).then(|| Q::from_integer(v.into()))
    }))
}

/// The tensor with the old names and kind, entries from `value(index)`.
fn fill(t: &Tensor, d: [usize; 3], value: impl Fn(usize) -> Option<Q>) -> Tensor {
    let mut out = Tensor::zero(t.field(), t.kind(), d, Some(t.names().clone()));
    for i in 0..d[0] {
        for j in 0..d[1] {
            let row: Vec<(usize, Q)> = (0..d[2])
                .filter_map(|k| value((i * d[1] + j) * d[2] + k).map(|v| (k, v)))
                .collect();
            if !row.is_empty() {
                out.set_product(i, j, row);
            }
        }
    }
    out
}

/// Bits of a bound on `|x|` for the largest entry of a list.
fn max_bits(v: &[BigInt]) -> u64 {
    v.iter().map(|x| x.bits()).max().unwrap_or(0)
}

/// Over Q: `None` when the bound is out of reach of the primes (the caller's direct
/// method decides), `Some(None)` when S is singular.
fn over_q(t: &Tensor, p: &Matrix<Q>, r: &Matrix<Q>, s: &Matrix<Q>) -> Option<Option<Tensor>> {
    let d = t.dims();
    // P = P' diag(1/dp), R = R' diag(1/dr), S = S' diag(1/ds): S^-1 = diag(ds) S'^-1
    let (pi, dp) = integer_columns(p);
    let (ri, dr) = integer_columns(r);
    let (si, ds) = integer_columns(s);
    let dt = t
        .entries()
        .fold(BigInt::one(), |l, (_, _, _, v)| l.lcm(v.denom()));
    let ci: Vec<(usize, usize, usize, BigInt)> = t
        .entries()
        .map(|(a, b, k, v)| (a, b, k, v.numer() * (&dt / v.denom())))
        .collect();
    // Hadamard's bound on every minor of S' (each row norm counted as at least 1)
    let n = d[2];
    let hadamard_bits: u64 = (0..n)
        .map(|row| {
            let sq: BigInt = si[row * n..(row + 1) * n].iter().map(|x| x * x).sum();
            sq.bits().div_ceil(2).max(1)
        })
        .sum();
    let cmax = ci.iter().map(|x| x.3.bits()).max().unwrap_or(0);
    let nnz_bits = 64 - (ci.len().max(1) as u64).leading_zeros() as u64;
    let n_bits = nnz_bits + max_bits(&pi) + max_bits(&ri) + cmax + hadamard_bits;
    let need = n_bits.max(hadamard_bits) + 2;
    // residues of N and det S' modulo primes not dividing det S'
    let mut moduli: Vec<u64> = Vec::new();
    let mut ns: Vec<Vec<u64>> = Vec::new();
    let mut dets: Vec<u64> = Vec::new();
    let mut bits = 0f64;
    let extra = need as usize / 27 + 8;
    let primes: Vec<u64> = if extra <= cached_primes().len() {
        cached_primes().to_vec()
    } else {
        crate::linalg::modular::kernel_primes(extra)
    };
    for &q in &primes {
        if bits > need as f64 {
            break;
        }
        let f = PrimeField::new(q).expect("prime");
        let qb = BigInt::from(q);
        let red = |v: &[BigInt]| v.iter().map(|x| residue(x, &qb, q)).collect::<Vec<u64>>();
        let sm = Matrix {
            rows: n,
            cols: n,
            data: red(&si),
        };
        let det = determinant(&f, &sm);
        if det == 0 {
            continue;
        }
        let sinv = inverse(&f, &sm).expect("nonzero determinant");
        let adj: Vec<u64> = sinv.data.iter().map(|x| f.mul(x, &det)).collect();
        let c: Vec<(usize, usize, usize, u64)> = ci
            .iter()
            .map(|(a, b, k, v)| (*a, *b, *k, residue(v, &qb, q)))
            .collect();
        ns.push(contract(&f, d, &red(&pi), &red(&ri), &c, &adj));
        dets.push(det);
        moduli.push(q);
        bits += (q as f64).log2();
    }
    if bits <= need as f64 {
        // S is singular (its determinant vanishes modulo every prime): the caller's direct
        // method decides
        return None;
    }
    let det = crt(&dets, &moduli);
    if det.is_zero() {
        return Some(None);
    }
    // c_new[i][j][k] = N[i][j][k] ds[k] / (dp[i] dr[j] D det S')
    let base = Q::new(BigInt::one(), dt * det);
    let entries = d[0] * d[1] * d[2];
    let mut values: Vec<Option<Q>> = Vec::with_capacity(entries);
    let mut res = vec![0u64; moduli.len()];
    for idx in 0..entries {
        for (x, nq) in res.iter_mut().zip(&ns) {
            *x = nq[idx];
        }
        if res.iter().all(|&x| x == 0) {
            values.push(None);
            continue;
        }
        let v = crt(&res, &moduli);
        let (i, j, k) = (idx / (d[1] * d[2]), (idx / d[2]) % d[1], idx % d[2]);
        let scale = Q::new(ds[k].clone(), &dp[i] * &dr[j]);
        values.push((!v.is_zero()).then(|| Q::from_integer(v) * &base * scale));
    }
    Some(Some(fill(t, d, |idx| values[idx].clone())))
}

/// The integer in the symmetric range with the given residues (Garner's method).
fn crt(res: &[u64], moduli: &[u64]) -> BigInt {
    let mut x = BigInt::zero();
    let mut m = BigInt::one();
    for (&r, &q) in res.iter().zip(moduli) {
        let qb = BigInt::from(q);
        let xm = residue(&x, &qb, q);
        let mm = residue(&m, &qb, q);
        let f = PrimeField::new(q).expect("prime");
        let t = f.mul(&f.sub(&r, &xm), &f.inv(&mm).expect("coprime moduli"));
        x += &m * t;
        m *= q;
    }
    let half: BigInt = &m >> 1u32;
    if x > half { x - m } else { x }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tensor::{change_basis, random_invertible};

    #[test]
    fn agrees_with_the_direct_method() {
        // a random rational tensor, random integer and fractional changes of basis; the
        // direct method (exact rational sums) is the reference
        let mut t = Tensor::zero(FieldSpec::Rational, super::super::Kind::Bilinear, [3, 2, 4], None);
        let mut k = 1i64;
        for i in 0..3 {
            for j in 0..2 {
                for c in 0..4 {
                    if (i + 2 * j + c) % 3 != 0 {
                        t.set(i, j, c, Q::new(k.into(), (1 + (k % 5)).into()));
                        k = -k * 7 % 101 + 3;
                    }
                }
            }
        }
        let p = random_invertible(3, 50, 1);
        let r = random_invertible(2, 50, 2).map(|x| x / Q::from_integer(7.into()));
        let s = random_invertible(4, 1000, 3);
        let fast = change_basis_modular(&t, &p, &r, &s).unwrap().unwrap();
        let slow = super::super::basis::change_basis_direct(&t, &p, &r, &s).unwrap();
        assert_eq!(fast, slow);
        assert_eq!(change_basis(&t, &p, &r, &s).unwrap(), slow);
        // over GF(7): both methods agree (or both find S singular mod 7)
        let t7 = t.with_field(FieldSpec::Prime(7)).unwrap();
        let (p7, r7, s7) = (
            random_invertible(3, 3, 7),
            random_invertible(2, 3, 8),
            random_invertible(4, 3, 9),
        );
        assert_eq!(
            change_basis_modular(&t7, &p7, &r7, &s7).unwrap(),
            super::super::basis::change_basis_direct(&t7, &p7, &r7, &s7)
        );
    }
}
