//! Gröbner bases over QQ by the multi-modular method (Arnold 2003, "Modular algorithms for
//! computing Gröbner bases"; Idrees, Pfister and Steidel 2011): reduced bases modulo several
//! word-size primes, Chinese remaindering of their coefficients, rational reconstruction
//! (Wang 1981), and a final check over QQ.
//!
//! - Bad primes (dividing a leading coefficient of an input generator, after clearing
//!   denominators) are skipped.
//! - Unlucky primes are detected by disagreement of leading monomials: the images are grouped
//!   by their lists of leading monomials and the largest group is lifted.
//! - A lift is accepted when its reconstruction is stable under one more prime and it passes
//!   the verification: (a) every S-polynomial left by the Gebauer–Möller criteria reduces to 0
//!   (so the lift G is a Gröbner basis of the ideal it generates), and (b) every input generator
//!   reduces to 0 (so the input ideal I lies in ⟨G⟩). With (a), (b) and in(⟨G⟩) = in(I) the
//!   two ideals are equal. in(⟨G⟩) equals the leading ideal of the images of the group, which
//!   is in(I) as soon as one prime of the group is lucky; primes are unlucky only if they divide
//!   a fixed nonzero integer depending on I, so this can only fail if every prime of the group
//!   does. For homogeneous I the equality is proved outright: I ⊆ ⟨G⟩ and the Hilbert function
//!   of I mod p is at most that of I (Arnold 2003, Thm 5.13).

use super::{groebner_basis, BasisOver, Engine, ReducedBasis, Stats};
use crate::control::Control;
use crate::error::Result;
use crate::field::{integer_scale, primality, Field, PrimeField, RationalField};
use crate::monomial::Monomial;
use crate::poly::{Poly, PolyOver, Ring, RingOver};
use num_bigint::{BigInt, Sign};
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use rayon::prelude::*;
use std::collections::{BTreeMap, HashMap};

/// Routes `groebner_basis` over QQ to the multi-modular method; `None` for other fields.
pub(crate) fn route_rationals<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    engine: Engine,
    control: &Control,
) -> Option<Result<ReducedBasis<F>>> {
    let ring_q = F::as_rationals::<RingOver>(ring)?;
    let gens_q: Vec<Poly<RationalField>> = gens
        .iter()
        .map(|g| F::as_rationals::<PolyOver>(g).cloned())
        .collect::<Option<_>>()?;
    let result = rational_groebner_basis(ring_q, &gens_q, engine, control)
        .map(|gb| F::from_rationals::<BasisOver>(gb).expect("F is QQ"));
    Some(result)
}

/// The reduced Gröbner basis of `gens` over QQ, by the multi-modular method.
pub fn rational_groebner_basis(
    ring: &Ring<RationalField>,
    gens: &[Poly<RationalField>],
    engine: Engine,
    control: &Control,
) -> Result<ReducedBasis<RationalField>> {
    let gens: Vec<Poly<RationalField>> = gens
        .iter()
        .filter(|g| !g.is_zero())
        .map(|g| integer_multiple(ring, g))
        .collect();
    let start = std::time::Instant::now();
    let mut groups: HashMap<Vec<Monomial>, Lift> = HashMap::new();
    let mut primes = PrimeSequence::new();
    // Images are computed a batch at a time, one prime per worker thread.
    let batch = control
        .limits
        .threads
        .unwrap_or_else(rayon::current_num_threads)
        .max(1);
    loop {
        control.check()?;
        let batch_primes: Vec<u64> = (0..batch).map(|_| primes.next_good(&gens)).collect();
        let images: Vec<(Vec<Poly<PrimeField>>, Stats)> = batch_primes
            .par_iter()
            .map(|&p| modular_image(ring, &gens, p, engine, control))
            .collect::<Result<_>>()?;
        for (&p, (image, mut stats)) in batch_primes.iter().zip(images) {
            let leads: Vec<Monomial> = image
                .iter()
                .map(|g| g.leading_monomial().unwrap().clone())
                .collect();
            groups
                .entry(leads.clone())
                .or_default()
                .add_image(p, &image);
            let count = groups[&leads].primes;
            if groups.values().any(|other| other.primes > count) {
                continue; // a larger group outvotes this one: this prime is likely unlucky
            }
            let lift = groups.get_mut(&leads).unwrap();
            let Some(candidate) = lift.reconstruct(ring) else {
                continue;
            };
            let stable = lift.previous.as_ref() == Some(&candidate);
            lift.previous = Some(candidate.clone());
            if stable && verify::is_groebner_basis_containing(ring, &candidate, &gens, control)? {
                stats.engine = format!("{} (multi-modular, {} primes)", engine.name(), primes.used);
                stats.seconds = start.elapsed().as_secs_f64();
                return Ok(ReducedBasis {
                    ring: ring.clone(),
                    polys: candidate,
                    stats,
                });
            }
        }
    }
}

/// A nonzero rational multiple of f with coprime integer coefficients.
fn integer_multiple(ring: &Ring<RationalField>, f: &Poly<RationalField>) -> Poly<RationalField> {
    let coeffs: Vec<&BigRational> = f.terms().iter().map(|t| &t.1).collect();
    ring.scale(f, &integer_scale(&coeffs))
}

