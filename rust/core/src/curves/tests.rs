//! Curves against brute-force enumeration and published facts (sources named beside each).

use super::*;
use crate::field::PrimeField;
use crate::field_kind::AnyField;
use crate::parse::parse_poly;
use crate::with_any_field;

fn ring_over<F: Field>(field: F, vars: &[&str]) -> Ring<F> {
    let names = vars.iter().map(|s| s.to_string()).collect();
    Ring::new(field, names, MonomialOrder::Grevlex).unwrap()
}

fn curve_over<F: PowerBasis>(field: F, vars: &[&str], equations: &[&str]) -> Curve<F> {
    let ring = ring_over(field, vars);
    let gens: Vec<Poly<F>> = equations
        .iter()
        .map(|e| parse_poly(&ring, e).unwrap())
        .collect();
    Curve::new(&ring, &gens, &Control::new()).unwrap()
}

fn counts<F: PowerBasis>(curve: &Curve<F>, up_to: u32) -> Vec<u128> {
    (1..=up_to)
        .map(|r| curve.count_points(r, &Control::new()).unwrap())
        .collect()
}

/// Points of the projective plane curve `equation` over the field `spec` (integer
/// coefficients), by trying every point of P^2 there.
// The bodies expand once per field kind, and only some element types are `Copy`.
#[allow(clippy::clone_on_copy)]
fn brute_force_plane(spec: &str, equation: &str) -> u128 {
    with_any_field!(AnyField::parse(spec).unwrap(), k => {
        let ring = ring_over(k.clone(), &["x", "y", "z"]);
        let f = parse_poly(&ring, equation).unwrap();
        let elements = k.small_elements(1 << 12).unwrap();
        let mut points = Vec::new();
        for x in &elements {
            for y in &elements {
                points.push(vec![x.clone(), y.clone(), k.one()]);
            }
            points.push(vec![k.one(), x.clone(), k.zero()]);
        }
        points.push(vec![k.zero(), k.one(), k.zero()]);
        points.iter().filter(|p| k.is_zero(&ring.evaluate(&f, p).unwrap())).count() as u128
    })
}

/// Affine points of the plane curve `equation` in x, y over the field `spec`.
#[allow(clippy::clone_on_copy)]
fn brute_force_affine(spec: &str, equation: &str) -> u128 {
    with_any_field!(AnyField::parse(spec).unwrap(), k => {
        let ring = ring_over(k.clone(), &["x", "y"]);
        let f = parse_poly(&ring, equation).unwrap();
        let elements = k.small_elements(1 << 12).unwrap();
        let mut count = 0;
        for x in &elements {
            for y in &elements {
                count += u128::from(k.is_zero(&ring.evaluate(&f, &[x.clone(), y.clone()]).unwrap()));
            }
        }
        count
    })
}

fn l_polynomial(zeta: &Zeta) -> Vec<i64> {
    zeta.l_polynomial
        .iter()
        .map(|a| i64::try_from(a).unwrap())
        .collect()
}

#[test]
fn klein_quartic_counts_and_zeta_over_gf2() {
    // Published counts of x^3 y + y^3 z + z^3 x over GF(2), GF(4), GF(8): 3, 5, 24, and
    // L(T) = 1 + 5T^3 + 8T^6 (from memory); checked by brute force too.
    let equation = "x^3*y + y^3*z + z^3*x";
    let curve = curve_over(PrimeField::new(2).unwrap(), &["x", "y", "z"], &[equation]);
    assert!(curve.is_smooth());
    assert_eq!(curve.genus().unwrap(), 3);
    assert_eq!(counts(&curve, 3), vec![3, 5, 24]);
    for (r, spec) in [(1, "GF(2)"), (2, "GF(4)"), (3, "GF(8)"), (4, "GF(16)")] {
        assert_eq!(
            counts(&curve, r)[r as usize - 1],
            brute_force_plane(spec, equation)
        );
    }
    let zeta = curve.zeta(&Control::new()).unwrap();
    assert_eq!(l_polynomial(&zeta), vec![1, 0, 0, 5, 0, 0, 8]);
    assert!(zeta.satisfies_functional_equation());
    for r in 1..=5u32 {
        assert_eq!(
            zeta.points(r),
            BigInt::from(curve.count_points(r, &Control::new()).unwrap())
        );
    }
    // Over GF(8) the curve reaches Serre's bound 8 + 1 + 3·⌊2√8⌋ = 24 (Serre 1983): maximal.
    let check = curve.check_bounds(3, 24).unwrap();
    assert!(check.within && check.maximal);
}

