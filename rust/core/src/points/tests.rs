//! Point counts against brute-force enumeration, textbook curves and the Hasse–Weil bound.

use super::*;
use crate::parse::parse_poly;
use crate::PrimeField;

fn ring(p: u64, vars: &[&str]) -> Ring<PrimeField> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    Ring::new(PrimeField::new(p).unwrap(), names, MonomialOrder::Grevlex).unwrap()
}

fn polys(r: &Ring<PrimeField>, gens: &[&str]) -> Vec<Poly<PrimeField>> {
    gens.iter().map(|g| parse_poly(r, g).unwrap()).collect()
}

fn affine(p: u64, vars: &[&str], gens: &[&str]) -> u128 {
    let r = ring(p, vars);
    count_affine_points(&r, &polys(&r, gens), Engine::default(), &Control::new()).unwrap()
}

fn projective(p: u64, vars: &[&str], gens: &[&str]) -> u128 {
    let r = ring(p, vars);
    count_projective_points(&r, &polys(&r, gens), Engine::default(), &Control::new()).unwrap()
}

/// Common zeros in GF(p)^n by trying every point.
fn enumerate(r: &Ring<PrimeField>, gens: &[Poly<PrimeField>]) -> u128 {
    let p = r.field.modulus();
    let n = r.nvars();
    let mut count = 0;
    for index in 0..p.pow(n as u32) {
        let point: Vec<u64> = (0..n).map(|i| index / p.pow(i as u32) % p).collect();
        if gens.iter().all(|g| r.evaluate(g, &point).unwrap() == 0) {
            count += 1;
        }
    }
    count
}

#[test]
fn textbook_elliptic_curve_over_gf5() {
    // y^2 = x^3 + x + 1 over GF(5): 8 affine points, 9 with the point at infinity (common
    // textbook example; also enumerated).
    assert_eq!(affine(5, &["x", "y"], &["y^2 - x^3 - x - 1"]), 8);
    assert_eq!(
        projective(5, &["x", "y", "z"], &["y^2*z - x^3 - x*z^2 - z^3"]),
        9
    );
}

#[test]
fn counts_agree_with_enumeration() {
    let systems: [(u64, &[&str], &[&str]); 9] = [
        (3, &["x", "y", "z"], &["x*y - z^2", "x + y + z + 1"]),
        (5, &["x", "y"], &["x^2 + y^2 - 1"]),
        (7, &["x", "y"], &["x^3 - y^2*x + 3", "x*y - 2"]),
        (7, &["x", "y", "z"], &["x*y*z - 1"]),
        (5, &["x", "y", "z"], &["x^2 - y^3 + z", "z^2 - x*y"]),
        (2, &["a", "b", "c", "d"], &["a*b + c*d + 1", "a + b*c*d"]),
        (3, &["x", "y"], &["x^3 - x"]),
        (11, &["x", "y"], &["y^2 - x^5 - 3*x + 1"]),
        (13, &["x", "y"], &["(x - 1)^2*(y + 2)^3", "x^2 - y^2 - 3"]),
    ];
    for (p, vars, gens) in systems {
        let r = ring(p, vars);
        let g = polys(&r, gens);
        let counted = count_affine_points(&r, &g, Engine::default(), &Control::new()).unwrap();
        assert_eq!(counted, enumerate(&r, &g), "GF({p}): {gens:?}");
    }
    // The zero ideal and the unit ideal.
    assert_eq!(affine(7, &["x", "y", "z"], &["0"]), 343);
    assert_eq!(affine(7, &["x", "y"], &["x", "x + 1"]), 0);
}

#[test]
fn union_of_all_rational_lines() {
    // x^q y - x y^q over GF(q) is the product of the q + 1 linear forms through the origin
    // defined over GF(q) (Moore determinant): every affine point lies on one, and all q + 1
    // points of P^1(GF(q)) are zeros.
    for q in [2u64, 3, 5, 7] {
        let f = format!("x^{q}*y - x*y^{q}");
        assert_eq!(affine(q, &["x", "y"], &[&f]), (q * q) as u128);
        assert_eq!(projective(q, &["x", "y"], &[&f]), (q + 1) as u128);
    }
}

