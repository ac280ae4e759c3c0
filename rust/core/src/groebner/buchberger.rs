//! Buchberger's algorithm (Buchberger 1965) with the Gebauer–Möller pair criteria (1988) and the
//! sugar selection strategy (Giovini, Mora, Niesi, Robbiano, Traverso 1991): one S-polynomial
//! at a time, reduced by the division algorithm. The reference engine: simple enough to trust,
//! and the yardstick that faster engines are tested against.

use super::pairs::{Pair, PairSet, Selection};
use super::reduce::{normal_form, reduced_basis};
use super::stats::{Stats, StepStats};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::poly::{Poly, Ring};

/// S-polynomial of basis elements i and j over their lcm.
fn s_polynomial<F: Field>(ring: &Ring<F>, g: &[Poly<F>], pair: &Pair) -> Result<Poly<F>> {
    let (f, h) = (&g[pair.i], &g[pair.j]);
    let field = &ring.field;
    let mf = pair.lcm.div(f.leading_monomial().unwrap());
    let mh = pair.lcm.div(h.leading_monomial().unwrap());
    let cf = field.inv(f.leading_coefficient().unwrap()).unwrap();
    let ch = field.neg(&field.inv(h.leading_coefficient().unwrap()).unwrap());
    let a = ring.mul_term(f, &cf, &mf)?;
    ring.add_scaled(&a, &ch, &mh, h)
}

/// Reduced Gröbner basis of `gens` and the run's statistics.
pub fn compute<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    control: &Control,
) -> Result<(Vec<Poly<F>>, Stats)> {
    let mut stats = Stats::default();
    let mut basis: Vec<Poly<F>> = Vec::new();
    let mut pairs = PairSet::default();
    for f in gens.iter().filter(|f| !f.is_zero()) {
        if f.is_constant() {
            return Ok((vec![ring.one()], stats));
        }
        let f = ring.monic(f);
        let sugar = f.degree().unwrap();
        pairs.insert(f.leading_monomial().unwrap().clone(), sugar);
        basis.push(f);
    }
    let active_of = |pairs: &PairSet, basis: &[Poly<F>]| -> Vec<Poly<F>> {
        pairs
            .active_indices()
            .into_iter()
            .map(|k| basis[k].clone())
            .collect()
    };
    let mut active = active_of(&pairs, &basis);
    // Sugar under degree orders; under the others, the least lcm in the order among the pairs
    // of least sugar (the pairs of one sugar can have lcms far up in the order).
    let selection = if ring.order.is_degree_compatible() {
        Selection::LeastSugar
    } else {
        Selection::LeastLcm
    };
    while let Some(pair) = pairs.take(selection, &ring.order, Some(1)).pop() {
        control.check()?;
        control.check_degree(pair.sugar, stats.steps.len())?;
        record_step(&mut stats, pair.sugar);
        let s = s_polynomial(ring, &basis, &pair)?;
        // No matrices here: the matrix limit bounds each S-polynomial as a one-row matrix.
        control.check_matrix(1, s.len(), stats.steps.len())?;
        stats.reached(s.degree().unwrap_or(0));
        let h = normal_form(ring, &s, &active)?;
        if h.is_zero() {
            stats.zero_reductions += 1;
            continue;
        }
        stats.steps.last_mut().unwrap().new_elements += 1;
        if h.is_constant() {
            return Ok((vec![ring.one()], stats));
        }
        let h = ring.monic(&h);
        pairs.insert(h.leading_monomial().unwrap().clone(), pair.sugar);
        basis.push(h);
        active = active_of(&pairs, &basis);
    }
    Ok((reduced_basis(ring, active)?, stats))
}

/// One stats entry per sugar degree: consecutive pairs of equal sugar are counted together.
fn record_step(stats: &mut Stats, sugar: u32) {
    match stats.steps.last_mut() {
        Some(s) if s.degree == sugar => s.pairs += 1,
        _ => stats.steps.push(StepStats {
            degree: sugar,
            pairs: 1,
            ..Default::default()
        }),
    }
}
