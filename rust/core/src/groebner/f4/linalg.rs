//! Row echelon form of an F4 matrix by the known-pivot / new-row split of Faugère and Lachartre
//! (2010): the reducer rows already have distinct leading columns (the "known pivots"), so
//! 1. every new row is reduced by the known pivots alone: rows are independent, reduced in
//!    parallel, eight at a time in one interleaved dense accumulator with delayed modular
//!    reduction (see `arith`);
//! 2. what is left lives in the columns without a known pivot, a much smaller matrix, which is
//!    echelonized: rows are again reduced in parallel, and a row whose leading column has no pivot
//!    yet installs itself as that column's pivot (a lock-free race: the loser keeps reducing);
//! 3. the installed rows are reduced by each other (back substitution).
//!
//! The rows installed in step 2 are the new basis elements: their leading monomials are exactly
//! the leading monomials of the row space that are not leading monomials of the known pivots.

use super::arith::{Arith, LANES};
use super::parallel::map_items;
use super::symbolic::{Row, SymbolicMatrix};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use std::marker::PhantomData;
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::{Arc, OnceLock};

/// The new pivots of one matrix.
pub struct Echelon<C> {
    /// Monic rows with distinct leading columns, indexed by the matrix's columns.
    pub rows: Vec<Row<C>>,
    /// New rows that reduced to zero.
    pub zero_rows: usize,
    pub multiply_adds: u64,
}

/// What a column of an accumulator holds after `DenseRow::eliminate`.
#[derive(PartialEq, Eq)]
enum Entry {
    Zero,
    /// A nonzero entry in a column without pivot.
    Free,
}

/// A sparse row under construction: columns and coefficients.
type Entries<C> = (Vec<u32>, Vec<C>);

/// One worker's dense accumulator.
pub(super) struct DenseRow<'a, F: Field, A: Arith<F>> {
    arith: &'a A,
    acc: Vec<A::A>,
    /// Multiply-adds the accumulator can still take before it must be normalized.
    budget: u64,
    multiply_adds: u64,
    _f: PhantomData<F>,
}

impl<'a, F: Field, A: Arith<F>> DenseRow<'a, F, A> {
    pub(super) fn new(arith: &'a A, width: usize) -> Self {
        let acc = vec![arith.acc_zero(); width];
        DenseRow {
            arith,
            acc,
            budget: arith.headroom(),
            multiply_adds: 0,
            _f: PhantomData,
        }
    }

    fn load(&mut self, cols: &[u32], coeffs: &[A::C]) {
        for (&c, x) in cols.iter().zip(coeffs) {
            self.acc[c as usize] = self.arith.load(x);
        }
    }

