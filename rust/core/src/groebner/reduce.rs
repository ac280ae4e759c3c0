//! Normal forms and interreduction: the division algorithm (Cox, Little and O'Shea 1992,
//! §2.3) and the passage from a Gröbner basis to the reduced one (Buchberger 1965).

use crate::error::Result;
use crate::field::Field;
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};

/// Index of a divisor of `m` among `leads`, preferring the first found.
fn find_divisor(m: &Monomial, basis: &[Poly<impl Field>]) -> Option<usize> {
    basis
        .iter()
        .position(|g| g.leading_monomial().is_some_and(|l| l.divides(m)))
}

/// Fully reduced normal form of `f` by `basis` (a remainder of the division algorithm; unique
/// when `basis` is a Gröbner basis).
pub fn normal_form<F: Field>(ring: &Ring<F>, f: &Poly<F>, basis: &[Poly<F>]) -> Result<Poly<F>> {
    let field = &ring.field;
    let mut rest = f.clone();
    let mut remainder: Vec<(Monomial, F::Elem)> = Vec::new();
    while let Some((m, c)) = rest.terms().first().cloned() {
        match find_divisor(&m, basis) {
            Some(k) => {
                let g = &basis[k];
                let lg = g.leading_monomial().expect("nonzero");
                let factor = field.neg(&field.div(&c, g.leading_coefficient().unwrap()).unwrap());
                rest = ring.add_scaled(&rest, &factor, &m.div(lg), g)?;
            }
            None => {
                remainder.push((m, c));
                rest = Poly::from_sorted_tail(rest, 1);
            }
        }
    }
    Ok(Poly::from_sorted(remainder))
}

/// Indices of a minimal subset with the same leading ideal: for each leading monomial not a
/// proper multiple of another, the first element carrying it. Increasing order of leading monomial.
pub fn minimal_indices(leads: &[&Monomial], order: &MonomialOrder) -> Vec<usize> {
    let mut idx: Vec<usize> = (0..leads.len()).collect();
    idx.sort_by(|&a, &b| order.cmp(leads[a], leads[b]).then(a.cmp(&b)));
    idx.dedup_by(|a, b| leads[*a] == leads[*b]);
    let mut minimal: Vec<usize> = Vec::new();
    for k in idx {
        if !minimal.iter().any(|&h| leads[h].divides(leads[k])) {
            minimal.push(k);
        }
    }
    minimal
}

/// The reduced Gröbner basis from any Gröbner basis: drop elements whose leading monomial is a
/// multiple of another's, reduce the tails, make monic, sort by decreasing leading monomial.
pub fn reduced_basis<F: Field>(ring: &Ring<F>, basis: Vec<Poly<F>>) -> Result<Vec<Poly<F>>> {
    let basis: Vec<Poly<F>> = basis.into_iter().filter(|g| !g.is_zero()).collect();
    if basis.iter().any(|g| g.is_constant()) {
        return Ok(vec![ring.one()]);
    }
    let leads: Vec<&Monomial> = basis
        .iter()
        .map(|g| g.leading_monomial().unwrap())
        .collect();
    let minimal: Vec<Poly<F>> = minimal_indices(&leads, &ring.order)
        .into_iter()
        .map(|k| basis[k].clone())
        .collect();
    let mut reduced = Vec::with_capacity(minimal.len());
    for k in 0..minimal.len() {
        let g = &minimal[k];
        let (lead, tail) = g.split_lead();
        let others: Vec<Poly<F>> = minimal
            .iter()
            .enumerate()
            .filter(|(i, _)| *i != k)
            .map(|(_, h)| h.clone())
            .collect();
        let tail = normal_form(ring, &tail, &others)?;
        let full = ring.add(&ring.term(lead.0, lead.1), &tail);
        reduced.push(ring.monic(&full));
    }
    reduced.sort_by(|a, b| ring.cmp(b.leading_monomial().unwrap(), a.leading_monomial().unwrap()));
    Ok(reduced)
}
