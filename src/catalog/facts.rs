//! Recomputing stored facts: each fact key that bilin can compute is mapped to the
//! fingerprint value it must equal; rank bounds are re-derived by [`super::rank_facts`]; the
//! others are reported as not computable so that the test suite can count them.

use super::fingerprint::{Fingerprint, Value};
use super::meta::Fact;
use crate::tensor::Tensor;

/// The outcome of checking one stored fact.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum FactCheck {
    /// bilin computed the same value.
    Agrees,
    /// bilin computed a different value (shown).
    Disagrees(String),
    /// bilin cannot compute this fact (yet); the reason is given.
    NotComputable(String),
}

fn as_text(v: &Value) -> String {
    v.to_string()
}

fn last(v: Option<&Value>) -> Option<usize> {
    match v {
        Some(Value::Ints(x)) => x.last().copied(),
        _ => None,
    }
}

/// The value bilin computes for a fact key, or why it cannot.
pub fn computed_value(key: &str, fp: &Fingerprint, t: &Tensor) -> Result<String, String> {
    let flag = |k: &str| matches!(fp.get(k), Some(Value::Bool(true)));
    let char0 = t.field().characteristic() == 0;
    let n = t.dims()[0];
    let get = |k: &str| {
        fp.get(k)
            .map(as_text)
            .ok_or_else(|| format!("`{k}` is not computed for this input"))
    };
    match key {
        "dimension" => Ok(n.to_string()),
        "dims" | "flattening" | "commutative" | "anticommutative" | "associative"
        | "alternative" | "flexible" | "lie" | "jordan" | "unital" | "annihilator"
        | "commutant" | "nucleus" | "centre" | "derivations" | "centroid" | "squares"
        | "lower.central" | "derived.series" | "upper.central" | "nilpotency.class"
        | "centre.fields" => get(key),
        "derived" => match fp.get("derived.series") {
            Some(Value::Ints(v)) => Ok(v.get(1).copied().unwrap_or(v[0]).to_string()),
            _ => Err("the derived series is computed for algebras only".into()),
        },
        "killing.rank" if flag("lie") => get("trace.rank"),
        "radical" if flag("associative") && char0 => match fp.get("trace.rank") {
            Some(Value::Int(r)) => Ok((n - r).to_string()),
            _ => Err("no trace form".into()),
        },
        "semisimple" if (flag("associative") || flag("lie")) && char0 => match fp.get("trace.rank")
        {
            Some(Value::Int(r)) => Ok(if *r == n { "yes" } else { "no" }.into()),
            _ => Err("no trace form".into()),
        },
        "nilpotent" if flag("lie") => Ok(if last(fp.get("lower.central")) == Some(0) {
            "yes"
        } else {
            "no"
        }
        .into()),
        "solvable" if flag("lie") => Ok(if last(fp.get("derived.series")) == Some(0) {
            "yes"
        } else {
            "no"
        }
        .into()),
        "killing.rank" | "radical" | "semisimple" | "nilpotent" | "solvable" => Err(format!(
            "`{key}` is computed only for Lie (or, for radical/semisimple, associative) algebras over Q"
        )),
        "rank.upper" | "rank.lower" => {
            Err("tensor rank bounds are checked by `rank_facts::check_rank_fact`".into())
        }
        _ => Err(format!("no computation for the fact key `{key}`")),
    }
}

/// Check one stored fact against the fingerprint of the entry's tensor.
pub fn check_fact(fact: &Fact, fp: &Fingerprint, t: &Tensor) -> FactCheck {
    if let Some(d) = &fact.domain
        && !d.eq_ignore_ascii_case(&t.field().name())
        && !fact.key.starts_with("rank.")
    {
        return FactCheck::NotComputable(format!(
            "the fact refers to {d}, the table is over {}",
            t.field()
        ));
    }
    if fact.key.starts_with("rank.") {
        return super::rank_facts::check_rank_fact(
            &fact.key,
            &fact.value,
            fact.domain.as_deref(),
            t,
            &super::rank_facts::RankCheckParams::default(),
        );
    }
    match computed_value(&fact.key, fp, t) {
        Ok(v) if v == fact.value => FactCheck::Agrees,
        Ok(v) => FactCheck::Disagrees(v),
        Err(why) => FactCheck::NotComputable(why),
    }
}
