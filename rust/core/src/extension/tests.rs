//! GF(p^k) against published values and independent brute force.

use super::*;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::Ring;
use proptest::prelude::*;

fn modulus(p: u64, text: &str) -> Modulus {
    Modulus::parse(PrimeField::new(p).unwrap(), None, text).unwrap()
}
fn default_modulus(p: u64, k: u32) -> Modulus {
    Modulus::first_irreducible(PrimeField::new(p).unwrap(), k).unwrap()
}

/// Irreducibility by trial division by every monic polynomial of degree 1..=n/2 (independent of
/// Rabin's test used by the field).
fn irreducible_by_trial_division(p: u64, f: &[u64]) -> bool {
    let n = f.len() - 1;
    let base = PrimeField::new(p).unwrap();
    for d in 1..=n / 2 {
        for code in 0..p.pow(d as u32) {
            let mut g: Vec<u64> = (0..d).map(|i| (code / p.pow(i as u32)) % p).collect();
            g.push(1);
            // Long division of f by monic g.
            let mut r = f.to_vec();
            for top in (d..=n).rev() {
                let c = r[top];
                for j in 0..=d {
                    r[top - d + j] = base.sub(&r[top - d + j], &base.mul(&c, &g[j]));
                }
            }
            if r[..d].iter().all(|&x| x == 0) {
                return false;
            }
        }
    }
    true
}

#[test]
fn default_modulus_is_the_first_irreducible() {
    // GF(2^8): a^8 + a^4 + a^3 + a + 1, the modulus of FIPS-197 (AES) §4.2, from memory.
    assert_eq!(default_modulus(2, 8).text(), "a^8 + a^4 + a^3 + a + 1");
    for (p, k) in [
        (2u64, 2u32),
        (2, 3),
        (2, 4),
        (2, 8),
        (3, 2),
        (3, 3),
        (3, 5),
        (5, 2),
        (7, 3),
        (2, 16),
    ] {
        let m = default_modulus(p, k);
        assert!(
            irreducible_by_trial_division(p, m.coefficients()),
            "GF({p}^{k})"
        );
        // Every smaller monic polynomial of degree k (integer order) is reducible.
        let code_of = |c: &[u64]| c.iter().rev().skip(1).fold(0u64, |acc, &d| acc * p + d);
        if p.pow(k) <= 1 << 10 {
            for code in 0..code_of(m.coefficients()) {
                let mut g: Vec<u64> = (0..k).map(|i| (code / p.pow(i)) % p).collect();
                g.push(1);
                assert!(
                    !irreducible_by_trial_division(p, &g),
                    "GF({p}^{k}) code {code}"
                );
            }
        }
    }
}

#[test]
fn count_of_irreducibles_matches_gauss_formula() {
    // Number of monic irreducibles of degree n over GF(p): (1/n) Σ_{d|n} μ(d) p^(n/d) (Gauss;
    // Lidl and Niederreiter, Thm 3.25). Values: p=2: n=2..8 → 1, 2, 3, 6, 9, 18, 30;
    // p=3: n=2..4 → 3, 8, 18.
    let cases: [(u64, &[u64]); 2] = [(2, &[1, 2, 3, 6, 9, 18, 30]), (3, &[3, 8, 18])];
    for (p, counts) in cases {
        for (i, &expected) in counts.iter().enumerate() {
            let n = i as u32 + 2;
            let count = (0..p.pow(n))
                .filter(|code| {
                    let mut g: Vec<u64> = (0..n).map(|j| (code / p.pow(j)) % p).collect();
                    g.push(1);
                    Modulus::new(PrimeField::new(p).unwrap(), g).is_ok()
                })
                .count() as u64;
            assert_eq!(count, expected, "degree {n} over GF({p})");
        }
    }
}

#[test]
fn aes_products_from_fips_197() {
    // FIPS-197 §4.2: {57}·{83} = {c1}; §4.2.1: {57}·{13} = {fe}; §4.2 also {53}^-1 = {ca}
    // (the S-box example's inverse, from memory).
    let t = TableField::new(default_modulus(2, 8)).unwrap();
    let e = ExtensionField::new(default_modulus(2, 8));
    assert_eq!(t.mul(&0x57, &0x83), 0xc1);
    assert_eq!(t.mul(&0x57, &0x13), 0xfe);
    assert_eq!(t.inv(&0x53), Some(0xca));
    let enc = |x: &[u64]| t.encode(x);
    assert_eq!(
        enc(&e.mul(
            &e.from_coefficients(&t.decode(0x57)),
            &e.from_coefficients(&t.decode(0x83))
        )),
        0xc1
    );
    assert_eq!(
        enc(&e.inv(&e.from_coefficients(&t.decode(0x53))).unwrap()),
        0xca
    );
}

