//! Prime fields GF(p) for primes too large for a machine word (p ≥ 2^63, any size up to
//! 2^(64N)): elements are N-limb residues in Montgomery form (Montgomery 1985), see
//! [`super::montgomery`]. The limb count N is chosen at run time from the size of p
//! ([`BigPrimeField::limbs_for`]); callers hold one of the instantiations N = 2, 4, 8.
//!
//! Primality of p is checked by the Baillie–PSW test ([`super::bpsw`]): probabilistic in
//! principle, with no known counterexample.

use super::bpsw;
use super::montgomery::{from_limbs, to_limbs, Limbs, Montgomery};
use super::Field;
use crate::error::{Error, Result};
use num_bigint::BigUint;
use num_traits::ToPrimitive;

#[derive(Clone, Debug)]
pub struct BigPrimeField<const N: usize> {
    mont: Montgomery<N>,
    p: BigUint,
    /// (p − 1)/2 in ordinary form: residues above it print as negatives.
    half: Limbs<N>,
}

impl<const N: usize> PartialEq for BigPrimeField<N> {
    fn eq(&self, other: &Self) -> bool {
        self.p == other.p
    }
}

impl<const N: usize> BigPrimeField<N> {
    /// The limb count used for a prime of `bits` bits (2, 4 or 8; `None` above 512 bits).
    pub fn limbs_for(bits: u64) -> Option<usize> {
        match bits {
            0..=128 => Some(2),
            129..=256 => Some(4),
            257..=512 => Some(8),
            _ => None,
        }
    }

    /// GF(p) for a prime p that fits N limbs.
    pub fn new(p: &BigUint) -> Result<Self> {
        if !bpsw::is_probable_prime(p) {
            let why = match bpsw::small_factor(p) {
                Some(d) => format!(" (it is divisible by {d})"),
                None => " (it fails the Baillie-PSW test)".to_string(),
            };
            return Err(Error::invalid(format!("GF({p}): {p} is not a prime{why}")));
        }
        let mont = Montgomery::<N>::new(p).ok_or_else(|| {
            Error::invalid(format!(
                "GF({p}): the prime needs more than {} bits",
                64 * N
            ))
        })?;
        let half = to_limbs::<N>(&(p >> 1u32)).expect("fits");
        Ok(BigPrimeField {
            mont,
            p: p.clone(),
            half,
        })
    }

    pub fn modulus(&self) -> &BigUint {
        &self.p
    }

    /// The element of an ordinary value x (any size; reduced mod p).
    pub fn from_biguint(&self, x: &BigUint) -> Limbs<N> {
        self.mont
            .enter(&to_limbs::<N>(&(x % &self.p)).expect("reduced"))
    }
    /// The ordinary value in [0, p) of an element.
    pub fn to_biguint(&self, a: &Limbs<N>) -> BigUint {
        from_limbs(&self.mont.leave(a))
    }
}

impl<const N: usize> Field for BigPrimeField<N> {
    /// Montgomery form x·2^(64N) mod p, canonical (< p).
    type Elem = Limbs<N>;

