//! Greatest common divisors of univariate polynomials by Euclid's algorithm, and the Bézout
//! cofactors by its extended form. Each division step is the schoolbook division of
//! [`super::division`] (quotients in a remainder sequence are short).

use super::{divide, monic, multiply, subtract, Univariate};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;

/// Monic greatest common divisor (zero when both are zero).
pub fn gcd<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    gcd_checked(field, a, b, &Control::new()).expect("no limits and no interruption")
}

/// Monic greatest common divisor, polling `control` between division steps.
pub fn gcd_checked<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    control: &Control,
) -> Result<Univariate<F>> {
    let (mut a, mut b) = (a.to_vec(), b.to_vec());
    super::trim(field, &mut a);
    super::trim(field, &mut b);
    while !b.is_empty() {
        control.check()?;
        let r = divide(field, &a, &b).1;
        a = b;
        b = r;
    }
    Ok(monic(field, &a))
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
    let (mut r0, mut r1) = (
        super::trimmed(field, a.to_vec()),
        super::trimmed(field, b.to_vec()),
    );
    let (mut s0, mut s1) = (vec![field.one()], vec![]);
    let (mut t0, mut t1) = (vec![], vec![field.one()]);
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
