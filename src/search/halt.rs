//! When a long step of a search must give up: a wall-clock deadline and flags set from
//! outside (a signal handler, another worker that met the target). Kernels receive it as a
//! field of their parameters and poll it between units of work of bounded cost, so a
//! search ends within moments of its time limit or a stop signal, whatever step it is in.

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::Instant;

/// A deadline and stop flags; the default never halts.
#[derive(Clone, Debug, Default)]
pub struct Halt {
    /// Give up at this instant.
    pub deadline: Option<Instant>,
    /// Give up once any of these is set.
    pub flags: Vec<Arc<AtomicBool>>,
}

impl Halt {
    /// True once the deadline has passed or a flag is set. Cost: one clock read.
    pub fn reached(&self) -> bool {
        self.flags.iter().any(|f| f.load(Ordering::Relaxed))
            || self.deadline.is_some_and(|d| Instant::now() >= d)
    }
}
