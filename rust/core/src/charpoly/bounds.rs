//! Degree bounds for the coefficients of det(x·Id - A) over k[T], which decide how many
//! interpolation points are needed: in each t_i, the least of the row sums and column sums of
//! the entries' degrees (each term of the determinant takes one entry per row and per column)
//! and of the cycle bound; in total degree, the coefficient of x^{r-k} is a sum of products of
//! entries along disjoint cycles through k indices, so its degree is at most ⌊k·λ*⌋ with λ* the
//! largest mean degree of a cycle, computed by Karp's theorem (Karp 1978).

use super::interpolation::LowerSet;
use crate::field::Field;
use crate::poly::{Poly, Ring};

/// Largest number of values (grid points × coefficients) interpolation may hold.
const MAX_INTERPOLATION_VALUES: u64 = 20_000_000;

/// A cycle mean λ* as a fraction (numerator, denominator); `None` when the graph has no cycle.
pub(super) type CycleMean = Option<(i64, i64)>;

/// The points that determine the coefficients: the lower set of exponents under the degree
/// bounds in each t_i and in total, and the largest cycle mean of the entries' total degrees
/// (the total degree of the coefficient of x^k is at most ⌊(r - k)·λ*⌋).
pub(super) struct Grid {
    /// bounds[i]: the degree bound in t_i; interpolation needs bounds[i] + 1 distinct points.
    pub(super) bounds: Vec<u64>,
    pub(super) set: LowerSet,
    pub(super) mean: CycleMean,
}

/// The interpolation grid, when it is small enough; `None` otherwise.
pub(super) fn interpolation_grid<F: Field>(ring: &Ring<F>, a: &[Vec<Poly<F>>]) -> Option<Grid> {
    let d = ring.nvars();
    let r = a.len();
    let degree_in = |p: &Poly<F>, i: usize| {
        p.terms()
            .iter()
            .map(|(m, _)| u64::from(m.exponents()[i]))
            .max()
            .unwrap_or(0)
    };
    let total = |p: &Poly<F>| p.degree().map(u64::from);
    let total_mean = largest_cycle_mean(
        &a.iter()
            .map(|row| row.iter().map(total).collect())
            .collect::<Vec<_>>(),
    );
    let total_bound = cycle_bound(total_mean, r);
    let bounds: Vec<u64> = (0..d)
        .map(|i| {
            let rows: u64 = a
                .iter()
                .map(|row| row.iter().map(|p| degree_in(p, i)).max().unwrap_or(0))
                .sum();
            let cols: u64 = (0..r)
                .map(|k| a.iter().map(|row| degree_in(&row[k], i)).max().unwrap_or(0))
                .sum();
            let in_i = |p: &Poly<F>| (!p.is_zero()).then(|| degree_in(p, i));
            let cycles = cycle_bound(
                largest_cycle_mean(
                    &a.iter()
                        .map(|row| row.iter().map(in_i).collect())
                        .collect::<Vec<_>>(),
                ),
                r,
            );
            rows.min(cols).min(cycles).min(total_bound)
        })
        .collect();
    let points = bounds
        .iter()
        .try_fold(1u64, |acc, &b| acc.checked_mul(b + 1))?;
    (points.checked_mul(r as u64 + 1)? <= MAX_INTERPOLATION_VALUES).then(|| Grid {
        set: LowerSet::new(&bounds, total_bound),
        bounds,
        mean: total_mean,
    })
}

/// The largest mean degree λ* of a cycle, given the degree of each entry (`None` for a zero
/// entry): each term of the coefficient of x^{r-k} in det(x·Id - A) is a product of entries
/// along disjoint cycles through k indices, so its degree is at most ⌊k·λ*⌋ (see
/// [`cycle_bound`]). Karp's theorem (Karp 1978) computes λ* from the heaviest walks with
/// exactly j edges: λ* = max_v min_j (W_r(v) - W_j(v)) / (r - j).
fn largest_cycle_mean(degrees: &[Vec<Option<u64>>]) -> CycleMean {
    let r = degrees.len();
    // walks[j][v]: largest degree of a walk of exactly j edges ending at v (None: no walk).
    let mut walks: Vec<Vec<Option<i64>>> = vec![vec![Some(0); r]];
    for j in 1..=r {
        let next = (0..r)
            .map(|v| {
                (0..r)
                    .filter_map(|u| Some(walks[j - 1][u]? + degrees[u][v]? as i64))
                    .max()
            })
            .collect();
        walks.push(next);
    }
    // Largest over v of the smallest ratio, compared exactly as fractions (numerator, denominator).
    let mut best: Option<(i64, i64)> = None;
    #[allow(clippy::needless_range_loop)] // v indexes every walk length's row, not one slice
    for v in 0..r {
        let Some(last) = walks[r][v] else { continue };
        let ratio = (0..r)
            .filter_map(|j| walks[j][v].map(|w| (last - w, (r - j) as i64)))
            .min_by(|a, b| {
                (i128::from(a.0) * i128::from(b.1)).cmp(&(i128::from(b.0) * i128::from(a.1)))
            });
        if let Some(q) = ratio {
            if best.is_none_or(|b| {
                i128::from(q.0) * i128::from(b.1) > i128::from(b.0) * i128::from(q.1)
            }) {
                best = Some(q);
            }
        }
    }
    best
}

/// ⌊k·λ*⌋: the degree bound of the coefficient of x^{r-k}, k ≤ r (0 without cycles).
pub(super) fn cycle_bound(mean: CycleMean, k: usize) -> u64 {
    mean.map_or(0, |(num, den)| {
        u64::try_from((k as i64 * num).div_euclid(den)).unwrap_or(0)
    })
}
