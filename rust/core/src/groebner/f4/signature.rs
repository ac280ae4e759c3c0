//! Signature-based F4: F4's matrices (Faugère 1999) with the signature criteria of F5 (Faugère
//! 2002), so that the rows that would reduce to zero are mostly never built.
//!
//! Every polynomial carries a signature: the leading term t·e_i of some representation
//! Σ a_j f_j, in a module order that compares the degree of t·f_i first, then the position i,
//! then t. The computation is that of the homogenized system (one extra variable h, smallest
//! in the order), with h kept implicit: an element of homogeneous degree D is stored
//! dehomogenized together with D, and a monomial m stands for m·h^(D - deg m). Over a
//! degree-compatible order the dehomogenized basis is a Gröbner basis of the affine ideal
//! (h-free leading monomials dehomogenize to leading monomials), and the homogeneous setting
//! keeps the criteria simple: every signature of one step has the same degree.
//!
//! Per step, all J-pairs of the lowest degree (the larger-signature half u·g of each
//! S-polynomial, Gao, Volny and Wang 2010) not discarded by
//! - the syzygy criterion: the signature is a multiple of a known syzygy's (those of the
//!   rows that reduced to zero, and the Koszul syzygies LM(g)·e_i of the elements g in the
//!   ideal of f_1..f_{i-1});
//! - the rewrite criterion (Eder and Roune 2013): an element added later has a signature that
//!   divides this one's;
//!
//! (those J-pairs) become the rows of one matrix, with reducers from symbolic preprocessing that for each
//! monomial take the multiple of smallest signature. All rows are reduced in increasing order of
//! signature, each only by rows of smaller signature (so that every reduction keeps the
//! signature of the row reduced). A row whose leading monomial changed, and that is not a
//! multiple of an element with the same signature, is a new element; a row that reduces to zero
//! gives a syzygy. When no J-pair is left, the elements are a Gröbner basis; the engine returns
//! the reduced basis.

use super::arith::Arith;
use super::arith::LANES;
use super::hash::MonomialTable;
use super::linalg::{reduce_block, DenseRow, LaneBlock, LaneMask, ALL_LANES};
use super::symbolic::{self, Divisor, Element, Multiple, Row};
use super::{element_of, import_poly, reduced_basis};
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
use std::cmp::Ordering;
use std::collections::{BTreeMap, HashMap};
use std::hash::{BuildHasherDefault, Hasher};
use std::sync::atomic::{AtomicU64, Ordering as AtomicOrdering};
use std::time::Instant;

use super::super::stats::{Stats, StepStats};

/// The signature t·e_index of a homogeneous element of degree `degree`; `mono` is t
/// dehomogenized (a monomial-table index).
#[derive(Clone, Copy, PartialEq, Eq, Hash, Debug)]
struct Sig {
    degree: u32,
    index: u32,
    mono: u32,
}

/// An element's signature and whether it takes part in pairs and reductions (the input
/// polynomials are stored as inactive elements until their own row has been reduced).
struct Label {
    sig: Sig,
    active: bool,
}

/// A J-pair of signature sig: the row mult·basis[element] with mult·sig(element) = sig (the
/// multiplier is found from the signature when the pair is reduced: most pairs never are).
#[derive(Clone, Copy)]
struct JPair {
    element: usize,
}

/// One degree's J-pairs, by signature (position, t).
type PairQueue = HashMap<(u32, u32), JPair, BuildHasherDefault<KeyHasher>>;

/// A row that reduces a column, and the lanes of a block it may reduce.
type LanePivot<'a, C> = (&'a Row<C>, LaneMask);

/// Hashes the pair queue's keys, two small integers, with one multiplication: SipHash's
/// resistance to chosen keys buys nothing here, and every new element queues a pair with
/// every other.
#[derive(Default)]
struct KeyHasher(u64);

