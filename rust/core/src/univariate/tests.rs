//! Tests of the univariate arithmetic against schoolbook products, the division identity, brute
//! force over small fields, and the classical factorization of x^(q^n) − x into all monic
//! irreducible polynomials of degree dividing n (Gauss's count; Lidl and Niederreiter, *Finite
//! Fields*, 1983, Theorem 3.25, from memory).

use super::distinct_degree::linear_part;
use super::*;
use crate::control::Control;
use crate::field::{Field, PrimeField};
use crate::field_kind::AnyField;
use crate::rng::Rng;
use crate::with_any_field;

fn random_poly<F: Field>(field: &F, rng: &mut Rng, len: usize) -> Univariate<F> {
    let mut p: Univariate<F> = (0..len).map(|_| random_element(field, rng)).collect();
    if let Some(last) = p.last_mut() {
        if field.is_zero(last) {
            *last = field.one();
        }
    }
    p
}

fn schoolbook<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    if a.is_empty() || b.is_empty() {
        return vec![];
    }
    let mut out = vec![field.zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            out[i + j] = field.add(&out[i + j], &field.mul(x, y));
        }
    }
    trimmed(field, out)
}

const SPECS: &[&str] = &[
    "GF(2)",
    "GF(3)",
    "GF(65521)",
    "GF(2305843009213693951)",
    "GF(9223372036854775783)",
    "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
    "GF(4)",
    "GF(8)",
    "GF(9)",
    "GF(2^16)",
    "GF(2^40)",
    "GF(5^30)",
];

#[test]
fn products_agree_with_the_schoolbook_product() {
    let mut rng = Rng::new(1);
    for spec in SPECS {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            for (la, lb) in [(1, 1), (3, 50), (40, 41), (100, 130), (300, 97), (257, 513)] {
                let a = random_poly(field, &mut rng, la);
                let b = random_poly(field, &mut rng, lb);
                assert_eq!(multiply(field, &a, &b), schoolbook(field, &a, &b), "{spec} {la}x{lb}");
            }
            let a = random_poly(field, &mut rng, 200);
            assert_eq!(square(field, &a), schoolbook(field, &a, &a), "{spec} square");
        });
    }
}

#[test]
fn transform_products_are_exact_for_long_word_prime_polynomials() {
    // 2^63 − 25 is the largest prime below 2^63 (from memory; PrimeField checks it), so the
    // integer products reach 2^143 and need all three transform primes.
    let mut rng = Rng::new(2);
    for p in [65521u64, (1 << 61) - 1, 9223372036854775783] {
        let field = PrimeField::new(p).unwrap();
        let a = random_poly(&field, &mut rng, 3000);
        let b = random_poly(&field, &mut rng, 2500);
        let product = multiply(&field, &a, &b);
        // Check at random points: (a·b)(t) = a(t)·b(t).
        for _ in 0..20 {
            let t = random_element(&field, &mut rng);
            let expected = field.mul(&evaluate(&field, &a, &t), &evaluate(&field, &b, &t));
            assert_eq!(evaluate(&field, &product, &t), expected);
        }
        assert_eq!(product.len(), 5499);
    }
}

#[test]
fn division_satisfies_the_division_identity() {
    let mut rng = Rng::new(3);
    for spec in SPECS {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            for (la, lb) in [(5, 3), (10, 20), (400, 150), (1000, 300), (700, 699)] {
                let a = random_poly(field, &mut rng, la);
                let b = random_poly(field, &mut rng, lb);
                let (q, r) = divide(field, &a, &b);
                assert!(r.len() < b.len(), "{spec}: remainder too long");
                assert_eq!(add(field, &multiply(field, &q, &b), &r), a, "{spec} {la}/{lb}");
                let modulo = Modulo::new(field, &b);
                let c = random_poly(field, &mut rng, lb - 1);
                let d = random_poly(field, &mut rng, lb - 1);
                assert_eq!(
                    modulo.multiply(&c, &d),
                    remainder(field, &multiply(field, &c, &d), &b),
                    "{spec}"
                );
            }
        });
    }
}