#[test]
fn hermitian_curves_are_maximal() {
    // x^(q+1) + y^(q+1) + z^(q+1) over GF(q^2) has q^3 + 1 points, genus q(q−1)/2 and
    // L(T) = (1 + qT)^(2g) (handbook fact).
    for (spec, q, equation) in [
        ("GF(4)", 2i64, "x^3 + y^3 + z^3"),
        ("GF(9)", 3, "x^4 + y^4 + z^4"),
    ] {
        with_any_field!(AnyField::parse(spec).unwrap(), k => {
            let curve = curve_over(k, &["x", "y", "z"], &[equation]);
            let g = (q * (q - 1) / 2) as usize;
            assert_eq!(curve.genus().unwrap(), g);
            assert_eq!(curve.count_points(1, &Control::new()).unwrap(), (q * q * q + 1) as u128);
            assert_eq!(curve.count_points(1, &Control::new()).unwrap(), brute_force_plane(spec, equation));
            let zeta = curve.zeta(&Control::new()).unwrap();
            let expected: Vec<i64> = (0..=2 * g as u32)
                .map(|k| binomial_i64(2 * g as u32, k) * q.pow(k))
                .collect();
            assert_eq!(l_polynomial(&zeta), expected);
            assert!(zeta.satisfies_functional_equation());
            let check = curve.check_bounds(1, (q * q * q + 1) as u128).unwrap();
            assert!(check.maximal && !check.minimal);
        });
    }
}

fn binomial_i64(n: u32, k: u32) -> i64 {
    (0..k).fold(1i64, |acc, i| acc * i64::from(n - i) / i64::from(i + 1))
}

#[test]
fn elliptic_curves_satisfy_hasse() {
    // #E = q + 1 − a and L(T) = 1 − aT + qT^2 (Hasse 1936); counts by brute force, with the one
    // point at infinity of y^2 = x^3 + ... .
    for (p, equation) in [
        (7u64, "y^2 - x^3 - 3*x - 2"),
        (101, "y^2 - x^3 - x - 1"),
        (2, "y^2 + y - x^3"),
    ] {
        let curve = curve_over(PrimeField::new(p).unwrap(), &["x", "y"], &[equation]);
        assert!(curve.is_smooth());
        assert_eq!(curve.genus().unwrap(), 1);
        let n = curve.count_points(1, &Control::new()).unwrap();
        assert_eq!(n, brute_force_affine(&format!("GF({p})"), equation) + 1);
        let a = p as i64 + 1 - n as i64;
        let zeta = curve.zeta(&Control::new()).unwrap();
        assert_eq!(l_polynomial(&zeta), vec![1, -a, p as i64]);
        assert_eq!(zeta.jacobian_order(), BigInt::from(n));
        assert!(zeta.satisfies_functional_equation());
        // N_2 = q^2 + 1 − (a^2 − 2q) (Hasse), against a count over GF(p^2) where brute force is cheap.
        let n2 = curve.count_points(2, &Control::new()).unwrap() as i64;
        assert_eq!(n2, (p * p) as i64 + 1 - (a * a - 2 * p as i64));
        assert_eq!(zeta.points(2), BigInt::from(n2));
    }
}

#[test]
fn genus_two_curve_in_characteristic_two() {
    // y^2 + x*y = x^5 + 1 over GF(2): smooth model with one point at infinity (deg f odd);
    // N_1, N_2 by brute force over GF(2), GF(4); #J = L(1) with L(T) = 1 + a1 T + a2 T^2 + 2 a1 T^3
    // + 4 T^4, a1 = N_1 − 3, a2 = (N_2 − 5 + a1^2)/2 (Newton's identities).
    let equation = "y^2 + x*y + x^5 + 1";
    let curve = curve_over(PrimeField::new(2).unwrap(), &["x", "y"], &[equation]);
    assert!(curve.is_smooth());
    assert_eq!(curve.genus().unwrap(), 2);
    let n1 = brute_force_affine("GF(2)", equation) as i64 + 1;
    let n2 = brute_force_affine("GF(4)", equation) as i64 + 1;
    assert_eq!(counts(&curve, 2), vec![n1 as u128, n2 as u128]);
    let a1 = n1 - 3;
    let a2 = (n2 - 5 + a1 * a1) / 2;
    let zeta = curve.zeta(&Control::new()).unwrap();
    assert_eq!(l_polynomial(&zeta), vec![1, a1, a2, 2 * a1, 4]);
    assert_eq!(
        zeta.jacobian_order(),
        BigInt::from(1 + a1 + a2 + 2 * a1 + 4)
    );
    assert_eq!(zeta.jacobian_order(), BigInt::from((n1 * n1 + n2) / 2 - 2));
    for r in 3..=6u32 {
        let spec = format!("GF(2^{r})");
        let brute = brute_force_affine(&spec, equation) + 1;
        assert_eq!(zeta.points(r), BigInt::from(brute));
    }
}

