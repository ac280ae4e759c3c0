//! The number of distinct roots in GF(Q) of a polynomial over GF(Q), Q = p^k: the work of each
//! fibre of a point count ([`super::fibres`]). Small degrees are counted in fixed-size arrays,
//! with no allocation per polynomial:
//! - degree 2 in characteristic 2: a·y² + b·y + c has one root when b = 0 (squaring is a
//!   bijection), else two or none as the absolute trace Tr(ac/b²) is 0 or 1 (substitute
//!   y = (b/a)·z to reach z² + z = ac/b²); in odd characteristic one root for a zero
//!   discriminant, else two or none as the discriminant is a square or not (Euler's
//!   criterion). Both from Lidl and Niederreiter 1983, ch. 2 and 6;
//! - degree 3 up to [`SMALL`] − 1: deg gcd(y^Q − y, f) (Cantor and Zassenhaus 1981), y^Q mod f
//!   by Frobenius steps. In characteristic 2 the squaring Σ a_i y^i ↦ Σ a_i² (y^(2i) mod f) is
//!   semilinear: the images y^(2i) mod f (the rows of Berlekamp's 1967 Frobenius matrix) are
//!   made once per polynomial, and each of the k squarings costs d squares and d·⌊d/2⌋
//!   products. In odd characteristic, square-and-multiply on the bits of Q. The degree of the
//!   gcd by Euclid's algorithm on pseudo-remainders (scaling by nonzero constants keeps the
//!   degree; no inversion).
//!
//! Over GF(2^k), 4 ≤ k ≤ 64, with the field's bit hook, degrees 3 and 4 are counted by
//! GF(2)-linear algebra instead ([`super::binary_roots`]) and the trace is a bit mask.
//!
//! Larger degrees go to the distinct-degree split of [`crate::univariate::distinct_degree`].

use super::binary_roots::BinaryRoots;
use crate::control::Control;
use crate::error::{Error, Result};
use crate::field::{field_size, Field};
use crate::univariate::distinct_degree::linear_part_for_order;

/// Polynomials of degree below this are counted in fixed-size arrays: the fibres of plane
/// curves of low degree, which are most of the work of a count.
pub const SMALL: usize = 9;

/// The most rows y^(2i) mod f, ⌈d/2⌉ ≤ i < d, that a polynomial of degree d < SMALL needs.
const ROWS: usize = SMALL / 2;

type Small<E> = [<E as Field>::Elem; SMALL];

/// How a Frobenius step is taken in GF(Q).
#[derive(Clone, Debug)]
enum Characteristic {
    /// Q = 2^k: k semilinear squarings.
    Two { k: u32 },
    /// Q odd: (Q − 1)/2 for Euler's criterion; y^Q by square-and-multiply.
    Odd { half: u64 },
}

/// Root counts in one finite field GF(Q) with Q < 2^64 − 1.
#[derive(Clone, Debug)]
pub struct RootCounter<E: Field> {
    field: E,
    /// Q as little-endian limbs.
    order: Vec<u64>,
    size: u64,
    characteristic: Characteristic,
    /// The bit-level counts of GF(2^k), when the field has them.
    binary: Option<BinaryRoots<E>>,
}

impl<E: Field> RootCounter<E> {
    pub fn new(field: &E) -> Result<Self> {
        let size = field_size(field).filter(|&n| n < u64::MAX).ok_or_else(|| {
            Error::ResourceLimit(format!(
                "roots are counted in finite fields of fewer than 2^64 - 1 elements, not {}",
                field.spec()
            ))
        })?;
        let order = field
            .order_limbs()
            .ok_or_else(|| Error::invalid("roots are counted in a finite field"))?;
        let characteristic = if field.characteristic_u64() == Some(2) {
            Characteristic::Two {
                k: size.trailing_zeros(),
            }
        } else {
            Characteristic::Odd {
                half: (size - 1) / 2,
            }
        };
        Ok(RootCounter {
            field: field.clone(),
            order,
            size,
            characteristic,
            binary: BinaryRoots::new(field),
        })
    }

