//! Gröbner bases against printed textbook answers.

use super::*;
use crate::field::PrimeField;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;

use crate::test_support::ring_32003 as ring;

fn basis_text(r: &Ring<PrimeField>, gens: &[&str]) -> Vec<String> {
    let gens: Vec<_> = gens.iter().map(|g| parse_poly(r, g).unwrap()).collect();
    let gb = groebner_basis(r, &gens, Engine::Buchberger, &Control::new()).unwrap();
    gb.polys.iter().map(|g| r.format(g)).collect()
}

fn parsed(r: &Ring<PrimeField>, texts: &[&str]) -> Vec<String> {
    texts
        .iter()
        .map(|t| r.format(&parse_poly(r, t).unwrap()))
        .collect()
}

/// katsura-n over GF(32003) in grevlex: its ring and equations.
fn katsura_32003(n: usize) -> (Ring<PrimeField>, Vec<crate::poly::Poly<PrimeField>>) {
    let s = crate::systems::katsura(n);
    let r = Ring::new(
        PrimeField::new(32003).unwrap(),
        s.vars.clone(),
        MonomialOrder::Grevlex,
    )
    .unwrap();
    let gens = s.polys(&r).unwrap();
    (r, gens)
}

#[test]
fn grlex_example_from_cox_little_oshea() {
    // Cox, Little, O'Shea, Ideals, Varieties, and Algorithms, §2.7 (from memory):
    // (x^3 - 2xy, x^2 y - 2y^2 + x) in grlex has reduced basis {x^2, xy, y^2 - x/2}.
    let r = ring(&["x", "y"], MonomialOrder::Grlex);
    let gb = basis_text(&r, &["x^3 - 2*x*y", "x^2*y - 2*y^2 + x"]);
    assert_eq!(gb, parsed(&r, &["x^2", "x*y", "y^2 - 1/2*x"]));
}

#[test]
fn lex_example_from_cox_little_oshea() {
    // Cox, Little, O'Shea §3.1 (from memory): x^2+y^2+z^2 = 1, x^2+z^2 = y, x = z has lex basis
    // {x - z, y - 2z^2, z^4 + z^2/2 - 1/4}.
    let r = ring(&["x", "y", "z"], MonomialOrder::Lex);
    let gb = basis_text(&r, &["x^2 + y^2 + z^2 - 1", "x^2 + z^2 - y", "x - z"]);
    assert_eq!(
        gb,
        parsed(&r, &["x - z", "y - 2*z^2", "z^4 + 1/2*z^2 - 1/4"])
    );
}

#[test]
fn unit_and_zero_ideals() {
    let r = ring(&["x", "y"], MonomialOrder::Grevlex);
    assert_eq!(basis_text(&r, &["x*y - 1", "x"]), vec!["1"]);
    assert_eq!(basis_text(&r, &["0"]), Vec::<String>::new());
    assert_eq!(basis_text(&r, &["3"]), vec!["1"]);
}

#[test]
fn membership_of_known_elements() {
    // The twisted cubic's ideal (y - x^2, z - x^3) contains xz - y^2 and y^3 - z^2 (minors of
    // the 2x3 matrix [[1, x, y], [x, y, z]]; Cox, Little, O'Shea §1.4, from memory).
    let r = ring(&["x", "y", "z"], MonomialOrder::Grevlex);
    let gens: Vec<_> = ["y - x^2", "z - x^3"]
        .iter()
        .map(|g| parse_poly(&r, g).unwrap())
        .collect();
    let gb = groebner_basis(&r, &gens, Engine::Buchberger, &Control::new()).unwrap();
    for member in ["x*z - y^2", "y^3 - z^2", "x*y - z"] {
        assert!(
            gb.contains(&parse_poly(&r, member).unwrap()).unwrap(),
            "{member}"
        );
    }
    assert!(!gb.contains(&parse_poly(&r, "x").unwrap()).unwrap());
    let nf = gb.reduce(&parse_poly(&r, "x^3 + y").unwrap()).unwrap();
    assert!(!nf.is_zero());
}