#[test]
fn even_degree_model_has_two_or_no_points_at_infinity() {
    // y^2 = x^6 + 1 over GF(7)... leading coefficient 1 is a square: two points at infinity,
    // and y^2 = 3x^6 + 1 (3 a non-square mod 7) none; counted against brute force.
    for (equation, at_infinity) in [("y^2 - x^6 - 1", 2), ("y^2 - 3*x^6 - 1", 0)] {
        let curve = curve_over(PrimeField::new(7).unwrap(), &["x", "y"], &[equation]);
        assert!(curve.is_smooth());
        assert_eq!(curve.genus().unwrap(), 2);
        for (r, spec) in [(1u32, "GF(7)"), (2, "GF(49)")] {
            let extra = if r == 2 { 2 } else { at_infinity };
            assert_eq!(
                curve.count_points(r, &Control::new()).unwrap(),
                brute_force_affine(spec, equation) + extra
            );
        }
        assert!(curve
            .zeta(&Control::new())
            .unwrap()
            .satisfies_functional_equation());
    }
}

#[test]
fn curve_over_extension_field_is_counted_over_its_extensions() {
    // y^2 + y = x^3 + a over GF(4) = GF(2)[a]: counts over GF(16) against brute force on
    // the same equation read over GF(16), where a is a root of a^2 + a + 1.
    let gf4 = AnyField::parse("GF(4)").unwrap();
    let AnyField::Table(k) = gf4 else {
        panic!("GF(4) has tables")
    };
    let curve = curve_over(k, &["x", "y"], &["y^2 + y + x^3 + a"]);
    let n1 = curve.count_points(1, &Control::new()).unwrap();
    assert_eq!(n1, brute_force_affine("GF(4)", "y^2 + y + x^3 + a") + 1);
    let n2 = curve.count_points(2, &Control::new()).unwrap();
    // In GF(16) = GF(2)[b]/(b^4 + b + 1), b^5 is a root of a^2 + a + 1.
    assert_eq!(n2, brute_force_affine("GF(16)", "y^2 + y + x^3 + a^5") + 1);
    let zeta = curve.zeta(&Control::new()).unwrap();
    assert_eq!(zeta.points(2), BigInt::from(n2));
}

#[test]
fn space_curve_complete_intersection() {
    // Two quadrics in P^3 meeting transversally: genus 1 from the Hilbert polynomial 4s
    // (Hartshorne 1977, from memory); #J = N_1 for genus 1, and N_2 from L(T) against a count.
    let curve = curve_over(
        PrimeField::new(5).unwrap(),
        &["x", "y", "z", "w"],
        &["x^2 + y^2 + z^2 + w^2", "x^2 + 2*y^2 + 3*z^2 + 4*w^2"],
    );
    assert!(curve.is_smooth());
    assert_eq!(curve.genus().unwrap(), 1);
    let zeta = curve.zeta(&Control::new()).unwrap();
    let n1 = curve.count_points(1, &Control::new()).unwrap();
    assert_eq!(zeta.jacobian_order(), BigInt::from(n1));
    assert_eq!(
        zeta.points(2),
        BigInt::from(curve.count_points(2, &Control::new()).unwrap())
    );
}