    #[inline]
    fn zero(&self) -> Limbs<N> {
        [0; N]
    }
    #[inline]
    fn one(&self) -> Limbs<N> {
        self.mont.one()
    }
    #[inline]
    fn is_zero(&self, a: &Limbs<N>) -> bool {
        a.iter().all(|&w| w == 0)
    }
    #[inline]
    fn add(&self, a: &Limbs<N>, b: &Limbs<N>) -> Limbs<N> {
        self.mont.add(a, b)
    }
    #[inline]
    fn sub(&self, a: &Limbs<N>, b: &Limbs<N>) -> Limbs<N> {
        self.mont.sub(a, b)
    }
    #[inline]
    fn neg(&self, a: &Limbs<N>) -> Limbs<N> {
        self.mont.neg(a)
    }
    #[inline]
    fn mul(&self, a: &Limbs<N>, b: &Limbs<N>) -> Limbs<N> {
        self.mont.mul(a, b)
    }
    /// Fermat: a^(p−2).
    fn inv(&self, a: &Limbs<N>) -> Option<Limbs<N>> {
        if self.is_zero(a) {
            return None;
        }
        let e = (&self.p - 2u32).to_u64_digits();
        Some(self.mont.pow(a, &e))
    }
    fn pow(&self, a: &Limbs<N>, e: u64) -> Limbs<N> {
        self.mont.pow(a, &[e])
    }
    fn from_i64(&self, v: i64) -> Limbs<N> {
        let x = self.from_biguint(&BigUint::from(v.unsigned_abs()));
        if v < 0 {
            self.neg(&x)
        } else {
            x
        }
    }
    fn from_decimal(&self, digits: &str) -> Limbs<N> {
        let x: BigUint = digits.parse().unwrap_or_default();
        self.from_biguint(&x)
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
    /// Symmetric representative, as for word-size primes: p − 1 prints as -1.
    fn format(&self, a: &Limbs<N>) -> String {
        let x = self.mont.leave(a);
        if super::montgomery::geq(&self.half, &x) {
            from_limbs(&x).to_string()
        } else {
            format!("-{}", &self.p - from_limbs(&x))
        }
    }
    fn element_from_index(&self, i: u64) -> Limbs<N> {
        self.from_biguint(&BigUint::from(i))
    }
    /// Uniform over 0..p, drawn on the limbs of p.
    fn random(&self, rng: &mut crate::rng::Rng) -> Limbs<N> {
        let n = rng.below_limbs(&self.p.to_u64_digits());
        self.from_biguint(&BigUint::from_slice(
            &n.iter()
                .flat_map(|&w| [w as u32, (w >> 32) as u32])
                .collect::<Vec<_>>(),
        ))
    }
    fn size_hint(&self) -> f64 {
        self.p.to_f64().unwrap_or(f64::INFINITY)
    }
    fn characteristic_u64(&self) -> Option<u64> {
        self.p.to_u64()
    }
    fn order_limbs(&self) -> Option<Vec<u64>> {
        Some(self.p.to_u64_digits())
    }
    /// The Frobenius map is the identity on GF(p).
    fn pth_root(&self, a: &Limbs<N>) -> Option<Limbs<N>> {
        Some(*a)
    }
    fn montgomery_modulus(&self) -> Option<Vec<u64>> {
        Some(self.mont.modulus().to_vec())
    }
    fn to_montgomery_limbs(&self, a: &Limbs<N>, out: &mut [u64]) {
        out.copy_from_slice(a);
    }
    fn from_montgomery_limbs(&self, limbs: &[u64]) -> Limbs<N> {
        let mut a = [0u64; N];
        a.copy_from_slice(limbs);
        a
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn two_pow(k: u32) -> BigUint {
        BigUint::from(2u8).pow(k)
    }
    fn p25519() -> BigPrimeField<4> {
        // 2^255 − 19 (Bernstein 2006).
        BigPrimeField::new(&(two_pow(255) - 19u32)).unwrap()
    }
    fn p127() -> BigPrimeField<2> {
        // 2^127 − 1, a Mersenne prime.
        BigPrimeField::new(&(two_pow(127) - 1u32)).unwrap()
    }
    fn p384() -> BigPrimeField<8> {
        // The NIST P-384 prime 2^384 − 2^128 − 2^96 + 2^32 − 1 (FIPS 186-4, from memory).
        let p = two_pow(384) - two_pow(128) - two_pow(96) + two_pow(32) - 1u32;
        BigPrimeField::new(&p).unwrap()
    }

    /// Field axioms plus agreement of every operation with exact integer arithmetic mod p.
    fn check<const N: usize>(f: &BigPrimeField<N>, a: &BigUint, b: &BigUint, c: &BigUint) {
        let p = f.modulus();
        let (x, y, z) = (f.from_biguint(a), f.from_biguint(b), f.from_biguint(c));
        assert_eq!(f.to_biguint(&f.mul(&x, &y)), (a * b) % p);
        assert_eq!(f.to_biguint(&f.add(&x, &y)), (a + b) % p);
        assert_eq!(f.to_biguint(&f.sub(&x, &y)), (a % p + p - b % p) % p);
        assert_eq!(f.mul(&f.mul(&x, &y), &z), f.mul(&x, &f.mul(&y, &z)));
        assert_eq!(
            f.mul(&x, &f.add(&y, &z)),
            f.add(&f.mul(&x, &y), &f.mul(&x, &z))
        );
        if !f.is_zero(&x) {
            assert!(f.is_one(&f.mul(&x, &f.inv(&x).unwrap())));
        }
        assert_eq!(
            f.to_biguint(&f.pow(&x, 65537)),
            a.modpow(&BigUint::from(65537u32), p)
        );
        let text = f.format(&x);
        let back = match text.strip_prefix('-') {
            Some(t) => f.neg(&f.from_decimal(t)),
            None => f.from_decimal(&text),
        };
        assert_eq!(back, x);
    }

    fn big_from(words: &[u64]) -> BigUint {
        from_limbs(words)
    }

    proptest! {
        #[test]
        fn axioms_and_integer_agreement(a in proptest::collection::vec(any::<u64>(), 9),
                                        b in proptest::collection::vec(any::<u64>(), 9),
                                        c in proptest::collection::vec(any::<u64>(), 9)) {
            let (a, b, c) = (big_from(&a), big_from(&b), big_from(&c));
            check(&p25519(), &a, &b, &c);
            check(&p127(), &a, &b, &c);
            check(&p384(), &a, &b, &c);
        }
    }

    #[test]
    fn extreme_values_and_printing() {
        let f = p25519();
        let m1 = f.from_i64(-1);
        assert_eq!(f.format(&m1), "-1");
        assert_eq!(f.mul(&m1, &m1), f.one());
        assert_eq!(
            f.format(&f.from_decimal(
                "57896044618658097711785492504343953926634992332820282019728792003956564819949"
            )),
            "0"
        );
        assert_eq!(
            f.characteristic(),
            "57896044618658097711785492504343953926634992332820282019728792003956564819949"
        );
        // A prime just above 2^63 (2^63 + 29, from sympy.nextprime(2^63), from memory) on 2 limbs.
        let small = BigPrimeField::<2>::new(&(two_pow(63) + 29u32)).unwrap();
        assert_eq!(small.characteristic_u64(), Some((1 << 63) + 29));
        let e = BigPrimeField::<4>::new(&(two_pow(255) - 21u32))
            .unwrap_err()
            .to_string();
        assert!(e.contains("is not a prime"), "{e}");
        let e = BigPrimeField::<2>::new(&(two_pow(255) - 19u32))
            .unwrap_err()
            .to_string();
        assert!(e.contains("more than 128 bits"), "{e}");
    }
}

#[cfg(test)]
mod engine_tests {
    //! The same systems over 2^255 − 19, a prime just above 2^63 and word-size primes: for
    //! generic systems the leading monomials of the reduced bases agree (a prime is unlucky only
    //! if it divides one of finitely many integers attached to the system).
    use crate::control::Control;
    use crate::field::Field;
    use crate::field_kind::AnyField;
    use crate::groebner::{groebner_basis, Engine};
    use crate::order::MonomialOrder;
    use crate::parse::parse_poly;
    use crate::poly::Ring;
    use crate::Monomial;

    fn leads<F: Field>(field: F, gens: &[&str], order: MonomialOrder) -> Vec<Monomial> {
        let names = ["x", "y", "z"].iter().map(|s| s.to_string()).collect();
        let r = Ring::new(field, names, order).unwrap();
        let gens: Vec<_> = gens.iter().map(|g| parse_poly(&r, g).unwrap()).collect();
        let gb = groebner_basis(&r, &gens, Engine::Buchberger, &Control::new()).unwrap();
        // A generic system's basis is monic with nonzero coefficients of the input's size.
        gb.leading_monomials()
    }

    #[test]
    fn leading_monomials_agree_across_prime_sizes() {
        let systems: [&[&str]; 3] = [
            &["x^2 + 3*y*z - 5", "y^2 - 7*x*z + 2", "z^2 - x*y + 11"],
            &["x*y - 13*z + 1", "y*z - 17*x", "x*z - 19*y + 23"],
            &["x^3 + 2*y^2 - z", "x*y*z - 3", "y^3 - x^2 + 5*z^2"],
        ];
        let specs = [
            "GF(65521)",
            "GF(9223372036854775783)",
            "GF(9223372036854775837)",
            "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
            "Q",
        ];
        for gens in systems {
            for order in [MonomialOrder::Grevlex, MonomialOrder::Lex] {
                let all: Vec<Vec<Monomial>> = specs
                    .iter()
                    .map(|s| crate::with_any_field!(AnyField::parse(s).unwrap(), f => leads(f, gens, order.clone())))
                    .collect();
                for (s, l) in specs.iter().zip(&all) {
                    assert_eq!(l, &all[0], "{s} vs GF(65521) on {gens:?}");
                }
            }
        }
    }
}
