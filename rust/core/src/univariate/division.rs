//! Division with remainder of dense polynomials, and arithmetic modulo a fixed polynomial.
//!
//! For large degrees the quotient comes from a power series inverse: with rev(p) = x^deg p ·
//! p(1/x), the quotient of a by b is rev(rev(a) · rev(b)^(−1) mod x^(deg a − deg b + 1)), and the
//! inverse series comes from Newton's iteration g ← g·(2 − rev(b)·g), doubling the precision each
//! step (Sieveking 1972; Kung 1974), so a division costs a few products. [`Modulo`] keeps the
//! inverse series of its modulus, so that each reduction costs two products, and over fields
//! with a transform path also the transforms of the modulus and of the inverse series
//! ([`super::transform_reduction`]), so that those two products cost half; its powers use
//! square-and-multiply, with exponents given as little-endian 64-bit limbs (x^q for q up to
//! 2^512 and beyond costs one squaring per bit).

use super::transform_reduction::TransformReduction;
use super::{degree, multiply, square, subtract, trimmed, Univariate};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;
use std::sync::Arc;

/// Below this quotient length (or divisor degree) the schoolbook division is used.
const NEWTON_THRESHOLD: usize = 64;
/// From this modulus degree on, [`Modulo`] keeps the transforms of its modulus.
const TRANSFORM_REDUCTION_THRESHOLD: usize = 128;

/// (quotient, remainder) of a by b ≠ 0.
pub fn divide<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> (Univariate<F>, Univariate<F>) {
    let db = degree::<F>(b).expect("division by the zero polynomial");
    if a.len() <= db {
        return (vec![], trimmed(field, a.to_vec()));
    }
    let quotient_length = a.len() - db;
    if quotient_length < NEWTON_THRESHOLD || db < NEWTON_THRESHOLD {
        return schoolbook(field, a, b);
    }
    let inverse = inverse_series(field, &reversed(field, b, b.len()), quotient_length);
    let quotient = quotient_from_inverse(field, a, db, &inverse);
    let remainder = subtract(field, a, &multiply(field, &quotient, b));
    (quotient, remainder)
}

/// a mod b, for b ≠ 0 (without building the quotient when the division is short: this is the
/// product reduction of every extension-field multiplication).
pub fn remainder<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    let db = degree::<F>(b).expect("division by the zero polynomial");
    if a.len() <= db {
        return trimmed(field, a.to_vec());
    }
    if a.len() - db < NEWTON_THRESHOLD || db < NEWTON_THRESHOLD {
        let mut r = a.to_vec();
        reduce_in_place(field, &mut r, b, |_, _| {});
        r.truncate(db);
        return trimmed(field, r);
    }
    divide(field, a, b).1
}

/// Cancels the coefficients of r from the top down to degree deg b with multiples of b,
/// reporting each quotient coefficient (its degree and value) to `quotient`.
fn reduce_in_place<F: Field>(
    field: &F,
    r: &mut [F::Elem],
    b: &[F::Elem],
    mut quotient: impl FnMut(usize, F::Elem),
) {
    let db = b.len() - 1;
    let lead_inv = field.inv(&b[db]).expect("nonzero leading coefficient");
    for top in (db..r.len()).rev() {
        if field.is_zero(&r[top]) {
            continue;
        }
        let c = field.mul(&r[top], &lead_inv);
        for (x, y) in r[top - db..top].iter_mut().zip(b) {
            *x = field.sub(x, &field.mul(&c, y));
        }
        r[top] = field.zero();
        quotient(top - db, c);
    }
}

/// The schoolbook division: one row operation per quotient coefficient.
fn schoolbook<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> (Univariate<F>, Univariate<F>) {
    let db = b.len() - 1;
    let mut r = a.to_vec();
    let mut q = vec![field.zero(); a.len() - db];
    reduce_in_place(field, &mut r, b, |i, c| q[i] = c);
    r.truncate(db);
    (trimmed(field, q), trimmed(field, r))
}

/// x^(n−1)·p(1/x) for p of length ≤ n, as n coefficients.
fn reversed<F: Field>(field: &F, p: &[F::Elem], n: usize) -> Vec<F::Elem> {
    (0..n)
        .map(|i| p.get(n - 1 - i).cloned().unwrap_or_else(|| field.zero()))
        .collect()
}

/// g with f·g ≡ 1 (mod x^n), f[0] ≠ 0, by Newton's iteration.
pub fn inverse_series<F: Field>(field: &F, f: &[F::Elem], n: usize) -> Univariate<F> {
    let mut g = vec![field.inv(&f[0]).expect("invertible constant term")];
    let mut precision = 1;
    while precision < n {
        precision = (2 * precision).min(n);
        let mut e = multiply(field, &f[..f.len().min(precision)], &g);
        e.truncate(precision);
        // g·(2 − f·g) = g − g·(f·g − 1); f·g − 1 vanishes below the old precision.
        let mut correction = e;
        if correction.is_empty() {
            correction.push(field.zero());
        }
        correction[0] = field.sub(&correction[0], &field.one());
        let mut delta = multiply(field, &g, &trimmed(field, correction));
        delta.truncate(precision);
        g = subtract(field, &g, &delta);
    }
    g
}