    /// Eliminates, left to right from column `from`, every entry whose column has a pivot, up to
    /// the first nonzero entry without a pivot; returns that entry's column (`None`: the row is
    /// zero from `from` on).
    fn sweep<'r>(
        &mut self,
        from: usize,
        pivot_of: &impl Fn(usize) -> Option<&'r Row<A::C>>,
    ) -> Option<usize>
    where
        A::C: 'r,
    {
        (from..self.acc.len()).find(|&k| self.eliminate(k, pivot_of) == Entry::Free)
    }

    /// Eliminates every entry from column `from` on whose column has a pivot.
    fn sweep_all<'r>(&mut self, from: usize, pivot_of: &impl Fn(usize) -> Option<&'r Row<A::C>>)
    where
        A::C: 'r,
    {
        let mut from = from;
        while let Some(k) = self.sweep(from, pivot_of) {
            from = k + 1;
        }
    }

    /// `row` with every entry from its leading column on reduced by the pivots `pivot_of`
    /// gives: the monic result, or `None` when the row reduces to zero.
    pub(super) fn reduce_row<'r>(
        &mut self,
        row: &Row<A::C>,
        pivot_of: &impl Fn(usize) -> Option<&'r Row<A::C>>,
    ) -> Option<Row<A::C>>
    where
        A::C: 'r,
    {
        self.load(&row.cols, &row.coeffs);
        let lead = self.sweep(row.cols[0] as usize, pivot_of)?;
        self.sweep_all(lead + 1, pivot_of);
        let inv = self.arith.inv(&self.arith.settle(&self.acc[lead]));
        let (cols, coeffs) = self.extract(lead, Some(&inv), true);
        Some(Row {
            cols,
            coeffs: coeffs.into(),
        })
    }

    pub(super) fn multiply_adds(&self) -> u64 {
        self.multiply_adds
    }

    /// Adds m times the row (`cols`, `coeffs`, all after column `k`) to the accumulator.
    fn add_multiple(&mut self, cols: &[u32], coeffs: &[A::C], m: &A::C, k: usize) {
        self.arith.axpy(&mut self.acc, cols, coeffs, m);
        self.multiply_adds += cols.len() as u64;
        self.budget -= 1;
        if self.budget == 0 {
            self.arith.normalize(&mut self.acc[k + 1..]);
            self.budget = self.arith.headroom();
        }
    }

    /// Clears column `k` with its pivot if it has one; says what the column holds afterwards.
    #[inline(always)]
    fn eliminate<'r>(
        &mut self,
        k: usize,
        pivot_of: &impl Fn(usize) -> Option<&'r Row<A::C>>,
    ) -> Entry
    where
        A::C: 'r,
    {
        let arith = self.arith;
        if arith.acc_is_zero(&self.acc[k]) {
            return Entry::Zero;
        }
        let c = arith.settle(&self.acc[k]);
        if arith.is_zero(&c) {
            self.acc[k] = arith.acc_zero();
            return Entry::Zero;
        }
        let Some(pivot) = pivot_of(k) else {
            self.acc[k] = arith.load(&c);
            return Entry::Free;
        };
        // Pivots are monic: adding -c times the pivot's tail clears column k.
        self.acc[k] = arith.acc_zero();
        self.add_multiple(&pivot.cols[1..], &pivot.coeffs[1..], &arith.neg(&c), k);
        Entry::Zero
    }

    /// The nonzero entries from column `from` on, times `scale`; clears them when `clear`.
    pub(super) fn extract(
        &mut self,
        from: usize,
        scale: Option<&A::C>,
        clear: bool,
    ) -> Entries<A::C> {
        let arith = self.arith;
        let (mut cols, mut coeffs) = (Vec::new(), Vec::new());
        for k in from..self.acc.len() {
            if arith.acc_is_zero(&self.acc[k]) {
                continue;
            }
            let c = arith.settle(&self.acc[k]);
            if clear {
                self.acc[k] = arith.acc_zero();
            }
            if !arith.is_zero(&c) {
                cols.push(k as u32);
                coeffs.push(match scale {
                    Some(s) => arith.mul(&c, s),
                    None => c,
                });
            }
        }
        (cols, coeffs)
    }
}

/// Up to LANES rows reduced together by the known pivots, in one interleaved accumulator: the
/// entry of column k in lane j sits at k·LANES + j. Each pivot row is then read once per block
/// rather than once per row, and each of its entries updates all lanes in one cache line (the
/// pivot rows of a large matrix are many megabytes, far more than a core's cache).
pub(super) struct LaneBlock<'a, F: Field, A: Arith<F>> {
    arith: &'a A,
    acc: Vec<A::A>,
    /// `axpy_lanes` calls the accumulator can still take before it must be normalized.
    budget: u64,
    multiply_adds: u64,
    _f: PhantomData<F>,
}

impl<'a, F: Field, A: Arith<F>> LaneBlock<'a, F, A> {
    pub(super) fn new(arith: &'a A, width: usize) -> Self {
        LaneBlock {
            arith,
            acc: vec![arith.acc_zero(); width * LANES],
            budget: arith.headroom(),
            multiply_adds: 0,
            _f: PhantomData,
        }
    }

    fn load(&mut self, lane: usize, cols: &[u32], coeffs: &[A::C]) {
        for (&c, x) in cols.iter().zip(coeffs) {
            self.acc[c as usize * LANES + lane] = self.arith.load(x);
        }
    }

