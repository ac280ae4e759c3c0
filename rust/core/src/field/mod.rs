//! Fields of coefficients.
//!
//! The [`Field`] trait is small on purpose: the algorithms only add, multiply, invert and
//! compare elements. Prime fields, prime-power fields, multi-precision primes and the rationals
//! plug in as further implementations without touching the algorithms.

mod bigprime;
pub mod bpsw;
pub mod montgomery;
pub mod primality;
mod prime;
pub mod random;
mod rational;

pub use bigprime::BigPrimeField;
pub use prime::{inverse_mod_word, PrimeField};
pub use random::uniform_element;
pub use rational::{integer_scale, RationalField};

use crate::error::{Error, Result};
use std::fmt::Debug;
use std::hash::Hash;

/// A field whose elements are values of type `Elem`; the field value carries the parameters
/// (modulus, tables) needed to compute with them.
pub trait Field: Clone + Debug + PartialEq + Send + Sync + 'static {
    type Elem: Clone + Debug + PartialEq + Eq + Hash + Send + Sync + 'static;

    fn zero(&self) -> Self::Elem;
    fn one(&self) -> Self::Elem;
    fn is_zero(&self, a: &Self::Elem) -> bool;
    fn is_one(&self, a: &Self::Elem) -> bool {
        *a == self.one()
    }
    fn add(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    fn sub(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    fn neg(&self, a: &Self::Elem) -> Self::Elem;
    fn mul(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    /// The inverse, or `None` for zero.
    fn inv(&self, a: &Self::Elem) -> Option<Self::Elem>;
    /// The image of an integer.
    #[allow(clippy::wrong_self_convention)] // the field (its modulus) makes the element
    fn from_i64(&self, v: i64) -> Self::Elem;
    /// The image of an integer written in decimal (any length).
    #[allow(clippy::wrong_self_convention)] // the field (its modulus) makes the element
    fn from_decimal(&self, digits: &str) -> Self::Elem {
        let ten = self.from_i64(10);
        digits.bytes().fold(self.zero(), |acc, d| {
            self.add(&self.mul(&acc, &ten), &self.from_i64(i64::from(d - b'0')))
        })
    }
    /// Characteristic, in decimal (it may not fit a machine word).
    fn characteristic(&self) -> String;
    /// Number of elements, in decimal; `None` for an infinite field.
    fn order(&self) -> Option<String>;
    /// Degree over the prime field.
    fn degree(&self) -> u32 {
        1
    }
    /// The spec string that reads this field back (`GF(7)`).
    fn spec(&self) -> String;
    /// Element as polynomial text: an integer, or an expression in the generator name.
    fn format(&self, a: &Self::Elem) -> String;
    /// Name of a field generator usable in polynomial text (`a` for GF(p^k)); none for GF(p).
    fn generator_name(&self) -> Option<&str> {
        None
    }
    /// The generator named by [`Field::generator_name`].
    fn generator(&self) -> Option<Self::Elem> {
        None
    }
    /// The i-th element of a fixed enumeration of the field (0 ↦ 0, 1 ↦ 1; for a finite field
    /// of q elements, i < q runs through all of them once; for QQ: 0, 1, -1, 2, -2, ...).
    /// Used for enumeration in tests and for random choices (a random i).
    fn element_from_index(&self, i: u64) -> Self::Elem;
    /// A random element: uniform over the whole field when it is finite, however large (see
    /// [`uniform_element`]); for an infinite field, one of the first 2^16 elements.
    fn random(&self, rng: &mut crate::rng::Rng) -> Self::Elem {
        uniform_element(self, rng)
    }
    /// Elements of a finite field listed by [`Field::element_from_index`]; `None` for infinite
    /// fields or fields with more than `limit` elements.
    fn small_elements(&self, limit: usize) -> Option<Vec<Self::Elem>> {
        let q: u64 = self.order()?.parse().ok()?;
        (q <= limit as u64).then(|| (0..q).map(|i| self.element_from_index(i)).collect())
    }
    /// Field size as a float, for probability bounds (infinite: `f64::INFINITY`).
    fn size_hint(&self) -> f64;
    /// The characteristic when it fits a machine word (every field but big-prime ones; 0 for QQ).
    fn characteristic_u64(&self) -> Option<u64>;
    /// The field size q as little-endian 64-bit limbs (for exponents such as x^q); `None` if infinite.
    fn order_limbs(&self) -> Option<Vec<u64>>;
    /// The p-th root of `a` in characteristic p > 0 (finite fields are perfect, so it exists and
    /// is unique); `None` in characteristic 0.
    fn pth_root(&self, a: &Self::Elem) -> Option<Self::Elem>;

    fn pow(&self, a: &Self::Elem, mut e: u64) -> Self::Elem {
        let mut base = a.clone();
        let mut acc = self.one();
        while e > 0 {
            if e & 1 == 1 {
                acc = self.mul(&acc, &base);
            }
            base = self.mul(&base, &base);
            e >>= 1;
        }
        acc
    }
    fn div(&self, a: &Self::Elem, b: &Self::Elem) -> Option<Self::Elem> {
        self.inv(b).map(|bi| self.mul(a, &bi))
    }

    // Hooks for matrix engines (F4): a prime field whose elements are machine words lets the
    // linear algebra run on packed integer coefficients with delayed modular reduction. Every
    // other field keeps the defaults and is handled through the generic methods above.

    /// `Some(p)` when this is the prime field GF(p) with p < 2^63 and elements convert losslessly
    /// to their canonical residues in [0, p) by [`Field::to_word`] and back by [`Field::from_word`].
    fn word_modulus(&self) -> Option<u64> {
        None
    }
    /// The canonical residue of `a` (only meaningful when [`Field::word_modulus`] is `Some`).
    fn to_word(&self, _a: &Self::Elem) -> u64 {
        0
    }
    /// The element with canonical residue `w < p` (only meaningful when
    /// [`Field::word_modulus`] is `Some`).
    #[allow(clippy::wrong_self_convention)] // the field (its modulus) makes the element
    fn from_word(&self, _w: u64) -> Self::Elem {
        self.zero()
    }
    /// `Some(k)` when this is GF(2^k), k ≤ 64, with elements convertible to and from the k bits
    /// of their coordinates on the polynomial basis 1, t, ..., t^(k−1) of the generator t
    /// (bit i is the coefficient of t^i) by [`Field::to_binary_bits`] and
    /// [`Field::from_binary_bits`]: the Frobenius and every GF(2)-linear map then act on bit
    /// vectors (root counts of fibres in characteristic 2, `curves::binary_roots`).
    fn binary_degree(&self) -> Option<u32> {
        None
    }
    /// The coordinate bits of `a` (only meaningful when [`Field::binary_degree`] is `Some`).
    fn to_binary_bits(&self, _a: &Self::Elem) -> u64 {
        0
    }
    /// The element with coordinate bits `bits` < 2^k (only meaningful when
    /// [`Field::binary_degree`] is `Some`).
    #[allow(clippy::wrong_self_convention)] // the field (its modulus) makes the element
    fn from_binary_bits(&self, _bits: u64) -> Self::Elem {
        self.zero()
    }
    /// `Some(limbs of p)` (little-endian, 2, 4 or 8 of them) when this is GF(p) for a prime
    /// beyond a machine word whose elements are Montgomery residues on that many limbs (see
    /// [`montgomery`]): F4 then sums products on wider limbs and reduces once per entry.
    fn montgomery_modulus(&self) -> Option<Vec<u64>> {
        None
    }
    /// The Montgomery residue of `a` into `out` (only meaningful when
    /// [`Field::montgomery_modulus`] is `Some`; `out` has that many limbs).
    fn to_montgomery_limbs(&self, _a: &Self::Elem, _out: &mut [u64]) {}
    /// The element with Montgomery residue `limbs` (canonical; only meaningful when
    /// [`Field::montgomery_modulus`] is `Some`).
    #[allow(clippy::wrong_self_convention)] // the field (its modulus) makes the element
    fn from_montgomery_limbs(&self, _limbs: &[u64]) -> Self::Elem {
        self.zero()
    }

    // Hooks for methods special to the rationals (the multi-modular Gröbner basis, maximality by
    // a primitive element): generic code asks for the QQ view of a value and gets `None` over
    // every other field, with the types checked by the compiler (no run-time downcast).

    /// `value` as the same value over QQ when this field is QQ; `None` otherwise.
    fn as_rationals<W: FieldIndexed>(_value: &W::Of<Self>) -> Option<&W::Of<RationalField>> {
        None
    }
    /// A value over QQ as the same value over this field when it is QQ; `None` otherwise.
    fn from_rationals<W: FieldIndexed>(_value: W::Of<RationalField>) -> Option<W::Of<Self>> {
        None
    }
}

/// A family of types indexed by a field (a ring over F, a polynomial over F, a basis over F):
/// what the hooks [`Field::as_rationals`] and [`Field::from_rationals`] carry across.
pub trait FieldIndexed {
    type Of<F: Field>;
}

/// Number of field elements when it fits 64 bits (`u64::MAX` for larger finite fields, `None`
/// for Q).
pub fn field_size<F: Field>(field: &F) -> Option<u64> {
    field
        .order()
        .and_then(|q| q.parse().ok())
        .or_else(|| field.order().map(|_| u64::MAX))
}

/// q as limbs for a finite field; an error naming the field otherwise.
pub fn field_order_limbs<F: Field>(field: &F, what: &str) -> Result<Vec<u64>> {
    field.order_limbs().ok_or_else(|| {
        Error::invalid(format!(
            "{what} needs a finite field; {} is infinite",
            field.spec()
        ))
    })
}

#[cfg(test)]
mod tests;
