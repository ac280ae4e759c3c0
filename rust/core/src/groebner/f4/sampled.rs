//! The new pivots of an F4 matrix from random linear combinations of its new rows, for matrices
//! whose new rows are mostly linearly dependent (typically most of them reduce to zero once the
//! basis nears completion).
//!
//! Only the row space matters: its echelon form, hence the new basis elements, does not depend
//! on which spanning rows produced it. So instead of reducing all m new rows by the known
//! pivots (the expensive part), we reduce batches of random combinations Σ r_i·row_i, each r_i
//! drawn uniformly from a set T of field elements, and echelonize what is left. While the rows
//! found so far span a proper subspace S of the new rows' space V (modulo the known pivots),
//! there is a linear form vanishing on S but not on V; it is a nonzero linear polynomial in the
//! r_i, so a fresh combination lies in S with probability at most 1/|T| (Schwartz 1980;
//! Zippel 1979). A batch of b fresh combinations that all lie in S therefore proves S = V up to
//! a probability of |T|^-b; batches are at least as large as needed for |T|^-b ≤ 2^-80.
//!
//! The result is then, with that probability, exactly the exact reduction's (same new pivots,
//! same basis); the failure case would lose basis elements, never add wrong ones, since every
//! combination lies in the ideal. When the rank found reaches the number of new rows or of free
//! columns, the space is complete for certain. Sampling stops paying when the rank is a large
//! share of the rows; then the remaining rows are reduced exactly (deterministic), after the
//! pivots already found.

use super::arith::{Arith, LANES};
use super::linalg::{reduce_new_rows, Echelon, LaneBlock, NewPivots};
use super::parallel::map_items;
use super::symbolic::{Row, SymbolicMatrix};
use super::Sampling;
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::rng::Rng;

/// Failure probability allowed per matrix: 2^-SECURITY_BITS.
const SECURITY_BITS: f64 = 80.0;

/// Combinations per batch while the rank is still growing.
const BATCH: usize = 16;

/// Rows of the matrix reduced first, to price the exact method.
const SAMPLE_ROWS: usize = 16;

/// The new pivots of `matrix`, from random combinations of its new rows (see the module doc),
/// in reduced echelon form when `back_substitute` (see `NewPivots::finish`);
/// exact when the field is infinite or the matrix has fewer than `sampling.min_rows` new rows.
/// `rank_share` is the share of new rows that were independent in the previous matrix, if
/// known: it predicts this matrix's rank, so that matrices of high rank, where sampling cannot
/// pay, go to the exact method early.
pub fn reduce_new_rows_sampled<F: Field, A: Arith<F>>(
    arith: &A,
    matrix: &SymbolicMatrix<A::C>,
    control: &Control,
    (sampling, rng): (&Sampling, &mut Rng),
    rank_share: Option<f64>,
    back_substitute: bool,
) -> Result<Echelon<A::C>> {
    let rows = &matrix.new_rows;
    let Some(space_size) = arith.sample_space() else {
        return reduce_new_rows(arith, matrix, control, back_substitute);
    };
    if rows.len() < sampling.min_rows.max(1) || space_size < 2 {
        return reduce_new_rows(arith, matrix, control, back_substitute);
    }
    // Fresh combinations that must all lie in the space found for it to be accepted.
    let proof = (SECURITY_BITS / (space_size as f64).log2()).ceil() as usize;
    let mut space = NewPivots::new(arith, matrix);
    let bound = rows.len().min(space.free_columns());
    let mut fallback = sampling
        .exact_fallback
        .then(|| ExactPrice::measure(&mut space, rows, rng, rank_share, control))
        .transpose()?;

    let row_entries: u64 = rows.iter().map(|r| r.cols.len() as u64).sum();
    let mut batch = BATCH.max(proof);
    while space.rank() < bound {
        let before = space.multiply_adds();
        let combos = combinations(arith, matrix, batch, rng, control)?;
        space.add_work(batch as u64 * row_entries);
        let combo_refs: Vec<&Row<A::C>> = combos.iter().collect();
        let already_spanned = space.add(&combo_refs, control)?;
        if already_spanned == batch {
            break; // the space is complete except with probability ≤ space_size^-proof ≤ 2^-80
        }
        // Some combinations already in the space: it is probably complete, and `proof` fresh
        // ones check it. None: the rank is still growing.
        let drawn = batch;
        batch = if already_spanned > 0 {
            proof
        } else {
            BATCH.max(proof)
        };
        if let Some(price) = &mut fallback {
            let spent = (space.multiply_adds() - before) as f64;
            if price.gives_way(spent, drawn, space.rank(), batch) {
                let rest: Vec<&Row<A::C>> = (0..rows.len())
                    .filter(|i| price.sample.binary_search(i).is_err())
                    .map(|i| &rows[i])
                    .collect();
                space.add(&rest, control)?;
                break;
            }
        }
    }
    space.finish(control, back_substitute)
}