impl Hasher for KeyHasher {
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.write_u32(u32::from(b));
        }
    }
    fn write_u32(&mut self, x: u32) {
        self.0 = (self.0.rotate_left(32) ^ u64::from(x)).wrapping_mul(0x9E37_79B9_7F4A_7C15);
    }
    fn finish(&self) -> u64 {
        self.0 ^ (self.0 >> 32)
    }
}

/// Reduced Gröbner basis of `gens` by signature-based F4; requires a degree-compatible order.
pub(super) fn compute<F: Field, A: Arith<F>>(
    ring: &Ring<F>,
    arith: A,
    gens: &[Poly<F>],
    control: &Control,
) -> Result<(Vec<Poly<F>>, Stats)> {
    match run(ring, arith, gens, control, None)? {
        SignatureEnd::Finished(polys, stats) => Ok((polys, stats)),
        SignatureEnd::Fell(..) => unreachable!("the run goes on after a degree fall"),
    }
}

/// How a run of the signature engine ended.
pub(super) enum SignatureEnd<F: Field, A: Arith<F>> {
    /// The reduced basis.
    Finished(Vec<Poly<F>>, Stats),
    /// Stopped after a step that found an element whose leading monomial has a lower degree
    /// than the element (a degree fall), as the caller's rule said, with the arithmetic and
    /// what was found.
    Fell(A, Box<Fall<A::C>>),
}

/// The state of the signature engine at the degree fall where it stopped: a Gröbner basis of
/// the homogenized ideal up to the degree of that step, dehomogenized.
pub(super) struct Fall<C> {
    pub table: MonomialTable,
    /// The elements with their homogeneous degrees (their sugar): the active elements, and the
    /// input polynomials of higher degree, which no step has reached yet.
    pub elements: Vec<(Element<C>, u32)>,
    /// Every S-polynomial of homogeneous degree up to this one has a standard representation
    /// by `elements`.
    pub complete_degree: u32,
    /// Elements of lower degree than their homogeneous degree, and all elements, found by the
    /// last step.
    pub fallen: (usize, usize),
    pub stats: Stats,
}

/// What a step with a degree fall found, for the caller's rule on stopping there.
#[derive(Clone, Copy, Debug)]
pub(super) struct FallStep {
    /// The step's degree.
    pub degree: u32,
    /// Its J-pairs (after the criteria), and the most of any step so far, this one included.
    pub pairs: usize,
    pub peak_pairs: usize,
    /// Elements of lower degree than their homogeneous degree, and all elements, it found.
    pub fallen: usize,
    pub found: usize,
}

/// Runs the signature engine; with a rule `stop_at`, stops after the first step with a degree
/// fall for which the rule says so, and hands over its state.
pub(super) fn run<F: Field, A: Arith<F>>(
    ring: &Ring<F>,
    arith: A,
    gens: &[Poly<F>],
    control: &Control,
    stop_at: Option<&dyn Fn(&FallStep) -> bool>,
) -> Result<SignatureEnd<F, A>> {
    if !ring.order.is_degree_compatible() {
        return Err(Error::invalid(
            "signature-based F4 needs an order that compares degrees first (grevlex, deglex)",
        ));
    }
    let mut engine = SignatureEngine {
        ring,
        arith,
        table: MonomialTable::new(ring.nvars(), ring.order.clone()),
        basis: Vec::new(),
        labels: Vec::new(),
        input_degrees: Vec::new(),
        by_index: Vec::new(),
        syzygies: Vec::new(),
        pending: BTreeMap::new(),
        stats: Stats::default(),
        stop_at,
        peak_pairs: 0,
        fallen: (0, 0),
    };
    match engine.main_loop(gens, control)? {
        Progress::Unit => return Ok(SignatureEnd::Finished(vec![ring.one()], engine.stats)),
        Progress::Fell(degree) => return Ok(engine.hand_over(degree)),
        Progress::Going => {}
    }
    let active: Vec<usize> = (0..engine.basis.len())
        .filter(|&k| engine.labels[k].active)
        .collect();
    let polys = reduced_basis(
        ring,
        &engine.arith,
        &mut engine.table,
        &engine.basis,
        &active,
        engine.stats.steps.len(),
        control,
    )?;
    Ok(SignatureEnd::Finished(polys, engine.stats))
}

