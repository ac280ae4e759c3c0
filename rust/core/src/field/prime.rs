//! The prime field GF(p) for primes p < 2^63, elements stored as canonical residues in [0, p).
//!
//! Multiplication reduces the 128-bit product by Barrett's method (Barrett 1986) with a
//! precomputed 128-bit reciprocal, avoiding a 128-bit division per product. Canonical storage
//! keeps printing, hashing and the delayed-reduction accumulators of the linear algebra simple.

use super::{primality, Field};
use crate::error::{Error, Result};

#[derive(Clone, Debug)]
pub struct PrimeField {
    p: u64,
    /// floor(2^128 / p), split in 64-bit halves.
    mu_hi: u64,
    mu_lo: u64,
}

impl PartialEq for PrimeField {
    fn eq(&self, other: &Self) -> bool {
        self.p == other.p
    }
}

impl PrimeField {
    /// Largest supported modulus (exclusive): sums of two residues must fit in 64 bits.
    pub const MAX_MODULUS: u64 = 1 << 63;

    /// GF(p); `p` must be a prime below 2^63.
    pub fn new(p: u64) -> Result<Self> {
        if p >= Self::MAX_MODULUS {
            return Err(Error::invalid(format!(
                "GF({p}): word-size prime fields need p < 2^63"
            )));
        }
        if !primality::is_prime(p) {
            let why = match primality::small_factor(p, 1_000_000) {
                Some(d) => format!(" (it is divisible by {d})"),
                None if p < 2 => String::new(),
                None => " (it has a factor above 10^6)".to_string(),
            };
            return Err(Error::invalid(format!("GF({p}): {p} is not a prime{why}")));
        }
        Ok(Self::known_prime(p))
    }

    /// GF(p) for a `p` already known to be a prime below 2^63 (the word modulus of a field), so
    /// that its Barrett reduction and inverse serve other word arithmetic (the F4 kernels)
    /// without a second primality test.
    pub(crate) fn known_prime(p: u64) -> Self {
        debug_assert!((2..Self::MAX_MODULUS).contains(&p));
        let mu = u128::MAX / p as u128 + u128::from(u128::MAX % p as u128 == p as u128 - 1);
        PrimeField {
            p,
            mu_hi: (mu >> 64) as u64,
            mu_lo: mu as u64,
        }
    }

    #[inline]
    pub fn modulus(&self) -> u64 {
        self.p
    }

    /// x mod p for any x < 2^128 with x < p · 2^64 (in particular every product of residues).
    #[inline]
    pub fn reduce_u128(&self, x: u128) -> u64 {
        let (x_hi, x_lo) = ((x >> 64) as u64, x as u64);
        let lo_lo = (x_lo as u128 * self.mu_lo as u128) >> 64;
        let hi_lo = x_hi as u128 * self.mu_lo as u128;
        let lo_hi = x_lo as u128 * self.mu_hi as u128;
        let mid = lo_lo + (hi_lo as u64 as u128) + (lo_hi as u64 as u128);
        let q = x_hi as u128 * self.mu_hi as u128 + (hi_lo >> 64) + (lo_hi >> 64) + (mid >> 64);
        // q underestimates floor(x / p) by at most 3, so r < 4p.
        let mut r = x.wrapping_sub(q.wrapping_mul(self.p as u128));
        while r >= self.p as u128 {
            r -= self.p as u128;
        }
        r as u64
    }

    /// x mod p for any x < 2^64, with the high word of the reciprocal alone (⌊2^64 / p⌋ up to
    /// rounding): the quotient estimate is short by at most two, one multiplication instead of
    /// the four of [`PrimeField::reduce_u128`]. The word loops of the characteristic
    /// polynomial sum products of residues below 2^32 in one word and reduce them here.
    #[inline]
    pub fn reduce_u64(&self, x: u64) -> u64 {
        let q = ((u128::from(x) * u128::from(self.mu_hi)) >> 64) as u64;
        let mut r = x - q * self.p;
        while r >= self.p {
            r -= self.p;
        }
        r
    }

