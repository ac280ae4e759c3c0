//! Hilbert series against counting formulas, Bézout's theorem, semi-regular sequences and
//! textbook varieties.

use super::*;
use crate::field::PrimeField;
use crate::monomial::Monomial;
use crate::monomial_ideal::product_of_one_minus;
use crate::parse::parse_poly;
use crate::test_support::{numbered_ring_32003, ring_32003};

fn ring(vars: &[&str]) -> Ring<PrimeField> {
    ring_32003(vars, MonomialOrder::Grevlex)
}

fn series_of(r: &Ring<PrimeField>, gens: &[&str]) -> HilbertSeries {
    let gens: Vec<_> = gens.iter().map(|g| parse_poly(r, g).unwrap()).collect();
    hilbert_series(r, &gens, Engine::default(), &Control::new()).unwrap()
}

/// A fixed pseudo-random sequence (64-bit LCG, Knuth's MMIX constants) for generic coefficients.
struct Lcg(u64);
impl Lcg {
    fn next(&mut self, modulus: u64) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 33) % modulus
    }
}

/// A dense form of degree `d` in the ring's variables with pseudo-random coefficients.
fn random_form(r: &Ring<PrimeField>, d: u32, rng: &mut Lcg) -> Poly<PrimeField> {
    let n = r.nvars();
    let mut terms = vec![];
    let mut exps = vec![0u32; n];
    fn fill(k: usize, left: u32, exps: &mut Vec<u32>, out: &mut Vec<Vec<u32>>) {
        if k + 1 == exps.len() {
            exps[k] = left;
            out.push(exps.clone());
            return;
        }
        for e in 0..=left {
            exps[k] = e;
            fill(k + 1, left - e, exps, out);
        }
    }
    let mut all = vec![];
    fill(0, d, &mut exps, &mut all);
    for e in all {
        terms.push((Monomial::from_exponents(e).unwrap(), rng.next(32003)));
    }
    r.from_terms(terms)
}

fn binomial(n: i128, k: i128) -> i128 {
    (0..k).fold(1, |acc, i| acc * (n - i) / (i + 1))
}

#[test]
fn all_monomials_of_one_degree() {
    // (x_1..x_5)^10 has 1001 generators; the quotient has basis all monomials of degree < 10,
    // C(k + 4, 4) of degree k and C(14, 5) = 2002 in all (counting by stars and bars).
    let n = 5;
    let mut leads = vec![];
    let mut stack = vec![(vec![], 10u32)];
    while let Some((prefix, left)) = stack.pop() {
        if prefix.len() == n - 1 {
            let mut e: Vec<u32> = prefix.clone();
            e.push(left);
            leads.push(Monomial::from_exponents(e).unwrap());
            continue;
        }
        for e in 0..=left {
            let mut p = prefix.clone();
            p.push(e);
            stack.push((p, left - e));
        }
    }
    assert_eq!(leads.len(), 1001);
    let s = monomial_ideal_series(n, &leads, false, &Control::new()).unwrap();
    let expected: Vec<i128> = (0..10).map(|k| binomial(k + 4, 4)).collect();
    assert_eq!(s.numerator, expected);
    assert_eq!(s.denominator_exponent, 0);
    assert_eq!(s.degree().unwrap(), 2002);
    assert_eq!(s.regularity_index().unwrap(), 10);
}

#[test]
fn unit_zero_and_coordinate_ideals() {
    let r = ring(&["x", "y", "z"]);
    let unit = series_of(&r, &["x", "x + 1"]);
    assert_eq!((unit.numerator.clone(), unit.dimension()), (vec![], -1));
    let zero = series_of(&r, &["0"]);
    assert_eq!(
        (
            zero.numerator.clone(),
            zero.denominator_exponent,
            zero.dimension()
        ),
        (vec![1], 3, 3)
    );
    // k[x,y,z]/(x): a polynomial ring in two variables, Hilbert polynomial s + 1.
    let plane = series_of(&r, &["x"]);
    assert_eq!(plane.polynomial().unwrap(), vec![(1, 1), (1, 1)]);
}

