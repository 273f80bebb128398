//! Reports: results gathered as serialisable data and rendered as text or JSON.

pub mod invariants;
mod invariants_text;
