//! Schemes over GF(2) with bit-packed factors in multi-word masks.
//!
//! A factor on an axis of dimension d is a mask of `words(d) = ceil(d / 64)` 64-bit words:
//! bit `i % 64` of word `i / 64` is the coefficient of basis vector i. Axes up to
//! [`MAX_DIM`] basis vectors are supported, so formats such as <8,9,2> (72 left
//! coordinates) fit.
//!
//! Invariant: every mask of a [`BitScheme`] has exactly `words(dims[a])` words and no bit
//! at or above `dims[a]`.

use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q};
use crate::scheme::Scheme;
use crate::tensor::Tensor;
use num_traits::{One, Zero};

/// The largest axis dimension of a bit-packed scheme (four 64-bit words).
pub const MAX_DIM: usize = 256;

/// Words of a mask for `d` basis vectors.
pub fn words(d: usize) -> usize {
    d.div_ceil(64).max(1)
}

/// A mask with the single bit i.
pub fn unit_mask(n_words: usize, i: usize) -> Vec<u64> {
    let mut m = vec![0u64; n_words];
    m[i / 64] |= 1 << (i % 64);
    m
}

/// `a += b` over GF(2), word by word (masks of equal length).
#[inline]
pub fn xor_words(a: &mut [u64], b: &[u64]) {
    for (x, y) in a.iter_mut().zip(b) {
        *x ^= y;
    }
}

/// Bit i of a mask.
#[inline]
pub fn bit(m: &[u64], i: usize) -> bool {
    m[i / 64] >> (i % 64) & 1 == 1
}

/// Indices of the set bits of a mask, in increasing order.
pub fn bits_of(m: &[u64]) -> impl Iterator<Item = usize> + '_ {
    m.iter().enumerate().flat_map(|(w, &x)| {
        let mut x = x;
        std::iter::from_fn(move || {
            if x == 0 {
                None
            } else {
                let i = x.trailing_zeros() as usize;
                x &= x - 1;
                Some(w * 64 + i)
            }
        })
    })
}

/// A scheme over GF(2) with bit-packed factors: `terms[t][a]` is the factor on axis `a`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct BitScheme {
    pub dims: [usize; 3],
    pub terms: Vec<[Vec<u64>; 3]>,
}

/// The residue mod 2 of a rational with odd denominator; `None` for an even denominator.
fn parity(x: &Q) -> Option<bool> {
    use num_integer::Integer;
    if x.denom().is_even() {
        return None;
    }
    Some(x.numer().is_odd())
}

/// Refuse shapes the bit-packed walk cannot hold.
pub fn check_dims(dims: [usize; 3]) -> Result<()> {
    if dims.iter().any(|&d| d > MAX_DIM || d == 0) {
        return Err(Error::Invalid(format!(
            "the flip walk packs factors in at most {} 64-bit words: dimensions {dims:?} must be 1..={MAX_DIM}",
            MAX_DIM / 64
        )));
    }
    Ok(())
}

/// The tensor reduced mod 2 as masks: `out[i * dims[1] + j]` has bit k set when
/// `c[i][j][k]` is odd. Fails for a tensor over GF(p), p != 2, or with an even denominator.
/// Cost: O(nnz + d0 d1 words(d2)).
pub fn tensor_bits(t: &Tensor) -> Result<Vec<Vec<u64>>> {
    check_dims(t.dims())?;
    if let FieldSpec::Prime(p) = t.field()
        && p != 2
    {
        return Err(Error::Invalid(format!(
            "the GF(2) flip walk needs a tensor over Q or GF(2); this tensor is over GF({p})"
        )));
    }
    let d = t.dims();
    let mut out = vec![vec![0u64; words(d[2])]; d[0] * d[1]];
    for (i, j, k, c) in t.entries() {
        let odd = parity(c).ok_or_else(|| {
            Error::Invalid(format!(
                "coefficient {c} of the tensor has an even denominator: no reduction mod 2"
            ))
        })?;
        if odd {
            out[i * d[1] + j][k / 64] ^= 1 << (k % 64);
        }
    }
    Ok(out)
}

