//! Field axioms checked on random elements, for small primes and primes near 2^63.

use super::*;
use proptest::prelude::*;

/// p = 2, 3, the prime 65521 (largest below 2^16), 2^31 - 1, 2^61 - 1 and 2^63 - 25 (the largest
/// prime below 2^63; tables of primes below powers of two, from memory, confirmed by sympy.isprime).
const PRIMES: [u64; 6] = [2, 3, 65521, 2147483647, (1 << 61) - 1, (1 << 63) - 25];

fn check_axioms(f: &PrimeField, a: u64, b: u64, c: u64) {
    let p = f.modulus();
    let (a, b, c) = (a % p, b % p, c % p);
    assert_eq!(f.add(&a, &b), f.add(&b, &a));
    assert_eq!(f.mul(&a, &b), f.mul(&b, &a));
    assert_eq!(f.mul(&f.mul(&a, &b), &c), f.mul(&a, &f.mul(&b, &c)));
    assert_eq!(
        f.mul(&a, &f.add(&b, &c)),
        f.add(&f.mul(&a, &b), &f.mul(&a, &c))
    );
    assert_eq!(f.add(&a, &f.neg(&a)), 0);
    assert_eq!(f.sub(&a, &b), f.add(&a, &f.neg(&b)));
    // Reference product by 128-bit division.
    assert_eq!(f.mul(&a, &b), ((a as u128 * b as u128) % p as u128) as u64);
    if a != 0 {
        assert_eq!(f.mul(&a, &f.inv(&a).unwrap()), 1);
    }
}

proptest! {
    #[test]
    fn field_axioms(a in any::<u64>(), b in any::<u64>(), c in any::<u64>()) {
        for &p in &PRIMES {
            check_axioms(&PrimeField::new(p).unwrap(), a, b, c);
        }
    }

    #[test]
    fn decimal_parsing_matches_u128_reduction(v in any::<u128>()) {
        for &p in &PRIMES {
            let f = PrimeField::new(p).unwrap();
            prop_assert_eq!(f.from_decimal(&v.to_string()), (v % p as u128) as u64);
        }
    }
}

#[test]
fn extreme_residues() {
    for &p in &PRIMES {
        let f = PrimeField::new(p).unwrap();
        let m = p - 1;
        assert_eq!(f.mul(&m, &m), 1, "(-1)^2 = 1 in GF({p})");
        assert_eq!(f.add(&m, &m), f.from_i64(-2));
        assert_eq!(f.inv(&0), None);
        for a in [1, p / 2, m] {
            assert_eq!(f.pow(&a, p - 1), 1, "Fermat: {a}^(p-1) = 1 in GF({p})");
        }
    }
}

#[test]
fn composite_and_oversized_moduli_are_rejected_with_the_number() {
    let e = PrimeField::new(65535).unwrap_err().to_string();
    assert!(
        e.contains("65535 is not a prime") && e.contains("divisible by 3"),
        "{e}"
    );
    let e = PrimeField::new(1).unwrap_err().to_string();
    assert!(e.contains("1 is not a prime"), "{e}");
    let e = PrimeField::new(1 << 63).unwrap_err().to_string();
    assert!(e.contains("p < 2^63"), "{e}");
}

#[test]
fn symmetric_printing() {
    let f = PrimeField::new(7).unwrap();
    assert_eq!(f.format(&6), "-1");
    assert_eq!(f.format(&3), "3");
    assert_eq!(f.format(&4), "-3");
}
