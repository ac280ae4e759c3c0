//! The arithmetic of the scalar loops of the characteristic polynomial (Krylov, Hessenberg,
//! interpolation): either the generic [`Field`] interface, or residues modulo a prime p < 2^32
//! held in machine words, where a product fits 64 bits and `acc ± a·b` needs one reduction
//! instead of two (delayed reduction; the reduction itself is the prime field's Barrett
//! reduction, Barrett 1986, and inverses are the core's one word inverse). The loops are
//! written once, generic over [`Scalars`]; values are converted once at the boundary.

use crate::field::{Field, PrimeField};

/// What the scalar loops compute with, and the conversions from and to the field `F`.
pub trait Scalars {
    type Base: Field;
    type E: Clone + PartialEq + std::fmt::Debug;

    fn zero(&self) -> Self::E;
    fn one(&self) -> Self::E;
    fn is_zero(&self, a: &Self::E) -> bool;
    fn add(&self, a: &Self::E, b: &Self::E) -> Self::E;
    fn sub(&self, a: &Self::E, b: &Self::E) -> Self::E;
    fn neg(&self, a: &Self::E) -> Self::E;
    fn mul(&self, a: &Self::E, b: &Self::E) -> Self::E;
    /// The inverse, or `None` for zero.
    fn inv(&self, a: &Self::E) -> Option<Self::E>;
    /// acc + a·b.
    fn mul_add(&self, acc: &Self::E, a: &Self::E, b: &Self::E) -> Self::E {
        self.add(acc, &self.mul(a, b))
    }
    /// acc - a·b.
    fn mul_sub(&self, acc: &Self::E, a: &Self::E, b: &Self::E) -> Self::E {
        self.sub(acc, &self.mul(a, b))
    }
    /// Σ a_i·b_i.
    fn dot<'x>(&self, pairs: impl Iterator<Item = (&'x Self::E, &'x Self::E)>) -> Self::E
    where
        Self::E: 'x,
    {
        pairs.fold(self.zero(), |acc, (a, b)| self.mul_add(&acc, a, b))
    }
    /// The j-th interpolation point: distinct for j < [`Scalars::points`].
    fn point(&self, j: u64) -> Self::E;
    /// How many distinct points there are (the number of elements, `u64::MAX` when larger).
    fn points(&self) -> u64;
    fn import(&self, a: &<Self::Base as Field>::Elem) -> Self::E;
    /// The element of the base field, or `None` when `a` lies outside it (scalars in an
    /// extension of the base field).
    fn export(&self, a: &Self::E) -> Option<<Self::Base as Field>::Elem>;

    /// Sums of products for [`LANES`] independent problems side by side: `acc[l] += a[l]·b[l]`
    /// with no reduction in between, so that the loop over the lanes can run on vector units.
    type Lanes: Clone;
    fn lanes_zero(&self) -> Self::Lanes;
    fn lanes_mul_add(&self, acc: &mut Self::Lanes, a: &[Self::E; LANES], b: &[Self::E; LANES]);
    /// The reduced sum of each lane.
    fn lanes_finish(&self, acc: &Self::Lanes) -> [Self::E; LANES];
}

/// The inverses of all `values`, or `None` when one is zero, with one inversion and three
/// products per value (Montgomery 1987, batch inversion): an inverse by the extended Euclidean
/// algorithm costs as much as dozens of products.
pub fn invert_all<S: Scalars>(s: &S, values: &[S::E]) -> Option<Vec<S::E>> {
    // prefix[i] = values[0]·...·values[i-1]
    let mut prefix = Vec::with_capacity(values.len() + 1);
    prefix.push(s.one());
    for v in values {
        prefix.push(s.mul(prefix.last().unwrap(), v));
    }
    let mut rest = s.inv(prefix.last().unwrap())?; // 1 / (values[0]·...·values[i])
    let mut inverses = vec![s.zero(); values.len()];
    for i in (0..values.len()).rev() {
        inverses[i] = s.mul(&rest, &prefix[i]);
        rest = s.mul(&rest, &values[i]);
    }
    Some(inverses)
}

/// How many problems the lane operations of [`Scalars`] carry side by side: the lane count of
/// the F4 kernels, whose vector code the same CPUs run.
pub use crate::vector_unit::LANES;

/// The field's own arithmetic: works for every field.
pub struct Generic<'a, F: Field>(pub &'a F);

