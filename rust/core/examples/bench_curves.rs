//! Curves over finite fields (`fibrewise_core::curves`): N_1..N_g fibre by fibre and the zeta
//! function, checked while timing (the functional equation, and N_(g+1) from L(T) against a
//! count where that is cheap).
//!
//! Target (issue 19, on the 2-core machine): a genus-3 plane quartic over GF(2^8), N_1..N_3
//! (N_3 over GF(2^24), about 2^24/3 fibres) and the zeta function ≤ 5 s. The ratio printed
//! beside it, seconds per fibre for N_3 against N_2, shows how the cost per root count grows
//! with the field (GF(2^24) against GF(2^16)); the time per fibre at N_3 times the fibres of a
//! count says what a larger count would cost. CPU time (both workers) is printed beside the
//! wall-clock time, and the CPU time per fibre of N_3. A second ratio, in the same run: the root
//! count of the fibres ([`RootCounter`], for these quartics the GF(2)-linear count of
//! `curves::binary_roots`) against the general distinct-degree split (`linear_part_for_order`)
//! on the same 2^16 fibres over GF(2^24), with the counts compared. An elliptic curve over the 61-bit
//! prime 2^61 − 1 must be refused at once (not run).

use fibrewise_core::curves::root_count::RootCounter;
use fibrewise_core::curves::zeta::Zeta;
use fibrewise_core::curves::Curve;
use fibrewise_core::field::{Field, PrimeField};
use fibrewise_core::field_kind::AnyField;
use fibrewise_core::order::MonomialOrder;
use fibrewise_core::parse::parse_poly;
use fibrewise_core::univariate::distinct_degree::linear_part_for_order;
use fibrewise_core::{Control, Error, Poly, Ring};
use std::time::Instant;

mod common;
use common::cpu_seconds;

fn main() {
    quartic_over_gf256();
    root_count_against_the_general_split();
    refusal_over_a_61_bit_prime();
}

fn quartic_over_gf256() {
    // A plane quartic of our own with every power of y up to 4 in its fibres.
    let equation = "x^3*y + y^3*z + z^3*x + a*y^4 + x^2*z^2";
    let AnyField::Table(field) = AnyField::parse("GF(2^8)").unwrap() else {
        panic!("GF(2^8) has tables")
    };
    let ring = Ring::new(
        field,
        vec!["x".into(), "y".into(), "z".into()],
        MonomialOrder::Grevlex,
    )
    .unwrap();
    let f: Poly<_> = parse_poly(&ring, equation).unwrap();
    let control = Control::new();
    let cpu_start = cpu_seconds();
    let start = Instant::now();
    let curve = Curve::new(&ring, &[f], &control).unwrap();
    assert!(curve.is_smooth(), "the benchmark quartic must be smooth");
    assert_eq!(curve.genus().unwrap(), 3);
    let mut seconds_per_fibre = Vec::new();
    let mut cpu_per_fibre = None;
    let mut counts = Vec::new();
    for r in 1..=3u32 {
        let t = Instant::now();
        let cpu_before = cpu_seconds();
        counts.push(curve.count_points(r, &control).unwrap());
        let fibres = 256f64.powi(r as i32) / f64::from(r);
        seconds_per_fibre.push(t.elapsed().as_secs_f64() / fibres);
        cpu_per_fibre = cpu_seconds()
            .zip(cpu_before)
            .map(|(end, start)| (end - start) / fibres);
    }
    let zeta = Zeta::from_counts(curve.q().unwrap(), 3, &counts).unwrap();
    let seconds = start.elapsed().as_secs_f64();
    let cpu = cpu_seconds().zip(cpu_start).map(|(end, start)| end - start);
    assert!(zeta.satisfies_functional_equation());
    for (r, n) in counts.iter().enumerate() {
        assert_eq!(zeta.points(r as u32 + 1), (*n).into());
    }
    println!("genus-3 quartic {equation} over GF(2^8)");
    println!(
        "  N_1..N_3 = {counts:?}; L(T) coefficients {:?}",
        zeta.l_polynomial
    );
    println!("  Jacobian order {}", zeta.jacobian_order());
    println!(
        "  seconds per fibre: N_1 {:.2e}, N_2 {:.2e}, N_3 {:.2e} (ratio N_3/N_2 {:.2})",
        seconds_per_fibre[0],
        seconds_per_fibre[1],
        seconds_per_fibre[2],
        seconds_per_fibre[2] / seconds_per_fibre[1]
    );
    println!(
        "  CPU per fibre of N_3 (both workers): {}",
        cpu_per_fibre.map_or("?".into(), |c| format!("{c:.2e} s"))
    );
    println!(
        "  N_1..N_3 and the zeta function: {seconds:.2} s wall, {} CPU ({} rayon workers)   target <= 5 s: {}",
        cpu.map_or("?".into(), |c| format!("{c:.2} s")),
        rayon::current_num_threads(),
        if seconds <= 5.0 { "met" } else { "MISSED" }
    );
}

/// The fibres y ↦ a·y^4 + y^3 + x^3·y + x^2 + x of the benchmark quartic (chart z = 1) over
/// GF(2^24) for the first 2^16 values of x: the fixed-size count against the general split.
fn root_count_against_the_general_split() {
    let AnyField::Binary(field) = AnyField::parse("GF(2^24)").unwrap() else {
        panic!("GF(2^24) is bit-packed")
    };
    let a = field.generator().unwrap();
    let fibres: Vec<Vec<u64>> = (0..1u64 << 16)
        .map(|i| {
            let x = field.element_from_index(i * 251 + 7);
            let x2 = field.mul(&x, &x);
            vec![x2 ^ x, field.mul(&x2, &x), 0, 1, a]
        })
        .collect();
    let control = Control::new();
    let counter = RootCounter::new(&field).unwrap();
    let order = field.order_limbs().unwrap();
    let t = Instant::now();
    let fast: Vec<u128> = fibres
        .iter()
        .map(|f| counter.count(f, &control).unwrap())
        .collect();
    let fast_seconds = t.elapsed().as_secs_f64();
    let t = Instant::now();
    let general: Vec<u128> = fibres
        .iter()
        .map(|f| {
            (linear_part_for_order(&field, f, &order, &control)
                .unwrap()
                .len()
                - 1) as u128
        })
        .collect();
    let general_seconds = t.elapsed().as_secs_f64();
    assert_eq!(fast, general, "the two root counts disagree");
    let n = fibres.len() as f64;
    println!(
        "root counts of 2^16 quartic fibres over GF(2^24), one thread: RootCounter {:.2e} s per fibre, \
         general split {:.2e} s per fibre (ratio {:.1}); counts equal",
        fast_seconds / n,
        general_seconds / n,
        general_seconds / fast_seconds
    );
}

fn refusal_over_a_61_bit_prime() {
    let p = (1u64 << 61) - 1;
    let ring = Ring::new(
        PrimeField::new(p).unwrap(),
        vec!["x".into(), "y".into()],
        MonomialOrder::Grevlex,
    )
    .unwrap();
    let f = parse_poly(&ring, "y^2 - x^3 - 7").unwrap();
    let start = Instant::now();
    let curve = Curve::new(&ring, &[f], &Control::new()).unwrap();
    match curve.count_points(1, &Control::new()) {
        Err(Error::ResourceLimit(message)) => println!(
            "elliptic curve over GF(2^61 - 1): refused in {:.3} s: {message}",
            start.elapsed().as_secs_f64()
        ),
        other => panic!("expected a refusal, got {other:?}"),
    }
}
