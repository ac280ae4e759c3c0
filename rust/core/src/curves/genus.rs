//! The genus of a smooth projective curve from its equations: a smooth plane curve of degree d
//! has genus (d − 1)(d − 2)/2 (Plücker's formula); a curve with Hilbert polynomial
//! P(s) = d·s + 1 − p_a has arithmetic genus p_a = 1 − P(0) (Hilbert 1890; Hartshorne 1977,
//! III.7), which is the genus when the curve is smooth and connected, as smooth complete
//! intersections are; a hyperelliptic model y² + h(x)y = f(x) with smooth model has genus
//! g = ⌈max(2 deg h, deg f)/2⌉ − 1, its smooth model glued from two charts (Cantor 1987,
//! Menezes, Wu and Zuccherato 1996).

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::groebner::ReducedBasis;
use crate::hilbert::series_of_basis;

/// (d − 1)(d − 2)/2.
pub fn plane_curve_genus(degree: u32) -> usize {
    let d = degree as usize;
    if d == 0 {
        return 0;
    }
    (d - 1) * d.saturating_sub(2) / 2
}

/// 1 − P(0) from the Hilbert polynomial of the homogeneous ideal with reduced basis `gb`.
pub fn arithmetic_genus<F: Field>(gb: &ReducedBasis<F>, control: &Control) -> Result<i128> {
    let polynomial = series_of_basis(gb, control)?.polynomial()?;
    let (numerator, denominator) = polynomial.first().copied().unwrap_or((0, 1));
    if numerator % denominator != 0 {
        return Err(Error::invalid(
            "the Hilbert polynomial of a curve has an integer constant term",
        ));
    }
    Ok(1 - numerator / denominator)
}

/// ⌈max(2 deg h, deg f)/2⌉ − 1, the genus of the smooth model of y² + h(x)y = f(x); −1 when h
/// and f are constants (no curve).
pub fn hyperelliptic_genus(degree_h: Option<usize>, degree_f: Option<usize>) -> i64 {
    let top = (2 * degree_h.unwrap_or(0)).max(degree_f.unwrap_or(0)) as i64;
    (top + 1) / 2 - 1
}
