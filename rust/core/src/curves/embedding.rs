//! The field GF(q^r) ⊇ GF(q) on which a curve over GF(q) is counted, and the embedding of GF(q)
//! into it: GF(q^r) is GF(p^(kr)) on its default modulus, and GF(q) = GF(p)[a]/(m) goes in by
//! sending a to a root of m there ([`generator_image`]), each element written on the powers of a
//! (the power basis, Lidl and Niederreiter 1983) and mapped coefficient by coefficient
//! ([`embed_coefficients`]).

use crate::control::Control;
use crate::error::{Error, Result};
use crate::extension::{BinaryField, ExtensionField, Modulus, TableField};
use crate::field::{BigPrimeField, Field, PrimeField, RationalField};
use crate::field_kind::{extension_field, AnyField};
use crate::points::extension::{embed_coefficients, generator_image};

/// A field whose elements can be written on the power basis of its generator over GF(p).
pub trait PowerBasis: Field {
    /// The coefficients c_0, c_1, ... of a = Σ c_i g^i over GF(p); `None` for fields other than
    /// GF(p^k) with p < 2^63.
    fn power_basis(&self, a: &Self::Elem) -> Option<Vec<u64>>;
    /// The defining polynomial of GF(p^k) over GF(p); `None` for prime fields (and Q).
    fn defining_modulus(&self) -> Option<&Modulus> {
        None
    }
}

impl PowerBasis for PrimeField {
    fn power_basis(&self, a: &u64) -> Option<Vec<u64>> {
        Some(vec![*a])
    }
}

impl PowerBasis for TableField {
    fn power_basis(&self, a: &u32) -> Option<Vec<u64>> {
        Some(self.decode(*a))
    }
    fn defining_modulus(&self) -> Option<&Modulus> {
        Some(self.modulus())
    }
}

impl PowerBasis for BinaryField {
    fn power_basis(&self, a: &u64) -> Option<Vec<u64>> {
        Some((0..self.degree()).map(|i| (a >> i) & 1).collect())
    }
    fn defining_modulus(&self) -> Option<&Modulus> {
        Some(self.modulus())
    }
}

impl PowerBasis for ExtensionField {
    fn power_basis(&self, a: &Box<[u64]>) -> Option<Vec<u64>> {
        Some(a.to_vec())
    }
    fn defining_modulus(&self) -> Option<&Modulus> {
        Some(self.modulus())
    }
}

impl<const N: usize> PowerBasis for BigPrimeField<N> {
    fn power_basis(&self, _a: &Self::Elem) -> Option<Vec<u64>> {
        None
    }
}

impl PowerBasis for RationalField {
    fn power_basis(&self, _a: &Self::Elem) -> Option<Vec<u64>> {
        None
    }
}

/// GF(q^r) for the field GF(q) = `base`, on the default modulus of degree k·r over GF(p).
pub fn extension_of<F: Field>(base: &F, r: u32) -> Result<AnyField> {
    let p = base
        .characteristic_u64()
        .filter(|&p| p > 0 && p < PrimeField::MAX_MODULUS)
        .ok_or_else(|| {
            Error::invalid(format!(
                "extensions of {} are not available: curves are counted over GF(p^k) with p < 2^63",
                base.spec()
            ))
        })?;
    let degree = base.degree().checked_mul(r).ok_or_else(|| {
        Error::invalid(format!(
            "GF(q^{r}) over {} has too large a degree",
            base.spec()
        ))
    })?;
    if degree == 1 {
        return Ok(AnyField::Prime(PrimeField::new(p)?));
    }
    extension_field(Modulus::first_irreducible(PrimeField::new(p)?, degree)?)
}

/// The embedding of `base` into `target` (a field of the same characteristic containing it).
pub fn embedding<'a, F: PowerBasis, E: Field>(
    base: &'a F,
    target: &'a E,
    control: &Control,
) -> Result<impl Fn(&F::Elem) -> E::Elem + 'a> {
    if base.power_basis(&base.one()).is_none() {
        return Err(Error::invalid(format!(
            "{} has no embedding into {}: curves are counted over GF(p^k) with p < 2^63",
            base.spec(),
            target.spec()
        )));
    }
    let generator = match base.defining_modulus() {
        Some(modulus) => generator_image(modulus, target, control)?,
        None => target.one(),
    };
    Ok(move |c: &F::Elem| {
        let coefficients = base.power_basis(c).expect("checked above");
        embed_coefficients(target, &coefficients, &generator)
    })
}
