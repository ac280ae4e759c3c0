//! The rational points of a polynomial system over a finite field GF(q), listed and checked.
//!
//! Zero-dimensional systems: from the grevlex basis, the quotient A = R/I and a linear form ℓ
//! (the last variable first, then random forms) give a shape representation x_i ≡ g_i(ℓ) by
//! Krylov sequences ([`crate::groebner::order_change::shape`], Faugère and Mou 2011) whenever the minimal
//! polynomial f of ℓ has degree dim A; the rational points are then (g_i(t))_i for the roots t
//! of f in GF(q) (roots by [`crate::univariate::roots`]: gcd with x^q − x by repeated squaring,
//! then Cantor–Zassenhaus). A random ℓ over GF(q) separates the D points of a radical ideal with
//! probability at least 1 − D(D − 1)/(2q) (Schwartz 1980; Zippel 1979), so for q large against
//! D^2 one or two draws suffice. Otherwise (multiple points, or q too small to separate them),
//! the field equations x_i^q − x_i are added (as NF(x_i^q) − x_i, by repeated squaring in A),
//! which leaves a radical ideal whose points are exactly the rational ones, and that ideal is
//! split along the roots of the minimal polynomials of the variables, one basis per branch: the
//! triangular decomposition of Lazard 1992, restricted to rational points.
//!
//! Positive dimension: a maximal independent set U of variables is enumerated over GF(q)^|U|
//! (at most [`FIBRE_LIMIT`] fibres); one parametric basis over U is specialised at each fibre
//! ([`super::fibres`]), and a fibre gets a basis of its own only where that is not generic.
//!
//! Every returned point is checked in every input polynomial before it is returned.

use crate::control::Control;
use crate::dimension::{krull_dimension, maximum_independent_sets};
use crate::error::{Error, Result};
use crate::field::field_order_limbs;
use crate::field::Field;
use crate::groebner::order_change::shape::shape_representation;
use crate::groebner::{groebner_basis, Engine, ReducedBasis};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
use crate::rng::Rng;
use crate::univariate::{self, random_element};
use crate::zerodim::maximal::frobenius_coordinates;
use crate::zerodim::Quotient;

use super::fibres::ParametricBasis;

/// Most fibres enumerated for a system of positive dimension.
pub const FIBRE_LIMIT: u64 = 1 << 20;

/// The seed of the random linear forms and functionals (the result does not depend on it).
const SEED: u64 = 0x0090_1775;

/// The points of V(gens) in GF(q)^n, each a vector of coordinates in the ring's variable order;
/// at most `limit` of them when given (then the first ones found).
pub fn rational_points<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    limit: Option<usize>,
    engine: Engine,
    control: &Control,
) -> Result<Vec<Vec<F::Elem>>> {
    field_order_limbs(&ring.field, "listing points")?;
    let r = ring.with_order(MonomialOrder::Grevlex)?;
    let adopted: Vec<Poly<F>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
    let mut points = Vec::new();
    collect_points(&r, &adopted, limit, engine, control, &mut points)?;
    for point in &points {
        check_point(ring, gens, point)?;
    }
    Ok(points)
}

/// An error unless every generator vanishes at the point.
pub fn check_point<F: Field>(ring: &Ring<F>, gens: &[Poly<F>], point: &[F::Elem]) -> Result<()> {
    for (k, g) in gens.iter().enumerate() {
        if !ring.field.is_zero(&ring.evaluate(g, point)?) {
            let text: Vec<String> = point.iter().map(|c| ring.field.format(c)).collect();
            return Err(Error::invalid(format!(
                "internal check failed: the point ({}) found for the system does not satisfy equation {} ({})",
                text.join(", "),
                k + 1,
                ring.format(g)
            )));
        }
    }
    Ok(())
}

fn room(limit: Option<usize>, found: usize) -> bool {
    limit.is_none_or(|l| found < l)
}

pub(crate) fn collect_points<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    limit: Option<usize>,
    engine: Engine,
    control: &Control,
    out: &mut Vec<Vec<F::Elem>>,
) -> Result<()> {
    if !room(limit, out.len()) {
        return Ok(());
    }
    let gb = groebner_basis(ring, gens, engine, control)?;
    if gb.is_unit_ideal() {
        return Ok(());
    }
    if krull_dimension(ring.nvars(), &gb.leading_monomials()) > 0 {
        return fibres(ring, &gb, limit, engine, control, out);
    }
    for point in zero_dimensional_points(&gb, engine, control)? {
        if !room(limit, out.len()) {
            break;
        }
        out.push(point);
    }
    Ok(())
}

/// The rational points of a zero-dimensional ideal given by its grevlex basis.
pub fn zero_dimensional_points<F: Field>(
    gb: &ReducedBasis<F>,
    engine: Engine,
    control: &Control,
) -> Result<Vec<Vec<F::Elem>>> {
    let quotient = Quotient::new(gb.clone(), control)?;
    if let Some(points) = points_by_shape(&quotient, 2, control)? {
        return Ok(points);
    }
    let rational = with_field_equations(&quotient, engine, control)?;
    split_rational(rational, engine, control)
}

