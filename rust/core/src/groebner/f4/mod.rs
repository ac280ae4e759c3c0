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
pub mod auto;
pub mod hash;
pub mod linalg;
pub mod parallel;
pub mod sampled;
pub mod signature;
pub mod symbolic;

#[cfg(test)]
mod tests;

use super::pairs::{Pair, PairSet, Selection};
use super::reduce::minimal_indices;
use super::stats::{Stats, StepStats};
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::monomial::Monomial;
use crate::monomial_ideal::{monomial_ideal_series, HilbertSeries};
use crate::poly::{Poly, Ring};
use crate::rng::Rng;
use arith::{Arith, BigPrime, FieldOps, LargePrime, SmallPrime};
use hash::MonomialTable;
use std::collections::HashMap;
use std::time::Instant;
use symbolic::{Divisor, Element, Multiple, Row, SymbolicMatrix};

/// Tuning of the F4 engine.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct F4Options {
    /// At most this many pairs per step (the others wait for the next step); `None`: all pairs
    /// the selection rule gives.
    pub max_pairs_per_step: Option<usize>,
    pub variant: Variant,
}

/// Which rows each matrix gets and how its new rows are reduced: one choice, so that settings
/// that exclude each other cannot be combined.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum Variant {
    /// Every pair's rows, every new row reduced: the result is certain.
    #[default]
    Exact,
    /// Random combinations of the new rows are reduced (see [`sampled`]): over a finite field
    /// the result is the exact one except with probability at most 2^-80 per matrix. Orders
    /// that do not compare degrees first (lex, block orders) stay exact: there the dense rows
    /// that combinations give would raise the degrees of later pairs without bound.
    Sampled(Sampling),
    /// Signature-based F4 (see [`signature`]): exact, needs an order that compares degrees
    /// first, and skips most rows that would reduce to zero.
    Signatures,
    /// Signatures while degrees do not fall, plain F4 from the first fall on (see [`auto`]).
    Auto,
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

/// Reduced Gröbner basis of `gens`; runs on `control.limits.threads` threads (default: all cores).
pub fn compute_with<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    options: &F4Options,
) -> Result<(Vec<Poly<F>>, Stats)> {
    let run = || dispatch(ring, gens, control, options);
    match control.limits.threads {
        // One thread: no pool at all (the linear algebra then stays on this thread).
        Some(1) => run(),
        _ => control.on_threads(run),
    }
}

/// Runs `$body` with `$arith` bound to the coefficient kernel for `$ring`'s field: packed words
/// for word-size GF(p), packed limbs for larger primes, the field's own arithmetic otherwise.
macro_rules! with_arith {
    ($ring:expr, $arith:ident => $body:expr) => {
        match $ring.field.word_modulus() {
            Some(p) if p < 1 << 16 => {
                let $arith = SmallPrime::<u16>::new(p);
                $body
            }
            Some(p) if p < 1 << 31 => {
                let $arith = SmallPrime::<u32>::new(p);
                $body
            }
            Some(p) => {
                let $arith = LargePrime::new(p);
                $body
            }
            None => match $ring.field.montgomery_modulus().as_deref() {
                Some(limbs) if limbs.len() == 2 => {
                    let $arith = BigPrime::<2, 5>::new(limbs).expect("two limbs");
                    $body
                }
                Some(limbs) if limbs.len() == 4 => {
                    let $arith = BigPrime::<4, 9>::new(limbs).expect("four limbs");
                    $body
                }
                Some(limbs) if limbs.len() == 8 => {
                    let $arith = BigPrime::<8, 17>::new(limbs).expect("eight limbs");
                    $body
                }
                _ => {
                    let $arith = FieldOps::new($ring.field.clone());
                    $body
                }
            },
        }
    };
}

fn dispatch<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    options: &F4Options,
) -> Result<(Vec<Poly<F>>, Stats)> {
    with_arith!(ring, arith => F4Run::new(ring, arith, options).run(gens, control))
}

/// The reduced basis of the ideal generated by `basis`, which must be a Gröbner basis for the
/// order of `ring` (nonzero polynomials): one matrix, as at the end of every F4 run.
pub fn interreduce<F: Field>(
    ring: &Ring<F>,
    basis: &[Poly<F>],
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let options = F4Options::default();
    with_arith!(ring, arith => {
        let mut run = F4Run::new(ring, arith, &options);
        if let Outcome::Unit = run.import_all(basis) {
            return Ok(vec![ring.one()]);
        }
        let all: Vec<usize> = (0..run.basis.len()).collect();
        reduced_basis(ring, &run.arith, &mut run.table, &run.basis, &all, 0, control)
    })
}

