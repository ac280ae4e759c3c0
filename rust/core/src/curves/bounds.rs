//! How a point count compares with the bounds for a smooth projective absolutely irreducible
//! curve of genus g over GF(Q): the Hasse–Weil bound |N − (Q + 1)| ≤ 2g√Q (Weil 1948) and
//! Serre's refinement |N − (Q + 1)| ≤ g⌊2√Q⌋ (Serre 1983). A curve reaching Serre's upper bound
//! is called maximal, one reaching the lower bound minimal; when Q is a square, Serre's and the
//! Hasse–Weil bounds agree and a maximal curve has L(T) = (1 + √Q T)^(2g).

use super::zeta::{floor_sqrt, q_power};
use num_bigint::BigInt;

/// One count N_r = #C(GF(q^r)) against the bounds.
#[derive(Clone, Debug, PartialEq)]
pub struct BoundCheck {
    pub r: u32,
    pub points: BigInt,
    /// The Hasse–Weil interval [Q + 1 − ⌊2g√Q⌋, Q + 1 + ⌊2g√Q⌋] (integers in it).
    pub hasse_weil: (BigInt, BigInt),
    /// Serre's interval [Q + 1 − g⌊2√Q⌋, Q + 1 + g⌊2√Q⌋].
    pub serre: (BigInt, BigInt),
    /// The count lies in both intervals.
    pub within: bool,
    /// g > 0 and the count is Serre's upper bound.
    pub maximal: bool,
    /// g > 0 and the count is Serre's lower bound.
    pub minimal: bool,
}

/// The count `points` over GF(q^r) for a curve of genus `genus`, against both bounds.
pub fn check_bounds(q: u64, r: u32, genus: usize, points: BigInt) -> BoundCheck {
    let big_q = q_power(q, r);
    let g = BigInt::from(genus);
    let center = &big_q + 1;
    // ⌊2g√Q⌋ = ⌊√(4g²Q)⌋ and g⌊2√Q⌋ = g⌊√(4Q)⌋, exactly.
    let hasse_weil_radius = floor_sqrt(&(BigInt::from(4) * &g * &g * &big_q));
    let serre_radius = &g * floor_sqrt(&(BigInt::from(4) * &big_q));
    let hasse_weil = (&center - &hasse_weil_radius, &center + &hasse_weil_radius);
    let serre = (&center - &serre_radius, &center + &serre_radius);
    let within = serre.0 <= points && points <= serre.1;
    BoundCheck {
        r,
        maximal: genus > 0 && points == serre.1,
        minimal: genus > 0 && points == serre.0,
        within,
        points,
        hasse_weil,
        serre,
    }
}
