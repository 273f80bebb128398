//! Explicit isomorphisms of nilpotent Lie algebras over Q, solved generator by generator
//! along the lower central series, verified exactly.
//!
//! Method. Let E (the catalog entry, in its published basis) and X (the input) be
//! nilpotent Lie algebras of the same dimension. A homomorphism phi: E -> X is fixed by
//! the images y_1..y_d of generators g_1..g_d of E, basis vectors of E spanning a
//! complement of E^2 = [E, E]; phi is onto (so an isomorphism) exactly when the y_i are
//! independent modulo X^2. E is spanned by left-normed words `[g_a, w]`; for each word that
//! is not a new basis word, E gives a relation `[g_a, w] = sum c_j w_j`, and phi is a
//! homomorphism exactly when every such relation holds for the images (the set of u with
//! `phi[u, v] = [phi u, phi v]` for all v is a subalgebra, by the Jacobi identity, so the
//! generators suffice).
//!
//! The images are chosen in turn. Each y_i is looked for inside the characteristic
//! subspace of X that corresponds to the smallest characteristic subspace of E holding
//! g_i; the family of characteristic subspaces is built the same way in both algebras:
//! the terms of the lower and upper central series, their centralisers, and the pairwise
//! intersections of these. The relations that involve g_i (and earlier generators only)
//! are polynomial in y_i; their affine-linear part is read off exactly (interpolation in a
//! scaling parameter) and solved; a seeded random point of the solution space is then
//! checked against the full relations, exactly. Choices that fail are retried and, when a
//! step has no solution, the previous choice is redone, within a step budget.
//!
//! The result is accepted only after [`crate::tensor::change_basis_algebra`] reproduces X's
//! structure constants from E's exactly. "Not found" means not found within the budget
//! (for instance when the images must solve a norm equation), never "not isomorphic".
//! Invariant: every returned matrix has passed that exact check.

use super::iso::{express, same_constants};
use crate::linalg::modular::inverse_q;
use crate::linalg::{Matrix, nullspace, rank_q, rref, solve};
use crate::scalar::{FieldSpec, Q, Rationals};
use crate::tensor::{Kind, Tensor, change_basis_algebra};
use num_traits::{One, Zero};
use rand::{Rng, SeedableRng};

/// Parameters of [`find_nilpotent_isomorphism`].
#[derive(Clone, Debug)]
pub struct LieIsoParams {
    /// Seed of the random points of the solution spaces.
    pub seed: u64,
    /// Give up after this many attempts (each: fresh leading parts, then the lifting).
    pub max_steps: usize,
    /// Do not attempt algebras of larger dimension.
    pub max_dim: usize,
}

impl Default for LieIsoParams {
    fn default() -> Self {
        LieIsoParams {
            seed: 1,
            max_steps: 6,
            max_dim: 12,
        }
    }
}

type Vector = Vec<Q>;
type Subspace = Vec<Vector>;

/// A basis of the span of vectors of length `len` (the nonzero rows of the reduced
/// echelon form).
fn span_of(vectors: Vec<Vector>, len: usize) -> Subspace {
    if vectors.is_empty() {
        return Vec::new();
    }
    let mut m = Matrix::from_rows(vectors, len);
    let r = rref(&Rationals, &mut m).len();
    (0..r).map(|i| m.row(i).to_vec()).collect()
}

/// A Lie algebra given by its structure tensor, with the exact subspace operations.
struct Lie<'a> {
    t: &'a Tensor,
    n: usize,
}

