//! Prime-power fields GF(p^k) = GF(p)[a]/(f) for a monic irreducible f of degree k ≥ 2: elements
//! are polynomials of degree < k in the generator `a`, written like `a^3 + 2*a + 1`.
//!
//! Three representations: [`TableField`] (logarithm tables, q ≤ 2^16), [`BinaryField`]
//! (GF(2^k), k ≤ 64, bit-packed) and [`ExtensionField`] (coefficient vectors with schoolbook
//! products reduced modulo f and inverses by the extended Euclidean algorithm, any q). [`Modulus`] holds f, its arithmetic,
//! the irreducibility test and the default choice of f.

mod binary;
mod modulus;
mod squaring;
mod table;

pub use binary::BinaryField;
pub(crate) use modulus::check_generator_name;
pub use modulus::{Modulus, DEFAULT_GENERATOR};
pub use table::{TableField, MAX_TABLE_ORDER};

use crate::error::Result;
use crate::field::{Field, PrimeField};
use modulus::format_dense;

#[derive(Clone, Debug)]
pub struct ExtensionField {
    modulus: Modulus,
}

impl PartialEq for ExtensionField {
    fn eq(&self, other: &Self) -> bool {
        self.modulus == other.modulus
    }
}

impl ExtensionField {
    pub fn new(modulus: Modulus) -> Self {
        ExtensionField { modulus }
    }

    /// GF(p^k) on its default modulus.
    pub fn with_default_modulus(p: u64, k: u32) -> Result<Self> {
        Ok(ExtensionField::new(Modulus::first_irreducible(
            PrimeField::new(p)?,
            k,
        )?))
    }

    pub fn modulus(&self) -> &Modulus {
        &self.modulus
    }

    /// The element Σ c[i] a^i (coefficients reduced mod p; c may be longer than k).
    pub fn from_coefficients(&self, c: &[u64]) -> Box<[u64]> {
        let p = self.modulus.characteristic();
        let reduced: Vec<u64> = c.iter().map(|x| x % p).collect();
        let r = self.modulus.mul_mod(&reduced, &[1]);
        self.pad(r)
    }

    fn k(&self) -> usize {
        self.modulus.degree() as usize
    }
    fn pad(&self, mut v: Vec<u64>) -> Box<[u64]> {
        v.resize(self.k(), 0);
        v.into_boxed_slice()
    }
    fn constant(&self, c: u64) -> Box<[u64]> {
        self.pad(vec![c])
    }
}

impl Field for ExtensionField {
    /// Coefficients c_0 .. c_(k-1) of Σ c_i a^i, always exactly k of them.
    type Elem = Box<[u64]>;

    fn zero(&self) -> Box<[u64]> {
        self.constant(0)
    }
    fn one(&self) -> Box<[u64]> {
        self.constant(1)
    }
    fn is_zero(&self, a: &Box<[u64]>) -> bool {
        a.iter().all(|&c| c == 0)
    }
    fn add(&self, a: &Box<[u64]>, b: &Box<[u64]>) -> Box<[u64]> {
        let f = &self.modulus.base;
        a.iter().zip(b.iter()).map(|(x, y)| f.add(x, y)).collect()
    }
    fn sub(&self, a: &Box<[u64]>, b: &Box<[u64]>) -> Box<[u64]> {
        let f = &self.modulus.base;
        a.iter().zip(b.iter()).map(|(x, y)| f.sub(x, y)).collect()
    }
    fn neg(&self, a: &Box<[u64]>) -> Box<[u64]> {
        let f = &self.modulus.base;
        a.iter().map(|x| f.neg(x)).collect()
    }
    fn mul(&self, a: &Box<[u64]>, b: &Box<[u64]>) -> Box<[u64]> {
        self.pad(self.modulus.mul_mod(a, b))
    }
    fn inv(&self, a: &Box<[u64]>) -> Option<Box<[u64]>> {
        self.modulus.inv_mod(a).map(|v| self.pad(v))
    }
    fn from_i64(&self, v: i64) -> Box<[u64]> {
        self.constant(self.modulus.base.from_i64(v))
    }
    fn from_decimal(&self, digits: &str) -> Box<[u64]> {
        self.constant(self.modulus.base.from_decimal(digits))
    }
    fn characteristic(&self) -> String {
        self.modulus.characteristic().to_string()
    }
    fn order(&self) -> Option<String> {
        Some(self.modulus.order().to_string())
    }
    fn degree(&self) -> u32 {
        self.modulus.degree()
    }
    fn spec(&self) -> String {
        self.modulus.spec()
    }
    fn format(&self, a: &Box<[u64]>) -> String {
        format_dense(a, self.modulus.generator())
    }
    fn generator_name(&self) -> Option<&str> {
        Some(self.modulus.generator())
    }
    fn generator(&self) -> Option<Box<[u64]>> {
        Some(self.pad(vec![0, 1]))
    }
    /// The base-p digits of i (of i mod q when q < 2^64) as coefficients.
    fn element_from_index(&self, i: u64) -> Box<[u64]> {
        let p = self.modulus.characteristic();
        let mut rest = i;
        let digits = (0..self.k())
            .map(|_| {
                let d = rest % p;
                rest /= p;
                d
            })
            .collect();
        self.pad(digits)
    }
    /// Uniform coefficients: uniform over all p^k elements, whatever k.
    fn random(&self, rng: &mut crate::rng::Rng) -> Box<[u64]> {
        let p = self.modulus.characteristic();
        self.pad((0..self.k()).map(|_| rng.below(p)).collect())
    }
    fn size_hint(&self) -> f64 {
        (self.modulus.characteristic() as f64).powi(self.k() as i32)
    }
    fn characteristic_u64(&self) -> Option<u64> {
        Some(self.modulus.characteristic())
    }
    fn order_limbs(&self) -> Option<Vec<u64>> {
        Some(self.modulus.order().to_u64_digits())
    }
    /// a^(q/p) = a^(p^(k-1)): the Frobenius a ↦ a^p applied k − 1 times inverts it.
    fn pth_root(&self, a: &Box<[u64]>) -> Option<Box<[u64]>> {
        let p = self.modulus.characteristic();
        Some((1..self.k()).fold(a.clone(), |x, _| self.pow(&x, p)))
    }
}

#[cfg(test)]
mod tests;
