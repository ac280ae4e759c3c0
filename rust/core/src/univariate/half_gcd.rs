//! The half-gcd: the product of the first quotient steps of Euclid's algorithm on (a, b), the
//! ones whose remainders keep degree at least half of deg a, computed from the top halves of a
//! and b only, recursively (Knuth 1970, Schönhage 1971; the form with two recursive calls on
//! quarter-size problems of Thull and Yap 1990). With fast products a gcd of degree n costs
//! O(M(n) log n) instead of the O(n^2) of the classical algorithm.
//!
//! The quotients of (a div x^m, b div x^m) agree with those of (a, b) as long as the
//! remainders stay above degree about m + (deg a − m)/2, which is what makes the top halves
//! enough. Whatever the inputs, the returned matrix is a product of quotient matrices
//! [[0, 1], [1, −q]], hence of determinant ±1: applying it never changes the gcd, so a gcd
//! computed through it is exact; the halving only bounds the running time.

use super::{degree, divide, multiply, subtract, trimmed, Univariate};
use crate::control::Control;
use crate::error::Result;
use crate::field::Field;

/// Below this degree the quotient steps are done one by one.
pub const HALF_GCD_THRESHOLD: usize = 96;

/// A 2×2 matrix of polynomials, acting on pairs (a, b) as column vectors.
#[derive(Clone, Debug)]
pub struct Matrix<F: Field> {
    pub entries: [[Univariate<F>; 2]; 2],
}

impl<F: Field> Matrix<F> {
    pub fn identity(field: &F) -> Self {
        Matrix {
            entries: [[vec![field.one()], vec![]], [vec![], vec![field.one()]]],
        }
    }

    /// (m00·a + m01·b, m10·a + m11·b).
    pub fn apply(&self, field: &F, a: &[F::Elem], b: &[F::Elem]) -> (Univariate<F>, Univariate<F>) {
        let row = |r: &[Univariate<F>; 2]| {
            super::add(
                field,
                &multiply(field, &r[0], a),
                &multiply(field, &r[1], b),
            )
        };
        (row(&self.entries[0]), row(&self.entries[1]))
    }

    /// [[0, 1], [1, −q]] · self: the effect of one more quotient step (a, b) ↦ (b, a − q·b).
    pub fn after_quotient(self, field: &F, q: &[F::Elem]) -> Self {
        let [top, bottom] = self.entries;
        let new_bottom = [
            subtract(field, &top[0], &multiply(field, q, &bottom[0])),
            subtract(field, &top[1], &multiply(field, q, &bottom[1])),
        ];
        Matrix {
            entries: [bottom, new_bottom],
        }
    }

    /// self · right.
    pub fn times(&self, field: &F, right: &Matrix<F>) -> Self {
        let entry = |i: usize, j: usize| {
            super::add(
                field,
                &multiply(field, &self.entries[i][0], &right.entries[0][j]),
                &multiply(field, &self.entries[i][1], &right.entries[1][j]),
            )
        };
        Matrix {
            entries: [[entry(0, 0), entry(0, 1)], [entry(1, 0), entry(1, 1)]],
        }
    }
}

/// For deg a > deg b (b may be zero): a product M of quotient matrices of Euclid's algorithm
/// on (a, b) with M·(a, b) = (c, d), deg c ≥ ⌈deg a / 2⌉ > deg d.
pub fn half_gcd<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    control: &Control,
) -> Result<Matrix<F>> {
    control.check()?;
    let n = degree::<F>(a).expect("a nonzero first argument");
    let m = n.div_ceil(2);
    if b.len() <= m {
        return Ok(Matrix::identity(field));
    }
    if n < HALF_GCD_THRESHOLD {
        return quotient_steps(field, a, b, m, control);
    }
    let r = half_gcd(field, &a[m..], &b[m..], control)?;
    let (a1, b1) = r.apply(field, a, b);
    if b1.len() <= m {
        return Ok(r);
    }
    let (q, rem) = divide(field, &a1, &b1);
    let r = r.after_quotient(field, &q);
    if rem.len() <= m {
        return Ok(r);
    }
    let l = b1.len() - 1;
    let k = (2 * m).saturating_sub(l);
    let s = half_gcd(field, &b1[k..], shifted_down(&rem, k), control)?;
    Ok(s.times(field, &r))
}

/// p div x^k (empty when deg p < k).
fn shifted_down<E>(p: &[E], k: usize) -> &[E] {
    p.get(k..).unwrap_or(&[])
}

/// The quotient steps of Euclid's algorithm while the second remainder has degree ≥ m.
fn quotient_steps<F: Field>(
    field: &F,
    a: &[F::Elem],
    b: &[F::Elem],
    m: usize,
    control: &Control,
) -> Result<Matrix<F>> {
    let mut matrix = Matrix::identity(field);
    let (mut a, mut b) = (trimmed(field, a.to_vec()), trimmed(field, b.to_vec()));
    while b.len() > m {
        control.check()?;
        let (q, r) = divide(field, &a, &b);
        matrix = matrix.after_quotient(field, &q);
        (a, b) = (b, r);
    }
    Ok(matrix)
}

/// A pair (a, b) brought down by [`reduce_pair`], with the product of its quotient matrices.
pub type ReducedPair<F> = (Univariate<F>, Univariate<F>, Option<Matrix<F>>);

/// Brings (a, b), deg a ≥ deg b, down to a pair with the same gcd and deg a below
/// [`HALF_GCD_THRESHOLD`] (or b = 0), by half-gcd steps each followed by one division;
/// returns the pair and the product T of all the quotient matrices used (T·(a, b) = result),
/// when `track` asks for it.
pub fn reduce_pair<F: Field>(
    field: &F,
    mut a: Univariate<F>,
    mut b: Univariate<F>,
    track: bool,
    control: &Control,
) -> Result<ReducedPair<F>> {
    let mut total = track.then(|| Matrix::identity(field));
    while !b.is_empty() && a.len() > HALF_GCD_THRESHOLD {
        control.check()?;
        if b.len() < a.len() {
            let m = half_gcd(field, &a, &b, control)?;
            (a, b) = m.apply(field, &a, &b);
            total = total.map(|t| m.times(field, &t));
            if b.is_empty() {
                break;
            }
        }
        let (q, r) = divide(field, &a, &b);
        total = total.map(|t| t.after_quotient(field, &q));
        (a, b) = (b, r);
    }
    Ok((a, b, total))
}
