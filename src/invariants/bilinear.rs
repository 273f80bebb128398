//! Invariants of a bilinear map T: U x V -> W (dims a, b, c):
//! - centroid triples `(X, Y, Z)` with `T(Xu, v) = T(u, Yv) = Z T(u, v)`;
//! - derivation triples `(D1, D2, D3)` with `T(D1 u, v) + T(u, D2 v) = D3 T(u, v)`;
//! - adjoint pairs `(f, g)`, f on U, g on V, with `T(f u, v) = T(u, g v)`;
//! - left radical `{u : T(u, V) = 0}` and right radical `{v : T(U, v) = 0}`.
//!
//! A triple is one vector: X (a^2 coordinates `l a + i`), then Y (b^2), then Z (c^2).
//! Cost: systems of a b c (twice for the centroid) equations in a^2 + b^2 + c^2 unknowns.

use super::equations::{Eq, System};
use crate::error::Result;
use crate::linalg::nullspace::{SolveParams, Space, solve_nullspace};
use crate::tensor::IntegralTensor;

/// Which invariant of a bilinear map.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MapInvariant {
    CentroidTriples,
    DerivationTriples,
    AdjointPairs,
    LeftRadical,
    RightRadical,
}

/// A proven basis of the requested invariant.
pub fn map_invariant(
    k: &IntegralTensor,
    which: MapInvariant,
    params: &SolveParams,
) -> Result<Space> {
    let eq = match which {
        MapInvariant::CentroidTriples => Eq::CentroidTriples,
        MapInvariant::DerivationTriples => Eq::DerivationTriples,
        MapInvariant::AdjointPairs => Eq::AdjointPairs,
        MapInvariant::LeftRadical => Eq::MapRadical { left: true },
        MapInvariant::RightRadical => Eq::MapRadical { left: false },
    };
    solve_nullspace(&System::new(k, &[eq]), params)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::{FieldSpec, Q};
    use crate::tensor::{Kind, Tensor};

    /// <1,1,2>-style map: Q x Q^2 -> Q^2, (x, y) -> x y (scalar times vector).
    fn scalar_times_vector() -> Tensor {
        let mut t = Tensor::zero(FieldSpec::Rational, Kind::Bilinear, [1, 2, 2], None);
        t.set(0, 0, 0, Q::from_integer(1.into()));
        t.set(0, 1, 1, Q::from_integer(1.into()));
        t
    }

    #[test]
    fn scalar_times_vector_invariants() {
        // T(x, v) = x v. Centroid triples: X = s, and Y = Z with s v = Z v... worked by
        // hand: T(Xx, v) = Z(x v) for all v forces Z = X scalar; T(x, Yv) = Z x v forces
        // Y = Z: dim 1. Derivations: D1 x v + x D2 v = D3 x v: D3 = D1 + D2 with D2
        // arbitrary: dim 1 + 4 = 5. Adjoint pairs: f x v = x g v: g = f scalar: dim 1.
        // Radicals are 0 (by hand).
        let it = IntegralTensor::from_tensor(&scalar_times_vector());
        let p = SolveParams::default();
        let d = |w| map_invariant(&it, w, &p).unwrap().dim();
        assert_eq!(d(MapInvariant::CentroidTriples), 1);
        assert_eq!(d(MapInvariant::DerivationTriples), 5);
        assert_eq!(d(MapInvariant::AdjointPairs), 1);
        assert_eq!(d(MapInvariant::LeftRadical), 0);
        assert_eq!(d(MapInvariant::RightRadical), 0);
    }
}
