//! The final check of a lifted basis over QQ, with integer coefficients throughout: a basis
//! element or S-polynomial is made primitive over ZZ and reduced fraction-free (each step
//! h ← a·h − b·m·g with a, b coprime integers cancels the leading term), so no rational gcd is
//! taken per coefficient operation; contents are divided out after each step with Lehmer's gcd
//! ([`super::integer_gcd`]), and the reduced polynomial's terms are moved and scaled in place
//! rather than copied (allocation and the binary gcd dominated before). Head reduction
//! decides both questions asked: with G a Gröbner basis, f ∈ ⟨G⟩ iff head reduction of f
//! ends at 0; and G is a Gröbner basis iff every S-polynomial left by the Gebauer–Möller
//! criteria head-reduces to 0 (Buchberger 1965). Pairs are checked in parallel. This exact
//! reduction is the fallback of the much faster check by identities proved modulo primes
//! ([`super::identities`]), for the rare basis whose identities need more primes than it tries.

use super::super::pairs::PairSet;
use super::integer_gcd::gcd;
use crate::control::Control;
use crate::error::Result;
use crate::field::{integer_scale, RationalField};
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use num_bigint::BigInt;
use num_traits::{One, Zero};
use rayon::prelude::*;
use std::cmp::Ordering;

/// Terms with integer coefficients, strictly decreasing in the ring's order, none zero.
type IntPoly = Vec<(Monomial, BigInt)>;

/// The primitive integer polynomial that is a rational multiple of f.
fn primitive(ring: &Ring<RationalField>, f: &Poly<RationalField>) -> IntPoly {
    let coeffs: Vec<_> = f.terms().iter().map(|t| &t.1).collect();
    let scaled = ring.scale(f, &integer_scale(&coeffs));
    scaled
        .terms()
        .iter()
        .map(|(m, c)| (m.clone(), c.numer().clone()))
        .collect()
}

/// a·h − b·m·g over the tails (the leading terms cancel by the choice of a and b). `h` is
/// consumed: its terms are moved and scaled in place, so only the terms of m·g are allocated.
fn combine(
    ring: &Ring<RationalField>,
    h: impl IntoIterator<Item = (Monomial, BigInt)>,
    a: &BigInt,
    b: &BigInt,
    m: &Monomial,
    g: &[(Monomial, BigInt)],
) -> Result<IntPoly> {
    let mut h = h.into_iter().peekable();
    let mut out = Vec::with_capacity(h.size_hint().0 + g.len());
    let scale = |mut c: BigInt| {
        if !a.is_one() {
            c *= a;
        }
        c
    };
    for (gm, gc) in g {
        let shifted = gm.mul(m)?;
        while let Some(t) = h.next_if(|t| ring.cmp(&t.0, &shifted) == Ordering::Greater) {
            out.push((t.0, scale(t.1)));
        }
        let product = if b.is_one() { gc.clone() } else { b * gc };
        match h.next_if(|t| t.0 == shifted) {
            Some((hm, hc)) => {
                let c = scale(hc) - product;
                if !c.is_zero() {
                    out.push((hm, c));
                }
            }
            None => out.push((shifted, -product)),
        }
    }
    out.extend(h.map(|(hm, hc)| (hm, scale(hc))));
    Ok(out)
}

/// Divides out the gcd of the coefficients. The gcd is taken from the last (often smallest) term
/// and given up as soon as it is 1, which is the common case, so this is cheap to call often.
fn make_primitive(h: &mut IntPoly) {
    let mut content = BigInt::zero();
    for t in h.iter().rev() {
        content = gcd(&content, &t.1);
        if content.is_one() {
            return;
        }
    }
    if !content.is_zero() {
        for t in h.iter_mut() {
            t.1 /= &content;
        }
    }
}

/// Whether head reduction of h by `basis` ends at 0.
fn head_reduces_to_zero(
    ring: &Ring<RationalField>,
    mut h: IntPoly,
    basis: &[IntPoly],
    control: &Control,
) -> Result<bool> {
    while let Some((lm, lc)) = h.first() {
        control.check()?;
        let Some(g) = basis.iter().find(|g| g[0].0.divides(lm)) else {
            return Ok(false);
        };
        let d = gcd(lc, &g[0].1);
        let (a, b) = (&g[0].1 / &d, lc / &d);
        let m = lm.div(&g[0].0);
        h = combine(ring, h.into_iter().skip(1), &a, &b, &m, &g[1..])?;
        make_primitive(&mut h);
    }
    Ok(true)
}

/// The S-polynomial of f and g with integer coefficients.
fn s_polynomial(
    ring: &Ring<RationalField>,
    f: &IntPoly,
    g: &IntPoly,
    lcm: &Monomial,
) -> Result<IntPoly> {
    let d = gcd(&f[0].1, &g[0].1);
    let (a, b) = (&g[0].1 / &d, &f[0].1 / &d);
    let mf = lcm.div(&f[0].0);
    let f_shifted: IntPoly = f[1..]
        .iter()
        .map(|(m, c)| Ok((m.mul(&mf)?, c.clone())))
        .collect::<Result<_>>()?;
    combine(ring, f_shifted, &a, &b, &lcm.div(&g[0].0), &g[1..])
}

/// Whether `basis` (nonzero polynomials) is a Gröbner basis whose ideal contains every generator.
pub fn is_groebner_basis_containing(
    ring: &Ring<RationalField>,
    basis: &[Poly<RationalField>],
    gens: &[Poly<RationalField>],
    control: &Control,
) -> Result<bool> {
    if let Some(answer) = super::identities::check(ring, basis, gens, control)? {
        return Ok(answer);
    }
    let int_basis: Vec<IntPoly> = basis.iter().map(|g| primitive(ring, g)).collect();
    let mut pairs = PairSet::default();
    for g in basis {
        pairs.insert(g.leading_monomial().unwrap().clone(), g.degree().unwrap());
    }
    let mut work = pairs.pairs;
    work.sort_by_key(|p| p.lcm.degree());
    let failure = work.par_iter().map(|pair| -> Result<bool> {
        let s = s_polynomial(ring, &int_basis[pair.i], &int_basis[pair.j], &pair.lcm)?;
        head_reduces_to_zero(ring, s, &int_basis, control)
    });
    match failure.find_any(|r| !matches!(r, Ok(true))) {
        Some(Err(e)) => return Err(e),
        Some(Ok(_)) => return Ok(false),
        None => {}
    }
    for g in gens {
        if !head_reduces_to_zero(ring, primitive(ring, g), &int_basis, control)? {
            return Ok(false);
        }
    }
    Ok(true)
}
