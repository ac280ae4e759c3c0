//! The multi-modular method against textbook bases over QQ and the reference engine over QQ.

use super::*;
use crate::groebner::buchberger;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;

fn ring(vars: &[&str], order: MonomialOrder) -> Ring<RationalField> {
    Ring::new(
        RationalField,
        vars.iter().map(|s| s.to_string()).collect(),
        order,
    )
    .unwrap()
}

fn polys(r: &Ring<RationalField>, texts: &[&str]) -> Vec<Poly<RationalField>> {
    texts.iter().map(|t| parse_poly(r, t).unwrap()).collect()
}

fn basis(r: &Ring<RationalField>, gens: &[&str]) -> Vec<Poly<RationalField>> {
    groebner_basis(r, &polys(r, gens), Engine::Buchberger, &Control::new())
        .unwrap()
        .polys
}

#[test]
fn textbook_bases_over_the_rationals() {
    // Cox, Little, O'Shea, Ideals, Varieties, and Algorithms, §2.7 and §3.1 (from memory).
    let r = ring(&["x", "y"], MonomialOrder::Grlex);
    assert_eq!(
        basis(&r, &["x^3 - 2*x*y", "x^2*y - 2*y^2 + x"]),
        polys(&r, &["x^2", "x*y", "y^2 - 1/2*x"])
    );
    let r = ring(&["x", "y", "z"], MonomialOrder::Lex);
    assert_eq!(
        basis(&r, &["x^2 + y^2 + z^2 - 1", "x^2 + z^2 - y", "x - z"]),
        polys(&r, &["x - z", "y - 2*z^2", "z^4 + 1/2*z^2 - 1/4"])
    );
}

#[test]
fn rational_reconstruction_recovers_small_fractions() {
    let m = BigInt::from(1_000_000_007u64) * BigInt::from(998_244_353u64);
    for (a, b) in [(3i64, 4i64), (-7, 13), (0, 1), (123456, 789), (-1, 99991)] {
        let b_inv = BigInt::from(b).modinv(&m).unwrap();
        let u = (BigInt::from(a) * b_inv).mod_floor(&m);
        assert_eq!(
            rational_reconstruction(&u, &m),
            Some(BigRational::new(a.into(), b.into()))
        );
    }
    // Modulo 101 every answer obeys the bound sqrt(101/2) ≈ 7 and the congruence; some
    // residues have none.
    let m = BigInt::from(101);
    let mut found = 0;
    for u in 0..101 {
        if let Some(q) = rational_reconstruction(&BigInt::from(u), &m) {
            assert!(
                q.numer().abs() <= BigInt::from(7) && *q.denom() <= BigInt::from(7),
                "{u}: {q}"
            );
            assert_eq!(
                (q.numer() - BigInt::from(u) * q.denom()).mod_floor(&m),
                BigInt::zero()
            );
            found += 1;
        }
    }
    assert!(found < 101);
}

#[test]
fn unlucky_first_prime_is_outvoted() {
    // With p the first prime used, (x^2 - p*y, x*y) has basis {x^2 - p*y, x*y, y^2} over QQ
    // (y·(x^2 - p y) - x·(x y) = -p y^2), but only {x^2, x*y} mod p: p is unlucky.
    let p = PrimeSequence::new().next_good(&[]);
    let r = ring(&["x", "y"], MonomialOrder::Grevlex);
    let g1 = format!("x^2 - {p}*y");
    let got = basis(&r, &[&g1, "x*y"]);
    assert_eq!(got, polys(&r, &[&g1, "x*y", "y^2"]));
}