/// The reduced basis of the homogeneous ideal generated by `gens` (homogeneous), knowing its
/// Hilbert series `target` in advance: a degree whose Hilbert function the leading monomials
/// found so far already give is complete, so its pairs are dropped unreduced; once the whole
/// series is reached the run stops (Traverso 1996).
pub fn compute_driven<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    target: &HilbertSeries,
) -> Result<(Vec<Poly<F>>, Stats)> {
    let options = F4Options::default();
    with_arith!(ring, arith => {
        let mut run = F4Run::new(ring, arith, &options);
        run.target = Some(target);
        run.plain(gens, control)
    })
}

/// F4 through the field's own operations (every field; tests compare it with the packed kernels).
#[cfg(test)]
pub(crate) fn compute_generic<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
    options: &F4Options,
) -> Result<(Vec<Poly<F>>, Stats)> {
    F4Run::new(ring, FieldOps::new(ring.field.clone()), options).run(gens, control)
}

/// How far the leading monomials found are from a known Hilbert series.
enum Progress {
    /// They give the whole series: the basis is complete.
    Complete,
    /// They give the Hilbert function in the degree of the next pairs, which reduce to zero.
    DegreeComplete,
    Open,
}

/// Result of a run before conversion: the reduced basis, or the unit ideal.
enum Outcome {
    Basis,
    Unit,
}

/// One run of F4: the basis so far, its pairs and the run's statistics.
struct F4Run<'a, F: Field, A: Arith<F>> {
    ring: &'a Ring<F>,
    arith: A,
    options: &'a F4Options,
    table: MonomialTable,
    basis: Vec<Element<A::C>>,
    pairs: PairSet,
    stats: Stats,
    /// Settings and source of the random combinations when the linear algebra samples.
    sampler: Option<(Sampling, Rng)>,
    /// Share of the last matrix's new rows that were independent.
    rank_share: Option<f64>,
    /// Whether every generator is homogeneous (then sugar is the degree, and every step stays
    /// in one degree whatever the order).
    homogeneous: bool,
    /// The Hilbert series of the ideal, when known in advance (see [`compute_driven`]).
    target: Option<&'a HilbertSeries>,
}

impl<'a, F: Field, A: Arith<F>> F4Run<'a, F, A> {
    fn new(ring: &'a Ring<F>, arith: A, options: &'a F4Options) -> Self {
        F4Run {
            ring,
            arith,
            options,
            table: MonomialTable::new(ring.nvars(), ring.order.clone()),
            basis: Vec::new(),
            pairs: PairSet::default(),
            stats: Stats::default(),
            sampler: match options.variant {
                Variant::Sampled(sampling) => Some((
                    sampling,
                    sampling.seed.map_or_else(Rng::from_entropy, Rng::new),
                )),
                _ => None,
            },
            rank_share: None,
            homogeneous: true,
            target: None,
        }
    }

    fn run(self, gens: &[Poly<F>], control: &Control) -> Result<(Vec<Poly<F>>, Stats)> {
        match self.options.variant {
            Variant::Signatures => return signature::compute(self.ring, self.arith, gens, control),
            Variant::Auto => return auto::compute(self, gens, control),
            Variant::Exact | Variant::Sampled(_) => {}
        }
        self.plain(gens, control)
    }

    /// Plain F4 from the generators.
    fn plain(mut self, gens: &[Poly<F>], control: &Control) -> Result<(Vec<Poly<F>>, Stats)> {
        if let Outcome::Unit = self.import_all(gens) {
            return Ok((vec![self.ring.one()], self.stats));
        }
        self.finish(control)
    }

    /// Plain F4 going on from the state of the signature engine at a degree fall.
    fn resume(
        ring: &'a Ring<F>,
        arith: A,
        options: &'a F4Options,
        fall: Box<signature::Fall<A::C>>,
    ) -> Self {
        let fall = *fall;
        let mut run = F4Run::new(ring, arith, options);
        run.table = fall.table;
        run.stats = fall.stats;
        let mut elements = fall.elements;
        // Larger leading monomials first, as in the main loop.
        elements.sort_by(|(a, _), (b, _)| run.table.cmp(b.lead(), a.lead()));
        for (element, sugar) in elements {
            run.add_element(element, sugar);
        }
        run.pairs.drop_up_to_sugar(fall.complete_degree);
        run
    }

    /// Runs the main loop from the current basis and pairs to the reduced basis.
    fn finish(mut self, control: &Control) -> Result<(Vec<Poly<F>>, Stats)> {
        if let Outcome::Unit = self.main_loop(control)? {
            return Ok((vec![self.ring.one()], self.stats));
        }
        let polys = self.final_basis(control)?;
        Ok((polys, self.stats))
    }

