//! The hybrid method: guess the values of k variables and run the Gröbner engine on each of the
//! 2^k specialized systems (Bettale, Faugère and Perret 2009). Guessing makes the systems
//! overdetermined, which lowers the degree the engine reaches; the 2^k runs are independent and
//! share the threads.
//!
//! Each specialized system keeps the guessed variables, fixed by the linear equations
//! x_v = a_v, so that its basis describes points of the whole space: the solutions of the
//! system are the union over the guesses of the solutions of the specialized ones.

use super::f4;
use super::monomial::{sum_of, Bits, BoolOrder};
use super::solutions;
use crate::control::Control;
use crate::error::{Error, Result};
use num_bigint::BigUint;
use rayon::prelude::*;
use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

/// Most variables the hybrid guesses (2^24 engine runs).
pub const MAX_GUESS: usize = 24;

/// The solutions found by guessing: points (bit v = x_v, sorted, at most `limit`), the total
/// count when every guess was finished, and the number of engine runs.
pub struct Guessed<const W: usize> {
    pub points: Vec<Bits<W>>,
    pub count: Option<BigUint>,
    pub runs: usize,
}

/// One guess's outcome: its points and count (`None`: skipped after the limit was reached).
type Outcome<const W: usize> = Option<(Vec<Bits<W>>, BigUint)>;

/// `gens` with each guessed variable `guessed[i]` set to bit i of `guess`, plus the equations
/// fixing them.
fn specialize<const W: usize>(
    order: BoolOrder,
    gens: &[Vec<Bits<W>>],
    guessed: &[usize],
    guess: u64,
) -> Vec<Vec<Bits<W>>> {
    let (mut ones, mut zeros) = (Bits::<W>::ONE, Bits::<W>::ONE);
    for (i, &v) in guessed.iter().enumerate() {
        if guess >> i & 1 == 1 {
            ones = ones.union(&Bits::var(v));
        } else {
            zeros = zeros.union(&Bits::var(v));
        }
    }
    let mut out: Vec<Vec<Bits<W>>> = gens
        .iter()
        .map(|g| {
            let monos = g
                .iter()
                .filter(|m| m.coprime(&zeros))
                .map(|m| m.minus(&ones))
                .collect();
            sum_of(order, monos)
        })
        .filter(|g| !g.is_empty())
        .collect();
    for (i, &v) in guessed.iter().enumerate() {
        let mut fix = vec![Bits::var(v)];
        if guess >> i & 1 == 1 {
            fix.push(Bits::ONE);
        }
        out.push(fix);
    }
    out
}

/// Solves `gens` by guessing the variables `guessed`: all points (at most `limit`; none kept
/// when `count_only`), on the threads of the current rayon pool.
pub fn solve<const W: usize>(
    order: BoolOrder,
    nvars: usize,
    gens: &[Vec<Bits<W>>],
    guessed: &[usize],
    limit: Option<usize>,
    count_only: bool,
    control: &Control,
) -> Result<Guessed<W>> {
    if guessed.len() > MAX_GUESS {
        return Err(Error::invalid(format!(
            "the hybrid method guesses at most {MAX_GUESS} variables, not {}",
            guessed.len()
        )));
    }
    if let Some(&v) = guessed.iter().find(|&&v| v >= nvars) {
        return Err(Error::invalid(format!(
            "guessed variable index {v} out of range"
        )));
    }
    let limit = if count_only { None } else { limit };
    let stop = AtomicBool::new(false);
    let kept = AtomicUsize::new(0);
    let runs: Vec<Result<Outcome<W>>> = (0..1u64 << guessed.len())
        .into_par_iter()
        .map(|guess| {
            if stop.load(Ordering::Relaxed) {
                return Ok(None);
            }
            let system = specialize(order, gens, guessed, guess);
            let (basis, _) = f4::compute(order, nvars, &system, control)?;
            let leads: Vec<Bits<W>> = basis.iter().map(|p| p[0]).collect();
            let count = solutions::count_standard(&leads, nvars, control)?;
            if count_only || count == BigUint::ZERO {
                return Ok(Some((Vec::new(), count)));
            }
            let wanted = limit.map(|l| l.saturating_sub(kept.load(Ordering::Relaxed)));
            let points = solutions::points(order, nvars, basis, wanted, control)?;
            if let Some(l) = limit {
                if kept.fetch_add(points.len(), Ordering::Relaxed) + points.len() >= l {
                    stop.store(true, Ordering::Relaxed);
                }
            }
            Ok(Some((points, count)))
        })
        .collect();
    let mut points = Vec::new();
    let mut count = BigUint::ZERO;
    let mut complete = true;
    for run in runs {
        match run? {
            Some((p, c)) => {
                points.extend(p);
                count += c;
            }
            None => complete = false,
        }
    }
    points.sort_unstable_by(|a, b| a.0.iter().rev().cmp(b.0.iter().rev()));
    if let Some(l) = limit {
        if points.len() >= l {
            complete = false;
            points.truncate(l);
        }
    }
    Ok(Guessed {
        points,
        count: complete.then_some(count),
        runs: 1 << guessed.len(),
    })
}
