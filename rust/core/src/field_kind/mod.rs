//! [`AnyField`]: a field of any kind, one variant per concrete field type, and the choice of
//! type for a given order. Reading field specs from text (`GF(7)`, `GF(2^8)`, ...) is one layer
//! up, in [`crate::field_spec`], since it parses polynomials.
//!
//! Which type serves which field: primes below 2^63 → [`PrimeField`]; larger primes →
//! [`BigPrimeField`] on 2, 4 or 8 limbs (up to 2^512); p^k with k ≥ 2 → [`TableField`] when
//! q ≤ 2^16, [`BinaryField`] for GF(2^k) up to k = 64, else [`ExtensionField`]; `Q` → [`RationalField`].

mod kinds;
use crate::error::{Error, Result};
use crate::extension::{BinaryField, ExtensionField, Modulus, TableField, MAX_TABLE_ORDER};
use crate::field::{BigPrimeField, Field, PrimeField};
use num_bigint::BigUint;
use num_traits::ToPrimitive;

crate::field_kind_enum! {
    /// A field of any kind (the list in [`for_each_field_kind!`](crate::for_each_field_kind)).
    #[derive(Clone, Debug, PartialEq)]
    pub enum AnyField
}

/// Applies an expression to the concrete field inside an [`AnyField`].
#[macro_export]
macro_rules! with_any_field {
    ($field:expr, $f:ident => $body:expr) => {{
        use $crate::field_kind::AnyField as AnyFieldOfKind;
        $crate::match_field_kind!(AnyFieldOfKind, $field, $f => $body)
    }};
}

impl AnyField {
    /// GF(p^k) on the modulus with coefficients c_0..c_k (low degree first); GF(p) for k = 1.
    /// This is how a field object from another library (its irreducible polynomial) comes in.
    pub fn from_modulus(p: &BigUint, coeffs: Vec<u64>) -> Result<Self> {
        if coeffs.len() <= 2 {
            return prime_field(p);
        }
        let base = small_prime(&format!("GF({p}^{})", coeffs.len() - 1), p)?;
        extension_field(Modulus::new(base, coeffs)?)
    }

    pub fn spec(&self) -> String {
        with_any_field!(self, f => f.spec())
    }
    pub fn characteristic(&self) -> String {
        with_any_field!(self, f => f.characteristic())
    }
    pub fn order(&self) -> Option<String> {
        with_any_field!(self, f => f.order())
    }
    pub fn degree(&self) -> u32 {
        with_any_field!(self, f => f.degree())
    }
    /// The modulus of a prime-power field.
    pub fn modulus(&self) -> Option<&Modulus> {
        match self {
            AnyField::Table(f) => Some(f.modulus()),
            AnyField::Binary(f) => Some(f.modulus()),
            AnyField::Extension(f) => Some(f.modulus()),
            _ => None,
        }
    }
}

/// The prime field of an extension: word-size only.
pub(crate) fn small_prime(spec: &str, p: &BigUint) -> Result<PrimeField> {
    match p.to_u64().filter(|&v| v < PrimeField::MAX_MODULUS) {
        Some(v) => PrimeField::new(v),
        None => Err(Error::invalid(format!(
            "field spec '{spec}': extension fields GF(p^k) need p < 2^63"
        ))),
    }
}

/// GF(p) on the fastest representation for the size of p.
pub fn prime_field(p: &BigUint) -> Result<AnyField> {
    if let Some(v) = p.to_u64().filter(|&v| v < PrimeField::MAX_MODULUS) {
        return Ok(AnyField::Prime(PrimeField::new(v)?));
    }
    match BigPrimeField::<2>::limbs_for(p.bits()) {
        Some(2) => Ok(AnyField::BigPrime2(BigPrimeField::new(p)?)),
        Some(4) => Ok(AnyField::BigPrime4(BigPrimeField::new(p)?)),
        Some(_) => Ok(AnyField::BigPrime8(BigPrimeField::new(p)?)),
        None => Err(Error::invalid(format!(
            "GF({p}): primes above 2^512 are not supported"
        ))),
    }
}

/// GF(p^k) on `modulus`: tables when q ≤ 2^16, bit-packed for GF(2^k) with k ≤ 64.
pub fn extension_field(modulus: Modulus) -> Result<AnyField> {
    if modulus.order() <= BigUint::from(MAX_TABLE_ORDER) {
        Ok(AnyField::Table(TableField::new(modulus)?))
    } else if modulus.characteristic() == 2 && modulus.degree() <= 64 {
        Ok(AnyField::Binary(BinaryField::new(modulus)?))
    } else {
        Ok(AnyField::Extension(ExtensionField::new(modulus)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn from_modulus_coefficients() {
        let f =
            AnyField::from_modulus(&BigUint::from(2u8), vec![1, 1, 0, 1, 1, 0, 0, 0, 1]).unwrap();
        assert_eq!(f.spec(), "GF(2^8)");
        assert_eq!(
            AnyField::from_modulus(&BigUint::from(7u8), vec![0, 1])
                .unwrap()
                .spec(),
            "GF(7)"
        );
        assert!(AnyField::from_modulus(&BigUint::from(2u8), vec![1, 0, 1]).is_err());
    }
}
