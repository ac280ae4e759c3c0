//! Products of polynomials over prime fields GF(p) with p beyond a machine word (the
//! Montgomery-limb fields of 2 to 8 limbs) by number-theoretic transforms: the integer product
//! of the coefficient vectors (each coefficient an integer below p) is computed modulo as many
//! word transform primes as its size needs ([`super::ntt`]; Pollard 1971, Schönhage and
//! Strassen 1971), and put together by the Chinese remainder theorem in its explicit form,
//! x = Σ y_t·(M/p_t) − k·M with k from a floating-point estimate, reduced modulo p by one wide
//! accumulation and a single Montgomery reduction (Montgomery 1985) per coefficient.
//!
//! The coefficients are taken in their Montgomery form A = a·R mod p (R = 2^(64·limbs)): the
//! integer product then holds Σ A_i·B_j = (Σ a_i·b_j)·R^2, and the Montgomery reduction of the
//! accumulated sum removes one factor R, leaving the Montgomery form of the coefficient of a·b
//! with no conversion in or out.

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
    let primes = wide_transform_primes(modulus, a.len().min(b.len()));
    let (la, lb) = (
        montgomery_limbs(field, a, modulus.len()),
        montgomery_limbs(field, b, modulus.len()),
    );
    let same = std::ptr::eq(a, b);
    let residues: Vec<Vec<u64>> = rayon_map(primes, |prime| {
        let ra = residues_of(prime, &la, modulus.len());
        if same {
            prime.convolve(&ra, &ra, log_n)
        } else {
            prime.convolve(&ra, &residues_of(prime, &lb, modulus.len()), log_n)
        }
    });
    let crt = ExplicitCrt::new(primes, modulus);
    (0..len)
        .into_par_iter()
        .with_min_len(256)
        .map(|i| crt.combine(field, &residues, i))
        .collect()
}

/// The transform primes for products modulo the prime with limbs `modulus` of polynomials whose
/// shorter factor has `shorter` coefficients: the integer coefficients are below shorter·p^2,
/// and the primes (each above 2^61) multiply to at least 2^3 times that bound, which the
/// rounding in [`ExplicitCrt::combine`] needs.
pub(super) fn wide_transform_primes(modulus: &[u64], shorter: usize) -> &'static [TransformPrime] {
    let bits =
        2 * limbs_to_biguint(modulus).bits() + u64::from(usize::BITS - shorter.leading_zeros());
    &transform_primes()[..(bits as usize + 3).div_ceil(61)]
}

/// The Montgomery limbs of the coefficients of v, `width` limbs each, one after the other.
pub(super) fn montgomery_limbs<F: Field>(field: &F, v: &[F::Elem], width: usize) -> Vec<u64> {
    let mut out = vec![0u64; v.len() * width];
    for (c, chunk) in v.iter().zip(out.chunks_mut(width)) {
        field.to_montgomery_limbs(c, chunk);
    }
    out
}

fn limbs_to_biguint(limbs: &[u64]) -> BigUint {
    BigUint::from_slice(
        &limbs
            .iter()
            .flat_map(|&l| [l as u32, (l >> 32) as u32])
            .collect::<Vec<u32>>(),
    )
}