impl<F: Field> Scalars for Generic<'_, F> {
    type Base = F;
    type E = F::Elem;

    fn zero(&self) -> F::Elem {
        self.0.zero()
    }
    fn one(&self) -> F::Elem {
        self.0.one()
    }
    fn is_zero(&self, a: &F::Elem) -> bool {
        self.0.is_zero(a)
    }
    fn add(&self, a: &F::Elem, b: &F::Elem) -> F::Elem {
        self.0.add(a, b)
    }
    fn sub(&self, a: &F::Elem, b: &F::Elem) -> F::Elem {
        self.0.sub(a, b)
    }
    fn neg(&self, a: &F::Elem) -> F::Elem {
        self.0.neg(a)
    }
    fn mul(&self, a: &F::Elem, b: &F::Elem) -> F::Elem {
        self.0.mul(a, b)
    }
    fn inv(&self, a: &F::Elem) -> Option<F::Elem> {
        self.0.inv(a)
    }
    fn point(&self, j: u64) -> F::Elem {
        self.0.element_from_index(j)
    }
    fn points(&self) -> u64 {
        crate::field::field_size(self.0).unwrap_or(u64::MAX)
    }
    fn import(&self, a: &F::Elem) -> F::Elem {
        a.clone()
    }
    fn export(&self, a: &F::Elem) -> Option<F::Elem> {
        Some(a.clone())
    }

    type Lanes = [F::Elem; LANES];
    fn lanes_zero(&self) -> Self::Lanes {
        std::array::from_fn(|_| self.0.zero())
    }
    fn lanes_mul_add(&self, acc: &mut Self::Lanes, a: &[F::Elem; LANES], b: &[F::Elem; LANES]) {
        for ((acc, a), b) in acc.iter_mut().zip(a).zip(b) {
            *acc = self.mul_add(acc, a, b);
        }
    }
    fn lanes_finish(&self, acc: &Self::Lanes) -> [F::Elem; LANES] {
        acc.clone()
    }
}

/// Residues in [0, p) of a prime field GF(p) with p < 2^32, through the field's
/// [`Field::to_word`] and [`Field::from_word`]; sums and inverses as in [`PrimeField`].
pub struct Words<'a, F: Field> {
    field: &'a F,
    prime: PrimeField,
    p: u64,
    /// 2^64 mod p: the weight of a carry out of the low word of a sum.
    carry: u64,
}

impl<'a, F: Field> Words<'a, F> {
    /// `Some` when the field is GF(p) with 2 < p < 2^32 held as words.
    pub fn new(field: &'a F) -> Option<Self> {
        // A word modulus is a prime: no second primality test.
        let p = field.word_modulus().filter(|&p| p > 2 && p < 1 << 32)?;
        let prime = PrimeField::known_prime(p);
        Some(Words {
            field,
            carry: (prime.reduce_u64(u64::MAX) + 1) % p,
            prime,
            p,
        })
    }

    /// x mod p for any x < 2^64.
    #[inline]
    fn reduce(&self, x: u64) -> u64 {
        self.prime.reduce_u64(x)
    }
}

