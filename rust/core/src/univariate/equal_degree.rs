//! Equal-degree factorization over GF(q) (Cantor and Zassenhaus 1981): a monic squarefree f
//! whose irreducible factors all have degree d is split by gcd(h, f) for a random element h of
//! GF(q)[x]/(f) mapped into the subset where the components are 0 or 1 in half of the factors:
//! - q odd: h = r^((q^d − 1)/2) − 1, which is 0 in a factor exactly when r is a nonzero
//!   square there; each of two given factors falls on either side with probability about 1/2,
//!   independently (for d = 1, r = x + a with a random a, which splits two roots with
//!   probability (q − 1)/(2q));
//! - q = 2^k: h = Tr(r) = r + r^2 + r^4 + ... + r^(2^(kd − 1)), the trace to GF(2) of every
//!   component (von zur Gathen and Shoup 1992), which is 0 or 1 with probability 1/2 each.
//!
//! Failed draws are retried, so the result is always the complete factorization; only the
//! running time is random, with a seeded generator so that runs repeat.

use super::{
    degree, divide, gcd::gcd_checked, linear, monic, random_element, subtract, Modulo, Univariate,
};
use crate::control::Control;
use crate::error::Result;
use crate::field::field_order_limbs;
use crate::field::Field;
use crate::rng::Rng;
use num_bigint::BigUint;

/// The monic irreducible factors of f, a monic squarefree product of irreducible polynomials of
/// degree d each.
pub fn equal_degree_factorization<F: Field>(
    field: &F,
    f: &[F::Elem],
    d: usize,
    rng: &mut Rng,
    control: &Control,
) -> Result<Vec<Univariate<F>>> {
    let q = BigUint::from_slice(
        &field_order_limbs(field, "equal-degree factorization")?
            .iter()
            .flat_map(|&l| [l as u32, (l >> 32) as u32])
            .collect::<Vec<u32>>(),
    );
    let splitter = Splitter::new(q, d);
    let mut done = Vec::new();
    let mut pending = vec![monic(field, f)];
    while let Some(g) = pending.pop() {
        control.check()?;
        let n = degree::<F>(&g).unwrap_or(0);
        if n <= d {
            if n > 0 {
                done.push(g);
            }
            continue;
        }
        let part = splitter.try_split(field, &g, rng, control)?;
        let n_part = degree::<F>(&part).unwrap_or(0);
        if n_part > 0 && n_part < n {
            let other = divide(field, &g, &part).0;
            pending.push(part);
            pending.push(other);
        } else {
            pending.push(g);
        }
    }
    Ok(done)
}

/// The random splitting step for factors of degree d over GF(q).
struct Splitter {
    /// q = 2^k: Some(k·d), the number of terms of the trace; odd q: None.
    trace_terms: Option<u64>,
    /// (q^d − 1)/2 as limbs, for odd q.
    half_exponent: Vec<u64>,
    d: usize,
}

impl Splitter {
    fn new(q: BigUint, d: usize) -> Self {
        let is_power_of_two = q.count_ones() == 1;
        let qd = q.pow(d as u32);
        if is_power_of_two {
            Splitter {
                trace_terms: Some(qd.bits() - 1),
                half_exponent: vec![],
                d,
            }
        } else {
            let half: BigUint = (qd - 1u32) >> 1;
            Splitter {
                trace_terms: None,
                half_exponent: half.to_u64_digits(),
                d,
            }
        }
    }

    /// gcd(h, g) for one random h as in the module doc (may be 1 or g: then retry).
    fn try_split<F: Field>(
        &self,
        field: &F,
        g: &[F::Elem],
        rng: &mut Rng,
        control: &Control,
    ) -> Result<Univariate<F>> {
        let modulo = Modulo::new(field, g);
        let r = self.random_element_mod(field, g, rng);
        let h = match self.trace_terms {
            Some(terms) => {
                let mut power = r.clone();
                let mut sum = r;
                for _ in 1..terms {
                    control.check()?;
                    power = modulo.square(&power);
                    sum = super::add(field, &sum, &power);
                }
                sum
            }
            None => {
                let s = modulo.power(&r, &self.half_exponent, control)?;
                subtract(field, &s, &[field.one()])
            }
        };
        gcd_checked(field, &h, g, control)
    }

    /// x + a for factors of degree 1 (cheap and enough), else a random polynomial of degree
    /// below deg g.
    fn random_element_mod<F: Field>(
        &self,
        field: &F,
        g: &[F::Elem],
        rng: &mut Rng,
    ) -> Univariate<F> {
        if self.d == 1 && self.trace_terms.is_none() {
            return linear(field, &random_element(field, rng));
        }
        let r: Univariate<F> = (0..g.len() - 1)
            .map(|_| random_element(field, rng))
            .collect();
        let r = super::trimmed(field, r);
        if r.is_empty() {
            linear(field, &field.one())
        } else {
            r
        }
    }
}