/// What a step or the main loop came to.
enum Progress {
    Going,
    /// A unit was found: the ideal is the whole ring.
    Unit,
    /// The step of this degree found a degree fall (and the run stops at falls).
    Fell(u32),
}

struct SignatureEngine<'a, F: Field, A: Arith<F>> {
    ring: &'a Ring<F>,
    arith: A,
    table: MonomialTable,
    basis: Vec<Element<A::C>>,
    labels: Vec<Label>,
    /// Total degree of each input polynomial (the degree of its signature e_i).
    input_degrees: Vec<u32>,
    /// The active elements of each signature position, in the order they were added.
    by_index: Vec<Vec<usize>>,
    /// Signatures of the rows that reduced to zero, per position.
    syzygies: Vec<Vec<Sig>>,
    /// J-pairs by degree, one per signature (position, t).
    pending: BTreeMap<u32, PairQueue>,
    stats: Stats,
    /// The rule on stopping after a step with a degree fall (`None`: never stop).
    stop_at: Option<&'a dyn Fn(&FallStep) -> bool>,
    /// The most J-pairs of any step so far.
    peak_pairs: usize,
    /// Elements of lower degree than their homogeneous degree, and all elements, found by the
    /// step where the run stopped.
    fallen: (usize, usize),
}

/// A row of one step's matrix: its signature, and where it comes from.
#[derive(Clone, Copy)]
struct Slot {
    sig: Sig,
    /// Index into the matrix's new rows (a J-pair) or reducers.
    row: usize,
    j_pair: bool,
}