#[test]
fn projective_counts_agree_with_charts_by_enumeration() {
    // Klein quartic over GF(p) and a conic: projective points = (affine cone points - 1)/(p - 1).
    for (p, gens) in [
        (5u64, vec!["x^3*y + y^3*z + z^3*x"]),
        (7, vec!["x^2 + y^2 - z^2"]),
        (3, vec!["x*y - z*w", "x^2 - y*w"]),
    ] {
        let vars: Vec<&str> = ["x", "y", "z", "w"][..if gens.len() == 2 { 4 } else { 3 }].to_vec();
        let r = ring(p, &vars);
        let g = polys(&r, &gens);
        let cone = enumerate(&r, &g);
        let counted = count_projective_points(&r, &g, Engine::default(), &Control::new()).unwrap();
        assert_eq!(counted, (cone - 1) / (p as u128 - 1), "GF({p}): {gens:?}");
    }
}

#[test]
fn hasse_weil_bound_for_elliptic_curves() {
    // y^2 = x^3 + a x + b with 4a^3 + 27b^2 ≠ 0 is a smooth genus-1 curve: its N projective
    // points satisfy |N - (q + 1)| <= 2 sqrt(q) (Hasse 1936; REFERENCE-VALUES).
    for (q, a, b) in [(31u64, 2, 3), (37, 1, 5), (43, 3, 7)] {
        assert_ne!((4 * a * a * a + 27 * b * b) % q, 0);
        let f = format!("y^2*z - x^3 - {a}*x*z^2 - {b}*z^3");
        let n = projective(q, &["x", "y", "z"], &[&f]) as f64;
        assert!(
            (n - (q as f64 + 1.0)).abs() <= 2.0 * (q as f64).sqrt(),
            "GF({q}): {n}"
        );
    }
}

#[test]
fn large_field_exponent_is_cheap() {
    // Over GF(2^61 - 1) (a Mersenne prime, ≡ 1 mod 3): x^2 = 4 has 2 roots and y^3 = 8 has 3
    // (2 times the cube roots of unity), so 6 points; x^q is reduced by repeated squaring.
    let p = (1u64 << 61) - 1;
    assert_eq!(affine(p, &["x", "y"], &["x^2 - 4", "y^3 - 8"]), 6);
    // y^2 = -1 has no root when p ≡ 3 mod 4 (2^61 - 1 ≡ 3 mod 4).
    assert_eq!(affine(p, &["x", "y"], &["x^2 - 4", "y^2 + 1"]), 0);
}

#[test]
fn projective_count_needs_homogeneous_input() {
    let r = ring(5, &["x", "y", "z"]);
    let err = count_projective_points(
        &r,
        &polys(&r, &["x^2 - y"]),
        Engine::default(),
        &Control::new(),
    )
    .unwrap_err();
    assert!(err.to_string().contains("not homogeneous"), "{err}");
}

#[test]
fn huge_univariate_exponents_are_counted_by_their_residue() {
    // x^e = 1 has gcd(e, q − 1) solutions in the cyclic group GF(q)^* (a handbook fact; Lidl and
    // Niederreiter 1983, from memory). 4294967295 = 3·5·17·257·65537, 65520 = 2^4·3^2·5·7·13.
    assert_eq!(affine(65521, &["x"], &["x^4294967295 - 1"]), 15);
    // x^4294967295 − x: 0 and the solutions of x^(2·(2^31 − 1)) = 1, gcd(2^32 − 2, 65520) = 2
    // (2^31 − 1 is prime, Euler; from memory).
    assert_eq!(affine(65521, &["x"], &["x^4294967295 - x"]), 3);
    let field = crate::field_kind::AnyField::parse("GF(2^16)").unwrap();
    crate::with_any_field!(field, f => {
        let r = Ring::new(f, vec!["x".to_string()], MonomialOrder::Grevlex).unwrap();
        let gens = vec![parse_poly(&r, "x^4294967295 - 1").unwrap()];
        // 4294967295 = 65535 · 65537: every nonzero element is a root.
        assert_eq!(count_affine_points(&r, &gens, Engine::default(), &Control::new()).unwrap(), 65535);
    });
}