#[test]
fn gcd_finds_the_planted_common_factor() {
    let mut rng = Rng::new(4);
    for spec in SPECS {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            let c = monic(field, &random_poly(field, &mut rng, 30));
            let a = random_poly(field, &mut rng, 200);
            let b = random_poly(field, &mut rng, 150);
            let g0 = gcd(field, &a, &b);
            let g = gcd(field, &multiply(field, &a, &c), &multiply(field, &b, &c));
            assert_eq!(g, multiply(field, &g0, &c), "{spec}");
            let (s, t) = bezout(field, &a, &b);
            assert_eq!(add(field, &multiply(field, &s, &a), &multiply(field, &t, &b)), g0);
        });
    }
}

#[test]
fn powers_modulo_a_polynomial_agree_with_repeated_multiplication() {
    let mut rng = Rng::new(5);
    let field = PrimeField::new(101).unwrap();
    let f = random_poly(&field, &mut rng, 90);
    let a = random_poly(&field, &mut rng, 40);
    let mut expected = vec![1u64];
    for _ in 0..77 {
        expected = remainder(&field, &multiply(&field, &expected, &a), &f);
    }
    assert_eq!(
        power_mod(&field, &a, &[77], &f, &Control::new()).unwrap(),
        expected
    );
    let modulo = Modulo::new(&field, &f);
    let x77 = modulo.x_power(&[77], &Control::new()).unwrap();
    assert_eq!(x77, remainder(&field, &monomial(&field, 77), &f));
}

/// All roots of f by trying every element.
fn brute_force_roots<F: Field>(field: &F, f: &[F::Elem]) -> Vec<String> {
    let mut found: Vec<String> = field
        .small_elements(1 << 16)
        .unwrap()
        .into_iter()
        .filter(|a| field.is_zero(&evaluate(field, f, a)))
        .map(|a| field.format(&a))
        .collect();
    found.sort();
    found
}

#[test]
fn roots_agree_with_brute_force_over_small_fields() {
    let mut rng = Rng::new(6);
    for spec in [
        "GF(2)", "GF(3)", "GF(7)", "GF(251)", "GF(4)", "GF(8)", "GF(9)", "GF(2^8)", "GF(3^5)",
        "GF(2^16)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            for len in [2, 3, 6, 20, 60] {
                // A random polynomial times a few planted roots, some repeated.
                let planted: Vec<_> = (0..3).map(|_| random_element(field, &mut rng)).collect();
                let mut f = random_poly(field, &mut rng, len);
                f = multiply(field, &f, &from_roots(field, &planted));
                f = multiply(field, &f, &linear(field, &planted[0]));
                let mut got: Vec<String> = roots(field, &f, &Control::new())
                    .unwrap()
                    .iter()
                    .map(|a| field.format(a))
                    .collect();
                got.sort();
                assert_eq!(got, brute_force_roots(field, &f), "{spec}: {}", format(field, &f, "x"));
            }
        });
    }
}

#[test]
fn planted_roots_are_found_over_large_fields() {
    let mut rng = Rng::new(7);
    for spec in [
        "GF(2305843009213693951)",
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
        "GF(170141183460469231731687303715884105727)",
        "GF(2^64)",
        "GF(3^40)",
        "GF(65521^3)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            let planted: Vec<_> = (0..12).map(|_| random_element(field, &mut rng)).collect();
            let f = multiply(field, &random_poly(field, &mut rng, 40), &from_roots(field, &planted));
            let found = roots(field, &f, &Control::new()).unwrap();
            for r in &found {
                assert!(field.is_zero(&evaluate(field, &f, r)), "{spec}: not a root");
            }
            for r in &planted {
                assert!(found.contains(r), "{spec}: planted root missing");
            }
            let distinct: std::collections::HashSet<_> = found.iter().collect();
            assert_eq!(distinct.len(), found.len(), "{spec}: repeated root");
        });
    }
}

