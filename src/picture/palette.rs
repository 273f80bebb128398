//! Colours of the pictures: one diverging scale for signed coefficients (blue for
//! positive, orange for negative, five shades each by magnitude), a sequential scale for
//! densities, and the ink of frames, grids and text.
//!
//! The two hues of the diverging scale differ in lightness and in the blue-yellow
//! direction, which stays visible under the common red-green colour-vision deficiencies
//! (protanopia, deuteranopia); every ramp is monotone in lightness, so it also reads in
//! grey. Magnitudes are classified exactly (no floating point): the level of a coefficient
//! c is the bit length of ceil(|c|), so level 1 is |c| <= 1, level 2 is 1 < |c| <= 3,
//! level 3 is 3 < |c| <= 7, and so on; the largest level present gets the darkest shade.

use crate::scalar::{FieldSpec, Q};
use num_bigint::BigInt;
use num_traits::{Signed, Zero};

/// Positive coefficients, lightest to darkest.
pub const POSITIVE: [&str; 5] = ["#bccce0", "#93aed2", "#6a90c3", "#4172b5", "#1854a6"];
/// Negative coefficients, lightest to darkest.
pub const NEGATIVE: [&str; 5] = ["#ecceb2", "#e2b185", "#d89459", "#ce772c", "#c45a00"];
/// Densities (fraction of nonzero coefficients), lightest to darkest.
pub const DENSITY: [&str; 6] = [
    "#e0e6e3", "#bac9c9", "#95adae", "#709194", "#457176", "#124a52",
];
/// Background of a zero coefficient.
pub const ZERO: &str = "#ffffff";
/// Thin lines between cells.
pub const GRID: &str = "#e3e2dc";
/// Frames of matrices.
pub const FRAME: &str = "#77756c";
/// Block edges and rings around coefficients outside the blocks.
pub const EDGE: &str = "#202020";
/// Tint of the diagonal blocks in a block picture.
pub const BLOCK_TINT: &str = "#f3f1e6";

/// The style sheet shared by all pictures (text classes `t` title, `c` caption,
/// `l` labels, `s` small labels).
pub fn style(label_px: i64) -> String {
    format!(
        "text{{font-family:'DejaVu Sans Mono',Menlo,Consolas,monospace;fill:#222}}\
         .t{{font-size:15px;font-weight:bold}}.c{{font-size:12px}}\
         .l{{font-size:{label_px}px}}.s{{font-size:10px;fill:#555}}"
    )
}

/// The value shown for a stored coefficient: itself over Q; over GF(p) the balanced
/// residue in `-(p-1)/2 ..= (p-1)/2` (so that -1 reads as negative).
pub fn display_value(field: FieldSpec, v: &Q) -> Q {
    match field {
        FieldSpec::Rational => v.clone(),
        FieldSpec::Prime(p) => {
            let p = Q::from_integer(BigInt::from(p));
            if v * Q::from_integer(2.into()) > p {
                v - p
            } else {
                v.clone()
            }
        }
    }
}

/// The magnitude level of a nonzero coefficient: the bit length of ceil(|c|) (at least 1).
pub fn level(v: &Q) -> u64 {
    let c = v.abs().ceil().to_integer();
    c.bits().max(1)
}

/// A diverging colour scale fitted to the largest magnitude level present.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Scale {
    pub max_level: u64,
}

impl Scale {
    /// The scale for a set of (displayed) values; zeros are ignored.
    pub fn fit<'a>(values: impl Iterator<Item = &'a Q>) -> Scale {
        let max_level = values
            .filter(|v| !v.is_zero())
            .map(level)
            .max()
            .unwrap_or(1);
        Scale { max_level }
    }

    /// The shade 0..5 (lightest to darkest) of a magnitude level: the largest level
    /// present is 4, and levels spread evenly below it.
    pub fn shade_of_level(&self, l: u64) -> usize {
        if self.max_level <= 1 {
            return 4;
        }
        let below = (self.max_level - l.min(self.max_level)) * 4;
        let step = below.div_ceil(self.max_level - 1);
        4 - step.min(4) as usize
    }

    /// The fill colour of a value (`ZERO` for zero) and its shade.
    pub fn colour(&self, v: &Q) -> (&'static str, usize) {
        if v.is_zero() {
            return (ZERO, 0);
        }
        let s = self.shade_of_level(level(v));
        let fill = if v.is_negative() {
            NEGATIVE[s]
        } else {
            POSITIVE[s]
        };
        (fill, s)
    }

    /// For each shade 0..5: the largest level mapped to it, if any (for the legend).
    pub fn shade_bounds(&self) -> Vec<(usize, u64)> {
        let mut out: Vec<(usize, u64)> = Vec::new();
        for l in 1..=self.max_level {
            let s = self.shade_of_level(l);
            match out.last_mut() {
                Some(last) if last.0 == s => last.1 = l,
                _ => out.push((s, l)),
            }
        }
        out
    }
}

/// The legend text of the magnitudes up to a level: `1`, `3`, `7`, ..., `2^L-1` for large
/// levels.
pub fn level_bound_text(l: u64) -> String {
    if l <= 20 {
        ((1u64 << l) - 1).to_string()
    } else {
        format!("2^{l}-1")
    }
}

/// The density shade 0..6 of a count out of a maximum (`count >= 1`).
pub fn density_shade(count: usize, max: usize) -> usize {
    let n = DENSITY.len();
    ((count * n).div_ceil(max.max(1))).clamp(1, n) - 1
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    #[test]
    fn levels_and_shades_are_exact() {
        assert_eq!(level(&q(1, 1)), 1);
        assert_eq!(level(&q(-1, 2)), 1);
        assert_eq!(level(&q(3, 1)), 2);
        assert_eq!(level(&q(7, 2)), 3);
        let s = Scale { max_level: 1 };
        assert_eq!(s.colour(&q(1, 1)), (POSITIVE[4], 4));
        assert_eq!(s.colour(&q(-1, 1)), (NEGATIVE[4], 4));
        let s = Scale { max_level: 3 };
        assert_eq!(s.shade_of_level(3), 4);
        assert_eq!(s.shade_of_level(2), 2);
        assert_eq!(s.shade_of_level(1), 0);
        assert_eq!(s.shade_bounds(), vec![(0, 1), (2, 2), (4, 3)]);
        let s = Scale { max_level: 40 };
        assert_eq!(s.shade_of_level(1), 0);
        assert_eq!(s.shade_of_level(40), 4);
        assert_eq!(
            display_value(FieldSpec::Prime(7), &q(6, 1)),
            q(-1, 1),
            "balanced residue"
        );
        assert_eq!(density_shade(1, 100), 0);
        assert_eq!(density_shade(100, 100), 5);
    }
}