    /// Clears column `k` with the column's pivot in the lanes whose bit is set in `lanes`.
    #[inline(always)]
    fn eliminate(&mut self, k: usize, pivot: &Row<A::C>, lanes: LaneMask) {
        let arith = self.arith;
        let mut multipliers: [A::C; LANES] = std::array::from_fn(|_| arith.zero());
        let mut used = 0;
        for (j, m) in multipliers.iter_mut().enumerate() {
            if lanes & (1 << j) == 0 {
                continue;
            }
            let entry = &mut self.acc[k * LANES + j];
            if arith.acc_is_zero(entry) {
                continue;
            }
            let c = arith.settle(entry);
            *entry = arith.acc_zero();
            if !arith.is_zero(&c) {
                // Pivots are monic: adding -c times the pivot's tail clears column k.
                *m = arith.neg(&c);
                used += 1;
            }
        }
        if used == 0 {
            return;
        }
        arith.axpy_lanes(
            &mut self.acc,
            &pivot.cols[1..],
            &pivot.coeffs[1..],
            &multipliers,
        );
        self.multiply_adds += used * (pivot.cols.len() - 1) as u64;
        self.spend_budget(k + 1);
    }

    /// Adds `multipliers[j]` times the row to lane j, for every lane.
    pub(super) fn add_multiples(&mut self, row: &Row<A::C>, multipliers: &[A::C; LANES]) {
        let arith = self.arith;
        arith.axpy_lanes(&mut self.acc, &row.cols, &row.coeffs, multipliers);
        self.spend_budget(0);
    }

    /// Counts one more `axpy_lanes` call; normalizes the entries from column `from` on when the
    /// accumulator could overflow at the next (entries before `from` are settled already).
    fn spend_budget(&mut self, from: usize) {
        self.budget -= 1;
        if self.budget == 0 {
            self.arith.normalize(&mut self.acc[from * LANES..]);
            self.budget = self.arith.headroom();
        }
    }

    /// The nonzero entries of `lane` from column `from` on; clears them.
    pub(super) fn extract(&mut self, lane: usize, from: usize) -> Entries<A::C> {
        let arith = self.arith;
        let (mut cols, mut coeffs) = (Vec::new(), Vec::new());
        let width = self.acc.len() / LANES;
        for k in from..width {
            let entry = &mut self.acc[k * LANES + lane];
            if arith.acc_is_zero(entry) {
                continue;
            }
            let c = arith.settle(entry);
            *entry = arith.acc_zero();
            if !arith.is_zero(&c) {
                cols.push(k as u32);
                coeffs.push(c);
            }
        }
        (cols, coeffs)
    }
}

/// Reduces each row by the known pivots (starting after the row's leading entry when
/// `skip_lead`); returns what is left of each row, sparse, in the order of `rows`.
///
/// Rows go into blocks by their first column: a block's rows then start together (a block
/// scans the pivots from its earliest start), and blocks come by decreasing work, which the
/// workers take in turn.
fn reduce_by_known<F: Field, A: Arith<F>>(
    arith: &A,
    width: usize,
    pivots: &[Option<&Row<A::C>>],
    rows: &[&Row<A::C>],
    skip_lead: bool,
    control: &Control,
    multiply_adds: &AtomicU64,
) -> Result<Vec<Entries<A::C>>> {
    let skip = usize::from(skip_lead);
    let first_column = |row: &Row<A::C>| row.cols.get(skip).map_or(width, |&c| c as usize);
    let mut order: Vec<usize> = (0..rows.len()).collect();
    order.sort_by_key(|&i| first_column(rows[i]));
    let sorted: Vec<&Row<A::C>> = order.iter().map(|&i| rows[i]).collect();
    let blocks: Vec<&[&Row<A::C>]> = sorted.chunks(LANES).collect();
    let reduced = map_items(
        &blocks,
        PARALLEL_MIN_ROWS / LANES,
        control,
        || LaneBlock::new(arith, width),
        |acc, block| {
            control.check()?;
            let pivot_of = |k: usize| pivots[k].map(|p| (p, ALL_LANES));
            Ok(reduce_block(acc, block, skip, pivot_of, multiply_adds))
        },
    );
    let mut out: Vec<Entries<A::C>> = (0..rows.len()).map(|_| Default::default()).collect();
    let mut reduced_rows = order.iter();
    for block in reduced {
        for entries in block? {
            out[*reduced_rows.next().expect("one result per row")] = entries;
        }
    }
    Ok(out)
}

/// Which lanes of a block a pivot may reduce: bit j for lane j.
pub(super) type LaneMask = u32;
pub(super) const ALL_LANES: LaneMask = (1 << LANES) - 1;

