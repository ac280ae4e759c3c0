//! The automatic choice between signature-based and plain F4, per system and per step.
//!
//! The signature criteria (Faugère 2002; see [`super::signature`]) remove almost every row that
//! would reduce to zero, which is most of plain F4's work on systems whose degrees never fall
//! (katsura-n: 2.5x faster at n = 11). Where degrees fall, the signature engine must work in the
//! homogenized ideal above the degrees plain F4 needs, and loses by up to 20x. So:
//! - more equations than unknowns: plain F4 from the start (the homogeneous parts of the
//!   equations cannot form a regular sequence, degrees fall, on dense random systems only at the
//!   last step, after the signature engine has paid for all the others);
//! - otherwise the signature engine runs while degrees do not fall. When they fall at once (at
//!   most one above the highest degree of the equations: eco-n), plain F4 starts afresh.
//! - A fall late in the run, at a step with fewer than half the J-pairs of the largest step
//!   so far (the run is past its peak: noon-n, whose degrees fall in its last steps), is left
//!   to the signature engine: the few pairs after it are small steps for it, while plain F4
//!   would begin with every pair of lower degree that involves the fallen elements (noon-7:
//!   one matrix of 20,583 x 22,447 for a single new element).
//! - After any other fall (the first step that finds an element of lower degree than its
//!   homogeneous degree), plain F4 goes on from the elements found so far: they form a
//!   Gröbner basis of the homogenized ideal up to that step's degree, so every pair of sugar
//!   up to that degree already has a standard representation (dehomogenizing keeps leading
//!   monomials in an order that compares degrees first) and F4 drops those pairs (as in the
//!   sugar-truncated bases of Giovini, Mora, Niesi, Robbiano and Traverso 1991).
//!
//! The choice is recorded in [`Stats::choice`] and per step in [`StepStats::signatures`].
//!
//! [`StepStats::signatures`]: crate::groebner::StepStats::signatures

use super::arith::Arith;
use super::signature::{self, FallStep, SignatureEnd};
use super::F4Run;
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::groebner::Stats;
use crate::poly::Poly;
use std::cell::Cell;

/// The degree up to which a fall counts as one at the start: one above the highest degree of
/// the generators (saturating: degrees near 2^32 are legal input).
fn start_degree<F: Field>(gens: &[Poly<F>]) -> u32 {
    gens.iter()
        .filter_map(Poly::degree)
        .max()
        .unwrap_or(0)
        .saturating_add(1)
}

/// Whether a fall comes late: its step has fewer than half the J-pairs of the largest step so
/// far (the run is past its peak, and the steps left are small).
fn is_late(fall: &FallStep) -> bool {
    2 * fall.pairs < fall.peak_pairs
}

/// The reduced basis of `gens`, with the engine chosen as the module documentation says.
pub(super) fn compute<F: Field, A: Arith<F>>(
    run: F4Run<'_, F, A>,
    gens: &[Poly<F>],
    control: &Control,
) -> Result<(Vec<Poly<F>>, Stats)> {
    let ring = run.ring;
    let equations = gens.iter().filter(|g| !g.is_zero()).count();
    let plain = if !ring.order.is_degree_compatible() {
        Some("f4: the order does not compare degrees first")
    } else if equations > ring.nvars() {
        Some("f4: more equations than unknowns, degrees fall")
    } else {
        None
    };
    if let Some(reason) = plain {
        let (polys, mut stats) = run.plain(gens, control)?;
        stats.choice = reason.to_string();
        return Ok((polys, stats));
    }
    let options = run.options;
    let start = start_degree(gens);
    // The first late fall the signature engine went on past, for the record.
    let passed: Cell<Option<FallStep>> = Cell::new(None);
    let stop = |fall: &FallStep| {
        let stop = fall.degree <= start || !is_late(fall);
        if !stop && passed.get().is_none() {
            passed.set(Some(*fall));
        }
        stop
    };
    match signature::run(ring, run.arith, gens, control, Some(&stop))? {
        SignatureEnd::Finished(polys, mut stats) => {
            stats.choice = match passed.get() {
                None => "f4-signature: no degree fall".to_string(),
                Some(fall) => format!(
                    "f4-signature: degrees fell only late, first at degree {} ({} of {} new \
                     elements, {} J-pairs against a peak of {})",
                    fall.degree, fall.fallen, fall.found, fall.pairs, fall.peak_pairs
                ),
            };
            Ok((polys, stats))
        }
        SignatureEnd::Fell(arith, fall) if fall.complete_degree <= start => {
            // Degrees fell at once: plain F4 from the generators costs less than going on from
            // the homogenized elements (eco-10: 0.34 s against 0.16 s), and little is lost.
            let degree = fall.complete_degree;
            let (polys, mut stats) = F4Run::new(ring, arith, options).plain(gens, control)?;
            stats.choice = format!("f4: degrees fell at degree {degree}, at the start");
            Ok((polys, stats))
        }
        SignatureEnd::Fell(arith, fall) => {
            let (degree, (fallen, found)) = (fall.complete_degree, fall.fallen);
            let (polys, mut stats) = F4Run::resume(ring, arith, options, fall).finish(control)?;
            let late = match passed.get() {
                None => String::new(),
                Some(first) => format!(" (after late falls from degree {})", first.degree),
            };
            stats.choice = format!(
                "f4-signature up to degree {degree}, where degrees fell{late} ({fallen} of \
                 {found} new elements) in a step of at least half the largest one's J-pairs; \
                 f4 from there"
            );
            Ok((polys, stats))
        }
    }
}
