//! Bases in orders that do not compare degrees first (lex, elimination and other block
//! orders, weight orders) by a change of order: a basis in grevlex first, which the fast
//! engines compute well, then the Hilbert-driven Buchberger algorithm (Traverso 1996) on the
//! homogenized ideal.
//!
//! Homogenizing the grevlex basis G of I with a new variable h (smallest) gives a Gröbner basis
//! of the homogenized ideal I^h for grevlex with h last, with the same leading monomials; so the
//! Hilbert series of I^h is known before the target basis is computed. The target basis of I^h
//! is then computed degree by degree in the target order extended by h (compared after every
//! variable of the ring), with F4 as the engine: a degree whose Hilbert function the leading
//! monomials found so far already give is complete, and its pairs are dropped unreduced; once
//! the whole series is reached, the computation stops. Setting h = 1 in that basis gives a
//! Gröbner basis of I in the target order (two monomials of a homogeneous polynomial differ in
//! the ring's variables, where the extended order compares first, so leading monomials survive
//! dehomogenization), which one more matrix makes reduced.
//!
//! This works in every dimension. For zero-dimensional ideals whose quotient R/I is not too
//! large, [`change_order`] goes instead through linear algebra in the quotient: FGLM
//! (Faugère, Gianni, Lazard, Mora 1993), with its sparse Krylov route for lex targets in shape
//! position (Faugère and Mou 2011), see [`crate::groebner::order_change::fglm`].

use super::f4;
use super::quotient::quotient_dimension;
use super::{groebner_basis, Engine, ReducedBasis, Stats};
use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::monomial::Monomial;
use crate::monomial_ideal::monomial_ideal_series;
use crate::order::{MonomialOrder, OrderBlock};
use crate::poly::{Poly, Ring};
use fglm::fglm_within;

/// Routes every engine but the reference one (Buchberger's, kept as a direct computation to
/// check the others against) under an order that does not compare degrees first through a
/// grevlex basis by that engine and a change of order: F4 run directly under lex climbs to
/// degrees far above the basis's; `None` for every other request.
pub(crate) fn route_change_of_order<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    engine: Engine,
    control: &Control,
) -> Option<Result<ReducedBasis<F>>> {
    if engine == Engine::Buchberger || ring.order.is_degree_compatible() {
        return None;
    }
    Some(by_change_of_order(ring, gens, engine, control))
}

/// The reduced basis of `gens` in `ring`'s order, from a grevlex basis.
fn by_change_of_order<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    engine: Engine,
    control: &Control,
) -> Result<ReducedBasis<F>> {
    let start = std::time::Instant::now();
    let grevlex_ring = ring.with_order(MonomialOrder::Grevlex)?;
    let adopted: Vec<Poly<F>> = gens.iter().map(|g| grevlex_ring.adopt(g.clone())).collect();
    let grevlex = groebner_basis(&grevlex_ring, &adopted, engine, control)?;
    let (polys, mut stats) = change_order(&grevlex, ring, control)?;
    stats.engine = engine.name().to_string();
    let how = if grevlex.stats.choice.is_empty() {
        format!("by {}", engine.name())
    } else {
        format!("({})", grevlex.stats.choice)
    };
    stats.choice = format!("grevlex basis {how}, then {}", stats.choice);
    let mut steps = grevlex.stats.steps;
    steps.append(&mut stats.steps);
    stats.steps = steps;
    stats.zero_reductions += grevlex.stats.zero_reductions;
    stats.reached(grevlex.stats.highest_degree);
    for f in gens.iter().chain(&polys) {
        stats.reached(f.degree().unwrap_or(0));
    }
    stats.seconds = start.elapsed().as_secs_f64();
    Ok(ReducedBasis {
        ring: ring.clone(),
        polys,
        stats,
    })
}

/// The reduced basis, in `target`'s order, of the ideal whose reduced grevlex basis is
/// `grevlex` (same variables and field), and the statistics of the conversion.
pub fn change_order<F: Field>(
    grevlex: &ReducedBasis<F>,
    target: &Ring<F>,
    control: &Control,
) -> Result<(Vec<Poly<F>>, Stats)> {
    if grevlex.polys.is_empty() || grevlex.is_unit_ideal() {
        let stats = Stats {
            choice: "no conversion needed".into(),
            ..Default::default()
        };
        return Ok((grevlex.polys.clone(), stats));
    }
    if let Some(d) = zero_dimensional_quotient(grevlex, control)? {
        if let Some(basis) = fglm_within(grevlex, target, FGLM_DENSE_LIMIT, control)? {
            let stats = Stats {
                choice: format!("FGLM in the quotient R/I of dimension {d}"),
                ..basis.stats
            };
            return Ok((basis.polys, stats));
        }
    }
    hilbert_driven(grevlex, target, control)
}

/// Largest dim_k R/I for which the change of order runs FGLM's dense linear algebra, O(n·D^3)
/// field operations; beyond it only the Krylov route (lex targets in shape position) is tried
/// before the Hilbert-driven computation.
pub const FGLM_DENSE_LIMIT: usize = 1024;

