//! Row echelon form of an F4 matrix by the known-pivot / new-row split of Faugère and Lachartre
//! (2010): the reducer rows already have distinct leading columns (the "known pivots"), so
//! 1. every new row is reduced by the known pivots alone: rows are independent, reduced in
//!    parallel, each in a dense accumulator with delayed modular reduction (see `arith`);
//! 2. what is left lives in the columns without a known pivot, a much smaller matrix, which is
//!    echelonized: rows are again reduced in parallel, and a row whose leading column has no pivot
//!    yet installs itself as that column's pivot (a lock-free race: the loser keeps reducing).
//!
//! The rows installed in step 2 are the new basis elements: their leading monomials are exactly
//! the leading monomials of the row space that are not leading monomials of the known pivots.

use super::arith::Arith;
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

/// What a column of an accumulator holds after `Dense::eliminate`.
#[derive(PartialEq, Eq)]
enum Entry {
    Zero,
    /// A nonzero entry in a column without pivot.
    Free,
}

/// A sparse row under construction: columns and coefficients.
type Entries<C> = (Vec<u32>, Vec<C>);

/// One worker's dense accumulator.
struct Dense<'a, F: Field, A: Arith<F>> {
    arith: &'a A,
    acc: Vec<A::A>,
    /// Multiply-adds the accumulator can still take before it must be normalized.
    budget: u64,
    multiply_adds: u64,
    _f: PhantomData<F>,
}

