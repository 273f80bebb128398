//! Name resolution hook for inputs that are neither files nor generators.
//!
//! CATALOG HOOK: the catalog (a higher layer) registers a [`Resolver`] at start-up with
//! [`register_resolver`]; [`crate::input::load_input`] consults the registered resolvers,
//! in registration order, after files and generators. The input layer never imports the
//! catalog, so the layering stays downward-only.

use crate::error::Result;
use crate::tensor::Tensor;
use std::sync::RwLock;

/// A resolver: `None` when it does not know the name, otherwise the tensor or an error.
pub type Resolver = fn(&str) -> Option<Result<Tensor>>;

static RESOLVERS: RwLock<Vec<Resolver>> = RwLock::new(Vec::new());

/// Register a resolver (idempotent for the same function).
pub fn register_resolver(r: Resolver) {
    let mut v = RESOLVERS.write().unwrap_or_else(|e| e.into_inner());
    if !v.iter().any(|&x| std::ptr::fn_addr_eq(x, r)) {
        v.push(r);
    }
}

/// Ask the registered resolvers about `name`; the first that knows it answers.
pub fn resolve_registered(name: &str) -> Option<Result<Tensor>> {
    let v = RESOLVERS.read().unwrap_or_else(|e| e.into_inner()).clone();
    v.iter().find_map(|r| r(name))
}
