//! Helpers shared by the unit tests: rings over GF(32003) and polynomials from text.

use crate::field::PrimeField;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::{Poly, Ring};

/// The ring GF(32003)[vars] with the given order (32003: a prime, as common practice in tests).
pub fn ring_32003(vars: &[&str], order: MonomialOrder) -> Ring<PrimeField> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    Ring::new(PrimeField::new(32003).unwrap(), names, order).unwrap()
}

/// GF(32003)[x0..x{n-1}] in grevlex.
pub fn numbered_ring_32003(n: usize) -> Ring<PrimeField> {
    let names: Vec<String> = (0..n).map(|i| format!("x{i}")).collect();
    let refs: Vec<&str> = names.iter().map(String::as_str).collect();
    ring_32003(&refs, MonomialOrder::Grevlex)
}

/// The polynomials of `texts` in `ring`.
pub fn polys(ring: &Ring<PrimeField>, texts: &[&str]) -> Vec<Poly<PrimeField>> {
    texts.iter().map(|t| parse_poly(ring, t).unwrap()).collect()
}

/// A random polynomial of `ring` with up to `terms` terms of degree at most `degree` (a seeded
/// generator: the same polynomials on every run).
pub fn random_poly<F: crate::field::Field>(
    ring: &Ring<F>,
    rng: &mut crate::rng::Rng,
    terms: usize,
    degree: u32,
) -> Poly<F> {
    let n = ring.nvars();
    ring.from_terms((0..terms).map(|_| {
        let mut left = rng.below(u64::from(degree) + 1) as u32;
        let exponents: Vec<u32> = (0..n)
            .map(|_| {
                let e = rng.below(u64::from(left) + 1) as u32;
                left -= e;
                e
            })
            .collect();
        let monomial = crate::monomial::Monomial::from_exponents(exponents).unwrap();
        (
            monomial,
            crate::univariate::random_element(&ring.field, rng),
        )
    }))
}
