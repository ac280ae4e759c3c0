//! Dense univariate polynomials over any [`Field`]: the one polynomial type of the core for
//! polynomials in one variable (the defining polynomials of extension fields, minimal
//! polynomials in quotient rings, eliminants of zero-dimensional systems).
//!
//! A polynomial is a [`Univariate`]: a vector of coefficients, the coefficient of x^i at index i, with no
//! trailing zeros (zero is the empty vector). The arithmetic is split by algorithm:
//! - [`multiply`]: schoolbook and Karatsuba products (Karatsuba and Ofman 1962) over every
//!   field, number-theoretic transforms over word primes (Pollard 1971; Schönhage and Strassen
//!   1971) with the Chinese remainder theorem ([`ntt`], and [`ntt_wide`] for primes beyond a
//!   machine word);
//! - [`division`]: division with remainder, by Newton iteration on the reversed divisor for large
//!   degrees (Sieveking 1972, Kung 1974), and arithmetic modulo a fixed polynomial, with
//!   [`transform_reduction`] keeping the transforms of the modulus ([`cyclic`] products);
//! - [`gcd`]: greatest common divisors and Bézout cofactors, by [`half_gcd`] steps (Thull and
//!   Yap 1990) for large degrees;
//! - [`squarefree`], [`distinct_degree`], [`equal_degree`], [`roots`]: factorization over finite
//!   fields (Cantor and Zassenhaus 1981; von zur Gathen and Shoup 1992), roots as the factors of
//!   degree 1. The polynomial x^q − x is never written down: x^q is computed modulo the
//!   polynomial by repeated squaring, so q may be as large as 2^512 or a power p^k;
//! - [`all_values`]: the values at every element of a small field by a transform over its
//!   multiplicative group, the faster route to the roots when q is close to the degree.

pub mod all_values;
pub mod cyclic;
pub mod distinct_degree;
pub mod division;
pub mod equal_degree;
pub mod gcd;
pub mod half_gcd;
pub mod multiply;
pub mod ntt;
pub mod ntt_wide;
pub mod roots;
pub mod squarefree;
pub mod transform_reduction;

pub use distinct_degree::distinct_degree_factorization;
pub use division::{divide, power_mod, remainder, Modulo};
pub use equal_degree::equal_degree_factorization;
pub use gcd::{bezout, gcd};
pub use multiply::{multiply, square};
pub use roots::{factor, roots};
pub use squarefree::{squarefree_factorization, squarefree_part};

use crate::field::Field;
use crate::rng::Rng;

/// Coefficients c_0, c_1, ..., c_d of Σ c_i x^i with c_d ≠ 0; zero is the empty vector.
pub type Univariate<F> = Vec<<F as Field>::Elem>;

/// Removes trailing zero coefficients.
pub fn trim<F: Field>(field: &F, p: &mut Univariate<F>) {
    while p.last().is_some_and(|c| field.is_zero(c)) {
        p.pop();
    }
}

/// `p` without trailing zeros.
pub fn trimmed<F: Field>(field: &F, mut p: Univariate<F>) -> Univariate<F> {
    trim(field, &mut p);
    p
}

/// Degree; `None` for zero.
pub fn degree<F: Field>(p: &[F::Elem]) -> Option<usize> {
    p.len().checked_sub(1)
}

/// Whether p is a nonzero constant.
pub fn is_constant<F: Field>(p: &[F::Elem]) -> bool {
    p.len() == 1
}

/// The constant polynomial c.
pub fn constant<F: Field>(field: &F, c: F::Elem) -> Univariate<F> {
    trimmed(field, vec![c])
}

/// x^e.
pub fn monomial<F: Field>(field: &F, e: usize) -> Univariate<F> {
    let mut p = vec![field.zero(); e + 1];
    p[e] = field.one();
    p
}

/// x − a.
pub fn linear<F: Field>(field: &F, a: &F::Elem) -> Univariate<F> {
    vec![field.neg(a), field.one()]
}