/// Number of monic irreducible polynomials of degree n over GF(q): (1/n) Σ_{d | n} μ(d) q^(n/d)
/// (Gauss; Lidl and Niederreiter 1983, Theorem 3.25, from memory).
pub(crate) fn irreducible_count(q: u64, n: u64) -> u64 {
    let mobius = |mut d: u64| {
        let mut sign = 1i64;
        let mut r = 2;
        while r * r <= d {
            if d.is_multiple_of(r) {
                d /= r;
                if d.is_multiple_of(r) {
                    return 0;
                }
                sign = -sign;
            }
            r += 1;
        }
        if d > 1 {
            sign = -sign;
        }
        sign
    };
    let total: i64 = (1..=n)
        .filter(|d| n.is_multiple_of(*d))
        .map(|d| mobius(d) * (q as i64).pow((n / d) as u32))
        .sum();
    (total / n as i64) as u64
}

#[test]
fn factoring_x_to_the_q_to_the_n_minus_x_gives_every_irreducible_once() {
    for (spec, q, n) in [
        ("GF(2)", 2, 6),
        ("GF(3)", 3, 4),
        ("GF(4)", 4, 3),
        ("GF(5)", 5, 3),
        ("GF(9)", 9, 2),
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            let size = (q as usize).pow(n as u32);
            let f = subtract(field, &monomial(field, size), &monomial(field, 1));
            let factors = factor(field, &f, &Control::new()).unwrap();
            for d in 1..=n {
                let count = factors.iter().filter(|(g, e)| *e == 1 && g.len() == d as usize + 1).count();
                let expected = if n % d == 0 { irreducible_count(q, d) } else { 0 };
                assert_eq!(count as u64, expected, "{spec}: degree {d}");
            }
            assert!(factors.iter().all(|(_, e)| *e == 1));
        });
    }
}

#[test]
fn factorization_multiplies_back_and_counts_multiplicities() {
    let mut rng = Rng::new(8);
    for spec in [
        "GF(2)",
        "GF(3)",
        "GF(13)",
        "GF(4)",
        "GF(9)",
        "GF(2305843009213693951)",
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
        "GF(2^16)",
        "GF(7^4)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            let g = random_poly(field, &mut rng, 6);
            let h = random_poly(field, &mut rng, 4);
            let mut f = random_poly(field, &mut rng, 25);
            for _ in 0..3 {
                f = multiply(field, &f, &g);
            }
            // In characteristic 2 and 3 a p-th power appears (derivative zero in that factor).
            for _ in 0..field.characteristic_u64().filter(|&p| p <= 3).map_or(2, |p| p as usize) {
                f = multiply(field, &f, &h);
            }
            let factors = factor(field, &f, &Control::new()).unwrap();
            let mut product = vec![field.one()];
            for (p, e) in &factors {
                for _ in 0..*e {
                    product = multiply(field, &product, p);
                }
                // Each factor is irreducible: no factor of degree ≤ deg/2 (its distinct-degree
                // split is itself).
                let dd = distinct_degree_factorization(field, p, &Control::new()).unwrap();
                assert_eq!(dd, vec![(p.clone(), p.len() - 1)], "{spec}: reducible factor");
            }
            assert_eq!(product, monic(field, &f), "{spec}");
        });
    }
}

#[test]
fn squarefree_part_in_characteristic_p() {
    // Over GF(3): (x + 1)^3 (x^2 + 1)^2 x^6 has squarefree part (x + 1)(x^2 + 1)x; the
    // derivative of (x + 1)^3 x^6 vanishes, which a characteristic-0 method would mishandle.
    let f = PrimeField::new(3).unwrap();
    let expand = |factors: &[(&[u64], usize)]| {
        let mut acc = vec![1];
        for (g, e) in factors {
            for _ in 0..*e {
                acc = multiply(&f, &acc, g);
            }
        }
        acc
    };
    let poly = expand(&[(&[1, 1], 3), (&[1, 0, 1], 2), (&[0, 1], 6)]);
    let expected = expand(&[(&[1, 1], 1), (&[1, 0, 1], 1), (&[0, 1], 1)]);
    assert_eq!(squarefree_part(&f, &poly), expected);
    let p_power = expand(&[(&[1, 1], 3), (&[0, 1], 6)]);
    assert_eq!(
        squarefree_part(&f, &p_power),
        expand(&[(&[1, 1], 1), (&[0, 1], 1)])
    );
    // x^9 − x over GF(3) is squarefree (the product of x − a over GF(9) ⊃ GF(3)).
    let mut frob = vec![0; 10];
    frob[9] = 1;
    frob[1] = 2;
    assert_eq!(squarefree_part(&f, &frob), frob);
    let sff = squarefree_factorization(&f, &poly);
    assert_eq!(
        sff,
        vec![(vec![1, 0, 1], 2), (vec![1, 1], 3), (vec![0, 1], 6)]
    );
}

