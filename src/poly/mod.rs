//! Univariate polynomials over GF(p) and over Z, and the factorization of an integer
//! polynomial into irreducible factors over Q.
//!
//! - [`modp`]: dense polynomials over GF(p), p an odd prime below 2^31: arithmetic, gcd,
//!   powers modulo a polynomial, and the factorization of a squarefree polynomial
//!   (distinct-degree, then equal-degree splitting by the method of Cantor and Zassenhaus);
//! - [`factor`]: integer polynomials: content, squarefree test, and the factorization over Q
//!   by the method of Zassenhaus (factor modulo a prime, Hensel lifting to a power of it
//!   past the Mignotte bound, recombination of the lifted factors by trial division). Every
//!   reported factor divides exactly, and a factor is reported irreducible only when no
//!   combination of the modular factors divides, so the result is exact.
//!
//! Coefficients are stored from the constant term up (`c[i]` is the coefficient of `x^i`),
//! without trailing zeros (the zero polynomial is empty).

pub mod factor;
pub mod modp;

pub use factor::{IntPoly, factor_over_q, is_squarefree, primitive_part};
