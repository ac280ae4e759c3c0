//! Fibre enumeration against brute force (every point of GF(q)^n tried) and against the exact
//! counts of [`crate::points::count_affine_points`], on seeded random curves and surfaces over
//! GF(2), GF(3), GF(4), GF(5), GF(7), with parameters that are variables and linear forms;
//! fibres where a leading coefficient vanishes are checked to take the fallback.

use super::*;
use crate::field_kind::AnyField;
use crate::parse::parse_poly;
use crate::points::count_affine_points;
use crate::points::solve::tests::{brute_force, ring_over, text};
use crate::rng::Rng;
use crate::test_support::random_poly;
use crate::with_any_field;

/// Every point over every fibre, as sorted texts, and the number of non-generic fibres.
fn all_fibres<F: Field>(
    ring: &Ring<F>,
    gens: &[Poly<F>],
    parameters: &[Poly<F>],
) -> (Vec<String>, u64) {
    let control = Control::new();
    let parametric = ParametricBasis::new(ring, gens, parameters, Engine::F4, &control).unwrap();
    let count = parametric.fibre_count().unwrap();
    let run = parametric
        .fibres(0, count, None, Engine::F4, &control)
        .unwrap();
    assert_eq!(run.next, count);
    let mut got: Vec<String> = run.points.iter().map(|p| text(ring, p)).collect();
    got.sort();
    (got, run.non_generic)
}

fn check_against_brute_force<F: Field>(ring: &Ring<F>, gens: &[Poly<F>], parameters: &[Poly<F>]) {
    let (got, _) = all_fibres(ring, gens, parameters);
    assert_eq!(got, brute_force(ring, gens), "{gens:?} over {parameters:?}");
    let count = count_affine_points(ring, gens, Engine::F4, &Control::new()).unwrap();
    assert_eq!(got.len() as u128, count, "{gens:?}: count differs");
}

#[test]
fn random_curves_and_surfaces_agree_with_brute_force() {
    for spec in ["GF(2)", "GF(3)", "GF(4)", "GF(5)", "GF(7)"] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(any, field => {
            let mut rng = Rng::new(17);
            for _ in 0..3 {
                // A plane curve over the parameter x, and over the linear form x + y.
                let plane = ring_over(field.clone(), &["x", "y"]);
                let mut f = random_poly(&plane, &mut rng, 5, 3);
                // y^3 keeps the curve finite over x, a random term or two on top.
                f = plane.add(&f, &parse_poly(&plane, "y^3").unwrap());
                let gens = vec![f];
                check_against_brute_force(&plane, &gens, &[plane.var(0)]);
                check_against_brute_force(&plane, &gens, &[parse_poly(&plane, "x + y").unwrap()]);
                // A surface in three variables over (x, y), and a space curve over z.
                let space = ring_over(field.clone(), &["x", "y", "z"]);
                let g = space.add(&random_poly(&space, &mut rng, 4, 2), &parse_poly(&space, "z^2").unwrap());
                check_against_brute_force(&space, std::slice::from_ref(&g), &[space.var(0), space.var(1)]);
                let h = space.add(&random_poly(&space, &mut rng, 4, 2), &parse_poly(&space, "x*y").unwrap());
                check_against_brute_force(&space, &[g, h], &[space.var(2)]);
            }
        });
    }
}

#[test]
fn fibres_where_a_leading_coefficient_vanishes_fall_back_to_a_basis() {
    // x*y^2 + y + x over x: the leading coefficient x of y^2 vanishes at x = 0, where the fibre
    // is y = 0 (one point); x*y - 1 over x: empty fibre at x = 0.
    for spec in ["GF(5)", "GF(7)", "GF(4)"] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(any, field => {
            let ring = ring_over(field.clone(), &["x", "y"]);
            for text in ["x*y^2 + y + x", "x*y - 1", "x^2*y^3 + x*y + 1"] {
                let gens = vec![parse_poly(&ring, text).unwrap()];
                let (got, non_generic) = all_fibres(&ring, &gens, &[ring.var(0)]);
                assert_eq!(got, brute_force(&ring, &gens), "{spec}: {text}");
                assert_eq!(non_generic, 1, "{spec}: {text}: only x = 0 is special");
            }
        });
    }
}

#[test]
fn a_generic_fibre_needs_no_basis_of_its_own() {
    // The specialised basis of y^2 - x^3 - x - 1 at every x is generic (y^2 is monic).
    let any = AnyField::parse("GF(7)").unwrap();
    with_any_field!(any, field => {
        let ring = ring_over(field.clone(), &["x", "y"]);
        let gens = vec![parse_poly(&ring, "y^2 - x^3 - x - 1").unwrap()];
        let (got, non_generic) = all_fibres(&ring, &gens, &[ring.var(0)]);
        assert_eq!(non_generic, 0);
        assert_eq!(got, brute_force(&ring, &gens));
    });
}

#[test]
fn parameters_with_positive_dimensional_fibres_are_enumerated_further() {
    // x*y = 0 in three variables over y: the fibre over y = 0 is the plane x free, z free.
    let any = AnyField::parse("GF(3)").unwrap();
    with_any_field!(any, field => {
        let ring = ring_over(field.clone(), &["x", "y", "z"]);
        let gens = vec![parse_poly(&ring, "x*y").unwrap()];
        let (got, _) = all_fibres(&ring, &gens, &[ring.var(1)]);
        assert_eq!(got, brute_force(&ring, &gens));
    });
}

#[test]
fn a_range_of_fibres_and_a_limit() {
    let any = AnyField::parse("GF(7)").unwrap();
    with_any_field!(any, field => {
        let ring = ring_over(field.clone(), &["x", "y"]);
        let gens = vec![parse_poly(&ring, "y^2 - x^3 - x - 1").unwrap()];
        let control = Control::new();
        let parametric = ParametricBasis::new(&ring, &gens, &[ring.var(0)], Engine::F4, &control).unwrap();
        let halves: usize = [(0, 3), (3, 4)]
            .iter()
            .map(|&(first, count)| parametric.fibres(first, count, None, Engine::F4, &control).unwrap().points.len())
            .sum();
        assert_eq!(halves, brute_force(&ring, &gens).len());
        let cut = parametric.fibres(0, 7, Some(1), Engine::F4, &control).unwrap();
        assert_eq!(cut.points.len(), 1);
        assert!(parametric.fibres(5, 3, None, Engine::F4, &control).is_err());
        assert!(parametric.fibre(&[], Engine::F4, &control).is_err());
    });
}