#[test]
fn huge_exponents_need_only_their_bits() {
    // x^(2^255 − 19) mod (x^2 + 1) over GF(2^255 − 19): p ≡ 1 mod 4, so x^p ≡ x·(x^2)^((p−1)/2)
    // = x·(−1)^((p−1)/2) = x (a quadratic residue argument: (p − 1)/2 even).
    let any = AnyField::parse(
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
    )
    .unwrap();
    with_any_field!(&any, field => {
        let f = vec![field.one(), field.zero(), field.one()];
        let h = distinct_degree::frobenius_of_x(field, &f, &Control::new()).unwrap();
        assert_eq!(h, monomial(field, 1));
        // and x^2 + 1 has its two roots ±sqrt(−1).
        assert_eq!(roots(field, &f, &Control::new()).unwrap().len(), 2);
        assert_eq!(linear_part(field, &f, &Control::new()).unwrap(), f);
    });
}

#[test]
fn half_gcd_route_agrees_with_euclid_on_random_inputs() {
    // Reference: the classical Euclidean algorithm (quadratic, one division per step).
    let mut rng = Rng::new(16);
    for spec in [
        "GF(2)",
        "GF(65521)",
        "GF(2305843009213693951)",
        "GF(2^255-19)",
        "GF(9)",
        "GF(2^16)",
        "GF(5^30)",
    ] {
        let spec = if spec == "GF(2^255-19)" {
            "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)"
        } else {
            spec
        };
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            for (la, lb, lc) in [(400, 300, 1), (500, 500, 1), (700, 200, 90), (350, 349, 200), (1000, 20, 5), (300, 0, 1)] {
                let c = monic(field, &random_poly(field, &mut rng, lc));
                let a = multiply(field, &random_poly(field, &mut rng, la), &c);
                let b = multiply(field, &random_poly(field, &mut rng, lb), &c);
                let control = Control::new();
                let expected = gcd::euclid(field, &a, &b, &control).unwrap();
                assert_eq!(gcd(field, &a, &b), expected, "{spec} {la} {lb} {lc}");
                assert_eq!(gcd(field, &b, &a), expected, "{spec} swapped");
                assert!(expected.len() >= lc, "{spec}: planted factor");
                if !a.is_empty() || !b.is_empty() {
                    let (g, s, t) = gcd::extended_gcd(field, &a, &b);
                    assert_eq!(g, expected);
                    assert_eq!(add(field, &multiply(field, &s, &a), &multiply(field, &t, &b)), g, "{spec} cofactors");
                    assert!(b.len() <= 1 || s.len() < b.len(), "{spec}: deg s < deg b");
                }
            }
            // A remainder sequence with a degree drop of many steps at once: gcd(x^n − 1, x^k − 1) = x^gcd(n,k) − 1.
            let x_minus = |n: usize| subtract(field, &monomial(field, n), &[field.one()]);
            assert_eq!(gcd(field, &x_minus(1200), &x_minus(450)), x_minus(150), "{spec} x^n - 1");
        });
    }
}