#[test]
fn degree_limit_and_interrupt() {
    let r = ring(&["x", "y", "z"], MonomialOrder::Grevlex);
    let gens: Vec<_> = ["x^2*y + z", "x*y^2 + 1", "z^3 - x"]
        .iter()
        .map(|g| parse_poly(&r, g).unwrap())
        .collect();
    let limited = Control::new().with_limits(crate::control::Limits {
        max_degree: Some(3),
        ..Default::default()
    });
    let err = groebner_basis(&r, &gens, Engine::Buchberger, &limited).unwrap_err();
    assert!(
        matches!(err, crate::Error::ResourceLimit(ref m) if m.contains("degree limit 3")),
        "{err}"
    );
    let stop = Control::new().with_interrupt(|| true);
    // The first poll happens on the first check.
    std::thread::sleep(std::time::Duration::from_millis(25));
    let err = groebner_basis(&r, &gens, Engine::Buchberger, &stop).unwrap_err();
    assert_eq!(err, crate::Error::Interrupted);
}

/// A spent time limit ends every engine with `ResourceLimit` at its first check, never with a
/// basis (katsura-7 has one of 128 solutions, many steps away). A fresh control per engine: the
/// clock is read on a control's first check and then every 256 checks.
#[test]
fn every_engine_stops_at_its_time_limit() {
    let (r, gens) = katsura_32003(7);
    for name in ENGINE_NAMES {
        let engine = Engine::from_name(name).unwrap();
        let spent = Control::new().with_limits(crate::control::Limits {
            max_time: Some(std::time::Duration::ZERO),
            ..Default::default()
        });
        let err = groebner_basis(&r, &gens, engine, &spent).unwrap_err();
        assert!(
            matches!(err, crate::Error::ResourceLimit(ref m) if m.contains("time limit")),
            "{}: {err}",
            engine.name()
        );
    }
}

#[test]
fn the_highest_degree_is_that_of_the_largest_polynomial_handled() {
    // (x^3 + y, y^3 + x): coprime leading monomials, no pair to reduce, no step; the highest
    // degree of the run is still 3 (the inputs, and the final interreduction's matrix).
    let r = ring(&["x", "y"], MonomialOrder::Grevlex);
    let gens: Vec<_> = ["x^3 + y", "y^3 + x"]
        .iter()
        .map(|g| parse_poly(&r, g).unwrap())
        .collect();
    for engine in [
        Engine::Auto,
        Engine::Buchberger,
        Engine::F4,
        Engine::F4Sampled,
        Engine::F4Signature,
    ] {
        let gb = groebner_basis(&r, &gens, engine, &Control::new()).unwrap();
        assert_eq!(gb.stats.max_degree(), 3, "{}", engine.name());
    }
}

/// The matrix limit is checked while symbolic preprocessing builds a matrix, not after: on
/// katsura-9 the first matrix over 100,000 entries is 512 x 741 (F4's step of degree 4), and
/// the limit must fire before a matrix twice the limit exists. The reference engine, which
/// builds no matrix, applies it to each S-polynomial as a one-row matrix.
#[test]
fn the_matrix_limit_fires_before_the_matrix_is_built() {
    let (r, gens) = katsura_32003(9);
    let limit = 100_000u64;
    let limited = Control::new().with_limits(crate::control::Limits {
        max_matrix_entries: Some(limit),
        ..Default::default()
    });
    for engine in [Engine::F4, Engine::F4Signature, Engine::Auto] {
        let err = groebner_basis(&r, &gens, engine, &limited).unwrap_err();
        let crate::Error::ResourceLimit(message) = err else {
            panic!("{}: {err}", engine.name());
        };
        let shape: Vec<u64> = message
            .split("needs a ")
            .nth(1)
            .and_then(|rest| rest.split(" matrix").next())
            .map(|m| m.split(" x ").map(|v| v.parse().unwrap()).collect())
            .unwrap();
        assert!(
            shape[0] * shape[1] <= 2 * limit,
            "{}: {message}",
            engine.name()
        );
    }
    let (r, gens) = katsura_32003(4);
    let tiny = Control::new().with_limits(crate::control::Limits {
        max_matrix_entries: Some(4),
        ..Default::default()
    });
    let err = groebner_basis(&r, &gens, Engine::Buchberger, &tiny).unwrap_err();
    assert!(matches!(err, crate::Error::ResourceLimit(_)), "{err}");
}
