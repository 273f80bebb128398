//! The word-size primes of the engine: primes below 2^28 taken downward from 2^28, the
//! same sequence everywhere, and the Hadamard bound that says how many a lift may need.
//! Invariant: `primes_prefix(k)` is a prefix of `primes_prefix(k + 1)`.

use super::modular::kernel_primes;

/// The first kernel primes, computed once.
pub fn cached_primes() -> &'static [u64] {
    static PRIMES: std::sync::OnceLock<Vec<u64>> = std::sync::OnceLock::new();
    PRIMES.get_or_init(|| kernel_primes(192))
}

/// Most kernel primes the engine uses: their product has about 229,000 bits, enough for
/// the solutions of any system it can eliminate in memory.
pub const MAX_KERNEL_PRIMES: usize = 8192;

/// The first `count` kernel primes (at most [`MAX_KERNEL_PRIMES`]), the same sequence as
/// [`cached_primes`]; the longer list is computed once, only when asked for.
pub fn primes_prefix(count: usize) -> &'static [u64] {
    let first = cached_primes();
    if count <= first.len() {
        return &first[..count];
    }
    static MANY: std::sync::OnceLock<Vec<u64>> = std::sync::OnceLock::new();
    let many = MANY.get_or_init(|| kernel_primes(MAX_KERNEL_PRIMES));
    &many[..count.min(many.len())]
}

/// Bits a modulus needs so that rational reconstruction recovers every reduced solution
/// vector of a system of rank at most `rank`, with integer coefficients of at most
/// `term_bits` bits and at most `terms` terms per equation: by Cramer's rule each entry is
/// a ratio of two minors of size at most `rank`, each below `(sqrt(terms) 2^term_bits)^rank`
/// (Hadamard's inequality), and reconstruction needs a modulus above `2 N D`.
pub fn hadamard_bits(rank: usize, term_bits: u64, terms: usize) -> u64 {
    let row = term_bits as f64 + (terms.max(1) as f64).log2() / 2.0;
    (2.0 * rank as f64 * row).ceil() as u64 + 2
}
