//! The solutions of a Boolean system read off its reduced Boolean Gröbner basis G.
//!
//! With the field equations the ideal is zero-dimensional and radical (it contains x^2 + x for
//! every variable), so the number of solutions in GF(2)^n is the number of standard monomials:
//! the square-free monomials that no leading monomial of G divides (Cox, Little and O'Shea 1992,
//! §5.3; Seidenberg 1974 for the radical). They are counted by splitting on one variable at a
//! time — those avoiding x_v, plus those containing it — as in the recursive computation of
//! Hilbert series of monomial ideals (Bigatti 1997).
//!
//! The points themselves come from splitting as well: a variable that is not a leading monomial
//! takes both values on the solution set (otherwise x_v + c would reduce to zero), so adding
//! x_v = 0 and x_v = 1 to the basis splits the solutions into two nonempty parts; when every
//! variable is a leading monomial the basis is {x_v + c_v}, one point.

use super::f4;
use super::monomial::{Bits, BoolOrder};
use crate::control::Control;
use crate::error::Result;
use num_bigint::BigUint;

/// The number of square-free monomials in `nvars` variables that no monomial of `leads` divides.
pub fn count_standard<const W: usize>(
    leads: &[Bits<W>],
    nvars: usize,
    control: &Control,
) -> Result<BigUint> {
    let all = Bits::<W>(std::array::from_fn(|w| {
        let bits = nvars.saturating_sub(64 * w).min(64);
        if bits == 64 {
            !0
        } else {
            (1u64 << bits) - 1
        }
    }));
    count_in(minimal(leads.to_vec()), all, control)
}

/// Leading monomials no other one divides, without repeats.
fn minimal<const W: usize>(mut leads: Vec<Bits<W>>) -> Vec<Bits<W>> {
    leads.sort_by_key(|m| m.degree());
    leads.dedup();
    let mut out: Vec<Bits<W>> = Vec::with_capacity(leads.len());
    for m in leads {
        if !out.iter().any(|k| k.divides(&m)) {
            out.push(m);
        }
    }
    out
}

/// Subsets of `vars` containing no monomial of `leads` (a minimal set, all inside `vars`).
fn count_in<const W: usize>(
    leads: Vec<Bits<W>>,
    vars: Bits<W>,
    control: &Control,
) -> Result<BigUint> {
    control.check()?;
    if leads.iter().any(|m| m.is_one()) {
        return Ok(BigUint::ZERO);
    }
    let used = leads.iter().fold(Bits::ONE, |u, m| u.union(m));
    let free = vars.minus(&used).degree();
    if leads.is_empty() {
        return Ok(BigUint::from(1u8) << free);
    }
    // Leads of degree one: their variable is 0 on every standard monomial.
    if leads.iter().all(|m| m.degree() == 1) {
        return Ok(BigUint::from(1u8) << free);
    }
    // Split on the variable in most leads.
    let mut counts = vec![0u32; 64 * W];
    for m in &leads {
        for v in m.vars() {
            counts[v] += 1;
        }
    }
    let v = (0..64 * W)
        .max_by_key(|&v| counts[v])
        .expect("some variable");
    let x = Bits::var(v);
    let rest = used.minus(&x);
    let without: Vec<Bits<W>> = leads.iter().filter(|m| !m.has_var(v)).copied().collect();
    let with: Vec<Bits<W>> = minimal(leads.iter().map(|m| m.minus(&x)).collect());
    let a = count_in(without, rest, control)?;
    let b = count_in(with, rest, control)?;
    Ok((a + b) << free)
}

/// The points of the solution set of the ideal with reduced Boolean basis `basis` (as bit sets,
/// bit v = x_v; at most `limit`), in increasing order of their words.
pub fn points<const W: usize>(
    order: BoolOrder,
    nvars: usize,
    basis: Vec<Vec<Bits<W>>>,
    limit: Option<usize>,
    control: &Control,
) -> Result<Vec<Bits<W>>> {
    let mut out = Vec::new();
    split(
        order,
        nvars,
        basis,
        limit.unwrap_or(usize::MAX),
        &mut out,
        control,
    )?;
    out.sort_unstable_by(|a, b| a.0.iter().rev().cmp(b.0.iter().rev()));
    Ok(out)
}

fn split<const W: usize>(
    order: BoolOrder,
    nvars: usize,
    basis: Vec<Vec<Bits<W>>>,
    limit: usize,
    out: &mut Vec<Bits<W>>,
    control: &Control,
) -> Result<()> {
    control.check()?;
    if out.len() >= limit || basis.iter().any(|p| p[0].is_one()) {
        return Ok(());
    }
    let linear_lead = |v: usize| basis.iter().any(|p| p[0] == Bits::var(v));
    let Some(v) = (0..nvars).find(|&v| !linear_lead(v)) else {
        // {x_v + c_v}: the point x_v = c_v (x_v + 1 has two monomials).
        let mut point = Bits::ONE;
        for p in &basis {
            if p.len() == 2 {
                point = point.union(&p[0]);
            }
        }
        out.push(point);
        return Ok(());
    };
    for value in [false, true] {
        let mut gens = basis.clone();
        gens.push(if value {
            vec![Bits::var(v), Bits::ONE]
        } else {
            vec![Bits::var(v)]
        });
        let (branch, _) = f4::compute(order, nvars, &gens, control)?;
        split(order, nvars, branch, limit, out, control)?;
    }
    Ok(())
}
