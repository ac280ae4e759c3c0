//! The monic equations of a finite projection over tiny fields against the same system over
//! GF(65521), in one run: over GF(7) the coefficients have higher degree in the parameters
//! than the field has points, so their characteristic polynomials are interpolated over an
//! extension of GF(7) (`normalization::zech`); the target is a cost about that of the
//! large-field case. And the default modulus of large binary fields (the irreducibility
//! search with packed squarings).
//!
//! Systems: two sparse equations in four variables (a random batch job of our own making).

use fibrewise_core::extension::Modulus;
use fibrewise_core::field::PrimeField;
use fibrewise_core::normalization::{project, Options};
use fibrewise_core::parse::parse_poly;
use fibrewise_core::{Control, MonomialOrder, Ring};
use std::time::Instant;

const SYSTEM: [&str; 2] = [
    "4*v2*v3^2 + 12*v0^3*v1^2*v3 + 26*v0^2*v1^3*v2^3",
    "43*v1^2*v2^2*v3^3 + 4*v0^2*v1^3*v2*v3^2",
];

/// Seconds for the summary and for the equations over GF(p), and the rank.
fn equations_over(p: u64) -> (f64, f64, usize) {
    let names = ["v0", "v1", "v2", "v3"].map(String::from).to_vec();
    let ring = Ring::new(PrimeField::new(p).unwrap(), names, MonomialOrder::Grevlex).unwrap();
    let gens: Vec<_> = SYSTEM
        .iter()
        .map(|t| parse_poly(&ring, t).unwrap())
        .collect();
    let control = Control::new();
    let start = Instant::now();
    let projection = project(&ring, &gens, None, &Options::default(), &control).unwrap();
    let summary = start.elapsed().as_secs_f64();
    let start = Instant::now();
    projection.equations(&control).unwrap();
    (
        summary,
        start.elapsed().as_secs_f64(),
        projection.summary().rank,
    )
}

fn main() {
    let (_, large, large_rank) = equations_over(65521);
    println!("GF(65521): equations {large:.3} s (rank {large_rank})");
    for p in [7, 3] {
        let (summary, small, rank) = equations_over(p);
        println!(
            "GF({p}): summary {summary:.3} s, equations {small:.3} s (rank {rank}), {:.1}x GF(65521)",
            small / large.max(1e-9)
        );
    }
    for k in [500, 1000, 2000, 4000] {
        let start = Instant::now();
        let modulus = Modulus::first_irreducible(PrimeField::new(2).unwrap(), k).unwrap();
        println!(
            "GF(2^{k}): default modulus {} in {:.3} s",
            modulus.text(),
            start.elapsed().as_secs_f64()
        );
    }
}
