//! The quotient algebra against published solution counts, Stickelberger's theorem and
//! hand-checked factorizations over small fields.

use super::maximal::{is_maximal, residue_field_degree};
use super::radical::count_solutions;
use super::*;
use crate::control::Control;
use crate::field::{Field, PrimeField};
use crate::groebner::ReducedBasis;
use crate::groebner::{groebner_basis, Engine};
use crate::monomial::Monomial;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::{Poly, Ring};
use crate::systems::{cyclic, katsura, System};

fn basis(p: u64, vars: &[&str], gens: &[&str]) -> ReducedBasis<PrimeField> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    let r = Ring::new(PrimeField::new(p).unwrap(), names, MonomialOrder::Grevlex).unwrap();
    let gens: Vec<_> = gens.iter().map(|g| parse_poly(&r, g).unwrap()).collect();
    groebner_basis(&r, &gens, Engine::default(), &Control::new()).unwrap()
}

/// The basis of a system of the shared benchmark corpus ([`crate::systems`]).
fn corpus_basis(p: u64, system: &System) -> ReducedBasis<PrimeField> {
    basis(p, &strs(&system.vars), &strs(&system.equations))
}

fn strs(texts: &[String]) -> Vec<&str> {
    texts.iter().map(String::as_str).collect()
}

#[test]
fn cyclic5_has_70_solutions() {
    // Cyclic-5: 70 solutions, all simple (Björck and Fröberg 1991, from memory).
    let gb = corpus_basis(32003, &cyclic(5));
    let c = Control::new();
    assert_eq!(quotient_dimension(&gb, &c).unwrap(), 70);
    assert_eq!(Quotient::new(gb.clone(), &c).unwrap().dimension(), 70);
    assert_eq!(count_solutions(&gb, Engine::default(), &c).unwrap(), 70);
}

#[test]
fn katsura4_has_16_solutions() {
    // Katsura-n has 2^n solutions (Katsura 1990, from memory): the Bézout bound.
    let gb = corpus_basis(32003, &katsura(4));
    let c = Control::new();
    assert_eq!(quotient_dimension(&gb, &c).unwrap(), 16);
    assert_eq!(count_solutions(&gb, Engine::default(), &c).unwrap(), 16);
}

#[test]
fn multiplication_matrices_obey_stickelberger() {
    // (x(x-1)(x-2), y - x^2) vanishes exactly at (0,0), (1,1), (2,4), each simply; by
    // Stickelberger's theorem (Cox–Little–O'Shea, Using Algebraic Geometry, §2.4, from memory)
    // the eigenvalues of M_x, M_y are the coordinates: traces 3 and 5, M_x singular.
    let gb = basis(101, &["x", "y"], &["x*(x - 1)*(x - 2)", "y - x^2"]);
    let c = Control::new();
    let q = Quotient::new(gb.clone(), &c).unwrap();
    assert_eq!(q.dimension(), 3);
    let ring = &gb.ring;
    let trace = |m: &Vec<Vec<u64>>| (0..m.len()).fold(0, |acc, i| (acc + m[i][i]) % 101);
    let mx = q.multiplication_matrix(&ring.var(0), &c).unwrap();
    let my = q.multiplication_matrix(&ring.var(1), &c).unwrap();
    assert_eq!((trace(&mx), trace(&my)), (3, 5));
    assert_eq!(crate::echelon::rank(&ring.field, mx.clone()), 2);
    // Multiplication matrices of R/I commute.
    let product = |a: &Vec<Vec<u64>>, b: &Vec<Vec<u64>>| -> Vec<Vec<u64>> {
        (0..3)
            .map(|i| {
                (0..3)
                    .map(|j| (0..3).fold(0, |s, k| (s + a[i][k] * b[k][j]) % 101))
                    .collect()
            })
            .collect()
    };
    assert_eq!(product(&mx, &my), product(&my, &mx));
    // In grevlex x^2 leads y - x^2, then x·y and y^2 lead: standard monomials 1 < y < x.
    let names = ring.names();
    let listed: Vec<String> = q
        .standard_monomials()
        .iter()
        .map(|m| m.format(names))
        .collect();
    assert_eq!(listed, vec!["1", "y", "x"]);
    // The minimal polynomial of y is (y)(y - 1)(y - 4) = y^3 - 5y^2 + 4y.
    assert_eq!(
        q.minimal_polynomial(&ring.var(1), &c).unwrap(),
        vec![0, 4, 101 - 5, 1]
    );
}