    /// The number of distinct roots in GF(Q) of Σ p_i y^i (Q of them for p = 0).
    pub fn count(&self, p: &[E::Elem], control: &Control) -> Result<u128> {
        let field = &self.field;
        let Some(d) = p.iter().rposition(|c| !field.is_zero(c)) else {
            return Ok(u128::from(self.size));
        };
        Ok(match d {
            0 => 0,
            1 => 1,
            2 => self.quadratic(&p[2], &p[1], &p[0]),
            3 | 4 if self.binary.is_some() => {
                let binary = self.binary.as_ref().expect("checked just above");
                if d == 3 {
                    binary.cubic(&std::array::from_fn(|i| p[i].clone()))
                } else {
                    binary.quartic(&std::array::from_fn(|i| p[i].clone()))
                }
            }
            d if d < SMALL => self.by_frobenius(&p[..=d]),
            _ => (linear_part_for_order(field, &p[..=d], &self.order, control)?.len() - 1) as u128,
        })
    }

    /// Roots of a·y² + b·y + c, a ≠ 0.
    fn quadratic(&self, a: &E::Elem, b: &E::Elem, c: &E::Elem) -> u128 {
        let field = &self.field;
        match self.characteristic {
            Characteristic::Two { k } => {
                if field.is_zero(b) {
                    return 1;
                }
                let b_inverse = field.inv(b).expect("b is nonzero");
                let t = field.mul(&field.mul(a, c), &field.mul(&b_inverse, &b_inverse));
                if field.is_zero(&self.absolute_trace(&t, k)) {
                    2
                } else {
                    0
                }
            }
            Characteristic::Odd { half } => {
                let four = field.from_i64(4);
                let discriminant = field.sub(&field.mul(b, b), &field.mul(&four, &field.mul(a, c)));
                if field.is_zero(&discriminant) {
                    1
                } else if field.is_one(&field.pow(&discriminant, half)) {
                    2
                } else {
                    0
                }
            }
        }
    }

    /// Tr(t) = t + t² + t⁴ + ... + t^(2^(k−1)) in GF(2^k): 0 or 1.
    fn absolute_trace(&self, t: &E::Elem, k: u32) -> E::Elem {
        let field = &self.field;
        if let Some(binary) = &self.binary {
            return field.from_i64(i64::from(binary.trace_is_one(t)));
        }
        let mut power = t.clone();
        let mut sum = t.clone();
        for _ in 1..k {
            power = field.mul(&power, &power);
            sum = field.add(&sum, &power);
        }
        sum
    }

    /// deg gcd(y^Q − y, p) for 3 ≤ deg p < SMALL.
    fn by_frobenius(&self, p: &[E::Elem]) -> u128 {
        let field = &self.field;
        let d = p.len() - 1;
        let lead_inverse = field
            .inv(&p[d])
            .expect("the leading coefficient is nonzero");
        // f: the monic p, its leading 1 implicit at index d in the reductions.
        let mut f: Small<E> = std::array::from_fn(|_| field.zero());
        for (fi, pi) in f.iter_mut().zip(&p[..d]) {
            *fi = field.mul(pi, &lead_inverse);
        }
        let mut power = match self.characteristic {
            Characteristic::Two { k } => self.power_of_two_frobenius(&f, d, k),
            Characteristic::Odd { .. } => self.square_and_multiply(&f, d),
        };
        power[1] = field.sub(&power[1], &field.one());
        f[d] = field.one();
        gcd_degree(field, &mut f, &mut power) as u128
    }

