//! Points of a curve C in P^(n−1), n ≥ 4, over GF(Q) = GF(q^r), counted fibre by fibre over a
//! projection onto one coordinate, for any Q below 2^64.
//!
//! P^(n−1) is split into the chart x_j = 1 and the hyperplane x_j = 0, for a coordinate x_j
//! that does not vanish on C. On the hyperplane C has finitely many points, counted by
//! [`crate::points::count_projective_points`] (a zero-dimensional count, cheap for any Q). On
//! the chart, the map to the coordinate x_i has finite fibres for a coordinate x_i whose fibre
//! over 0 is finite; one parametric basis of I + (x_j − 1) + (t − x_i) is made
//! ([`crate::points::fibres::ParametricBasis`], Gianni 1987 and Kalkbrener 1997) and
//! specialised at each t = v in GF(Q), a fibre getting a basis of its own only where a leading
//! coefficient vanishes. Among such coordinates x_i the one of least generic fibre degree is
//! taken (the number of standard monomials of the leading terms in x: a fibre of degree one is
//! a single point, read off linear equations). The equations are defined over GF(q), so
//! conjugate values v have fibres of the same size: one fibre per Frobenius orbit
//! ([`super::frobenius_orbits`]).

use super::frobenius_orbits::FrobeniusOrbits;
use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::{groebner_basis, Engine};
use crate::hilbert::monomial_ideal_series;
use crate::monomial::Monomial;
use crate::points::count_projective_points;
use crate::points::fibres::ParametricBasis;
use crate::poly::{Poly, Ring};

/// Values of the projection handed to a worker at a time.
const CHUNK: u64 = 1 << 8;

/// #C(GF(Q)) for the projective curve cut out by the homogeneous `gens` of `ring` (over
/// GF(Q) = GF(q^r), the coefficients in GF(q)).
pub fn count_by_projection<E: Field>(
    ring: &Ring<E>,
    gens: &[Poly<E>],
    q: u64,
    r: u32,
    control: &Control,
) -> Result<u128> {
    let n = ring.nvars();
    let with = |extra: &[Poly<E>]| -> Vec<Poly<E>> { [gens, extra].concat() };
    let j = (0..n)
        .rev()
        .find_map(|j| {
            cone_dimension(ring, &with(&[ring.var(j)]), control)
                .map(|d| (d <= 1).then_some(j))
                .transpose()
        })
        .transpose()?
        .ok_or_else(|| Error::invalid("every coordinate vanishes on the curve"))?;
    let at_infinity = count_projective_points(ring, &with(&[ring.var(j)]), Engine::Auto, control)?;
    let chart = with(&[ring.sub(&ring.var(j), &ring.one())]);
    let basis = projection(ring, &chart, j, control)?;
    let orbits = FrobeniusOrbits::new(&ring.field, q, r)?;
    let affine = orbits.weighted_sum(
        CHUNK,
        control,
        || (),
        |_, v| {
            let fibre = basis.fibre(std::slice::from_ref(v), Engine::Auto, control)?;
            Ok(fibre.points.len() as u128)
        },
    )?;
    Ok(at_infinity + affine)
}

/// The Krull dimension of the ideal of `gens` (the affine cone for homogeneous ones); −1 for
/// the unit ideal.
fn cone_dimension<E: Field>(ring: &Ring<E>, gens: &[Poly<E>], control: &Control) -> Result<i64> {
    let gb = groebner_basis(ring, gens, Engine::Auto, control)?;
    Ok(krull_dimension(ring.nvars(), &gb.leading_monomials()))
}

/// The parametric basis of the chart's equations over the coordinate x_i (i ≠ j) with finite
/// fibres and the least generic fibre degree.
fn projection<E: Field>(
    ring: &Ring<E>,
    chart: &[Poly<E>],
    j: usize,
    control: &Control,
) -> Result<ParametricBasis<E>> {
    let mut best: Option<(u128, ParametricBasis<E>)> = None;
    for i in (0..ring.nvars()).filter(|&i| i != j) {
        let over_zero = [chart, &[ring.var(i)]].concat();
        if cone_dimension(ring, &over_zero, control)? > 0 {
            continue;
        }
        let basis = ParametricBasis::new(ring, chart, &[ring.var(i)], Engine::Auto, control)?;
        let degree = generic_fibre_degree(&basis, control)?;
        if best.as_ref().is_none_or(|(d, _)| degree < *d) {
            best = Some((degree, basis));
        }
    }
    best.map(|(_, basis)| basis)
        .ok_or_else(|| Error::invalid("no coordinate projects the curve with finite fibres"))
}

/// The number of points of a generic fibre over the algebraic closure, with multiplicity: the
/// standard monomials of the x-parts of the leading monomials of the parametric basis.
fn generic_fibre_degree<E: Field>(basis: &ParametricBasis<E>, control: &Control) -> Result<u128> {
    let n = basis.ring.nvars();
    let leads = basis
        .basis
        .iter()
        .filter_map(|g| g.leading_monomial())
        .map(|m| Monomial::from_exponents(m.exponents()[..n].to_vec()))
        .collect::<Result<Vec<Monomial>>>()?;
    if leads.iter().any(|m| m.is_one()) || krull_dimension(n, &leads) > 0 {
        return Ok(u128::MAX);
    }
    let series = monomial_ideal_series(n, &leads, false, control)?;
    Ok(series.degree()? as u128)
}
