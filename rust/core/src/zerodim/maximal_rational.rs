//! Whether a zero-dimensional ideal I of QQ[x_1..x_n] is maximal, i.e. R = QQ[x]/I is a field,
//! by a primitive element (the Frobenius map of [`super::maximal`] does not exist over QQ).
//!
//! R is reduced iff every variable's minimal polynomial is squarefree (Seidenberg 1974, as in
//! [`super::radical`]); a reduced R is a product of number fields and has D = dim_QQ R distinct
//! points over the algebraic closure. The linear form u_c = x_1 + c·x_2 + ... + c^(n−1)·x_n takes
//! distinct values at two distinct points for all but at most n − 1 values of c, so some
//! c ≤ (n − 1)·D(D − 1)/2 separates all D points. Its minimal polynomial then has degree D, so
//! R = QQ[u_c] ≅ QQ[t]/(m) (the primitive element theorem, Kronecker), a field iff m is
//! irreducible ([`super::irreducible`], exact). Before a separating c is reached, a reducible
//! minimal polynomial already proves that R is not a field (every element of a field has an
//! irreducible minimal polynomial); an irreducible one of degree < D decides nothing and the
//! next c is tried. Cost per c: one minimal polynomial over QQ (O(D^3) exact operations) and one
//! irreducibility test; c = 0 or 1 usually suffices.

use super::irreducible::is_irreducible;
use super::maximal::reduced_quotient;
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::{Field, RationalField};
use crate::groebner::{BasisOver, ReducedBasis};
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use crate::univariate::degree;
use num_bigint::BigInt;
use num_rational::BigRational;

/// Routes `is_maximal` over QQ here; `None` for other fields.
pub(crate) fn route<F: Field>(gb: &ReducedBasis<F>, control: &Control) -> Option<Result<bool>> {
    let gb = F::as_rationals::<BasisOver>(gb)?;
    Some(is_maximal_over_rationals(gb, control))
}

/// Whether the ideal with basis `gb` over QQ is maximal. Positive-dimensional and unit ideals
/// are not.
pub fn is_maximal_over_rationals(
    gb: &ReducedBasis<RationalField>,
    control: &Control,
) -> Result<bool> {
    let ring = &gb.ring;
    let Some(quotient) = reduced_quotient(gb, control)? else {
        return Ok(false);
    };
    let d = quotient.dimension() as u64;
    let last = (ring.nvars() as u64).saturating_sub(1) * (d * d.saturating_sub(1) / 2);
    for c in 0..=last {
        control.check()?;
        let m = quotient.minimal_polynomial(&separating_candidate(ring, c), control)?;
        let primitive = degree::<RationalField>(&m) == Some(d as usize);
        let irreducible = is_irreducible(&m, control)?;
        if primitive || !irreducible {
            return Ok(primitive && irreducible);
        }
    }
    Err(Error::invalid(
        "is_maximal: no linear form separated the points of a reduced quotient, which the primitive element theorem rules out",
    ))
}

/// u_c = Σ_i c^i · x_(i+1) (with c^0 = 1, so u_0 = x_1).
pub(crate) fn separating_candidate(ring: &Ring<RationalField>, c: u64) -> Poly<RationalField> {
    let n = ring.nvars();
    ring.from_terms((0..n).map(|i| {
        let coefficient = BigInt::from(c).pow(i as u32);
        (
            Monomial::var_power(n, i, 1),
            BigRational::from_integer(coefficient),
        )
    }))
}
