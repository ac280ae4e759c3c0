//! Products of polynomials over prime fields GF(p) with p beyond a machine word (the
//! Montgomery-limb fields of 2 to 8 limbs) by number-theoretic transforms: the integer product
//! of the coefficient vectors (each coefficient an integer below p) is computed modulo as many
//! word transform primes as its size needs ([`super::ntt`]; Pollard 1971, Schönhage and
//! Strassen 1971), and put together by the Chinese remainder theorem in Garner's mixed-radix
//! form (Garner 1959), one digit per prime, before a single reduction modulo p.
//!
//! The coefficients are taken in their Montgomery form A = a·R mod p (R = 2^(64·limbs)): the
//! integer product then holds Σ A_i·B_j = (Σ a_i·b_j)·R^2, and the Montgomery product of each
//! mixed-radix digit with the matching prime product removes one factor R, leaving the
//! Montgomery form of the coefficient of a·b with no conversion in or out.

use super::ntt::{rayon_map, transform_log_length, transform_primes, TransformPrime};
use crate::field::Field;
use num_bigint::BigUint;
use rayon::prelude::*;

/// a·b over a field with [`Field::montgomery_modulus`] `Some(modulus)`; a and b nonempty;
/// length a.len() + b.len() − 1, not trimmed.
pub fn multiply_montgomery<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    modulus: &[u64],
) -> Vec<F::Elem> {
    let len = a.len() + b.len() - 1;
    let log_n = transform_log_length(len);
    let p = BigUint::from_slice(
        &modulus
            .iter()
            .flat_map(|&l| [l as u32, (l >> 32) as u32])
            .collect::<Vec<u32>>(),
    );
    // The integer coefficients are below min(|a|, |b|)·p^2; every transform prime exceeds 2^61.
    let bits = 2 * p.bits() + u64::from(usize::BITS - a.len().min(b.len()).leading_zeros());
    let count = (bits as usize).div_ceil(61);
    let primes = &transform_primes()[..count];
    let limbs = |v: &[F::Elem]| -> Vec<u64> {
        let mut out = vec![0u64; v.len() * modulus.len()];
        for (c, chunk) in v.iter().zip(out.chunks_mut(modulus.len())) {
            field.to_montgomery_limbs(c, chunk);
        }
        out
    };
    let (la, lb) = (limbs(a), limbs(b));
    let same = std::ptr::eq(a, b);
    let residues: Vec<Vec<u64>> = rayon_map(primes, |prime| {
        let ra = residues_of(prime, &la, modulus.len());
        if same {
            prime.convolve(&ra, &ra, log_n)
        } else {
            prime.convolve(&ra, &residues_of(prime, &lb, modulus.len()), log_n)
        }
    });
    let crt = MixedRadix::new(primes, &p, field, modulus.len());
    (0..len)
        .into_par_iter()
        .with_min_len(256)
        .map(|i| crt.combine(field, &residues, i))
        .collect()
}

/// The residues modulo `prime` of numbers given by `width` little-endian limbs each.
fn residues_of(prime: &TransformPrime, limbs: &[u64], width: usize) -> Vec<u64> {
    let p = prime.modulus();
    // mont(x, 2^(64(j+1)) mod p) = x·2^(64j) mod p.
    let mut weights = Vec::with_capacity(width);
    let mut w = (1u128 << 64) % p as u128;
    for _ in 0..width {
        weights.push(w as u64);
        w = w * ((1u128 << 64) % p as u128) % p as u128;
    }
    limbs
        .chunks(width)
        .map(|number| {
            number
                .iter()
                .zip(&weights)
                .fold(0, |acc, (&l, &w)| prime.add(acc, prime.mont(l % p, w)))
        })
        .collect()
}

/// Garner's mixed-radix reconstruction x = v_0 + v_1·p_0 + v_2·p_0·p_1 + ... (0 ≤ v_t < p_t),
/// followed by the sum of the digits times the prime products modulo the target prime.
struct MixedRadix<'a, F: Field> {
    primes: &'a [TransformPrime],
    /// prime_mod[t][s] = p_s mod p_t in Montgomery form (s < t).
    prime_mod: Vec<Vec<u64>>,
    /// inverse[t] = (p_0·...·p_(t−1))^(−1) mod p_t in Montgomery form.
    inverse: Vec<u64>,
    /// weight[t] = p_0·...·p_(t−1) mod P (P the target prime) as a field element whose
    /// Montgomery limbs are that residue.
    weight: Vec<F::Elem>,
    /// Limbs of the target field's elements.
    width: usize,
}

impl<'a, F: Field> MixedRadix<'a, F> {
    fn new(primes: &'a [TransformPrime], target: &BigUint, field: &F, width: usize) -> Self {
        let mut prime_mod = Vec::new();
        let mut inverse = Vec::new();
        let mut weight = Vec::new();
        let mut product = BigUint::from(1u32);
        for (t, pt) in primes.iter().enumerate() {
            let m = pt.modulus();
            prime_mod.push(
                primes[..t]
                    .iter()
                    .map(|ps| pt.to_montgomery(ps.modulus() % m))
                    .collect(),
            );
            let residue = (&product % m).iter_u64_digits().next().unwrap_or(0);
            inverse.push(pt.to_montgomery(if t == 0 { 1 } else { pt.inverse(residue) }));
            let mut digits = (&product % target).to_u64_digits();
            digits.resize(width, 0);
            weight.push(field.from_montgomery_limbs(&digits));
            product *= m;
        }
        MixedRadix {
            primes,
            prime_mod,
            inverse,
            weight,
            width,
        }
    }

    /// Coefficient i of the product as a field element.
    fn combine(&self, field: &F, residues: &[Vec<u64>], i: usize) -> F::Elem {
        let mut digits = [0u64; super::ntt::TRANSFORM_PRIME_COUNT];
        let mut out = field.zero();
        let mut limbs = vec![0u64; self.width];
        for (t, pt) in self.primes.iter().enumerate() {
            let m = pt.modulus();
            // v_0 + p_0·(v_1 + p_1·(... v_(t−1))) mod p_t by Horner's rule from the top digit.
            let mut acc = 0u64;
            for s in (0..t).rev() {
                acc = pt.add(
                    pt.mont(acc, self.prime_mod[t][s]),
                    reduce_below(digits[s], m),
                );
            }
            let v = pt.mont(pt.sub(residues[t][i], acc), self.inverse[t]);
            digits[t] = v;
            limbs[0] = v;
            let digit = field.from_montgomery_limbs(&limbs);
            out = field.add(&out, &field.mul(&digit, &self.weight[t]));
        }
        out
    }
}

/// x mod m for x < 2^62 and m > 2^61 (one conditional subtraction).
#[inline(always)]
fn reduce_below(x: u64, m: u64) -> u64 {
    if x >= m {
        x - m
    } else {
        x
    }
}
