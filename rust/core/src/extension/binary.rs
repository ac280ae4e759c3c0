//! GF(2^k) for 16 < k ≤ 64 with an element as the k bits of its coefficient vector (bit i is
//! the coefficient of a^i, which is also galois's integer representation): sums are XOR,
//! products carry-less multiplications with a 4-bit window, reduced by folding the high half
//! with x^k ≡ g (f = x^k + g), which takes few rounds because default moduli have low-degree g
//! (the standard word-level method; Hankerson, Menezes and Vanstone, Guide to Elliptic Curve
//! Cryptography, 2004, §2.3); the product itself by the processor's carry-less multiply when it
//! has one. Inverses by the extended Euclidean algorithm on bit vectors, square roots by k − 1
//! squarings.

use super::modulus::{format_dense, Modulus};
use crate::error::{Error, Result};
use crate::field::Field;

#[derive(Clone, Debug)]
pub struct BinaryField {
    modulus: Modulus,
    k: u32,
    /// f − x^k as bits.
    low: u64,
}

impl PartialEq for BinaryField {
    fn eq(&self, other: &Self) -> bool {
        self.modulus == other.modulus
    }
}

/// Carry-less product of two 64-bit polynomials over GF(2): the processor's carry-less
/// multiply instruction where it has one (checked once at run time), else a 4-bit window.
#[inline]
fn clmul(a: u64, b: u64) -> u128 {
    #[cfg(target_arch = "x86_64")]
    {
        if std::arch::is_x86_feature_detected!("pclmulqdq") {
            // SAFETY: the instruction set was detected just above.
            return unsafe { clmul_instruction(a, b) };
        }
    }
    clmul_window(a, b)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "pclmulqdq,sse2")]
#[inline]
unsafe fn clmul_instruction(a: u64, b: u64) -> u128 {
    use std::arch::x86_64::{_mm_clmulepi64_si128, _mm_set_epi64x, _mm_storeu_si128};
    let product = _mm_clmulepi64_si128(_mm_set_epi64x(0, a as i64), _mm_set_epi64x(0, b as i64), 0);
    let mut out = 0u128;
    _mm_storeu_si128(std::ptr::addr_of_mut!(out).cast(), product);
    out
}

/// a·b mod f (f = x^k + low) with the product and every fold of the reduction by the
/// carry-less multiply instruction, in one function so that the instructions are inlined
/// (the fibre-by-fibre point counts of curves spend their time here).
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "pclmulqdq,sse2")]
unsafe fn product_by_instruction(a: u64, b: u64, k: u32, low: u64) -> u64 {
    let mask = u128::from(u64::MAX >> (64 - k));
    let mut r = clmul_instruction(a, b);
    loop {
        let high = (r >> k) as u64;
        if high == 0 {
            return r as u64;
        }
        r = (r & mask) ^ clmul_instruction(high, low);
    }
}

/// The carry-less product with a table of the 16 multiples of `a` by 4-bit polynomials.
fn clmul_window(a: u64, b: u64) -> u128 {
    let mut table = [0u128; 16];
    for i in 1..16 {
        table[i] = if i & 1 == 1 {
            table[i - 1] ^ a as u128
        } else {
            table[i / 2] << 1
        };
    }
    let mut r = 0u128;
    for nibble in (0..16).rev() {
        r = (r << 4) ^ table[((b >> (4 * nibble)) & 15) as usize];
    }
    r
}

/// Degree of a nonzero polynomial over GF(2) given by its bits.
fn bit_degree(v: u128) -> i32 {
    127 - v.leading_zeros() as i32
}

impl BinaryField {
    pub fn new(modulus: Modulus) -> Result<Self> {
        let k = modulus.degree();
        if modulus.characteristic() != 2 || k > 64 {
            return Err(Error::invalid(format!(
                "bit-packed arithmetic needs GF(2^k) with k <= 64, not {}",
                modulus.spec()
            )));
        }
        let low = modulus.coefficients()[..k as usize]
            .iter()
            .enumerate()
            .fold(0u64, |acc, (i, &c)| acc | (c << i));
        Ok(BinaryField { modulus, k, low })
    }

    pub fn modulus(&self) -> &Modulus {
        &self.modulus
    }

    fn mask(&self) -> u64 {
        if self.k == 64 {
            u64::MAX
        } else {
            (1u64 << self.k) - 1
        }
    }

    /// r mod f for r of degree < 2k − 1.
    #[inline]
    fn reduce(&self, mut r: u128) -> u64 {
        let k = self.k;
        loop {
            let high = (r >> k) as u64;
            if high == 0 {
                return r as u64;
            }
            let low_part = r & (self.mask() as u128);
            r = low_part ^ clmul(high, self.low);
        }
    }