/// Up to LANES rows (lane j: `rows[j]`, from entry `skip` on) reduced together in `acc` by
/// the pivots `pivot_of` gives, each only in the lanes of its mask; returns what is left of
/// each row, sparse.
pub(super) fn reduce_block<'r, F: Field, A: Arith<F>>(
    acc: &mut LaneBlock<'_, F, A>,
    rows: &[&Row<A::C>],
    skip: usize,
    pivot_of: impl Fn(usize) -> Option<(&'r Row<A::C>, LaneMask)>,
    multiply_adds: &AtomicU64,
) -> Vec<Entries<A::C>>
where
    A::C: 'r,
{
    let width = acc.acc.len() / LANES;
    let mut start = width;
    for (lane, row) in rows.iter().enumerate() {
        if row.cols.len() > skip {
            acc.load(lane, &row.cols[skip..], &row.coeffs[skip..]);
            start = start.min(row.cols[skip] as usize);
        }
    }
    let before = acc.multiply_adds;
    for k in start..width {
        if let Some((pivot, lanes)) = pivot_of(k) {
            acc.eliminate(k, pivot, lanes);
        }
    }
    multiply_adds.fetch_add(acc.multiply_adds - before, Ordering::Relaxed);
    (0..rows.len())
        .map(|lane| acc.extract(lane, start))
        .collect()
}

/// Rows below which a matrix is reduced on the calling thread: waking the worker pool costs
/// more than it saves on small matrices, which is most of them for small systems.
pub(super) const PARALLEL_MIN_ROWS: usize = 64;

/// Reduces `rows` (over `width` columns) by `pivots`, installing a row as the pivot of its
/// leading column when that column has none yet; returns how many rows reduced to zero.
fn echelonize<F: Field, A: Arith<F>>(
    arith: &A,
    width: usize,
    rows: &[Row<A::C>],
    pivots: &[OnceLock<Row<A::C>>],
    control: &Control,
    multiply_adds: &AtomicU64,
) -> Result<usize> {
    let pivot_of = |k: usize| pivots[k].get();
    let zero: Vec<bool> = map_items(
        rows,
        PARALLEL_MIN_ROWS,
        control,
        || DenseRow::new(arith, width),
        |dense, row| {
            control.check()?;
            dense.load(&row.cols, &row.coeffs);
            let before = dense.multiply_adds;
            let mut from = row.cols[0] as usize;
            let is_zero = loop {
                let Some(k) = dense.sweep(from, &pivot_of) else {
                    break true;
                };
                let inv = arith.inv(&arith.settle(&dense.acc[k]));
                let (cols, coeffs) = dense.extract(k, Some(&inv), false);
                if pivots[k]
                    .set(Row {
                        cols,
                        coeffs: coeffs.into(),
                    })
                    .is_ok()
                {
                    dense.extract(k, None, true);
                    break false;
                }
                // Another worker took column k first: reduce by its row and go on.
                from = k;
            };
            multiply_adds.fetch_add(dense.multiply_adds - before, Ordering::Relaxed);
            Ok(is_zero)
        },
    )
    .into_iter()
    .collect::<Result<Vec<bool>>>()?;
    Ok(zero.iter().filter(|z| **z).count())
}

fn pivot_table<C>(matrix: &SymbolicMatrix<C>) -> Vec<Option<&Row<C>>> {
    let mut pivots = vec![None; matrix.columns.len()];
    for r in &matrix.reducers {
        pivots[r.cols[0] as usize] = Some(r);
    }
    pivots
}

/// The row space, beyond the known pivots, of the rows added to it so far: rows are reduced by
/// the known pivots, and what is left — in the columns without a known pivot, renumbered
/// densely — is echelonized against the new pivots installed before.
pub(super) struct NewPivots<'m, F: Field, A: Arith<F>> {
    arith: &'m A,
    width: usize,
    known: Vec<Option<&'m Row<A::C>>>,
    /// Matrix column of each free column, and free index of each matrix column (or u32::MAX).
    free_cols: Vec<u32>,
    free_index: Vec<u32>,
    pivots: Vec<OnceLock<Row<A::C>>>,
    rank: usize,
    zero_rows: usize,
    multiply_adds: AtomicU64,
    _f: PhantomData<F>,
}

