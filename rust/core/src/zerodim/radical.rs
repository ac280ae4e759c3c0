//! The radical of a zero-dimensional ideal and the number of distinct solutions over the
//! algebraic closure, by Seidenberg's lemma (Seidenberg 1974; Kreuzer and Robbiano,
//! *Computational Commutative Algebra 1*, 2000, Prop. 3.7.15, from memory): over a perfect field,
//! a zero-dimensional I that contains, for every variable, a squarefree polynomial in that variable
//! alone is radical; so √I = I + (squarefree parts of the minimal polynomials of the variables).
//! Finite fields are perfect, and squarefree parts are taken with p-th roots where needed
//! ([`crate::univariate::squarefree_part`]), so this is correct in positive characteristic.

use super::{quotient_dimension, Quotient};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::groebner::{groebner_basis, Engine, ReducedBasis};
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use crate::univariate::{degree, squarefree_part, Univariate};

/// The univariate polynomial g as a polynomial in variable `var` of `ring`.
fn in_variable<F: Field>(ring: &Ring<F>, g: &Univariate<F>, var: usize) -> Poly<F> {
    let n = ring.nvars();
    ring.from_terms(
        g.iter()
            .enumerate()
            .map(|(e, c)| (Monomial::var_power(n, var, e as u32), c.clone())),
    )
}

/// For each variable, its minimal polynomial in R/I and that polynomial's squarefree part.
pub fn variable_minimal_polynomials<F: Field>(
    quotient: &Quotient<F>,
    control: &Control,
) -> Result<Vec<(Univariate<F>, Univariate<F>)>> {
    let ring = &quotient.basis.ring;
    (0..ring.nvars())
        .map(|i| {
            let m = quotient.minimal_polynomial(&ring.var(i), control)?;
            let s = squarefree_part(&ring.field, &m);
            Ok((m, s))
        })
        .collect()
}

/// A Gröbner basis (same order) of the radical of the zero-dimensional ideal with basis `gb`.
pub fn zero_dimensional_radical<F: Field>(
    gb: &ReducedBasis<F>,
    engine: Engine,
    control: &Control,
) -> Result<ReducedBasis<F>> {
    if gb.is_unit_ideal() {
        return Ok(gb.clone());
    }
    let quotient = Quotient::new(gb.clone(), control)?;
    let ring = &gb.ring;
    let mut gens = gb.polys.clone();
    let mut changed = false;
    for (i, (m, s)) in variable_minimal_polynomials(&quotient, control)?
        .into_iter()
        .enumerate()
    {
        if degree::<F>(&s) < degree::<F>(&m) {
            gens.push(in_variable(ring, &s, i));
            changed = true;
        }
    }
    if !changed {
        return Ok(gb.clone());
    }
    groebner_basis(ring, &gens, engine, control)
}

/// Number of distinct points of V(I) over the algebraic closure, for zero-dimensional I.
pub fn count_solutions<F: Field>(
    gb: &ReducedBasis<F>,
    engine: Engine,
    control: &Control,
) -> Result<u128> {
    super::require_zero_dimensional(gb, "count_solutions")?;
    quotient_dimension(&zero_dimensional_radical(gb, engine, control)?, control)
}
