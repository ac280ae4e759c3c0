//! Random field elements from the core's generator [`Rng`]: uniform over a finite field of any
//! size (rejection sampling below the field order), small integers over an infinite field.

use super::Field;
use crate::rng::Rng;

impl Rng {
    /// A nonzero field element. Finite fields: uniform among the nonzero elements (all of them,
    /// however large the field); infinite fields: a small integer in ±1..±16, so certificates
    /// stay readable.
    pub fn nonzero<F: Field>(&mut self, field: &F) -> F::Elem {
        match crate::field::field_size(field) {
            Some(u64::MAX) => loop {
                let a = field.random(self);
                if !field.is_zero(&a) {
                    return a;
                }
            },
            size => {
                let count = size.map_or(32, |q| q.min(1 << 62));
                // element_from_index runs through 0, 1, ... so index 0 (zero) is skipped.
                field.element_from_index(1 + self.next_u64() % (count - 1))
            }
        }
    }
}

/// A uniformly random element of a finite field of any size; one of the first 2^16 elements of
/// the enumeration for an infinite field (small integers keep rational arithmetic cheap).
/// Fields of at most 2^64 elements draw an index of their enumeration; larger prime fields an
/// integer below p, built from 32-bit digits; larger extension fields Σ c_i a^i with uniform
/// coefficients c_i in the prime field (fields may override [`Field::random`] with a faster
/// equivalent).
pub fn uniform_element<F: Field>(field: &F, rng: &mut Rng) -> F::Elem {
    let Some(limbs) = field.order_limbs() else {
        return field.element_from_index(rng.below(1 << 16));
    };
    if limbs.len() == 1 {
        return field.element_from_index(rng.below(limbs[0]));
    }
    match (field.degree(), field.generator()) {
        (k, Some(a)) if k > 1 => {
            let p = field
                .characteristic_u64()
                .expect("extension over a word prime");
            (0..k).fold(field.zero(), |acc, _| {
                let c = field.from_i64(rng.below(p) as i64);
                field.add(&field.mul(&acc, &a), &c)
            })
        }
        _ => {
            let n = rng.below_limbs(&limbs);
            let base = field.from_i64(1 << 32);
            n.iter()
                .rev()
                .flat_map(|&w| [w >> 32, w & 0xffff_ffff])
                .fold(field.zero(), |acc, d| {
                    field.add(&field.mul(&acc, &base), &field.from_i64(d as i64))
                })
        }
    }
}
