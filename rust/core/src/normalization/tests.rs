//! Noether normalization against textbook examples, tampered certificates and random ideals.

use super::finiteness::standard_monomials;
use super::*;
use crate::field::PrimeField;
use crate::parse::parse_poly;

pub(super) type P = Poly<PrimeField>;

pub(super) fn ring(p: u64, vars: &[&str]) -> Ring<PrimeField> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    Ring::new(PrimeField::new(p).unwrap(), names, MonomialOrder::Grevlex).unwrap()
}

pub(super) fn polys(r: &Ring<PrimeField>, texts: &[&str]) -> Vec<P> {
    texts.iter().map(|t| parse_poly(r, t).unwrap()).collect()
}

fn normalize(r: &Ring<PrimeField>, gens: &[P]) -> FiniteProjection<PrimeField> {
    noether_normalization(r, gens, &Options::default(), &Control::new()).unwrap()
}

fn assert_verifies(nn: &FiniteProjection<PrimeField>, gens: &[P]) {
    let problems = nn.verify(gens, &Control::new()).unwrap();
    assert!(problems.is_empty(), "{problems:?} for {:?}", nn.to_text());
}

/// dim_k of R/J for a zero-dimensional J, by counting standard monomials of its grevlex basis.
/// The projection onto the given variables, proved by the elimination-order test (panics if
/// the ring is not finite over them).
fn over_variables(
    r: &Ring<PrimeField>,
    gens: &[P],
    params: &[usize],
) -> FiniteProjection<PrimeField> {
    let change = changes::Change::variables(params, r.nvars());
    let test = finiteness::Test::Elimination;
    let proof = finiteness::test_change(r, gens, &change, test, &Control::new())
        .unwrap()
        .unwrap();
    certificate::summary(r, &change, proof, false, &Control::new())
        .unwrap()
        .into_certificate(&Control::new())
        .unwrap()
}

fn quotient_dimension(r: &Ring<PrimeField>, gens: &[P]) -> usize {
    let gb = groebner_basis(r, gens, Engine::default(), &Control::new()).unwrap();
    if gb.is_unit_ideal() {
        return 0;
    }
    let all: Vec<usize> = (0..r.nvars()).collect();
    standard_monomials(
        &gb.leading_monomials(),
        &all,
        r.nvars(),
        100_000,
        &Control::new(),
    )
    .unwrap()
    .len()
}

#[test]
fn coordinate_cross_needs_a_linear_change() {
    // xy = 0: neither k[x] nor k[y] works (the other axis is a whole fiber); x + c·y does,
    // with rank 2 (two lines). Textbook example (Eisenbud, Commutative Algebra, §13, from memory).
    let r = ring(32003, &["x", "y"]);
    let gens = polys(&r, &["x*y"]);
    let nn = normalize(&r, &gens);
    assert_eq!(nn.dimension, 1);
    assert_eq!(nn.strategy, Strategy::Linear);
    assert!(nn.homogeneous);
    assert_eq!(nn.rank, 2);
    assert_verifies(&nn, &gens);
    // Over GF(2) the only candidate x + y works as well.
    let r2 = ring(2, &["x", "y"]);
    let gens2 = polys(&r2, &["x*y"]);
    let nn2 = normalize(&r2, &gens2);
    assert_eq!(nn2.strategy, Strategy::Linear);
    assert_verifies(&nn2, &gens2);
}

#[test]
fn cusp_is_finite_over_one_variable() {
    // y^2 = x^3: finite over k[x] of rank 2 and over k[y] of rank 3 (Reid, Undergraduate
    // Commutative Algebra, §4, from memory). The grevlex leading term x^3 makes k[y] free.
    let r = ring(32003, &["x", "y"]);
    let gens = polys(&r, &["y^2 - x^3"]);
    let nn = normalize(&r, &gens);
    assert_eq!((nn.dimension, nn.strategy), (1, Strategy::Variables));
    assert_eq!(nn.parameters, polys(&r, &["y"]));
    assert_eq!(nn.rank, 3);
    assert_verifies(&nn, &gens);
    // Over k[x]: the eliminating candidate with parameter x has rank 2.
    let over_x = over_variables(&r, &gens, &[0]);
    assert_eq!(over_x.rank, 2);
    assert_verifies(&over_x, &gens);
}

