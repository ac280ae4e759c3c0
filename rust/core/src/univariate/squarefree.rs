//! Squarefree parts and squarefree factorizations, correct in positive characteristic
//! (Yun 1976 in characteristic 0; its version for finite fields as in Knuth, *The Art of
//! Computer Programming* vol. 2, §4.6.2, from memory): where the derivative vanishes identically
//! the polynomial is a p-th power, and the p-th roots of its coefficients are taken (finite fields
//! are perfect).

use super::{degree, derivative, divide, gcd, monic, multiply, Univariate};
use crate::field::Field;

/// The polynomial g with g^p = w, for w a p-th power in characteristic p.
fn pth_root_polynomial<F: Field>(field: &F, w: &[F::Elem]) -> Univariate<F> {
    let p = field
        .characteristic_u64()
        .filter(|&p| p > 0)
        .expect("a vanishing derivative of a nonconstant polynomial needs characteristic p")
        as usize;
    w.iter()
        .step_by(p)
        .map(|c| field.pth_root(c).expect("positive characteristic"))
        .collect()
}

fn exact_quotient<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    divide(field, a, b).0
}

fn is_constant_or_zero<F: Field>(p: &[F::Elem]) -> bool {
    degree::<F>(p).unwrap_or(0) == 0
}

/// The monic squarefree part (product of the distinct monic irreducible factors) of p ≠ 0.
///
/// f = ∏ g_j^{e_j}: u = f / gcd(f, f') is the product of the g_j with p ∤ e_j; removing those
/// from gcd(f, f') leaves ∏_{p | e_j} g_j^{e_j}, a p-th power whose root is handled recursively.
pub fn squarefree_part<F: Field>(field: &F, f: &[F::Elem]) -> Univariate<F> {
    if is_constant_or_zero::<F>(f) {
        return vec![field.one()];
    }
    let df = derivative(field, f);
    if df.is_empty() {
        return squarefree_part(field, &pth_root_polynomial(field, f));
    }
    let mut w = gcd(field, f, &df);
    let u = exact_quotient(field, f, &w);
    loop {
        let g = gcd(field, &w, &u);
        if is_constant_or_zero::<F>(&g) {
            break;
        }
        w = exact_quotient(field, &w, &g);
    }
    let rest = if is_constant_or_zero::<F>(&w) {
        vec![field.one()]
    } else {
        squarefree_part(field, &pth_root_polynomial(field, &w))
    };
    monic(field, &multiply(field, &u, &rest))
}

/// The squarefree factorization of f ≠ 0: pairs (g_i, i) with g_i monic, squarefree, pairwise
/// coprime and of positive degree, and monic(f) = ∏ g_i^i; increasing in i.
pub fn squarefree_factorization<F: Field>(field: &F, f: &[F::Elem]) -> Vec<(Univariate<F>, usize)> {
    let f = monic(field, f);
    if is_constant_or_zero::<F>(&f) {
        return vec![];
    }
    let df = derivative(field, &f);
    let p = field.characteristic_u64().unwrap_or(0) as usize;
    if df.is_empty() {
        return squarefree_factorization(field, &pth_root_polynomial(field, &f))
            .into_iter()
            .map(|(g, e)| (g, e * p))
            .collect();
    }
    let mut out = Vec::new();
    // c holds the factors still to be counted; w the product of the distinct factors of
    // multiplicity ≥ i not divisible by p.
    let mut c = gcd(field, &f, &df);
    let mut w = exact_quotient(field, &f, &c);
    let mut i = 1;
    while !is_constant_or_zero::<F>(&w) {
        let y = gcd(field, &w, &c);
        let factor = exact_quotient(field, &w, &y);
        if !is_constant_or_zero::<F>(&factor) {
            out.push((monic(field, &factor), i));
        }
        c = exact_quotient(field, &c, &y);
        w = y;
        i += 1;
    }
    if !is_constant_or_zero::<F>(&c) {
        out.extend(
            squarefree_factorization(field, &pth_root_polynomial(field, &c))
                .into_iter()
                .map(|(g, e)| (g, e * p)),
        );
        out.sort_by_key(|(_, e)| *e);
    }
    out
}