    /// Adds the nonzero generators to the basis (the unit ideal if one is constant).
    fn import_all(&mut self, gens: &[Poly<F>]) -> Outcome {
        self.homogeneous = gens.iter().all(Poly::is_homogeneous);
        for f in gens.iter().filter(|f| !f.is_zero()) {
            if f.is_constant() {
                return Outcome::Unit;
            }
            let element = self.import(f);
            self.add_element(element, 0);
        }
        Outcome::Basis
    }

    fn main_loop(&mut self, control: &Control) -> Result<Outcome> {
        let degree_order = self.ring.order.is_degree_compatible();
        loop {
            control.check()?;
            let limit = self.options.max_pairs_per_step;
            // Homogeneous input: sugar is the degree, a whole degree at a time in any order.
            let selection = match self.homogeneous {
                true => Selection::LeastSugar,
                false => Selection::for_order(&self.ring.order),
            };
            let selected = self.pairs.take(selection, &self.ring.order, limit);
            let Some(degree) = selected.iter().map(|p| p.lcm.degree()).max() else {
                break;
            };
            let sugar = selected.iter().map(|p| p.sugar).max().unwrap_or(0);
            if let Some(target) = self.target {
                match self.hilbert_progress(target, sugar, control)? {
                    Progress::Complete => break,
                    Progress::DegreeComplete => continue,
                    Progress::Open => {}
                }
            }
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
                step,
                &mut self.table,
                &self.basis,
                &divisors,
                &known,
                &new,
            )?;
            stats.seconds_symbolic = clock.elapsed().as_secs_f64();
            (stats.rows, stats.columns, stats.nonzeros) =
                (matrix.rows(), matrix.columns.len(), matrix.nonzeros());
            self.stats.reached(matrix.max_degree(&self.table));

            let clock = Instant::now();
            // Fully reduced new elements only where that cannot raise degrees (see linalg); for
            // the same reason no sampling under other orders: combinations give dense tails.
            let back_substitute = degree_order || self.homogeneous;
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

    fn pair_rows(&mut self, selected: &[Pair]) -> (Vec<Multiple>, Vec<Multiple>) {
        pair_rows(&mut self.table, &self.basis, selected)
    }

    /// Where the leading monomials found so far stand against the known Hilbert series, for
    /// the pairs of degree `degree` (homogeneous input).
    fn hilbert_progress(
        &self,
        target: &HilbertSeries,
        degree: u32,
        control: &Control,
    ) -> Result<Progress> {
        let leads: Vec<Monomial> = self
            .pairs
            .active_indices()
            .into_iter()
            .map(|k| self.table.monomial(self.basis[k].lead()).clone())
            .collect();
        // A series too large for 128-bit coefficients only loses the shortcut.
        let series = match monomial_ideal_series(self.ring.nvars(), &leads, false, control) {
            Err(Error::Overflow(_)) => return Ok(Progress::Open),
            other => other?,
        };
        if series == *target {
            return Ok(Progress::Complete);
        }
        let count = degree as usize + 1;
        let value = |s: &HilbertSeries| s.coefficients(count).map(|c| c[degree as usize]);
        let complete = matches!((value(&series), value(target)), (Ok(a), Ok(b)) if a == b);
        Ok(match complete {
            true => Progress::DegreeComplete,
            false => Progress::Open,
        })
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
        let step = self.stats.steps.len();
        reduced_basis(
            ring,
            arith,
            &mut self.table,
            &self.basis,
            &active,
            step,
            control,
        )
    }
}

/// Both halves u·g of every pair of `selected`, once each. Per lcm, the first half seen is the
/// known pivot of that column; all other halves with the same lcm are new rows.
pub(crate) fn pair_rows<C>(
    table: &mut MonomialTable,
    basis: &[Element<C>],
    selected: &[Pair],
) -> (Vec<Multiple>, Vec<Multiple>) {
    let mut lcm_seen: HashMap<u32, ()> = HashMap::new();
    let mut row_seen: HashMap<Multiple, ()> = HashMap::new();
    let (mut known, mut new) = (Vec::new(), Vec::new());
    for pair in selected {
        let lcm = table.insert(&pair.lcm);
        for element in [pair.i, pair.j] {
            let mult = table.div(lcm, basis[element].lead());
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

/// The elements `indices` as reducers: leading monomial, its mask, index.
pub(crate) fn divisors_of<C>(
    table: &MonomialTable,
    basis: &[Element<C>],
    indices: &[usize],
) -> Vec<Divisor> {
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
pub(crate) fn import_poly<F: Field, A: Arith<F>>(
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
    step: usize,
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
    let matrix = symbolic::preprocess(control, step, table, basis, &divisors, &known, &[])?;
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