#[test]
fn wide_transform_products_agree_with_values_at_random_points() {
    // Primes of 2, 4 and 8 limbs: 2^127 − 1 (Mersenne), 2^255 − 19, and the 384-bit prime
    // 2^384 − 2^128 − 2^96 + 2^32 − 1 (FIPS 186-4, from memory; the field checks primality).
    let p384 = "39402006196394479212279040100143613805079739270465446667948293404245721771496870329047266088258938001861606973112319";
    let mut rng = Rng::new(17);
    for spec in [
        "GF(170141183460469231731687303715884105727)".to_string(),
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)"
            .to_string(),
        format!("GF({p384})"),
    ] {
        let any = AnyField::parse(&spec).unwrap();
        with_any_field!(&any, field => {
            let a = random_poly(field, &mut rng, 1500);
            let b = random_poly(field, &mut rng, 977);
            let product = multiply(field, &a, &b);
            assert_eq!(product.len(), 2476, "{spec}");
            for _ in 0..10 {
                let t = random_element(field, &mut rng);
                let expected = field.mul(&evaluate(field, &a, &t), &evaluate(field, &b, &t));
                assert_eq!(evaluate(field, &product, &t), expected, "{spec}");
            }
            assert_eq!(square(field, &b), schoolbook(field, &b, &b), "{spec} square");
        });
    }
}

#[test]
fn roots_by_evaluation_agree_with_brute_force() {
    let mut rng = Rng::new(18);
    for spec in [
        "GF(2)",
        "GF(3)",
        "GF(7)",
        "GF(251)",
        "GF(4)",
        "GF(9)",
        "GF(2^8)",
        "GF(3^5)",
        "GF(65521)",
        "GF(2^16)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            let q = all_values::small_order(field).unwrap();
            for len in [2, 6, 40, 300] {
                let planted: Vec<_> = (0..4).map(|_| random_element(field, &mut rng)).collect();
                let mut f = multiply(field, &random_poly(field, &mut rng, len), &from_roots(field, &planted));
                f = multiply(field, &f, &linear(field, &field.zero()));
                let mut got: Vec<String> = all_values::roots_by_evaluation(field, &f, q, &Control::new())
                    .unwrap()
                    .iter()
                    .map(|a| field.format(a))
                    .collect();
                got.sort();
                assert_eq!(got, brute_force_roots(field, &f), "{spec} length {len}");
            }
        });
    }
}

/// Random draws cover the whole field, not only the first 2^64 elements of its enumeration:
/// about half of the draws have the top coefficient (or top bit) set. 200 draws, binomial with
/// p = 1/2: outside 60..140 has probability below 1e-8.
#[test]
fn random_draws_cover_fields_beyond_two_to_the_sixty_four() {
    use crate::extension::ExtensionField;
    use crate::field::BigPrimeField;
    let mut rng = Rng::new(12);
    let binary = ExtensionField::with_default_modulus(2, 127).unwrap();
    let p = (num_bigint::BigUint::from(1u32) << 255u32) - 19u32;
    let big = BigPrimeField::<4>::new(&p).unwrap();
    let half = num_bigint::BigUint::from(1u32) << 254u32;
    let in_range = |hits: usize| (60..140).contains(&hits);
    let top = |a: &[u64]| a[126] == 1;
    let high = |a: &[u64; 4]| big.to_biguint(a) >= half;
    let draws = |f: &dyn Fn(&mut Rng) -> bool, rng: &mut Rng| (0..200).filter(|_| f(rng)).count();
    let counts = [
        draws(&|r| top(&random_element(&binary, r)), &mut rng),
        draws(
            &|r| top(&crate::field::uniform_element(&binary, r)),
            &mut rng,
        ),
        draws(&|r| high(&random_element(&big, r)), &mut rng),
        draws(&|r| high(&crate::field::uniform_element(&big, r)), &mut rng),
        draws(&|r| top(&r.nonzero(&binary)), &mut rng),
    ];
    assert!(counts.iter().all(|&c| in_range(c)), "{counts:?}");
}