#[test]
fn singular_curves_are_refused_with_their_singular_points() {
    // The cusp y^2 z = x^3 is singular at (0 : 0 : 1) only (textbook example).
    let curve = curve_over(
        PrimeField::new(5).unwrap(),
        &["x", "y", "z"],
        &["y^2*z - x^3"],
    );
    assert!(!curve.is_smooth());
    assert_eq!(
        curve.singular_points(&Control::new()).unwrap(),
        vec![vec![0, 0, 1]]
    );
    let message = curve
        .count_points(1, &Control::new())
        .unwrap_err()
        .to_string();
    assert!(message.contains("singular"), "{message}");
    // y^2 = x^2 (x + 1): a node at the origin of the affine hyperelliptic equation.
    let node = curve_over(
        PrimeField::new(7).unwrap(),
        &["x", "y"],
        &["y^2 - x^3 - x^2"],
    );
    assert!(!node.is_smooth());
    assert_eq!(
        node.singular_points(&Control::new()).unwrap(),
        vec![vec![0, 0]]
    );
    assert!(node.zeta(&Control::new()).is_err());
}

#[test]
fn large_fields_are_refused_before_any_work() {
    // An elliptic curve over the 61-bit prime 2^61 − 1: one root count per x is out of reach.
    let p = (1u64 << 61) - 1;
    let curve = curve_over(PrimeField::new(p).unwrap(), &["x", "y"], &["y^2 - x^3 - 7"]);
    assert_eq!(curve.genus().unwrap(), 1);
    match curve.count_points(1, &Control::new()) {
        Err(Error::ResourceLimit(message)) => {
            assert!(message.contains("fibre by fibre"), "{message}")
        }
        other => panic!("expected a refusal, got {other:?}"),
    }
}

#[test]
fn weil_bound_rejects_counts_of_no_curve() {
    // N_1 = 20 over GF(2) breaks |a_1| ≤ 2g√q for g = 1.
    assert!(Zeta::from_counts(2, 1, &[20]).is_err());
    assert!(Zeta::from_counts(2, 1, &[3])
        .unwrap()
        .satisfies_functional_equation());
}

/// Distinct roots of p in the field, by trying every element.
fn brute_force_roots<F: Field>(field: &F, p: &[F::Elem]) -> u128 {
    let size = crate::field::field_size(field).unwrap();
    (0..size)
        .filter(|&i| {
            let a = field.element_from_index(i);
            field.is_zero(&crate::univariate::evaluate(field, p, &a))
        })
        .count() as u128
}

/// Random polynomials of degree 0..=10 (beyond the fixed-size path too), some with many roots
/// (products of linear factors, repeated ones included), counted against brute force.
fn root_counts_agree_with_brute_force<F: Field>(field: F, polynomials: usize) {
    use crate::univariate::{from_roots, multiply, random_element};
    let counter = root_count::RootCounter::new(&field).unwrap();
    let mut rng = crate::rng::Rng::new(7);
    for n in 0..polynomials {
        let degree = n % 11;
        let mut p: Vec<F::Elem> = (0..=degree)
            .map(|_| random_element(&field, &mut rng))
            .collect();
        if n % 3 == 0 {
            let roots: Vec<F::Elem> = (0..1 + n % 4)
                .map(|_| random_element(&field, &mut rng))
                .collect();
            let repeated = [roots.clone(), roots[..1].to_vec()].concat();
            p = multiply(&field, &p, &from_roots(&field, &repeated));
        }
        let expected = if p.iter().all(|c| field.is_zero(c)) {
            crate::field::field_size(&field).unwrap() as u128
        } else {
            brute_force_roots(&field, &p)
        };
        assert_eq!(
            counter.count(&p, &Control::new()).unwrap(),
            expected,
            "{} over {}",
            crate::univariate::format(&field, &p, "y"),
            field.spec()
        );
    }
}

#[test]
fn root_counts_of_the_fibre_path_equal_brute_force() {
    // Tables (GF(2^4), GF(3^5)), a prime field, and the bit-packed GF(2^17) where the counts
    // of the benchmark run; the quadratics exercise the trace and square criteria.
    for spec in ["GF(16)", "GF(3^5)", "GF(101)"] {
        with_any_field!(AnyField::parse(spec).unwrap(), k => root_counts_agree_with_brute_force(k, 300));
    }
    let AnyField::Binary(k) = AnyField::parse("GF(2^17)").unwrap() else {
        panic!("GF(2^17) is bit-packed")
    };
    root_counts_agree_with_brute_force(k, 24);
    // The zero polynomial vanishes everywhere; y^2 + y + 1 has no root in GF(2^17) (odd degree
    // over GF(2): GF(4) is not a subfield) and y^2 + y two in GF(4).
    let gf = AnyField::parse("GF(2^17)").unwrap();
    with_any_field!(gf, k => {
        let counter = root_count::RootCounter::new(&k).unwrap();
        assert_eq!(counter.count(&[k.zero()], &Control::new()).unwrap(), 1 << 17);
        assert_eq!(counter.count(&[k.one(), k.one(), k.one()], &Control::new()).unwrap(), 0);
    });
    with_any_field!(AnyField::parse("GF(4)").unwrap(), k => {
        let counter = root_count::RootCounter::new(&k).unwrap();
        assert_eq!(counter.count(&[k.zero(), k.one(), k.one()], &Control::new()).unwrap(), 2);
    });
}

