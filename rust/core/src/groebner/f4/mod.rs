//! The F4 algorithm (Faugère 1999): Gröbner bases by sparse linear algebra. Each step takes all
//! critical pairs of the lowest degree (normal strategy; of the lowest sugar, Giovini, Mora,
//! Niesi, Robbiano and Traverso 1991, under orders that do not compare degrees first), writes
//! both halves of every S-polynomial as rows of one matrix, adds reducer rows by symbolic
//! preprocessing, and reduces the whole matrix at once; rows whose leading monomial is new join
//! the basis.
//!
//! Modules: [`hash`] (the monomial table), [`symbolic`] (symbolic preprocessing), [`linalg`]
//! (the Faugère–Lachartre reduction), [`arith`] (coefficient kernels with delayed reduction).
//! Pair bookkeeping is the shared Gebauer–Möller [`PairSet`]. The result is the reduced basis,
//! identical to the reference engine's.

pub mod arith;
pub mod hash;
pub mod linalg;
pub mod parallel;
pub mod sampled;
pub mod signature;
pub mod symbolic;

#[cfg(test)]
mod tests;

use super::pairs::{Pair, PairSet};
use super::reduce::minimal_indices;
use super::stats::{Stats, StepStats};
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use crate::rng::Rng;
use arith::{Arith, Generic, LargePrime, SmallPrime};
use hash::MonomialTable;
use std::collections::HashMap;
use std::time::Instant;
use symbolic::{Divisor, Element, Multiple, Row, SymbolicMatrix};

/// Tuning of the F4 engine.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Options {
    /// At most this many pairs per step (the others wait for the next step); `None`: all pairs
    /// of the lowest degree.
    pub max_pairs_per_step: Option<usize>,
    pub linear_algebra: LinearAlgebra,
    /// Signature-based F4 (see [`signature`]): exact, needs a degree-compatible order, and
    /// skips most rows that would reduce to zero.
    pub signatures: bool,
}

/// How the new rows of each matrix are reduced.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum LinearAlgebra {
    /// Every new row is reduced: the result is certain.
    #[default]
    Exact,
    /// Random combinations of the new rows are reduced (see [`sampled`]): over a finite field
    /// the result is the exact one except with probability at most 2^-80 per matrix. Orders
    /// that do not compare degrees first (lex, block orders) stay exact: there the dense rows
    /// that combinations give would raise the degrees of later pairs without bound.
    Sampled(Sampling),
}

/// Settings of the sampled linear algebra.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Sampling {
    /// Fixes the random choices (`None`: drawn from the operating system's entropy).
    pub seed: Option<u64>,
    /// Matrices with fewer new rows are reduced exactly.
    pub min_rows: usize,
    /// Whether a matrix whose rank turns out too large for sampling to pay is finished by the
    /// exact method (always on in normal use; tests turn it off to exercise sampling alone).
    pub exact_fallback: bool,
}

impl Default for Sampling {
    fn default() -> Self {
        Sampling {
            seed: None,
            min_rows: 64,
            exact_fallback: true,
        }
    }
}

/// Reduced Gröbner basis of `gens` and the run's statistics, with default options.
pub fn compute<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
) -> Result<(Vec<Poly<F>>, Stats)> {
    compute_with(ring, gens, control, &Options::default())
}

/// Reduced Gröbner basis of `gens`; runs on `control.limits.threads` threads (default: all cores).
pub fn compute_with<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    options: &Options,
) -> Result<(Vec<Poly<F>>, Stats)> {
    let run = || dispatch(ring, gens, control, options);
    match control.limits.threads {
        // One thread: no pool at all (the linear algebra then stays on this thread).
        None | Some(1) => run(),
        Some(0) => Err(Error::invalid("thread count must be at least 1")),
        Some(n) => rayon::ThreadPoolBuilder::new()
            .num_threads(n)
            .build()
            .map_err(|e| Error::invalid(format!("cannot start {n} worker threads: {e}")))?
            .install(run),
    }
}

