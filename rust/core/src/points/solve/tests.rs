//! Listed points against brute force over small fields (every point of GF(q)^n tried), against
//! the exact counts of [`crate::points::count_affine_points`], against Gauss's count of
//! irreducible polynomials for closed points (Lidl and Niederreiter 1983, Theorem 3.25, from
//! memory), and planted keys in power-map ciphers of our own.

use super::*;
use crate::field_kind::AnyField;
use crate::parse::parse_poly;
use crate::points::closed::closed_points;
use crate::points::count_affine_points;
use crate::univariate::tests::irreducible_count;
use crate::with_any_field;

pub(crate) fn ring_over<F: Field>(field: F, vars: &[&str]) -> Ring<F> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    Ring::new(field, names, MonomialOrder::Grevlex).unwrap()
}

/// All points of GF(q)^n where every generator vanishes, as text.
pub(crate) fn brute_force<F: Field>(ring: &Ring<F>, gens: &[Poly<F>]) -> Vec<String> {
    let elements = ring.field.small_elements(1 << 12).unwrap();
    let n = ring.nvars();
    let q = elements.len();
    let mut out = Vec::new();
    for index in 0..q.pow(n as u32) {
        let point: Vec<F::Elem> = (0..n)
            .map(|k| elements[index / q.pow(k as u32) % q].clone())
            .collect();
        if gens
            .iter()
            .all(|g| ring.field.is_zero(&ring.evaluate(g, &point).unwrap()))
        {
            out.push(text(ring, &point));
        }
    }
    out.sort();
    out
}

pub(crate) fn text<F: Field>(ring: &Ring<F>, point: &[F::Elem]) -> String {
    let parts: Vec<String> = point.iter().map(|c| ring.field.format(c)).collect();
    parts.join(",")
}

const SYSTEMS: &[(&[&str], &[&str])] = &[
    (&["x", "y"], &["x^2 + y^2 - 1", "x*y - 2"]),
    (&["x", "y"], &["x^3 - y", "y^3 - x"]),
    (&["x", "y"], &["x^2 - 2*x + 1", "y^2"]),
    (&["x", "y", "z"], &["x*y - z", "y*z - x", "z*x - y"]),
    (
        &["x", "y", "z"],
        &["x + y + z", "x*y + y*z + z*x", "x*y*z - 1"],
    ),
    // Positive dimension: a curve and a surface.
    (&["x", "y"], &["y^2 - x^3 - x - 1"]),
    (&["x", "y", "z"], &["x*y - z^2"]),
    (&["x", "y"], &["x^2 + 1", "y^2 + 1"]),
    (&["x", "y"], &["x^5 - x", "y^4 - y"]),
];

#[test]
fn listed_points_agree_with_brute_force_over_small_fields() {
    for spec in [
        "GF(2)", "GF(3)", "GF(5)", "GF(7)", "GF(4)", "GF(8)", "GF(9)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(any, field => {
            for (vars, gens) in SYSTEMS {
                let ring = ring_over(field.clone(), vars);
                let gens: Vec<_> = gens.iter().map(|g| parse_poly(&ring, g).unwrap()).collect();
                let points = rational_points(&ring, &gens, None, Engine::F4, &Control::new())
                    .unwrap();
                let mut got: Vec<String> = points.iter().map(|p| text(&ring, p)).collect();
                got.sort();
                assert_eq!(got, brute_force(&ring, &gens), "{spec} {gens:?}");
                let count = count_affine_points(&ring, &gens, Engine::F4, &Control::new()).unwrap();
                assert_eq!(got.len() as u128, count, "{spec}: count differs");
                // A limit cuts the list.
                let first = rational_points(&ring, &gens, Some(1), Engine::F4, &Control::new())
                    .unwrap();
                assert_eq!(first.len(), got.len().min(1));
            }
        });
    }
}

