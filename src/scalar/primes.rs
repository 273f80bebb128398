//! Primality and the word-size primes used by multi-modular methods.

/// Deterministic Miller-Rabin for all `u64` (the bases 2..37 suffice below 2^64; common
/// practice, see Jaeschke 1993, "On strong pseudoprimes to several bases"). Cost: O(log^3 n).
pub fn is_prime(n: u64) -> bool {
    if n < 2 {
        return false;
    }
    for p in [2u64, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37] {
        if n.is_multiple_of(p) {
            return n == p;
        }
    }
    let mulm = |a: u64, b: u64| ((a as u128 * b as u128) % n as u128) as u64;
    let powm = |mut a: u64, mut e: u64| {
        let mut r = 1u64;
        while e > 0 {
            if e & 1 == 1 {
                r = mulm(r, a);
            }
            a = mulm(a, a);
            e >>= 1;
        }
        r
    };
    let mut d = n - 1;
    let mut s = 0;
    while d.is_multiple_of(2) {
        d /= 2;
        s += 1;
    }
    'outer: for a in [2u64, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37] {
        let mut x = powm(a, d);
        if x == 1 || x == n - 1 {
            continue;
        }
        for _ in 1..s {
            x = mulm(x, x);
            if x == n - 1 {
                continue 'outer;
            }
        }
        return false;
    }
    true
}

/// The first `count` primes below 2^31, descending from 2^31. These keep every product of
/// two residues below 2^62, which the fast modular kernels rely on.
pub fn word_primes(count: usize) -> Vec<u64> {
    let mut out = Vec::with_capacity(count);
    let mut c = (1u64 << 31) - 1;
    while out.len() < count {
        if is_prime(c) {
            out.push(c);
        }
        c -= 2;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_primes() {
        let ps: Vec<u64> = (0..50).filter(|&n| is_prime(n)).collect();
        assert_eq!(
            ps,
            vec![2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47]
        );
        assert!(is_prime((1 << 61) - 1)); // Mersenne prime M61 (common practice)
        assert!(!is_prime(3_215_031_751)); // strong pseudoprime to bases 2,3,5,7 (from memory)
        assert_eq!(word_primes(2), vec![2147483647, 2147483629]);
    }
}