#[test]
fn affine_twisted_cubic_has_rank_one() {
    // (t, t^2, t^3): y = x^2, z = x^3, finite over k[x] of rank 1 (Cox–Little–O'Shea §1.2).
    let r = ring(32003, &["x", "y", "z"]);
    let gens = polys(&r, &["y - x^2", "z - x^3"]);
    let nn = normalize(&r, &gens);
    assert_eq!(nn.dimension, 1);
    assert_verifies(&nn, &gens);
    let over_x = over_variables(&r, &gens, &[0]);
    assert_eq!(over_x.rank, 1);
    // y = x^2 and z = x^3 as equations of degree 1.
    let eq_text: Vec<Vec<String>> = over_x.to_text().equations;
    assert_eq!(eq_text[1], vec!["1", "-t1^2"]);
    assert_eq!(eq_text[2], vec!["1", "-t1^3"]);
}

#[test]
fn twisted_cubic_cone_has_rank_three() {
    // The cone over the twisted cubic, 2x2 minors of [[x, y, z], [y, z, w]]: dimension 2,
    // degree 3 (Harris, Algebraic Geometry, Example 18.?; Cox–Little–O'Shea §8.4, from memory),
    // and a finite linear projection has degree equal to the degree of the variety.
    let r = ring(32003, &["x", "y", "z", "w"]);
    let gens = polys(&r, &["x*z - y^2", "y*w - z^2", "x*w - y*z"]);
    let nn = normalize(&r, &gens);
    assert_eq!(nn.dimension, 2);
    assert_eq!(nn.rank, 3);
    assert!(nn.homogeneous);
    assert!(nn.strategy != Strategy::Nonlinear);
    assert_verifies(&nn, &gens);
}

#[test]
fn zero_dimensional_maximal_ideal() {
    // (x^2 + 1, y - x) over GF(3) is maximal: x^2 + 1 is irreducible since -1 is not a square
    // mod 3 (3 ≡ 3 mod 4). R/I = GF(9): d = 0, rank 2, univariate monic equations.
    let r = ring(3, &["x", "y"]);
    let gens = polys(&r, &["x^2 + 1", "y - x"]);
    let nn = normalize(&r, &gens);
    assert_eq!((nn.dimension, nn.rank), (0, 2));
    assert!(nn.parameters.is_empty());
    for eq in nn.to_text().equations {
        assert_eq!(eq, vec!["1", "0", "1"]);
    }
    assert_verifies(&nn, &gens);
}

#[test]
fn zero_ideal_and_unit_ideal() {
    let r = ring(7, &["x", "y"]);
    let nn = normalize(&r, &[]);
    assert_eq!(nn.dimension, 2);
    assert_eq!(nn.parameters, polys(&r, &["x", "y"]));
    assert_eq!(
        nn.to_text().equations,
        vec![vec!["1", "-t1"], vec!["1", "-t2"]]
    );
    assert_verifies(&nn, &[]);
    let err = noether_normalization(
        &r,
        &polys(&r, &["x", "x - 1"]),
        &Options::default(),
        &Control::new(),
    )
    .unwrap_err();
    assert!(
        err.to_string()
            .contains("no solutions over the algebraic closure"),
        "{err}"
    );
}

#[test]
fn rational_lines_need_a_nonlinear_change() {
    // x^q y - x y^q over GF(q) is the union of the q + 1 GF(q)-rational lines through 0 (it is
    // the product of the linear forms over GF(q), Lidl–Niederreiter, Finite Fields, ch. 3).
    // Every linear form over GF(q) vanishes on one of these lines, so no linear parameter exists.
    for q in [2u64, 3, 5, 7] {
        let r = ring(q, &["x", "y"]);
        let gens = polys(
            &r,
            &["x^".to_string() + &q.to_string() + "*y - x*y^" + &q.to_string()]
                .iter()
                .map(String::as_str)
                .collect::<Vec<_>>(),
        );
        let nn = normalize(&r, &gens);
        assert_eq!(nn.dimension, 1);
        assert_eq!(nn.strategy, Strategy::Nonlinear, "q = {q}");
        assert!(!nn.homogeneous);
        // The smallest exponent works: p = y ± x^2 (or x ± y^2). It has degree 1 on one line
        // and degree 2 on each of the q others, so the rank is 2q + 1.
        let p = r.format(&nn.parameters[0]);
        assert!(
            ["x^2 + y", "-x^2 + y", "y^2 + x", "-y^2 + x"].contains(&p.as_str()),
            "q = {q}: parameter {p}"
        );
        assert_eq!(nn.rank, 2 * q as usize + 1, "q = {q}");
        assert_verifies(&nn, &gens);
    }
}

