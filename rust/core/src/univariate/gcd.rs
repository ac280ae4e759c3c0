//! Greatest common divisors of univariate polynomials and the Bézout cofactors: Euclid's
//! algorithm and its extended form, with the large degrees first brought down by half-gcd
//! steps ([`super::half_gcd`]), so that a gcd of degree n costs O(M(n) log n).

use super::half_gcd::reduce_pair;
use super::{divide, monic, multiply, subtract, trimmed, Univariate};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;

/// Monic greatest common divisor (zero when both are zero).
pub fn gcd<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    gcd_checked(field, a, b, &Control::new()).expect("no limits and no interruption")
}

/// Monic greatest common divisor, polling `control` between steps.
pub fn gcd_checked<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    control: &Control,
) -> Result<Univariate<F>> {
    let (a, b) = ordered(field, a, b);
    let (a, b, _) = reduce_pair(field, a, b, false, control)?;
    euclid(field, &a, &b, control)
}

/// The classical Euclidean algorithm (one schoolbook division per step): the reference the
/// half-gcd route is tested against, and the tail of every gcd.
pub fn euclid<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    control: &Control,
) -> Result<Univariate<F>> {
    let (mut a, mut b) = (trimmed(field, a.to_vec()), trimmed(field, b.to_vec()));
    while !b.is_empty() {
        control.check()?;
        let r = divide(field, &a, &b).1;
        a = b;
        b = r;
    }
    Ok(monic(field, &a))
}

/// (a, b) trimmed, the one of larger degree first.
fn ordered<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> (Univariate<F>, Univariate<F>) {
    let (a, b) = (trimmed(field, a.to_vec()), trimmed(field, b.to_vec()));
    if a.len() >= b.len() {
        (a, b)
    } else {
        (b, a)
    }
}

/// (s, t) with s·a + t·b = gcd(a, b) monic, deg s < deg b and deg t < deg a (extended Euclid);
/// a and b not both zero.
pub fn bezout<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> (Univariate<F>, Univariate<F>) {
    let (_, s, t) = extended_gcd(field, a, b);
    (s, t)
}

/// (g, s, t) with g = gcd(a, b) monic and s·a + t·b = g; a and b not both zero.
pub fn extended_gcd<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
) -> (Univariate<F>, Univariate<F>, Univariate<F>) {
    let (a, b) = (trimmed(field, a.to_vec()), trimmed(field, b.to_vec()));
    let swapped = a.len() < b.len();
    let (x, y) = if swapped { (b, a) } else { (a, b) };
    let (r0, r1, total) =
        reduce_pair(field, x, y, true, &Control::new()).expect("no limits and no interruption");
    let [[s0, t0], [s1, t1]] = total.expect("tracked").entries;
    let (g, s, t) = extended_euclid(field, r0, r1, (s0, t0), (s1, t1));
    if swapped {
        (g, t, s)
    } else {
        (g, s, t)
    }
}

/// Extended Euclid from remainders r0, r1 with known cofactors (r_i = s_i·a + t_i·b).
fn extended_euclid<F: Field>(
    field: &F,
    mut r0: Univariate<F>,
    mut r1: Univariate<F>,
    (mut s0, mut t0): (Univariate<F>, Univariate<F>),
    (mut s1, mut t1): (Univariate<F>, Univariate<F>),
) -> (Univariate<F>, Univariate<F>, Univariate<F>) {
    while !r1.is_empty() {
        let (q, r) = divide(field, &r0, &r1);
        let s2 = subtract(field, &s0, &multiply(field, &q, &s1));
        let t2 = subtract(field, &t0, &multiply(field, &q, &t1));
        (r0, r1, s0, s1, t0, t1) = (r1, r, s1, s2, t1, t2);
    }
    let inv = field
        .inv(r0.last().expect("not both zero"))
        .expect("nonzero");
    (
        super::scale(field, &r0, &inv),
        super::scale(field, &s0, &inv),
        super::scale(field, &t0, &inv),
    )
}

/// The inverse of a modulo m (deg m ≥ 1), or `None` when they have a common factor.
pub fn inverse_mod<F: Field>(field: &F, a: &[F::Elem], m: &[F::Elem]) -> Option<Univariate<F>> {
    let a = super::remainder(field, a, m);
    if a.is_empty() {
        return None;
    }
    let (g, s, _) = extended_gcd(field, &a, m);
    (g.len() == 1).then_some(s)
}