#[test]
fn reducible_and_malformed_moduli_are_clear_errors() {
    let gf2 = || PrimeField::new(2).unwrap();
    let e = Modulus::parse(gf2(), Some(8), "a^8+1")
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("a^8 + 1 is reducible over GF(2)") && e.contains("a = 1 is a root"),
        "{e}"
    );
    let e = Modulus::parse(gf2(), Some(4), "a^4+a^2+1")
        .unwrap_err()
        .to_string();
    assert!(e.contains("reducible"), "{e}"); // (a^2+a+1)^2, no root
    let e = Modulus::parse(gf2(), Some(8), "a^4+a+1")
        .unwrap_err()
        .to_string();
    assert!(e.contains("degree 4, but the field needs degree 8"), "{e}");
    let e = Modulus::parse(gf2(), Some(8), "a^8+b")
        .unwrap_err()
        .to_string();
    assert!(e.contains("unknown variable 'b'"), "{e}");
}

/// The Hermitian curve y^q + y = x^(q+1) over GF(q^2) has q^3 affine points (Stichtenoth,
/// Algebraic Function Fields and Codes, from memory): counted by brute force over all pairs.
fn hermitian_count<F: Field>(f: &F, q: u64) -> u64 {
    let all = f.small_elements(1 << 16).unwrap();
    let mut n = 0;
    for x in &all {
        let rhs = f.pow(x, q + 1);
        n += all.iter().filter(|y| f.add(&f.pow(y, q), y) == rhs).count() as u64;
    }
    n
}

#[test]
fn hermitian_curves_have_q_cubed_points() {
    for (p, k, q) in [(2u64, 2u32, 2u64), (3, 2, 3), (2, 4, 4)] {
        let m = default_modulus(p, k);
        assert_eq!(
            hermitian_count(&TableField::new(m.clone()).unwrap(), q),
            q * q * q,
            "table q={q}"
        );
        assert_eq!(
            hermitian_count(&ExtensionField::new(m), q),
            q * q * q,
            "general q={q}"
        );
    }
}

#[test]
fn text_round_trip_with_the_generator() {
    let f = TableField::new(default_modulus(3, 2)).unwrap();
    let r = Ring::new(f, vec!["x".into(), "y".into()], MonomialOrder::Grevlex).unwrap();
    let g = parse_poly(&r, "a^3*x + y + a*a + 2").unwrap();
    let text = r.format(&g);
    assert_eq!(parse_poly(&r, &text).unwrap(), g, "{text}");
    // a^2 = -1 in GF(3)[a]/(a^2 + 1), the default modulus of GF(9); so a^3 = -a = 2a.
    assert_eq!(f_spec(&r.field), "GF(3^2)");
    assert_eq!(text, "2*a*x + y + 1");
    let e = Ring::new(r.field.clone(), vec!["a".into()], MonomialOrder::Lex).unwrap_err();
    assert!(e.to_string().contains("clashes with the generator"));
}

fn f_spec<F: Field>(f: &F) -> String {
    f.spec()
}

#[test]
fn spec_names_non_default_moduli() {
    let t = TableField::new(modulus(2, "a^8+a^4+a^3+a^2+1")).unwrap();
    assert_eq!(t.spec(), "GF(2)[a]/(a^8 + a^4 + a^3 + a^2 + 1)");
    assert_eq!(
        TableField::new(default_modulus(2, 8)).unwrap().spec(),
        "GF(2^8)"
    );
    assert_eq!(t.order().unwrap(), "256");
    let big = ExtensionField::with_default_modulus((1 << 61) - 1, 3).unwrap();
    // (2^61 - 1)^3, as printed by Python's exact integers.
    assert_eq!(
        big.order().unwrap(),
        "12259964326927110850916040267783483001021757281745764351"
    );
}

fn check_axioms<F: Field>(f: &F, a: u64, b: u64, c: u64) {
    let (a, b, c) = (
        f.element_from_index(a),
        f.element_from_index(b),
        f.element_from_index(c),
    );
    assert_eq!(f.add(&a, &b), f.add(&b, &a));
    assert_eq!(f.mul(&a, &b), f.mul(&b, &a));
    assert_eq!(f.mul(&f.mul(&a, &b), &c), f.mul(&a, &f.mul(&b, &c)));
    assert_eq!(f.add(&f.add(&a, &b), &c), f.add(&a, &f.add(&b, &c)));
    assert_eq!(
        f.mul(&a, &f.add(&b, &c)),
        f.add(&f.mul(&a, &b), &f.mul(&a, &c))
    );
    assert!(f.is_zero(&f.add(&a, &f.neg(&a))));
    assert_eq!(f.sub(&a, &b), f.add(&a, &f.neg(&b)));
    if !f.is_zero(&a) {
        assert!(f.is_one(&f.mul(&a, &f.inv(&a).unwrap())));
    }
    let p: u64 = f.characteristic().parse().unwrap();
    assert_eq!(f.pow(&f.pth_root(&a).unwrap(), p), a);
}

