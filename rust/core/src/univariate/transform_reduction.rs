//! Reduction modulo a fixed polynomial f of degree d by cyclic products whose fixed factors are
//! transformed once ([`super::cyclic`]): the reductions of x^q mod f by repeated squaring all
//! share the transforms of f and of its inverse series.
//!
//! For a of degree at most 2d − 2, the quotient a div f comes from the inverse series
//! g = rev(f)^(−1) mod x^(d−1) (Sieveking 1972, Kung 1974): with H = x^(d−2)·g(1/x), the quotient
//! is the top half, coefficients d − 2 to 2d − 4, of (a div x^d)·H. The remainder a − q·f has
//! degree below d, so the coefficients of q·f from d upwards are those of a: a cyclic product
//! q·f modulo x^N − 1 with N > d is enough, the coefficients it wraps around being known. A
//! reduction then costs about half the transforms of a division with fresh products.

use super::cyclic::{CyclicProducts, Spectra};
use super::ntt::transform_log_length;
use super::{trimmed, Univariate};
use crate::field::Field;

/// The transforms of f and of its reversed inverse series, for reductions modulo f.
pub struct TransformReduction<F: Field> {
    d: usize,
    /// Products (a div x^d)·H, of length at least 2d − 3.
    quotient: CyclicProducts<F>,
    inverse_spectra: Spectra,
    /// Products q·f modulo x^N − 1, N > d.
    remainder: CyclicProducts<F>,
    modulus_spectra: Spectra,
}

impl<F: Field> std::fmt::Debug for TransformReduction<F> {
    fn fmt(&self, out: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            out,
            "TransformReduction(degree {}, lengths {} and {})",
            self.d,
            self.quotient.length(),
            self.remainder.length()
        )
    }
}

impl<F: Field> TransformReduction<F> {
    /// For f of degree d ≥ 2 and `inverse` = rev(f)^(−1) mod x^k, k ≥ d − 1 (trailing zeros may
    /// be missing); `None` for fields without a transform path.
    pub fn new(field: &F, f: &[F::Elem], inverse: &[F::Elem]) -> Option<Self> {
        let d = f.len() - 1;
        assert!(d >= 2, "a modulus of degree at least 2");
        let quotient = CyclicProducts::new(field, transform_log_length(2 * d - 3), d)?;
        let remainder = CyclicProducts::new(field, transform_log_length(d + 1), d)?;
        let h: Vec<F::Elem> = (0..d - 1)
            .rev()
            .map(|i| inverse.get(i).cloned().unwrap_or_else(|| field.zero()))
            .collect();
        Some(TransformReduction {
            d,
            inverse_spectra: quotient.spectra(&h),
            quotient,
            modulus_spectra: remainder.spectra(f),
            remainder,
        })
    }

    /// a mod f for d < a.len() ≤ 2d − 1.
    pub fn reduce(&self, field: &F, a: &[F::Elem]) -> Univariate<F> {
        let d = self.d;
        assert!(
            a.len() > d && a.len() < 2 * d,
            "an operand of degree below 2 deg f"
        );
        let q = self
            .quotient
            .product(&a[d..], &self.inverse_spectra, d - 2..2 * d - 3);
        let n = self.remainder.length();
        let wrapped = self.remainder.product(&q, &self.modulus_spectra, 0..d);
        // (q·f)_k = wrapped_k − (q·f)_(k+N) = wrapped_k − a_(k+N) for k < d < N.
        let r = (0..d)
            .map(|k| {
                let low = field.sub(&a[k], &wrapped[k]);
                match a.get(k + n) {
                    Some(high) => field.add(&low, high),
                    None => low,
                }
            })
            .collect();
        trimmed(field, r)
    }
}