impl BitScheme {
    /// The standard scheme of the tensor mod 2 (one term per odd structure constant).
    pub fn standard(t: &Tensor) -> Result<BitScheme> {
        let bits = tensor_bits(t)?;
        let d = t.dims();
        let mut terms = Vec::new();
        for (ij, m) in bits.iter().enumerate() {
            let (i, j) = (ij / d[1], ij % d[1]);
            for k in bits_of(m) {
                terms.push([
                    unit_mask(words(d[0]), i),
                    unit_mask(words(d[1]), j),
                    unit_mask(words(d[2]), k),
                ]);
            }
        }
        Ok(BitScheme { dims: d, terms })
    }

    /// Reduce a scheme mod 2 (every denominator must be odd). Terms with a zero factor
    /// mod 2 are dropped.
    pub fn from_scheme(s: &Scheme) -> Result<BitScheme> {
        check_dims(s.dims)?;
        if let FieldSpec::Prime(p) = s.field
            && p != 2
        {
            return Err(Error::Invalid(format!(
                "a scheme over GF({p}) has no reduction mod 2"
            )));
        }
        let pack = |v: &[Q]| -> Result<Vec<u64>> {
            let mut m = vec![0u64; words(v.len())];
            for (i, x) in v.iter().enumerate() {
                if parity(x).ok_or_else(|| {
                    Error::Invalid(format!("scheme entry {x} has an even denominator"))
                })? {
                    m[i / 64] |= 1 << (i % 64);
                }
            }
            Ok(m)
        };
        let mut terms = Vec::with_capacity(s.rank());
        for t in 0..s.rank() {
            let tr = [pack(&s.u[t])?, pack(&s.v[t])?, pack(&s.w[t])?];
            if tr.iter().all(|m| m.iter().any(|&x| x != 0)) {
                terms.push(tr);
            }
        }
        Ok(BitScheme {
            dims: s.dims,
            terms,
        })
    }

    /// The number of terms.
    pub fn rank(&self) -> usize {
        self.terms.len()
    }

    /// The scheme with 0/1 entries, labelled with `field`.
    pub fn to_scheme(&self, field: FieldSpec) -> Scheme {
        let unpack = |m: &[u64], n: usize| -> Vec<Q> {
            (0..n)
                .map(|i| if bit(m, i) { Q::one() } else { Q::zero() })
                .collect()
        };
        let mut s = Scheme::empty(field, self.dims);
        for tr in &self.terms {
            s.push(
                unpack(&tr[0], self.dims[0]),
                unpack(&tr[1], self.dims[1]),
                unpack(&tr[2], self.dims[2]),
            );
        }
        s
    }

    /// `sum_t u_t (x) v_t (x) w_t` over GF(2), in the layout of [`tensor_bits`].
    /// Cost: O(r d0 d1 words(d2)).
    pub fn evaluate(&self) -> Vec<Vec<u64>> {
        let d = self.dims;
        let mut out = vec![vec![0u64; words(d[2])]; d[0] * d[1]];
        for tr in &self.terms {
            for i in bits_of(&tr[0]) {
                for j in bits_of(&tr[1]) {
                    for (o, x) in out[i * d[1] + j].iter_mut().zip(&tr[2]) {
                        *o ^= x;
                    }
                }
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn masks_across_words() {
        let m = unit_mask(2, 70);
        assert!(bit(&m, 70) && !bit(&m, 6));
        let mut x = vec![0u64; 3];
        for i in [0, 63, 64, 130] {
            x[i / 64] |= 1 << (i % 64);
        }
        assert_eq!(bits_of(&x).collect::<Vec<_>>(), vec![0, 63, 64, 130]);
        assert_eq!((words(64), words(65), words(256)), (1, 2, 4));
        assert!(check_dims([257, 1, 1]).is_err());
    }
}