#[test]
fn twisted_cubic() {
    // The 2x2 minors of [[x, y, z], [y, z, w]]: a projective curve of degree 3 with Hilbert
    // polynomial 3s + 1; the affine cone has dimension 2 (Cox–Little–O'Shea; Hartshorne, from memory).
    let r = ring(&["x", "y", "z", "w"]);
    let s = series_of(&r, &["x*z - y^2", "y*w - z^2", "x*w - y*z"]);
    assert_eq!(s.numerator, vec![1, 2]);
    assert_eq!(s.denominator_exponent, 2);
    assert_eq!(s.dimension(), 2);
    assert_eq!(s.degree().unwrap(), 3);
    assert_eq!(s.polynomial().unwrap(), vec![(1, 1), (3, 1)]);
    assert_eq!(s.regularity_index().unwrap(), 0);
}

#[test]
fn segre_embedding_of_p1_times_p1() {
    // The quadric surface xw - yz in P^3 (Segre image of P^1 x P^1): degree 2, dimension 2 in
    // P^3, Hilbert polynomial (s + 1)^2 (Harris, Algebraic Geometry: A First Course, chapters 2 and 13, from memory).
    let r = ring(&["x", "y", "z", "w"]);
    let s = series_of(&r, &["x*w - y*z"]);
    assert_eq!((s.degree().unwrap(), s.dimension()), (2, 3));
    assert_eq!(s.polynomial().unwrap(), vec![(1, 1), (2, 1), (1, 1)]);
    // Segre P^1 x P^2 in P^5: the 2x2 minors of a generic 2x3 matrix of variables, degree 3,
    // dimension 3 (projective), Hilbert polynomial (s + 1)(s + 2)(s + 1)/2 (Harris, Algebraic Geometry: A First Course, chapter 2).
    let r = ring(&["a", "b", "c", "d", "e", "f"]);
    let s = series_of(&r, &["a*e - b*d", "a*f - c*d", "b*f - c*e"]);
    assert_eq!((s.degree().unwrap(), s.dimension()), (3, 4));
    // (s+1)^2 (s+2) / 2 = (s^3 + 4 s^2 + 5 s + 2) / 2.
    assert_eq!(
        s.polynomial().unwrap(),
        vec![(1, 1), (5, 2), (2, 1), (1, 2)]
    );
}

#[test]
fn bezout_complete_intersections() {
    // Generic forms of degrees d_1..d_c form a complete intersection of degree d_1···d_c with
    // Hilbert series ∏ (1 - t^{d_i}) / (1 - t)^n (Bézout; Hartshorne I.7).
    let mut rng = Lcg(7);
    for (n, degrees) in [
        (3usize, vec![2u32, 3]),
        (4, vec![2, 2, 2]),
        (3, vec![2, 2, 3]),
        (4, vec![3, 2]),
    ] {
        let r = numbered_ring_32003(n);
        let gens: Vec<_> = degrees
            .iter()
            .map(|&d| random_form(&r, d, &mut rng))
            .collect();
        let s = hilbert_series(&r, &gens, Engine::default(), &Control::new()).unwrap();
        let product: i128 = degrees.iter().map(|&d| d as i128).product();
        assert_eq!(s.degree().unwrap(), product, "degrees {degrees:?}");
        assert_eq!(s.dimension(), (n - degrees.len()) as i64);
        let numerator = product_of_one_minus(degrees.iter().copied(), &Control::new()).unwrap();
        let expected = HilbertSeries::from_big_numerator(numerator, n, false).unwrap();
        assert_eq!(s, expected);
    }
}

/// [(1 - t^2)^m / (1 - t)^n]_+ : the series truncated before its first non-positive coefficient.
fn semi_regular_series(n: usize, m: usize, terms: usize) -> Vec<i128> {
    let mut c = vec![0i128; terms];
    c[0] = 1;
    for _ in 0..m {
        for i in (2..terms).rev() {
            c[i] -= c[i - 2];
        }
    }
    for _ in 0..n {
        for i in 1..terms {
            c[i] += c[i - 1];
        }
    }
    match c.iter().position(|&v| v <= 0) {
        Some(k) if m > n => c[..k].to_vec(),
        _ => c,
    }
}

