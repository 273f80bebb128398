//! Storing the products of the table format as they are read: each product line or grid
//! cell goes straight into the tensor (one sorted row per product, no copy), duplicates
//! are compared with the stored row, and only products with a bare number wait for
//! `finish` (they need the `unit`). Also the fast hash of the basis-name index.
//!
//! Invariant: `Built::first` records, per product `(i, j)`, the line and byte where it was
//! first given; the tensor holds the value given there. Cost: O(terms log terms) per line.

use super::table::{Builder, Pending, Symmetry};
use crate::error::Result;
use crate::scalar::{Field, FieldSpec, PrimeField, Q, q_to_string};
use crate::tensor::{Kind, Tensor};
use num_traits::Zero;
use std::collections::HashMap;

/// FNV-1a: a fast hash for the basis-name index (names are short; the map is consulted
/// three times per product line).
#[derive(Default, Clone, Copy)]
pub(super) struct Fnv(u64);

impl std::hash::Hasher for Fnv {
    fn finish(&self) -> u64 {
        self.0
    }
    fn write(&mut self, bytes: &[u8]) {
        let mut h = if self.0 == 0 {
            0xcbf2_9ce4_8422_2325
        } else {
            self.0
        };
        for &b in bytes {
            h = (h ^ u64::from(b)).wrapping_mul(0x0100_0000_01b3);
        }
        self.0 = h;
    }
}

/// The name index of one axis.
pub(super) type NameIndex = HashMap<String, usize, std::hash::BuildHasherDefault<Fnv>>;

/// The tensor being built and, per product `(i, j)`, where it was first given:
/// `first[i * dims[1] + j] = (1 + line index, byte)`, line 0 for never.
pub(super) struct Built {
    pub t: Tensor,
    pub first: Vec<(u32, u32)>,
    /// Per product: stored as the mirror of another product (a bracket or a declared
    /// symmetry), not given itself.
    pub mirrored: Vec<bool>,
    pub prime: Option<PrimeField>,
}

impl Built {
    fn seen(&self, i: usize, j: usize) -> Option<(usize, usize)> {
        match self.first[i * self.t.dims()[1] + j] {
            (0, _) => None,
            (l, b) => Some((l as usize - 1, b as usize)),
        }
    }
}

impl Builder<'_> {
    /// Create the tensor (the basis is complete and the field fixed from here on).
    pub(super) fn ensure_built(&mut self) {
        if self.built.is_some() {
            return;
        }
        let kind = self.kind.unwrap_or(Kind::Algebra);
        let names: [Vec<String>; 3] = std::array::from_fn(|a| {
            self.names[a]
                .as_ref()
                .map(|n| n.0.clone())
                .unwrap_or_default()
        });
        let dims = [names[0].len(), names[1].len(), names[2].len()];
        let field = self.field.map_or(FieldSpec::Rational, |f| f.0);
        let prime = match field {
            FieldSpec::Prime(p) => PrimeField::new(p),
            FieldSpec::Rational => None,
        };
        self.built = Some(Built {
            t: Tensor::zero(field, kind, dims, Some(names)),
            first: vec![(0, 0); dims[0] * dims[1]],
            mirrored: vec![false; dims[0] * dims[1]],
            prime,
        });
    }

    /// Take one product: stored at once when every term names a basis vector, kept for
    /// `finish` when a bare number needs the unit.
    pub fn add_product(&mut self, p: Pending) -> Result<()> {
        self.products += 1;
        self.ensure_built();
        if p.terms.iter().any(|t| t.k.is_none() && !t.coef.is_zero()) {
            self.pending.push(p);
            return Ok(());
        }
        self.insert(&p)
    }

    /// Whether a product's mirror is stored too: `Some(true)` negated (a bracket, or an
    /// anticommutative table), `Some(false)` equal (a commutative table).
    fn mirror_of(&self, p: &Pending) -> Option<(bool, String)> {
        if p.bracket {
            return Some((true, "the bracket".to_string()));
        }
        self.symmetry.map(|(s, line)| {
            (
                s == Symmetry::Anticommutative,
                format!("`{}` (line {})", s.keyword(), line + 1),
            )
        })
    }

    /// Store a product in the tensor (with its mirror when the table says so), refusing a
    /// conflicting duplicate.
    pub(super) fn insert(&mut self, p: &Pending) -> Result<()> {
        let Some(built) = self.built.as_ref() else {
            return Ok(());
        };
        let v = reduce_terms(self, p, built.prime.as_ref())?;
        let mirror = self.mirror_of(p);
        if let Some((true, why)) = &mirror
            && p.i == p.j
            && !v.is_empty()
        {
            let t = &built.t;
            let x = t.name(0, p.i);
            return Err(self.err(
                p.line,
                p.byte,
                format!(
                    "`{x}*{x}` = `{}` contradicts {why}: an anticommutative product has \
                     `{x}*{x}` = 0",
                    show(t, &v)
                ),
            ));
        }
        let w = match &mirror {
            Some((neg, _)) if p.i != p.j => Some(if *neg {
                v.iter().map(|(k, c)| (*k, -c.clone())).collect::<Vec<_>>()
            } else {
                v.clone()
            }),
            _ => None,
        };
        if let Some(field) = built.prime.as_ref()
            && let Some(w) = &w
        {
            // -c as the representative in 1..p, as the tensor stores it
            let w: Vec<(usize, Q)> = w
                .iter()
                .map(|(k, c)| {
                    (
                        *k,
                        field.to_rational(&field.from_rational(c).unwrap_or_default()),
                    )
                })
                .collect();
            self.store(p, p.i, p.j, v, None)?;
            return self.store(p, p.j, p.i, w, mirror.map(|m| m.1));
        }
        self.store(p, p.i, p.j, v, None)?;
        match w {
            Some(w) => self.store(p, p.j, p.i, w, mirror.map(|m| m.1)),
            None => Ok(()),
        }
    }

    /// Store the value `v` of product `(i, j)` given by `p` (as a mirror by `why`).
    fn store(
        &mut self,
        p: &Pending,
        i: usize,
        j: usize,
        v: Vec<(usize, Q)>,
        why: Option<String>,
    ) -> Result<()> {
        let Some(built) = self.built.as_ref() else {
            return Ok(());
        };
        let b = built.t.dims()[1];
        if let Some((line, byte)) = built.seen(i, j) {
            let t = &built.t;
            let old = t.product(i, j);
            if old != v.as_slice() {
                let (here, there) = (show(t, &v), show(t, old));
                let name = format!("{}*{}", t.name(0, i), t.name(1, j));
                let message = match (&why, built.mirrored[i * b + j]) {
                    (Some(why), _) => format!(
                        "this line and {why} give `{name}` = `{here}`, but line {} gave \
                         `{there}`",
                        line + 1
                    ),
                    (None, true) => {
                        let reason = match self.symmetry {
                            Some((s, sl)) => format!("`{}` (line {})", s.keyword(), sl + 1),
                            None => "the bracket".to_string(),
                        };
                        format!(
                            "`{name}` = `{here}` contradicts {reason}: line {} gives `{}*{}` = \
                             `{}`, so `{name}` = `{there}`",
                            line + 1,
                            t.name(0, j),
                            t.name(1, i),
                            show(t, t.product(j, i)),
                        )
                    }
                    (None, false) => {
                        // Report at the later of the two lines (products with a bare number
                        // are stored last, so the stored one may come later in the file).
                        let (at, at_byte, here, other, there) = if line > p.line {
                            (line, byte, there, p.line, here)
                        } else {
                            (p.line, p.byte, here, line, there)
                        };
                        return Err(self.err(
                            at,
                            at_byte,
                            format!(
                                "conflicting duplicate product `{name}`: here `{here}`, but \
                                 line {} gave `{there}`",
                                other + 1,
                            ),
                        ));
                    }
                };
                return Err(self.err(p.line, p.byte, message));
            }
            return Ok(());
        }
        self.count_nonzero(v.len(), p.line, p.byte)?;
        let Some(built) = self.built.as_mut() else {
            return Ok(());
        };
        built.t.set_product(i, j, v);
        built.first[i * b + j] = (
            u32::try_from(p.line + 1).unwrap_or(u32::MAX),
            u32::try_from(p.byte).unwrap_or(u32::MAX),
        );
        built.mirrored[i * b + j] = why.is_some();
        Ok(())
    }
}

