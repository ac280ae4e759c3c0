//! The closed points of a zero-dimensional system over GF(q): the Galois orbits of its solutions
//! over the algebraic closure, i.e. the maximal ideals containing I. Each comes with its degree
//! [k(P) : k] and its reduced lex basis, a triangular set generating the maximal ideal
//! (Lazard 1992).
//!
//! Method: A = R/√I (the radical by Seidenberg 1974) is a product of fields GF(q^(m_j)), one per
//! closed point, and the elements fixed by Frobenius a ↦ a^q form the subalgebra ∏ GF(q)
//! (Berlekamp 1967). A random fixed element e takes a value in GF(q) on each factor; its minimal
//! polynomial has distinct roots c in GF(q), and the ideals √I + (e − c) split the points into
//! groups; each group is split again until the fixed subalgebra is one-dimensional (the ideal is
//! maximal). Two given factors are separated by a random e with probability 1 − 1/q, so the
//! splitting ends after a few rounds even over GF(2); no separating linear form is needed.

use super::solve::check_point;
use crate::control::Control;
use crate::echelon::kernel;
use crate::error::Result;
use crate::field::field_order_limbs;
use crate::field::Field;
use crate::groebner::order_change::fglm::fglm;
use crate::groebner::{groebner_basis, Engine, ReducedBasis};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
use crate::rng::Rng;
use crate::univariate::{self, random_element};
use crate::zerodim::maximal::frobenius_matrix;
use crate::zerodim::radical::zero_dimensional_radical;
use crate::zerodim::{require_zero_dimensional, Quotient};

/// One closed point: a Galois orbit of solutions.
#[derive(Clone, Debug)]
pub struct ClosedPoint<F: Field> {
    /// [k(P) : k], the number of solutions in the orbit.
    pub degree: usize,
    /// The reduced lex basis of the maximal ideal (a triangular set).
    pub equations: ReducedBasis<F>,
}

impl<F: Field> ClosedPoint<F> {
    /// The coordinates of the point when it is rational (degree 1).
    pub fn rational_point(&self) -> Option<Vec<F::Elem>> {
        if self.degree != 1 {
            return None;
        }
        let ring = &self.equations.ring;
        (0..ring.nvars())
            .map(|i| {
                let nf = self.equations.reduce(&ring.var(i)).ok()?;
                Some(
                    nf.terms()
                        .first()
                        .map_or_else(|| ring.field.zero(), |(_, c)| c.clone()),
                )
            })
            .collect()
    }
}

const SEED: u64 = 0x00c1_05ed;

/// The closed points of V(gens) for a zero-dimensional system over a finite field.
pub fn closed_points<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    engine: Engine,
    control: &Control,
) -> Result<Vec<ClosedPoint<F>>> {
    field_order_limbs(&ring.field, "closed points")?;
    let r = ring.with_order(MonomialOrder::Grevlex)?;
    let adopted: Vec<Poly<F>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
    let gb = groebner_basis(&r, &adopted, engine, control)?;
    if gb.is_unit_ideal() {
        return Ok(vec![]);
    }
    require_zero_dimensional(&gb, "closed points")?;
    let radical = zero_dimensional_radical(&gb, engine, control)?;
    let lex = ring.with_order(MonomialOrder::Lex)?;
    let mut rng = Rng::new(SEED);
    let mut out = Vec::new();
    let mut pending = vec![radical];
    while let Some(part) = pending.pop() {
        control.check()?;
        let quotient = Quotient::new(part, control)?;
        match split_once(&quotient, &mut rng, engine, control)? {
            Some(parts) => pending.extend(parts.into_iter().filter(|p| !p.is_unit_ideal())),
            None => {
                let point = ClosedPoint {
                    degree: quotient.dimension(),
                    equations: fglm(&quotient.basis, &lex, control)?,
                };
                if let Some(coordinates) = point.rational_point() {
                    check_point(ring, gens, &coordinates)?;
                }
                out.push(point);
            }
        }
    }
    out.sort_by_key(|p| p.degree);
    Ok(out)
}

/// For a reduced A: `None` when A is a field; else the ideals √I + (e − c) for a random
/// Frobenius-fixed e and the roots c of its minimal polynomial (retried until e is not constant).
fn split_once<F: Field>(
    quotient: &Quotient<F>,
    rng: &mut Rng,
    engine: Engine,
    control: &Control,
) -> Result<Option<Vec<ReducedBasis<F>>>> {
    let ring = &quotient.basis.ring;
    let field = &ring.field;
    let d = quotient.dimension();
    // Columns of Φ − Id as rows of its transpose: the kernel of (Φ − Id) is that of the
    // matrix whose rows are indexed by coordinates; build that matrix.
    let columns = frobenius_matrix(quotient, control)?;
    let rows: Vec<Vec<F::Elem>> = (0..d)
        .map(|i| {
            (0..d)
                .map(|j| {
                    let c = columns[j][i].clone();
                    if i == j {
                        field.sub(&c, &field.one())
                    } else {
                        c
                    }
                })
                .collect()
        })
        .collect();
    let fixed = kernel(field, rows, d);
    if fixed.len() <= 1 {
        return Ok(None);
    }
    loop {
        control.check()?;
        let mut e = vec![field.zero(); d];
        for v in &fixed {
            let c = random_element(field, rng);
            for (x, y) in e.iter_mut().zip(v) {
                *x = field.add(x, &field.mul(&c, y));
            }
        }
        let element = quotient.element(&e);
        let minimal = quotient.minimal_polynomial(&element, control)?;
        if minimal.len() <= 2 {
            continue;
        }
        let mut parts = Vec::new();
        for c in univariate::roots(field, &minimal, control)? {
            let mut gens = quotient.basis.polys.clone();
            gens.push(ring.sub(&element, &ring.constant(c)));
            parts.push(groebner_basis(ring, &gens, engine, control)?);
        }
        return Ok(Some(parts));
    }
}