/// The fields under test, built once (tables of GF(2^16) take a moment).
fn small_fields() -> &'static [(TableField, ExtensionField)] {
    static FIELDS: std::sync::OnceLock<Vec<(TableField, ExtensionField)>> =
        std::sync::OnceLock::new();
    FIELDS.get_or_init(|| {
        [(2u64, 2u32), (2, 3), (3, 2), (2, 8), (3, 5), (2, 16)]
            .iter()
            .map(|&(p, k)| {
                let m = default_modulus(p, k);
                (TableField::new(m.clone()).unwrap(), ExtensionField::new(m))
            })
            .collect()
    })
}

fn large_fields() -> &'static [ExtensionField] {
    static FIELDS: std::sync::OnceLock<Vec<ExtensionField>> = std::sync::OnceLock::new();
    FIELDS.get_or_init(|| {
        [(2u64, 20u32), (65521, 3), ((1 << 61) - 1, 2), (3, 41)]
            .iter()
            .map(|&(p, k)| ExtensionField::with_default_modulus(p, k).unwrap())
            .collect()
    })
}

fn binary_fields() -> &'static [(BinaryField, ExtensionField)] {
    static FIELDS: std::sync::OnceLock<Vec<(BinaryField, ExtensionField)>> =
        std::sync::OnceLock::new();
    FIELDS.get_or_init(|| {
        let mut moduli: Vec<Modulus> = [17u32, 32, 61, 64]
            .iter()
            .map(|&k| default_modulus(2, k))
            .collect();
        // A dense modulus makes the reduction fold many times: the last irreducible of degree
        // 64 in integer order (found by search from the top).
        let gf2 = PrimeField::new(2).unwrap();
        let dense = (0u64..)
            .find_map(|i| {
                let low = u64::MAX - i;
                let mut c: Vec<u64> = (0..64).map(|b| (low >> b) & 1).collect();
                c.push(1);
                Modulus::new(gf2.clone(), c).ok()
            })
            .unwrap();
        moduli.push(dense);
        moduli
            .into_iter()
            .map(|m| (BinaryField::new(m.clone()).unwrap(), ExtensionField::new(m)))
            .collect()
    })
}

proptest! {
    #[test]
    fn binary_fields_satisfy_the_axioms_and_agree_with_the_general_representation(a in any::<u64>(), b in any::<u64>(), c in any::<u64>()) {
        for (f, e) in binary_fields() {
            check_axioms(f, a, b, c);
            let (x, y) = (f.element_from_index(a), f.element_from_index(b));
            let bits = |v: u64| (0..64).map(|i| (v >> i) & 1).collect::<Vec<u64>>();
            let (u, v) = (e.from_coefficients(&bits(x)), e.from_coefficients(&bits(y)));
            prop_assert_eq!(e.from_coefficients(&bits(f.mul(&x, &y))), e.mul(&u, &v));
            if x != 0 {
                prop_assert_eq!(e.from_coefficients(&bits(f.inv(&x).unwrap())), e.inv(&u).unwrap());
            }
            prop_assert_eq!(f.format(&x), e.format(&u));
        }
    }

    #[test]
    fn table_and_general_fields_satisfy_the_axioms_and_agree(a in any::<u64>(), b in any::<u64>(), c in any::<u64>()) {
        for (t, e) in small_fields() {
            check_axioms(t, a, b, c);
            check_axioms(e, a, b, c);
            let (x, y) = (t.element_from_index(a), t.element_from_index(b));
            let (u, v) = (e.from_coefficients(&t.decode(x)), e.from_coefficients(&t.decode(y)));
            prop_assert_eq!(t.decode(t.mul(&x, &y)), e.mul(&u, &v).to_vec());
            prop_assert_eq!(t.decode(t.add(&x, &y)), e.add(&u, &v).to_vec());
        }
    }

    #[test]
    fn large_extension_fields_satisfy_the_axioms(a in any::<u64>(), b in any::<u64>(), c in any::<u64>()) {
        for e in large_fields() {
            check_axioms(e, a, b, c);
        }
    }
}
