//! Storing the products of the table format as they are read: each product line or grid
//! cell goes straight into the tensor (one sorted row per product, no copy), duplicates
//! are compared with the stored row, and only products with a bare number wait for
//! `finish` (they need the `unit`). Also the fast hash of the basis-name index.
//!
//! Invariant: `Built::first` records, per product `(i, j)`, the line and byte where it was
//! first given; the tensor holds the value given there. Cost: O(terms log terms) per line.

use super::table::{Builder, Pending};
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

    /// Store a product in the tensor, refusing a conflicting duplicate.
    pub(super) fn insert(&mut self, p: &Pending) -> Result<()> {
        let Some(built) = self.built.as_ref() else {
            return Ok(());
        };
        let v = reduce_terms(self, p, built.prime.as_ref())?;
        if let Some((line, byte)) = built.seen(p.i, p.j) {
            let t = &built.t;
            let old = t.product(p.i, p.j);
            if old != v.as_slice() {
                // Report at the later of the two lines (products with a bare number are
                // stored last, so the stored one may come later in the file).
                let (here, there) = (show(t, &v), show(t, old));
                let (at, at_byte, here, other, there) = if line > p.line {
                    (line, byte, there, p.line, here)
                } else {
                    (p.line, p.byte, here, line, there)
                };
                return Err(self.err(
                    at,
                    at_byte,
                    format!(
                        "conflicting duplicate product `{}*{}`: here `{here}`, but line {} gave \
                         `{there}`",
                        t.name(0, p.i),
                        t.name(1, p.j),
                        other + 1,
                    ),
                ));
            }
            return Ok(());
        }
        let Some(built) = self.built.as_mut() else {
            return Ok(());
        };
        built.t.set_product(p.i, p.j, v);
        let b = built.t.dims()[1];
        built.first[p.i * b + p.j] = (
            u32::try_from(p.line + 1).unwrap_or(u32::MAX),
            u32::try_from(p.byte).unwrap_or(u32::MAX),
        );
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