#[test]
fn large_coefficients_need_several_primes() {
    // Lex basis of {3x - 10^40, y^2 - x y + 7/11}: x = 10^40/3, so y^2 - (10^40/3) y + 7/11.
    let r = ring(&["x", "y"], MonomialOrder::Lex);
    let gens = polys(&r, &["3*x - 10^40", "y^2 - x*y + 7/11"]);
    let gb = groebner_basis(&r, &gens, Engine::Buchberger, &Control::new()).unwrap();
    assert_eq!(
        gb.polys,
        polys(&r, &["x - 10^40/3", "y^2 - 10^40/3*y + 7/11"])
    );
    assert!(
        gb.stats.engine.contains("multi-modular"),
        "{}",
        gb.stats.engine
    );
}

#[test]
fn agrees_with_the_reference_engine_run_over_the_rationals() {
    // Small systems with rational coefficients: the direct Buchberger run over QQ (no
    // modular arithmetic) must give the same reduced basis.
    let systems: [(&[&str], &[&str], MonomialOrder); 4] = [
        (
            &["x", "y", "z"],
            &["x^2 + 2/3*y*z - 1", "y^2 - 5/7*x*z + 2", "z^2 - x*y + 1/2"],
            MonomialOrder::Grevlex,
        ),
        (
            &["x", "y", "z"],
            &["x*y - 3/2*z", "y*z - 1/5*x", "x*z - 7*y + 1"],
            MonomialOrder::Lex,
        ),
        (
            &["x", "y"],
            &["x^3 - 1/3*y^2 + x", "x*y^2 - 4/9"],
            MonomialOrder::Grlex,
        ),
        (
            &["x", "y", "z"],
            &["x + y + z", "x*y + y*z + z*x", "x*y*z - 1"],
            MonomialOrder::Lex,
        ),
    ];
    for (vars, gens, order) in systems {
        let r = ring(vars, order);
        let gens = polys(&r, gens);
        let (direct, _) = buchberger::compute(&r, &gens, &Control::new()).unwrap();
        let modular = groebner_basis(&r, &gens, Engine::Buchberger, &Control::new()).unwrap();
        assert_eq!(
            modular.polys,
            direct,
            "{:?}",
            modular
                .polys
                .iter()
                .map(|g| r.format(g))
                .collect::<Vec<_>>()
        );
    }
}

#[test]
fn unit_and_zero_ideals() {
    let r = ring(&["x", "y"], MonomialOrder::Grevlex);
    assert_eq!(basis(&r, &["x*y - 1", "x"]), polys(&r, &["1"]));
    assert!(basis(&r, &["0"]).is_empty());
    assert_eq!(basis(&r, &["2/3"]), polys(&r, &["1"]));
}

#[test]
fn verification_rejects_wrong_lifts() {
    // Cox, Little, O'Shea §2.7 (from memory): {x^2, xy, y^2 - x/2} is the grlex basis of
    // (x^3 - 2xy, x^2 y - 2y^2 + x). A wrong coefficient, a missing element, or an ideal that
    // does not contain the input must all be rejected.
    let r = ring(&["x", "y"], MonomialOrder::Grlex);
    let gens = polys(&r, &["x^3 - 2*x*y", "x^2*y - 2*y^2 + x"]);
    let c = Control::new();
    let good = polys(&r, &["x^2", "x*y", "y^2 - 1/2*x"]);
    assert!(verify::is_groebner_basis_containing(&r, &good, &gens, &c).unwrap());
    let wrong_coefficient = polys(&r, &["x^2", "x*y", "y^2 - 1/3*x"]);
    assert!(!verify::is_groebner_basis_containing(&r, &wrong_coefficient, &gens, &c).unwrap());
    // Not a Gröbner basis: y·(x^2 + y) − x·(x y) = y^2 has a leading term outside ⟨x^2, xy⟩.
    let not_gb = polys(&r, &["x^2 + y", "x*y"]);
    assert!(
        !verify::is_groebner_basis_containing(&r, &not_gb, &polys(&r, &["x^2 + y"]), &c).unwrap()
    );
    // A Gröbner basis of a smaller ideal than the input's.
    let smaller = polys(&r, &["x^2"]);
    assert!(!verify::is_groebner_basis_containing(&r, &smaller, &gens, &c).unwrap());
}