/// Points from a shape representation for the last variable or one of `random_forms` random
/// linear forms; `None` when none of them has a minimal polynomial of degree dim A.
fn points_by_shape<F: Field>(
    quotient: &Quotient<F>,
    random_forms: usize,
    control: &Control,
) -> Result<Option<Vec<Vec<F::Elem>>>> {
    let ring = &quotient.basis.ring;
    let field = &ring.field;
    let n = ring.nvars();
    let mut rng = Rng::new(SEED);
    let mut forms = vec![vec![(n - 1, field.one())]];
    for _ in 0..random_forms {
        forms.push(
            (0..n)
                .map(|i| (i, random_element(field, &mut rng)))
                .collect(),
        );
    }
    for form in forms {
        if let Some(shape) = shape_representation(quotient, &form, &mut rng, control)? {
            let roots = univariate::roots(field, &shape.minimal_polynomial, control)?;
            return Ok(Some(roots.iter().map(|t| shape.point(field, t)).collect()));
        }
    }
    Ok(None)
}

/// The basis of I + (x_i^q − x_i : all i): radical, and its points are the rational points of I.
fn with_field_equations<F: Field>(
    quotient: &Quotient<F>,
    engine: Engine,
    control: &Control,
) -> Result<ReducedBasis<F>> {
    let ring = &quotient.basis.ring;
    let mut gens = quotient.basis.polys.clone();
    for (i, image) in frobenius_coordinates(quotient, control)?
        .into_iter()
        .enumerate()
    {
        gens.push(ring.sub(&quotient.element(&image), &ring.var(i)));
    }
    groebner_basis(ring, &gens, engine, control)
}

/// The points of a radical zero-dimensional ideal whose points are all rational.
fn split_rational<F: Field>(
    gb: ReducedBasis<F>,
    engine: Engine,
    control: &Control,
) -> Result<Vec<Vec<F::Elem>>> {
    control.check()?;
    if gb.is_unit_ideal() {
        return Ok(vec![]);
    }
    let ring = gb.ring.clone();
    let quotient = Quotient::new(gb, control)?;
    if quotient.dimension() == 1 {
        let point = (0..ring.nvars())
            .map(|i| Ok(quotient.coordinates(&ring.var(i))?[0].clone()))
            .collect::<Result<_>>()?;
        return Ok(vec![point]);
    }
    if let Some(points) = points_by_shape(&quotient, 1, control)? {
        return Ok(points);
    }
    // Some variable takes several values (else dim A = 1): branch on them.
    for i in 0..ring.nvars() {
        let minimal = quotient.minimal_polynomial(&ring.var(i), control)?;
        if minimal.len() <= 2 {
            continue;
        }
        let mut points = Vec::new();
        for value in univariate::roots(&ring.field, &minimal, control)? {
            let mut gens = quotient.basis.polys.clone();
            gens.push(ring.sub(&ring.var(i), &ring.constant(value)));
            let branch = groebner_basis(&ring, &gens, engine, control)?;
            points.extend(split_rational(branch, engine, control)?);
        }
        return Ok(points);
    }
    unreachable!("a radical ideal of dimension > 1 has a variable with several values")
}

/// Positive dimension: enumerate a maximal independent set of variables and solve each fibre
/// by specialising one parametric basis ([`super::fibres`]).
fn fibres<F: Field>(
    ring: &Ring<F>,
    gb: &ReducedBasis<F>,
    limit: Option<usize>,
    engine: Engine,
    control: &Control,
    out: &mut Vec<Vec<F::Elem>>,
) -> Result<()> {
    let field = &ring.field;
    let n = ring.nvars();
    let free = maximum_independent_sets(n, &gb.leading_monomials(), 1)
        .into_iter()
        .next()
        .expect("a positive-dimensional ideal has an independent set");
    let q = crate::field::field_size(field).unwrap_or(u64::MAX);
    let count = (q as u128)
        .checked_pow(free.len() as u32)
        .unwrap_or(u128::MAX);
    if count > u128::from(FIBRE_LIMIT) {
        return Err(Error::ResourceLimit(format!(
            "listing the points of a system of dimension {} over {} means solving {} fibres (more than {FIBRE_LIMIT})",
            free.len(),
            field.spec(),
            if count == u128::MAX { "too many".to_string() } else { count.to_string() }
        )));
    }
    // One parametric basis over the free variables, specialised fibre by fibre.
    let parameters: Vec<Poly<F>> = free.iter().map(|&i| ring.var(i)).collect();
    let parametric = ParametricBasis::new(ring, &gb.polys, &parameters, engine, control)?;
    let room_left = limit.map(|l| l.saturating_sub(out.len()));
    let run = parametric.fibres(0, count as u64, room_left, engine, control)?;
    out.extend(run.points);
    Ok(())
}

/// The elements with enumeration indices the base-q digits of `index`.
pub(crate) fn digits<F: Field>(field: &F, mut index: u64, q: u64, count: usize) -> Vec<F::Elem> {
    (0..count)
        .map(|_| {
            let d = index % q;
            index /= q;
            field.element_from_index(d)
        })
        .collect()
}

#[cfg(test)]
pub(crate) mod tests;
