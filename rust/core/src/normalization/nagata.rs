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
        let mut in_rest: Vec<&Poly<F>> = gb
            .polys
            .iter()
            .filter(|g| {
                g.terms()
                    .iter()
                    .all(|(m, _)| integral.iter().all(|&i| m.exponents()[i] == 0))
            })
            .collect();
        in_rest.sort_by_key(|g| (g.len(), g.degree()));
        let step = choose_step(&elim, &in_rest, rng).ok_or_else(|| {
            Error::invalid("Noether normalization: the elimination ideal is zero although the dimension is smaller")
        })?;
        let mut images: Vec<Poly<F>> = (0..n).map(|i| elim.var(i)).collect();
        for (u, c, e) in &step.shifts {
            let power = elim.pow_within(&elim.var(step.v), u64::from(*e), control)?;
            images[*u] = elim.add(&images[*u], &elim.scale(&power, c));
            let shift = ring.scale(
                &ring.pow_within(&coords[step.v], u64::from(*e), control)?,
                c,
            );
            coords[*u] = ring.sub(&coords[*u], &shift);
        }
        current = gb
            .polys
            .iter()
            .map(|g| elim.substitute_within(g, &images, &elim, control))
            .collect::<Result<_>>()?;
        rest.retain(|&i| i != step.v);
        integral.push(step.v);
    }
    integral.sort_unstable();
    let shifts = rest
        .iter()
        .map(|&s| ring.sub(&coords[s], &ring.var(s)))
        .collect();
    Ok(Change {
        params: rest,
        nonparams: integral,
        shifts,
    })
}

/// The cheapest substitution that makes one of `candidates` monic in one of its variables v,
/// shifting as few of its other variables as possible: none (f already monic in v), then linear
/// shifts with random coefficients, then equal and then distinct small exponents, and Nagata's
/// exponents (all other variables of f) last.
fn choose_step<F: Field>(
    ring: &Ring<F>,
    candidates: &[&Poly<F>],
    rng: &mut Rng,
) -> Option<Step<F>> {
    let field = &ring.field;
    let one = field.one();
    let options: Vec<Candidate<'_, F>> = candidates
        .iter()
        .flat_map(|f| {
            let support = support(f);
            support
                .iter()
                .rev()
                .map(|&v| {
                    let others: Vec<usize> = support.iter().copied().filter(|&u| u != v).collect();
                    (*f, v, subsets_by_size(&others))
                })
                .collect::<Vec<_>>()
        })
        .collect();
    let test = |f: &Poly<F>, v: usize, set: &[usize], cs: &[F::Elem], es: &[u32]| {
        top_coefficient_is_constant(ring, f, v, set, cs, es)
    };
    for (f, v, _) in &options {
        if test(f, *v, &[], &[], &[]) {
            return Some(Step {
                v: *v,
                shifts: vec![],
            });
        }
    }
    for _ in 0..2 {
        for (f, v, subsets) in &options {
            for set in subsets.iter().filter(|s| !s.is_empty()) {
                let cs: Vec<F::Elem> = set.iter().map(|_| rng.nonzero(field)).collect();
                let es = vec![1; set.len()];
                if test(f, *v, set, &cs, &es) {
                    return Some(step(*v, set, cs, es));
                }
            }
        }
    }
    let max_r = candidates
        .iter()
        .map(|f| exponent_bound(f))
        .max()
        .unwrap_or(2);
    for e in 2..=max_r {
        for (f, v, subsets) in &options {
            for set in subsets.iter().filter(|s| !s.is_empty()) {
                let ones = vec![one.clone(); set.len()];
                let equal = vec![e; set.len()];
                if test(f, *v, set, &ones, &equal) {
                    return Some(step(*v, set, ones, equal));
                }
                if let Some(distinct) = powers(e, set.len()).filter(|_| set.len() > 1) {
                    if test(f, *v, set, &ones, &distinct) {
                        return Some(step(*v, set, ones, distinct));
                    }
                }
            }
        }
    }
    // Nagata: exponents r, r^2, ... with r above every exponent of f separate all monomials.
    let (f, v, subsets) = options.first()?;
    let all = subsets.last()?;
    let exps = powers(exponent_bound(f), all.len())?;
    Some(step(*v, all, vec![one; all.len()], exps))
}

