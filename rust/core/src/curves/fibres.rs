//! Points of a curve over a finite field GF(Q), counted fibre by fibre over the x-line: for each
//! x in GF(Q), the number of roots in GF(Q) of the specialised polynomial Σ c_j(x) y^j
//! ([`super::root_count`]: deg gcd(y^Q − y, ·) with y^Q by Frobenius steps modulo the fibre
//! polynomial, Cantor and Zassenhaus 1981, or a trace or square criterion for quadratics), never
//! as a dense matrix of size Q; then the points at infinity of the model. When GF(Q) = GF(q^r)
//! and the curve is defined over GF(q), conjugate x (x, x^q, x^(q²), ...) have fibres of the
//! same size, so one fibre per Frobenius orbit is counted and weighted by the orbit's length
//! ([`super::frobenius_orbits`]). The x are shared out in chunks over rayon's workers.

use super::frobenius_orbits::FrobeniusOrbits;
use super::root_count::RootCounter;
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::univariate::Univariate;

/// Most x-fibres counted (one root count each) before a count is refused as out of reach.
pub const FIBRE_LIMIT: u128 = 1 << 28;

/// x values handed to a worker at a time.
const CHUNK: u64 = 1 << 12;

/// A curve as the affine points (x, y) with Σ_j c_j(x) y^j = 0, plus the points at infinity of
/// its model: the roots of `at_infinity` in GF(Q), and one more point when `extra_point`.
#[derive(Clone, Debug)]
pub struct FibredCurve<E: Field> {
    /// c_0(x), c_1(x), ...: the coefficient of y^j as a polynomial in x.
    pub columns: Vec<Univariate<E>>,
    pub at_infinity: Univariate<E>,
    pub extra_point: bool,
}

/// The number of x-fibres a count over GF(q^r) goes through (one per Frobenius orbit), or an
/// error saying why the count is out of reach when there are more than [`FIBRE_LIMIT`].
pub fn check_fibre_cost(q: u64, r: u32, fibre_degree: usize) -> Result<u128> {
    check_fibre_cost_within(
        q,
        r,
        FIBRE_LIMIT,
        &format!("polynomials of degree {fibre_degree}"),
    )
}

/// As [`check_fibre_cost`] with the given limit (a power of two) on the number of fibres,
/// `fibres` saying what each fibre is.
pub fn check_fibre_cost_within(q: u64, r: u32, limit: u128, fibres: &str) -> Result<u128> {
    let big_q = (q as f64).powi(r as i32);
    let count = big_q / f64::from(r);
    if count > limit as f64 {
        let target = if r == 1 {
            format!("GF({q})")
        } else {
            format!("GF({q}^{r})")
        };
        return Err(Error::ResourceLimit(format!(
            "counting points over {target} fibre by fibre means about {count:.3e} root counts of {fibres} \
             (one per Frobenius orbit of x in {target}), more than the limit of 2^{} (already minutes of work): \
             point counting for large fields is not available in this edition",
            limit.trailing_zeros()
        )));
    }
    Ok(count as u128)
}

/// #C(GF(Q)) for the curve over `field` = GF(Q) = GF(q^r), its equations defined over GF(q).
pub fn count_fibred<E: Field>(
    field: &E,
    curve: &FibredCurve<E>,
    q: u64,
    r: u32,
    control: &Control,
) -> Result<u128> {
    let counter = RootCounter::new(field)?;
    let orbits = FrobeniusOrbits::new(field, q, r)?;
    let affine = orbits.weighted_sum(
        CHUNK,
        control,
        || Vec::with_capacity(curve.columns.len()),
        |fibre, x| {
            fibre_at(field, &curve.columns, x, fibre);
            counter.count(fibre, control)
        },
    )?;
    let infinity = counter.count(&curve.at_infinity, control)?;
    Ok(affine + infinity + u128::from(curve.extra_point))
}

/// fibre ← Σ c_j(x) y^j, each c_j by Horner's rule (the buffer is reused from fibre to fibre).
fn fibre_at<E: Field>(field: &E, columns: &[Univariate<E>], x: &E::Elem, fibre: &mut Vec<E::Elem>) {
    fibre.clear();
    fibre.extend(columns.iter().map(|c| {
        c.iter()
            .rev()
            .fold(field.zero(), |acc, a| field.add(&field.mul(&acc, x), a))
    }));
}
