//! The values of a polynomial at every element of a small finite field GF(q), and its roots read
//! off from them. On the nonzero elements g^j (g a primitive element) x^(q−1) = 1, so f folds
//! to degree < q − 1 and its values are the discrete Fourier transform of length q − 1 of the
//! folded coefficients with the root of unity g, computed by the mixed-radix splitting of
//! Cooley and Tukey (1965) over the prime factors of q − 1, each factor L by a direct transform
//! of length L: q·ΣL field operations in all. When q is not much larger than deg f this is
//! cheaper than the gcd with x^q − x (a degree-2^16 polynomial over GF(2^16) costs about
//! 2^16·(3 + 5 + 17 + 257) products).

use crate::control::Control;
use crate::error::Result;
use crate::field::Field;

/// Largest field order evaluated element by element: the values take q elements of memory.
pub const MAX_EVALUATED_ORDER: u64 = 1 << 22;

/// The field order q when it is at most [`MAX_EVALUATED_ORDER`].
pub fn small_order<F: Field>(field: &F) -> Option<u64> {
    let q: u64 = field.order()?.parse().ok()?;
    (q <= MAX_EVALUATED_ORDER).then_some(q)
}

/// The prime factors of n with multiplicity, increasing.
fn prime_factors(mut n: u64) -> Vec<u64> {
    let mut out = Vec::new();
    let mut d = 2;
    while d * d <= n {
        while n.is_multiple_of(d) {
            out.push(d);
            n /= d;
        }
        d += 1;
    }
    if n > 1 {
        out.push(n);
    }
    out
}

/// The number of field operations of the evaluation at every element of GF(q): q·(sum of the
/// prime factors of q − 1 with multiplicity).
pub fn evaluation_cost(q: u64) -> u64 {
    q.saturating_mul(prime_factors(q - 1).iter().sum())
}

/// An element of multiplicative order q − 1.
fn primitive_element<F: Field>(field: &F, q: u64) -> F::Elem {
    let n = q - 1;
    let mut divisors = prime_factors(n);
    divisors.dedup();
    (1..q)
        .map(|i| field.element_from_index(i))
        .find(|g| divisors.iter().all(|r| !field.is_one(&field.pow(g, n / r))))
        .expect("the multiplicative group of a finite field is cyclic")
}

/// The distinct roots of f ≠ 0 in GF(q), q = [`small_order`], by evaluation at every element;
/// in increasing order of discrete logarithm, 0 first.
pub fn roots_by_evaluation<F: Field>(
    field: &F,
    f: &[F::Elem],
    q: u64,
    control: &Control,
) -> Result<Vec<F::Elem>> {
    let n = (q - 1) as usize;
    let mut folded = vec![field.zero(); n];
    for (i, c) in f.iter().enumerate() {
        folded[i % n] = field.add(&folded[i % n], c);
    }
    let g = primitive_element(field, q);
    let values = transform(field, &folded, &g, &prime_factors(q - 1), control)?;
    let mut out = Vec::new();
    if f.first().is_none_or(|c| field.is_zero(c)) {
        out.push(field.zero());
    }
    let mut power = field.one();
    for v in &values {
        if field.is_zero(v) {
            out.push(power.clone());
        }
        power = field.mul(&power, &g);
    }
    Ok(out)
}

/// Σ_i c_i·w^(i·j) for j < n = c.len(), w of order n = ∏ factors.
fn transform<F: Field>(
    field: &F,
    c: &[F::Elem],
    w: &F::Elem,
    factors: &[u64],
    control: &Control,
) -> Result<Vec<F::Elem>> {
    let n = c.len();
    let Some((&l, rest)) = factors.split_last() else {
        return Ok(c.to_vec());
    };
    control.check()?;
    let l = l as usize;
    let m = n / l;
    // c_(i1 + l·i2) for fixed i1 is a sequence of length m with root w^l.
    let w_l = field.pow(w, l as u64);
    let parts: Vec<Vec<F::Elem>> = (0..l)
        .map(|i1| {
            let sub: Vec<F::Elem> = c[i1..].iter().step_by(l).cloned().collect();
            transform(field, &sub, &w_l, rest, control)
        })
        .collect::<Result<_>>()?;
    // Value j = Σ_(i1) w^(i1·j)·parts[i1][j mod m], by Horner's rule in w^j.
    let mut out = Vec::with_capacity(n);
    let mut w_j = field.one();
    for j in 0..n {
        if j % 4096 == 0 {
            control.check()?;
        }
        let k = j % m;
        let value = parts.iter().rev().fold(field.zero(), |acc, part| {
            field.add(&field.mul(&acc, &w_j), &part[k])
        });
        out.push(value);
        w_j = field.mul(&w_j, w);
    }
    Ok(out)
}

/// Whether evaluating f at every element is cheaper than the route through x^q mod f: a
/// rough operation count of the latter is deg f·log2(q)·log2(deg f) products of size deg f.
pub fn evaluation_is_cheaper(q: u64, degree: usize) -> bool {
    let d = degree.max(2) as u64;
    let log_q = 64 - u64::from(q.leading_zeros());
    let log_d = 64 - u64::from(d.leading_zeros());
    evaluation_cost(q) <= 16 * d * log_q * log_d
}
