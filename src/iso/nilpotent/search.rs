//! The generator-by-generator search: the image of each generator of E is chosen in its
//! place in X (module documentation of [`super`]), its layer-1 part on a line of the
//! solutions of the relations modulo X^3, its deeper layers by [`super::lifting`].

use super::adapted::Adapted;
use super::lifting::{Lifting, affine_solutions};
use super::space::Lie;
use super::words::{Plan, residuals};
use super::{LieIsoParams, Subspace, Vector};
use crate::linalg::{Matrix, rank_q};
use crate::scalar::Q;
use num_traits::{One, Zero};
use rand::Rng;

pub(super) struct Search<'a> {
    pub(super) x: Lie<'a>,
    pub(super) plan: Plan,
    /// Where each generator's image is looked for: a basis of the layer-1 coordinates of
    /// the corresponding characteristic subspace of X.
    pub(super) places: Vec<Subspace>,
    pub(super) adapted: Adapted,
    pub(super) rng: rand_chacha::ChaCha8Rng,
    pub(super) steps: usize,
    pub(super) params: LieIsoParams,
}

impl Search<'_> {
    pub(super) fn generators(&self) -> usize {
        self.places.len()
    }

    /// The layer-k coordinates of all residuals of the steps `0..steps`.
    pub(super) fn layer_residuals(&self, ys: &[Vector], steps: usize, k: usize) -> Vector {
        residuals(&self.x, &self.plan, ys, steps)
            .iter()
            .flat_map(|r| self.adapted.layer_part(r, k))
            .collect()
    }

    /// The layer-1 coordinates `c` as a vector of X.
    pub(super) fn leading_vector(&self, t: &[Q], place: &Subspace) -> Vector {
        let n = self.x.n;
        let mut c = vec![Q::zero(); n];
        let lead = (0..n).filter(|&j| self.adapted.layer[j] == 1);
        for (j, k) in lead.enumerate() {
            for (x, p) in t.iter().zip(place) {
                c[k] += x * &p[j];
            }
        }
        self.adapted.vector(&c)
    }

    /// The image of generator i given the earlier ones (see the module documentation):
    /// its layer-1 part on a line `base + s dir` of the solutions of the relations modulo
    /// X^3, the deeper layers by linear systems, the point s of the line a rational root
    /// of the obstruction left by those systems.
    pub(super) fn choose_image(&mut self, ys: &mut Vec<Vector>, i: usize) -> bool {
        let place = self.places[i].clone();
        let n = self.x.n;
        ys.push(vec![Q::zero(); n]);
        let r0 = self.layer_residuals(ys, i + 1, 2);
        let mut columns = Vec::with_capacity(place.len());
        for k in 0..place.len() {
            let mut t = vec![Q::zero(); place.len()];
            t[k] = Q::one();
            ys[i] = self.leading_vector(&t, &place);
            let r = self.layer_residuals(ys, i + 1, 2);
            columns.push(r.iter().zip(&r0).map(|(a, b)| a - b).collect::<Vector>());
        }
        ys.pop();
        let Some((base, free)) = affine_solutions(&r0, &columns, place.len()) else {
            return false;
        };
        let mut dir = vec![Q::zero(); place.len()];
        for f in &free {
            let z = Q::from_integer(self.rng.gen_range(-3i64..=3).into());
            for (o, v) in dir.iter_mut().zip(f) {
                *o += &z * v;
            }
        }
        let (base, dir) = (
            self.leading_vector(&base, &place),
            self.leading_vector(&dir, &place),
        );
        let lifting = Lifting::new(self, ys, i, &base, &dir);
        let at = |s: &Q| -> Vector { base.iter().zip(&dir).map(|(b, d)| b + s * d).collect() };
        let candidates: Vec<Q> = if dir.iter().all(Zero::is_zero) {
            vec![Q::zero()]
        } else {
            match lifting.obstruction_polynomial(self, ys, &at) {
                Some(p) if p.iter().all(|c| c.iter().all(Zero::is_zero)) => {
                    vec![Q::from_integer(self.rng.gen_range(1i64..=3).into())]
                }
                Some(p) => p
                    .iter()
                    .find(|c| c.iter().any(|x| !x.is_zero()))
                    .map(|c| crate::poly::rational::rational_roots(c))
                    .unwrap_or_default(),
                None => Vec::new(),
            }
        };
        for s in candidates {
            let (y, obstruction) = lifting.lift(self, ys, at(&s));
            if obstruction.iter().any(|x| !x.is_zero()) {
                continue;
            }
            let mut lead: Vec<Vector> = ys.iter().map(|y| self.adapted.layer_part(y, 1)).collect();
            lead.push(self.adapted.layer_part(&y, 1));
            if rank_q(&Matrix::from_rows(
                lead,
                place.first().map_or(0, |p| p.len()),
            )) != i + 1
            {
                continue;
            }
            ys.push(y);
            return true;
        }
        false
    }

    /// All images in turn, retried with fresh random lines within the budget.
    pub(super) fn run(&mut self) -> Option<Vec<Vector>> {
        'attempt: while self.steps < self.params.max_steps {
            self.steps += 1;
            let mut ys = Vec::new();
            for i in 0..self.generators() {
                if !self.choose_image(&mut ys, i) {
                    continue 'attempt;
                }
            }
            if residuals(&self.x, &self.plan, &ys, self.generators())
                .iter()
                .all(|r| r.iter().all(Zero::is_zero))
            {
                return Some(ys);
            }
        }
        None
    }
}
