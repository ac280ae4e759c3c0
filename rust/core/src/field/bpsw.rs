//! The Baillie–PSW probable-prime test for integers of any size (Baillie and Wagstaff 1980;
//! Pomerance, Selfridge and Wagstaff 1980): trial division, Miller–Rabin to the first twelve
//! prime bases (Miller 1976; Rabin 1980), then a strong Lucas test with Selfridge's choice of
//! parameters. Probabilistic in principle: no composite passing it is known, and none exists
//! below 2^64 (where the deterministic test of [`super::primality`] is used anyway).

use super::montgomery::{to_limbs, Montgomery};
use super::primality;
use num_bigint::BigUint;
use num_traits::{One, ToPrimitive, Zero};

const SMALL_PRIMES: [u64; 12] = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37];

/// Jacobi symbol (a/m) for odd m > 0.
fn jacobi(mut a: u64, mut m: u64) -> i32 {
    let mut sign = 1;
    a %= m;
    while a != 0 {
        while a.is_multiple_of(2) {
            a /= 2;
            if m % 8 == 3 || m % 8 == 5 {
                sign = -sign;
            }
        }
        std::mem::swap(&mut a, &mut m);
        if a % 4 == 3 && m % 4 == 3 {
            sign = -sign;
        }
        a %= m;
    }
    if m == 1 {
        sign
    } else {
        0
    }
}

/// Jacobi symbol (d/n) for a small odd |d| and odd n, by quadratic reciprocity.
fn jacobi_small_over_big(d: i64, n: &BigUint) -> i32 {
    let abs = d.unsigned_abs();
    let n_mod_4 = (n % 4u32).to_u64().unwrap();
    let r = (n % abs).to_u64().unwrap();
    let mut j = jacobi(r, abs);
    if abs % 4 == 3 && n_mod_4 == 3 {
        j = -j;
    }
    if d < 0 && n_mod_4 == 3 {
        j = -j; // (-1/n) = -1 for n ≡ 3 (mod 4)
    }
    j
}

/// Smallest prime factor of `n` below 1000, for error messages and the test's first filter.
pub fn small_factor(n: &BigUint) -> Option<u64> {
    (2u64..1000)
        .filter(|&d| primality::is_prime(d))
        .find(|&d| (n % d).is_zero() && *n != BigUint::from(d))
}

/// Whether n is (probably, see the module doc) prime.
pub fn is_probable_prime(n: &BigUint) -> bool {
    if let Some(small) = n.to_u64() {
        return primality::is_prime(small);
    }
    if small_factor(n).is_some() {
        return false;
    }
    match n.bits() {
        0..=128 => test_with::<2>(n),
        129..=256 => test_with::<4>(n),
        257..=512 => test_with::<8>(n),
        513..=1024 => test_with::<16>(n),
        _ => test_with::<64>(n),
    }
}

fn test_with<const N: usize>(n: &BigUint) -> bool {
    let m = Montgomery::<N>::new(n).expect("odd and fits");
    miller_rabin(&m, n) && strong_lucas(&m, n)
}

fn miller_rabin<const N: usize>(m: &Montgomery<N>, n: &BigUint) -> bool {
    let n_minus_1 = n - 1u32;
    let s = n_minus_1.trailing_zeros().unwrap();
    let d = (&n_minus_1 >> s).to_u64_digits();
    let minus_one = m.neg(&m.one());
    'bases: for &a in &SMALL_PRIMES {
        let mut x = m.pow(&m.enter(&to_limbs::<N>(&BigUint::from(a)).unwrap()), &d);
        if x == m.one() || x == minus_one {
            continue;
        }
        for _ in 1..s {
            x = m.mul(&x, &x);
            if x == minus_one {
                continue 'bases;
            }
        }
        return false;
    }
    true
}

/// Selfridge's method A: the first D in 5, −7, 9, −11, ... with (D/n) = −1; P = 1,
/// Q = (1 − D)/4. `None` means n is composite (a square, or sharing a factor with some D).
fn selfridge_parameters(n: &BigUint) -> Option<i64> {
    let mut d: i64 = 5;
    for tries in 0.. {
        match jacobi_small_over_big(d, n) {
            -1 => return Some(d),
            0 if BigUint::from(d.unsigned_abs()) != *n => return None,
            _ => {}
        }
        // Squares have (D/n) ≠ −1 for every D: catch them before searching long.
        if tries == 20 && n.sqrt().pow(2) == *n {
            return None;
        }
        d = if d > 0 { -(d + 2) } else { -d + 2 };
    }
    unreachable!()
}

