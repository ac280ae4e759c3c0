//! Univariate polynomials over finite fields (`fibrewise_core::univariate`) and the default
//! moduli of large extension fields: roots of dense polynomials of high degree, checked while
//! timing (each planted root must be found and every root found must be a root).
//!
//! Targets (issue 16 and 22, on the 2-core machine): roots of a dense degree-59049 polynomial over
//! GF(2^61 − 1) ≤ 10 s; degree 6561 over GF(2^255 − 19) ≤ 20 s; degree 2^16 over GF(2^16) ≤ 10 s;
//! the default modulus of GF(2^500) and GF(2^1000) in well under a second.

use fibrewise_core::field::{AnyField, Field, Modulus, PrimeField};
use fibrewise_core::rng::Rng;
use fibrewise_core::univariate::{self, evaluate, from_roots, multiply, random_element};
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

/// Roots of a random dense polynomial of degree `degree` with `planted` roots planted.
fn roots_of_dense(spec: &str, label: &str, degree: usize, planted: usize, target: f64) {
    let field = AnyField::parse(spec).unwrap();
    with_any_field!(&field, field => {
        let mut rng = Rng::new(degree as u64);
        let chosen: Vec<_> = (0..planted).map(|_| random_element(field, &mut rng)).collect();
        let mut rest: Vec<_> = (0..degree - planted + 1).map(|_| random_element(field, &mut rng)).collect();
        *rest.last_mut().unwrap() = field.one();
        let f = multiply(field, &rest, &from_roots(field, &chosen));
        let start = Instant::now();
        let found = univariate::roots(field, &f, &Control::new()).unwrap();
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
    });
}

fn main() {
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
    println!();
    default_moduli();
}