#[test]
fn closed_points_of_the_field_of_q_to_the_n_elements() {
    // x^(q^n) = x has one closed point per monic irreducible polynomial of degree dividing n.
    for (spec, q, n) in [
        ("GF(2)", 2u64, 4u32),
        ("GF(3)", 3, 3),
        ("GF(4)", 4, 2),
        ("GF(5)", 5, 2),
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(any, field => {
            let ring = ring_over(field.clone(), &["x"]);
            let f = format!("x^{} - x", q.pow(n));
            let gens = vec![parse_poly(&ring, &f).unwrap()];
            let points = closed_points(&ring, &gens, Engine::F4, &Control::new()).unwrap();
            for d in 1..=n {
                let expected = if n % d == 0 { irreducible_count(q, u64::from(d)) } else { 0 };
                let got = points.iter().filter(|p| p.degree == d as usize).count() as u64;
                assert_eq!(got, expected, "{spec}: degree {d}");
            }
        });
    }
}

#[test]
fn closed_points_split_the_solutions_into_orbits() {
    for spec in ["GF(2)", "GF(3)", "GF(7)", "GF(4)", "GF(9)"] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(any, field => {
            for (vars, gens) in SYSTEMS.iter().take(5).chain(SYSTEMS.iter().skip(7)) {
                let ring = ring_over(field.clone(), vars);
                let gens: Vec<_> = gens.iter().map(|g| parse_poly(&ring, g).unwrap()).collect();
                let gb = groebner_basis(&ring, &gens, Engine::F4, &Control::new()).unwrap();
                if gb.is_unit_ideal() {
                    continue;
                }
                let points = closed_points(&ring, &gens, Engine::F4, &Control::new()).unwrap();
                let solutions =
                    crate::zerodim::radical::count_solutions(&gb, Engine::F4, &Control::new())
                        .unwrap();
                let total: usize = points.iter().map(|p| p.degree).sum();
                assert_eq!(total as u128, solutions, "{spec} {gens:?}");
                let rational = points.iter().filter(|p| p.degree == 1).count();
                assert_eq!(rational, brute_force(&ring, &gens).len(), "{spec}");
                for p in &points {
                    assert!(crate::zerodim::maximal::is_maximal(&p.equations, &Control::new())
                        .unwrap());
                    assert!(gens.iter().all(|g| p.equations.contains(&p.equations.ring.adopt(g.clone())).unwrap()));
                }
            }
        });
    }
}

/// A power-map cipher of our own: state s_0 = plaintext, s_(i+1) = (s_i + k)^3, ciphertext
/// s_r + k; unknowns the key k and the states s_1..s_(r−1). Returns the ring and the equations
/// for the ciphertext of `plaintext` under `key`.
fn power_map_cipher<F: Field>(
    field: F,
    rounds: usize,
    plaintext: i64,
    key: &F::Elem,
) -> (Ring<F>, Vec<Poly<F>>) {
    let mut names = vec!["k".to_string()];
    names.extend((1..rounds).map(|i| format!("s{i}")));
    let ring = Ring::new(field.clone(), names, MonomialOrder::Grevlex).unwrap();
    let mut state = field.from_i64(plaintext);
    for _ in 0..rounds {
        state = field.pow(&field.add(&state, key), 3);
    }
    let cipher = field.add(&state, key);
    let k = ring.var(0);
    let mut previous = ring.constant(field.from_i64(plaintext));
    let mut gens = Vec::new();
    for i in 1..=rounds {
        let cube = ring.pow(&ring.add(&previous, &k), 3).unwrap();
        if i < rounds {
            gens.push(ring.sub(&ring.var(i), &cube));
            previous = ring.var(i);
        } else {
            gens.push(ring.sub(&ring.add(&cube, &k), &ring.constant(cipher.clone())));
        }
    }
    (ring, gens)
}

#[test]
fn planted_keys_of_power_map_ciphers_are_found() {
    for spec in [
        "GF(65519)",
        "GF(2305843009213693951)",
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(any, field => {
            let key = field.from_decimal("1234567");
            let (ring, gens) = power_map_cipher(field.clone(), 4, 42, &key);
            let points = rational_points(&ring, &gens, None, Engine::F4, &Control::new()).unwrap();
            assert!(points.iter().any(|p| p[0] == key), "{spec}: planted key not found");
        });
    }
}
