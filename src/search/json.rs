//! The JSON forms of search results and checkpoints.
//!
//! Scheme: `{"schema":"bilin.scheme/1","field":"Q","dims":[a,b,c],"rank":r,
//! "u":[[..],..],"v":[[..],..],"w":[[..],..]}`; `u[t]` is the left factor of term t, every
//! entry a string `"p/q"` or `"n"` (JSON integers are accepted on reading).
//!
//! Checkpoint: `{"schema":"bilin.search-checkpoint/1","seed":S,"shard":[K,N],
//! "next_run":n,"best":SCHEME-or-null}`; runs `0..next_run` of this shard are done.
//!
//! Files are written through [`crate::output`] and [`super::store`] (complete files only,
//! never a better result replaced by a worse one).

use crate::error::Result;
use crate::input::json_tree::{JValue, JsonDoc, check_keys};
use crate::input::{json_list, json_required};
use crate::scheme::Scheme;
use serde_json::{Value, json};

/// The JSON value of a scheme (the `bilin.scheme/1` form of [`crate::scheme::json`]).
pub fn scheme_to_json(s: &Scheme) -> Value {
    crate::scheme::json::to_json(s)
}

/// The schema tag of checkpoints.
pub const CHECKPOINT_SCHEMA: &str = "bilin.search-checkpoint/1";

/// A search checkpoint (see the module documentation).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Checkpoint {
    pub seed: u64,
    pub shard: (u64, u64),
    pub next_run: u64,
    pub best: Option<Scheme>,
}

/// What a result or checkpoint file holds.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Saved {
    /// A search checkpoint.
    Checkpoint(Checkpoint),
    /// A plain scheme (a search result, or any scheme in the JSON form).
    Scheme(Scheme),
}

impl Saved {
    /// The scheme it holds, if any.
    pub fn best(&self) -> Option<&Scheme> {
        match self {
            Saved::Checkpoint(c) => c.best.as_ref(),
            Saved::Scheme(s) => Some(s),
        }
    }

    /// The scheme it holds, if any, by value.
    pub fn into_best(self) -> Option<Scheme> {
        match self {
            Saved::Checkpoint(c) => c.best,
            Saved::Scheme(s) => Some(s),
        }
    }
}

/// The JSON value of a checkpoint.
pub fn checkpoint_to_json(c: &Checkpoint) -> Value {
    json!({
        "schema": CHECKPOINT_SCHEMA,
        "seed": c.seed,
        "shard": [c.shard.0, c.shard.1],
        "next_run": c.next_run,
        "best": c.best.as_ref().map(scheme_to_json),
    })
}

/// Read a checkpoint or a scheme in the JSON form (a checkpoint is recognised by its
/// `schema`). Every error is located (line, column, JSON path); the checkpoint's keys are
/// all required: `schema`, `seed`, `shard` ([K, N] with K < N), `next_run`, `best` (a
/// scheme or null). Cost: linear in the text.
pub fn parse_saved(text: &str, source: &str) -> Result<Saved> {
    let doc = JsonDoc { text, source };
    let root = doc.parse()?;
    let is_checkpoint = matches!(&root.get("schema").map(|s| &s.value),
        Some(JValue::Str(s)) if s == CHECKPOINT_SCHEMA);
    if !is_checkpoint {
        return crate::scheme::json::from_node(&doc, &root, "$", None).map(Saved::Scheme);
    }
    check_keys(
        &doc,
        &root,
        "$",
        &["schema", "seed", "shard", "next_run", "best"],
    )?;
    let number = |k: &str| -> Result<u64> {
        let v = json_required(&doc, &root, "$", k, "a non-negative integer")?;
        v.as_index().ok_or_else(|| {
            doc.error(
                v.at,
                &format!("$.{k}"),
                format!("expected a non-negative integer, found {}", v.describe()),
            )
        })
    };
    let seed = number("seed")?;
    let next_run = number("next_run")?;
    let shard_v = json_required(&doc, &root, "$", "shard", "[K, N]")?;
    let shard = match json_list(&doc, shard_v, "$.shard", "[K, N]")? {
        [k, n] => match (k.as_index(), n.as_index()) {
            (Some(k), Some(n)) if k < n => (k, n),
            _ => {
                return Err(doc.error(
                    shard_v.at,
                    "$.shard",
                    "expected [K, N] with integers 0 <= K < N",
                ));
            }
        },
        _ => {
            return Err(doc.error(
                shard_v.at,
                "$.shard",
                format!("expected [K, N], found {}", shard_v.describe()),
            ));
        }
    };
    let best_v = json_required(&doc, &root, "$", "best", "a scheme or null")?;
    let best = match best_v.value {
        JValue::Null => None,
        _ => Some(crate::scheme::json::from_node(
            &doc, best_v, "$.best", None,
        )?),
    };
    Ok(Saved::Checkpoint(Checkpoint {
        seed,
        shard,
        next_run,
        best,
    }))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::FieldSpec;
    use crate::scalar::q;

    #[test]
    fn round_trip_and_located_errors() {
        let mut s = Scheme::empty(FieldSpec::Rational, [2, 1, 1]);
        s.push(vec![q(1, 2), q(-3, 1)], vec![q(1, 1)], vec![q(0, 1)]);
        let text = scheme_to_json(&s).to_string();
        assert_eq!(parse_saved(&text, "s").unwrap(), Saved::Scheme(s.clone()));
        let c = Checkpoint {
            seed: 3,
            shard: (1, 4),
            next_run: 17,
            best: Some(s),
        };
        let text = checkpoint_to_json(&c).to_string();
        assert_eq!(parse_saved(&text, "c").unwrap(), Saved::Checkpoint(c));
        for (text, want) in [
            (
                "{\"dims\":[1,1]}",
                "s:1:9: $.dims: expected three dimensions",
            ),
            (
                "{\"dims\":[1,1,1],\"u\":[[\"x\"]],\"v\":[[1]],\"w\":[[1]]}",
                "s:1:23: $.u[0][0]: expected a coefficient",
            ),
            (
                "{\"schema\":\"bilin.search-checkpoint/1\",\"seed\":1,\"next_run\":0,\n\"shard\":[2,2],\"best\":null}",
                "s:2:9: $.shard: expected [K, N] with integers 0 <= K < N",
            ),
            (
                "{\"schema\":\"bilin.search-checkpoint/1\",\"seed\":1,\"shard\":[0,1],\"best\":null}",
                "s:1:1: $: missing key \"next_run\"",
            ),
            (
                "{\"schema\":\"bilin.search-checkpoint/1\",\"seed\":1e3,\"shard\":[0,1],\"next_run\":0,\"best\":null}",
                "s:1:46: $.seed: expected a non-negative integer, found the number 1e3",
            ),
            ("", "s:1:1: the input is empty"),
        ] {
            let e = parse_saved(text, "s").unwrap_err().to_string();
            assert!(e.starts_with(want), "{text}: {e}");
        }
    }
}
