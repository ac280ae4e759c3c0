//! Whether a univariate polynomial over QQ is irreducible, exactly, by the Berlekamp–Zassenhaus
//! method (Zassenhaus 1969, "On Hensel factorization I"; the presentation of von zur Gathen and
//! Gerhard, *Modern Computer Algebra* 1999, ch. 15, from memory):
//!
//! 1. f is made a primitive integer polynomial; a non-squarefree f of degree ≥ 2 is reducible.
//! 2. Degree patterns: modulo a few small primes p not dividing lc(f) and keeping f squarefree,
//!    f is factored by Berlekamp's algorithm. A factor of f over QQ of degree d reduces to a
//!    product of modular factors, so d must be a sum of modular factor degrees for every such
//!    prime; when no d in 1..deg f − 1 survives, f is irreducible (Musser 1978 studied how few
//!    primes this usually takes). This is only a shortcut: its "reducible-looking" answers are
//!    never trusted.
//! 3. Otherwise the factorization modulo the prime with fewest factors is lifted by Hensel's
//!    lemma to p^k > 2B, where B = |lc(f)|·2^n·‖f‖₂ bounds lc(f)/lc(g)·g for every factor g of f
//!    (Mignotte 1974: ‖g‖₁ ≤ 2^deg g·|lc(g)/lc(f)|·‖f‖₂), and every subset of at most half the
//!    lifted factors whose degree survived step 2 is tried: its product times lc(f), taken with
//!    symmetric residues, has a primitive part dividing f over ZZ iff it is a true factor. No
//!    subset dividing f means f is irreducible.
//!
//! Cost: step 3 tries up to 2^(r−1) subsets for r modular factors. That is exponential in the
//! worst case (Swinnerton-Dyer polynomials of degree 2^m have r ≥ 2^(m−1) factors modulo every
//! prime), harmless for the degrees that minimal polynomials of quotient algebras reach here,
//! and always terminates; each subset costs one product and one trial division.

use super::berlekamp::factor_squarefree;
use super::hensel::{lift_factors, multiply_integer, reduce_mod, IntPoly};
use crate::control::Control;
use crate::error::Result;
use crate::field::{integer_scale, primality, PrimeField, RationalField};
use crate::univariate::{degree, derivative, gcd, squarefree_part, Univariate};
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};

/// Good primes whose degree patterns are intersected before lifting (common practice: a handful).
const PATTERN_PRIMES: usize = 6;

/// Whether f ∈ QQ[x] is irreducible (degree ≥ 1, no factorization into two factors of positive
/// degree). Constants are not irreducible.
pub fn is_irreducible(f: &Univariate<RationalField>, control: &Control) -> Result<bool> {
    let n = match degree::<RationalField>(f) {
        None | Some(0) => return Ok(false),
        Some(1) => return Ok(true),
        Some(n) => n,
    };
    if degree::<RationalField>(&squarefree_part(&RationalField, f)) != Some(n) {
        return Ok(false);
    }
    Ok(true_factor(&primitive_integer(f), control)?.is_none())
}

/// The monic irreducible factors over QQ of a squarefree f of degree ≥ 1, by splitting off one
/// true factor at a time (each found as in [`is_irreducible`]); sorted by degree, then
/// coefficients.
pub fn irreducible_factors(
    f: &Univariate<RationalField>,
    control: &Control,
) -> Result<Vec<Univariate<RationalField>>> {
    let mut pending = vec![primitive_integer(f)];
    let mut out = Vec::new();
    while let Some(g) = pending.pop() {
        control.check()?;
        match true_factor(&g, control)? {
            Some(h) => {
                let rest = exact_quotient(&g, &h).expect("a true factor divides");
                pending.push(positive(h));
                pending.push(positive(rest));
            }
            None => out.push(monic_rational(&g)),
        }
    }
    out.sort_by(|a, b| a.len().cmp(&b.len()).then_with(|| a.cmp(b)));
    Ok(out)
}

/// g or −g, whichever has a positive leading coefficient (the lifting bound needs lc > 0).
fn positive(g: IntPoly) -> IntPoly {
    if g.last().is_some_and(|c| c.is_negative()) {
        g.into_iter().map(|c| -c).collect()
    } else {
        g
    }
}

fn monic_rational(g: &IntPoly) -> Univariate<RationalField> {
    let lc = g.last().expect("nonzero").clone();
    g.iter()
        .map(|c| BigRational::new(c.clone(), lc.clone()))
        .collect()
}