#[test]
fn semi_regular_quadratic_systems() {
    // m generic quadrics in n variables (Bardet, Faugère, Salvy 2004): Hilbert series
    // (1 - t^2)^m / (1 - t)^n for m <= n, its truncation [..]_+ for m > n; e.g. n = 5, m = 6
    // gives 1 + 5t + 9t^2 + 5t^3 (REFERENCE-VALUES).
    assert_eq!(semi_regular_series(5, 6, 12), vec![1, 5, 9, 5]);
    let mut rng = Lcg(2004);
    for (n, m) in [(3usize, 3usize), (3, 4), (4, 5), (4, 6), (5, 6), (5, 3)] {
        let r = numbered_ring_32003(n);
        let gens: Vec<_> = (0..m).map(|_| random_form(&r, 2, &mut rng)).collect();
        let s = hilbert_series(&r, &gens, Engine::default(), &Control::new()).unwrap();
        let values = s.coefficients(12).unwrap();
        let expected = semi_regular_series(n, m, 12);
        let k = expected.len();
        assert_eq!(&values[..k], &expected[..], "n = {n}, m = {m}");
        if m > n {
            assert!(
                values[k..].iter().all(|&v| v == 0),
                "n = {n}, m = {m}: {values:?}"
            );
        }
    }
}

#[test]
fn affine_hilbert_function_of_a_parabola() {
    // y = x^2 in the affine plane: standard monomials y^j, x y^j in grevlex, so the affine
    // Hilbert function is 2s + 1 and the degree 2 (Cox–Little–O'Shea §9.3, from memory).
    let r = ring(&["x", "y"]);
    let s = series_of(&r, &["y - x^2"]);
    assert!(s.affine);
    assert_eq!((s.dimension(), s.degree().unwrap()), (1, 2));
    assert_eq!(s.polynomial().unwrap(), vec![(1, 1), (2, 1)]);
    assert_eq!(s.coefficients(4).unwrap(), vec![1, 3, 5, 7]);
    // The same ideal in lex is first re-based in grevlex: the answer does not change.
    let lex = r.with_order(MonomialOrder::Lex).unwrap();
    let s_lex = series_of(&lex, &["y - x^2"]);
    assert_eq!(s_lex, s);
}

#[test]
fn zero_dimensional_affine_ideal_counts_solutions_with_multiplicity() {
    // (x^2 - 1, y^3) has 2 points, each of multiplicity 3: degree 6; the affine Hilbert
    // function becomes constant 6 from degree 3 on (standard monomials x^a y^b, a < 2, b < 3).
    let r = ring(&["x", "y"]);
    let s = series_of(&r, &["x^2 - 1", "y^3"]);
    assert_eq!((s.dimension(), s.degree().unwrap()), (0, 6));
    assert_eq!(s.coefficients(6).unwrap(), vec![1, 3, 5, 6, 6, 6]);
    assert_eq!(s.polynomial().unwrap(), vec![(6, 1)]);
    assert_eq!(s.regularity_index().unwrap(), 3);
}

#[test]
fn many_variables_need_big_intermediate_coefficients() {
    // (x_1, ..., x_140): the first numerator (1 - t)^140 has the coefficient C(140, 70) > 2^127,
    // but the series of a point is 1. 132 generic linear forms in 132 variables: one point,
    // degree 1 (Bézout; a linear system of full rank has one solution).
    let leads: Vec<Monomial> = (0..140).map(|i| Monomial::var_power(140, i, 1)).collect();
    let series = monomial_ideal_series(140, &leads, false, &Control::new()).unwrap();
    assert_eq!(
        (series.numerator.clone(), series.denominator_exponent),
        (vec![1], 0)
    );
    let r = numbered_ring_32003(132);
    let mut rng = Lcg(132);
    let gens: Vec<_> = (0..132).map(|_| random_form(&r, 1, &mut rng)).collect();
    let series = hilbert_series(&r, &gens, Engine::default(), &Control::new()).unwrap();
    assert_eq!(series.degree().unwrap(), 1);
    assert_eq!(series.dimension(), 0);
    // The ideal (0) in 140 variables: 1/(1 - t)^140, degree 1; its Hilbert polynomial
    // C(s + 139, 139) has coefficients with denominators 139!, beyond 128 bits: an error.
    let zero = monomial_ideal_series(140, &[], false, &Control::new()).unwrap();
    assert_eq!(zero.degree().unwrap(), 1);
    assert!(matches!(zero.polynomial(), Err(Error::Overflow(_))));
}