#[test]
fn tampered_certificates_are_rejected() {
    let r = ring(32003, &["x", "y"]);
    let gens = polys(&r, &["x*y"]);
    let nn = normalize(&r, &gens);
    let good = nn.to_text();
    let check =
        |text: &CertificateText| check_certificate(&r, &gens, text, &Control::new()).unwrap();
    assert!(check(&good).is_empty());

    let mut changed = good.clone();
    let last = changed.equations[0].len() - 1;
    changed.equations[0][last] = format!("({}) + 1", changed.equations[0][last]);
    let problems = check(&changed);
    assert!(
        problems
            .iter()
            .any(|p| p.contains("equation for x does not lie in the ideal")),
        "{problems:?}"
    );

    let mut dropped = good.clone();
    dropped.equations.pop();
    let problems = check(&dropped);
    assert!(
        problems
            .iter()
            .any(|p| p.contains("1 equations for 2 variables")),
        "{problems:?}"
    );

    let mut wrong_d = good.clone();
    wrong_d.dimension = 0;
    let problems = check(&wrong_d);
    assert!(problems.iter().any(|p| p.contains("d = 0")), "{problems:?}");

    let mut not_monic = good.clone();
    not_monic.equations[1][0] = "2".into();
    let problems = check(&not_monic);
    assert!(
        problems
            .iter()
            .any(|p| p.contains("equation for y is not monic")),
        "{problems:?}"
    );

    let mut bad_inverse = good.clone();
    bad_inverse.inverse[0] = format!("{} + 1", bad_inverse.inverse[0]);
    let problems = check(&bad_inverse);
    assert!(
        problems.iter().any(|p| p.contains("inverse image of x")),
        "{problems:?}"
    );

    let mut unreadable = good;
    unreadable.parameters[0] = "x +* y".into();
    let problems = check(&unreadable);
    assert!(problems[0].starts_with("parameter 1:"), "{problems:?}");
}

#[test]
fn fiber_dimension_is_bounded_by_module_generators() {
    // Cone over the twisted cubic: the fiber over a point is a finite set of at most
    // #module generators points (with multiplicity); over a generic point exactly rank = 3.
    let r = ring(32003, &["x", "y", "z", "w"]);
    let gens = polys(&r, &["x*z - y^2", "y*w - z^2", "x*w - y*z"]);
    let nn = normalize(&r, &gens);
    let fiber = nn.fiber(&gens, &[5, 11]).unwrap();
    let dim = quotient_dimension(&r, &fiber);
    assert!(dim <= nn.module_generators.len());
    assert_eq!(dim, 3);
    assert!(nn.fiber(&gens, &[1]).is_err());
}

#[test]
fn seed_reproduces_the_result() {
    let r = ring(32003, &["x", "y", "z"]);
    let gens = polys(&r, &["x*y - z", "x*z"]);
    let opts = Options {
        request: Request::Auto,
        seed: 17,
    };
    let a = noether_normalization(&r, &gens, &opts, &Control::new()).unwrap();
    let b = noether_normalization(&r, &gens, &opts, &Control::new()).unwrap();
    assert_eq!(a.to_text(), b.to_text());
    assert_verifies(&a, &gens);
    let forced = Options {
        request: Request::Only(Strategy::Nonlinear),
        seed: 3,
    };
    let c = noether_normalization(&r, &gens, &forced, &Control::new()).unwrap();
    assert_verifies(&c, &gens);
}