/// Word-size primes downward from 2^62, skipping bad ones.
struct PrimeSequence {
    next: u64,
    used: usize,
}

impl PrimeSequence {
    fn new() -> Self {
        PrimeSequence {
            next: 1 << 62,
            used: 0,
        }
    }

    /// The next prime that divides no leading coefficient of the (integer) generators.
    fn next_good(&mut self, gens: &[Poly<RationalField>]) -> u64 {
        loop {
            self.next -= 1;
            let p = self.next;
            if !primality::is_prime(p) {
                continue;
            }
            let bad = gens
                .iter()
                .any(|g| residue(g.leading_coefficient().unwrap().numer(), p) == 0);
            if !bad {
                self.used += 1;
                return p;
            }
        }
    }
}

fn residue(x: &BigInt, p: u64) -> u64 {
    x.mod_floor(&BigInt::from(p)).to_u64().unwrap()
}

/// The reduced basis of the generators' images in GF(p)[x] (integer coefficients mod p).
fn modular_image(
    ring: &Ring<RationalField>,
    gens: &[Poly<RationalField>],
    p: u64,
    engine: Engine,
    control: &Control,
) -> Result<(Vec<Poly<PrimeField>>, Stats)> {
    let ring_p = Ring::new(
        PrimeField::new(p)?,
        ring.names().to_vec(),
        ring.order.clone(),
    )?;
    let images: Vec<Poly<PrimeField>> = gens
        .iter()
        .map(|g| {
            ring_p.from_terms(
                g.terms()
                    .iter()
                    .map(|(m, c)| (m.clone(), residue(c.numer(), p))),
            )
        })
        .collect();
    let gb = groebner_basis(&ring_p, &images, engine, control)?;
    Ok((gb.polys, gb.stats))
}

/// The Chinese-remainder lift of the images of one group (same leading monomials): per basis
/// element, each monomial's coefficient modulo the product of the group's primes.
#[derive(Default)]
struct Lift {
    primes: usize,
    modulus: BigInt,
    coeffs: Vec<BTreeMap<Monomial, BigInt>>,
    previous: Option<Vec<Poly<RationalField>>>,
}

impl Lift {
    /// Combines x ≡ r (mod M) with x ≡ s (mod p) for every coefficient (missing = 0).
    fn add_image(&mut self, p: u64, image: &[Poly<PrimeField>]) {
        let pb = BigInt::from(p);
        if self.primes == 0 {
            self.modulus = pb;
            self.coeffs = image
                .iter()
                .map(|g| {
                    g.terms()
                        .iter()
                        .map(|(m, c)| (m.clone(), BigInt::from(*c)))
                        .collect()
                })
                .collect();
            self.primes = 1;
            return;
        }
        let field = PrimeField::new(p).expect("prime");
        let m_inv = field
            .inv(&residue(&self.modulus, p))
            .expect("distinct primes");
        for (old, new) in self.coeffs.iter_mut().zip(image) {
            let new_terms: BTreeMap<&Monomial, u64> =
                new.terms().iter().map(|(m, c)| (m, *c)).collect();
            for m in new_terms.keys() {
                old.entry((*m).clone()).or_insert_with(BigInt::zero);
            }
            for (m, r) in old.iter_mut() {
                let s = new_terms.get(m).copied().unwrap_or(0);
                let diff = field.sub(&s, &residue(r, p));
                let t = field.mul(&diff, &m_inv);
                *r += &self.modulus * BigInt::from(t);
            }
        }
        self.modulus *= pb;
        self.primes += 1;
    }

    /// Rational reconstruction of every coefficient; `None` if one has no small preimage yet.
    fn reconstruct(&self, ring: &Ring<RationalField>) -> Option<Vec<Poly<RationalField>>> {
        let mut out = Vec::with_capacity(self.coeffs.len());
        for g in &self.coeffs {
            let mut terms = Vec::with_capacity(g.len());
            for (m, r) in g {
                if !r.is_zero() {
                    terms.push((m.clone(), rational_reconstruction(r, &self.modulus)?));
                }
            }
            out.push(ring.from_terms(terms));
        }
        Some(out)
    }
}

/// The fraction a/b with |a|, b ≤ sqrt(M/2), gcd(a, b) = 1 and a ≡ u·b (mod M), if any
/// (Wang 1981; the bound makes it unique): the extended Euclidean algorithm on (M, u) stopped
/// at the first remainder below the bound.
pub fn rational_reconstruction(u: &BigInt, modulus: &BigInt) -> Option<BigRational> {
    let bound = (modulus / 2u32).sqrt();
    let (mut r0, mut r1) = (modulus.clone(), u.mod_floor(modulus));
    let (mut t0, mut t1) = (BigInt::zero(), BigInt::one());
    while r1 > bound {
        let q = &r0 / &r1;
        let r2 = &r0 - &q * &r1;
        let t2 = &t0 - &q * &t1;
        (r0, r1, t0, t1) = (r1, r2, t1, t2);
    }
    if t1.is_zero() || t1.abs() > bound || !r1.gcd(&t1).is_one() {
        return None;
    }
    let (num, den) = if t1.sign() == Sign::Minus {
        (-r1, -t1)
    } else {
        (r1, t1)
    };
    Some(BigRational::new(num, den))
}

mod identities;
pub mod integer_gcd;
mod verify;

#[cfg(test)]
mod tests;
