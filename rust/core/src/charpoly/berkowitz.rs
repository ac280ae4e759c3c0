//! The characteristic polynomial over k[T] by Berkowitz's division-free algorithm (Berkowitz
//! 1984): the characteristic polynomials of the leading minors, each from the previous one by a
//! lower-triangular Toeplitz product. It needs no interpolation points, so it serves the fields
//! too small for them, in every characteristic.

use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::poly::{Poly, Ring};

/// Berkowitz's division-free algorithm over k[T].
pub(super) fn berkowitz<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let mut coeffs = vec![ring.one()];
    for r in 0..a.len() {
        let toeplitz = toeplitz_column(ring, a, r, control)?;
        // Char. poly. of the leading (r+1)-minor = lower-triangular Toeplitz(toeplitz) · coeffs.
        let mut next = vec![Poly::zero(); r + 2];
        for (i, out) in next.iter_mut().enumerate() {
            for (j, c) in coeffs.iter().enumerate().take(i + 1) {
                if !c.is_zero() && !toeplitz[i - j].is_zero() {
                    *out = ring.add(out, &ring.mul(&toeplitz[i - j], c)?);
                }
            }
        }
        coeffs = next;
    }
    Ok(coeffs)
}

/// First column of Berkowitz's Toeplitz matrix for step r:
/// [1, -a_rr, -R·C, -R·A_r·C, ..., -R·A_r^{r-1}·C], with A_r the leading r × r block,
/// R = a[r][0..r] and C = a[0..r][r].
fn toeplitz_column<F: Field>(
    ring: &Ring<F>,
    a: &[Vec<Poly<F>>],
    r: usize,
    control: &Control,
) -> Result<Vec<Poly<F>>> {
    let mut column = vec![ring.one(), ring.neg(&a[r][r])];
    let mut w: Vec<Poly<F>> = (0..r).map(|i| a[i][r].clone()).collect();
    for k in 0..r {
        control.check()?;
        column.push(ring.neg(&dot(ring, &a[r][..r], &w)?));
        if k + 1 < r {
            w = (0..r)
                .map(|i| dot(ring, &a[i][..r], &w))
                .collect::<Result<_>>()?;
        }
    }
    Ok(column)
}

fn dot<F: Field>(ring: &Ring<F>, u: &[Poly<F>], v: &[Poly<F>]) -> Result<Poly<F>> {
    let mut acc = Poly::zero();
    for (x, y) in u.iter().zip(v) {
        if !x.is_zero() && !y.is_zero() {
            acc = ring.add(&acc, &ring.mul(x, y)?);
        }
    }
    Ok(acc)
}
