//! The Frobenius map f ↦ f^q on R/I over GF(q), by repeated squaring modulo a Gröbner basis
//! (square-and-multiply, reducing after every product), so that x^q costs O(log q) products of
//! normal forms rather than an expansion to degree q.

use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::groebner::ReducedBasis;
use crate::poly::Poly;

/// The normal form of f^e modulo the basis, e given as little-endian 64-bit limbs.
pub fn power_modulo<F: Field>(
    gb: &ReducedBasis<F>,
    f: &Poly<F>,
    exponent: &[u64],
    control: &Control,
) -> Result<Poly<F>> {
    let ring = &gb.ring;
    let mut acc = gb.reduce(&ring.one())?;
    let bits = exponent.len() * 64;
    // Left to right: acc = acc^2 · f^bit.
    let base = gb.reduce(f)?;
    for k in (0..bits).rev() {
        control.check()?;
        acc = gb.reduce(&ring.mul(&acc, &acc)?)?;
        if exponent[k / 64] >> (k % 64) & 1 == 1 {
            acc = gb.reduce(&ring.mul(&acc, &base)?)?;
        }
    }
    Ok(acc)
}
