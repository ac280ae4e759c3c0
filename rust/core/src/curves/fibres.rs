//! Points of a curve over a finite field GF(Q), counted fibre by fibre over the x-line: for each
//! x in GF(Q), the number of roots in GF(Q) of the specialised polynomial Σ c_j(x) y^j, read off
//! as deg gcd(y^Q − y, ·) with y^Q by repeated squaring modulo the fibre polynomial (Cantor and
//! Zassenhaus 1981; [`crate::univariate::distinct_degree`]), never as a dense matrix of size Q;
//! then the points at infinity of the model. When GF(Q) = GF(q^r) and the curve is defined over
//! GF(q), conjugate x (x, x^q, x^(q²), ...) have fibres of the same size, so one fibre per
//! Frobenius orbit is counted and weighted by the orbit's length.

use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::Field;
use crate::univariate::distinct_degree::linear_part_for_order;
use crate::univariate::{evaluate, gcd, monic, trimmed, Univariate};
use rayon::prelude::*;
use std::hash::{DefaultHasher, Hash, Hasher};

/// Most x-fibres counted (one root count each) before a count is refused as out of reach.
pub const FIBRE_LIMIT: u128 = 1 << 28;

/// x values handed to a worker at a time.
const CHUNK: u64 = 1 << 12;

/// A curve as the affine points (x, y) with Σ_j c_j(x) y^j = 0, plus the points at infinity of
/// its model: the roots of `at_infinity` in GF(Q), and one more point when `extra_point`.
#[derive(Clone, Debug)]
pub struct FibredCurve<E: Field> {
    /// c_0(x), c_1(x), ...: the coefficient of y^j as a polynomial in x.
    pub columns: Vec<Univariate<E>>,
    pub at_infinity: Univariate<E>,
    pub extra_point: bool,
}

/// The number of x-fibres a count over GF(q^r) goes through (one per Frobenius orbit), or an
/// error saying why the count is out of reach when there are more than [`FIBRE_LIMIT`].
pub fn check_fibre_cost(q: u64, r: u32, fibre_degree: usize) -> Result<u128> {
    let big_q = (q as f64).powi(r as i32);
    let fibres = big_q / f64::from(r);
    if fibres > FIBRE_LIMIT as f64 {
        let target = if r == 1 {
            format!("GF({q})")
        } else {
            format!("GF({q}^{r})")
        };
        return Err(Error::ResourceLimit(format!(
            "counting points over {target} fibre by fibre means about {fibres:.3e} root counts of polynomials of degree {fibre_degree} \
             (one per Frobenius orbit of x in {target}), more than the limit of 2^28 (already minutes of work; \
             2^40 would be days): point counting for large fields is not available in this edition"
        )));
    }
    Ok(fibres as u128)
}

/// #C(GF(Q)) for the curve over `field` = GF(Q) = GF(q^r), its equations defined over GF(q).
pub fn count_fibred<E: Field>(
    field: &E,
    curve: &FibredCurve<E>,
    q: u64,
    r: u32,
    control: &Control,
) -> Result<u128> {
    let order = field
        .order_limbs()
        .ok_or_else(|| Error::invalid("points are counted over a finite field"))?;
    let big_q = crate::field::field_size(field)
        .filter(|&n| n < u64::MAX)
        .ok_or_else(|| {
            Error::ResourceLimit(format!("{} is too large to go through", field.spec()))
        })?;
    let chunks = big_q.div_ceil(CHUNK);
    let affine = (0..chunks)
        .into_par_iter()
        .map(|chunk| {
            let start = chunk * CHUNK;
            let mut sum = 0u128;
            for i in start..(start + CHUNK).min(big_q) {
                control.check()?;
                let x = field.element_from_index(i);
                let weight = orbit_weight(field, &x, q, r);
                if weight > 0 {
                    let fibre = fibre_at(field, &curve.columns, &x);
                    sum += weight * count_roots(field, &fibre, &order, big_q, control)?;
                }
            }
            Ok(sum)
        })
        .try_reduce(|| 0, |a, b| Ok(a + b))?;
    let infinity = count_roots(field, &curve.at_infinity, &order, big_q, control)?;
    Ok(affine + infinity + u128::from(curve.extra_point))
}

/// Σ c_j(x) y^j.
fn fibre_at<E: Field>(field: &E, columns: &[Univariate<E>], x: &E::Elem) -> Univariate<E> {
    trimmed(
        field,
        columns.iter().map(|c| evaluate(field, c, x)).collect(),
    )
}

