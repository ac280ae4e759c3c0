//! Monomials as exponent vectors with their total degree cached.
//!
//! Exponents are `u32`; every operation that could exceed that (or a total degree above
//! `u32::MAX`) is checked and reported as [`Error::Overflow`], never wrapped.

use crate::error::{Error, Result};

#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct Monomial {
    degree: u32,
    exps: Box<[u32]>,
}

fn overflow() -> Error {
    Error::Overflow("exponent overflow: a degree exceeds 2^32 - 1".into())
}

impl Monomial {
    /// The monomial 1 in `n` variables.
    pub fn one(n: usize) -> Self {
        Monomial {
            degree: 0,
            exps: vec![0; n].into_boxed_slice(),
        }
    }

    /// The variable x_i (0-based) in `n` variables, to the power `e`.
    pub fn var_power(n: usize, i: usize, e: u32) -> Self {
        let mut exps = vec![0; n];
        exps[i] = e;
        Monomial {
            degree: e,
            exps: exps.into_boxed_slice(),
        }
    }

    pub fn from_exponents(exps: Vec<u32>) -> Result<Self> {
        let degree = exps
            .iter()
            .try_fold(0u32, |d, &e| d.checked_add(e))
            .ok_or_else(overflow)?;
        Ok(Monomial {
            degree,
            exps: exps.into_boxed_slice(),
        })
    }

    #[inline]
    pub fn exponents(&self) -> &[u32] {
        &self.exps
    }
    #[inline]
    pub fn degree(&self) -> u32 {
        self.degree
    }
    #[inline]
    pub fn nvars(&self) -> usize {
        self.exps.len()
    }
    pub fn is_one(&self) -> bool {
        self.degree == 0
    }

    pub fn mul(&self, other: &Monomial) -> Result<Monomial> {
        let degree = self.degree.checked_add(other.degree).ok_or_else(overflow)?;
        let exps = self
            .exps
            .iter()
            .zip(other.exps.iter())
            .map(|(a, b)| a.checked_add(*b));
        let exps: Option<Box<[u32]>> = exps.collect();
        Ok(Monomial {
            degree,
            exps: exps.ok_or_else(overflow)?,
        })
    }

    pub fn pow(&self, e: u32) -> Result<Monomial> {
        let degree = self.degree.checked_mul(e).ok_or_else(overflow)?;
        let exps: Option<Box<[u32]>> = self.exps.iter().map(|a| a.checked_mul(e)).collect();
        Ok(Monomial {
            degree,
            exps: exps.ok_or_else(overflow)?,
        })
    }

    #[inline]
    pub fn divides(&self, other: &Monomial) -> bool {
        self.degree <= other.degree && self.exps.iter().zip(other.exps.iter()).all(|(a, b)| a <= b)
    }

    /// self / other, assuming `other` divides `self`.
    pub fn div(&self, other: &Monomial) -> Monomial {
        debug_assert!(other.divides(self));
        let exps = self
            .exps
            .iter()
            .zip(other.exps.iter())
            .map(|(a, b)| a - b)
            .collect();
        Monomial {
            degree: self.degree - other.degree,
            exps,
        }
    }

    /// Least common multiple (cannot overflow: each exponent is one of the inputs').
    pub fn lcm(&self, other: &Monomial) -> Monomial {
        let exps: Box<[u32]> = self
            .exps
            .iter()
            .zip(other.exps.iter())
            .map(|(a, b)| *a.max(b))
            .collect();
        let degree = exps.iter().map(|&e| e as u64).sum::<u64>();
        Monomial {
            degree: u32::try_from(degree).unwrap_or(u32::MAX),
            exps,
        }
    }

    /// Whether the two monomials share no variable.
    pub fn coprime(&self, other: &Monomial) -> bool {
        self.exps
            .iter()
            .zip(other.exps.iter())
            .all(|(a, b)| *a == 0 || *b == 0)
    }

    /// If this monomial is a power of a single variable x_i (degree ≥ 1), that i.
    pub fn pure_power_variable(&self) -> Option<usize> {
        let mut it = self.exps.iter().enumerate().filter(|(_, e)| **e > 0);
        match (it.next(), it.next()) {
            (Some((i, _)), None) => Some(i),
            _ => None,
        }
    }

    /// Text form with the given variable names: `x^2*y`, or `1`.
    pub fn format(&self, names: &[String]) -> String {
        let parts: Vec<String> = self
            .exps
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
}