/// The residues modulo `prime` of numbers given by `width` little-endian limbs each.
pub(super) fn residues_of(prime: &TransformPrime, limbs: &[u64], width: usize) -> Vec<u64> {
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

/// The most limbs of a target prime (fields of 2, 4 or 8 limbs).
const MAX_WIDTH: usize = 8;

/// The Chinese remainder theorem in its explicit form, reduced modulo the target prime P: with
/// M = p_0·...·p_(T−1) and y_t = r_t·(M/p_t)^(−1) mod p_t, the integer x < M with residues r_t
/// is Σ y_t·(M/p_t) − k·M, where k = ⌊Σ y_t/p_t⌋ is the rounding of a floating-point sum
/// (x/M < 1/8, and the rounding error of the sum is below T·2^(−52)). Modulo P this is one
/// wide accumulation Σ y_t·(M/p_t mod P) + k·(−M mod P) of one-limb by T-limb products and a
/// single Montgomery reduction, which also removes the factor R of the Montgomery inputs.
pub(super) struct ExplicitCrt {
    primes: &'static [TransformPrime],
    /// (M/p_t)^(−1) mod p_t in Montgomery form.
    cofactor_inverse: Vec<u64>,
    /// 1/p_t.
    reciprocal: Vec<f64>,
    /// M/p_t mod P, `width` limbs each.
    cofactor: Vec<u64>,
    /// −M mod P.
    minus_product: [u64; MAX_WIDTH],
    modulus: [u64; MAX_WIDTH],
    /// −P^(−1) mod 2^64.
    neg_inv: u64,
    width: usize,
}

impl ExplicitCrt {
    pub(super) fn new(primes: &'static [TransformPrime], modulus: &[u64]) -> Self {
        let width = modulus.len();
        assert!(
            width <= MAX_WIDTH,
            "a target prime of at most {MAX_WIDTH} limbs"
        );
        let target = limbs_to_biguint(modulus);
        let product: BigUint = primes.iter().map(|p| BigUint::from(p.modulus())).product();
        let fixed = |x: &BigUint| {
            let mut out = [0u64; MAX_WIDTH];
            for (o, d) in out.iter_mut().zip(x.iter_u64_digits()) {
                *o = d;
            }
            out
        };
        let mut cofactor_inverse = Vec::new();
        let mut cofactor = Vec::new();
        for prime in primes {
            let m = prime.modulus();
            let quotient = &product / m;
            let residue = (&quotient % m).iter_u64_digits().next().unwrap_or(0);
            cofactor_inverse.push(prime.to_montgomery(prime.inverse(residue)));
            cofactor.extend_from_slice(&fixed(&(&quotient % &target))[..width]);
        }
        let minus_product = fixed(&((&target - &product % &target) % &target));
        let mut inv: u64 = 1;
        for _ in 0..6 {
            inv = inv.wrapping_mul(2u64.wrapping_sub(modulus[0].wrapping_mul(inv)));
        }
        ExplicitCrt {
            primes,
            cofactor_inverse,
            reciprocal: primes.iter().map(|p| 1.0 / p.modulus() as f64).collect(),
            cofactor,
            minus_product,
            modulus: fixed(&target),
            neg_inv: inv.wrapping_neg(),
            width,
        }
    }

    /// Coefficient i of the product (residues[t][i] modulo p_t) as a field element.
    pub(super) fn combine<F: Field>(&self, field: &F, residues: &[Vec<u64>], i: usize) -> F::Elem {
        let w = self.width;
        // Σ y_t·(M/p_t mod P) + k·(−M mod P) < (T + 1)·2^62·P: w + 2 limbs; the reduction
        // then adds below 2^(64w)·P (2w + 2 limbs in all).
        let mut acc = [0u64; 2 * MAX_WIDTH + 2];
        let mut fraction = 0.0f64;
        for (t, prime) in self.primes.iter().enumerate() {
            let y = prime.mont(residues[t][i], self.cofactor_inverse[t]);
            fraction += y as f64 * self.reciprocal[t];
            add_product(&mut acc[..w + 2], y, &self.cofactor[t * w..(t + 1) * w]);
        }
        let k = fraction.round() as u64;
        add_product(&mut acc[..w + 2], k, &self.minus_product[..w]);
        let mut limbs = [0u64; MAX_WIDTH];
        self.montgomery_reduce(&mut acc[..2 * w + 2], &mut limbs[..w]);
        field.from_montgomery_limbs(&limbs[..w])
    }

    /// out = acc·2^(−64w) mod P, by w one-limb Montgomery steps (Montgomery 1985) and final
    /// subtractions; acc < 2^(64(w + 2)), given on 2w + 2 limbs.
    fn montgomery_reduce(&self, acc: &mut [u64], out: &mut [u64]) {
        let w = self.width;
        for i in 0..w {
            let m = acc[i].wrapping_mul(self.neg_inv);
            add_product(&mut acc[i..], m, &self.modulus[..w]);
        }
        let high = &mut acc[w..];
        while !less_than(high, &self.modulus[..w]) {
            subtract_in_place(high, &self.modulus[..w]);
        }
        out.copy_from_slice(&high[..w]);
    }
}

/// acc += y·v (v shorter than acc; the sum must fit acc).
#[inline(always)]
fn add_product(acc: &mut [u64], y: u64, v: &[u64]) {
    let mut carry = 0u64;
    for (a, &x) in acc.iter_mut().zip(v) {
        let t = *a as u128 + y as u128 * x as u128 + carry as u128;
        *a = t as u64;
        carry = (t >> 64) as u64;
    }
    for a in acc[v.len()..].iter_mut() {
        if carry == 0 {
            break;
        }
        let (s, overflow) = a.overflowing_add(carry);
        *a = s;
        carry = overflow as u64;
    }
}

/// Whether a < b as numbers (a may have more limbs than b).
fn less_than(a: &[u64], b: &[u64]) -> bool {
    if a[b.len()..].iter().any(|&x| x != 0) {
        return false;
    }
    for (x, y) in a[..b.len()].iter().rev().zip(b.iter().rev()) {
        if x != y {
            return x < y;
        }
    }
    false
}

/// a −= b for a ≥ b (a may have more limbs than b).
fn subtract_in_place(a: &mut [u64], b: &[u64]) {
    let mut borrow = false;
    for (i, x) in a.iter_mut().enumerate() {
        let y = b.get(i).copied().unwrap_or(0);
        let (d1, b1) = x.overflowing_sub(y);
        let (d2, b2) = d1.overflowing_sub(borrow as u64);
        *x = d2;
        borrow = b1 || b2;
    }
}
