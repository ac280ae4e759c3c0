//! The check of a lifted basis over QQ by one matrix and identities proved modulo primes.
//!
//! G (monic, reduced, rational) is a Gröbner basis containing the inputs iff every S-polynomial
//! left by the Gebauer–Möller criteria and every input reduces to zero by G (Buchberger 1965).
//! All of them are put in one F4 matrix (Faugère 1999): both halves of each S-polynomial and
//! each input as rows, reducers from symbolic preprocessing. A row reduces to zero iff it is a
//! combination Σ c_k·pivot_k of the pivots (known rows of distinct leading columns). Over GF(p)
//! the reduction finds the c_k mod p; G is monic, so reducing never divides, and for p dividing
//! no denominator of G a row that reduces to zero over QQ does so mod p too: a row that does not
//! reduce to zero mod p proves G wrong.
//!
//! From enough primes the c_k are lifted by Chinese remaindering and rational reconstruction
//! with one denominator per row (Wang 1981 for the first entries, a multiplication for the
//! others), and each identity row = Σ c_k·pivot_k is then *proved*: times the common
//! denominator Λ it is an identity of integer polynomials, true modulo every prime used (the
//! lifted c_k are ≡ the modular ones), whose coefficients are bounded by
//! Λ·(|row| + Σ |c_k|·|pivot_k|); once the product M of the primes exceeds twice that bound,
//! both sides are equal. Every coefficient operation on the way is on machine words, except one
//! reconstruction per row entry: no big-integer reduction at all.

use super::super::f4::arith::LargePrime;
use super::super::f4::hash::MonomialTable;
use super::super::f4::linalg::combinations;
use super::super::f4::symbolic::{self, Element, Multiple, SymbolicMatrix};
use super::super::f4::{divisors_of, pair_rows};
use super::super::pairs::PairSet;
use super::rational_reconstruction;
use crate::control::Control;
use crate::error::Result;
use crate::field::{primality, Field, PrimeField, RationalField};
use crate::monomial::Monomial;
use crate::poly::{Poly, Ring};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};
use rayon::prelude::*;
use std::collections::BTreeMap;
use std::sync::Arc;

/// Primes tried before giving up (the caller then checks by exact reduction).
const MAX_PRIMES: usize = 96;

/// Whether `basis` (the reduced basis candidate, monic) is a Gröbner basis containing every
/// generator; `None` when the identities could not be proved within the prime budget.
pub fn check(
    ring: &Ring<RationalField>,
    basis: &[Poly<RationalField>],
    gens: &[Poly<RationalField>],
    control: &Control,
) -> Result<Option<bool>> {
    let mut polys: Vec<Poly<RationalField>> = basis.to_vec();
    polys.extend(gens.iter().filter(|g| !g.is_zero()).map(|g| ring.monic(g)));
    let layout = Layout::new(ring, basis.len(), &polys, control)?;
    let mut residues: Vec<Vec<Sparse>> = Vec::new();
    let mut primes: Vec<u64> = Vec::new();
    let mut next = 1u64 << 61;
    // Attempts at 4, 6, 9, 13, ... primes: a failed attempt stops at its first unproved row.
    let mut attempt_at = 4;
    while primes.len() < MAX_PRIMES {
        control.check()?;
        next = next_prime_below(next);
        let p = next;
        if layout.denominators.iter().any(|d| residue(d, p) == 0) {
            continue;
        }
        let Some(rows) = layout.combinations_mod(p, control)? else {
            return Ok(Some(false));
        };
        primes.push(p);
        residues.push(rows);
        if primes.len() == attempt_at {
            if layout.proved(&primes, &residues, control)? {
                return Ok(Some(true));
            }
            attempt_at += attempt_at / 2;
        }
    }
    Ok(None)
}

/// The verification matrix without its coefficients (elements: the basis first, then the
/// inputs), and the coefficients of the elements as fractions.
struct Layout {
    /// Coefficients of each element as reduced fractions (numerator, denominator).
    coefficients: Vec<Vec<(BigInt, BigInt)>>,
    /// Every denominator that occurs (a prime must divide none).
    denominators: Vec<BigInt>,
    /// log2 of an upper bound on the largest |coefficient| of each element.
    height: Vec<f64>,
    /// Bits of the least common multiple of all denominators, bounded above.
    common_denominator_bits: f64,
    matrix: SymbolicMatrix<u64>,
    new_rows: Vec<Multiple>,
}

/// The multipliers of one row modulo one prime: (reducer index, multiplier), nonzero ones only.
type Sparse = Vec<(u32, u64)>;

