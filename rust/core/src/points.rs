//! Number of points with coordinates in GF(q) of the variety of an ideal, exactly.
//!
//! Affine: the points of V(I) in GF(q)^n are the common zeros of I and the x_i^q − x_i, and
//! J = I + (x_i^q − x_i) is zero-dimensional and radical (x^q − x is squarefree and splits over
//! GF(q)), so the count is dim_k R/J (Seidenberg 1974; Lidl and Niederreiter, *Finite Fields*,
//! 1983, for x^q − x = ∏ (x − a)). The generators x_i^q − x_i are replaced by
//! NF(x_i^q) − x_i, computed by repeated squaring modulo a basis of I, so large q stays cheap.
//!
//! Projective (homogeneous I): P^{n−1}(GF(q)) is the disjoint union of the affine charts
//! {x_0 = … = x_{j−1} = 0, x_j = 1}, j = 0..n−1, each a copy of GF(q)^{n−1−j}; the counts of the
//! dehomogenized ideals on the charts add up without double counting.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::frobenius::{field_order_limbs, frobenius_of_variables};
use crate::groebner::{groebner_basis, Engine};
use crate::order::MonomialOrder;
use crate::poly::{Poly, Ring};
use crate::zerodim::vector_space_dimension;

/// Number of points of V(gens) in GF(q)^n.
pub fn count_affine_points<F: Field>(ring: &Ring<F>, gens: &[Poly<F>], engine: Engine, control: &Control) -> Result<u128> {
    field_order_limbs(&ring.field, "count_points")?;
    // The count does not depend on the order; grevlex keeps the bases small.
    let r = ring.with_order(MonomialOrder::Grevlex)?;
    let gens: Vec<Poly<F>> = gens.iter().map(|g| r.adopt(g.clone())).collect();
    let gb = groebner_basis(&r, &gens, engine, control)?;
    if gb.is_unit_ideal() {
        return Ok(0);
    }
    let mut with_field_equations = gb.polys.clone();
    for (i, image) in frobenius_of_variables(&gb, control)?.into_iter().enumerate() {
        with_field_equations.push(r.sub(&image, &r.var(i)));
    }
    let rational = groebner_basis(&r, &with_field_equations, engine, control)?;
    vector_space_dimension(&rational, control)
}

/// Number of points of the projective variety of homogeneous `gens` in P^{n−1}(GF(q)).
pub fn count_projective_points<F: Field>(ring: &Ring<F>, gens: &[Poly<F>], engine: Engine, control: &Control) -> Result<u128> {
    field_order_limbs(&ring.field, "count_points")?;
    if let Some(k) = gens.iter().position(|g| !g.is_homogeneous()) {
        return Err(Error::invalid(format!(
            "projective point count needs homogeneous polynomials; generator {} ({}) is not homogeneous",
            k + 1,
            ring.format(&gens[k])
        )));
    }
    let n = ring.nvars();
    let mut total: u128 = 0;
    for j in 0..n {
        control.check()?;
        total += count_on_chart(ring, gens, j, engine, control)?;
    }
    Ok(total)
}

/// Points with x_0 = … = x_{j−1} = 0 and x_j = 1.
fn count_on_chart<F: Field>(ring: &Ring<F>, gens: &[Poly<F>], j: usize, engine: Engine, control: &Control) -> Result<u128> {
    let n = ring.nvars();
    let field = &ring.field;
    if j + 1 == n {
        let mut point = vec![field.zero(); n];
        point[j] = field.one();
        for g in gens {
            if !field.is_zero(&ring.evaluate(g, &point)?) {
                return Ok(0);
            }
        }
        return Ok(1);
    }
    let chart = Ring::new(field.clone(), ring.names()[j + 1..].to_vec(), MonomialOrder::Grevlex)?;
    let images: Vec<Poly<F>> = (0..n)
        .map(|k| match k.cmp(&j) {
            std::cmp::Ordering::Less => Poly::zero(),
            std::cmp::Ordering::Equal => chart.one(),
            std::cmp::Ordering::Greater => chart.var(k - j - 1),
        })
        .collect();
    let dehomogenized: Vec<Poly<F>> = gens.iter().map(|g| ring.substitute(g, &images, &chart)).collect::<Result<_>>()?;
    count_affine_points(&chart, &dehomogenized, engine, control)
}

#[cfg(test)]
mod tests;
