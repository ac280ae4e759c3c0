//! Monomials as exponent vectors with their total degree cached.
//!
//! Exponents are `u32`; every operation that could exceed that (or a total degree above
//! `u32::MAX`) is checked and reported as [`Error::Overflow`], never wrapped.
//!
//! Up to [`INLINE`] exponents are held inside the value itself, more on the heap: polynomial
//! arithmetic creates and drops monomials all the time, and for the few variables of most
//! systems that then costs no allocation. Equality, hashing and ordering (degree, then the
//! exponent slice) depend only on the exponents, never on where they are held.

use crate::error::{Error, Result};
use std::cmp::Ordering;
use std::hash::{Hash, Hasher};

/// The most exponents held without a heap allocation.
const INLINE: usize = 6;

/// Layout of 64-bit divisibility masks: one bit per (variable, threshold), set when the
/// exponent exceeds the threshold, so `mask(a) & !mask(b) != 0` proves that a does not divide b
/// without reading the exponents. With few variables each gets several thresholds (0, 1, 3, 7,
/// ...); with more than 64 variables the first 64 get one bit each (exponent > 0).
#[derive(Clone, Debug, Default)]
pub struct MaskLayout {
    /// Variables with bits (the first 64 at most) and thresholds per variable.
    vars: usize,
    per_var: u32,
}

impl MaskLayout {
    pub fn new(nvars: usize) -> Self {
        let per_var = 64usize
            .checked_div(nvars)
            .map_or(0, |share| share.clamp(1, 8) as u32);
        MaskLayout {
            vars: nvars.min(64),
            per_var,
        }
    }

    /// Bit `v·per_var + k` is set when exponent v exceeds 2^k - 1, i.e. for k below the
    /// exponent's bit length.
    #[inline]
    pub fn mask(&self, exps: &[u32]) -> u64 {
        exps[..self.vars]
            .iter()
            .enumerate()
            .fold(0u64, |m, (v, &e)| {
                let set = self.per_var.min(u32::BITS - e.leading_zeros());
                m | ((1u64 << set) - 1) << (v as u32 * self.per_var)
            })
    }
}

#[derive(Clone, Debug)]
pub struct Monomial {
    degree: u32,
    exps: Exponents,
}

/// The exponents: inline (the first `len` entries of the array, the rest zero) or on the heap.
#[derive(Clone, Debug)]
enum Exponents {
    Inline { len: u8, exps: [u32; INLINE] },
    Heap(Box<[u32]>),
}

impl Exponents {
    #[inline]
    fn as_slice(&self) -> &[u32] {
        match self {
            Exponents::Inline { len, exps } => &exps[..*len as usize],
            Exponents::Heap(exps) => exps,
        }
    }

    /// `n` exponents from `f(i)`.
    #[inline]
    fn from_fn(n: usize, f: impl FnMut(usize) -> u32) -> Self {
        if n <= INLINE {
            let mut f = f;
            let mut exps = [0; INLINE];
            for (i, e) in exps.iter_mut().enumerate().take(n) {
                *e = f(i);
            }
            Exponents::Inline { len: n as u8, exps }
        } else {
            Exponents::Heap((0..n).map(f).collect())
        }
    }

    /// `n` exponents from `f(i)`, or `None` as soon as one is `None`.
    #[inline]
    fn try_from_fn(n: usize, mut f: impl FnMut(usize) -> Option<u32>) -> Option<Self> {
        if n <= INLINE {
            let mut exps = [0; INLINE];
            for (i, e) in exps.iter_mut().enumerate().take(n) {
                *e = f(i)?;
            }
            Some(Exponents::Inline { len: n as u8, exps })
        } else {
            (0..n)
                .map(f)
                .collect::<Option<Box<[u32]>>>()
                .map(Exponents::Heap)
        }
    }

    fn from_vec(exps: Vec<u32>) -> Self {
        if exps.len() <= INLINE {
            Self::from_fn(exps.len(), |i| exps[i])
        } else {
            Exponents::Heap(exps.into_boxed_slice())
        }
    }
}

impl PartialEq for Monomial {
    #[inline]
    fn eq(&self, other: &Self) -> bool {
        self.degree == other.degree && self.exponents() == other.exponents()
    }
}

impl Eq for Monomial {}

impl Hash for Monomial {
    fn hash<H: Hasher>(&self, state: &mut H) {
        self.degree.hash(state);
        self.exponents().hash(state);
    }
}

impl Ord for Monomial {
    #[inline]
    fn cmp(&self, other: &Self) -> Ordering {
        self.degree
            .cmp(&other.degree)
            .then_with(|| self.exponents().cmp(other.exponents()))
    }
}

impl PartialOrd for Monomial {
    #[inline]
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}

fn overflow() -> Error {
    Error::Overflow("exponent overflow: a degree exceeds 2^32 - 1".into())
}

impl Monomial {
    /// The monomial 1 in `n` variables.
    pub fn one(n: usize) -> Self {
        Monomial {
            degree: 0,
            exps: Exponents::from_fn(n, |_| 0),
        }
    }

