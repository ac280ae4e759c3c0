//! Cyclic products, modulo x^N − 1 for a power of two N, of polynomials over the fields with a
//! transform path (word primes, and primes of 2 to 8 Montgomery limbs), with the transforms of a
//! fixed factor computed once: the number-theoretic transforms over word primes of
//! [`super::ntt`] (Pollard 1971; Schönhage and Strassen 1971) and the Chinese remainder step of
//! [`super::ntt`] (Garner 1959) or [`super::ntt_wide`] (explicit form). A product by a factor
//! whose spectra are known costs one forward and one backward transform per transform prime
//! instead of three transforms; only the coefficients asked for are put together.

use super::ntt::{rayon_map, word_transform_primes, Garner, TransformPrime};
use super::ntt_wide::{montgomery_limbs, residues_of, wide_transform_primes, ExplicitCrt};
use crate::field::Field;
use rayon::prelude::*;
use std::ops::Range;

/// Cyclic products of length 2^log_n over one field.
pub struct CyclicProducts<F: Field> {
    field: F,
    log_n: u32,
    primes: &'static [TransformPrime],
    recombination: Recombination,
}

/// The Chinese remainder step of the field's kind.
enum Recombination {
    /// GF(m), m < 2^63: coefficients are their residues.
    Word(Garner<'static>),
    /// GF(P) on Montgomery limbs: coefficients are their Montgomery forms.
    Wide(ExplicitCrt, usize),
}

/// The forward transforms of one polynomial, one per transform prime.
pub struct Spectra(Vec<Vec<u64>>);

impl<F: Field> CyclicProducts<F> {
    /// Products of length 2^log_n of factors of which one has at most `shorter` coefficients
    /// (this bounds the integer coefficients, hence the number of transform primes); `None`
    /// for fields without a transform path.
    pub fn new(field: &F, log_n: u32, shorter: usize) -> Option<Self> {
        let (primes, recombination) = if let Some(m) = field.word_modulus() {
            let primes = word_transform_primes(m, shorter);
            (primes, Recombination::Word(Garner::new(primes, m)))
        } else {
            let modulus = field.montgomery_modulus()?;
            let primes = wide_transform_primes(&modulus, shorter);
            let crt = ExplicitCrt::new(primes, &modulus);
            (primes, Recombination::Wide(crt, modulus.len()))
        };
        Some(CyclicProducts {
            field: field.clone(),
            log_n,
            primes,
            recombination,
        })
    }

    /// N, the length of the products.
    pub fn length(&self) -> usize {
        1 << self.log_n
    }

    /// The spectra of a (at most N coefficients).
    pub fn spectra(&self, a: &[F::Elem]) -> Spectra {
        assert!(
            a.len() <= self.length(),
            "a factor longer than the cyclic length"
        );
        let residues = self.residues(a);
        Spectra(rayon_map(&self.indexed_primes(), |&(t, prime)| {
            prime.spectrum(&residues(t, prime), self.log_n)
        }))
    }

    /// Coefficients `range` (within 0..N) of the cyclic product of a (at most N coefficients)
    /// and the polynomial whose spectra are `b`.
    pub fn product(&self, a: &[F::Elem], b: &Spectra, range: Range<usize>) -> Vec<F::Elem> {
        assert!(a.len() <= self.length() && range.end <= self.length());
        let residues = self.residues(a);
        let convolutions: Vec<Vec<u64>> = rayon_map(&self.indexed_primes(), |&(t, prime)| {
            let spectrum = prime.spectrum(&residues(t, prime), self.log_n);
            prime.convolve_spectra(spectrum, &b.0[t], self.log_n)
        });
        range
            .into_par_iter()
            .with_min_len(256)
            .map(|i| match &self.recombination {
                Recombination::Word(crt) => self.field.from_word(crt.combine(&convolutions, i)),
                Recombination::Wide(crt, _) => crt.combine(&self.field, &convolutions, i),
            })
            .collect()
    }

    fn indexed_primes(&self) -> Vec<(usize, &'static TransformPrime)> {
        self.primes.iter().enumerate().collect()
    }

    /// The coefficients of a as integers modulo the t-th transform prime.
    fn residues<'a>(
        &'a self,
        a: &'a [F::Elem],
    ) -> impl Fn(usize, &TransformPrime) -> Vec<u64> + Sync + 'a {
        let limbs = match self.recombination {
            Recombination::Wide(_, width) => Some((montgomery_limbs(&self.field, a, width), width)),
            Recombination::Word(_) => None,
        };
        move |_, prime| match &limbs {
            Some((limbs, width)) => residues_of(prime, limbs, *width),
            None => a.iter().map(|c| self.field.to_word(c)).collect(),
        }
    }
}
