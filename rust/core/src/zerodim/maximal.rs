//! Whether a zero-dimensional ideal I over GF(q) is maximal, i.e. R/I is a field, and then its
//! degree [R/I : k]. (Over QQ, [`is_maximal`] hands over to [`super::maximal_rational`].)
//!
//! A finite-dimensional reduced GF(q)-algebra is a product of fields GF(q^{m_j}), and the
//! elements fixed by Frobenius a ↦ a^q form the subalgebra ∏ GF(q), of dimension the number of
//! factors (the idea of Berlekamp 1967). So R/I is a field exactly when it is reduced (every
//! variable's minimal polynomial is squarefree, Seidenberg 1974) and Frobenius − identity has
//! rank dim R/I − 1. Frobenius is a ring map, so its value on a standard monomial is the product
//! of the images x_i^q, computed once by repeated squaring in R/I.

use super::radical::variable_minimal_polynomials;
use super::Quotient;
use crate::control::Control;
use crate::dimension::krull_dimension;
use crate::echelon::rank;
use crate::error::{Error, Result};
use crate::field::field_order_limbs;
use crate::field::Field;
use crate::groebner::ReducedBasis;
use crate::univariate::degree;

/// The coordinates of x_i^q in R/I for each variable, q the field order.
pub fn frobenius_coordinates<F: Field>(
    quotient: &Quotient<F>,
    control: &Control,
) -> Result<Vec<Vec<F::Elem>>> {
    let ring = &quotient.basis.ring;
    let q = field_order_limbs(&ring.field, "the Frobenius map")?;
    (0..ring.nvars())
        .map(|i| quotient.power(&quotient.coordinates(&ring.var(i))?, &q, control))
        .collect()
}

/// Columns: coordinates of b^q for each standard monomial b, from b^q = (b / x_i)^q · x_i^q.
pub(crate) fn frobenius_matrix<F: Field>(
    quotient: &Quotient<F>,
    control: &Control,
) -> Result<Vec<Vec<F::Elem>>> {
    let ring = &quotient.basis.ring;
    let images = frobenius_coordinates(quotient, control)?;
    let image_multiples: Vec<Vec<Vec<F::Elem>>> = images
        .iter()
        .map(|x| quotient.multiples(x, control))
        .collect::<Result<_>>()?;
    // b_j = x_i · b_k with k < j, so the image of b_k is ready.
    let mut image_of: Vec<Vec<F::Elem>> = Vec::with_capacity(quotient.dimension());
    for j in 0..quotient.dimension() {
        control.check()?;
        let image = match quotient.parent(j) {
            None => quotient.coordinates(&ring.one())?,
            Some((i, k)) => quotient.combine(&image_of[k], &image_multiples[i]),
        };
        image_of.push(image);
    }
    Ok(image_of)
}

/// R/I when I is zero-dimensional and radical (every variable's minimal polynomial squarefree,
/// Seidenberg 1974); `None` otherwise (such I is never maximal).
pub(super) fn reduced_quotient<F: Field>(
    gb: &ReducedBasis<F>,
    control: &Control,
) -> Result<Option<Quotient<F>>> {
    if krull_dimension(gb.ring.nvars(), &gb.leading_monomials()) != 0 {
        return Ok(None);
    }
    let quotient = Quotient::new(gb.clone(), control)?;
    let reduced = variable_minimal_polynomials(&quotient, control)?
        .iter()
        .all(|(m, s)| degree::<F>(m) == degree::<F>(s));
    Ok(reduced.then_some(quotient))
}

/// Whether the ideal with basis `gb` is maximal. Positive-dimensional and unit ideals are not.
/// Over QQ, see [`super::maximal_rational`].
pub fn is_maximal<F: Field>(gb: &ReducedBasis<F>, control: &Control) -> Result<bool> {
    if let Some(answer) = super::maximal_rational::route(gb, control) {
        return answer;
    }
    field_order_limbs(&gb.ring.field, "is_maximal")?;
    let Some(quotient) = reduced_quotient(gb, control)? else {
        return Ok(false);
    };
    let field = &gb.ring.field;
    let columns = frobenius_matrix(&quotient, control)?;
    let d = quotient.dimension();
    // Rows of (Φ − Id)ᵀ: the rank is the same.
    let shifted: Vec<Vec<F::Elem>> = columns
        .into_iter()
        .enumerate()
        .map(|(j, mut col)| {
            col[j] = field.sub(&col[j], &field.one());
            col
        })
        .collect();
    Ok(rank(field, shifted) == d - 1)
}

/// [R/I : k] for a maximal ideal I; an error naming the problem otherwise.
pub fn residue_field_degree<F: Field>(gb: &ReducedBasis<F>, control: &Control) -> Result<u128> {
    if !is_maximal(gb, control)? {
        return Err(Error::invalid(
            "residue_field_degree needs a maximal ideal; this ideal is not maximal",
        ));
    }
    super::quotient_dimension(gb, control)
}