#[test]
fn distinct_solutions_in_characteristic_three() {
    // Over GF(3): (x+1)^3 (x^2+1)^2 = 0, y^3 = 0. dim R/I = 7·3 = 21; distinct solutions over the
    // closure: x = -1 or x = ±i (x^2 + 1 is irreducible mod 3 since 3 ≡ 3 mod 4), y = 0: three.
    // (x+1)^3 = x^3 + 1 has zero derivative in characteristic 3.
    let gb = basis(3, &["x", "y"], &["(x + 1)^3*(x^2 + 1)^2", "y^3"]);
    let c = Control::new();
    assert_eq!(quotient_dimension(&gb, &c).unwrap(), 21);
    assert_eq!(count_solutions(&gb, Engine::default(), &c).unwrap(), 3);
    // The radical is ((x + 1)(x^2 + 1), y).
    let rad = radical::zero_dimensional_radical(&gb, Engine::default(), &c).unwrap();
    let expected = basis(3, &["x", "y"], &["(x + 1)*(x^2 + 1)", "y"]);
    assert_eq!(rad.polys, expected.polys);
}

#[test]
fn maximal_ideals_and_residue_degrees() {
    let c = Control::new();
    // x^2 + 1 is irreducible over GF(3): (x^2 + 1, y - x) is maximal with residue field GF(9).
    let gf9 = basis(3, &["x", "y"], &["x^2 + 1", "y - x"]);
    assert!(is_maximal(&gf9, &c).unwrap());
    assert_eq!(residue_field_degree(&gf9, &c).unwrap(), 2);
    // (x^2 + 1, y^2 + 1) over GF(3) is the two points (i, ±i) and their conjugates: two
    // Galois orbits, so R/I = GF(9) x GF(9) is not a field.
    assert!(!is_maximal(&basis(3, &["x", "y"], &["x^2 + 1", "y^2 + 1"]), &c).unwrap());
    // x^3 - 2 is irreducible over GF(7) (2 is not a cube mod 7: cubes are 0, ±1).
    let gf343 = basis(7, &["x", "y", "z"], &["x^3 - 2", "y - x^2", "z - x - y"]);
    assert!(is_maximal(&gf343, &c).unwrap());
    assert_eq!(residue_field_degree(&gf343, &c).unwrap(), 3);
    // A rational point is maximal of degree 1; a double point, two points and a curve are not.
    assert_eq!(
        residue_field_degree(&basis(5, &["x", "y"], &["x - 1", "y + 2"]), &c).unwrap(),
        1
    );
    assert!(!is_maximal(&basis(5, &["x", "y"], &["x^2", "y"]), &c).unwrap());
    assert!(!is_maximal(&basis(5, &["x", "y"], &["x^2 - 1", "y"]), &c).unwrap());
    assert!(!is_maximal(&basis(5, &["x", "y"], &["x*y - 1"]), &c).unwrap());
    assert!(!is_maximal(&basis(5, &["x", "y"], &["1"]), &c).unwrap());
    let err = residue_field_degree(&basis(5, &["x", "y"], &["x^2 - 1", "y"]), &c).unwrap_err();
    assert!(err.to_string().contains("not maximal"), "{err}");
}

#[test]
fn positive_dimensional_ideals_are_rejected() {
    let gb = basis(7, &["x", "y", "z"], &["x*y - z"]);
    let err = quotient_dimension(&gb, &Control::new()).unwrap_err();
    assert!(
        matches!(err, crate::Error::InvalidInput(ref m) if m.contains("dimension 2")),
        "{err}"
    );
    assert!(Quotient::new(gb, &Control::new()).is_err());
    // The unit ideal: R/I = 0.
    assert_eq!(
        quotient_dimension(&basis(7, &["x"], &["x", "x - 1"]), &Control::new()).unwrap(),
        0
    );
}

#[test]
fn quotient_powers_agree_with_powers_of_normal_forms() {
    // Two independent routes to x^q in R/I: vector arithmetic on the multiplication matrices,
    // and repeated squaring of polynomials with a normal form after each product.
    let gb = corpus_basis(32003, &cyclic(5));
    let c = Control::new();
    let q = Quotient::new(gb.clone(), &c).unwrap();
    let ring = &gb.ring;
    let f = crate::parse::parse_poly(ring, "x0 + 2*x1*x2 - x4^2").unwrap();
    for exponent in [vec![32003u64], vec![5, 1]] {
        let by_vectors = q.element(&q.power(&q.coordinates(&f).unwrap(), &exponent, &c).unwrap());
        let by_polys = crate::frobenius::power_modulo(&gb, &f, &exponent, &c).unwrap();
        assert_eq!(by_vectors, by_polys);
    }
}