/// What the exact method would cost on the rest of a matrix, and what sampling has spent.
struct ExactPrice {
    /// Rows reduced to price the exact method (they count towards the space too), increasing.
    sample: Vec<usize>,
    exact_rest: f64,
    predicted_rank: f64,
    spent: f64,
    drawn: usize,
}

impl ExactPrice {
    /// Reduces a random sample of the rows themselves: it prices the exact method per row.
    fn measure<F: Field, A: Arith<F>>(
        space: &mut NewPivots<'_, F, A>,
        rows: &[Row<A::C>],
        rng: &mut Rng,
        rank_share: Option<f64>,
        control: &Control,
    ) -> Result<Self> {
        let count = SAMPLE_ROWS.min(rows.len());
        let sample = stratified_sample(rows, count, rng);
        let sample_rows: Vec<&Row<A::C>> = sample.iter().map(|&i| &rows[i]).collect();
        space.add(&sample_rows, control)?;
        let row_cost = space.multiply_adds() as f64 / count as f64;
        Ok(ExactPrice {
            sample,
            exact_rest: row_cost * (rows.len() - count) as f64,
            predicted_rank: rank_share.map_or(0.0, |share| share * rows.len() as f64),
            spent: 0.0,
            drawn: 0,
        })
    }

    /// After a batch of `drawn` combinations that cost `spent`: whether to finish exactly,
    /// because sampling up to the predicted rank would cost more than reducing the remaining
    /// rows, or has already wasted half of that.
    fn gives_way(&mut self, spent: f64, drawn: usize, rank: usize, next_batch: usize) -> bool {
        self.spent += spent;
        self.drawn += drawn;
        let combo_cost = self.spent / self.drawn as f64;
        let to_go = (self.predicted_rank - rank as f64).max(0.0) + next_batch as f64;
        to_go * combo_cost > self.exact_rest || self.spent > self.exact_rest / 2.0
    }
}

/// `count` distinct row indices (count ≤ rows), one drawn at random from each of `count` equal
/// strata of the rows ordered by leading column, in increasing order. What a row costs to reduce
/// depends mostly on how far left it starts, so stratifying by it steadies the price estimate.
fn stratified_sample<C>(rows: &[Row<C>], count: usize, rng: &mut Rng) -> Vec<usize> {
    let mut by_lead: Vec<usize> = (0..rows.len()).collect();
    by_lead.sort_by_key(|&i| rows[i].cols.first().copied().unwrap_or(u32::MAX));
    let mut chosen: Vec<usize> = (0..count)
        .map(|s| {
            let (start, end) = (s * rows.len() / count, (s + 1) * rows.len() / count);
            by_lead[start + rng.below((end - start) as u64) as usize]
        })
        .collect();
    chosen.sort_unstable();
    chosen
}

/// `count` random combinations of the new rows, as sparse rows; LANES of them are formed
/// together, so each new row is read once per LANES combinations.
fn combinations<F: Field, A: Arith<F>>(
    arith: &A,
    matrix: &SymbolicMatrix<A::C>,
    count: usize,
    rng: &mut Rng,
    control: &Control,
) -> Result<Vec<Row<A::C>>> {
    let space_size = arith.sample_space().expect("finite sample space");
    // Drawn here, in order, so that a seed reproduces the run whatever the thread count.
    let lane_groups: Vec<usize> = (0..count)
        .step_by(LANES)
        .map(|first| LANES.min(count - first))
        .collect();
    let multipliers: Vec<Vec<[A::C; LANES]>> = lane_groups
        .iter()
        .map(|&lanes| {
            (0..matrix.new_rows.len())
                .map(|_| {
                    std::array::from_fn(|j| match j < lanes {
                        true => arith.element(rng.below(space_size)),
                        false => arith.zero(),
                    })
                })
                .collect()
        })
        .collect();
    let width = matrix.columns.len();
    let groups = map_items(
        &multipliers,
        2,
        control,
        || LaneBlock::new(arith, width),
        |block, multipliers| {
            control.check()?;
            for (row, m) in matrix.new_rows.iter().zip(multipliers) {
                block.add_multiples(row, m);
            }
            Ok((0..LANES)
                .map(|lane| block.extract(lane, 0))
                .collect::<Vec<_>>())
        },
    );
    let mut combos = Vec::with_capacity(count);
    for (group, lanes) in groups.into_iter().zip(lane_groups) {
        combos.extend(group?.into_iter().take(lanes).map(|(cols, coeffs)| Row {
            cols,
            coeffs: coeffs.into(),
        }));
    }
    Ok(combos)
}