/// A factor of the primitive squarefree integer polynomial f of degree between 1 and deg f − 1,
/// primitive; `None` when f is irreducible (steps 2 and 3 of the module doc).
fn true_factor(f: &IntPoly, control: &Control) -> Result<Option<IntPoly>> {
    let n = f.len() - 1;
    if n <= 1 {
        return Ok(None);
    }
    let mut allowed = vec![true; n + 1];
    let mut best: Option<(u64, Vec<Vec<u64>>)> = None;
    for p in good_primes(f).take(PATTERN_PRIMES) {
        control.check()?;
        let field = PrimeField::new(p)?;
        let factors = factor_squarefree(&field, &reduce_mod(f, p), control)?;
        let sums = subset_sums(&factors, n);
        for (d, ok) in allowed.iter_mut().enumerate() {
            *ok &= sums[d];
        }
        if !(1..n).any(|d| allowed[d]) {
            return Ok(None);
        }
        if best.as_ref().is_none_or(|(_, b)| factors.len() < b.len()) {
            best = Some((p, factors));
        }
    }
    let (p, factors) = best.expect("at least one good prime");
    find_true_factor(f, p, &factors, &allowed, control)
}

/// The primitive integer polynomial with positive leading coefficient proportional to f.
fn primitive_integer(f: &Univariate<RationalField>) -> IntPoly {
    let scale = integer_scale(&f.iter().collect::<Vec<_>>());
    let sign = if f.last().expect("nonzero").is_negative() {
        -BigInt::one()
    } else {
        BigInt::one()
    };
    f.iter()
        .map(|c| (c * &scale).to_integer() * &sign)
        .collect()
}

/// Primes p ≥ 3 with p ∤ lc(f) and f mod p squarefree, increasing. For squarefree f only
/// finitely many primes fail (those dividing lc(f) or the discriminant), so this never ends.
pub(crate) fn good_primes(f: &[BigInt]) -> impl Iterator<Item = u64> + '_ {
    (3u64..)
        .filter(|&p| primality::is_prime(p))
        .filter(move |&p| {
            let image = reduce_mod(f, p);
            if image.len() != f.len() {
                return false;
            }
            let field = PrimeField::new(p).expect("prime");
            degree::<PrimeField>(&gcd(&field, &image, &derivative(&field, &image))) == Some(0)
        })
}

/// sums[d]: whether some sub-multiset of the factors' degrees adds up to d.
fn subset_sums(factors: &[Vec<u64>], n: usize) -> Vec<bool> {
    let mut sums = vec![false; n + 1];
    sums[0] = true;
    for g in factors {
        let d = g.len() - 1;
        for total in (d..=n).rev() {
            sums[total] |= sums[total - d];
        }
    }
    sums
}

/// Zassenhaus's recombination: some product of at most half the lifted factors, with an allowed
/// degree, that gives a factor of f over ZZ (that factor), or `None`.
fn find_true_factor(
    f: &IntPoly,
    p: u64,
    factors: &[Vec<u64>],
    allowed: &[bool],
    control: &Control,
) -> Result<Option<IntPoly>> {
    let lc = f.last().expect("nonzero").clone();
    let norm = f.iter().map(|c| c * c).sum::<BigInt>().sqrt() + 1;
    let bound = &lc * (BigInt::one() << (f.len() - 1)) * norm;
    let (mut k, mut modulus) = (1u32, BigInt::from(p));
    while modulus <= &bound * 2 {
        k += 1;
        modulus *= p;
    }
    let lifted = lift_factors(f, factors, p, k, control)?;
    let r = lifted.len();
    for size in 1..=r / 2 {
        let mut subset: Vec<usize> = (0..size).collect();
        loop {
            control.check()?;
            let d: usize = subset.iter().map(|&i| lifted[i].len() - 1).sum();
            if allowed[d] {
                let product = subset.iter().fold(vec![lc.clone()], |acc, &i| {
                    multiply_integer(&acc, &lifted[i])
                });
                let candidate = primitive_part(symmetric(product, &modulus));
                if exact_quotient(f, &candidate).is_some() {
                    return Ok(Some(candidate));
                }
            }
            if !next_subset(&mut subset, r) {
                break;
            }
        }
    }
    Ok(None)
}

/// The next size-k subset of 0..r in lexicographic order; false after the last.
fn next_subset(subset: &mut [usize], r: usize) -> bool {
    let k = subset.len();
    let Some(i) = (0..k).rev().find(|&i| subset[i] < r - k + i) else {
        return false;
    };
    subset[i] += 1;
    for j in i + 1..k {
        subset[j] = subset[j - 1] + 1;
    }
    true
}

/// Coefficients reduced into (−M/2, M/2].
fn symmetric(g: IntPoly, modulus: &BigInt) -> IntPoly {
    let half = modulus / 2;
    g.into_iter()
        .map(|c| {
            let c = c.mod_floor(modulus);
            if c > half {
                c - modulus
            } else {
                c
            }
        })
        .collect()
}

