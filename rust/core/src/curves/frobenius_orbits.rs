//! The elements of GF(Q) = GF(q^r) up to the Frobenius σ: x ↦ x^q, walked in order with a few
//! additions per element: one representative of each σ-orbit, weighted by the orbit's length.
//! Conjugate x (x, σ(x), σ²(x), ...) have fibres of the same size over a curve defined over
//! GF(q), so a count goes through one fibre per orbit (about Q/r of them).
//!
//! GF(Q) is enumerated as x_i = Σ d_j b_j with d_j the base-p digits of i and b_j = γ^j the
//! power basis of a generator γ over GF(p) (Lidl and Niederreiter 1983, ch. 2). From i to i + 1
//! the t trailing digits p − 1 wrap to 0 and the next digit grows by one, and p·b = 0, so
//! x_(i+1) = x_i + (b_0 + ... + b_t); σ is additive, so every conjugate σ^m(x_i) moves by
//! σ^m(b_0 + ... + b_t), made once. The representative of an orbit is the member of least
//! hash; when two members share the least hash, every member counts for itself.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::{field_size, Field};
use rayon::prelude::*;
use std::hash::{Hash, Hasher};

/// The σ-orbits of GF(q^r) under x ↦ x^q, ready to be walked from any index.
#[derive(Clone, Debug)]
pub struct FrobeniusOrbits<E: Field> {
    field: E,
    p: u64,
    size: u64,
    r: usize,
    /// conjugates[j][m] = σ^m(b_j).
    basis: Vec<Vec<E::Elem>>,
    /// steps[t][m] = σ^m(b_0 + ... + b_t).
    steps: Vec<Vec<E::Elem>>,
}

/// An element x_i of the enumeration with its conjugates σ^m(x_i), m < r.
#[derive(Clone, Debug)]
pub struct OrbitWalk<'a, E: Field> {
    orbits: &'a FrobeniusOrbits<E>,
    index: u64,
    conjugates: Vec<E::Elem>,
}

impl<E: Field> FrobeniusOrbits<E> {
    /// The orbits of `field` = GF(q^r) under x ↦ x^q.
    pub fn new(field: &E, q: u64, r: u32) -> Result<Self> {
        let p = field.characteristic_u64().filter(|&p| p > 1);
        let size = field_size(field).filter(|&n| n < u64::MAX);
        let (Some(p), Some(size)) = (p, size) else {
            return Err(Error::invalid(format!(
                "Frobenius orbits are walked in finite fields of fewer than 2^64 - 1 elements, not {}",
                field.spec()
            )));
        };
        if q.checked_pow(r) != Some(size) {
            return Err(Error::invalid(format!(
                "{} is not GF({q}^{r})",
                field.spec()
            )));
        }
        let generator = match field.generator() {
            Some(g) => g,
            None if field.degree() == 1 => field.one(),
            None => {
                return Err(Error::invalid(format!(
                    "{} has no generator to enumerate it by",
                    field.spec()
                )))
            }
        };
        let degree = field.degree() as usize;
        let mut basis = Vec::with_capacity(degree);
        let mut power = field.one();
        for _ in 0..degree {
            basis.push(conjugates(field, &power, q, r as usize));
            power = field.mul(&power, &generator);
        }
        let mut steps: Vec<Vec<E::Elem>> = Vec::with_capacity(degree);
        for b in &basis {
            let step = match steps.last() {
                Some(previous) => previous
                    .iter()
                    .zip(b)
                    .map(|(s, c)| field.add(s, c))
                    .collect(),
                None => b.clone(),
            };
            steps.push(step);
        }
        Ok(FrobeniusOrbits {
            field: field.clone(),
            p,
            size,
            r: r as usize,
            basis,
            steps,
        })
    }

    /// Q, the number of elements walked.
    pub fn size(&self) -> u64 {
        self.size
    }

    /// The walk positioned at x_index.
    pub fn walk_from(&self, index: u64) -> OrbitWalk<'_, E> {
        let field = &self.field;
        let mut conjugates = vec![field.zero(); self.r];
        let mut rest = index;
        for b in &self.basis {
            let digit = field.from_i64((rest % self.p) as i64);
            rest /= self.p;
            if field.is_zero(&digit) {
                continue;
            }
            for (c, image) in conjugates.iter_mut().zip(b) {
                *c = field.add(c, &field.mul(&digit, image));
            }
        }
        OrbitWalk {
            orbits: self,
            index,
            conjugates,
        }
    }
}

