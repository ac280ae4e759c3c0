//! Change of monomial order for zero-dimensional ideals by the FGLM algorithm (Faugère, Gianni,
//! Lazard, Mora 1993): the monomials are visited in increasing target order, each as x_k times
//! an earlier standard monomial of the target order, so that its normal form for the source
//! basis is one multiplication-matrix product away; the first linear dependence of a normal
//! form on those of the earlier standard monomials is a polynomial of the new reduced basis, and
//! its leading monomial is never extended again. The cost is O(n·D^3) field operations for a
//! quotient of dimension D in n variables, whatever the target order.
//!
//! For a lex target in shape position the Krylov route of [`super::shape`] (Faugère and Mou
//! 2011) is tried first: O(D) sparse matrix products and univariate arithmetic.

use super::shape::shape_lex_basis;
use crate::control::Control;
use crate::echelon::Echelon;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::quotient::Quotient;
use crate::groebner::{ReducedBasis, Stats};
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};

/// The reduced Gröbner basis for the order of `to` of the zero-dimensional ideal whose reduced
/// basis for the order of `from` is `basis` (same field and variables).
pub fn change_order<F: Field>(
    from: &Ring<F>,
    basis: &[Poly<F>],
    to: &Ring<F>,
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let gb = ReducedBasis {
        ring: from.clone(),
        polys: basis.to_vec(),
        stats: Stats::default(),
    };
    Ok(fglm(&gb, to, control)?.polys)
}

/// [`change_order`] on a [`ReducedBasis`], returning one (the statistics say how long it took).
pub fn fglm<F: Field>(
    gb: &ReducedBasis<F>,
    to: &Ring<F>,
    control: &Control,
) -> Result<ReducedBasis<F>> {
    let basis = fglm_within(gb, to, usize::MAX, control)?;
    Ok(basis.expect("without a dimension limit the linear algebra route always runs"))
}

/// [`fglm`] by the Krylov route (lex target in shape position, any dim R/I), or by the dense
/// linear algebra route when dim R/I <= `dense_limit`; `None` when neither applies (the dense
/// route costs O(n·D^3): the caller then takes another way).
pub fn fglm_within<F: Field>(
    gb: &ReducedBasis<F>,
    to: &Ring<F>,
    dense_limit: usize,
    control: &Control,
) -> Result<Option<ReducedBasis<F>>> {
    if gb.ring.names() != to.names() || gb.ring.field != to.field {
        return Err(Error::invalid(
            "a change of order needs the same field and variables in both rings",
        ));
    }
    let start = std::time::Instant::now();
    let adopt = |polys: Vec<Poly<F>>| -> Vec<Poly<F>> {
        let mut out: Vec<Poly<F>> = polys.into_iter().map(|p| to.adopt(p)).collect();
        out.sort_by(|a, b| to.cmp(b.leading_monomial().unwrap(), a.leading_monomial().unwrap()));
        out
    };
    let polys = if gb.is_unit_ideal() {
        vec![to.one()]
    } else {
        let quotient = Quotient::new(gb.clone(), control)?;
        let shape = match to.order {
            MonomialOrder::Lex => shape_lex_basis(&quotient, to, control)?,
            _ => None,
        };
        match shape {
            Some(polys) => adopt(polys),
            None if quotient.dimension() <= dense_limit => {
                adopt(linear_algebra_route(&quotient, to, control)?)
            }
            None => return Ok(None),
        }
    };
    let stats = Stats {
        seconds: start.elapsed().as_secs_f64(),
        engine: "fglm".to_string(),
        ..Stats::default()
    };
    Ok(Some(ReducedBasis {
        ring: to.clone(),
        polys,
        stats,
    }))
}

/// A monomial waiting to be visited: x_k times the standard monomial `parent` (by index).
struct Candidate {
    monomial: Monomial,
    variable: usize,
    parent: usize,
}

/// The FGLM main loop (see the module doc).
fn linear_algebra_route<F: Field>(
    quotient: &Quotient<F>,
    to: &Ring<F>,
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let field = &to.field;
    let n = to.nvars();
    let mut echelon = Echelon::new(field.clone());
    // The standard monomials of the target order with their normal-form coordinates.
    let mut standard: Vec<(Monomial, Vec<F::Elem>)> = Vec::new();
    let mut leads: Vec<Monomial> = Vec::new();
    let mut basis: Vec<Poly<F>> = Vec::new();
    let one = quotient.coordinates(&to.one())?;
    if let Some(relation) = echelon.add(one.clone()) {
        // 1 ≡ 0: the unit ideal (handled by the caller; kept for safety).
        debug_assert_eq!(relation.len(), 1);
        return Ok(vec![to.one()]);
    }
    standard.push((Monomial::one(n), one));
    let mut pending: Vec<Candidate> = Vec::new();
    push_children(&mut pending, &standard[0].0, 0, &leads, n)?;
    while let Some(next) = pop_smallest(&mut pending, to) {
        control.check()?;
        if leads.iter().any(|l| l.divides(&next.monomial)) {
            continue;
        }
        let v = quotient.times_variable_coordinates(
            next.variable,
            &standard[next.parent].1,
            control,
        )?;
        match echelon.add(v.clone()) {
            Some(relation) => {
                // Σ_j c_j · b_j + 1 · m ≡ 0 with the b_j the standard monomials so far.
                let terms = standard
                    .iter()
                    .map(|(m, _)| m.clone())
                    .zip(relation.iter().cloned())
                    .chain(std::iter::once((next.monomial.clone(), field.one())));
                basis.push(to.from_terms(terms));
                leads.push(next.monomial);
            }
            None => {
                standard.push((next.monomial.clone(), v));
                push_children(&mut pending, &next.monomial, standard.len() - 1, &leads, n)?;
            }
        }
    }
    if standard.len() != quotient.dimension() {
        return Err(Error::invalid(format!(
            "change of order: found {} standard monomials for a quotient of dimension {} (the input is not a reduced basis)",
            standard.len(),
            quotient.dimension()
        )));
    }
    Ok(basis)
}

/// Adds x_k · m for every variable, unless already waiting or a multiple of a found leading
/// monomial.
fn push_children(
    pending: &mut Vec<Candidate>,
    m: &Monomial,
    index: usize,
    leads: &[Monomial],
    n: usize,
) -> Result<()> {
    for k in 0..n {
        let up = m.mul(&Monomial::var_power(n, k, 1))?;
        if leads.iter().any(|l| l.divides(&up)) || pending.iter().any(|c| c.monomial == up) {
            continue;
        }
        pending.push(Candidate {
            monomial: up,
            variable: k,
            parent: index,
        });
    }
    Ok(())
}

/// Removes and returns the smallest waiting monomial in the target order.
fn pop_smallest<F: Field>(pending: &mut Vec<Candidate>, to: &Ring<F>) -> Option<Candidate> {
    let best =
        (0..pending.len()).min_by(|&a, &b| to.cmp(&pending[a].monomial, &pending[b].monomial))?;
    Some(pending.swap_remove(best))
}
