//! The JSON scheme form used for search results and checkpoints, and atomic file writes.
//!
//! Scheme: `{"schema":"bilin.scheme/1","field":"Q","dims":[a,b,c],"rank":r,
//! "u":[[..],..],"v":[[..],..],"w":[[..],..]}`; `u[t]` is the left factor of term t, every
//! entry a string `"p/q"` or `"n"` (JSON integers are accepted on reading).
//!
//! Checkpoint: `{"schema":"bilin.search-checkpoint/1","seed":S,"shard":[K,N],
//! "next_run":n,"best":SCHEME-or-null}`; runs `0..next_run` of this shard are done.
//!
//! Invariant: a written file is complete (written to a temporary file, then renamed).

use crate::error::{Error, Result};
use crate::scheme::Scheme;
use serde_json::{Value, json};

/// The JSON value of a scheme (the `bilin.scheme/1` form of [`crate::scheme::json`]).
pub fn scheme_to_json(s: &Scheme) -> Value {
    crate::scheme::json::to_json(s)
}

fn invalid(msg: impl Into<String>) -> Error {
    Error::Invalid(msg.into())
}

/// Read a scheme from its JSON value (the `bilin.scheme/1` form); shapes are checked,
/// entries parsed exactly.
pub fn scheme_from_value(v: &Value) -> Result<Scheme> {
    crate::scheme::json::from_value(v, "<scheme in a checkpoint>")
}

/// Parse a scheme JSON text.
pub fn scheme_from_json(text: &str) -> Result<Scheme> {
    let v: Value =
        serde_json::from_str(text).map_err(|e| invalid(format!("not valid JSON: {e}")))?;
    scheme_from_value(&v)
}

/// A search checkpoint (see the module documentation).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Checkpoint {
    pub seed: u64,
    pub shard: (u64, u64),
    pub next_run: u64,
    pub best: Option<Scheme>,
}

/// The JSON value of a checkpoint.
pub fn checkpoint_to_json(c: &Checkpoint) -> Value {
    json!({
        "schema": "bilin.search-checkpoint/1",
        "seed": c.seed,
        "shard": [c.shard.0, c.shard.1],
        "next_run": c.next_run,
        "best": c.best.as_ref().map(scheme_to_json),
    })
}

/// Read a checkpoint, or a plain scheme file (taken as a checkpoint with that best scheme).
pub fn checkpoint_from_json(text: &str) -> Result<Checkpoint> {
    let v: Value =
        serde_json::from_str(text).map_err(|e| invalid(format!("not valid JSON: {e}")))?;
    match v.get("schema").and_then(Value::as_str) {
        Some("bilin.search-checkpoint/1") => {
            let num = |k: &str| {
                v.get(k)
                    .and_then(Value::as_u64)
                    .ok_or_else(|| invalid(format!("checkpoint: missing \"{k}\"")))
            };
            let shard = v
                .get("shard")
                .and_then(Value::as_array)
                .and_then(|a| Some((a.first()?.as_u64()?, a.get(1)?.as_u64()?)))
                .unwrap_or((0, 1));
            let best = match v.get("best") {
                None | Some(Value::Null) => None,
                Some(b) => Some(scheme_from_value(b)?),
            };
            Ok(Checkpoint {
                seed: num("seed")?,
                shard,
                next_run: num("next_run")?,
                best,
            })
        }
        _ => Ok(Checkpoint {
            seed: 0,
            shard: (0, 1),
            next_run: 0,
            best: Some(scheme_from_value(&v)?),
        }),
    }
}

/// Write `text` to `path` atomically: a temporary file in the same directory, then rename.
pub fn write_atomic(path: &str, text: &str) -> Result<()> {
    let io = |e: std::io::Error| Error::Io {
        path: path.to_string(),
        message: e.to_string(),
    };
    let tmp = format!("{path}.tmp{}", std::process::id());
    std::fs::write(&tmp, text).map_err(io)?;
    std::fs::rename(&tmp, path).map_err(io)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::FieldSpec;
    use crate::scalar::q;

    #[test]
    fn round_trip() {
        let mut s = Scheme::empty(FieldSpec::Rational, [2, 1, 1]);
        s.push(vec![q(1, 2), q(-3, 1)], vec![q(1, 1)], vec![q(0, 1)]);
        let text = scheme_to_json(&s).to_string();
        assert_eq!(scheme_from_json(&text).unwrap(), s);
        let c = Checkpoint {
            seed: 3,
            shard: (1, 4),
            next_run: 17,
            best: Some(s),
        };
        assert_eq!(
            checkpoint_from_json(&checkpoint_to_json(&c).to_string()).unwrap(),
            c
        );
        assert!(scheme_from_json("{\"dims\":[1,1]}").is_err());
        assert!(
            scheme_from_json("{\"dims\":[1,1,1],\"u\":[[\"x\"]],\"v\":[[1]],\"w\":[[1]]}").is_err()
        );
    }
}