impl<F: Field> Scalars for Words<'_, F> {
    type Base = F;
    type E = u64;

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
        self.prime.add(a, b)
    }
    fn sub(&self, a: &u64, b: &u64) -> u64 {
        self.prime.sub(a, b)
    }
    fn neg(&self, a: &u64) -> u64 {
        self.prime.neg(a)
    }
    #[inline]
    fn mul(&self, a: &u64, b: &u64) -> u64 {
        self.reduce(a * b)
    }
    fn inv(&self, a: &u64) -> Option<u64> {
        self.prime.inv(a)
    }
    /// acc + a·b < p + (p-1)^2 < 2^64: one reduction.
    #[inline]
    fn mul_add(&self, acc: &u64, a: &u64, b: &u64) -> u64 {
        self.reduce(acc + a * b)
    }
    /// acc + a·(p - b) ≡ acc - a·b, and it stays below p + (p-1)·p < 2^64: one reduction.
    #[inline]
    fn mul_sub(&self, acc: &u64, a: &u64, b: &u64) -> u64 {
        self.reduce(acc + a * (self.p - b))
    }
    /// The products (each below 2^64) summed in two words without reduction, reduced once:
    /// carries·(2^64 mod p) + low, where the first term is below p^2 and the second below p
    /// after reduction, so the sum stays below 2^64.
    #[inline]
    fn dot<'x>(&self, pairs: impl Iterator<Item = (&'x u64, &'x u64)>) -> u64 {
        let (mut low, mut carries) = (0u64, 0u64);
        for (a, b) in pairs {
            let (sum, carry) = low.overflowing_add(a * b);
            low = sum;
            carries += u64::from(carry);
        }
        self.reduce(self.reduce(carries) * self.carry + self.reduce(low))
    }
    fn point(&self, j: u64) -> u64 {
        self.field.to_word(&self.field.element_from_index(j))
    }
    fn points(&self) -> u64 {
        self.p
    }
    fn import(&self, a: &F::Elem) -> u64 {
        self.field.to_word(a)
    }
    fn export(&self, a: &u64) -> Option<F::Elem> {
        Some(self.field.from_word(*a))
    }

    /// Each lane sums its products (each below 2^64, of residues below p < 2^32, which
    /// vector units multiply directly) in one word; a sum that wraps past 2^64 gets
    /// 2^64 mod p added back at once, so the word stays congruent to the exact sum and below
    /// 2^64 (a wrapped sum is below the product just added, at most (p - 1)^2 <= 2^64 - 2^33,
    /// and 2^64 mod p < 2^32). One reduction at the end.
    type Lanes = [u64; LANES];
    fn lanes_zero(&self) -> Self::Lanes {
        [0; LANES]
    }
    #[inline(always)]
    fn lanes_mul_add(&self, acc: &mut Self::Lanes, a: &[u64; LANES], b: &[u64; LANES]) {
        for l in 0..LANES {
            // Residues are below p < 2^32: the casts lose nothing and show the compiler so.
            let product = (a[l] as u32 as u64) * (b[l] as u32 as u64);
            let (sum, wrapped) = acc[l].overflowing_add(product);
            acc[l] = sum + if wrapped { self.carry } else { 0 };
        }
    }
    #[inline(always)]
    fn lanes_finish(&self, acc: &Self::Lanes) -> [u64; LANES] {
        std::array::from_fn(|l| self.reduce(acc[l]))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::field::PrimeField;

    /// Every operation on words agrees with the prime field's own on random residues of the
    /// largest prime below 2^32, 4294967291 (a handbook fact: 2^32 - 5 is prime), and of 7.
    #[test]
    fn words_agree_with_the_field() {
        let mut rng = crate::rng::Rng::new(11);
        for p in [7u64, 4_294_967_291] {
            let field = PrimeField::new(p).unwrap();
            let words = Words::new(&field).unwrap();
            let generic = Generic(&field);
            let mut samples: Vec<u64> = (0..200).map(|_| rng.next_u64() % p).collect();
            samples.extend([0, 1, p - 1, p - 2]);
            for (i, a) in samples.iter().enumerate() {
                let b = &samples[(i * 7 + 3) % samples.len()];
                let c = &samples[(i * 13 + 5) % samples.len()];
                assert_eq!(words.mul(a, b), generic.mul(a, b), "{a}·{b} mod {p}");
                assert_eq!(words.mul_add(c, a, b), generic.mul_add(c, a, b));
                assert_eq!(words.mul_sub(c, a, b), generic.mul_sub(c, a, b));
                assert_eq!(words.sub(a, b), generic.sub(a, b));
                assert_eq!(words.neg(a), generic.neg(a));
                assert_eq!(words.inv(a), generic.inv(a));
            }
            // Long sums carry out of the low word many times.
            let pairs = || samples.iter().zip(samples.iter().rev());
            assert_eq!(words.dot(pairs()), generic.dot(pairs()), "dot mod {p}");
        }
        assert!(Words::new(&PrimeField::new(2).unwrap()).is_none());
    }

    /// Batch inversion gives each value's inverse (checked by the product with the value), and
    /// `None` when a value is zero; over GF(4294967291) in words and GF(7) in the field.
    #[test]
    fn batch_inverses_are_inverses() {
        let mut rng = crate::rng::Rng::new(5);
        for p in [7u64, 4_294_967_291] {
            let field = PrimeField::new(p).unwrap();
            let (words, generic) = (Words::new(&field).unwrap(), Generic(&field));
            let values: Vec<u64> = (0..40).map(|_| 1 + rng.next_u64() % (p - 1)).collect();
            for inverses in [invert_all(&words, &values), invert_all(&generic, &values)] {
                let inverses = inverses.unwrap();
                for (v, w) in values.iter().zip(&inverses) {
                    assert_eq!(words.mul(v, w), 1, "{v} mod {p}");
                }
            }
            assert_eq!(invert_all(&words, &[]), Some(vec![]));
            assert_eq!(invert_all(&words, &[3, 0, 5]), None);
        }
    }

    /// The lane sums agree with the field's own sums of products, lane by lane, for sums long
    /// enough to wrap past 2^64 many times (products near (p - 1)^2, every other one), over
    /// GF(4294967291) and GF(7).
    #[test]
    fn lane_sums_agree_with_the_field() {
        let mut rng = crate::rng::Rng::new(23);
        for p in [7u64, 4_294_967_291] {
            let field = PrimeField::new(p).unwrap();
            let (words, generic) = (Words::new(&field).unwrap(), Generic(&field));
            for length in [0, 1, 5, 3000] {
                let (mut fast, mut slow) = (words.lanes_zero(), generic.lanes_zero());
                for step in 0..length {
                    let draw = |rng: &mut crate::rng::Rng| -> [u64; LANES] {
                        std::array::from_fn(|_| {
                            if step % 2 == 0 {
                                p - 1
                            } else {
                                rng.next_u64() % p
                            }
                        })
                    };
                    let (a, b) = (draw(&mut rng), draw(&mut rng));
                    words.lanes_mul_add(&mut fast, &a, &b);
                    generic.lanes_mul_add(&mut slow, &a, &b);
                }
                assert_eq!(
                    words.lanes_finish(&fast),
                    generic.lanes_finish(&slow),
                    "{length} mod {p}"
                );
            }
        }
    }
}
