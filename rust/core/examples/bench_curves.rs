//! Curves over finite fields (`fibrewise_core::curves`): N_1..N_g fibre by fibre and the zeta
//! function, checked while timing (the functional equation, and N_(g+1) from L(T) against a
//! count where that is cheap).
//!
//! Target (issue 19, on the 2-core machine): a genus-3 plane quartic over GF(2^8), N_1..N_3
//! (N_3 over GF(2^24), about 2^24/3 fibres) and the zeta function ≤ 5 s. The ratio printed
//! beside it, seconds per fibre for N_3 against N_2, shows how the cost per root count grows
//! with the field (GF(2^24) against GF(2^16)); the time per fibre at N_3 times the fibres of a
//! count says what a larger count would cost. An elliptic curve over the 61-bit prime
//! 2^61 − 1 must be refused at once (not run).

use fibrewise_core::curves::zeta::Zeta;
use fibrewise_core::curves::Curve;
use fibrewise_core::field::{AnyField, PrimeField};
use fibrewise_core::order::MonomialOrder;
use fibrewise_core::parse::parse_poly;
use fibrewise_core::{Control, Error, Poly, Ring};
use std::time::Instant;

fn main() {
    quartic_over_gf256();
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
    let start = Instant::now();
    let curve = Curve::new(&ring, &[f], &control).unwrap();
    assert!(curve.is_smooth(), "the benchmark quartic must be smooth");
    assert_eq!(curve.genus().unwrap(), 3);
    let mut seconds_per_fibre = Vec::new();
    let mut counts = Vec::new();
    for r in 1..=3u32 {
        let t = Instant::now();
        counts.push(curve.count_points(r, &control).unwrap());
        let fibres = 256f64.powi(r as i32) / f64::from(r);
        seconds_per_fibre.push(t.elapsed().as_secs_f64() / fibres);
    }
    let zeta = Zeta::from_counts(curve.q().unwrap(), 3, &counts).unwrap();
    let seconds = start.elapsed().as_secs_f64();
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
        "  N_1..N_3 and the zeta function: {seconds:.2} s   target <= 5 s: {}",
        if seconds <= 5.0 { "met" } else { "MISSED" }
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