impl<E: Field> FrobeniusOrbits<E> {
    /// Σ weight(x)·value(x) over one representative x of each orbit: the elements shared out
    /// over rayon's workers in runs of `chunk`, each run with a state made by `init` (a
    /// buffer reused from element to element).
    pub fn weighted_sum<S>(
        &self,
        chunk: u64,
        control: &Control,
        init: impl Fn() -> S + Sync,
        value: impl Fn(&mut S, &E::Elem) -> Result<u128> + Sync,
    ) -> Result<u128> {
        (0..self.size.div_ceil(chunk))
            .into_par_iter()
            .map(|run| {
                let start = run * chunk;
                let end = (start + chunk).min(self.size);
                let mut walk = self.walk_from(start);
                let mut state = init();
                let mut sum = 0u128;
                for i in start..end {
                    if i % CHECK_EVERY == 0 {
                        control.check()?;
                    }
                    let weight = walk.weight();
                    if weight > 0 {
                        sum += weight * value(&mut state, walk.element())?;
                    }
                    if i + 1 < end {
                        walk.advance();
                    }
                }
                Ok(sum)
            })
            .try_reduce(|| 0, |a, b| Ok(a + b))
    }
}

/// Elements between two checks for interruption (a check touches a counter shared by the
/// workers).
const CHECK_EVERY: u64 = 64;

impl<E: Field> OrbitWalk<'_, E> {
    /// The current element x_i.
    pub fn element(&self) -> &E::Elem {
        &self.conjugates[0]
    }

    /// How many fibres the one over x_i stands for: the length of its orbit when x_i is the
    /// orbit's representative, 0 for the other members (1 each on a tie of hashes).
    pub fn weight(&self) -> u128 {
        let x = &self.conjugates[0];
        let length = (1..self.orbits.r)
            .find(|&m| self.conjugates[m] == *x)
            .unwrap_or(self.orbits.r);
        if length == 1 {
            return 1;
        }
        let own = cheap_hash(x);
        let (mut least, mut ties) = (own, 1);
        for c in &self.conjugates[1..length] {
            let h = cheap_hash(c);
            if h < least {
                (least, ties) = (h, 1);
            } else if h == least {
                ties += 1;
            }
        }
        match (ties, least == own) {
            (1, true) => length as u128,
            (1, false) => 0,
            _ => 1,
        }
    }

    /// Moves to x_(i+1) (the caller stays below Q).
    pub fn advance(&mut self) {
        let orbits = self.orbits;
        let field = &orbits.field;
        let trailing = if orbits.p == 2 {
            self.index.trailing_ones() as usize
        } else {
            let mut trailing = 0;
            let mut rest = self.index;
            while rest % orbits.p == orbits.p - 1 {
                trailing += 1;
                rest /= orbits.p;
            }
            trailing
        };
        self.index += 1;
        let Some(step) = orbits.steps.get(trailing) else {
            // Past the last element: every digit wrapped.
            return;
        };
        for (c, s) in self.conjugates.iter_mut().zip(step) {
            *c = field.add(c, s);
        }
    }
}

/// x, σ(x), ..., σ^(r−1)(x) for σ: x ↦ x^q.
fn conjugates<E: Field>(field: &E, x: &E::Elem, q: u64, r: usize) -> Vec<E::Elem> {
    let mut out = Vec::with_capacity(r);
    let mut y = x.clone();
    for _ in 0..r {
        let next = field.pow(&y, q);
        out.push(y);
        y = next;
    }
    out
}

/// A fast hash of a field element (one multiply-rotate per word), enough to pick one member of
/// an orbit: ties are handled by the caller.
fn cheap_hash<T: Hash>(value: &T) -> u64 {
    let mut hasher = WordHasher(0);
    value.hash(&mut hasher);
    hasher.finish()
}

struct WordHasher(u64);

impl Hasher for WordHasher {
    fn finish(&self) -> u64 {
        // A final mix so that the least hash is not simply the least element.
        let x = self.0 ^ (self.0 >> 29);
        x.wrapping_mul(0xbf58_476d_1ce4_e5b9) ^ (x >> 32)
    }
    fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.write_u64(u64::from(b));
        }
    }
    fn write_u32(&mut self, word: u32) {
        self.write_u64(u64::from(word));
    }
    fn write_u64(&mut self, word: u64) {
        self.0 = (self.0.rotate_left(5) ^ word).wrapping_mul(0x9e37_79b9_7f4a_7c15);
    }
    fn write_usize(&mut self, word: usize) {
        self.write_u64(word as u64);
    }
}