/// The quotient of a by b (deg b = db) from the inverse of rev(b) to precision ≥ deg a − db + 1.
fn quotient_from_inverse<F: Field>(
    field: &F,
    a: &[F::Elem],
    db: usize,
    inverse: &[F::Elem],
) -> Univariate<F> {
    let length = a.len() - db;
    let top: Vec<F::Elem> = a.iter().rev().take(length).cloned().collect();
    let head = &inverse[..inverse.len().min(length)];
    let mut q_reversed = multiply(field, &trimmed(field, top), head);
    q_reversed.resize(length, field.zero());
    q_reversed.reverse();
    trimmed(field, q_reversed)
}

/// Arithmetic in k[x]/(f) for a fixed f of degree ≥ 1: reductions by the precomputed inverse
/// series of rev(f).
#[derive(Clone, Debug)]
pub struct Modulo<F: Field> {
    pub field: F,
    modulus: Univariate<F>,
    /// rev(f)^(−1) mod x^(deg f), for quotients of products of reduced elements.
    inverse: Univariate<F>,
    /// The transforms of f and of the inverse series, shared by the clones.
    transforms: Option<Arc<TransformReduction<F>>>,
}

impl<F: Field> Modulo<F> {
    /// Arithmetic modulo f (deg f ≥ 1).
    pub fn new(field: &F, f: &[F::Elem]) -> Self {
        let f = trimmed(field, f.to_vec());
        let d = degree::<F>(&f).expect("a nonzero modulus");
        let inverse = if d >= NEWTON_THRESHOLD {
            inverse_series(field, &reversed(field, &f, f.len()), d)
        } else {
            vec![]
        };
        let transforms = (d >= TRANSFORM_REDUCTION_THRESHOLD)
            .then(|| TransformReduction::new(field, &f, &inverse))
            .flatten()
            .map(Arc::new);
        Modulo {
            field: field.clone(),
            modulus: f,
            inverse,
            transforms,
        }
    }

    pub fn modulus(&self) -> &[F::Elem] {
        &self.modulus
    }

    pub fn degree(&self) -> usize {
        self.modulus.len() - 1
    }

    /// a mod f for deg a < 2·deg f (any a, by plain division, otherwise).
    pub fn reduce(&self, a: &[F::Elem]) -> Univariate<F> {
        let d = self.degree();
        if a.len() <= d {
            return trimmed(&self.field, a.to_vec());
        }
        if self.inverse.is_empty() || a.len() - d > d {
            return remainder(&self.field, a, &self.modulus);
        }
        if let Some(transforms) = &self.transforms {
            // Worth it for the long quotients of products; x·a takes the plain way.
            if 2 * (a.len() - d) > d && a.len() < 2 * d {
                return transforms.reduce(&self.field, a);
            }
        }
        let q = quotient_from_inverse(&self.field, a, d, &self.inverse);
        let mut qf = multiply(&self.field, &q, &self.modulus);
        qf.truncate(d);
        let mut low = a[..d].to_vec();
        low = subtract(&self.field, &low, &qf);
        low
    }

    pub fn multiply(&self, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
        self.reduce(&multiply(&self.field, a, b))
    }

    pub fn square(&self, a: &[F::Elem]) -> Univariate<F> {
        self.reduce(&square(&self.field, a))
    }

    /// x·a mod f.
    pub fn times_x(&self, a: &[F::Elem]) -> Univariate<F> {
        let mut shifted = Vec::with_capacity(a.len() + 1);
        shifted.push(self.field.zero());
        shifted.extend_from_slice(a);
        self.reduce(&trimmed(&self.field, shifted))
    }

    /// a^e mod f, e as little-endian 64-bit limbs; a reduced.
    pub fn power(
        &self,
        a: &[F::Elem],
        exponent: &[u64],
        control: &Control,
    ) -> Result<Univariate<F>> {
        self.power_by(exponent, control, |acc| self.multiply(acc, a))
    }

    /// x^e mod f, e as little-endian 64-bit limbs: multiplying by x is a shift.
    pub fn x_power(&self, exponent: &[u64], control: &Control) -> Result<Univariate<F>> {
        self.power_by(exponent, control, |acc| self.times_x(acc))
    }

    /// Left-to-right square-and-multiply with `times_base` as the multiplication by the base.
    fn power_by(
        &self,
        exponent: &[u64],
        control: &Control,
        times_base: impl Fn(&[F::Elem]) -> Univariate<F>,
    ) -> Result<Univariate<F>> {
        let mut acc = self.reduce(&[self.field.one()]);
        let bits = exponent.len() * 64;
        let top = (0..bits)
            .rev()
            .find(|&k| exponent[k / 64] >> (k % 64) & 1 == 1);
        let Some(top) = top else {
            return Ok(acc);
        };
        for k in (0..=top).rev() {
            control.check()?;
            acc = self.square(&acc);
            if exponent[k / 64] >> (k % 64) & 1 == 1 {
                acc = times_base(&acc);
            }
        }
        Ok(acc)
    }
}

/// a^e mod m, e as little-endian limbs (a convenience over [`Modulo::power`]).
pub fn power_mod<F: Field>(
    field: &F,
    a: &[F::Elem],
    exponent: &[u64],
    m: &[F::Elem],
    control: &Control,
) -> Result<Univariate<F>> {
    let modulo = Modulo::new(field, m);
    let base = modulo.reduce(&remainder(field, a, m));
    modulo.power(&base, exponent, control)
}
