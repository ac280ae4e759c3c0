//! Finite projections (`fibrewise_core::normalization`) against one grevlex basis, measured in
//! one run: the summary (parameters, coordinates, rank, module generators, strategy) without the
//! monic equations, the equations on first use, the whole certificate, and its check from the
//! ideal alone.
//!
//! Targets (ratios in this run): summary ≤ 2x one grevlex basis; the check of a certificate at
//! most a small multiple (≤ 3x) of producing it. Systems: m dense quadrics in n variables over
//! GF(65521) (`systems::random_quadratic`, generic coefficients), whose projections are finite
//! over the last n - m variables with rank 2^m (Bézout's bound, attained by generic quadrics),
//! and a small four-variable system whose module of generators has torsion.

use fibrewise_core::field::PrimeField;
use fibrewise_core::groebner::{groebner_basis, Engine};
use fibrewise_core::normalization::{project, Options};
use fibrewise_core::parse::parse_poly;
use fibrewise_core::systems::random_quadratic;
use fibrewise_core::{Control, MonomialOrder, Poly, Ring};
use std::time::Instant;

fn seconds<T>(f: impl FnOnce() -> T) -> (T, f64) {
    let start = Instant::now();
    let value = f();
    (value, start.elapsed().as_secs_f64())
}

/// Prints one row; whether its targets are met (the summary target only where `summary_target`:
/// a basis of a tenth of a millisecond is no yardstick).
fn measure(
    title: &str,
    ring: &Ring<PrimeField>,
    gens: &[Poly<PrimeField>],
    summary_target: bool,
) -> bool {
    let control = Control::new();
    let options = Options::default();
    let (_, basis_s) = seconds(|| groebner_basis(ring, gens, Engine::default(), &control).unwrap());
    let (projection, summary_s) =
        seconds(|| project(ring, gens, None, &options, &control).unwrap());
    let (equations, equations_s) = seconds(|| projection.equations(&control).unwrap());
    let terms: usize = equations.iter().flatten().map(|c| c.len()).sum();
    let summary = projection.summary().clone();
    let certificate = fibrewise_core::normalization::FiniteProjection {
        equations,
        ..summary
    };
    let (problems, check_s) = seconds(|| certificate.verify(gens, &control).unwrap());
    let full_s = summary_s + equations_s;
    let summary_ratio = summary_s / basis_s.max(1e-6);
    let check_ratio = check_s / full_s.max(1e-6);
    println!(
        "{title:<28} {:<9} rank {:<4} gens {:<4} terms {terms:<8} basis {basis_s:7.3}s summary {summary_s:7.3}s ({summary_ratio:5.1}x) equations {equations_s:7.3}s full {full_s:7.3}s check {check_s:7.3}s ({check_ratio:4.1}x)",
        certificate.strategy.name(),
        certificate.rank,
        certificate.module_generators.len(),
    );
    if !problems.is_empty() {
        println!("  check FAILED: {problems:?}");
        return false;
    }
    (!summary_target || summary_ratio <= 2.0) && check_ratio <= 3.0
}

fn ring(names: &[String]) -> Ring<PrimeField> {
    Ring::new(
        PrimeField::new(65521).unwrap(),
        names.to_vec(),
        MonomialOrder::Grevlex,
    )
    .unwrap()
}

fn main() {
    println!("targets: summary <= 2x one grevlex basis, check <= 3x producing the certificate");
    let mut all = true;
    for (n, m) in [(8usize, 6usize), (7, 5), (8, 4)] {
        let system = random_quadratic(n, m, 1);
        let r = ring(&system.vars);
        let gens = system.polys(&r).unwrap();
        all &= measure(&format!("{m} dense quadrics, {n} vars"), &r, &gens, true);
    }
    let names: Vec<String> = ["v0", "v1", "v2", "v3"]
        .iter()
        .map(|s| s.to_string())
        .collect();
    let r = ring(&names);
    let gens: Vec<_> = [
        "4*v2*v3^2 + 12*v0^3*v1^2*v3 + 26*v0^2*v1^3*v2^3",
        "43*v1^2*v2^2*v3^3 + 4*v0^2*v1^3*v2*v3^2",
    ]
    .iter()
    .map(|t| parse_poly(&r, t).unwrap())
    .collect();
    all &= measure("two sparse, 4 vars (torsion)", &r, &gens, false);
    println!(
        "{}",
        if all {
            "targets met"
        } else {
            "a target was MISSED"
        }
    );
}