/// Reduce a product's terms into the field: sorted `(k, c)` without zeros.
fn reduce_terms(
    b: &Builder<'_>,
    p: &Pending,
    field: Option<&PrimeField>,
) -> Result<Vec<(usize, Q)>> {
    let line = b.line(p.line);
    let mut acc: Vec<(usize, Q)> = Vec::with_capacity(p.terms.len());
    for t in &p.terms {
        if t.coef.is_zero() {
            continue;
        }
        let k = match t.k {
            Some(k) => k,
            None => match b.unit {
                Some((u, _)) => u,
                None => {
                    return Err(line.err(
                        t.pos,
                        format!(
                            "the bare number `{}` means a multiple of the unit, but no `unit` \
                             statement declares one",
                            q_to_string(&t.coef)
                        ),
                    ));
                }
            },
        };
        let c = match field {
            None => t.coef.clone(),
            Some(f) => {
                if f.denominator_vanishes(&t.coef) {
                    return Err(line.err(
                        t.pos,
                        format!(
                            "the coefficient {} has a denominator divisible by {}, so it has no \
                             value in GF({})",
                            q_to_string(&t.coef),
                            f.modulus(),
                            f.modulus()
                        ),
                    ));
                }
                f.to_rational(&f.from_rational(&t.coef).unwrap_or_default())
            }
        };
        acc.push((k, c));
    }
    if acc.len() > 1 {
        // merge repeated names (coefficients add)
        acc.sort_by_key(|e| e.0);
        let mut merged: Vec<(usize, Q)> = Vec::with_capacity(acc.len());
        for (k, c) in acc {
            match merged.last_mut() {
                Some(last) if last.0 == k => last.1 += c,
                _ => merged.push((k, c)),
            }
        }
        acc = merged;
        if let Some(e) = acc.iter().find_map(|e| super::check_digits(&e.1).err()) {
            return Err(line.err(p.terms.first().map_or(0, |t| t.pos), e));
        }
        if let Some(f) = field {
            for e in &mut acc {
                e.1 = f.to_rational(&f.from_rational(&e.1).unwrap_or_default());
            }
        }
    }
    acc.retain(|e| !e.1.is_zero());
    Ok(acc)
}

pub(super) fn show(t: &Tensor, v: &[(usize, Q)]) -> String {
    super::write::format_combination(v.iter().map(|(k, c)| (t.name(2, *k), c)), true)
}