impl<F: Field, A: Arith<F>> SignatureEngine<'_, F, A> {
    /// Runs until no J-pair is left, or to the first degree fall where the caller's rule stops.
    fn main_loop(&mut self, gens: &[Poly<F>], control: &Control) -> Result<Progress> {
        let one = self.table.insert(&Monomial::one(self.ring.nvars()));
        for f in gens.iter().filter(|f| !f.is_zero()) {
            if f.is_constant() {
                return Ok(Progress::Unit);
            }
            let index = self.input_degrees.len() as u32;
            let degree = f.degree().unwrap_or(0);
            self.input_degrees.push(degree);
            self.by_index.push(Vec::new());
            self.syzygies.push(Vec::new());
            let element = import_poly(self.ring, &self.arith, &mut self.table, f);
            let sig = Sig {
                degree,
                index,
                mono: one,
            };
            self.basis.push(element);
            self.labels.push(Label { sig, active: false });
            self.push_pair(
                sig,
                JPair {
                    element: self.basis.len() - 1,
                },
            );
        }
        while let Some((degree, pairs)) = self.pending.pop_first() {
            control.check()?;
            match self.step(degree, pairs, control)? {
                Progress::Going => {}
                end => return Ok(end),
            }
        }
        Ok(Progress::Going)
    }

    /// The state after the complete step of degree `degree`, for plain F4 to go on from.
    fn hand_over(self, degree: u32) -> SignatureEnd<F, A> {
        let labels = self.labels;
        let input_degrees = self.input_degrees;
        let elements = self
            .basis
            .into_iter()
            .zip(&labels)
            .filter(|(_, label)| {
                let index = label.sig.index as usize;
                label.active || input_degrees[index] > degree
            })
            .map(|(element, label)| (element, label.sig.degree))
            .collect();
        let fall = Fall {
            table: self.table,
            elements,
            complete_degree: degree,
            fallen: self.fallen,
            stats: self.stats,
        };
        SignatureEnd::Fell(self.arith, Box::new(fall))
    }

    /// One matrix: the J-pairs of degree `degree`.
    fn step(&mut self, degree: u32, pairs: PairQueue, control: &Control) -> Result<Progress> {
        let step = self.stats.steps.len();
        control.check_degree(degree, step)?;
        let mut selected: Vec<(Sig, JPair)> = pairs
            .into_iter()
            .map(|((index, mono), pair)| {
                let sig = Sig {
                    degree,
                    index,
                    mono,
                };
                (sig, pair)
            })
            .filter(|(sig, pair)| !self.is_syzygy(sig) && !self.is_rewritable(sig, pair.element))
            .collect();
        if selected.is_empty() {
            return Ok(Progress::Going);
        }
        selected.sort_by(|a, b| self.cmp_sig(&a.0, &b.0));
        let mut stats = StepStats {
            degree,
            pairs: selected.len(),
            signatures: true,
            ..Default::default()
        };

        let clock = Instant::now();
        let new: Vec<Multiple> = selected
            .iter()
            .map(|(sig, p)| Multiple {
                mult: self.table.div(sig.mono, self.labels[p.element].sig.mono),
                element: p.element,
            })
            .collect();
        let matrix = {
            let pick = reducer_picker(
                &self.basis,
                &self.labels,
                &self.by_index,
                &self.ring.order,
                &self.table,
                degree,
            );
            symbolic::preprocess_with(
                control,
                step,
                &mut self.table,
                &self.basis,
                &pick,
                &[],
                &new,
            )?
        };
        let mut slots: Vec<Slot> = selected
            .iter()
            .enumerate()
            .map(|(row, (sig, _))| Slot {
                sig: *sig,
                row,
                j_pair: true,
            })
            .collect();
        for (row, multiple) in matrix.reducer_multiples.iter().enumerate() {
            let sig = self.multiple_sig(degree, multiple)?;
            slots.push(Slot {
                sig,
                row,
                j_pair: false,
            });
        }
        // Increasing signature; of rows with equal signatures only one is kept (the J-pair's):
        // one may not reduce the other, and either represents the signature.
        slots.sort_by(|a, b| self.cmp_sig(&a.sig, &b.sig).then(b.j_pair.cmp(&a.j_pair)));
        slots.dedup_by(|later, earlier| later.sig == earlier.sig);
        stats.seconds_symbolic = clock.elapsed().as_secs_f64();
        (stats.rows, stats.columns, stats.nonzeros) =
            (matrix.rows(), matrix.columns.len(), matrix.nonzeros());
        self.stats.reached(matrix.max_degree(&self.table));

        let clock = Instant::now();
        let mut pivots: Vec<Option<Row<A::C>>> = (0..matrix.columns.len()).map(|_| None).collect();
        let mut dense = DenseRow::new(&self.arith, matrix.columns.len());
        let mut found: Vec<(Sig, usize)> = Vec::new();
        let lane_work = AtomicU64::new(0);
        let mut started: HashMap<usize, Row<A::C>> = HashMap::new();
        for (done, slot) in slots.iter().enumerate() {
            if done % 64 == 0 {
                control.check()?;
            }
            let row = row_of(&matrix, slot);
            let lead = row.cols[0] as usize;
            if !slot.j_pair && pivots[lead].is_none() {
                // A reducer nothing reduced before: a pivot as it is.
                pivots[lead] = Some(Row {
                    cols: row.cols.clone(),
                    coeffs: row.coeffs.clone(),
                });
                continue;
            }
            if !started.contains_key(&done) {
                let block =
                    self.start_block(&matrix, &slots, done, &pivots, control, &lane_work)?;
                started.extend(block);
            }
            // Every row that needs reducing starts in a block: the one begun at it, if no
            // earlier block took it.
            let start = started
                .remove(&done)
                .expect("a block holds every row to be reduced");
            let reduced = if start.cols.is_empty() {
                None
            } else {
                dense.reduce_row(&start, &|k| pivots[k].as_ref())
            };
            match reduced {
                None => {
                    self.stats.zero_reductions += 1;
                    self.syzygies[slot.sig.index as usize].push(slot.sig);
                }
                Some(reduced) => {
                    let new_lead = reduced.cols[0] as usize;
                    let is_input = slot.j_pair && !self.labels[selected[slot.row].1.element].active;
                    if new_lead != lead || is_input {
                        found.push((slot.sig, new_lead));
                    }
                    pivots[new_lead] = Some(reduced);
                }
            }
        }
        stats.seconds_linear_algebra = clock.elapsed().as_secs_f64();
        stats.multiply_adds = dense.multiply_adds() + lane_work.load(AtomicOrdering::Relaxed);

        let mut added = 0;
        let mut fallen = 0;
        for (sig, column) in found {
            let lead = matrix.columns[column];
            if self.is_singular(&sig, lead) {
                continue;
            }
            let row = pivots[column]
                .take()
                .expect("a new element's row is a pivot");
            let element = element_of(&matrix, row);
            if self.table.degree(element.lead()) == 0 {
                return Ok(Progress::Unit);
            }
            fallen += usize::from(self.table.degree(element.lead()) < sig.degree);
            self.add_element(element, sig)?;
            added += 1;
        }
        stats.new_elements = added;
        self.stats.steps.push(stats);
        self.peak_pairs = self.peak_pairs.max(selected.len());
        let fall = FallStep {
            degree,
            pairs: selected.len(),
            peak_pairs: self.peak_pairs,
            fallen,
            found: added,
        };
        if fallen > 0 && self.stop_at.is_some_and(|stop| stop(&fall)) {
            self.fallen = (fallen, added);
            return Ok(Progress::Fell(degree));
        }
        Ok(Progress::Going)
    }

    /// The rows to be reduced from slot `first` on (up to one block of lanes: J-pair rows, and
    /// reducers whose leading column already has a pivot) reduced together, in the eight-lane
    /// kernel, by the rows of smaller signature known so far: the pivots installed,
    /// and the reducers between the block's rows whose leading column has no pivot yet (most
    /// are installed as they are when their turn comes; each reduces only the lanes after it).
    /// What else the rows meet is left to each row's own pass. Should such a reducer be reduced
    /// instead of installed, the lanes it served still received a reduction by a row of smaller
    /// signature, and their own pass ends on the same row: a row fully reduced by the pivots
    /// of smaller signature is unique.
    fn start_block(
        &self,
        matrix: &symbolic::SymbolicMatrix<A::C>,
        slots: &[Slot],
        first: usize,
        pivots: &[Option<Row<A::C>>],
        control: &Control,
        work: &AtomicU64,
    ) -> Result<Vec<(usize, Row<A::C>)>> {
        control.check()?;
        let lead_of = |slot: &Slot| row_of(matrix, slot).cols[0] as usize;
        let block: Vec<usize> = (first..slots.len())
            .filter(|&i| slots[i].j_pair || pivots[lead_of(&slots[i])].is_some())
            .take(LANES)
            .collect();
        let rows: Vec<&Row<A::C>> = block.iter().map(|&i| row_of(matrix, &slots[i])).collect();
        let width = matrix.columns.len();
        // Per column, a non-pivot row of this block that may reduce the later lanes only.
        let mut waiting: Vec<Option<LanePivot<'_, A::C>>> = vec![None; width];
        for (lane, pair) in block.windows(2).enumerate() {
            let later_lanes = ALL_LANES & !((2 << lane) - 1);
            for slot in &slots[pair[0] + 1..pair[1]] {
                let row = row_of(matrix, slot);
                let lead = row.cols[0] as usize;
                if pivots[lead].is_none() && waiting[lead].is_none() {
                    waiting[lead] = Some((row, later_lanes));
                }
            }
        }
        let pivot_of = |k: usize| match &pivots[k] {
            Some(pivot) => Some((pivot, ALL_LANES)),
            None => waiting[k],
        };
        let mut acc = LaneBlock::new(&self.arith, width);
        let reduced = reduce_block(&mut acc, &rows, 0, pivot_of, work);
        Ok(block
            .into_iter()
            .zip(reduced)
            .map(|(i, (cols, coeffs))| {
                let row = Row {
                    cols,
                    coeffs: coeffs.into(),
                };
                (i, row)
            })
            .collect())
    }

    /// Signature order: degree, then position, then the monomial t (as the homogeneous t·h^a:
    /// with degree and position equal, a larger t means a smaller power of h, a larger term).
    fn cmp_sig(&self, a: &Sig, b: &Sig) -> Ordering {
        (a.degree, a.index)
            .cmp(&(b.degree, b.index))
            .then_with(|| self.table.cmp(a.mono, b.mono))
    }

    /// The power of h in the homogeneous signature.
    fn h_power(&self, sig: &Sig) -> u32 {
        sig.degree - self.input_degrees[sig.index as usize] - self.table.degree(sig.mono)
    }

    /// The power of h in the leading monomial of element `k` (homogeneous degree minus degree).
    fn lead_h_power(&self, k: usize) -> u32 {
        self.labels[k].sig.degree - self.table.degree(self.basis[k].lead())
    }

    fn sig_divides(&self, a: &Sig, b: &Sig) -> bool {
        a.index == b.index
            && self.table.divides(a.mono, b.mono)
            && self.h_power(a) <= self.h_power(b)
    }

    /// Syzygy criterion: `sig` is a multiple of a zero reduction's signature, or of a Koszul
    /// syzygy's LM(g)·e_i, g an element of the ideal of the inputs before position i.
    fn is_syzygy(&self, sig: &Sig) -> bool {
        let index = sig.index as usize;
        if self.syzygies[index]
            .iter()
            .any(|s| self.sig_divides(s, sig))
        {
            return true;
        }
        let power = self.h_power(sig);
        self.by_index[..index].iter().flatten().any(|&g| {
            let lead = self.basis[g].lead();
            self.table.divides(lead, sig.mono) && self.lead_h_power(g) <= power
        })
    }

    /// Rewrite criterion in the order of Gao, Volny and Wang (2010): of the elements whose
    /// signature divides `sig`, only the one whose multiple of that signature has the smallest
    /// leading monomial (the latest added among equals) needs its J-pair reduced; the others'
    /// are discarded. (Preferring the latest added element instead loses pairs here, where a
    /// row whose result is dropped as a multiple of an older element leaves the later one as
    /// the rewriter.)
    fn is_rewritable(&self, sig: &Sig, element: usize) -> bool {
        self.by_index[sig.index as usize].iter().any(|&k| {
            k != element
                && self.sig_divides(&self.labels[k].sig, sig)
                && self.prefers(sig, k, element)
        })
    }

    /// Whether element `a`'s multiple of signature `sig` is the one to reduce rather than
    /// element `b`'s: its leading monomial is smaller, or equal and `a` was added later.
    fn prefers(&self, sig: &Sig, a: usize, b: usize) -> bool {
        let n = self.ring.nvars();
        match self
            .ring
            .order
            .cmp_by(n, self.rewrite_key(sig, a), self.rewrite_key(sig, b))
        {
            Ordering::Less => true,
            Ordering::Equal => a > b,
            Ordering::Greater => false,
        }
    }

    /// The leading monomial (dehomogenized) of the multiple of element `k` whose signature is
    /// `sig` (a multiple of k's signature), as exponents.
    fn rewrite_key(&self, sig: &Sig, k: usize) -> impl Fn(usize) -> u32 + '_ {
        let label = self.labels[k].sig.mono;
        quotient_times(&self.table, sig.mono, label, self.basis[k].lead())
    }

    /// Whether a row of signature `sig` with leading monomial `lead` is a multiple u·g of an
    /// element with u·sig(g) = sig: then it adds nothing that g does not give.
    fn is_singular(&self, sig: &Sig, lead: u32) -> bool {
        let power = sig.degree - self.table.degree(lead);
        let target = self.table.exponents(sig.mono);
        self.by_index[sig.index as usize].iter().any(|&g| {
            let g_lead = self.basis[g].lead();
            if !self.table.divides(g_lead, lead) || self.lead_h_power(g) > power {
                return false;
            }
            let times = quotient_times(&self.table, lead, g_lead, self.labels[g].sig.mono);
            target.iter().enumerate().all(|(v, &e)| times(v) == e)
        })
    }

    /// The signature of a reducer row of degree `degree`.
    fn multiple_sig(&mut self, degree: u32, multiple: &Multiple) -> Result<Sig> {
        let sig = self.labels[multiple.element].sig;
        Ok(Sig {
            degree,
            index: sig.index,
            mono: self.table.mul(multiple.mult, sig.mono)?,
        })
    }

    /// Adds a new element and the J-pairs it forms with the active elements.
    fn add_element(&mut self, element: Element<A::C>, sig: Sig) -> Result<()> {
        let new = self.basis.len();
        self.basis.push(element);
        self.labels.push(Label { sig, active: true });
        let others: Vec<usize> = self.by_index.iter().flatten().copied().collect();
        for other in others {
            if let Some((sig, pair)) = self.j_pair(new, other)? {
                self.push_pair(sig, pair);
            }
        }
        self.by_index[sig.index as usize].push(new);
        Ok(())
    }

    /// The J-pair of elements `a` and `b`: the half of their S-polynomial of larger signature,
    /// in the homogeneous setting (`None` when both halves have the same signature). Most pairs
    /// are discarded here or in `push_pair`, so both halves are compared on exponents computed
    /// on the fly; only the kept half's monomials go into the table.
    fn j_pair(&mut self, a: usize, b: usize) -> Result<Option<(Sig, JPair)>> {
        let (ha, hb) = (self.lead_h_power(a), self.lead_h_power(b));
        let table = &self.table;
        let (la, lb) = (self.basis[a].lead(), self.basis[b].lead());
        let (ea, eb) = (table.exponents(la), table.exponents(lb));
        // Coprime leading monomials (h included): the larger half's signature is the leading
        // term of the principal syzygy g_b·a - g_a·b, so the syzygy criterion discards it.
        if (ha == 0 || hb == 0) && ea.iter().zip(eb).all(|(&x, &y)| x == 0 || y == 0) {
            return Ok(None);
        }
        let lcm = |v: usize| ea[v].max(eb[v]);
        let n = ea.len();
        let lcm_degree: u64 = (0..n).map(|v| u64::from(lcm(v))).sum();
        let (sa, sb) = (self.labels[a].sig, self.labels[b].sig);
        // Each half's signature monomial lcm / lead · label, of degree at most that of the
        // pair: checked once here, so that no exponent below can overflow.
        let degree = u32::try_from(lcm_degree + u64::from(ha.max(hb))).map_err(|_| overflow())?;
        for (label, lead) in [(sa.mono, la), (sb.mono, lb)] {
            let half = lcm_degree - u64::from(table.degree(lead)) + u64::from(table.degree(label));
            u32::try_from(half).map_err(|_| overflow())?;
        }
        let (ca, cb) = (table.exponents(sa.mono), table.exponents(sb.mono));
        let half = |of_a: bool| {
            let (e, c) = if of_a { (ea, ca) } else { (eb, cb) };
            move |v: usize| lcm(v) - e[v] + c[v]
        };
        let larger = sa
            .index
            .cmp(&sb.index)
            .then_with(|| self.ring.order.cmp_by(n, half(true), half(false)));
        let (k, label, of_a) = match larger {
            Ordering::Equal => return Ok(None),
            Ordering::Greater => (a, sa, true),
            Ordering::Less => (b, sb, false),
        };
        let sig_exps: Vec<u32> = (0..n).map(half(of_a)).collect();
        let sig = Sig {
            degree,
            index: label.index,
            mono: self.table.insert_exponents(&sig_exps)?,
        };
        Ok(Some((sig, JPair { element: k })))
    }

    /// Queues a J-pair; of two with the same signature the one the rewrite criterion prefers
    /// stays.
    fn push_pair(&mut self, sig: Sig, pair: JPair) {
        let key = (sig.index, sig.mono);
        let queue = self.pending.entry(sig.degree).or_default();
        let Some(&queued) = queue.get(&key) else {
            queue.insert(key, pair);
            return;
        };
        if !self.prefers(&sig, queued.element, pair.element) {
            self.pending
                .get_mut(&sig.degree)
                .expect("the queue of this degree exists")
                .insert(key, pair);
        }
    }
}

