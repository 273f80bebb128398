//! The interval `lower <= R(T) <= upper` for the tensor rank, each side with its reason:
//! the lower side a proven bound (its theorem), the upper side a scheme verified exactly
//! ([`upper`]). Where they meet the rank is known. For a cubic format n x n x n the
//! generic rank over C is reported beside it, labelled as the value for a random tensor
//! of that format, not a bound for this one; for a tensor proven to be a matrix product
//! `<n,m,p>` (in any bases), the published bounds stored with the catalog's entry of the
//! format are cited beside it, labelled as such. [`plan`] turns the interval into the choice
//! of a search method.

pub mod plan;
pub mod upper;

pub use upper::{Upper, UpperBounds, UpperParams, upper_bounds};

use crate::decompose::Uniqueness;
use crate::ranks::Bounds;
use crate::scheme::Scheme;
use crate::tensor::Tensor;
use serde::Serialize;

/// Most coordinates (terms times the sum of the dimensions) of a scheme written into the
/// JSON form of an interval.
pub const MAX_JSON_SCHEME_COORDINATES: usize = 100_000;

/// The lower side: the best proven lower bound, as the caller computed it.
#[derive(Clone, Debug, Serialize)]
pub struct Lower {
    pub value: usize,
    pub name: String,
    pub theorem: String,
}

impl Lower {
    /// The best proven lower bound for the rank over the tensor's field, with its theorem
    /// ([`Bounds::best_bound`]; border-rank bounds count, since R >= border rank).
    pub fn best_of(b: &Bounds) -> Lower {
        match b.best_bound() {
            Some(x) => Lower {
                value: x.value,
                name: x.name.clone(),
                theorem: x.theorem.clone(),
            },
            None => Lower::none(),
        }
    }

    /// No lower bound (R >= 0).
    pub fn none() -> Lower {
        Lower {
            value: 0,
            name: "none".into(),
            theorem: "-".into(),
        }
    }
}

/// The interval and its reasons.
#[derive(Clone, Debug, Serialize)]
pub struct RankInterval {
    pub lower: Lower,
    /// The best upper bound (the lowest verified scheme).
    pub upper: Upper,
    /// All upper bounds found, lowest first.
    pub uppers: Vec<Upper>,
    /// `Some(R)` when lower and upper meet.
    pub exact: Option<usize>,
    /// Kruskal's condition for the decomposition by simultaneous diagonalisation.
    pub uniqueness: Option<Uniqueness>,
    /// The generic rank over C of the format, where published (a value for random tensors
    /// of this format, not a bound for this tensor).
    pub generic_rank: Option<GenericRank>,
    /// For a tensor proven to be a matrix product `<n,m,p>`: the best published bounds
    /// over the interval's field stored with the catalog's entry of the format, cited
    /// (not re-derived; the proven interval is the one above).
    pub published: Option<Published>,
    pub notes: Vec<String>,
}

/// The published rank bounds of a recognised matrix format, from its catalog entry.
#[derive(Clone, Debug, Serialize)]
pub struct Published {
    /// `[n, m, p]` as recognised.
    pub format: [usize; 3],
    /// The catalog entry (the sorted format: the rank is invariant under permuting n, m, p).
    pub entry: String,
    /// The largest stored `rank.lower` over the field, with its source.
    pub lower: Option<PublishedBound>,
    /// The smallest stored `rank.upper` over the field, with its source.
    pub upper: Option<PublishedBound>,
}

/// One published bound and its source.
#[derive(Clone, Debug, Serialize)]
pub struct PublishedBound {
    pub value: usize,
    pub source: String,
}

/// The published bounds of `<n,m,p>` over `field` stored with the catalog entry
/// `matmulNMP` of the sorted format; `None` when there is no such entry or it stores no
/// rank bound over that field.
pub fn published_bounds(format: [usize; 3], field: crate::scalar::FieldSpec) -> Option<Published> {
    let e = crate::catalog::matmul_entry(format)?;
    let domain = field.name();
    let best = |key: &str, lower: bool| -> Option<PublishedBound> {
        let facts = e
            .meta
            .facts_with_key(key)
            .filter(|f| f.domain.as_deref() == Some(domain.as_str()))
            .filter_map(|f| Some((f.value.trim().parse::<usize>().ok()?, f.source.clone())));
        let pick = if lower {
            facts.max_by_key(|(v, _)| *v)
        } else {
            facts.min_by_key(|(v, _)| *v)
        };
        pick.map(|(value, source)| PublishedBound { value, source })
    };
    let (lower, upper) = (best("rank.lower", true), best("rank.upper", false));
    (lower.is_some() || upper.is_some()).then_some(Published {
        format,
        entry: e.meta.name.clone(),
        lower,
        upper,
    })
}

/// The generic rank of a format and its source.
#[derive(Clone, Debug, Serialize)]
pub struct GenericRank {
    pub value: usize,
    pub source: String,
}

impl RankInterval {
    /// The scheme attaining the upper bound.
    pub fn scheme(&self) -> &Scheme {
        &self.upper.scheme
    }