/// Picks the coefficient kernel: packed words for GF(p), the field's own arithmetic otherwise.
fn dispatch<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    options: &Options,
) -> Result<(Vec<Poly<F>>, Stats)> {
    match ring.field.word_modulus() {
        Some(p) if p < 1 << 16 => {
            Engine::new(ring, SmallPrime::<u16>::new(p), options).run(gens, control)
        }
        Some(p) if p < 1 << 31 => {
            Engine::new(ring, SmallPrime::<u32>::new(p), options).run(gens, control)
        }
        Some(_) => {
            let p = ring.field.word_modulus().unwrap();
            Engine::new(ring, LargePrime::new(p), options).run(gens, control)
        }
        None => compute_generic(ring, gens, control, options),
    }
}

/// F4 through the field's own operations (every field; used directly by tests on prime fields).
pub(crate) fn compute_generic<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    options: &Options,
) -> Result<(Vec<Poly<F>>, Stats)> {
    Engine::new(ring, Generic::new(ring.field.clone()), options).run(gens, control)
}

/// Result of a run before conversion: the reduced basis, or the unit ideal.
enum Outcome {
    Basis,
    Unit,
}

struct Engine<'a, F: Field, A: Arith<F>> {
    ring: &'a Ring<F>,
    arith: A,
    options: &'a Options,
    table: MonomialTable,
    basis: Vec<Element<A::C>>,
    pairs: PairSet,
    stats: Stats,
    /// Settings and source of the random combinations when the linear algebra samples.
    sampler: Option<(Sampling, Rng)>,
    /// Share of the last matrix's new rows that were independent.
    rank_share: Option<f64>,
}

impl<'a, F: Field, A: Arith<F>> Engine<'a, F, A> {
    fn new(ring: &'a Ring<F>, arith: A, options: &'a Options) -> Self {
        Engine {
            ring,
            arith,
            options,
            table: MonomialTable::new(ring.nvars(), ring.order.clone()),
            basis: Vec::new(),
            pairs: PairSet::default(),
            stats: Stats::default(),
            sampler: match options.linear_algebra {
                LinearAlgebra::Exact => None,
                LinearAlgebra::Sampled(sampling) => Some((
                    sampling,
                    sampling.seed.map_or_else(Rng::from_entropy, Rng::new),
                )),
            },
            rank_share: None,
        }
    }

    fn run(mut self, gens: &[Poly<F>], control: &Control) -> Result<(Vec<Poly<F>>, Stats)> {
        if self.options.signatures {
            return signature::compute(self.ring, self.arith, gens, control);
        }
        if let Outcome::Unit = self.main_loop(gens, control)? {
            return Ok((vec![self.ring.one()], self.stats));
        }
        let polys = self.final_basis(control)?;
        Ok((polys, self.stats))
    }

