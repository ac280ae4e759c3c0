//! The rational roots of a polynomial with rational coefficients, exactly, by p-adic lifting
//! (Hensel's lemma in Newton's form; Zassenhaus 1969, Loos 1983).
//!
//! f is scaled to a primitive integer polynomial with f(0) ≠ 0 (a root 0 is split off first)
//! and made squarefree. By the rational root theorem a root a/b in lowest terms has b | lc(f)
//! and a | f(0), so lc(f)·a/b is an integer of absolute value at most B = |lc(f)·f(0)|. For a
//! prime p that divides neither lc(f) nor the discriminant, every rational root reduces to a
//! simple root of f modulo p; each root modulo p is lifted by Newton's iteration r ← r −
//! f(r)/f'(r), which doubles the p-adic precision per step, until p^k > 2B. Then lc(f)·r in the
//! symmetric range (−p^k/2, p^k/2) is the integer lc(f)·a/b when r comes from a rational root,
//! and each candidate is kept only when f vanishes at it exactly: nothing rests on a bound being
//! tight, the bounds only guarantee that no root is missed.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::{integer_scale, PrimeField, RationalField};
use crate::univariate::{roots, squarefree_part};
use crate::zerodim::hensel::reduce_mod;
use crate::zerodim::irreducible::good_primes;
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{Signed, Zero};

/// The distinct rational roots of f ≠ 0, increasing.
pub fn rational_roots(f: &[BigRational], control: &Control) -> Result<Vec<BigRational>> {
    let f = crate::univariate::trimmed(&RationalField, f.to_vec());
    if f.is_empty() {
        return Err(Error::invalid(
            "rational roots of the zero polynomial: every number is a root",
        ));
    }
    let f = squarefree_part(&RationalField, &f);
    let mut out = Vec::new();
    let zeros = f.iter().take_while(|c| c.is_zero()).count();
    if zeros > 0 {
        out.push(BigRational::zero());
    }
    let integer = primitive_integer(&f[zeros..]);
    if integer.len() >= 2 {
        out.extend(nonzero_roots(&integer, control)?);
    }
    out.sort();
    Ok(out)
}

/// The primitive integer polynomial proportional to f (f ≠ 0).
fn primitive_integer(f: &[BigRational]) -> Vec<BigInt> {
    let scale = integer_scale(&f.iter().collect::<Vec<_>>());
    f.iter().map(|c| (c * &scale).to_integer()).collect()
}

/// The rational roots of a squarefree integer polynomial f with f(0) ≠ 0 and degree ≥ 1.
fn nonzero_roots(f: &[BigInt], control: &Control) -> Result<Vec<BigRational>> {
    let lc = f.last().expect("nonzero").clone();
    let bound = (&lc * &f[0]).abs();
    let p = good_primes(f)
        .next()
        .expect("a squarefree polynomial is squarefree modulo all but finitely many primes");
    let field = PrimeField::new(p)?;
    let image: Vec<u64> = reduce_mod(f, p);
    let (mut k, mut modulus) = (1u32, BigInt::from(p));
    while modulus <= &bound * 2u32 {
        k *= 2;
        modulus = &modulus * &modulus;
    }
    let df: Vec<BigInt> = (1..f.len()).map(|i| &f[i] * BigInt::from(i)).collect();
    let mut out = Vec::new();
    for r in roots(&field, &image, control)? {
        control.check()?;
        let lifted = newton_lift(f, &df, BigInt::from(r), p, k);
        let scaled = symmetric((&lc * lifted).mod_floor(&modulus), &modulus);
        let candidate = BigRational::new(scaled, lc.clone());
        if evaluate_integer(f, &candidate).is_zero() {
            out.push(candidate);
        }
    }
    Ok(out)
}

/// The root r mod p of f (simple modulo p) lifted to a root modulo p^k (k a power of two).
fn newton_lift(f: &[BigInt], df: &[BigInt], mut r: BigInt, p: u64, k: u32) -> BigInt {
    let mut precision = 1u32;
    let mut modulus = BigInt::from(p);
    while precision < k {
        precision *= 2;
        modulus = &modulus * &modulus;
        let value = horner(f, &r, &modulus);
        let slope = horner(df, &r, &modulus);
        let inverse = slope
            .modinv(&modulus)
            .expect("a simple root modulo p has an invertible derivative");
        r = (r - value * inverse).mod_floor(&modulus);
    }
    r
}

fn horner(f: &[BigInt], x: &BigInt, modulus: &BigInt) -> BigInt {
    f.iter()
        .rev()
        .fold(BigInt::zero(), |acc, c| (acc * x + c).mod_floor(modulus))
}

/// x in (−m/2, m/2] from x in [0, m).
fn symmetric(x: BigInt, m: &BigInt) -> BigInt {
    if &x * 2u32 > *m {
        x - m
    } else {
        x
    }
}

/// f(x) exactly.
fn evaluate_integer(f: &[BigInt], x: &BigRational) -> BigRational {
    f.iter().rev().fold(BigRational::zero(), |acc, c| {
        acc * x + BigRational::from_integer(c.clone())
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::str::FromStr;

    fn rational(text: &str) -> BigRational {
        BigRational::from_str(text).unwrap()
    }

    #[test]
    fn rational_roots_agree_with_sympy() {
        // (2x − 3)(5x + 7)(x^2 + 1)(3x − 10^20)(x^3 − 2), expanded with sympy 1.14; its rational
        // roots are 3/2, −7/5 and 10^20/3 (sympy 1.14, `roots(f, filter='Q')`).
        let f: Vec<BigRational> = [
            "-4200000000000000000000",
            "-199999999999999999874",
            "-2199999999999999999994",
            "1900000000000000000066",
            "2099999999999999999943",
            "1099999999999999999937",
            "99999999999999999967",
            "-1000000000000000000003",
            "30",
        ]
        .iter()
        .map(|c| rational(c))
        .collect();
        let found = rational_roots(&f, &Control::new()).unwrap();
        let expected = ["-7/5", "3/2", "100000000000000000000/3"].map(rational);
        assert_eq!(found, expected);
        // Rational coefficients, a repeated root and the root 0: x^2·(x − 1/2)^2·(x^2 − 3).
        let g: Vec<BigRational> = ["0", "0", "-3/4", "3", "-11/4", "-1", "1"]
            .iter()
            .map(|c| rational(c))
            .collect();
        assert_eq!(
            rational_roots(&g, &Control::new()).unwrap(),
            [rational("0"), rational("1/2")]
        );
        assert!(rational_roots(
            &[rational("-2"), rational("0"), rational("1")],
            &Control::new()
        )
        .unwrap()
        .is_empty());
        assert!(rational_roots(&[], &Control::new()).is_err());
    }
}