/// The matrix row of a slot.
fn row_of<'m, C>(matrix: &'m symbolic::SymbolicMatrix<C>, slot: &Slot) -> &'m Row<C> {
    if slot.j_pair {
        &matrix.new_rows[slot.row]
    } else {
        &matrix.reducers[slot.row]
    }
}

/// Symbolic preprocessing's choice of reducer for monomial m in a matrix of degree `degree`:
/// among the active elements whose leading monomial divides m (as homogeneous monomials), the
/// one whose multiple has the smallest signature, which lets the most rows be reduced by it.
fn reducer_picker<'e, C: Send + Sync>(
    basis: &[Element<C>],
    labels: &[Label],
    by_index: &[Vec<usize>],
    order: &'e MonomialOrder,
    table: &MonomialTable,
    degree: u32,
) -> impl Fn(&MonomialTable, u32) -> Option<Divisor> + Sync + 'e {
    // The candidates' leading monomials, masks and h powers side by side: every monomial of
    // the matrix scans them.
    let candidates: Vec<Vec<Candidate>> = by_index
        .iter()
        .map(|elements| {
            elements
                .iter()
                .map(|&g| {
                    let lead = basis[g].lead();
                    Candidate {
                        divisor: Divisor {
                            lead,
                            mask: table.mask(lead),
                            element: g,
                        },
                        h_power: labels[g].sig.degree - table.degree(lead),
                        label: labels[g].sig.mono,
                    }
                })
                .collect()
        })
        .collect();
    move |table: &MonomialTable, m: u32| {
        let room = degree - table.degree(m);
        let n = table.exponents(m).len();
        let sig_of = |c: &Candidate| quotient_times(table, m, c.divisor.lead, c.label);
        for elements in &candidates {
            let mut best: Option<&Candidate> = None;
            let fitting = elements.iter().filter(|c| {
                table.may_divide(c.divisor.mask, m)
                    && table.divides(c.divisor.lead, m)
                    && c.h_power <= room
            });
            for c in fitting {
                if best.is_none_or(|b| order.cmp_by(n, sig_of(c), sig_of(b)) == Ordering::Less) {
                    best = Some(c);
                }
            }
            if let Some(best) = best {
                return Some(best.divisor);
            }
        }
        None
    }
}

/// An element as candidate reducer: its divisor entry, the h power of its leading monomial
/// and its signature monomial.
struct Candidate {
    divisor: Divisor,
    h_power: u32,
    label: u32,
}

/// (a / b)·c for monomials of the table, b dividing a, as its exponents: the signature
/// monomial of the multiple of an element (leading monomial b, signature monomial c) that has
/// leading monomial a, and the other way round, the leading monomial of the multiple whose
/// signature monomial is a.
fn quotient_times(table: &MonomialTable, a: u32, b: u32, c: u32) -> impl Fn(usize) -> u32 + '_ {
    let (a, b, c) = (table.exponents(a), table.exponents(b), table.exponents(c));
    move |v| a[v] - b[v] + c[v]
}

fn overflow() -> Error {
    Error::Overflow("exponent overflow: a signature's degree exceeds 2^32 - 1".into())
}
