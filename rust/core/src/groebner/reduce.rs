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
/// when `basis` is a Gröbner basis). The part still to reduce lives in one of two buffers and
/// each step merges it into the other, so the steps allocate nothing once the buffers are
/// large enough; the leading term, which cancels by construction, is never merged.
pub fn normal_form<F: Field>(ring: &Ring<F>, f: &Poly<F>, basis: &[Poly<F>]) -> Result<Poly<F>> {
    let field = &ring.field;
    let mut rest: Vec<(Monomial, F::Elem)> = f.terms().to_vec();
    let mut spare: Vec<(Monomial, F::Elem)> = Vec::with_capacity(rest.len());
    // rest[..start] has gone to the remainder already.
    let mut start = 0;
    let mut remainder: Vec<(Monomial, F::Elem)> = Vec::new();
    while let Some((m, c)) = rest.get(start) {
        match find_divisor(m, basis) {
            Some(k) => {
                let (lead, tail) = basis[k].terms().split_first().expect("nonzero");
                let factor = field.neg(&field.div(c, &lead.1).unwrap());
                let shift = m.div(&lead.0);
                spare.clear();
                ring.add_scaled_into(&rest[start + 1..], &factor, &shift, tail, &mut spare)?;
                std::mem::swap(&mut rest, &mut spare);
                start = 0;
            }
            None => {
                remainder.push((m.clone(), c.clone()));
                start += 1;
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::control::Control;
    use crate::groebner::{groebner_basis, Engine};
    use crate::rng::Rng;
    use crate::test_support::{numbered_ring_32003, random_poly};

    /// The textbook division algorithm (Cox, Little and O'Shea 1992, §2.3), one fresh
    /// polynomial per step: what `normal_form` computed before it kept its buffers.
    fn division_remainder<F: Field>(ring: &Ring<F>, f: &Poly<F>, basis: &[Poly<F>]) -> Poly<F> {
        let mut rest = f.clone();
        let mut remainder = Poly::zero();
        while let Some((m, c)) = rest.terms().first().cloned() {
            let lead = ring.term(m.clone(), c.clone());
            match find_divisor(&m, basis) {
                Some(k) => {
                    let g = &basis[k];
                    let factor = ring.field.neg(
                        &ring
                            .field
                            .div(&c, g.leading_coefficient().unwrap())
                            .unwrap(),
                    );
                    let shift = m.div(g.leading_monomial().unwrap());
                    rest = ring.add_scaled(&rest, &factor, &shift, g).unwrap();
                }
                None => {
                    remainder = ring.add(&remainder, &lead);
                    rest = ring.sub(&rest, &lead);
                }
            }
        }
        remainder
    }

    /// Normal forms of random polynomials modulo the bases of random ideals agree with the
    /// textbook division, and reducing the remainder again changes nothing.
    #[test]
    fn normal_form_agrees_with_the_textbook_division() {
        let mut rng = Rng::new(7);
        let ring = numbered_ring_32003(4);
        for _ in 0..20 {
            let gens: Vec<_> = (0..3).map(|_| random_poly(&ring, &mut rng, 4, 2)).collect();
            let basis = groebner_basis(&ring, &gens, Engine::default(), &Control::new())
                .unwrap()
                .polys;
            for _ in 0..10 {
                let f = random_poly(&ring, &mut rng, 8, 5);
                let nf = normal_form(&ring, &f, &basis).unwrap();
                assert_eq!(nf, division_remainder(&ring, &f, &basis));
                assert_eq!(normal_form(&ring, &nf, &basis).unwrap(), nf);
            }
        }
    }
}