/// Every element of GF(q^r) is walked once, and the weights of each orbit {x, x^q, ...} add up
/// to its length (orbits made here by powering).
fn orbit_weights_cover_the_field<F: Field>(field: F, q: u64, r: u32) {
    let orbits = frobenius_orbits::FrobeniusOrbits::new(&field, q, r).unwrap();
    let size = orbits.size();
    let mut weight_of = std::collections::HashMap::new();
    // Two runs, to check that a walk started in the middle agrees with one from the start.
    for (start, end) in [(0, size / 2 + 1), (size / 2 + 1, size)] {
        let mut walk = orbits.walk_from(start);
        for i in start..end {
            assert!(weight_of
                .insert(walk.element().clone(), walk.weight())
                .is_none());
            if i + 1 < end {
                walk.advance();
            }
        }
    }
    assert_eq!(weight_of.len() as u64, size);
    for x in weight_of.keys() {
        let mut orbit = vec![x.clone()];
        let mut y = field.pow(x, q);
        while y != *x {
            orbit.push(y.clone());
            y = field.pow(&y, q);
        }
        let total: u128 = orbit.iter().map(|y| weight_of[y]).sum();
        assert_eq!(total, orbit.len() as u128, "orbit of {}", field.format(x));
    }
}

#[test]
fn frobenius_orbits_are_walked_once_with_their_lengths() {
    for (spec, q, r) in [
        ("GF(2^6)", 4, 3),
        ("GF(2^6)", 2, 6),
        ("GF(3^4)", 9, 2),
        ("GF(7)", 7, 1),
    ] {
        with_any_field!(AnyField::parse(spec).unwrap(), k => orbit_weights_cover_the_field(k, q, r));
    }
    let AnyField::Binary(k) = AnyField::parse("GF(2^18)").unwrap() else {
        panic!("GF(2^18) is bit-packed")
    };
    orbit_weights_cover_the_field(k, 64, 3);
}

#[test]
fn twisted_cubic_beyond_two_to_the_sixteen() {
    // The twisted cubic (s^3 : s^2 t : s t^2 : t^3), cut out by the 2 × 2 minors (not a complete
    // intersection): genus 0 and N_r = q^r + 1 (handbook fact), here over GF(2^17).
    let curve = curve_over(
        PrimeField::new(2).unwrap(),
        &["x", "y", "z", "w"],
        &["x*z - y^2", "y*w - z^2", "x*w - y*z"],
    );
    assert!(curve.is_smooth());
    assert_eq!(curve.genus().unwrap(), 0);
    for r in [1u32, 2, 3, 17] {
        assert_eq!(
            curve.count_points(r, &Control::new()).unwrap(),
            (1u128 << r) + 1
        );
    }
}

#[test]
fn elliptic_curve_as_two_quadrics_counts_as_its_plane_cubic() {
    // E: y^2 + xy = x^3 + 1 over GF(2) embedded in P^3 by (1 : x : y : x^2) (the functions with
    // poles of order ≤ 4 at the point at infinity): X0 X3 = X1^2 and
    // X2^2 + X1 X2 = X1 X3 + X0^2 (x^3 = x · x^2). An embedding, so N_r are those of the plane
    // cubic; N_1 by brute force, and N_17 over GF(2^17) from L(T) = 1 − aT + 2T^2 (Hasse). The
    // coordinates are named a..d: the name a of GF(2^r)'s generator must not get in the way.
    let space = curve_over(
        PrimeField::new(2).unwrap(),
        &["a", "b", "c", "d"],
        &["a*d - b^2", "c^2 + b*c + b*d + a^2"],
    );
    let cubic = "y^2*z + x*y*z + x^3 + z^3";
    let plane = curve_over(PrimeField::new(2).unwrap(), &["x", "y", "z"], &[cubic]);
    assert!(space.is_smooth() && plane.is_smooth());
    assert_eq!(space.genus().unwrap(), 1);
    assert_eq!(counts(&space, 4), counts(&plane, 4));
    let n1 = brute_force_plane("GF(2)", cubic);
    assert_eq!(space.count_points(1, &Control::new()).unwrap(), n1);
    let a = 3 - n1 as i64;
    let zeta = Zeta::from_counts(2, 1, &[n1]).unwrap();
    assert_eq!(l_polynomial(&zeta), vec![1, -a, 2]);
    let n17 = space.count_points(17, &Control::new()).unwrap();
    assert_eq!(zeta.points(17), BigInt::from(n17));
    assert_eq!(n17, plane.count_points(17, &Control::new()).unwrap());
}