/// Random ideals: `count` random polynomials of degree ≤ 3 with at most 4 terms.
fn random_ideal(r: &Ring<PrimeField>, rng: &mut changes::Rng, count: usize) -> Vec<P> {
    let n = r.nvars();
    (0..count)
        .map(|_| {
            let terms = 1 + rng.next_u64() % 4;
            let mut f = Poly::zero();
            for _ in 0..terms {
                // A product of up to three random variables: total degree at most 3.
                let mut exps = vec![0u32; n];
                for _ in 0..rng.next_u64() % 4 {
                    exps[(rng.next_u64() % n as u64) as usize] += 1;
                }
                let m = crate::Monomial::from_exponents(exps).unwrap();
                f = r.add(&f, &r.term(m, rng.nonzero(&r.field)));
            }
            f
        })
        .collect()
}

#[test]
fn random_ideals_verify_over_small_and_large_primes() {
    // Property test: for random ideals of every dimension, the certificate verifies, d equals
    // the dimension read off a basis, and (over a large field, where a random point is generic
    // with high probability) the fiber dimension at a random point equals the rank, never
    // exceeding the number of module generators.
    let mut rng = changes::Rng::new(2026);
    let mut seen_dims = std::collections::BTreeSet::new();
    let mut strategies = std::collections::BTreeSet::new();
    for case in 0..240 {
        let p = [2u64, 3, 5, 7, 32003, 2305843009213693951][case % 6];
        let n = 2 + case % 3;
        let names: Vec<&str> = ["x", "y", "z", "w"][..n].to_vec();
        let r = ring(p, &names);
        let count = 1 + (rng.next_u64() % n as u64) as usize;
        let gens = random_ideal(&r, &mut rng, count);
        let gb = groebner_basis(&r, &gens, Engine::default(), &Control::new()).unwrap();
        let dim = crate::dimension::krull_dimension(n, &gb.leading_monomials());
        let opts = Options {
            request: Request::Auto,
            seed: case as u64,
        };
        let result = noether_normalization(&r, &gens, &opts, &Control::new());
        if dim < 0 {
            assert!(result.is_err());
            continue;
        }
        let nn = result.unwrap();
        assert_eq!(nn.dimension as i64, dim, "case {case}");
        assert_verifies(&nn, &gens);
        seen_dims.insert(dim);
        strategies.insert(nn.strategy.name());
        let point: Vec<u64> = (0..nn.dimension).map(|_| rng.nonzero(&r.field)).collect();
        let fiber = quotient_dimension(&r, &nn.fiber(&gens, &point).unwrap());
        assert!(fiber <= nn.module_generators.len(), "case {case}");
        if p > 1 << 60 {
            assert_eq!(fiber, nn.rank, "case {case}: generic fiber");
        }
    }
    assert!(seen_dims.len() >= 3, "{seen_dims:?}");
    assert!(strategies.len() >= 2, "{strategies:?}");
}

#[test]
fn every_independent_set_is_tried_before_a_linear_change() {
    // Over GF(2), f = (x^2 - x)(y^2 - y)z + xy - z^2 is monic in z of degree 2 over k[x, y]
    // (its z-terms are -z^2 and a multiple of z), so the surface is finite over the (x, y)
    // plane; the grevlex leading term x^2y^2z hides it, and {x, y} is the last of the three
    // independent sets.
    let r = ring(2, &["x", "y", "z"]);
    let gens = polys(&r, &["(x^2 - x)*(y^2 - y)*z + x*y - z^2"]);
    let nn = normalize(&r, &gens);
    assert_eq!(nn.strategy, Strategy::Variables);
    assert_eq!(nn.parameters, polys(&r, &["x", "y"]));
    assert_eq!(nn.rank, 2);
    assert_verifies(&nn, &gens);
}