    fn main_loop(&mut self, gens: &[Poly<F>], control: &Control) -> Result<Outcome> {
        for f in gens.iter().filter(|f| !f.is_zero()) {
            if f.is_constant() {
                return Ok(Outcome::Unit);
            }
            let element = self.import(f);
            self.add_element(element, 0);
        }
        let degree_order = self.ring.order.is_degree_compatible();
        loop {
            control.check()?;
            // Pairs of least lcm degree (the normal strategy) under orders that compare degrees
            // first; of least sugar under the others, where the normal strategy can run far
            // above the degrees the basis needs (a block order on three variables climbed to
            // degree 38 and beyond where degree 10 suffices).
            let limit = self.options.max_pairs_per_step;
            let selected = if degree_order {
                self.pairs.take_lowest_degree(limit)
            } else {
                self.pairs.take_lowest(limit)
            };
            let Some(degree) = selected.iter().map(|p| p.lcm.degree()).max() else {
                break;
            };
            let sugar = selected.iter().map(|p| p.sugar).max().unwrap_or(0);
            let step = self.stats.steps.len();
            control.check_degree(degree, step)?;
            let mut stats = StepStats {
                degree,
                pairs: selected.len(),
                ..Default::default()
            };

            let clock = Instant::now();
            let (known, new) = self.pair_rows(&selected);
            let divisors = self.divisors(&self.pairs.active_indices());
            let matrix = symbolic::preprocess(
                control,
                &mut self.table,
                &self.basis,
                &divisors,
                &known,
                &new,
            )?;
            stats.seconds_symbolic = clock.elapsed().as_secs_f64();
            (stats.rows, stats.columns, stats.nonzeros) =
                (matrix.rows(), matrix.columns.len(), matrix.nonzeros());
            control.check_matrix(stats.rows, stats.columns, step)?;

            let clock = Instant::now();
            // Fully reduced new elements only where that cannot raise degrees (see linalg); for
            // the same reason no sampling under other orders: combinations give dense tails.
            let back_substitute = degree_order;
            let echelon = match &mut self.sampler {
                Some((sampling, rng)) if degree_order => sampled::reduce_new_rows_sampled(
                    &self.arith,
                    &matrix,
                    control,
                    (sampling, rng),
                    self.rank_share,
                    back_substitute,
                )?,
                _ => linalg::reduce_new_rows(&self.arith, &matrix, control, back_substitute)?,
            };
            stats.seconds_linear_algebra = clock.elapsed().as_secs_f64();
            stats.multiply_adds = echelon.multiply_adds;
            stats.new_elements = echelon.rows.len();
            if !matrix.new_rows.is_empty() {
                self.rank_share = Some(echelon.rows.len() as f64 / matrix.new_rows.len() as f64);
            }
            self.stats.zero_reductions += echelon.zero_rows;
            self.stats.steps.push(stats);

            let mut found: Vec<Element<A::C>> = echelon
                .rows
                .into_iter()
                .map(|r| element_of(&matrix, r))
                .collect();
            if found.iter().any(|e| self.table.degree(e.lead()) == 0) {
                return Ok(Outcome::Unit);
            }
            // Larger leading monomials first: a later, smaller one that divides an earlier one
            // retires it in the pair set.
            found.sort_by(|a, b| self.table.cmp(b.lead(), a.lead()));
            for e in found {
                self.add_element(e, sugar);
            }
        }
        Ok(Outcome::Basis)
    }

    /// Both halves u·g of every selected S-polynomial, once each. Per lcm, the first half seen
    /// is the known pivot of that column; all other halves with the same lcm are new rows.
    fn pair_rows(&mut self, selected: &[Pair]) -> (Vec<Multiple>, Vec<Multiple>) {
        let mut lcm_seen: HashMap<u32, ()> = HashMap::new();
        let mut row_seen: HashMap<Multiple, ()> = HashMap::new();
        let (mut known, mut new) = (Vec::new(), Vec::new());
        for pair in selected {
            let lcm = self.table.insert(&pair.lcm);
            for element in [pair.i, pair.j] {
                let mult = self.table.div(lcm, self.basis[element].lead());
                let row = Multiple { mult, element };
                if row_seen.insert(row, ()).is_some() {
                    continue;
                }
                if lcm_seen.insert(lcm, ()).is_none() {
                    known.push(row);
                } else {
                    new.push(row);
                }
            }
        }
        (known, new)
    }

    fn divisors(&self, indices: &[usize]) -> Vec<Divisor> {
        divisors_of(&self.table, &self.basis, indices)
    }

    /// Adds an element found at sugar `sugar` (0 for the input); its sugar is at least its degree.
    fn add_element(&mut self, e: Element<A::C>, sugar: u32) {
        let lead = self.table.monomial(e.lead()).clone();
        let degree = e
            .monos
            .iter()
            .map(|&m| self.table.degree(m))
            .max()
            .unwrap_or(0);
        self.pairs.insert(lead, degree.max(sugar));
        self.basis.push(e);
    }

