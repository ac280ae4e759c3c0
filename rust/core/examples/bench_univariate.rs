//! Univariate polynomials over finite fields (`fibrewise_core::univariate`) and the default
//! moduli of large extension fields: roots of dense polynomials of high degree, checked while
//! timing (each planted root must be found and every root found must be a root).
//!
//! Targets (issue 16 and 22, on the 2-core machine): roots of a dense degree-59049 polynomial over
//! GF(2^61 − 1) ≤ 10 s; degree 6561 over GF(2^255 − 19) ≤ 20 s; degree 2^16 over GF(2^16) ≤ 10 s;
//! the default modulus of GF(2^500) and GF(2^1000) in well under a second.

use fibrewise_core::extension::Modulus;
use fibrewise_core::field::field_order_limbs;
use fibrewise_core::field::{Field, PrimeField};
use fibrewise_core::field_kind::AnyField;
use fibrewise_core::rng::Rng;
use fibrewise_core::univariate::{
    self, equal_degree_factorization, evaluate, from_roots, gcd, monomial, multiply,
    random_element, subtract, Modulo,
};
use fibrewise_core::{with_any_field, Control};
use std::time::Instant;

fn default_moduli() {
    println!("{:40} {:>10}  modulus", "field", "seconds");
    for (p, k) in [
        (2u64, 100u32),
        (2, 500),
        (2, 1000),
        (3, 300),
        (65521, 20),
        (2, 2000),
    ] {
        let start = Instant::now();
        let m = Modulus::first_irreducible(PrimeField::new(p).unwrap(), k).unwrap();
        let text = m.text();
        let tail: String = text.split(" + ").skip(1).collect::<Vec<_>>().join(" + ");
        println!(
            "{:40} {:>10.3}  a^{k} + {tail}",
            format!("GF({p}^{k})"),
            start.elapsed().as_secs_f64()
        );
    }
}

/// Roots of a random dense polynomial of degree `degree` with `planted` roots planted; then the
/// same work by phases (x^q mod f, gcd(x^q − x, f), splitting the linear part) to show where the
/// time goes.
fn roots_of_dense(spec: &str, label: &str, degree: usize, planted: usize, target: f64) {
    let field = AnyField::parse(spec).unwrap();
    with_any_field!(&field, field => {
        let mut rng = Rng::new(degree as u64);
        let chosen: Vec<_> = (0..planted).map(|_| random_element(field, &mut rng)).collect();
        let mut rest: Vec<_> = (0..degree - planted + 1).map(|_| random_element(field, &mut rng)).collect();
        *rest.last_mut().unwrap() = field.one();
        let f = multiply(field, &rest, &from_roots(field, &chosen));
        let control = Control::new();
        let start = Instant::now();
        let found = univariate::roots(field, &f, &control).unwrap();
        let seconds = start.elapsed().as_secs_f64();
        assert!(found.iter().all(|r| field.is_zero(&evaluate(field, &f, r))));
        assert!(chosen.iter().all(|r| found.contains(r)));
        println!(
            "{:40} {:>10.2} {:>8} roots   target <= {target} s: {}",
            format!("roots, degree {degree} over {label}"),
            seconds,
            found.len(),
            if seconds <= target { "met" } else { "MISSED" }
        );
        if field.order_limbs().is_some_and(|q| q.len() > 1 || q[0] > 1 << 16) {
            phases(field, &f, &control);
        }
    });
}

/// The phases of the roots over a large field, timed one by one.
fn phases<F: Field>(field: &F, f: &[F::Elem], control: &Control) {
    let q = field_order_limbs(field, "bench").unwrap();
    let monic = univariate::monic(field, f);
    let start = Instant::now();
    let modulo = Modulo::new(field, &monic);
    let h = modulo.x_power(&q, control).unwrap();
    let powering = start.elapsed().as_secs_f64();
    let start = Instant::now();
    let linear = gcd(field, &subtract(field, &h, &monomial(field, 1)), &monic);
    let gcd_seconds = start.elapsed().as_secs_f64();
    let start = Instant::now();
    let mut rng = Rng::new(1);
    let split = equal_degree_factorization(field, &linear, 1, &mut rng, control).unwrap();
    println!(
        "    x^q mod f {powering:.2} s, gcd {gcd_seconds:.2} s, splitting {} roots {:.2} s",
        split.len(),
        start.elapsed().as_secs_f64()
    );
}

fn main() {
    // `bench_univariate roots` runs only the roots.
    let only_roots = std::env::args().any(|a| a == "roots");
    // The roots first: the default modulus of GF(2^2000) at the end takes minutes.
    roots_of_dense("GF(2305843009213693951)", "GF(2^61-1)", 59049, 20, 10.0);
    roots_of_dense(
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
        "GF(2^255-19)",
        6561,
        20,
        20.0,
    );
    roots_of_dense("GF(2^16)", "GF(2^16)", 1 << 16, 20, 10.0);
    if only_roots {
        return;
    }
    println!();
    default_moduli();
}