    /// y^(2^k) mod f in characteristic 2 (f monic of degree d, lower coefficients given).
    fn power_of_two_frobenius(&self, f: &Small<E>, d: usize, k: u32) -> Small<E> {
        let field = &self.field;
        let half = d.div_ceil(2);
        // rows[i − half] = y^(2i) mod f for half ≤ i < d; the lower y^(2i) are monomials.
        let mut rows: [Small<E>; ROWS] =
            std::array::from_fn(|_| std::array::from_fn(|_| field.zero()));
        let mut power: Small<E> = std::array::from_fn(|j| {
            if j < d {
                field.neg(&f[j])
            } else {
                field.zero()
            }
        });
        for j in d..2 * d - 1 {
            if j % 2 == 0 && j / 2 >= half {
                rows[j / 2 - half].clone_from(&power);
            }
            times_y_mod(field, f, d, &mut power);
        }
        let mut acc: Small<E> = std::array::from_fn(|_| field.zero());
        acc[1] = field.one();
        let mut next: Small<E> = std::array::from_fn(|_| field.zero());
        for _ in 0..k {
            for c in next[..d].iter_mut() {
                *c = field.zero();
            }
            for i in 0..half {
                next[2 * i] = field.mul(&acc[i], &acc[i]);
            }
            for (i, row) in (half..d).zip(&rows) {
                if field.is_zero(&acc[i]) {
                    continue;
                }
                let square = field.mul(&acc[i], &acc[i]);
                for (n, r) in next[..d].iter_mut().zip(row) {
                    *n = field.add(n, &field.mul(&square, r));
                }
            }
            std::mem::swap(&mut acc, &mut next);
        }
        acc
    }

    /// y^Q mod f by left-to-right square-and-multiply on the bits of Q.
    fn square_and_multiply(&self, f: &Small<E>, d: usize) -> Small<E> {
        let field = &self.field;
        let order = &self.order;
        let mut acc: Small<E> = std::array::from_fn(|_| field.zero());
        acc[0] = field.one();
        let mut product: [E::Elem; 2 * SMALL] = std::array::from_fn(|_| field.zero());
        let top = (0..order.len() * 64)
            .rev()
            .find(|&k| order[k / 64] >> (k % 64) & 1 == 1);
        for k in (0..=top.unwrap_or(0)).rev() {
            square_mod(field, f, d, &mut acc, &mut product);
            if order[k / 64] >> (k % 64) & 1 == 1 {
                times_y_mod(field, f, d, &mut acc);
            }
        }
        acc
    }
}

/// acc ← acc² mod f (f monic of degree d, lower coefficients given; acc of degree < d).
fn square_mod<E: Field>(
    field: &E,
    f: &Small<E>,
    d: usize,
    acc: &mut Small<E>,
    product: &mut [E::Elem; 2 * SMALL],
) {
    for c in product[..2 * d - 1].iter_mut() {
        *c = field.zero();
    }
    for i in 0..d {
        product[2 * i] = field.add(&product[2 * i], &field.mul(&acc[i], &acc[i]));
        for j in i + 1..d {
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
fn times_y_mod<E: Field>(field: &E, f: &Small<E>, d: usize, acc: &mut Small<E>) {
    let top = acc[d - 1].clone();
    for j in (1..d).rev() {
        acc[j] = field.sub(&acc[j - 1], &field.mul(&top, &f[j]));
    }
    acc[0] = field.neg(&field.mul(&top, &f[0]));
}

/// The degree of gcd(a, b) for a ≠ 0: Euclid's algorithm where each step replaces a by
/// lc(b)·a − lc(a)·y^s·b, a nonzero multiple of a remainder step.
fn gcd_degree<E: Field>(field: &E, a: &mut Small<E>, b: &mut Small<E>) -> usize {
    let degree = |p: &Small<E>| p.iter().rposition(|c| !field.is_zero(c));
    let (mut da, mut db) = (degree(a), degree(b));
    loop {
        let Some(n) = db else {
            return da.expect("a is nonzero");
        };
        if n == 0 {
            return 0;
        }
        while let Some(m) = da.filter(|&m| m >= n) {
            let (la, lb) = (a[m].clone(), b[n].clone());
            let shift = m - n;
            if !field.is_one(&lb) {
                for c in a[..m].iter_mut() {
                    *c = field.mul(c, &lb);
                }
            }
            for j in 0..n {
                a[shift + j] = field.sub(&a[shift + j], &field.mul(&la, &b[j]));
            }
            a[m] = field.zero();
            da = a[..m].iter().rposition(|c| !field.is_zero(c));
        }
        std::mem::swap(a, b);
        std::mem::swap(&mut da, &mut db);
    }
}