/// Largest dim_k R/I for which the quotient is built at all.
const QUOTIENT_LIMIT: u128 = 1 << 20;

/// dim_k R/I when the ideal is zero-dimensional and its quotient small enough to build.
fn zero_dimensional_quotient<F: Field>(
    grevlex: &ReducedBasis<F>,
    control: &Control,
) -> Result<Option<u128>> {
    if krull_dimension(grevlex.ring.nvars(), &grevlex.leading_monomials()) != 0 {
        return Ok(None);
    }
    let d = quotient_dimension(grevlex, control)?;
    Ok((d <= QUOTIENT_LIMIT).then_some(d))
}

/// The change of order by the Hilbert-driven computation on the homogenized ideal.
fn hilbert_driven<F: Field>(
    grevlex: &ReducedBasis<F>,
    target: &Ring<F>,
    control: &Control,
) -> Result<(Vec<Poly<F>>, Stats)> {
    let n = target.nvars();
    let homogenized_ring = Ring::new(
        target.field.clone(),
        with_extra_name(target.names()),
        extended_by_last(&target.order, n),
    )?;
    let homogenized: Vec<Poly<F>> = grevlex
        .polys
        .iter()
        .map(|g| homogenize(&homogenized_ring, g))
        .collect::<Result<_>>()?;
    let leads: Vec<Monomial> = homogenized
        .iter()
        .map(|g| lead_in_grevlex(g))
        .collect::<Result<_>>()?;
    let series = monomial_ideal_series(n + 1, &leads, false, control)?;
    let (basis, mut stats) = f4::compute_driven(&homogenized_ring, &homogenized, control, &series)?;
    let dehomogenized: Vec<Poly<F>> = basis
        .iter()
        .map(|g| dehomogenize(target, g))
        .collect::<Result<_>>()?;
    let polys = f4::interreduce(target, &dehomogenized, control)?;
    stats.choice = "Hilbert-driven change of order on the homogenized ideal".into();
    Ok((polys, stats))
}

/// The ring's variable names and one more, for h, that is none of them.
fn with_extra_name(names: &[String]) -> Vec<String> {
    let mut extra = "h".to_string();
    while names.contains(&extra) {
        extra.push('_');
    }
    names.iter().cloned().chain([extra]).collect()
}

/// The order on one more variable, h (index n), that compares the first n variables by `order`
/// and only then the power of h: a block order with h in a block of its own, last.
fn extended_by_last(order: &MonomialOrder, n: usize) -> MonomialOrder {
    let h = OrderBlock {
        order: MonomialOrder::Lex,
        vars: vec![n],
    };
    match order {
        MonomialOrder::Lex => MonomialOrder::Lex,
        MonomialOrder::Block(blocks) => {
            MonomialOrder::Block(blocks.iter().cloned().chain([h]).collect())
        }
        other => MonomialOrder::Block(vec![
            OrderBlock {
                order: other.clone(),
                vars: (0..n).collect(),
            },
            h,
        ]),
    }
}

/// f(x)·h^deg f with h the last variable of `ring`, as a polynomial of `ring`.
fn homogenize<F: Field>(ring: &Ring<F>, f: &Poly<F>) -> Result<Poly<F>> {
    let degree = f.degree().unwrap_or(0);
    let terms = f
        .terms()
        .iter()
        .map(|(m, c)| {
            let power = degree - m.degree();
            let exps = m.exponents().iter().copied().chain([power]).collect();
            Ok((Monomial::from_exponents(exps)?, c.clone()))
        })
        .collect::<Result<Vec<_>>>()?;
    Ok(ring.from_terms(terms))
}

/// The leading monomial of a homogenized grevlex basis element in grevlex with h last: the
/// term of least power of h, i.e. the leading monomial of the element before homogenizing.
fn lead_in_grevlex<F: Field>(g: &Poly<F>) -> Result<Monomial> {
    let n = g.terms()[0].0.nvars();
    let order = MonomialOrder::Grevlex;
    let lead = g
        .terms()
        .iter()
        .map(|(m, _)| m)
        .max_by(|a, b| order.cmp(a, b))
        .ok_or_else(|| Error::invalid("a basis element is zero"))?;
    debug_assert_eq!(lead.exponents()[n - 1], 0);
    Ok(lead.clone())
}

/// g with h = 1, in `ring` (the variables without h): the monomials of a homogeneous g differ
/// in the other variables, so no two terms merge.
fn dehomogenize<F: Field>(ring: &Ring<F>, g: &Poly<F>) -> Result<Poly<F>> {
    let n = ring.nvars();
    let terms = g
        .terms()
        .iter()
        .map(|(m, c)| {
            Ok((
                Monomial::from_exponents(m.exponents()[..n].to_vec())?,
                c.clone(),
            ))
        })
        .collect::<Result<Vec<_>>>()?;
    Ok(ring.adopt(Poly::from_sorted(terms)))
}

pub mod fglm;
pub mod multiplication;
pub mod shape;

#[cfg(test)]
mod tests;
