//! Parameters by iterated substitutions x_u -> x_u + c·x_v^e, after Nagata (1962, *Local Rings*):
//! the guaranteed fallback of the search, valid over every field, GF(2) included.
//!
//! One step: J is the ideal in the current coordinates, E the variables already made integral
//! and Rm the rest. An elimination basis (E >> Rm) gives J ∩ k[Rm] ≠ 0 (it is zero only when
//! |Rm| = dim). Pick f in it and a variable v of f; substituting u -> u + c_u v^{e_u} for the
//! other variables u of f makes f monic in v exactly when the constant
//! Σ_{α of largest weight} f_α Π c_u^{α_u} is nonzero, the weight being α_v + Σ e_u α_u. Then v
//! is integral over k[Rm \ v]; move v to E. Nagata's exponents e_u = r^k (r above every exponent
//! of f) make the weights of distinct monomials distinct, so the test always passes with them;
//! smaller exponents are tried first because they give much smaller certificates.

use super::changes::{Change, Rng};
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::{groebner_basis, Engine};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};

/// One substitution step: v becomes integral after u -> u + c·v^e for each (u, c, e).
struct Step<F: Field> {
    v: usize,
    shifts: Vec<(usize, F::Elem, u32)>,
}

/// A change whose parameters make R/I finite, found by Nagata steps; `d` is dim R/I.
pub fn nagata_change<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    d: usize,
    rng: &mut Rng,
    control: &Control,
) -> Result<Change<F>> {
    let n = ring.nvars();
    // coords[i]: the current coordinate y_i as a polynomial in the original variables.
    let mut coords: Vec<Poly<F>> = (0..n).map(|i| ring.var(i)).collect();
    let mut current: Vec<Poly<F>> = gens.to_vec();
    let mut rest: Vec<usize> = (0..n).collect();
    let mut integral: Vec<usize> = Vec::new();
    while rest.len() > d {
        control.check()?;
        let elim = ring.with_order(MonomialOrder::elimination(&integral, n))?;
        let adopted: Vec<Poly<F>> = current.iter().map(|g| elim.adopt(g.clone())).collect();
        let gb = groebner_basis(&elim, &adopted, Engine::default(), control)?;
        let mut in_rest: Vec<&Poly<F>> =
            gb.polys.iter().filter(|g| g.terms().iter().all(|(m, _)| integral.iter().all(|&i| m.exponents()[i] == 0))).collect();
        in_rest.sort_by_key(|g| (g.len(), g.degree()));
        let step = choose_step(&elim, &in_rest, rng).ok_or_else(|| {
            Error::invalid("Noether normalization: the elimination ideal is zero although the dimension is smaller")
        })?;
        let mut images: Vec<Poly<F>> = (0..n).map(|i| elim.var(i)).collect();
        for (u, c, e) in &step.shifts {
            let power = elim.pow(&elim.var(step.v), u64::from(*e))?;
            images[*u] = elim.add(&images[*u], &elim.scale(&power, c));
            let shift = ring.scale(&ring.pow(&coords[step.v], u64::from(*e))?, c);
            coords[*u] = ring.sub(&coords[*u], &shift);
        }
        current = gb.polys.iter().map(|g| elim.substitute(g, &images, &elim)).collect::<Result<_>>()?;
        rest.retain(|&i| i != step.v);
        integral.push(step.v);
    }
    integral.sort_unstable();
    let shifts = rest.iter().map(|&s| ring.sub(&coords[s], &ring.var(s))).collect();
    Ok(Change { params: rest, nonparams: integral, shifts })
}