    /// The variable x_i (0-based) in `n` variables, to the power `e`.
    pub fn var_power(n: usize, i: usize, e: u32) -> Self {
        assert!(i < n, "variable index {i} out of range for {n} variables");
        Monomial {
            degree: e,
            exps: Exponents::from_fn(n, |k| if k == i { e } else { 0 }),
        }
    }

    pub fn from_exponents(exps: Vec<u32>) -> Result<Self> {
        let degree = exps
            .iter()
            .try_fold(0u32, |d, &e| d.checked_add(e))
            .ok_or_else(overflow)?;
        Ok(Monomial {
            degree,
            exps: Exponents::from_vec(exps),
        })
    }

    /// The monomial with exponents f(0), ..., f(n - 1), built in place (no vector in between).
    pub fn from_exponent_fn(n: usize, f: impl FnMut(usize) -> u32) -> Result<Self> {
        let exps = Exponents::from_fn(n, f);
        let degree = exps
            .as_slice()
            .iter()
            .try_fold(0u32, |d, &e| d.checked_add(e))
            .ok_or_else(overflow)?;
        Ok(Monomial { degree, exps })
    }

    #[inline]
    pub fn exponents(&self) -> &[u32] {
        self.exps.as_slice()
    }
    #[inline]
    pub fn degree(&self) -> u32 {
        self.degree
    }
    #[inline]
    pub fn nvars(&self) -> usize {
        self.exponents().len()
    }
    pub fn is_one(&self) -> bool {
        self.degree == 0
    }

    pub fn mul(&self, other: &Monomial) -> Result<Monomial> {
        let degree = self.degree.checked_add(other.degree).ok_or_else(overflow)?;
        let (a, b) = (self.exponents(), other.exponents());
        let exps = Exponents::try_from_fn(a.len().min(b.len()), |i| a[i].checked_add(b[i]));
        Ok(Monomial {
            degree,
            exps: exps.ok_or_else(overflow)?,
        })
    }

    pub fn pow(&self, e: u32) -> Result<Monomial> {
        let degree = self.degree.checked_mul(e).ok_or_else(overflow)?;
        let a = self.exponents();
        let exps = Exponents::try_from_fn(a.len(), |i| a[i].checked_mul(e));
        Ok(Monomial {
            degree,
            exps: exps.ok_or_else(overflow)?,
        })
    }

    #[inline]
    pub fn divides(&self, other: &Monomial) -> bool {
        self.degree <= other.degree
            && self
                .exponents()
                .iter()
                .zip(other.exponents())
                .all(|(a, b)| a <= b)
    }

    /// self / other, assuming `other` divides `self`.
    pub fn div(&self, other: &Monomial) -> Monomial {
        debug_assert!(other.divides(self));
        let (a, b) = (self.exponents(), other.exponents());
        Monomial {
            degree: self.degree - other.degree,
            exps: Exponents::from_fn(a.len().min(b.len()), |i| a[i] - b[i]),
        }
    }

    /// Least common multiple (cannot overflow: each exponent is one of the inputs').
    pub fn lcm(&self, other: &Monomial) -> Monomial {
        let (a, b) = (self.exponents(), other.exponents());
        let exps = Exponents::from_fn(a.len().min(b.len()), |i| a[i].max(b[i]));
        let degree = exps.as_slice().iter().map(|&e| e as u64).sum::<u64>();
        Monomial {
            degree: u32::try_from(degree).unwrap_or(u32::MAX),
            exps,
        }
    }

    /// Whether `lcm` is the least common multiple of the two (without building it).
    pub fn lcm_is(&self, other: &Monomial, lcm: &Monomial) -> bool {
        let (a, b) = (self.exponents(), other.exponents());
        lcm.exponents()
            .iter()
            .zip(a.iter().zip(b))
            .all(|(l, (x, y))| *l == *x.max(y))
    }

    /// Whether the two monomials share no variable.
    pub fn coprime(&self, other: &Monomial) -> bool {
        self.exponents()
            .iter()
            .zip(other.exponents())
            .all(|(a, b)| *a == 0 || *b == 0)
    }

    /// If this monomial is a power of a single variable x_i (degree ≥ 1), that i.
    pub fn pure_power_variable(&self) -> Option<usize> {
        let mut it = self.exponents().iter().enumerate().filter(|(_, e)| **e > 0);
        match (it.next(), it.next()) {
            (Some((i, _)), None) => Some(i),
            _ => None,
        }
    }