/// Subsets of `items` ordered by size (all of them for up to 6 items; else none, the whole set).
fn subsets_by_size(items: &[usize]) -> Vec<Vec<usize>> {
    if items.len() > 6 {
        return vec![vec![], items.to_vec()];
    }
    let mut all: Vec<Vec<usize>> = (0u32..1 << items.len())
        .map(|mask| {
            items
                .iter()
                .enumerate()
                .filter(|(k, _)| mask >> k & 1 == 1)
                .map(|(_, &u)| u)
                .collect()
        })
        .collect();
    all.sort_by_key(|s: &Vec<usize>| s.len());
    all
}

/// A candidate f, the variable v to make integral, and the subsets of the other variables of f
/// that may be shifted, smallest first.
type Candidate<'a, F> = (&'a Poly<F>, usize, Vec<Vec<usize>>);

fn step<F: Field>(
    v: usize,
    others: &[usize],
    coefficients: Vec<F::Elem>,
    exps: Vec<u32>,
) -> Step<F> {
    Step {
        v,
        shifts: others
            .iter()
            .copied()
            .zip(coefficients)
            .zip(exps)
            .map(|((u, c), e)| (u, c, e))
            .collect(),
    }
}

fn support<F: Field>(f: &Poly<F>) -> Vec<usize> {
    let n = f.terms().first().map_or(0, |t| t.0.nvars());
    (0..n)
        .filter(|&i| f.terms().iter().any(|(m, _)| m.exponents()[i] > 0))
        .collect()
}

/// One more than the largest exponent in f.
fn exponent_bound<F: Field>(f: &Poly<F>) -> u32 {
    f.terms()
        .iter()
        .flat_map(|(m, _)| m.exponents().iter().copied())
        .max()
        .unwrap_or(0)
        + 1
}

/// [e, e^2, ..., e^k], or `None` when they overflow.
fn powers(e: u32, k: usize) -> Option<Vec<u32>> {
    (1..=k as u32).map(|i| e.checked_pow(i)).collect()
}

/// Whether f(u -> u + c_u v^{e_u} for u in `shifted`) has a nonzero constant as its coefficient
/// of the top power of v. Only the monomials of largest weight α_v + Σ e_u α_u reach that power,
/// each with coefficient f_α Π c_u^{α_u} times the unshifted variables' part; the sum must be a
/// nonzero constant.
fn top_coefficient_is_constant<F: Field>(
    ring: &Ring<F>,
    f: &Poly<F>,
    v: usize,
    shifted: &[usize],
    coefficients: &[F::Elem],
    exps: &[u32],
) -> bool {
    let field = &ring.field;
    let weight = |e: &[u32]| -> u128 {
        u128::from(e[v])
            + shifted
                .iter()
                .zip(exps)
                .map(|(&u, &w)| u128::from(e[u]) * u128::from(w))
                .sum::<u128>()
    };
    let top = f
        .terms()
        .iter()
        .map(|(m, _)| weight(m.exponents()))
        .max()
        .unwrap_or(0);
    let mut sums: std::collections::HashMap<Vec<u32>, F::Elem> = std::collections::HashMap::new();
    for (m, c) in f
        .terms()
        .iter()
        .filter(|(m, _)| weight(m.exponents()) == top)
    {
        let mut t = c.clone();
        for (&u, cu) in shifted.iter().zip(coefficients) {
            t = field.mul(&t, &field.pow(cu, u64::from(m.exponents()[u])));
        }
        let mut rest = m.exponents().to_vec();
        rest[v] = 0;
        for &u in shifted {
            rest[u] = 0;
        }
        let entry = sums.entry(rest).or_insert_with(|| field.zero());
        *entry = field.add(entry, &t);
    }
    sums.iter().all(|(rest, c)| {
        if rest.iter().all(|&e| e == 0) {
            !field.is_zero(c)
        } else {
            field.is_zero(c)
        }
    }) && sums.keys().any(|rest| rest.iter().all(|&e| e == 0))
}