    /// Text lines: the interval, then each side with its reason.
    pub fn lines(&self) -> Vec<String> {
        let field = self.upper.scheme.field.name();
        let mut l = vec![match self.exact {
            Some(r) => format!("R = {r} over {field} (the lower and upper bounds meet)"),
            None => format!(
                "{} <= R <= {} over {field}",
                self.lower.value, self.upper.value
            ),
        }];
        l.push(format!(
            "  lower {}: {} ({})",
            self.lower.value, self.lower.name, self.lower.theorem
        ));
        for u in &self.uppers {
            l.push(format!("  upper {}: {}, {}", u.value, u.name, u.detail));
        }
        if let Some(k) = &self.uniqueness {
            l.push(format!(
                "  Kruskal: k-ranks {}, {}, {} with {} terms: {} (Kruskal 1977, Linear Algebra \
                 Appl. 18)",
                k.k_ranks[0],
                k.k_ranks[1],
                k.k_ranks[2],
                k.terms,
                if k.unique {
                    "the decomposition is unique up to order and scaling of the terms"
                } else {
                    "uniqueness not established"
                }
            ));
        }
        if let Some(g) = &self.generic_rank {
            l.push(format!(
                "  generic rank of the format over C: {} ({}); a value for random tensors, \
                 not a bound for this one",
                g.value, g.source
            ));
        }
        if let Some(p) = &self.published {
            let [n, m, q] = p.format;
            let mut parts = Vec::new();
            if let Some(b) = &p.lower {
                parts.push(format!("R >= {} ({})", b.value, b.source));
            }
            if let Some(b) = &p.upper {
                parts.push(format!("R <= {} ({})", b.value, b.source));
            }
            l.push(format!(
                "  published for <{n},{m},{q}> over {field} (catalog entry {}; cited, not \
                 re-derived here): {}",
                p.entry,
                parts.join("; ")
            ));
        }
        for n in &self.notes {
            l.push(format!("  note: {n}"));
        }
        l
    }

    /// JSON form: every bound with its reason, and the scheme attaining the upper bound
    /// when it has at most [`MAX_JSON_SCHEME_COORDINATES`] coordinates (else `null`, with
    /// `scheme_omitted` saying its size; `bilin bounds --out` writes any scheme).
    pub fn to_json(&self) -> serde_json::Value {
        let s = &self.upper.scheme;
        let coordinates = s.rank() * s.dims.iter().sum::<usize>();
        let (scheme, omitted) = if coordinates <= MAX_JSON_SCHEME_COORDINATES {
            (crate::scheme::json::to_json(s), None)
        } else {
            (
                serde_json::Value::Null,
                Some(format!(
                    "{} terms, {coordinates} coordinates: above {MAX_JSON_SCHEME_COORDINATES}; \
                     `bilin bounds INPUT --out FILE` writes it",
                    s.rank()
                )),
            )
        };
        serde_json::json!({
            "lower": self.lower,
            "upper": self.upper,
            "uppers": self.uppers,
            "exact": self.exact,
            "uniqueness": self.uniqueness,
            "generic_rank": self.generic_rank,
            "published": self.published,
            "notes": self.notes,
            "scheme": scheme,
            "scheme_omitted": omitted,
        })
    }
}

/// The interval for `t` from the caller's best lower bound and the upper bounds of
/// [`upper_bounds`] (with the caller's `given` schemes). Cost: that of [`upper_bounds`].
pub fn rank_interval(
    t: &Tensor,
    lower: Lower,
    params: &UpperParams,
    given: &[(String, Scheme)],
) -> RankInterval {
    let UpperBounds {
        uppers,
        uniqueness,
        mut notes,
        matrix_format,
    } = upper_bounds(t, params, given);
    let upper = uppers[0].clone();
    // a verified scheme of rank r proves R <= r; a lower bound above it would be a defect
    let lower = if lower.value > upper.value {
        notes.push(format!(
            "the lower bound {} exceeds a verified scheme of rank {}: ignored",
            lower.value, upper.value
        ));
        Lower::none()
    } else {
        lower
    };
    let exact = (lower.value == upper.value).then_some(upper.value);
    RankInterval {
        lower,
        upper,
        uppers,
        exact,
        uniqueness,
        generic_rank: generic_rank(t.dims()),
        published: matrix_format.and_then(|f| published_bounds(f, t.field())),
        notes,
    }
}

/// The generic rank over C of the format n x n x n: `ceil(n^3 / (3n - 2))` for n != 3 and
/// 5 for n = 3 (Lickteig 1985, "Typical tensorial rank", Linear Algebra Appl. 69, from
/// memory); `None` for other formats.
pub fn generic_rank(d: [usize; 3]) -> Option<GenericRank> {
    let n = d[0];
    if d[1] != n || d[2] != n || n < 2 {
        return None;
    }
    let value = if n == 3 {
        5
    } else {
        (n * n * n).div_ceil(3 * n - 2)
    };
    Some(GenericRank {
        value,
        source: "Lickteig 1985, Typical tensorial rank, Linear Algebra Appl. 69 (from memory)"
            .into(),
    })
}