impl<'m, F: Field, A: Arith<F>> NewPivots<'m, F, A> {
    pub(super) fn new(arith: &'m A, matrix: &'m SymbolicMatrix<A::C>) -> Self {
        let width = matrix.columns.len();
        let known = pivot_table(matrix);
        let free_cols: Vec<u32> = (0..width as u32)
            .filter(|&k| known[k as usize].is_none())
            .collect();
        let mut free_index = vec![u32::MAX; width];
        for (i, &k) in free_cols.iter().enumerate() {
            free_index[k as usize] = i as u32;
        }
        let pivots = (0..free_cols.len()).map(|_| OnceLock::new()).collect();
        NewPivots {
            arith,
            width,
            known,
            free_cols,
            free_index,
            pivots,
            rank: 0,
            zero_rows: 0,
            multiply_adds: AtomicU64::new(0),
            _f: PhantomData,
        }
    }

    /// Dimension of the row space beyond the known pivots found so far.
    pub(super) fn rank(&self) -> usize {
        self.rank
    }

    /// Multiply-adds spent so far (combinations formed outside count once `add_work` is called).
    pub(super) fn multiply_adds(&self) -> u64 {
        self.multiply_adds.load(Ordering::Relaxed)
    }

    /// Counts multiply-adds done elsewhere for this matrix (e.g. forming combinations).
    pub(super) fn add_work(&self, multiply_adds: u64) {
        self.multiply_adds
            .fetch_add(multiply_adds, Ordering::Relaxed);
    }

    /// Columns without a known pivot: a bound on the rank.
    pub(super) fn free_columns(&self) -> usize {
        self.free_cols.len()
    }

    /// Adds `rows` to the row space; returns how many of them lay in it already.
    pub(super) fn add(&mut self, rows: &[&Row<A::C>], control: &Control) -> Result<usize> {
        let left = reduce_by_known(
            self.arith,
            self.width,
            &self.known,
            rows,
            false,
            control,
            &self.multiply_adds,
        )?;
        let mut zero = left.iter().filter(|(cols, _)| cols.is_empty()).count();
        let mut remaining: Vec<Row<A::C>> = left
            .into_iter()
            .filter(|(cols, _)| !cols.is_empty())
            .map(|(cols, coeffs)| Row {
                cols: cols.iter().map(|&k| self.free_index[k as usize]).collect(),
                coeffs: Arc::from(coeffs),
            })
            .collect();
        remaining.sort_by_key(|r| r.cols[0]);
        zero += echelonize(
            self.arith,
            self.free_cols.len(),
            &remaining,
            &self.pivots,
            control,
            &self.multiply_adds,
        )?;
        self.rank += rows.len() - zero;
        self.zero_rows += zero;
        Ok(zero)
    }

    /// Reduces every new pivot by the later ones (back substitution), so that each has zeros in
    /// the other new pivots' columns: the reduced echelon form of the space, which does not
    /// depend on the rows that spanned it. The new basis elements get shorter tails, so later
    /// matrices need fewer reducers (katsura-10: 36% fewer multiply-adds in all; random
    /// combinations span the space by dense rows, which without this would enter the basis).
    /// Only for orders that compare degrees first: under lex, reducing a tail can raise its
    /// degree without bound, and the pairs' degrees then run away (noon-3 over GF(7) reached
    /// degree 4 366 instead of 36).
    ///
    /// In chunks from the last pivot backwards: a chunk's rows are first reduced in parallel by
    /// the rows after the chunk (already final), then by each other, last first.
    fn back_substitute(&mut self, control: &Control) -> Result<()> {
        let width = self.free_cols.len();
        let arith = self.arith;
        let leads: Vec<usize> = (0..width)
            .filter(|&k| self.pivots[k].get().is_some())
            .collect();
        let mut done: Vec<Option<Row<A::C>>> = (0..width).map(|_| None).collect();
        let work = AtomicU64::new(0);
        let mut dense = DenseRow::new(arith, width);
        for (number, chunk) in leads.rchunks(BACK_SUBSTITUTION_CHUNK).enumerate() {
            let rows: Vec<(usize, Row<A::C>)> = chunk
                .iter()
                .map(|&lead| (lead, self.pivots[lead].take().expect("installed pivot")))
                .collect();
            // The last chunk has no rows after it.
            let rows_after = number > 0;
            let by_later: Vec<Result<Row<A::C>>> = if !rows_after {
                rows.into_iter().map(|(_, row)| Ok(row)).collect()
            } else {
                map_items(
                    &rows,
                    2,
                    control,
                    || DenseRow::new(arith, width),
                    |dense, (lead, row)| {
                        control.check()?;
                        let reduced = reduce_fully(dense, *lead, row, &done);
                        work.fetch_add(std::mem::take(&mut dense.multiply_adds), Ordering::Relaxed);
                        Ok(reduced)
                    },
                )
            };
            for (i, row) in by_later.into_iter().enumerate().rev() {
                let row = reduce_within_chunk(&mut dense, chunk[i], &row?, &chunk[i + 1..], &done);
                done[chunk[i]] = Some(row);
            }
        }
        work.fetch_add(dense.multiply_adds, Ordering::Relaxed);
        self.multiply_adds
            .fetch_add(work.into_inner(), Ordering::Relaxed);
        for (slot, row) in self.pivots.iter_mut().zip(done) {
            if let Some(row) = row {
                let _ = slot.set(row);
            }
        }
        Ok(())
    }