impl Lie<'_> {
    fn bracket(&self, x: &[Q], y: &[Q]) -> Vector {
        self.t.multiply(x, y)
    }

    fn unit(&self, i: usize) -> Vector {
        let mut v = vec![Q::zero(); self.n];
        v[i] = Q::one();
        v
    }

    fn whole(&self) -> Subspace {
        (0..self.n).map(|i| self.unit(i)).collect()
    }

    fn span(&self, vectors: Vec<Vector>) -> Subspace {
        span_of(vectors, self.n)
    }

    /// {x : <x, u> = 0 for u in the rows}.
    fn solutions(&self, rows: Vec<Vector>) -> Subspace {
        if rows.is_empty() {
            return self.whole();
        }
        nullspace(&Rationals, &Matrix::from_rows(rows, self.n))
    }

    fn intersect(&self, u: &Subspace, w: &Subspace) -> Subspace {
        let mut rows = self.solutions(u.clone());
        rows.extend(self.solutions(w.clone()));
        self.solutions(rows)
    }

    fn contains(&self, s: &Subspace, v: &[Q]) -> bool {
        express(FieldSpec::Rational, s, v).is_some()
    }

    fn equal(&self, u: &Subspace, w: &Subspace) -> bool {
        u.len() == w.len() && w.iter().all(|v| self.contains(u, v))
    }

    /// [S, T] as a subspace.
    fn product(&self, s: &Subspace, t: &Subspace) -> Subspace {
        let mut v = Vec::new();
        for a in s {
            for b in t {
                v.push(self.bracket(a, b));
            }
        }
        self.span(v)
    }

    /// The centraliser {x : [x, s] = 0 for s in S}.
    fn centraliser(&self, s: &Subspace) -> Subspace {
        let mut rows = Vec::new();
        for b in s {
            let cols: Vec<Vector> = (0..self.n)
                .map(|j| self.bracket(&self.unit(j), b))
                .collect();
            for k in 0..self.n {
                rows.push(cols.iter().map(|c| c[k].clone()).collect());
            }
        }
        self.solutions(rows)
    }

    /// The lower central series A = A^1, A^2 = [A, A], ..., down to its last term.
    fn lower_central(&self) -> Vec<Subspace> {
        let whole = self.whole();
        let mut terms = vec![whole.clone()];
        loop {
            let next = self.product(&whole, terms.last().expect("nonempty"));
            let stop = next.len() == terms.last().map_or(0, |t| t.len());
            terms.push(next);
            if stop || terms.last().is_some_and(|t| t.is_empty()) {
                return terms;
            }
        }
    }

    /// The upper central series 0 = Z_0, Z_1 (the centre), Z_{k+1} = {x : [x, A] in Z_k}.
    fn upper_central(&self) -> Vec<Subspace> {
        let mut terms: Vec<Subspace> = vec![Vec::new()];
        loop {
            let perp = self.solutions(terms.last().expect("nonempty").clone());
            let mut rows = Vec::new();
            for j in 0..self.n {
                let cols: Vec<Vector> = (0..self.n)
                    .map(|i| self.bracket(&self.unit(i), &self.unit(j)))
                    .collect();
                for p in &perp {
                    rows.push(
                        cols.iter()
                            .map(|c| c.iter().zip(p).map(|(a, b)| a * b).sum())
                            .collect(),
                    );
                }
            }
            let next = self.solutions(rows);
            let stop = next.len() == terms.last().map_or(0, |t| t.len());
            terms.push(next);
            if stop || terms.last().is_some_and(|t| t.len() == self.n) {
                return terms;
            }
        }
    }

    /// The characteristic subspaces used to place the generators (module documentation),
    /// built by the same sequence of operations in every algebra; equal members are kept
    /// once (equality is invariant, so both algebras keep the same positions).
    fn characteristic_family(&self) -> Vec<Subspace> {
        let mut base = self.lower_central();
        base.extend(self.upper_central());
        let cents: Vec<Subspace> = base.iter().map(|s| self.centraliser(s)).collect();
        base.extend(cents);
        let mut family: Vec<Subspace> = Vec::new();
        let add = |s: Subspace, family: &mut Vec<Subspace>| {
            if !family.iter().any(|f| self.equal(f, &s)) {
                family.push(s);
            }
        };
        for s in &base {
            add(s.clone(), &mut family);
        }
        let first = family.clone();
        for (i, a) in first.iter().enumerate() {
            for b in &first[i + 1..] {
                add(self.intersect(a, b), &mut family);
            }
        }
        family
    }
}