    #[inline]
    pub fn mul_u64(&self, a: u64, b: u64) -> u64 {
        self.reduce_u128(a as u128 * b as u128)
    }

    /// Inverse of a residue, `None` for 0.
    #[inline]
    pub fn inverse(&self, a: u64) -> Option<u64> {
        inverse_mod_word(a, self.p)
    }
}

/// The inverse of a modulo a prime p < 2^63 (a reduced), by the extended Euclidean algorithm;
/// `None` for a = 0. The one word inverse of the core: the field, the F4 kernels and the
/// quotient algebras use it.
pub fn inverse_mod_word(a: u64, p: u64) -> Option<u64> {
    if a == 0 {
        return None;
    }
    // p < 2^63, and every remainder and Bézout coefficient of the extended Euclidean algorithm
    // stays within ±p, so 64-bit signed words suffice (far cheaper than 128-bit division).
    let (mut r0, mut r1) = (p as i64, a as i64);
    let (mut t0, mut t1) = (0i64, 1i64);
    while r1 != 0 {
        let q = r0 / r1;
        (r0, r1) = (r1, r0 - q * r1);
        (t0, t1) = (t1, t0 - q * t1);
    }
    Some(t0.rem_euclid(p as i64) as u64)
}

impl Field for PrimeField {
    type Elem = u64;

    #[inline]
    fn zero(&self) -> u64 {
        0
    }
    #[inline]
    fn one(&self) -> u64 {
        1
    }
    #[inline]
    fn is_zero(&self, a: &u64) -> bool {
        *a == 0
    }
    #[inline]
    fn add(&self, a: &u64, b: &u64) -> u64 {
        let s = a + b;
        if s >= self.p {
            s - self.p
        } else {
            s
        }
    }
    #[inline]
    fn sub(&self, a: &u64, b: &u64) -> u64 {
        if a >= b {
            a - b
        } else {
            a + self.p - b
        }
    }
    #[inline]
    fn neg(&self, a: &u64) -> u64 {
        if *a == 0 {
            0
        } else {
            self.p - a
        }
    }
    #[inline]
    fn mul(&self, a: &u64, b: &u64) -> u64 {
        self.mul_u64(*a, *b)
    }
    fn inv(&self, a: &u64) -> Option<u64> {
        self.inverse(*a)
    }
    fn from_i64(&self, v: i64) -> u64 {
        (v as i128).rem_euclid(self.p as i128) as u64
    }
    fn from_decimal(&self, digits: &str) -> u64 {
        // Nineteen digits at a time fit a u64 below 10^19.
        digits.as_bytes().chunks(18).fold(0, |acc, chunk| {
            let scale = 10u64.pow(chunk.len() as u32) % self.p;
            let v: u64 = std::str::from_utf8(chunk).unwrap().parse().unwrap();
            self.add(&self.mul_u64(acc, scale), &(v % self.p))
        })
    }
    fn characteristic(&self) -> String {
        self.p.to_string()
    }
    fn order(&self) -> Option<String> {
        Some(self.p.to_string())
    }
    fn spec(&self) -> String {
        format!("GF({})", self.p)
    }
    /// Symmetric representative: `p - 1` prints as `-1`, which reads better in equations.
    fn format(&self, a: &u64) -> String {
        if *a > self.p / 2 {
            format!("-{}", self.p - a)
        } else {
            a.to_string()
        }
    }
    fn element_from_index(&self, i: u64) -> u64 {
        i % self.p
    }
    fn size_hint(&self) -> f64 {
        self.p as f64
    }
    fn characteristic_u64(&self) -> Option<u64> {
        Some(self.p)
    }
    fn order_limbs(&self) -> Option<Vec<u64>> {
        Some(vec![self.p])
    }
    /// In GF(p) the Frobenius map is the identity, so every element is its own p-th root.
    fn pth_root(&self, a: &u64) -> Option<u64> {
        Some(*a)
    }
    fn word_modulus(&self) -> Option<u64> {
        Some(self.p)
    }
    #[inline]
    fn to_word(&self, a: &u64) -> u64 {
        *a
    }
    #[inline]
    fn from_word(&self, w: u64) -> u64 {
        w
    }
}