/// The cheapest substitution that makes one of `candidates` monic in one of its variables:
/// none (univariate f), then linear shifts with random coefficients, then equal and then
/// distinct small exponents, and Nagata's exponents last.
fn choose_step<F: Field>(ring: &Ring<F>, candidates: &[&Poly<F>], rng: &mut Rng) -> Option<Step<F>> {
    let field = &ring.field;
    let one = field.one();
    let options = |f: &Poly<F>| -> Vec<(usize, Vec<usize>)> {
        let support = support(f);
        support.iter().rev().map(|&v| (v, support.iter().copied().filter(|&u| u != v).collect())).collect()
    };
    for f in candidates {
        if let [(v, others)] = options(f).as_slice() {
            if others.is_empty() {
                return Some(Step { v: *v, shifts: vec![] });
            }
        }
    }
    for _ in 0..3 {
        for f in candidates {
            for (v, others) in options(f) {
                let coefficients: Vec<F::Elem> = others.iter().map(|_| rng.nonzero(field)).collect();
                let exps = vec![1; others.len()];
                if top_coefficient_nonzero(ring, f, v, &others, &coefficients, &exps) {
                    return Some(step(v, &others, coefficients, exps));
                }
            }
        }
    }
    let max_r = candidates.iter().map(|f| exponent_bound(f)).max().unwrap_or(2);
    for e in 2..=max_r {
        for f in candidates {
            for (v, others) in options(f) {
                let ones = vec![one.clone(); others.len()];
                let equal = vec![e; others.len()];
                if top_coefficient_nonzero(ring, f, v, &others, &ones, &equal) {
                    return Some(step(v, &others, ones, equal));
                }
                if let Some(distinct) = powers(e, others.len()) {
                    if top_coefficient_nonzero(ring, f, v, &others, &ones, &distinct) {
                        return Some(step(v, &others, ones, distinct));
                    }
                }
            }
        }
    }
    // Nagata: exponents r, r^2, ... with r above every exponent of f separate all monomials.
    let f = candidates.first()?;
    let (v, others) = options(f).into_iter().next()?;
    let exps = powers(exponent_bound(f), others.len())?;
    Some(step(v, &others, vec![one; others.len()], exps))
}

fn step<F: Field>(v: usize, others: &[usize], coefficients: Vec<F::Elem>, exps: Vec<u32>) -> Step<F> {
    Step { v, shifts: others.iter().copied().zip(coefficients).zip(exps).map(|((u, c), e)| (u, c, e)).collect() }
}

fn support<F: Field>(f: &Poly<F>) -> Vec<usize> {
    let n = f.terms().first().map_or(0, |t| t.0.nvars());
    (0..n).filter(|&i| f.terms().iter().any(|(m, _)| m.exponents()[i] > 0)).collect()
}

/// One more than the largest exponent in f.
fn exponent_bound<F: Field>(f: &Poly<F>) -> u32 {
    f.terms().iter().flat_map(|(m, _)| m.exponents().iter().copied()).max().unwrap_or(0) + 1
}

/// [e, e^2, ..., e^k], or `None` when they overflow.
fn powers(e: u32, k: usize) -> Option<Vec<u32>> {
    (1..=k as u32).map(|i| e.checked_pow(i)).collect()
}

/// Whether f(u -> u + c_u v^{e_u}) has a nonzero constant as its coefficient of the top power
/// of v: only the monomials of largest weight α_v + Σ e_u α_u reach that power, each with
/// coefficient f_α Π c_u^{α_u}.
fn top_coefficient_nonzero<F: Field>(
    ring: &Ring<F>,
    f: &Poly<F>,
    v: usize,
    others: &[usize],
    coefficients: &[F::Elem],
    exps: &[u32],
) -> bool {
    let field = &ring.field;
    let weight = |e: &[u32]| -> u128 {
        u128::from(e[v]) + others.iter().zip(exps).map(|(&u, &w)| u128::from(e[u]) * u128::from(w)).sum::<u128>()
    };
    let top = f.terms().iter().map(|(m, _)| weight(m.exponents())).max().unwrap_or(0);
    let mut sum = field.zero();
    for (m, c) in f.terms().iter().filter(|(m, _)| weight(m.exponents()) == top) {
        let mut t = c.clone();
        for (&u, cu) in others.iter().zip(coefficients) {
            t = field.mul(&t, &field.pow(cu, u64::from(m.exponents()[u])));
        }
        sum = field.add(&sum, &t);
    }
    !field.is_zero(&sum)
}