/// p divided by its leading coefficient (zero stays zero).
pub fn monic<F: Field>(field: &F, p: &[F::Elem]) -> Univariate<F> {
    match p.last() {
        Some(lc) if field.is_one(lc) => p.to_vec(),
        Some(lc) => scale(
            field,
            p,
            &field.inv(lc).expect("nonzero leading coefficient"),
        ),
        None => vec![],
    }
}

/// c·p.
pub fn scale<F: Field>(field: &F, p: &[F::Elem], c: &F::Elem) -> Univariate<F> {
    trimmed(field, p.iter().map(|x| field.mul(x, c)).collect())
}

/// a + b.
pub fn add<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    combine(field, a, b, |x, y| field.add(x, y), |x| x.clone())
}

/// a − b.
pub fn subtract<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    combine(field, a, b, |x, y| field.sub(x, y), |y| field.neg(y))
}

/// Coefficientwise op(a_i, b_i), with `only_b` where a has no coefficient.
fn combine<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    op: impl Fn(&F::Elem, &F::Elem) -> F::Elem,
    only_b: impl Fn(&F::Elem) -> F::Elem,
) -> Univariate<F> {
    let out = (0..a.len().max(b.len()))
        .map(|i| match (a.get(i), b.get(i)) {
            (Some(x), Some(y)) => op(x, y),
            (Some(x), None) => x.clone(),
            (None, Some(y)) => only_b(y),
            (None, None) => unreachable!("index below the longer length"),
        })
        .collect();
    trimmed(field, out)
}

pub fn derivative<F: Field>(field: &F, p: &[F::Elem]) -> Univariate<F> {
    trimmed(
        field,
        p.iter()
            .enumerate()
            .skip(1)
            .map(|(i, c)| field.mul(c, &field.from_i64(i as i64)))
            .collect(),
    )
}

/// p(a), by Horner's rule.
pub fn evaluate<F: Field>(field: &F, p: &[F::Elem], a: &F::Elem) -> F::Elem {
    p.iter()
        .rev()
        .fold(field.zero(), |acc, c| field.add(&field.mul(&acc, a), c))
}

/// The polynomial with the given roots: ∏ (x − r).
pub fn from_roots<F: Field>(field: &F, roots: &[F::Elem]) -> Univariate<F> {
    match roots.len() {
        0 => vec![field.one()],
        1 => linear(field, &roots[0]),
        n => multiply(
            field,
            &from_roots(field, &roots[..n / 2]),
            &from_roots(field, &roots[n / 2..]),
        ),
    }
}

/// Polynomial text in `name`, highest degree first (`a^3 + 2*a + 1`, `0`), coefficients in the
/// field's own notation (parenthesized when they are sums).
pub fn format<F: Field>(field: &F, p: &[F::Elem], name: &str) -> String {
    format_terms(
        p.iter()
            .enumerate()
            .rev()
            .filter(|(_, c)| !field.is_zero(c))
            .map(|(i, c)| (i, field.format(c))),
        name,
    )
}

/// Polynomial text from (exponent, coefficient text) pairs, highest exponent first, zero
/// coefficients left out; coefficient "1" is omitted before a power of `name`.
pub fn format_terms(terms: impl Iterator<Item = (usize, String)>, name: &str) -> String {
    let parts: Vec<String> = terms
        .map(|(i, text)| {
            let power = match i {
                0 => return text,
                1 => name.to_string(),
                _ => format!("{name}^{i}"),
            };
            match text.as_str() {
                "1" => power,
                t if t.contains(' ') => format!("({t})*{power}"),
                t => format!("{t}*{power}"),
            }
        })
        .collect();
    if parts.is_empty() {
        "0".into()
    } else {
        parts.join(" + ")
    }
}

/// A uniformly random element of the whole field (see [`Field::random`]).
pub fn random_element<F: Field>(field: &F, rng: &mut Rng) -> F::Elem {
    field.random(rng)
}

#[cfg(test)]
pub(crate) mod tests;