    /// A nonzero input polynomial as a monic element.
    fn import(&mut self, f: &Poly<F>) -> Element<A::C> {
        import_poly(self.ring, &self.arith, &mut self.table, f)
    }

    /// The reduced basis from the active elements.
    fn final_basis(&mut self, control: &Control) -> Result<Vec<Poly<F>>> {
        let active = self.pairs.active_indices();
        let (ring, arith) = (self.ring, &self.arith);
        reduced_basis(ring, arith, &mut self.table, &self.basis, &active, control)
    }
}

/// The elements `indices` as reducers: leading monomial, its mask, index.
fn divisors_of<C>(table: &MonomialTable, basis: &[Element<C>], indices: &[usize]) -> Vec<Divisor> {
    indices
        .iter()
        .map(|&element| {
            let lead = basis[element].lead();
            Divisor {
                lead,
                mask: table.mask(lead),
                element,
            }
        })
        .collect()
}

/// A nonzero polynomial as a monic element.
fn import_poly<F: Field, A: Arith<F>>(
    ring: &Ring<F>,
    arith: &A,
    table: &mut MonomialTable,
    f: &Poly<F>,
) -> Element<A::C> {
    let field = &ring.field;
    let inv = arith.inv(&arith.import(field, f.leading_coefficient().unwrap()));
    let monos = f.terms().iter().map(|(m, _)| table.insert(m)).collect();
    let coeffs = f
        .terms()
        .iter()
        .map(|(_, c)| arith.mul(&arith.import(field, c), &inv))
        .collect();
    Element { monos, coeffs }
}

fn export_element<F: Field, A: Arith<F>>(
    ring: &Ring<F>,
    arith: &A,
    table: &MonomialTable,
    e: &Element<A::C>,
) -> Poly<F> {
    let terms: Vec<(Monomial, F::Elem)> = e
        .monos
        .iter()
        .zip(e.coeffs.iter())
        .map(|(&m, c)| (table.monomial(m).clone(), arith.export(&ring.field, c)))
        .collect();
    Poly::from_sorted(terms)
}

/// The reduced basis of the ideal that the elements `candidates` (a Gröbner basis) generate: a
/// minimal subset, tails fully reduced by one more matrix (the minimal elements as known pivots,
/// closed by symbolic preprocessing), sorted by decreasing leading monomial.
fn reduced_basis<F: Field, A: Arith<F>>(
    ring: &Ring<F>,
    arith: &A,
    table: &mut MonomialTable,
    basis: &[Element<A::C>],
    candidates: &[usize],
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let leads: Vec<&Monomial> = candidates
        .iter()
        .map(|&k| table.monomial(basis[k].lead()))
        .collect();
    let minimal: Vec<usize> = minimal_indices(&leads, &ring.order)
        .into_iter()
        .map(|i| candidates[i])
        .collect();
    let one = table.insert(&Monomial::one(ring.nvars()));
    let known: Vec<Multiple> = minimal
        .iter()
        .map(|&element| Multiple { mult: one, element })
        .collect();
    let divisors = divisors_of(table, basis, &minimal);
    let matrix = symbolic::preprocess(control, table, basis, &divisors, &known, &[])?;
    let rows = linalg::reduce_tails(arith, &matrix, known.len(), control)?;
    let mut polys: Vec<Poly<F>> = rows
        .into_iter()
        .map(|r| export_element(ring, arith, table, &element_of(&matrix, r)))
        .collect();
    polys.sort_by(|a, b| ring.cmp(b.leading_monomial().unwrap(), a.leading_monomial().unwrap()));
    Ok(polys)
}

/// A matrix row as a basis element (columns back to monomials).
fn element_of<C>(matrix: &SymbolicMatrix<C>, row: Row<C>) -> Element<C> {
    Element {
        monos: row
            .cols
            .iter()
            .map(|&c| matrix.columns[c as usize])
            .collect(),
        coeffs: row.coeffs,
    }
}