    /// Coefficient bits of a^0 .. a^(k-1).
    fn bits(&self, a: u64) -> Vec<u64> {
        (0..self.k).map(|i| (a >> i) & 1).collect()
    }
}

impl Field for BinaryField {
    /// Bit i is the coefficient of a^i.
    type Elem = u64;

    fn zero(&self) -> u64 {
        0
    }
    fn one(&self) -> u64 {
        1
    }
    fn is_zero(&self, a: &u64) -> bool {
        *a == 0
    }
    fn add(&self, a: &u64, b: &u64) -> u64 {
        a ^ b
    }
    fn sub(&self, a: &u64, b: &u64) -> u64 {
        a ^ b
    }
    fn neg(&self, a: &u64) -> u64 {
        *a
    }
    #[inline]
    fn mul(&self, a: &u64, b: &u64) -> u64 {
        #[cfg(target_arch = "x86_64")]
        {
            if std::arch::is_x86_feature_detected!("pclmulqdq") {
                // SAFETY: the instruction set was detected just above.
                return unsafe { product_by_instruction(*a, *b, self.k, self.low) };
            }
        }
        self.reduce(clmul(*a, *b))
    }
    /// The extended Euclidean algorithm on bit vectors (Hankerson, Menezes and Vanstone 2004,
    /// Algorithm 2.48): u·a ≡ g1 and v·a ≡ g2 (mod f) are kept while the degrees of u and v
    /// go down to u = 1; about 2k shifts and XORs instead of the 2k products of Fermat.
    fn inv(&self, a: &u64) -> Option<u64> {
        if *a == 0 {
            return None;
        }
        let (mut u, mut v) = (u128::from(*a), (1u128 << self.k) | u128::from(self.low));
        let (mut g1, mut g2) = (1u128, 0u128);
        while u != 1 {
            let mut shift = bit_degree(u) - bit_degree(v);
            if shift < 0 {
                std::mem::swap(&mut u, &mut v);
                std::mem::swap(&mut g1, &mut g2);
                shift = -shift;
            }
            u ^= v << shift;
            g1 ^= g2 << shift;
        }
        Some(g1 as u64)
    }
    fn from_i64(&self, v: i64) -> u64 {
        (v & 1) as u64
    }
    fn from_decimal(&self, digits: &str) -> u64 {
        digits
            .bytes()
            .last()
            .map_or(0, |d| u64::from((d - b'0') & 1))
    }
    fn characteristic(&self) -> String {
        "2".into()
    }
    fn order(&self) -> Option<String> {
        Some(self.modulus.order().to_string())
    }
    fn degree(&self) -> u32 {
        self.k
    }
    fn spec(&self) -> String {
        self.modulus.spec()
    }
    fn format(&self, a: &u64) -> String {
        format_dense(&self.bits(*a), self.modulus.generator())
    }
    fn generator_name(&self) -> Option<&str> {
        Some(self.modulus.generator())
    }
    fn generator(&self) -> Option<u64> {
        Some(2)
    }
    fn element_from_index(&self, i: u64) -> u64 {
        i & self.mask()
    }
    fn size_hint(&self) -> f64 {
        2f64.powi(self.k as i32)
    }
    fn characteristic_u64(&self) -> Option<u64> {
        Some(2)
    }
    fn order_limbs(&self) -> Option<Vec<u64>> {
        Some(self.modulus.order().to_u64_digits())
    }
    fn binary_degree(&self) -> Option<u32> {
        Some(self.k)
    }
    fn to_binary_bits(&self, a: &u64) -> u64 {
        *a
    }
    fn from_binary_bits(&self, bits: u64) -> u64 {
        bits
    }
    /// The square root a^(q/2): k − 1 squarings.
    fn pth_root(&self, a: &u64) -> Option<u64> {
        Some((1..self.k).fold(*a, |x, _| self.mul(&x, &x)))
    }
}

#[cfg(test)]
mod clmul_tests {
    use super::*;

    /// The instruction (when present) and the window agree with the schoolbook carry-less
    /// product, bit by bit.
    #[test]
    fn carry_less_products_agree_with_the_schoolbook_product() {
        let mut rng = crate::rng::Rng::new(21);
        for _ in 0..2000 {
            let (a, b) = (rng.next_u64(), rng.next_u64());
            let schoolbook = (0..64)
                .filter(|i| (b >> i) & 1 == 1)
                .fold(0u128, |acc, i| acc ^ (u128::from(a) << i));
            assert_eq!(clmul_window(a, b), schoolbook);
            assert_eq!(clmul(a, b), schoolbook);
        }
    }
}