/// How a word of E is built: a generator, or the bracket of a generator with a word.
#[derive(Clone, Copy, Debug)]
enum Word {
    Generator(usize),
    Bracket(usize, usize),
}

/// A relation `[g_a, w] = sum c_j w_j` of E, checked from the step of generator `step`.
struct Relation {
    generator: usize,
    word: usize,
    coefficients: Vec<Q>,
}

/// The words of E for the generators in order, and the relations each step adds.
struct Plan {
    words: Vec<Word>,
    /// The words' vectors in E.
    vectors: Vec<Vector>,
    /// Relations per step (generator index).
    relations: Vec<Vec<Relation>>,
    /// The number of words once generators 0..=i are in.
    words_at: Vec<usize>,
}

fn plan_words(e: &Lie, gens: &[Vector]) -> Plan {
    let mut words: Vec<Word> = Vec::new();
    let mut vectors: Vec<Vector> = Vec::new();
    let mut relations = Vec::new();
    let mut words_at = Vec::new();
    // done[w] = the number of generators already bracketed with word w
    let mut done: Vec<usize> = Vec::new();
    for (i, g) in gens.iter().enumerate() {
        let mut rels = Vec::new();
        words.push(Word::Generator(i));
        vectors.push(g.clone());
        done.push(0);
        let mut w = 0;
        while w < words.len() {
            while done[w] <= i {
                let a = done[w];
                done[w] += 1;
                let v = e.bracket(&gens[a], &vectors[w]);
                match express(FieldSpec::Rational, &vectors, &v) {
                    Some(coefficients) => rels.push(Relation {
                        generator: a,
                        word: w,
                        coefficients,
                    }),
                    None => {
                        words.push(Word::Bracket(a, w));
                        vectors.push(v);
                        done.push(0);
                    }
                }
            }
            w += 1;
        }
        relations.push(rels);
        words_at.push(words.len());
    }
    Plan {
        words,
        vectors,
        relations,
        words_at,
    }
}

/// The images in X of the first `count` words, from the generator images.
fn word_images(x: &Lie, plan: &Plan, ys: &[Vector], count: usize) -> Vec<Vector> {
    let mut out: Vec<Vector> = Vec::with_capacity(count);
    for w in &plan.words[..count] {
        let v = match *w {
            Word::Generator(i) => ys[i].clone(),
            Word::Bracket(a, u) => x.bracket(&ys[a], &out[u]),
        };
        out.push(v);
    }
    out
}

/// The residuals of the relations of the steps `0..steps` (all coordinates, concatenated).
fn residuals(x: &Lie, plan: &Plan, ys: &[Vector], steps: usize) -> Vec<Vector> {
    let images = word_images(x, plan, ys, plan.words_at[steps - 1]);
    let mut out = Vec::new();
    for r in plan.relations[..steps].iter().flatten() {
        let mut v = x.bracket(&ys[r.generator], &images[r.word]);
        for (c, w) in r.coefficients.iter().zip(&images) {
            if !c.is_zero() {
                for (o, y) in v.iter_mut().zip(w) {
                    *o -= c * y;
                }
            }
        }
        out.push(v);
    }
    out
}

/// X in a basis adapted to its lower central series: `basis[j]` lies in X^layer[j] and
/// the vectors of layer >= k span X^k.
struct Adapted {
    basis: Vec<Vector>,
    layer: Vec<usize>,
    /// Coordinates in `basis` of a vector: `inverse * v`.
    inverse: Matrix<Q>,
}

impl Adapted {
    fn new(x: &Lie) -> Option<Adapted> {
        let terms = x.lower_central();
        let mut basis: Vec<Vector> = Vec::new();
        let mut layer = Vec::new();
        for (k, term) in terms.iter().enumerate().rev() {
            for v in term {
                if !x.contains(&basis, v) {
                    basis.push(v.clone());
                    layer.push(k + 1);
                }
            }
        }
        basis.reverse();
        layer.reverse();
        let m = Matrix {
            rows: x.n,
            cols: x.n,
            data: (0..x.n)
                .flat_map(|r| basis.iter().map(move |c| c[r].clone()))
                .collect(),
        };
        let inverse = inverse_q(&m)?;
        Some(Adapted {
            basis,
            layer,
            inverse,
        })
    }