    /// The new pivots, in the matrix's columns; in reduced echelon form when `back_substitute`.
    pub(super) fn finish(
        mut self,
        control: &Control,
        back_substitute: bool,
    ) -> Result<Echelon<A::C>> {
        if back_substitute {
            self.back_substitute(control)?;
        }
        let free_cols = self.free_cols;
        let rows = self
            .pivots
            .into_iter()
            .filter_map(OnceLock::into_inner)
            .map(|r| Row {
                cols: r.cols.iter().map(|&i| free_cols[i as usize]).collect(),
                coeffs: r.coeffs,
            })
            .collect();
        Ok(Echelon {
            rows,
            zero_rows: self.zero_rows,
            multiply_adds: self.multiply_adds.into_inner(),
        })
    }
}

/// Pivot rows back-substituted together (in parallel) before the next chunk.
const BACK_SUBSTITUTION_CHUNK: usize = 32;

/// `row` (monic, leading column `lead`) with every entry after its lead that has a pivot in
/// `pivots` eliminated.
fn reduce_fully<F: Field, A: Arith<F>>(
    dense: &mut DenseRow<'_, F, A>,
    lead: usize,
    row: &Row<A::C>,
    pivots: &[Option<Row<A::C>>],
) -> Row<A::C> {
    dense.load(&row.cols[1..], &row.coeffs[1..]);
    dense.sweep_all(lead + 1, &|k: usize| pivots[k].as_ref());
    monic_row(dense, lead)
}

/// `row` (monic, leading column `lead`, already reduced by every pivot after its chunk)
/// reduced by the final rows of the pivots after it in its own chunk, whose leading columns are
/// `later` (increasing). Only those columns can still hold entries with a pivot, and a final row
/// has none at the columns of the pivots after it: one pass over `later` suffices, where
/// [`reduce_fully`] would sweep every column.
fn reduce_within_chunk<F: Field, A: Arith<F>>(
    dense: &mut DenseRow<'_, F, A>,
    lead: usize,
    row: &Row<A::C>,
    later: &[usize],
    pivots: &[Option<Row<A::C>>],
) -> Row<A::C> {
    dense.load(&row.cols[1..], &row.coeffs[1..]);
    let pivot_of = |k: usize| pivots[k].as_ref();
    for &k in later {
        dense.eliminate(k, &pivot_of);
    }
    monic_row(dense, lead)
}

/// The row with leading entry one at `lead` and the accumulator's entries after it as tail
/// (which it clears).
fn monic_row<F: Field, A: Arith<F>>(dense: &mut DenseRow<'_, F, A>, lead: usize) -> Row<A::C> {
    let (cols, coeffs) = dense.extract(lead + 1, None, true);
    Row {
        cols: std::iter::once(lead as u32).chain(cols).collect(),
        coeffs: std::iter::once(dense.arith.one()).chain(coeffs).collect(),
    }
}

/// The new pivots of the matrix: the new rows reduced by the known pivots, then echelonized,
/// then reduced by each other when `back_substitute`.
pub fn reduce_new_rows<F: Field, A: Arith<F>>(
    arith: &A,
    matrix: &SymbolicMatrix<A::C>,
    control: &Control,
    back_substitute: bool,
) -> Result<Echelon<A::C>> {
    let mut space = NewPivots::new(arith, matrix);
    let rows: Vec<&Row<A::C>> = matrix.new_rows.iter().collect();
    space.add(&rows, control)?;
    space.finish(control, back_substitute)
}

/// The multipliers of a combination of known pivots: (reducer index, multiplier).
pub type Combination<C> = Vec<(u32, C)>;