/// Roots of a product of linear factors over GF(2^127) on its sparse default modulus: the
/// equal-degree splitting by the trace needs random elements from the whole field (it never
/// split when the draws stayed among the first 2^64 elements).
#[test]
fn roots_over_a_binary_field_beyond_two_to_the_sixty_four() {
    let mut rng = Rng::new(13);
    let any = AnyField::parse("GF(2^127)").unwrap();
    with_any_field!(&any, field => {
        let a = field.generator().unwrap();
        let mut planted: Vec<_> = (0..6).map(|_| random_element(field, &mut rng)).collect();
        planted.extend((0..4).map(|i| field.add(&field.pow(&a, 100 + i), &field.from_i64(1))));
        planted.push(field.zero());
        planted.push(field.one());
        let f = multiply(field, &from_roots(field, &planted), &random_poly(field, &mut rng, 5));
        let found = roots(field, &f, &Control::new()).unwrap();
        for r in &found {
            assert!(field.is_zero(&evaluate(field, &f, r)), "not a root");
        }
        for r in &planted {
            assert!(found.contains(r), "planted root missing");
        }
    });
}

/// a mod b by one row operation per quotient coefficient (the reference for the reductions).
fn schoolbook_remainder<F: Field>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Univariate<F> {
    let db = b.len() - 1;
    let lead_inv = field.inv(&b[db]).unwrap();
    let mut r = a.to_vec();
    for top in (db..r.len()).rev() {
        let c = field.mul(&r[top], &lead_inv);
        for (x, y) in r[top - db..=top].iter_mut().zip(b) {
            *x = field.sub(x, &field.mul(&c, y));
        }
    }
    r.truncate(db);
    trimmed(field, r)
}

#[test]
fn reductions_with_the_transforms_of_the_modulus_agree_with_schoolbook_division() {
    // Word primes (one to three transform primes), primes of 2, 4 and 8 limbs (2^127 − 1,
    // 2^255 − 19, the 384-bit prime of the wide products above) and a binary field (no
    // transform path). Degrees around the powers of two where the transform lengths change.
    let p384 = "39402006196394479212279040100143613805079739270465446667948293404245721771496870329047266088258938001861606973112319";
    let mut rng = Rng::new(19);
    for spec in [
        "GF(65521)".to_string(),
        "GF(2305843009213693951)".to_string(),
        "GF(9223372036854775783)".to_string(),
        "GF(170141183460469231731687303715884105727)".to_string(),
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)"
            .to_string(),
        format!("GF({p384})"),
        "GF(2^16)".to_string(),
    ] {
        let any = AnyField::parse(&spec).unwrap();
        with_any_field!(&any, field => {
            for d in [128, 129, 200, 255, 256, 257] {
                let f = random_poly(field, &mut rng, d + 1);
                let modulo = Modulo::new(field, &f);
                let (x, y) = (random_poly(field, &mut rng, d), random_poly(field, &mut rng, d));
                let product = multiply(field, &x, &y);
                assert_eq!(modulo.multiply(&x, &y), schoolbook_remainder(field, &product, &f), "{spec} d={d}");
                assert_eq!(modulo.square(&x), schoolbook_remainder(field, &square(field, &x), &f), "{spec} d={d} square");
                let shorter = random_poly(field, &mut rng, d + d / 2 + 1);
                assert_eq!(modulo.reduce(&shorter), schoolbook_remainder(field, &shorter, &f), "{spec} d={d} shorter");
                // Every coefficient −1: the integer products reach their bound.
                let top = vec![field.neg(&field.one()); 2 * d - 1];
                let mut g = vec![field.neg(&field.one()); d];
                g.push(field.one());
                assert_eq!(Modulo::new(field, &g).reduce(&top), schoolbook_remainder(field, &top, &g), "{spec} d={d} extreme");
            }
        });
    }
}

#[test]
fn wide_products_of_extreme_coefficients_agree_with_the_schoolbook_product() {
    // Coefficients p − 1 make the integer coefficients of the product as large as they get,
    // where the rounding of the explicit Chinese remainder step has the least room.
    for spec in [
        "GF(170141183460469231731687303715884105727)",
        "GF(57896044618658097711785492504343953926634992332820282019728792003956564819949)",
    ] {
        let any = AnyField::parse(spec).unwrap();
        with_any_field!(&any, field => {
            let a = vec![field.neg(&field.one()); 700];
            let b = vec![field.neg(&field.one()); 300];
            assert_eq!(multiply(field, &a, &b), schoolbook(field, &a, &b), "{spec}");
            assert_eq!(square(field, &a), schoolbook(field, &a, &a), "{spec} square");
        });
    }
}