#[test]
fn singular_closed_points_over_extensions() {
    // (x^2 + z^2)^2 + y^2 z^2 over GF(3): singular where x^2 + z^2 = y = 0, two points
    // (±i : 0 : 1) conjugate over GF(3) (−1 is not a square mod 3), and at (0 : 1 : 0); the
    // closed points against every point of P^2(GF(9)) where F and its partials vanish.
    let equation = "(x^2 + z^2)^2 + y^2*z^2";
    let curve = curve_over(PrimeField::new(3).unwrap(), &["x", "y", "z"], &[equation]);
    assert!(!curve.is_smooth());
    let closed = curve.singular_closed_points(&Control::new()).unwrap();
    assert_eq!(
        closed.iter().map(|p| p.degree).collect::<Vec<_>>(),
        vec![1, 2]
    );
    assert_eq!(
        curve.singular_points(&Control::new()).unwrap(),
        vec![vec![0, 1, 0]]
    );
    let AnyField::Table(gf9) = AnyField::parse("GF(9)").unwrap() else {
        panic!("GF(9) has tables")
    };
    let mut listed = Vec::new();
    for p in &closed {
        let r = &p.equations.ring;
        listed.extend(
            crate::points::extension::points_over(
                r,
                &p.equations.polys,
                gf9.clone(),
                |c| gf9.from_i64(*c as i64),
                None,
                Engine::Auto,
                &Control::new(),
            )
            .unwrap(),
        );
    }
    listed.sort_by_key(|p| p.iter().map(|&c| c as u64).collect::<Vec<_>>());
    let ring = ring_over(gf9.clone(), &["x", "y", "z"]);
    let f = parse_poly(&ring, equation).unwrap();
    let mut equations = vec![f.clone()];
    for i in 0..3 {
        equations.push(jacobian::partial_derivative(&ring, &f, i).unwrap());
    }
    // P^2(GF(9)) with the first nonzero coordinate 1, as the closed points' charts have it.
    let elements = gf9.small_elements(9).unwrap();
    let mut brute = Vec::new();
    for a in &elements {
        for b in &elements {
            brute.push(vec![1, *a, *b]);
        }
        brute.push(vec![0, 1, *a]);
    }
    brute.push(vec![0, 0, 1]);
    brute.retain(|p| {
        equations
            .iter()
            .all(|g| gf9.is_zero(&ring.evaluate(g, p).unwrap()))
    });
    brute.sort_by_key(|p| p.iter().map(|&c| c as u64).collect::<Vec<_>>());
    assert_eq!(listed, brute);
}

/// Polynomials of degree 2 to 4 over GF(2^k) in every shape the bit-level count separates:
/// random; no cubic term; a root at 0; products of linear factors drawn from two roots (so
/// repeated roots, the case f(s) = 0, and triple and fourfold roots); a linear factor times a
/// random quadratic; and fixed affine ones with many roots.
fn binary_test_polynomials<F: Field>(field: &F, random: usize) -> Vec<Vec<F::Elem>> {
    use crate::univariate::{from_roots, multiply, random_element};
    let mut rng = crate::rng::Rng::new(19);
    let mut out = Vec::new();
    let (zero, one) = (field.zero(), field.one());
    for n in 0..random {
        let degree = 2 + n % 3;
        let mut p: Vec<F::Elem> = (0..=degree)
            .map(|_| random_element(field, &mut rng))
            .collect();
        match n / 3 % 5 {
            0 => {}
            1 if degree > 2 => p[degree - 1] = zero.clone(),
            2 => p[0] = zero.clone(),
            3 => {
                let pool = [
                    random_element(field, &mut rng),
                    random_element(field, &mut rng),
                ];
                let roots: Vec<F::Elem> = (0..degree)
                    .map(|i| pool[(n >> (3 + i)) & 1].clone())
                    .collect();
                p = multiply(field, &[p[0].clone()], &from_roots(field, &roots));
            }
            _ => {
                let root = random_element(field, &mut rng);
                p = multiply(field, &from_roots(field, &[root]), &p[..degree]);
            }
        }
        // A product with a zero factor comes out empty; a zero leading coefficient is dropped.
        if p.last().is_some_and(|c| !field.is_zero(c)) {
            out.push(p);
        }
    }
    for exponents in [
        &[1usize, 4][..],
        &[2, 4],
        &[0, 4],
        &[4],
        &[0, 3],
        &[3],
        &[2, 3],
        &[0, 1, 2],
        &[0, 1, 3],
        &[1, 2, 3, 4],
    ] {
        let top = exponents[exponents.len() - 1];
        out.push(
            (0..=top)
                .map(|i| {
                    if exponents.contains(&i) {
                        one.clone()
                    } else {
                        zero.clone()
                    }
                })
                .collect(),
        );
    }
    out
}