impl Layout {
    fn new(
        ring: &Ring<RationalField>,
        basis_len: usize,
        polys: &[Poly<RationalField>],
        control: &Control,
    ) -> Result<Layout> {
        let mut table = MonomialTable::new(ring.nvars(), ring.order.clone());
        let elements: Vec<Vec<u32>> = polys
            .iter()
            .map(|f| f.terms().iter().map(|(m, _)| table.insert(m)).collect())
            .collect();
        let coefficients: Vec<Vec<(BigInt, BigInt)>> = polys
            .iter()
            .map(|f| {
                f.terms()
                    .iter()
                    .map(|(_, c)| (c.numer().clone(), c.denom().clone()))
                    .collect()
            })
            .collect();
        let mut denominators: Vec<BigInt> = Vec::new();
        for d in coefficients.iter().flatten().map(|(_, d)| d) {
            if !d.is_one() && !denominators.contains(d) {
                denominators.push(d.clone());
            }
        }
        let lcm = denominators.iter().fold(BigInt::one(), |acc, d| acc.lcm(d));
        let height = coefficients
            .iter()
            .map(|cs| {
                cs.iter()
                    .map(|(n, d)| bits(n) - bits(d) + 1.0)
                    .fold(f64::MIN, f64::max)
            })
            .collect();
        let dummy: Vec<Element<u64>> = elements
            .iter()
            .map(|monos| Element {
                monos: monos.clone(),
                coeffs: vec![0u64; monos.len()].into(),
            })
            .collect();
        let mut pairs = PairSet::default();
        for g in &polys[..basis_len] {
            pairs.insert(g.leading_monomial().unwrap().clone(), 0);
        }
        let selected = std::mem::take(&mut pairs.pairs);
        let (known, mut new) = pair_rows(&mut table, &dummy, &selected);
        let one = table.insert(&Monomial::one(ring.nvars()));
        new.extend((basis_len..polys.len()).map(|element| Multiple { mult: one, element }));
        let all: Vec<usize> = (0..basis_len).collect();
        let divisors = divisors_of(&table, &dummy, &all);
        let matrix = symbolic::preprocess(control, 0, &mut table, &dummy, &divisors, &known, &new)?;
        Ok(Layout {
            coefficients,
            denominators,
            height,
            common_denominator_bits: bits(&lcm),
            matrix,
            new_rows: new,
        })
    }

    /// The multipliers of every row modulo p (`None`: some row does not reduce to zero mod p,
    /// so G is not the basis).
    fn combinations_mod(&self, p: u64, control: &Control) -> Result<Option<Vec<Sparse>>> {
        let field = PrimeField::new(p)?;
        let coeffs: Vec<Arc<[u64]>> = self
            .coefficients
            .iter()
            .map(|cs| {
                cs.iter()
                    .map(|(n, d)| field.mul(&residue(n, p), &field.inv(&residue(d, p)).unwrap()))
                    .collect()
            })
            .collect();
        let matrix = SymbolicMatrix {
            columns: self.matrix.columns.clone(),
            reducers: self
                .matrix
                .reducers
                .iter()
                .zip(&self.matrix.reducer_multiples)
                .map(|(r, m)| symbolic::Row {
                    cols: r.cols.clone(),
                    coeffs: coeffs[m.element].clone(),
                })
                .collect(),
            reducer_multiples: self.matrix.reducer_multiples.clone(),
            new_rows: self
                .matrix
                .new_rows
                .iter()
                .zip(&self.new_rows)
                .map(|(r, m)| symbolic::Row {
                    cols: r.cols.clone(),
                    coeffs: coeffs[m.element].clone(),
                })
                .collect(),
        };
        let arith = LargePrime::new(p);
        let found = combinations::<PrimeField, _>(&arith, &matrix, control)?;
        Ok(found.into_iter().collect())
    }

    /// Whether the identities of every row are proved by the primes so far.
    fn proved(&self, primes: &[u64], residues: &[Vec<Sparse>], control: &Control) -> Result<bool> {
        let crt = Crt::new(primes)?;
        let modulus_bits = bits(&crt.modulus) - 1.0;
        let rows: Vec<usize> = (0..self.new_rows.len()).collect();
        let failed = rows.par_iter().map(|&row| -> Result<bool> {
            control.check()?;
            // Per reducer used at any prime, its multipliers at every prime (0 where unused).
            let mut by_reducer: BTreeMap<u32, Vec<u64>> = BTreeMap::new();
            for (j, at_prime) in residues.iter().enumerate() {
                for &(i, c) in &at_prime[row] {
                    by_reducer.entry(i).or_insert_with(|| vec![0; primes.len()])[j] = c;
                }
            }
            let used: Vec<usize> = by_reducer.keys().map(|&i| i as usize).collect();
            let lifted: Vec<BigInt> = by_reducer.values().map(|rs| crt.lift(rs)).collect();
            let Some((denominator, numerators)) = common_denominator(&lifted, &crt.modulus) else {
                return Ok(true);
            };
            let own = self.height[self.new_rows[row].element];
            let terms = used
                .iter()
                .zip(&numerators)
                .map(|(&i, x)| bits(x) + self.height[self.matrix.reducer_multiples[i].element]);
            let largest = terms.fold(own, f64::max);
            let bound = self.common_denominator_bits
                + bits(&denominator)
                + largest
                + ((used.len() + 1) as f64).log2()
                + 1.0;
            Ok(bound + 1.0 >= modulus_bits)
        });
        match failed.find_any(|r| !matches!(r, Ok(false))) {
            Some(Err(e)) => Err(e),
            Some(Ok(_)) => Ok(false),
            None => Ok(true),
        }
    }
}

