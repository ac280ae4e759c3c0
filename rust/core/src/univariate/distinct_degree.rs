//! Distinct-degree factorization over GF(q): a squarefree f splits into the products of its
//! irreducible factors of each degree d, read off as gcd(x^(q^d) − x, f), with x^(q^d) mod f
//! computed by repeated squaring from x^(q^(d−1)) (Cantor and Zassenhaus 1981; von zur Gathen and
//! Shoup 1992). x^(q^d) − x itself is never written down.

use super::{degree, divide, gcd::gcd_checked, monomial, subtract, Modulo, Univariate};
use crate::control::Control;
use crate::error::Result;
use crate::field::field_order_limbs;
use crate::field::Field;

/// x^q mod f (deg f ≥ 1), q the field order.
pub fn frobenius_of_x<F: Field>(
    field: &F,
    f: &[F::Elem],
    control: &Control,
) -> Result<Univariate<F>> {
    let q = field_order_limbs(field, "x^q modulo a polynomial")?;
    Modulo::new(field, f).x_power(&q, control)
}

/// gcd(x^q − x, f): the product of the distinct linear factors of f ≠ 0 (monic).
pub fn linear_part<F: Field>(field: &F, f: &[F::Elem], control: &Control) -> Result<Univariate<F>> {
    let q = field_order_limbs(field, "x^q modulo a polynomial")?;
    linear_part_for_order(field, f, &q, control)
}

/// [`linear_part`] with the field order q given as little-endian limbs (callers counting the
/// roots of many polynomials compute q once).
pub fn linear_part_for_order<F: Field>(
    field: &F,
    f: &[F::Elem],
    q: &[u64],
    control: &Control,
) -> Result<Univariate<F>> {
    let f = super::monic(field, f);
    if degree::<F>(&f).unwrap_or(0) == 0 {
        return Ok(vec![field.one()]);
    }
    let h = Modulo::new(field, &f).x_power(q, control)?;
    gcd_checked(
        field,
        &subtract(field, &h, &monomial(field, 1)),
        &f,
        control,
    )
}

/// For a monic squarefree f: pairs (g_d, d), g_d the product of the irreducible factors of f
/// of degree d (only the d with g_d ≠ 1), increasing in d.
pub fn distinct_degree_factorization<F: Field>(
    field: &F,
    f: &[F::Elem],
    control: &Control,
) -> Result<Vec<(Univariate<F>, usize)>> {
    let q = field_order_limbs(field, "distinct-degree factorization")?;
    let mut rest = super::monic(field, f);
    let mut out = Vec::new();
    let x = monomial(field, 1);
    let mut h = x.clone();
    let mut d = 0;
    while degree::<F>(&rest).unwrap_or(0) >= 2 * (d + 1) {
        d += 1;
        let modulo = Modulo::new(field, &rest);
        h = modulo.power(&modulo.reduce(&h), &q, control)?;
        let g = gcd_checked(field, &subtract(field, &h, &x), &rest, control)?;
        if degree::<F>(&g).unwrap_or(0) > 0 {
            rest = divide(field, &rest, &g).0;
            h = divide(field, &h, &rest).1;
            out.push((g, d));
        }
    }
    if let Some(n) = degree::<F>(&rest).filter(|&n| n > 0) {
        out.push((rest, n));
    }
    Ok(out)
}