#[test]
fn multiplication_matrices_agree_with_the_division_algorithm() {
    // Border normal forms are built from earlier ones; each column must equal the remainder of
    // x_i·b_j by the division algorithm (Cox–Little–O'Shea §2.3).
    for system in [cyclic(5), katsura(4)] {
        let gb = corpus_basis(32003, &system);
        let c = Control::new();
        let q = Quotient::new(gb.clone(), &c).unwrap();
        let ring = &gb.ring;
        for i in 0..ring.nvars() {
            let matrix = q.multiplication_matrix(&ring.var(i), &c).unwrap();
            for (j, b) in q.standard_monomials().iter().enumerate() {
                let product =
                    ring.term(b.mul(&Monomial::var_power(ring.nvars(), i, 1)).unwrap(), 1);
                let expected = q.coordinates(&product).unwrap();
                let column: Vec<u64> = matrix.iter().map(|row| row[j]).collect();
                assert_eq!(column, expected, "x{i} times {}", b.format(ring.names()));
            }
        }
    }
}

fn rational_basis(vars: &[&str], gens: &[&str]) -> ReducedBasis<crate::field::RationalField> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    let r = Ring::new(crate::field::RationalField, names, MonomialOrder::Grevlex).unwrap();
    let gens: Vec<_> = gens.iter().map(|g| parse_poly(&r, g).unwrap()).collect();
    groebner_basis(&r, &gens, Engine::default(), &Control::new()).unwrap()
}

#[test]
fn maximal_ideals_over_the_rationals() {
    let c = Control::new();
    let maximal =
        |vars: &[&str], gens: &[&str]| is_maximal(&rational_basis(vars, gens), &c).unwrap();
    // QQ(√2, √3) has degree 4 over QQ (handbook fact), so (x^2 - 2, y^2 - 3) is maximal; in
    // (x^2 - 2, y^2 - 2), (y - x)(y + x) = 0, so it is not.
    let sqrt23 = rational_basis(&["x", "y"], &["x^2 - 2", "y^2 - 3"]);
    assert!(is_maximal(&sqrt23, &c).unwrap());
    assert_eq!(residue_field_degree(&sqrt23, &c).unwrap(), 4);
    assert!(!maximal(&["x", "y"], &["x^2 - 2", "y^2 - 2"]));
    // x^2 + 1 is irreducible; x^4 + 4 = (x^2 + 2x + 2)(x^2 - 2x + 2) (Sophie Germain).
    assert!(maximal(&["x"], &["x^2 + 1"]));
    assert!(!maximal(&["x"], &["x^4 + 4"]));
    // x^4 - 10x^2 + 1, the minimal polynomial of √2 + √3, is irreducible but reducible modulo
    // every prime (Swinnerton-Dyer): degree patterns alone can never prove it.
    let sd = rational_basis(&["x", "y"], &["x^4 - 10*x^2 + 1", "y - x^2"]);
    assert!(is_maximal(&sd, &c).unwrap());
    assert_eq!(residue_field_degree(&sd, &c).unwrap(), 4);
    // The variable x alone is no primitive element of QQ(∛2, ω) = splitting field of x^3 - 2
    // (degree 6): x^3 = 2, y^2 + x*y + x^2 = 0 (y = ωx). Maximal, found through a linear form.
    let splitting = rational_basis(&["x", "y"], &["x^3 - 2", "y^2 + x*y + x^2"]);
    assert!(is_maximal(&splitting, &c).unwrap());
    assert_eq!(residue_field_degree(&splitting, &c).unwrap(), 6);
    // Non-reduced, two points, positive-dimensional and unit ideals are not maximal.
    assert!(!maximal(&["x", "y"], &["x^2", "y - 1/2"]));
    assert!(!maximal(&["x", "y"], &["x^2 - 1", "y"]));
    assert!(!maximal(&["x", "y"], &["x*y - 1"]));
    assert!(!maximal(&["x", "y"], &["1"]));
    assert!(maximal(&["x", "y"], &["x - 3/4", "y + 2"]));
    let err = residue_field_degree(&rational_basis(&["x"], &["x^4 + 4"]), &c).unwrap_err();
    assert!(err.to_string().contains("not maximal"), "{err}");
}

