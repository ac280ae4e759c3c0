//! Greatest common divisors of big integers by Lehmer's method (Lehmer 1938; Knuth, *The Art of
//! Computer Programming* vol. 2, §4.5.2, Algorithm L, from memory): the Euclidean quotients are
//! computed on the leading 62 bits of both numbers as long as they agree with the true ones,
//! and the accumulated 2×2 cofactor matrix is applied to the full numbers once, so a
//! multi-word gcd costs about one multi-word operation per machine word of quotient bits
//! instead of one per bit (the binary method) or per quotient (plain Euclid). Unbalanced
//! operands take one full division first, which is what contents of polynomials need most.

use num_bigint::{BigInt, BigUint};
use num_integer::Integer;
use num_traits::{ToPrimitive, Zero};

/// Bits of the leading parts; cofactors stay below 2^62 in absolute value, so i128 suffices.
const LEADING_BITS: u64 = 62;

/// gcd(a, b) ≥ 0 (gcd(0, 0) = 0).
pub fn gcd(a: &BigInt, b: &BigInt) -> BigInt {
    BigInt::from(gcd_magnitudes(a.magnitude().clone(), b.magnitude().clone()))
}

fn gcd_magnitudes(mut a: BigUint, mut b: BigUint) -> BigUint {
    if a < b {
        std::mem::swap(&mut a, &mut b);
    }
    while b.bits() > 64 {
        // Unbalanced: one division brings a below b.
        if a.bits() > b.bits() + 32 {
            let r = &a % &b;
            a = std::mem::replace(&mut b, r);
            continue;
        }
        match leading_cofactors(&a, &b) {
            None => {
                let r = &a % &b;
                a = std::mem::replace(&mut b, r);
            }
            Some([s, t, u, v]) => {
                let (a_int, b_int) = (BigInt::from(a), BigInt::from(b));
                let next_a = &a_int * s + &b_int * t;
                let next_b = &a_int * u + &b_int * v;
                a = next_a.magnitude().clone();
                b = next_b.magnitude().clone();
            }
        }
    }
    if b.is_zero() {
        return a;
    }
    let small = b.to_u64().expect("at most 64 bits");
    let rest = (&a % small).to_u64().expect("below b");
    BigUint::from(small.gcd(&rest))
}

/// Knuth's Algorithm L on the leading bits of a ≥ b: the cofactors [s, t, u, v] with
/// (s·a + t·b, u·a + v·b) the pair reached by the Euclidean steps whose quotients the leading
/// bits determine; `None` when not even the first quotient is determined.
fn leading_cofactors(a: &BigUint, b: &BigUint) -> Option<[i128; 4]> {
    let shift = a.bits().saturating_sub(LEADING_BITS);
    let mut x = (a >> shift).to_i128().expect("62 bits");
    let mut y = (b >> shift).to_i128().expect("62 bits");
    let (mut s, mut t, mut u, mut v) = (1i128, 0i128, 0i128, 1i128);
    while y + u != 0 && y + v != 0 {
        let q = (x + s) / (y + u);
        if q != (x + t) / (y + v) {
            break;
        }
        (s, u) = (u, s - q * u);
        (t, v) = (v, t - q * v);
        (x, y) = (y, x - q * y);
    }
    (t != 0).then_some([s, t, u, v])
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn big(words: &[u64]) -> BigInt {
        BigInt::from(BigUint::new(
            words
                .iter()
                .flat_map(|w| [*w as u32, (*w >> 32) as u32])
                .collect(),
        ))
    }

    proptest! {
        // num-integer's binary gcd is the reference.
        #[test]
        fn agrees_with_the_binary_method(
            a in proptest::collection::vec(any::<u64>(), 0..6),
            b in proptest::collection::vec(any::<u64>(), 0..6),
            c in proptest::collection::vec(any::<u64>(), 0..3),
            negative in any::<bool>(),
        ) {
            let common = big(&c);
            let x = big(&a) * &common;
            let y = if negative { -(big(&b) * &common) } else { big(&b) * &common };
            prop_assert_eq!(gcd(&x, &y), x.gcd(&y));
        }
    }

    #[test]
    fn consecutive_fibonacci_numbers_are_coprime() {
        // The worst case of Euclid's algorithm (Lamé 1844): every quotient is 1.
        let (mut f, mut g) = (BigInt::from(1), BigInt::from(1));
        for _ in 0..500 {
            (f, g) = (g.clone(), f + g);
        }
        assert_eq!(gcd(&f, &g), BigInt::from(1));
        assert_eq!(gcd(&(&f * 6), &(-&g * 6)), BigInt::from(6));
    }
}