impl<'a, F: Field, A: Arith<F>> Dense<'a, F, A> {
    fn new(arith: &'a A, width: usize) -> Self {
        let acc = vec![arith.acc_zero(); width];
        Dense {
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
        arith.axpy(
            &mut self.acc,
            &pivot.cols[1..],
            &pivot.coeffs[1..],
            &arith.neg(&c),
        );
        self.acc[k] = arith.acc_zero();
        self.multiply_adds += (pivot.cols.len() - 1) as u64;
        self.budget -= 1;
        if self.budget == 0 {
            arith.normalize(&mut self.acc[k + 1..]);
            self.budget = arith.headroom();
        }
        Entry::Zero
    }

    /// The nonzero entries from column `from` on, times `scale`; clears them when `clear`.
    fn extract(&mut self, from: usize, scale: Option<&A::C>, clear: bool) -> Entries<A::C> {
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

/// Rows reduced together by the known pivots: each pivot row is then read once per block rather
/// than once per row, so it comes from cache for all but the first (the pivot rows of a large
/// matrix are many megabytes, far more than a core's cache, while a block of accumulators fits).
const BLOCK_ROWS: usize = 8;

/// Reduces each row by the known pivots (starting after the row's leading entry when
/// `skip_lead`); returns what is left of each row, sparse.
fn reduce_by_known<F: Field, A: Arith<F>>(
    arith: &A,
    width: usize,
    pivots: &[Option<&Row<A::C>>],
    rows: &[&Row<A::C>],
    skip_lead: bool,
    control: &Control,
    multiply_adds: &AtomicU64,
) -> Result<Vec<Entries<A::C>>> {
    let pivot_of = |k: usize| pivots[k];
    let skip = usize::from(skip_lead);
    let blocks: Vec<&[&Row<A::C>]> = rows.chunks(BLOCK_ROWS).collect();
    let reduced = map_items(
        &blocks,
        PARALLEL_MIN_ROWS / BLOCK_ROWS,
        control,
        || Vec::<Dense<F, A>>::new(),
        |dense, block| {
            control.check()?;
            while dense.len() < block.len() {
                dense.push(Dense::new(arith, width));
            }
            let mut start = width;
            for (d, row) in dense.iter_mut().zip(block.iter()) {
                if row.cols.len() > skip {
                    d.load(&row.cols[skip..], &row.coeffs[skip..]);
                    start = start.min(row.cols[skip] as usize);
                }
            }
            let block_dense = &mut dense[..block.len()];
            let before: u64 = block_dense.iter().map(|d| d.multiply_adds).sum();
            for k in start..width {
                for d in block_dense.iter_mut() {
                    d.eliminate(k, &pivot_of);
                }
            }
            let after: u64 = block_dense.iter().map(|d| d.multiply_adds).sum();
            multiply_adds.fetch_add(after - before, Ordering::Relaxed);
            Ok(block_dense
                .iter_mut()
                .map(|d| d.extract(start, None, true))
                .collect::<Vec<_>>())
        },
    );
    let mut out = Vec::with_capacity(rows.len());
    for block in reduced {
        out.extend(block?);
    }
    Ok(out)
}

/// Rows below which a matrix is reduced on the calling thread: waking the worker pool costs
/// more than it saves on small matrices, which is most of them for small systems.
const PARALLEL_MIN_ROWS: usize = 64;

/// Echelonizes `rows` (over `width` columns, no pivots known); returns the installed pivots and
/// the number of rows that reduced to zero.
fn echelonize<F: Field, A: Arith<F>>(
    arith: &A,
    width: usize,
    rows: &[Row<A::C>],
    control: &Control,
    multiply_adds: &AtomicU64,
) -> Result<(Vec<Row<A::C>>, usize)> {
    let pivots: Vec<OnceLock<Row<A::C>>> = (0..width).map(|_| OnceLock::new()).collect();
    let pivot_of = |k: usize| pivots[k].get();
    let zero: Vec<bool> = map_items(
        rows,
        PARALLEL_MIN_ROWS,
        control,
        || Dense::new(arith, width),
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
    .collect::<Result<_>>()?;
    let installed = pivots
        .into_iter()
        .filter_map(OnceLock::into_inner)
        .collect();
    Ok((installed, zero.iter().filter(|z| **z).count()))
}

fn pivot_table<C>(matrix: &SymbolicMatrix<C>) -> Vec<Option<&Row<C>>> {
    let mut pivots = vec![None; matrix.columns.len()];
    for r in &matrix.reducers {
        pivots[r.cols[0] as usize] = Some(r);
    }
    pivots
}

/// The new pivots of the matrix: the new rows reduced by the known pivots, then echelonized.
pub fn reduce_new_rows<F: Field, A: Arith<F>>(
    arith: &A,
    matrix: &SymbolicMatrix<A::C>,
    control: &Control,
) -> Result<Echelon<A::C>> {
    let width = matrix.columns.len();
    let pivots = pivot_table(matrix);
    let multiply_adds = AtomicU64::new(0);
    let new_rows: Vec<&Row<A::C>> = matrix.new_rows.iter().collect();
    let left = reduce_by_known(
        arith,
        width,
        &pivots,
        &new_rows,
        false,
        control,
        &multiply_adds,
    )?;

    // The remaining matrix lives in the columns without a known pivot; renumber them densely.
    let free_cols: Vec<u32> = (0..width as u32)
        .filter(|&k| pivots[k as usize].is_none())
        .collect();
    let mut free_index = vec![u32::MAX; width];
    for (i, &k) in free_cols.iter().enumerate() {
        free_index[k as usize] = i as u32;
    }
    let mut zero_rows = left.iter().filter(|(cols, _)| cols.is_empty()).count();
    let mut remaining: Vec<Row<A::C>> = left
        .into_iter()
        .filter(|(cols, _)| !cols.is_empty())
        .map(|(cols, coeffs)| Row {
            cols: cols.iter().map(|&k| free_index[k as usize]).collect(),
            coeffs: Arc::from(coeffs),
        })
        .collect();
    remaining.sort_by_key(|r| r.cols[0]);
    let (installed, zero) =
        echelonize(arith, free_cols.len(), &remaining, control, &multiply_adds)?;
    zero_rows += zero;
    let rows = installed
        .into_iter()
        .map(|r| Row {
            cols: r.cols.iter().map(|&i| free_cols[i as usize]).collect(),
            coeffs: r.coeffs,
        })
        .collect();
    Ok(Echelon {
        rows,
        zero_rows,
        multiply_adds: multiply_adds.into_inner(),
    })
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