/// The ring of `vars` in `order` and the polynomials `gens` read in it.
fn parsed<F: Field>(
    field: F,
    vars: &[&str],
    gens: &[&str],
    order: MonomialOrder,
) -> (Ring<F>, Vec<Poly<F>>) {
    let names: Vec<String> = vars.iter().map(|s| s.to_string()).collect();
    let ring = Ring::new(field, names, order).unwrap();
    let gens = gens.iter().map(|g| parse_poly(&ring, g).unwrap()).collect();
    (ring, gens)
}

/// The reduced basis computed in `order` by the default engine (for lex: a grevlex basis and the
/// Hilbert-driven change of order, a route independent of FGLM and of Krylov sequences), as text.
fn direct_basis_text<F: Field>(
    field: F,
    vars: &[&str],
    gens: &[&str],
    order: MonomialOrder,
) -> Vec<String> {
    let (ring, gens) = parsed(field, vars, gens, order);
    let gb = groebner_basis(&ring, &gens, Engine::Auto, &Control::new()).unwrap();
    gb.polys.iter().map(|p| ring.format(p)).collect()
}

/// The same basis by a grevlex basis and a change of order.
fn changed_basis_text<F: Field>(
    field: F,
    vars: &[&str],
    gens: &[&str],
    order: MonomialOrder,
) -> Vec<String> {
    let (from, gens) = parsed(field, vars, gens, MonomialOrder::Grevlex);
    let to = from.with_order(order).unwrap();
    let gb = groebner_basis(&from, &gens, Engine::Buchberger, &Control::new()).unwrap();
    let polys = fglm::change_order(&from, &gb.polys, &to, &Control::new()).unwrap();
    polys.iter().map(|p| to.format(p)).collect()
}

#[test]
fn change_of_order_agrees_with_the_reference_engine() {
    // In and out of shape position, radical and not, several fields; the reference is the
    // basis computed directly in the target order (F4 there, Buchberger for the grevlex input).
    let systems: Vec<(&[&str], Vec<&str>)> = vec![
        (&["x", "y"], vec!["x^2 - y^3", "x*y - 1"]),
        (&["x", "y"], vec!["x^2", "x*y", "y^3 - y^2"]),
        (&["x", "y", "z"], vec!["x^2 - 1", "y^2 - 1", "z^2 - x*y"]),
        (
            &["x", "y", "z"],
            vec!["x*y + z - 2", "y^2 - x + 3", "z^3 - y*z - 1"],
        ),
        (&["x", "y"], vec!["x^3", "y^3", "x*y^2"]),
    ];
    for (vars, gens) in &systems {
        for order in [MonomialOrder::Lex, MonomialOrder::Grlex] {
            for spec in ["GF(32003)", "GF(7)", "GF(4)", "GF(9)", "Q"] {
                let any = crate::field_kind::AnyField::parse(spec).unwrap();
                crate::with_any_field!(any, field => {
                    let expected = direct_basis_text(field.clone(), vars, gens, order.clone());
                    let got = changed_basis_text(field, vars, gens, order.clone());
                    assert_eq!(got, expected, "{spec} {order:?} {gens:?}");
                });
            }
        }
    }
}

#[test]
fn shape_lex_basis_is_found_from_krylov_sequences() {
    // Katsura-4 over GF(32003) is in shape position for u4 (16 simple solutions, Bézout's bound
    // 2^4 reached; Katsura 1990, from memory): the lex basis is u_i − g_i(u4) and a degree-16
    // eliminant, and the Krylov route must find it.
    let gb = corpus_basis(32003, &katsura(4));
    let quotient = Quotient::new(gb.clone(), &Control::new()).unwrap();
    let lex = gb.ring.with_order(MonomialOrder::Lex).unwrap();
    let polys = shape::shape_lex_basis(&quotient, &lex, &Control::new())
        .unwrap()
        .expect("katsura-4 is in shape position");
    assert_eq!(polys.last().unwrap().degree(), Some(16));
    let reference = direct_basis_text(
        PrimeField::new(32003).unwrap(),
        &["u0", "u1", "u2", "u3", "u4"],
        &strs(&katsura(4).equations),
        MonomialOrder::Lex,
    );
    let mut got: Vec<String> = polys.iter().map(|p| lex.format(p)).collect();
    got.sort();
    let mut reference = reference;
    reference.sort();
    assert_eq!(got, reference);
}
