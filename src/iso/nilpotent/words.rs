//! The words of the entry E on its chosen generators and the relations among them: E is
//! spanned by left-normed words `[g_a, w]`; each bracket of a generator with a word that
//! is not a new basis word gives a relation `[g_a, w] = sum c_j w_j`. A linear map defined
//! on the generators is a homomorphism exactly when the images satisfy every relation
//! (the Jacobi identity makes the generators suffice), which [`residuals`] measures.

use super::Vector;
use super::space::Lie;
use crate::iso::express;
use crate::scalar::{FieldSpec, Q};
use num_traits::Zero;

/// How a word of E is built: a generator, or the bracket of a generator with a word.
#[derive(Clone, Copy, Debug)]
pub(super) enum Word {
    Generator(usize),
    Bracket(usize, usize),
}

/// A relation `[g_a, w] = sum c_j w_j` of E, checked from the step of generator `step`.
pub(super) struct Relation {
    generator: usize,
    word: usize,
    coefficients: Vec<Q>,
}

/// The words of E for the generators in order, and the relations each step adds.
pub(super) struct Plan {
    pub(super) words: Vec<Word>,
    /// The words' vectors in E.
    pub(super) vectors: Vec<Vector>,
    /// Relations per step (generator index).
    pub(super) relations: Vec<Vec<Relation>>,
    /// The number of words once generators 0..=i are in.
    pub(super) words_at: Vec<usize>,
}

pub(super) fn plan_words(e: &Lie, gens: &[Vector]) -> Plan {
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
pub(super) fn word_images(x: &Lie, plan: &Plan, ys: &[Vector], count: usize) -> Vec<Vector> {
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
pub(super) fn residuals(x: &Lie, plan: &Plan, ys: &[Vector], steps: usize) -> Vec<Vector> {
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