/// For each new row of `matrix`: the multipliers c_k with row = Σ c_k · reducers[k], found by
/// reducing the row by the known pivots alone, or `None` when the row does not reduce to zero
/// that way (the known pivots must be monic). Used to check a basis: a row reduces to zero
/// exactly when it is such a combination.
pub fn combinations<F: Field, A: Arith<F>>(
    arith: &A,
    matrix: &SymbolicMatrix<A::C>,
    control: &Control,
) -> Result<Vec<Option<Combination<A::C>>>> {
    let width = matrix.columns.len();
    let mut pivot_index = vec![u32::MAX; width];
    for (i, r) in matrix.reducers.iter().enumerate() {
        pivot_index[r.cols[0] as usize] = i as u32;
    }
    map_items(
        &matrix.new_rows,
        PARALLEL_MIN_ROWS,
        control,
        || DenseRow::new(arith, width),
        |dense, row| {
            control.check()?;
            dense.load(&row.cols, &row.coeffs);
            let mut used = Vec::new();
            let first = row.cols[0] as usize;
            for (k, &i) in pivot_index.iter().enumerate().skip(first) {
                if arith.acc_is_zero(&dense.acc[k]) {
                    continue;
                }
                let c = arith.settle(&dense.acc[k]);
                dense.acc[k] = arith.acc_zero();
                if arith.is_zero(&c) {
                    continue;
                }
                if i == u32::MAX {
                    dense.extract(k, None, true);
                    return Ok(None);
                }
                let pivot = &matrix.reducers[i as usize];
                dense.add_multiple(&pivot.cols[1..], &pivot.coeffs[1..], &arith.neg(&c), k);
                used.push((i, c));
            }
            Ok(Some(used))
        },
    )
    .into_iter()
    .collect()
}

/// Fully reduces the tails of the first `count` known pivots by all known pivots: with the
/// matrix closed under symbolic preprocessing, each result has no entry in a pivot column
/// other than its leading one. Returns monic rows, in the order of the known pivots.
pub fn reduce_tails<F: Field, A: Arith<F>>(
    arith: &A,
    matrix: &SymbolicMatrix<A::C>,
    count: usize,
    control: &Control,
) -> Result<Vec<Row<A::C>>> {
    let pivots = pivot_table(matrix);
    let multiply_adds = AtomicU64::new(0);
    let rows: Vec<&Row<A::C>> = matrix.reducers[..count].iter().collect();
    let tails = reduce_by_known(
        arith,
        matrix.columns.len(),
        &pivots,
        &rows,
        true,
        control,
        &multiply_adds,
    )?;
    Ok(rows
        .iter()
        .zip(tails)
        .map(|(row, (cols, coeffs))| Row {
            cols: std::iter::once(row.cols[0]).chain(cols).collect(),
            coeffs: std::iter::once(arith.one()).chain(coeffs).collect(),
        })
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;
    use crate::groebner::f4::arith::SmallPrime;

    #[test]
    fn a_pivot_reduces_only_the_lanes_of_its_mask() {
        // Over GF(7), both lanes hold x0 + x1 and the pivot is x0 + 3·x2: the lane it may
        // reduce becomes x1 - 3·x2 = x1 + 4·x2, the other keeps its row.
        let arith = SmallPrime::<u32>::new(7);
        let row = |cols: Vec<u32>, coeffs: Vec<u32>| Row {
            cols,
            coeffs: coeffs.into(),
        };
        let pivot = row(vec![0, 2], vec![1, 3]);
        let lane_row = row(vec![0, 1], vec![1, 1]);
        let rows = [&lane_row, &lane_row];
        let work = AtomicU64::new(0);
        for (mask, expected) in [
            (0b10, [(vec![0, 1], vec![1, 1]), (vec![1, 2], vec![1, 4])]),
            (
                ALL_LANES,
                [(vec![1, 2], vec![1, 4]), (vec![1, 2], vec![1, 4])],
            ),
        ] {
            let mut acc = LaneBlock::<PrimeField, _>::new(&arith, 3);
            let pivot_of = |k: usize| (k == 0).then_some((&pivot, mask));
            assert_eq!(
                reduce_block(&mut acc, &rows, 0, pivot_of, &work),
                expected,
                "mask {mask:b}"
            );
        }
    }
}