fn primitive_part(g: IntPoly) -> IntPoly {
    let content = g.iter().fold(BigInt::zero(), |acc, c| acc.gcd(c));
    if content.is_zero() {
        return g;
    }
    g.into_iter().map(|c| c / &content).collect()
}

/// f / g when the primitive g (degree ≥ 1) divides f in ZZ[x] (by Gauss's lemma, the same as
/// in QQ[x]): long division where every quotient coefficient must be an integer.
fn exact_quotient(f: &IntPoly, g: &IntPoly) -> Option<IntPoly> {
    let dg = g.len() - 1;
    if dg == 0 || g.len() > f.len() {
        return None;
    }
    if !f[0].is_zero() && (g[0].is_zero() || !f[0].is_multiple_of(&g[0])) {
        return None;
    }
    let mut rest = f.clone();
    let mut quotient = vec![BigInt::zero(); f.len() - dg];
    for top in (dg..rest.len()).rev() {
        let (q, r) = rest[top].div_rem(&g[dg]);
        if !r.is_zero() {
            return None;
        }
        if q.is_zero() {
            continue;
        }
        for (i, c) in g.iter().enumerate() {
            rest[top - dg + i] -= &q * c;
        }
        quotient[top - dg] = q;
    }
    rest.iter().all(|c| c.is_zero()).then_some(quotient)
}

#[cfg(test)]
mod tests {
    use super::*;
    use num_rational::BigRational;

    fn poly(coeffs: &[i64]) -> Univariate<RationalField> {
        coeffs
            .iter()
            .map(|&c| BigRational::from_integer(c.into()))
            .collect()
    }

    fn irreducible(coeffs: &[i64]) -> bool {
        is_irreducible(&poly(coeffs), &Control::new()).unwrap()
    }

    #[test]
    fn classical_irreducible_and_reducible_polynomials() {
        // x^2 + 1, x^3 - 2 (Eisenstein at 2), x^4 + x^3 + x^2 + x + 1 (the 5th cyclotomic
        // polynomial) are irreducible; x^4 + 4 = (x^2 + 2x + 2)(x^2 - 2x + 2) (Sophie Germain)
        // and x^2 - 1, (x^2 + 1)^2 are not.
        assert!(irreducible(&[1, 0, 1]));
        assert!(irreducible(&[-2, 0, 0, 1]));
        assert!(irreducible(&[1, 1, 1, 1, 1]));
        assert!(!irreducible(&[4, 0, 0, 0, 1]));
        assert!(!irreducible(&[-1, 0, 1]));
        assert!(!irreducible(&[1, 0, 2, 0, 1]));
        // Non-monic, with a rational root 2/3: 3x^2 - 5x + 2 = (3x - 2)(x - 1); 6x^2 + 1 has none.
        assert!(!irreducible(&[2, -5, 3]));
        assert!(irreducible(&[1, 0, 6]));
        assert!(!irreducible(&[7]) && irreducible(&[3, 5]));
    }

    #[test]
    fn swinnerton_dyer_polynomials_are_irreducible() {
        // The minimal polynomials of √2 + √3 and √2 + √3 + √5 (Swinnerton-Dyer polynomials):
        // irreducible over QQ, yet reducible modulo every prime, so degree patterns never
        // decide them and the lifting must (a classical example, e.g. von zur Gathen–Gerhard).
        assert!(irreducible(&[1, 0, -10, 0, 1]));
        let s3 = [576, 0, -960, 0, 352, 0, -40, 0, 1];
        assert!(irreducible(&s3));
        // Its square-free product with a linear factor is reducible.
        let times_x_minus_1: Vec<i64> = (0..10)
            .map(|i| if i == 0 { 0 } else { s3[i - 1] } - if i < 9 { s3[i] } else { 0 })
            .collect();
        assert!(!irreducible(&times_x_minus_1));
    }

    #[test]
    fn irreducible_factors_multiply_back() {
        // x^4 + 4 = (x^2 − 2x + 2)(x^2 + 2x + 2) (Sophie Germain's identity); times the
        // Swinnerton-Dyer polynomial of √2 + √3 and 3x − 2 (irreducible, see above).
        let sophie = poly(&[4, 0, 0, 0, 1]);
        let sd = poly(&[1, 0, -10, 0, 1]);
        let linear = poly(&[-2, 3]);
        let f = crate::univariate::multiply(
            &RationalField,
            &crate::univariate::multiply(&RationalField, &sophie, &sd),
            &linear,
        );
        let factors = irreducible_factors(&f, &Control::new()).unwrap();
        let monic = |c: &[i64]| crate::univariate::monic(&RationalField, &poly(c));
        assert_eq!(
            factors,
            vec![
                monic(&[-2, 3]),
                monic(&[2, -2, 1]),
                monic(&[2, 2, 1]),
                monic(&[1, 0, -10, 0, 1]),
            ]
        );
    }
}