    fn coordinates(&self, v: &[Q]) -> Vector {
        self.inverse.mul_vec(&Rationals, v)
    }

    fn vector(&self, c: &[Q]) -> Vector {
        let n = c.len();
        let mut v = vec![Q::zero(); n];
        for (x, b) in c.iter().zip(&self.basis) {
            if !x.is_zero() {
                for (o, y) in v.iter_mut().zip(b) {
                    *o += x * y;
                }
            }
        }
        v
    }

    /// The coordinates of layer `k` of a vector.
    fn layer_part(&self, v: &[Q], k: usize) -> Vector {
        self.coordinates(v)
            .into_iter()
            .zip(&self.layer)
            .filter(|(_, l)| **l == k)
            .map(|(c, _)| c)
            .collect()
    }
}

struct Search<'a> {
    x: Lie<'a>,
    plan: Plan,
    /// Where each generator's image is looked for: a basis of the layer-1 coordinates of
    /// the corresponding characteristic subspace of X.
    places: Vec<Subspace>,
    adapted: Adapted,
    rng: rand_chacha::ChaCha8Rng,
    steps: usize,
    params: LieIsoParams,
}

impl Search<'_> {
    fn generators(&self) -> usize {
        self.places.len()
    }

    /// The layer-k coordinates of all residuals of the steps `0..steps`.
    fn layer_residuals(&self, ys: &[Vector], steps: usize, k: usize) -> Vector {
        residuals(&self.x, &self.plan, ys, steps)
            .iter()
            .flat_map(|r| self.adapted.layer_part(r, k))
            .collect()
    }

    /// The layer-1 coordinates `c` as a vector of X.
    fn leading_vector(&self, t: &[Q], place: &Subspace) -> Vector {
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
    fn choose_image(&mut self, ys: &mut Vec<Vector>, i: usize) -> bool {
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
    fn run(&mut self) -> Option<Vec<Vector>> {
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

/// The solutions t of `r0 + sum_k t_k columns[k] = 0`: a particular one and a basis of
/// the homogeneous ones; `None` when there is none.
fn affine_solutions(
    r0: &[Q],
    columns: &[Vector],
    unknowns: usize,
) -> Option<(Vector, Vec<Vector>)> {
    if r0.is_empty() || unknowns == 0 {
        if !r0.iter().all(Zero::is_zero) {
            return None;
        }
        let free = (0..unknowns)
            .map(|k| {
                let mut v = vec![Q::zero(); unknowns];
                v[k] = Q::one();
                v
            })
            .collect();
        return Some((vec![Q::zero(); unknowns], free));
    }
    let a = Matrix {
        rows: r0.len(),
        cols: unknowns,
        data: (0..r0.len())
            .flat_map(|r| columns.iter().map(move |c| c[r].clone()))
            .collect(),
    };
    let rhs: Vector = r0.iter().map(|v| -v).collect();
    Some((solve(&Rationals, &a, &rhs)?, nullspace(&Rationals, &a)))
}

/// The deeper layers of one image: for each layer k >= 2 the matrix of the layer-(k+1)
/// residuals against the layer-k coordinates of the image (independent of the point on
/// the line: only the other images' leading parts enter it), reduced to independent rows.
struct Lifting {
    i: usize,
    /// Per layer k = 2, 3, ...: (the coordinates of layer k, the independent rows, the
    /// matrix on those rows).
    layers: Vec<(Vec<usize>, Vec<usize>, Matrix<Q>)>,
}

impl Lifting {
    fn new(s: &Search, ys: &mut Vec<Vector>, i: usize, base: &[Q], dir: &[Q]) -> Lifting {
        let n = s.x.n;
        let top = s.adapted.layer.iter().copied().max().unwrap_or(1);
        let point: Vector = base.iter().zip(dir).map(|(b, d)| b + d).collect();
        ys.push(point);
        let mut layers = Vec::new();
        for k in 2..top {
            let slots: Vec<usize> = (0..n).filter(|&j| s.adapted.layer[j] == k).collect();
            let r0 = s.layer_residuals(ys, i + 1, k + 1);
            let mut columns = Vec::new();
            for &j in &slots {
                let keep = ys[i].clone();
                for (o, v) in ys[i].iter_mut().zip(&s.adapted.basis[j]) {
                    *o += v;
                }
                let r = s.layer_residuals(ys, i + 1, k + 1);
                columns.push(r.iter().zip(&r0).map(|(a, b)| a - b).collect::<Vector>());
                ys[i] = keep;
            }
            let rows: Vec<Vector> = (0..r0.len())
                .map(|r| columns.iter().map(|c| c[r].clone()).collect())
                .collect();
            // independent rows: the pivots of the transpose
            let mut tr = Matrix::from_rows(
                (0..slots.len())
                    .map(|c| rows.iter().map(|r| r[c].clone()).collect())
                    .collect(),
                rows.len(),
            );
            let keep = if slots.is_empty() {
                Vec::new()
            } else {
                rref(&Rationals, &mut tr)
            };
            let m = Matrix::from_rows(keep.iter().map(|&r| rows[r].clone()).collect(), slots.len());
            layers.push((slots, keep, m));
        }
        ys.pop();
        Lifting { i, layers }
    }

    /// Lift a leading part: solve each layer on its independent rows; the obstruction is
    /// what remains of the residuals (zero exactly when every layer was consistent).
    /// Linear in the residuals, so polynomial along a line.
    fn lift(&self, s: &Search, ys: &mut Vec<Vector>, lead: Vector) -> (Vector, Vector) {
        ys.push(lead);
        let mut obstruction = Vec::new();
        for (k, (slots, keep, m)) in self.layers.iter().enumerate() {
            let r = s.layer_residuals(ys, self.i + 1, k + 3);
            if !slots.is_empty() && !keep.is_empty() {
                let rhs: Vector = keep.iter().map(|&j| -&r[j]).collect();
                if let Some(u) = solve(&Rationals, m, &rhs) {
                    for (&j, c) in slots.iter().zip(&u) {
                        for (o, v) in ys[self.i].iter_mut().zip(&s.adapted.basis[j]) {
                            *o += c * v;
                        }
                    }
                }
            }
            obstruction.extend(s.layer_residuals(ys, self.i + 1, k + 3));
        }
        let y = ys.pop().expect("pushed");
        (y, obstruction)
    }

    /// The obstruction along the line as polynomials (one per coordinate, coefficients
    /// from the constant term up), by interpolation at s = 0, 1, ..., checked at two more
    /// points; `None` when no degree up to 48 fits.
    fn obstruction_polynomial(
        &self,
        s: &Search,
        ys: &mut Vec<Vector>,
        at: &dyn Fn(&Q) -> Vector,
    ) -> Option<Vec<Vector>> {
        let mut values: Vec<Vector> = Vec::new();
        let mut degree = 4;
        while degree <= 48 {
            while values.len() < degree + 3 {
                let x = Q::from_integer((values.len() as i64).into());
                values.push(self.lift(s, ys, at(&x)).1);
            }
            let coords = values[0].len();
            let polys: Vec<Vector> = (0..coords)
                .map(|c| {
                    let v: Vec<Q> = values[..=degree].iter().map(|o| o[c].clone()).collect();
                    interpolate(&v)
                })
                .collect();
            let fits = (degree + 1..degree + 3).all(|x| {
                let xq = Q::from_integer((x as i64).into());
                polys
                    .iter()
                    .zip(&values[x])
                    .all(|(p, v)| &evaluate(p, &xq) == v)
            });
            if fits {
                return Some(polys);
            }
            degree *= 2;
        }
        None
    }
}

/// The polynomial of degree <= len - 1 through (s, v[s]) for s = 0, 1, ..., coefficients
/// from the constant term up (Newton's divided differences, expanded).
fn interpolate(v: &[Q]) -> Vector {
    let n = v.len();
    let mut d = v.to_vec();
    for k in 1..n {
        for s in (k..n).rev() {
            d[s] = (&d[s] - &d[s - 1]) / Q::from_integer((k as i64).into());
        }
    }
    // p(x) = d0 + (x - 0)(d1 + (x - 1)(d2 + ...)), Horner from the inside
    let mut p: Vector = vec![d[n - 1].clone()];
    for k in (0..n - 1).rev() {
        // p <- p * (x - k) + d[k]
        let mut q = vec![Q::zero(); p.len() + 1];
        let kq = Q::from_integer((k as i64).into());
        for (j, c) in p.iter().enumerate() {
            q[j + 1] += c;
            q[j] -= c * &kq;
        }
        q[0] += &d[k];
        p = q;
    }
    while p.last().is_some_and(Zero::is_zero) {
        p.pop();
    }
    p
}

fn evaluate(p: &[Q], x: &Q) -> Q {
    p.iter().rev().fold(Q::zero(), |acc, c| acc * x + c)
}

/// Whether a tensor is a nilpotent Lie algebra over Q: anticommutative, Jacobi, lower
/// central series reaching 0 (exact; cost O(n^5) for the Jacobi identity).
pub fn is_nilpotent_lie(t: &Tensor) -> bool {
    if t.kind() != Kind::Algebra || t.field() != FieldSpec::Rational {
        return false;
    }
    let lie = Lie { t, n: t.dim() };
    let ok = crate::laws::check_laws(
        t,
        &crate::laws::Params {
            laws: vec![crate::laws::Law::Lie],
            stop_first: true,
            ..Default::default()
        },
    )
    .ok()
    .and_then(|r| r.holds(crate::laws::Law::Lie))
    .unwrap_or(false);
    ok && lie.lower_central().last().is_some_and(|s| s.is_empty())
}

/// Find an invertible M (columns: the images in E of X's basis vectors, in E's
/// coordinates) with `change_basis_algebra(e, M)` equal to `x` coefficient by coefficient,
/// for nilpotent Lie algebras x and e over Q (module documentation for the method).
/// Returns `None` when none is found within the budget, when the shapes differ or when
/// an algebra is not a nilpotent Lie algebra over Q. Cost: the characteristic subspaces
/// (O(n) subspace operations of O(n^4) each, then pairwise intersections), plus per
/// attempt O(n d) evaluations of the relations (d generators).
pub fn find_nilpotent_isomorphism(
    x: &Tensor,
    e: &Tensor,
    params: &LieIsoParams,
) -> Option<Matrix<Q>> {
    let n = x.dim();
    if e.dim() != n || n > params.max_dim || !is_nilpotent_lie(x) || !is_nilpotent_lie(e) {
        return None;
    }
    let (lx, le) = (Lie { t: x, n }, Lie { t: e, n });
    let (fx, fe) = (lx.characteristic_family(), le.characteristic_family());
    if fx.len() != fe.len() || fx.iter().zip(&fe).any(|(a, b)| a.len() != b.len()) {
        return None;
    }
    let e2 = le.lower_central().get(1).cloned().unwrap_or_default();
    let adapted = Adapted::new(&lx)?;
    // the smallest member of the family holding each basis vector of E
    let smallest = |v: &[Q]| -> (usize, Subspace) {
        let (mut se, mut sx) = (le.whole(), lx.whole());
        for (a, b) in fe.iter().zip(&fx) {
            if le.contains(a, v) {
                se = le.intersect(&se, a);
                sx = lx.intersect(&sx, b);
            }
        }
        (se.len(), sx)
    };
    let mut order: Vec<(usize, usize, Subspace)> = (0..n)
        .map(|i| {
            let (d, sx) = smallest(&le.unit(i));
            (d, i, sx)
        })
        .collect();
    // the most general generators first: the scale of a special one is then a rational
    // function of the earlier scales (L_{5,6}: the image of x2 scales as the square of x1's)
    order.sort_by_key(|(d, i, _)| (std::cmp::Reverse(*d), *i));
    let mut gens: Vec<Vector> = Vec::new();
    let mut places = Vec::new();
    let mut span = e2;
    for (_, i, sx) in order {
        let g = le.unit(i);
        if le.contains(&span, &g) {
            continue;
        }
        span.push(g.clone());
        gens.push(g);
        let lead: Vec<Vector> = sx.iter().map(|v| adapted.layer_part(v, 1)).collect();
        let k = lead.first().map_or(0, |v| v.len());
        places.push(span_of(lead, k));
    }
    if gens.is_empty() {
        // the zero algebra
        return Some(Matrix::identity(&Rationals, n));
    }
    let plan = plan_words(&le, &gens);
    if plan.vectors.len() != n {
        return None;
    }
    let mut search = Search {
        x: lx,
        plan,
        places,
        adapted,
        rng: rand_chacha::ChaCha8Rng::seed_from_u64(params.seed),
        steps: 0,
        params: params.clone(),
    };
    let ys = search.run()?;
    // phi(e_k) from the word images: F = Phi W^-1, then M = F^-1
    let images = word_images(&search.x, &search.plan, &ys, n);
    let columns = |vs: &[Vector]| Matrix {
        rows: n,
        cols: n,
        data: (0..n)
            .flat_map(|r| vs.iter().map(move |c| c[r].clone()))
            .collect(),
    };
    let w_inv = inverse_q(&columns(&search.plan.vectors))?;
    let f = columns(&images).mul(&Rationals, &w_inv);
    let m = inverse_q(&f)?;
    let y = change_basis_algebra(e, &m)?;
    same_constants(&y, x).then_some(m)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;
    use crate::tensor::random_invertible;

    /// A Lie algebra from its brackets [x_i, x_j] = c x_k (i < j).
    fn lie(n: usize, brackets: &[(usize, usize, usize, i64)]) -> Tensor {
        let names = (1..=n).map(|i| format!("x{i}")).collect();
        let mut t = Tensor::algebra(FieldSpec::Rational, names);
        for &(i, j, k, c) in brackets {
            t.set(i, j, k, q(c, 1));
            t.set(j, i, k, q(-c, 1));
        }
        t
    }

    /// L_{5,6} (de Graaf 2007, Classification of 6-dimensional nilpotent Lie algebras over
    /// fields of characteristic not 2, J. Algebra 309): [x1,x2] = x3, [x1,x3] = x4,
    /// [x1,x4] = x5, [x2,x3] = x5.
    fn l56() -> Tensor {
        lie(5, &[(0, 1, 2, 1), (0, 2, 3, 1), (0, 3, 4, 1), (1, 2, 4, 1)])
    }

    #[test]
    fn finds_an_isomorphism_in_a_basis_with_large_coefficients() {
        let e = l56();
        assert!(find_nilpotent_isomorphism(&e, &e, &LieIsoParams::default()).is_some());
        let x = change_basis_algebra(&e, &random_invertible(5, 1_000_000, 5)).unwrap();
        let m = find_nilpotent_isomorphism(&x, &e, &LieIsoParams::default()).expect("found");
        assert!(same_constants(&change_basis_algebra(&e, &m).unwrap(), &x));
    }

    #[test]
    fn non_isomorphic_algebras_give_none() {
        // L_{5,5}: [x1,x2] = x3, [x1,x3] = x5, [x2,x4] = x5 (de Graaf 2007), not L_{5,6}.
        let other = lie(5, &[(0, 1, 2, 1), (0, 2, 4, 1), (1, 3, 4, 1)]);
        assert!(find_nilpotent_isomorphism(&other, &l56(), &LieIsoParams::default()).is_none());
        // not nilpotent: sl2 (Humphreys 1972, Introduction to Lie algebras)
        let sl2 = lie(3, &[(0, 1, 2, 1), (2, 0, 0, 2), (2, 1, 1, -2)]);
        assert!(!is_nilpotent_lie(&sl2));
        assert!(find_nilpotent_isomorphism(&sl2, &sl2, &LieIsoParams::default()).is_none());
    }
}