#[test]
fn graded_or_affine_says_which_function() {
    // (x, y) is homogeneous: the graded function of a point is 1, 0, 0, ...; (x - 1, y) is
    // not: the affine function s -> dim R_{<=s}/I_{<=s} of a point is 1, 1, 1, ... (Cox,
    // Little, O'Shea, §9.3, from memory).
    let r = ring(&["x", "y"]);
    let graded = series_of(&r, &["x", "y"]);
    assert!(graded.graded());
    assert_eq!(
        (graded.numerator.clone(), graded.denominator_exponent),
        (vec![1], 0)
    );
    let affine = series_of(&r, &["x - 1", "y"]);
    assert!(!affine.graded());
    assert_eq!(
        (affine.numerator.clone(), affine.denominator_exponent),
        (vec![1], 1)
    );
    assert_eq!(graded.degree().unwrap(), affine.degree().unwrap());
}

#[test]
fn a_huge_exponent_is_a_resource_limit_not_an_abort() {
    // The leading ideal of x^4294967295 - 1: the numerator 1 - t^(2^32 - 1) would need 2^32
    // coefficients.
    let leads = [Monomial::var_power(1, 0, u32::MAX)];
    let control = Control::new().with_memory_budget(1 << 30);
    let err = monomial_ideal_series(1, &leads, false, &control).unwrap_err();
    assert!(
        matches!(err, Error::ResourceLimit(ref m) if m.contains("Hilbert series numerator")),
        "{err}"
    );
}

#[test]
fn non_homogeneous_basis_in_lex_is_rejected() {
    let r = ring(&["x", "y"]).with_order(MonomialOrder::Lex).unwrap();
    let gb = groebner_basis(
        &r,
        &[parse_poly(&r, "y - x^2").unwrap()],
        Engine::default(),
        &Control::new(),
    )
    .unwrap();
    let err = series_of_basis(&gb, &Control::new()).unwrap_err();
    assert!(err.to_string().contains("degree-compatible"), "{err}");
}

mod against_enumeration {
    use super::*;
    use proptest::prelude::*;

    /// Number of monomials of each degree ≤ top in n variables outside the monomial ideal.
    fn standard_by_degree(n: usize, gens: &[Vec<u32>], top: u32) -> Vec<i128> {
        let mut counts = vec![0i128; top as usize + 1];
        let mut exps = vec![0u32; n];
        loop {
            let d: u32 = exps.iter().sum();
            if d <= top
                && !gens
                    .iter()
                    .any(|g| g.iter().zip(&exps).all(|(a, b)| a <= b))
            {
                counts[d as usize] += 1;
            }
            // Next exponent vector in [0, top]^n.
            let mut k = 0;
            while k < n && exps[k] == top {
                exps[k] = 0;
                k += 1;
            }
            if k == n {
                return counts;
            }
            exps[k] += 1;
        }
    }

    proptest! {
        /// The pivot recursion against counting standard monomials one by one.
        #[test]
        fn series_counts_standard_monomials(
            gens in proptest::collection::vec(proptest::collection::vec(0u32..4, 4), 1..12)
        ) {
            let leads: Vec<Monomial> = gens.iter().map(|g| Monomial::from_exponents(g.clone()).unwrap()).collect();
            let series = monomial_ideal_series(4, &leads, false, &Control::new()).unwrap();
            prop_assert_eq!(series.coefficients(9).unwrap(), standard_by_degree(4, &gens, 8));
        }
    }
}