fn strong_lucas<const N: usize>(m: &Montgomery<N>, n: &BigUint) -> bool {
    let Some(d) = selfridge_parameters(n) else {
        return false;
    };
    let signed = |v: i64| {
        let x = m.enter(&to_limbs::<N>(&BigUint::from(v.unsigned_abs())).unwrap());
        if v < 0 {
            m.neg(&x)
        } else {
            x
        }
    };
    let (big_d, q) = (signed(d), signed((1 - d) / 4));
    let n_plus_1 = n + 1u32;
    let s = n_plus_1.trailing_zeros().unwrap();
    let k = &n_plus_1 >> s;
    // U_1 = 1, V_1 = P = 1, Q^1; then binary ladder over the remaining bits of k.
    let (mut u, mut v, mut qk) = (m.one(), m.one(), q);
    for bit in (0..k.bits() - 1).rev() {
        u = m.mul(&u, &v);
        v = m.sub(&m.mul(&v, &v), &m.add(&qk, &qk));
        qk = m.mul(&qk, &qk);
        if k.bit(bit) {
            let u_next = m.half(&m.add(&u, &v));
            v = m.half(&m.add(&m.mul(&big_d, &u), &v));
            u = u_next;
            qk = m.mul(&qk, &q);
        }
    }
    let zero = [0u64; N];
    if u == zero || v == zero {
        return true;
    }
    for _ in 1..s {
        v = m.sub(&m.mul(&v, &v), &m.add(&qk, &qk));
        qk = m.mul(&qk, &qk);
        if v == zero {
            return true;
        }
    }
    false
}

/// Used by tests and callers that want "is n a prime power p^k, and which": n = p^k with p
/// (probably) prime and k ≥ 1 maximal, or `None`.
pub fn prime_power(n: &BigUint) -> Option<(BigUint, u32)> {
    if *n <= BigUint::one() {
        return None;
    }
    for k in (1..=n.bits() as u32).rev() {
        let r = n.nth_root(k);
        if r > BigUint::one() && r.pow(k) == *n && is_probable_prime(&r) {
            return Some((r, k));
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    fn big(s: &str) -> BigUint {
        s.parse().unwrap()
    }

    #[test]
    fn known_primes_and_composites() {
        // 2^255 − 19 (Bernstein 2006, Curve25519), 2^127 − 1 (Mersenne prime, Lucas 1876),
        // 2^521 − 1 (Mersenne prime, Robinson 1952), the NIST P-256 prime
        // 2^256 − 2^224 + 2^192 + 2^96 − 1 (FIPS 186): all prime, from memory.
        let two = BigUint::from(2u8);
        let p25519 = two.pow(255) - 19u32;
        let m127 = two.pow(127) - 1u32;
        let m521 = two.pow(521) - 1u32;
        let p256 = two.pow(256) - two.pow(224) + two.pow(192) + two.pow(96) - 1u32;
        for p in [&p25519, &m127, &m521, &p256] {
            assert!(is_probable_prime(p), "{p}");
        }
        // 2^128 + 1 = 59649589127497217 · 5704689200685129054721 (Morrison–Brillhart 1975),
        // 2^256 − 1 (divisible by 3), products of two large primes, and a square of a prime.
        assert!(!is_probable_prime(&(two.pow(128) + 1u32)));
        assert!(!is_probable_prime(&(two.pow(256) - 1u32)));
        assert!(!is_probable_prime(&(&m127 * &p25519)));
        assert!(!is_probable_prime(&(&m127 * &m127)));
        assert!(!is_probable_prime(
            &(big("18446744073709551557") * big("18446744073709551533"))
        ));
    }

    #[test]
    fn montgomery_tests_agree_with_the_deterministic_64_bit_test() {
        // The same Miller–Rabin + strong Lucas code on one and two limbs, against the
        // deterministic 64-bit test, on consecutive odd numbers near 2^62 and 2^64.
        for start in [(1u64 << 62) + 1, u64::MAX - 40_000] {
            for n in (start..start + 40_000).step_by(2) {
                let big = BigUint::from(n);
                if small_factor(&big).is_some() {
                    continue;
                }
                let expected = primality::is_prime(n);
                assert_eq!(test_with::<1>(&big), expected, "{n}");
                assert_eq!(test_with::<2>(&big), expected, "{n}");
            }
        }
    }

    #[test]
    fn strong_lucas_pseudoprimes_pass_lucas_and_fail_miller_rabin() {
        // The first strong Lucas pseudoprimes for Selfridge's parameters (OEIS A217255, from
        // memory): composite, yet they pass the strong Lucas test; Miller–Rabin catches them.
        for n in [
            5459u64, 5777, 10877, 16109, 18971, 22499, 24569, 25199, 40309, 58519,
        ] {
            let big = BigUint::from(n);
            let m = Montgomery::<1>::new(&big).unwrap();
            assert!(
                strong_lucas(&m, &big),
                "{n} should pass the strong Lucas test"
            );
            assert!(!miller_rabin(&m, &big), "{n}");
        }
        // Strong pseudoprimes to base 2 (2047 = 23·89, 3277, 4033) fail the Lucas part.
        for n in [2047u64, 3277, 4033, 4681, 8321] {
            let big = BigUint::from(n);
            let m = Montgomery::<1>::new(&big).unwrap();
            assert!(!strong_lucas(&m, &big), "{n}");
        }
    }

    #[test]
    fn prime_powers() {
        assert_eq!(
            prime_power(&BigUint::from(256u32)),
            Some((BigUint::from(2u8), 8))
        );
        assert_eq!(
            prime_power(&BigUint::from(9u32)),
            Some((BigUint::from(3u8), 2))
        );
        assert_eq!(
            prime_power(&BigUint::from(7u32)),
            Some((BigUint::from(7u8), 1))
        );
        assert_eq!(prime_power(&BigUint::from(12u32)), None);
        assert_eq!(prime_power(&BigUint::from(1u32)), None);
        let p = BigUint::from((1u64 << 61) - 1);
        assert_eq!(prime_power(&p.pow(3)), Some((p, 3)));
    }
}
