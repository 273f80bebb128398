//! A nonzero minor modulo a prime: the certificate of a lower bound for the rank of a
//! matrix.
//!
//! If M has integer entries and the r x r submatrix `M[R, C]` has a determinant that is
//! nonzero modulo a prime p, then `det M[R, C]` is a nonzero integer, so `rank M >= r`
//! over Q and over every field containing Q. For a matrix over GF(q) the prime is q itself
//! and the statement is over GF(q) and its extensions. A rational matrix `M` with the
//! common denominator D is handled as `D M` (same rank).
//!
//! Finding one: the pivot columns of an echelon form of M are independent columns C, those
//! of the transpose independent rows R; when both have the rank r of M, `M[R, C]` is
//! nonsingular (`M = M[:, C] X`, so `r = rank M[R, :] <= rank M[R, C]`; common practice).
//! Both eliminations run on the shared engine ([`crate::linalg::nullspace::echelon_modulo`]).

use crate::linalg::modular::rank_mod;
use crate::linalg::nullspace::echelon_modulo;
use crate::linalg::system::RowSource;
use crate::linalg::{Matrix, rank};
use crate::scalar::{PrimeField, is_prime};
use serde::Serialize;

/// A square submatrix, by its row and column indices, and the prime its determinant is
/// nonzero modulo.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Minor {
    pub prime: u64,
    pub rows: Vec<usize>,
    pub columns: Vec<usize>,
}

impl Minor {
    /// The size r of the minor (the rank it proves).
    pub fn size(&self) -> usize {
        self.rows.len()
    }

    /// The JSON form `{"prime", "rows", "columns"}`.
    pub fn to_json(&self) -> serde_json::Value {
        serde_json::json!({"prime": self.prime, "rows": self.rows, "columns": self.columns})
    }

    /// Read the JSON form (as written by [`Minor::to_json`]).
    pub fn from_json(v: &serde_json::Value) -> Result<Minor, String> {
        let list = |key: &str| -> Result<Vec<usize>, String> {
            v[key]
                .as_array()
                .ok_or(format!("the minor has no `{key}` list"))?
                .iter()
                .map(|x| {
                    x.as_u64()
                        .map(|y| y as usize)
                        .ok_or(format!("`{key}` holds a non-index"))
                })
                .collect()
        };
        Ok(Minor {
            prime: v["prime"].as_u64().ok_or("the minor has no prime")?,
            rows: list("rows")?,
            columns: list("columns")?,
        })
    }
}

/// The rank modulo p of the matrix whose rows are the equations of `by_rows` (its
/// unknowns are the columns) and a nonzero minor of that size; `by_columns` poses the
/// transposed matrix. Cost: two eliminations modulo p.
pub fn find_minor(by_rows: &dyn RowSource, by_columns: &dyn RowSource, p: u64) -> Minor {
    let columns = echelon_modulo(by_rows, p).pivot_columns();
    let rows = echelon_modulo(by_columns, p).pivot_columns();
    debug_assert_eq!(rows.len(), columns.len(), "a matrix and its transpose");
    let r = rows.len().min(columns.len());
    Minor {
        prime: p,
        rows: rows[..r].to_vec(),
        columns: columns[..r].to_vec(),
    }
}

/// Check a minor: the prime is prime, the indices are distinct and in range, and the
/// submatrix, whose entries `entry(row, column)` gives modulo the prime, is nonsingular
/// modulo it. Cost: r^2 entries and one r x r elimination modulo the prime.
pub fn check_minor(
    m: &Minor,
    shape: [usize; 2],
    entry: impl Fn(usize, usize) -> u64,
) -> Result<(), String> {
    if !is_prime(m.prime) {
        return Err(format!("{} is not a prime", m.prime));
    }
    let fp = PrimeField::new(m.prime).ok_or("the prime is too large")?;
    if m.rows.len() != m.columns.len() {
        return Err("the minor is not square".into());
    }
    for (list, n, what) in [(&m.rows, shape[0], "row"), (&m.columns, shape[1], "column")] {
        let mut seen = std::collections::HashSet::new();
        for &i in list.iter() {
            if i >= n || !seen.insert(i) {
                return Err(format!("{what} index {i} is out of range or repeated"));
            }
        }
    }
    let r = m.size();
    let mut mat = Matrix::filled(r, r, 0u64);
    for (a, &i) in m.rows.iter().enumerate() {
        for (b, &j) in m.columns.iter().enumerate() {
            mat[(a, b)] = entry(i, j) % m.prime;
        }
    }
    // the word kernel for primes below 2^28 (all the minors found here), the generic
    // field otherwise (a certificate read from elsewhere)
    let full = if m.prime < 1 << 28 {
        rank_mod(mat, m.prime) == r
    } else {
        rank(&fp, &mat) == r
    };
    if full {
        Ok(())
    } else {
        Err(format!(
            "the {r} x {r} minor is singular modulo {}",
            m.prime
        ))
    }
}