/// deg gcd(y^Q − y, p) by the general distinct-degree split, p ≠ 0.
fn general_root_count<F: Field>(field: &F, p: &[F::Elem]) -> u128 {
    let order = field.order_limbs().unwrap();
    let linear = crate::univariate::distinct_degree::linear_part_for_order(
        field,
        p,
        &order,
        &Control::new(),
    );
    linear.unwrap().len() as u128 - 1
}

/// The root counts of [`RootCounter`] (the bit-level path for degrees 3 and 4, the trace mask
/// for degree 2) equal the general distinct-degree count deg gcd(y^Q − y, f), and brute
/// force when the field is small.
fn binary_root_counts_agree<F: Field>(field: F, random: usize) {
    assert!(
        binary_roots::BinaryRoots::new(&field).is_some(),
        "{} has the bit hook",
        field.spec()
    );
    let counter = root_count::RootCounter::new(&field).unwrap();
    let small = crate::field::field_size(&field).unwrap() <= 1 << 8;
    for p in binary_test_polynomials(&field, random) {
        let general = general_root_count(&field, &p);
        let text = crate::univariate::format(&field, &p, "y");
        assert_eq!(
            counter.count(&p, &Control::new()).unwrap(),
            general,
            "{text} over {}",
            field.spec()
        );
        if small {
            assert_eq!(general, brute_force_roots(&field, &p), "{text}");
        }
    }
}

#[test]
fn bit_level_root_counts_equal_the_general_count() {
    for spec in ["GF(2^4)", "GF(2^8)", "GF(2^16)"] {
        let AnyField::Table(k) = AnyField::parse(spec).unwrap() else {
            panic!("{spec} has tables")
        };
        binary_root_counts_agree(k, 600);
    }
    for spec in ["GF(2^24)", "GF(2^61)"] {
        let AnyField::Binary(k) = AnyField::parse(spec).unwrap() else {
            panic!("{spec} is bit-packed")
        };
        binary_root_counts_agree(k, 300);
    }
}

#[test]
fn bit_level_root_counts_at_the_edges_of_the_word() {
    // GF(2^64): every bit of the word in use (the counter itself stops below 2^64 − 1
    // elements, so the quartics are counted by the bit-level path directly).
    let AnyField::Binary(k) = AnyField::parse("GF(2^64)").unwrap() else {
        panic!("GF(2^64) is bit-packed")
    };
    let binary = binary_roots::BinaryRoots::new(&k).unwrap();
    for p in binary_test_polynomials(&k, 150) {
        let general = general_root_count(&k, &p);
        let fast = match p.len() {
            5 => binary.quartic(&std::array::from_fn(|i| p[i])),
            4 => binary.cubic(&std::array::from_fn(|i| p[i])),
            _ => continue,
        };
        assert_eq!(fast, general, "{}", crate::univariate::format(&k, &p, "y"));
    }
    // The roots of y^4 + y are GF(4), a subfield of GF(2^64) as 2 divides 64 (handbook fact).
    assert_eq!(binary.quartic(&[0, 1, 0, 0, 1]), 4);
    // GF(8) is below the bit-level path's smallest field; the general count stays.
    let AnyField::Table(gf8) = AnyField::parse("GF(8)").unwrap() else {
        panic!("GF(8) has tables")
    };
    assert!(binary_roots::BinaryRoots::new(&gf8).is_none());
}