/// The number of roots in GF(Q) of p (Q of them for p = 0).
pub fn count_roots<E: Field>(
    field: &E,
    p: &[E::Elem],
    order: &[u64],
    big_q: u64,
    control: &Control,
) -> Result<u128> {
    Ok(match p.len() {
        0 => u128::from(big_q),
        1 => 0,
        2 => 1,
        n if n <= SMALL => count_small_roots(field, p, order) as u128,
        _ => (linear_part_for_order(field, p, order, control)?.len() - 1) as u128,
    })
}

/// Fibre polynomials of degree below this are reduced in fixed-size arrays: the fibres of
/// plane curves of low degree, which are most of the work of a count.
const SMALL: usize = 9;

/// deg gcd(y^Q − y, p) for 2 ≤ deg p < SMALL: y^Q mod p by left-to-right square-and-multiply
/// on arrays (no allocation per step; the same method as [`crate::univariate::Modulo`]).
fn count_small_roots<E: Field>(field: &E, p: &[E::Elem], order: &[u64]) -> usize {
    let f = monic(field, p);
    let d = f.len() - 1;
    let mut acc: [E::Elem; SMALL] = std::array::from_fn(|_| field.zero());
    acc[0] = field.one();
    let mut product: [E::Elem; 2 * SMALL] = std::array::from_fn(|_| field.zero());
    // In characteristic 2 a square has no cross terms.
    let cross_terms = field.characteristic_u64() != Some(2);
    let top = (0..order.len() * 64)
        .rev()
        .find(|&k| order[k / 64] >> (k % 64) & 1 == 1);
    for k in (0..=top.unwrap_or(0)).rev() {
        square_mod(field, &f, d, cross_terms, &mut acc, &mut product);
        if order[k / 64] >> (k % 64) & 1 == 1 {
            times_y_mod(field, &f, d, &mut acc);
        }
    }
    acc[1] = field.sub(&acc[1], &field.one());
    let difference = trimmed(field, acc[..d].to_vec());
    gcd(field, &difference, &f).len() - 1
}

/// acc ← acc² mod f (f monic of degree d, acc of degree < d).
fn square_mod<E: Field>(
    field: &E,
    f: &[E::Elem],
    d: usize,
    cross_terms: bool,
    acc: &mut [E::Elem; SMALL],
    product: &mut [E::Elem; 2 * SMALL],
) {
    for c in product[..2 * d - 1].iter_mut() {
        *c = field.zero();
    }
    for i in 0..d {
        product[2 * i] = field.add(&product[2 * i], &field.mul(&acc[i], &acc[i]));
        for j in (i + 1..d).filter(|_| cross_terms) {
            let t = field.mul(&acc[i], &acc[j]);
            product[i + j] = field.add(&product[i + j], &field.add(&t, &t));
        }
    }
    for k in (d..2 * d - 1).rev() {
        let c = product[k].clone();
        if field.is_zero(&c) {
            continue;
        }
        for j in 0..d {
            product[k - d + j] = field.sub(&product[k - d + j], &field.mul(&c, &f[j]));
        }
    }
    acc[..d].clone_from_slice(&product[..d]);
}

/// acc ← y·acc mod f.
fn times_y_mod<E: Field>(field: &E, f: &[E::Elem], d: usize, acc: &mut [E::Elem; SMALL]) {
    let top = acc[d - 1].clone();
    for j in (1..d).rev() {
        acc[j] = field.sub(&acc[j - 1], &field.mul(&top, &f[j]));
    }
    acc[0] = field.neg(&field.mul(&top, &f[0]));
}

/// How many fibres the fibre over x stands for: the length of its Frobenius orbit
/// {x, x^q, x^(q²), ...} for the one orbit member of least hash, 0 for the others; 1 for every
/// member of an orbit whose least hash is shared (then each counts for itself).
fn orbit_weight<E: Field>(field: &E, x: &E::Elem, q: u64, r: u32) -> u128 {
    if r == 1 {
        return 1;
    }
    let mut hashes = vec![hash_of(x)];
    let mut y = field.pow(x, q);
    while y != *x {
        hashes.push(hash_of(&y));
        y = field.pow(&y, q);
    }
    let least = *hashes.iter().min().expect("x itself");
    match hashes.iter().filter(|&&h| h == least).count() {
        1 if hashes[0] == least => hashes.len() as u128,
        1 => 0,
        _ => 1,
    }
}

fn hash_of<T: Hash>(value: &T) -> u64 {
    let mut hasher = DefaultHasher::new();
    value.hash(&mut hasher);
    hasher.finish()
}
