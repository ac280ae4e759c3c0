//! The characteristic polynomial det(x·Id - A) of a square matrix over a polynomial ring k[T],
//! by Berkowitz's division-free algorithm (Berkowitz 1984, "On computing the determinant in
//! small parallel time using a small number of processors"): no division is needed, so it works
//! over k[T] directly and in every characteristic, GF(2) included.

use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use crate::poly::{Poly, Ring};

/// Coefficients [1, c_{r-1}, ..., c_0] of det(x·Id - A) = x^r + c_{r-1} x^{r-1} + ... + c_0,
/// for an r × r matrix `a` (rows of equal length r) over `ring`.
pub fn characteristic_polynomial<F: Field>(ring: &Ring<F>, a: &[Vec<Poly<F>>], control: &Control) -> Result<Vec<Poly<F>>> {
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
fn toeplitz_column<F: Field>(ring: &Ring<F>, a: &[Vec<Poly<F>>], r: usize, control: &Control) -> Result<Vec<Poly<F>>> {
    let mut column = vec![ring.one(), ring.neg(&a[r][r])];
    let mut w: Vec<Poly<F>> = (0..r).map(|i| a[i][r].clone()).collect();
    for k in 0..r {
        control.check()?;
        column.push(ring.neg(&dot(ring, &a[r][..r], &w)?));
        if k + 1 < r {
            w = (0..r).map(|i| dot(ring, &a[i][..r], &w)).collect::<Result<_>>()?;
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;

    #[test]
    fn two_by_two_and_companion() {
        let ring = Ring::new(PrimeField::new(101).unwrap(), vec!["t".into()], MonomialOrder::Grevlex).unwrap();
        let p = |s: &str| parse_poly(&ring, s).unwrap();
        // det(x - [[a, b], [c, d]]) = x^2 - (a + d) x + (ad - bc).
        let a = vec![vec![p("t"), p("2")], vec![p("3"), p("t + 1")]];
        let cp = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
        assert_eq!(cp, vec![p("1"), p("-2*t - 1"), p("t^2 + t - 6")]);
        // The companion matrix of x^3 + t x + 5 has that characteristic polynomial (Lang, Algebra).
        let z = Poly::zero;
        let comp = vec![vec![z(), z(), p("-5")], vec![p("1"), z(), p("-t")], vec![z(), p("1"), z()]];
        let cp = characteristic_polynomial(&ring, &comp, &Control::new()).unwrap();
        assert_eq!(cp, vec![p("1"), z(), p("t"), p("5")]);
    }
}