    /// Text form with the given variable names: `x^2*y`, or `1`.
    pub fn format(&self, names: &[String]) -> String {
        let parts: Vec<String> = self
            .exponents()
            .iter()
            .zip(names)
            .filter(|(e, _)| **e > 0)
            .map(|(e, n)| {
                if *e == 1 {
                    n.clone()
                } else {
                    format!("{n}^{e}")
                }
            })
            .collect();
        if parts.is_empty() {
            "1".into()
        } else {
            parts.join("*")
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn overflow_is_reported() {
        let big = Monomial::var_power(2, 0, u32::MAX);
        assert!(matches!(
            big.mul(&Monomial::var_power(2, 0, 1)),
            Err(Error::Overflow(_))
        ));
        assert!(matches!(
            Monomial::var_power(1, 0, 1 << 20).pow(1 << 12),
            Err(Error::Overflow(_))
        ));
        let two = Monomial::from_exponents(vec![u32::MAX, 1]);
        assert!(matches!(two, Err(Error::Overflow(_))));
        let built = Monomial::from_exponent_fn(2, |i| [u32::MAX, 1][i]);
        assert!(matches!(built, Err(Error::Overflow(_))));
    }

    /// Built in place or from a vector, inline (up to six exponents) or on the heap, a
    /// monomial is the same: equal, same degree, same exponents.
    #[test]
    fn built_in_place_equals_built_from_a_vector() {
        for n in [0, 1, 6, 7, 12] {
            let exponents: Vec<u32> = (0..n).map(|i| (i * 7 % 5) as u32).collect();
            let built = Monomial::from_exponent_fn(n, |i| exponents[i]).unwrap();
            let from_vec = Monomial::from_exponents(exponents.clone()).unwrap();
            assert_eq!(built, from_vec);
            assert_eq!(built.degree(), exponents.iter().sum::<u32>());
            assert_eq!(built.exponents(), &exponents[..]);
        }
    }

    #[test]
    fn divisibility_lcm_and_division() {
        let a = Monomial::from_exponents(vec![2, 1, 0]).unwrap();
        let b = Monomial::from_exponents(vec![1, 3, 0]).unwrap();
        let l = a.lcm(&b);
        assert_eq!(l.exponents(), &[2, 3, 0]);
        assert!(a.divides(&l) && b.divides(&l) && !a.divides(&b));
        assert_eq!(l.div(&a).exponents(), &[0, 2, 0]);
        assert_eq!(l.degree(), 5);
        let names: Vec<String> = ["x", "y", "z"].iter().map(|s| s.to_string()).collect();
        assert_eq!(a.format(&names), "x^2*y");
    }

    /// Monomials in more variables than fit inline compute and compare as the short ones do:
    /// the same operations on x^2·y·z^3 and x·y^4 padded by zeros to 3 and to 9 variables.
    #[test]
    fn masks_never_reject_a_divisor_and_lcm_is_recognised() {
        // Exhaustive over small exponent vectors in 2, 9 and 70 variables (one, several and
        // at most one threshold per variable; beyond 64 variables the rest get no bits).
        for nvars in [2usize, 9, 70] {
            let layout = MaskLayout::new(nvars);
            let mono = |seed: u32| {
                Monomial::from_exponents(
                    (0..nvars as u32)
                        .map(|v| (seed >> (v % 8)).wrapping_mul(v + 3) % 5)
                        .collect(),
                )
                .unwrap()
            };
            let monos: Vec<Monomial> = (0..200).map(mono).collect();
            for a in &monos {
                for b in &monos {
                    let (ma, mb) = (layout.mask(a.exponents()), layout.mask(b.exponents()));
                    if a.divides(b) {
                        assert_eq!(ma & !mb, 0, "mask rejected a divisor");
                    }
                    assert!(a.lcm_is(b, &a.lcm(b)));
                    assert_eq!(a.lcm_is(b, b), a.divides(b));
                }
            }
        }
        // Layout: with 8 variables, 8 bits each; exponent 5 (bit length 3) sets 3 of them.
        let layout = MaskLayout::new(8);
        assert_eq!(layout.mask(&[0, 5, 0, 0, 0, 0, 0, 1]), 0b111 << 8 | 1 << 56);
    }

    #[test]
    fn heap_and_inline_exponents_agree() {
        let pad = |e: &[u32], n: usize| {
            let mut v = e.to_vec();
            v.resize(n, 0);
            Monomial::from_exponents(v).unwrap()
        };
        let (a, b) = ([2, 1, 3], [1, 4, 0]);
        let short = (pad(&a, 3), pad(&b, 3));
        let long = (pad(&a, INLINE + 3), pad(&b, INLINE + 3));
        let same = |x: &Monomial, y: &Monomial| {
            assert_eq!(x.exponents(), &y.exponents()[..x.nvars()]);
            assert!(y.exponents()[x.nvars()..].iter().all(|&e| e == 0));
            assert_eq!(x.degree(), y.degree());
        };
        same(
            &short.0.mul(&short.1).unwrap(),
            &long.0.mul(&long.1).unwrap(),
        );
        same(&short.0.lcm(&short.1), &long.0.lcm(&long.1));
        same(&short.0.pow(3).unwrap(), &long.0.pow(3).unwrap());
        let l = long.0.lcm(&long.1);
        same(&short.0.lcm(&short.1).div(&short.1), &l.div(&long.1));
        assert_eq!(l.exponents()[..3], [2, 4, 3]);
        assert_eq!(short.0.cmp(&short.1), long.0.cmp(&long.1));
        assert_eq!(
            Monomial::var_power(INLINE + 1, INLINE, 2).exponents()[INLINE],
            2
        );
        assert_eq!(Monomial::one(INLINE + 2), pad(&[], INLINE + 2));
    }
}