/// An upper bound on log2 |x| (0 for x = 0), from its bit length.
fn bits(x: &BigInt) -> f64 {
    x.bits() as f64
}

fn residue(x: &BigInt, p: u64) -> u64 {
    x.mod_floor(&BigInt::from(p)).to_u64().unwrap()
}

fn next_prime_below(mut n: u64) -> u64 {
    loop {
        n -= 1;
        if primality::is_prime(n) {
            return n;
        }
    }
}

/// Chinese remaindering for a fixed list of primes (Garner's mixed-radix form): the residues
/// of a number give its digits in the radix p_0, p_0·p_1, ... on machine words, then the
/// number. The primes are close to each other (within a factor two), which the reductions of
/// one prime's residues modulo another rely on.
struct Crt {
    primes: Vec<u64>,
    fields: Vec<PrimeField>,
    /// p_i mod p_j at [j][i], for i < j.
    cross: Vec<Vec<u64>>,
    /// Inverse of p_0·...·p_{j-1} modulo p_j (1 for j = 0).
    inverses: Vec<u64>,
    modulus: BigInt,
}

impl Crt {
    fn new(primes: &[u64]) -> Result<Self> {
        let fields: Vec<PrimeField> = primes
            .iter()
            .map(|&p| PrimeField::new(p))
            .collect::<Result<_>>()?;
        let cross: Vec<Vec<u64>> = primes
            .iter()
            .enumerate()
            .map(|(j, &p)| primes[..j].iter().map(|&q| q % p).collect())
            .collect();
        let inverses = (0..primes.len())
            .map(|j| {
                let product = cross[j]
                    .iter()
                    .fold(1u64, |acc, &q| fields[j].mul_u64(acc, q));
                fields[j].inv(&product).expect("distinct primes")
            })
            .collect();
        let modulus = primes.iter().fold(BigInt::one(), |m, &p| m * p);
        Ok(Crt {
            primes: primes.to_vec(),
            fields,
            cross,
            inverses,
            modulus,
        })
    }

    /// The number in [0, M) with the given residues (one per prime, in order).
    fn lift(&self, residues: &[u64]) -> BigInt {
        let mut digits: Vec<u64> = Vec::with_capacity(residues.len());
        for (j, &r) in residues.iter().enumerate() {
            let (p, field) = (self.primes[j], &self.fields[j]);
            let below = |x: u64| if x >= p { x - p } else { x };
            // The value of the digits so far modulo p, by Horner from the top digit.
            let mut value = 0u64;
            for i in (0..j).rev() {
                value = below(field.mul_u64(value, self.cross[j][i]) + below(digits[i]));
            }
            let difference = below(r + p - value);
            digits.push(field.mul_u64(difference, self.inverses[j]));
        }
        let mut x = BigInt::zero();
        for i in (0..digits.len()).rev() {
            x = x * self.primes[i] + digits[i];
        }
        x
    }
}

/// One denominator d for all `values` (residues mod M) and the numerators x_i ≡ values_i·d in
/// (−M/2, M/2], so that x_i / d ≡ values_i: d is built from rational reconstructions of the
/// entries that d does not yet make small. `None` when a reconstruction fails or a denominator
/// shares a factor with M (more primes are needed).
fn common_denominator(values: &[BigInt], modulus: &BigInt) -> Option<(BigInt, Vec<BigInt>)> {
    let bound = (modulus / 2u32).sqrt();
    let half = modulus / 2u32;
    let symmetric = |x: BigInt| if x > half { x - modulus } else { x };
    let mut d = BigInt::one();
    for v in values {
        let x = symmetric((v * &d).mod_floor(modulus));
        if x.abs() <= bound {
            continue;
        }
        let fraction = rational_reconstruction(&(v * &d).mod_floor(modulus), modulus)?;
        let b = fraction.denom().clone();
        if !b.gcd(modulus).is_one() {
            return None;
        }
        d *= b;
    }
    let numerators = values
        .iter()
        .map(|v| symmetric((v * &d).mod_floor(modulus)))
        .collect();
    Some((d, numerators))
}
