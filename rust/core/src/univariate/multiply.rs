//! Products of dense univariate polynomials: schoolbook for short factors, Karatsuba's
//! three-product splitting (Karatsuba and Ofman 1962) over every field, and number-theoretic
//! transforms ([`super::ntt`]) over word-size prime fields, where a product of degree n costs
//! O(n log n) word operations, and over multi-word prime fields through several word primes and
//! the Chinese remainder theorem ([`super::ntt_wide`]).

use super::{ntt, ntt_wide, trimmed, Univariate};
use crate::field::Field;

/// Below this length (of the shorter factor) the schoolbook product is faster than Karatsuba.
const KARATSUBA_THRESHOLD: usize = 24;
/// Below this length (of the shorter factor) Karatsuba is faster than the transforms.
const TRANSFORM_THRESHOLD: usize = 96;

/// a·b.
pub fn multiply<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    if a.is_empty() || b.is_empty() {
        return vec![];
    }
    if a.len().min(b.len()) >= TRANSFORM_THRESHOLD {
        if let Some(p) = field.word_modulus() {
            let words = |v: &[F::Elem]| v.iter().map(|c| field.to_word(c)).collect::<Vec<u64>>();
            let wa = words(a);
            // A square transforms its one factor once.
            let product = if std::ptr::eq(a, b) {
                ntt::multiply_words(&wa, &wa, p)
            } else {
                ntt::multiply_words(&wa, &words(b), p)
            };
            return trimmed(
                field,
                product.into_iter().map(|w| field.from_word(w)).collect(),
            );
        }
        if let Some(modulus) = field.montgomery_modulus() {
            return trimmed(field, ntt_wide::multiply_montgomery(field, a, b, &modulus));
        }
    }
    trimmed(field, karatsuba(field, a, b))
}

/// a².
pub fn square<F: Field>(field: &F, a: &[F::Elem]) -> Univariate<F> {
    multiply(field, a, a)
}

/// The product, of length a.len() + b.len() − 1 (not trimmed), for nonempty a and b.
fn karatsuba<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    let (a, b) = if a.len() >= b.len() { (a, b) } else { (b, a) };
    if b.len() < KARATSUBA_THRESHOLD {
        return schoolbook(field, a, b);
    }
    let half = a.len().div_ceil(2);
    if b.len() <= half {
        // Unbalanced: multiply b by slices of a of b's length and add them up.
        let mut out = vec![field.zero(); a.len() + b.len() - 1];
        for (k, chunk) in a.chunks(b.len()).enumerate() {
            add_into(field, &mut out[k * b.len()..], &karatsuba(field, chunk, b));
        }
        return out;
    }
    let (a0, a1) = a.split_at(half);
    let (b0, b1) = b.split_at(half);
    let low = karatsuba(field, a0, b0);
    let high = karatsuba(field, a1, b1);
    let mut middle = karatsuba(field, &sum(field, a0, a1), &sum(field, b0, b1));
    sub_into(field, &mut middle, &low);
    sub_into(field, &mut middle, &high);
    let mut out = vec![field.zero(); a.len() + b.len() - 1];
    add_into(field, &mut out, &low);
    add_into(field, &mut out[2 * half..], &high);
    add_into(field, &mut out[half..], &middle);
    out
}

fn schoolbook<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    let mut out = vec![field.zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if field.is_zero(x) {
            continue;
        }
        for (o, y) in out[i..].iter_mut().zip(b) {
            *o = field.add(o, &field.mul(x, y));
        }
    }
    out
}

/// a + b for slices of any lengths (untrimmed, length of the longer).
fn sum<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Vec<F::Elem> {
    let mut out = a.to_vec();
    if b.len() > out.len() {
        out.resize(b.len(), field.zero());
    }
    add_into(field, &mut out, b);
    out
}

/// out[i] += v[i]; v may be longer than out only by trailing zeros.
fn add_into<F: Field>(field: &F, out: &mut [F::Elem], v: &[F::Elem]) {
    for (o, x) in out.iter_mut().zip(v) {
        *o = field.add(o, x);
    }
}

/// out[i] −= v[i]; v may be longer than out only by trailing zeros.
fn sub_into<F: Field>(field: &F, out: &mut [F::Elem], v: &[F::Elem]) {
    for (o, x) in out.iter_mut().zip(v) {
        *o = field.sub(o, x);
    }
}