#[test]
fn tiny_fields_enumerate_linear_forms_before_going_nonlinear() {
    // Over GF(2), (x^2 y - x y^2 + z, z^2 - x y) is a curve finite over k[x + y + z]: with
    // p = x + y + z, z = p - x - y and the first equation becomes monic in x and y after
    // elimination; no single variable works. A linear form must be found, not a nonlinear one.
    let r = ring(2, &["x", "y", "z"]);
    let gens = polys(&r, &["x^2*y - x*y^2 + z", "z^2 - x*y"]);
    let nn = normalize(&r, &gens);
    assert_eq!(nn.dimension, 1);
    assert_eq!(nn.strategy, Strategy::Linear, "{:?}", nn.to_text());
    assert_verifies(&nn, &gens);
    // x + y + z itself is a finite parameter (the elimination-order test).
    let change = changes::Change {
        params: vec![2],
        nonparams: vec![0, 1],
        shifts: polys(&r, &["x + y"]),
    };
    let proof = finiteness::test_change(
        &r,
        &gens,
        &change,
        finiteness::Test::Elimination,
        &Control::new(),
    );
    assert!(proof.unwrap().is_some());
}

/// Two sparse equations in four variables over GF(7) (a random batch job of our own making) on
/// which Nagata's search through elimination bases ran for minutes.
fn sparse_surface_over_gf7() -> (Ring<PrimeField>, Vec<P>) {
    let r = ring(7, &["v0", "v1", "v2", "v3"]);
    let gens = polys(
        &r,
        &[
            "4*v2*v3^2 + 12*v0^3*v1^2*v3 + 26*v0^2*v1^3*v2^3",
            "43*v1^2*v2^2*v3^3 + 4*v0^2*v1^3*v2*v3^2",
        ],
    );
    (r, gens)
}

#[test]
fn dense_linear_forms_over_gf7_before_going_nonlinear() {
    // The sparsest linear forms over GF(7) fail on this surface, but random dense ones succeed
    // about one time in three: the search must find linear parameters, whose rank stays within
    // Bézout's bound 8·8 = 64 on the degree (a nonlinear change raised it to 70).
    let (r, gens) = sparse_surface_over_gf7();
    let projection = project(&r, &gens, None, &Options::default(), &Control::new()).unwrap();
    let summary = projection.summary();
    assert_eq!(summary.dimension, 2);
    assert_eq!(summary.strategy, Strategy::Linear);
    assert!(summary.rank <= 64, "rank {}", summary.rank);
    let fiber = quotient_dimension(&r, &summary.fiber(&gens, &[3, 5]).unwrap());
    assert!(fiber <= summary.module_generators.len());
}

#[test]
fn small_exponents_first_on_a_sparse_system_over_gf7() {
    // Asked for a nonlinear change, the search tries shifts with exponents at most 4 first
    // (each candidate one grevlex basis). The summary (no equations) is checked against the
    // fibre over a point: at most as many points, with multiplicity, as module generators.
    let (r, gens) = sparse_surface_over_gf7();
    let options = Options {
        request: Request::Only(Strategy::Nonlinear),
        ..Options::default()
    };
    let projection = project(&r, &gens, None, &options, &Control::new()).unwrap();
    let summary = projection.summary();
    assert_eq!(summary.dimension, 2);
    assert_eq!(summary.strategy, Strategy::Nonlinear);
    assert!(summary.parameters.iter().all(|p| p.degree().unwrap() <= 4));
    assert!(summary.rank <= summary.module_generators.len());
    let fiber = quotient_dimension(&r, &summary.fiber(&gens, &[3, 5]).unwrap());
    assert!(fiber <= summary.module_generators.len());
}

#[test]
fn lazy_equations_equal_eager_ones() {
    // The summary and the equations computed apart give the certificate computed at once.
    let cases: [(u64, &[&str], &[&str]); 3] = [
        (
            32003,
            &["x", "y", "z", "w"],
            &["x*z - y^2", "y*w - z^2", "x*w - y*z"],
        ),
        (7, &["x", "y"], &["x^7*y - x*y^7"]),
        (65521, &["x", "y", "z"], &["x*y - z^2 + 1", "x^2 - y*z"]),
    ];
    for (p, vars, texts) in cases {
        let r = ring(p, vars);
        let gens = polys(&r, texts);
        let eager = normalize(&r, &gens);
        let projection = project(&r, &gens, None, &Options::default(), &Control::new()).unwrap();
        assert!(projection.summary().equations.is_empty());
        let lazy = projection.equations(&Control::new()).unwrap();
        assert_eq!(lazy, eager.equations);
        let whole = projection.into_certificate(&Control::new()).unwrap();
        assert_eq!(whole.to_text(), eager.to_text());
    }
}
