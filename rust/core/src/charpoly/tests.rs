//! The characteristic polynomial against Berkowitz's algorithm, textbook matrices and sequences.

use super::berkowitz::berkowitz;
use super::bounds::interpolation_grid;
use super::characteristic_polynomial;
use super::hessenberg::hessenberg_charpoly;
use super::interpolation::interpolate_in;
use super::krylov::{berlekamp_massey, projection_vector, scalar_charpoly, Columns};
use crate::charpoly::scalars::{Generic, Scalars, Words};
use crate::control::Control;
use crate::field::Field;
use crate::field::PrimeField;
use crate::order::MonomialOrder;
use crate::parse::parse_poly;
use crate::poly::{Poly, Ring};

/// Both methods on the same random matrices: interpolation over GF(101) (in words and in the
/// field's arithmetic), Berkowitz forced.
#[test]
fn interpolation_agrees_with_berkowitz() {
    let mut rng = crate::rng::Rng::new(9);
    for (nvars, size) in (1..=3).flat_map(|d| (0..6).map(move |s| (d, s))) {
        let names = ["s", "t", "u"][..nvars]
            .iter()
            .map(|v| v.to_string())
            .collect();
        let ring = Ring::new(PrimeField::new(101).unwrap(), names, MonomialOrder::Grevlex).unwrap();
        let a: Vec<Vec<Poly<PrimeField>>> = (0..size)
            .map(|_| {
                (0..size)
                    .map(|_| {
                        let terms = (0..3).map(|_| {
                            let e = (0..nvars)
                                .map(|i| (rng.next_u64() % (3 - i as u64 % 2)) as u32)
                                .collect();
                            (
                                crate::Monomial::from_exponents(e).unwrap(),
                                rng.next_u64() % 101,
                            )
                        });
                        ring.from_terms(terms)
                    })
                    .collect()
            })
            .collect();
        let fast = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
        let grid = interpolation_grid(&ring, &a).unwrap();
        let expected = berkowitz(&ring, &a, &Control::new()).unwrap();
        assert_eq!(fast, expected, "{nvars} variables, size {size}");
        // The same interpolation in the field's own arithmetic, the path of every field
        // that is not a word-size prime field.
        let generic = interpolate_in(&Generic(&ring.field), &ring, &a, &grid, &Control::new());
        assert_eq!(generic.unwrap(), expected, "{nvars} variables, size {size}");
    }
}

/// A random r × r matrix over `ring` whose entries have up to three terms with exponents
/// below `most` in each variable.
fn random_polynomial_matrix<F: Field>(
    ring: &Ring<F>,
    rng: &mut crate::rng::Rng,
    size: usize,
    most: u64,
) -> Vec<Vec<Poly<F>>> {
    let q = crate::field::field_size(&ring.field).unwrap();
    (0..size)
        .map(|_| {
            (0..size)
                .map(|_| {
                    let terms = (0..3).map(|_| {
                        let e = (0..ring.nvars())
                            .map(|_| (rng.next_u64() % most) as u32)
                            .collect();
                        let c = ring.field.element_from_index(rng.next_u64() % q);
                        (crate::Monomial::from_exponents(e).unwrap(), c)
                    });
                    ring.from_terms(terms)
                })
                .collect()
        })
        .collect()
}

/// Over fields with fewer elements than the degrees need as points (GF(2), GF(7), GF(4)),
/// interpolation runs in an extension of the field and gives what Berkowitz's algorithm
/// gives over the field itself, on random matrices whose degree bounds exceed the field.
#[test]
fn interpolation_in_an_extension_agrees_with_berkowitz() {
    fn agree<F: Field>(field: F, seed: u64) {
        let mut rng = crate::rng::Rng::new(seed);
        let q = crate::field::field_size(&field).unwrap();
        let mut extended = 0;
        for (nvars, size) in [(1, 3), (1, 6), (2, 4), (2, 6), (3, 3)] {
            let names = ["s", "t", "u"][..nvars]
                .iter()
                .map(|v| v.to_string())
                .collect();
            let ring = Ring::new(field.clone(), names, MonomialOrder::Grevlex).unwrap();
            let a = random_polynomial_matrix(&ring, &mut rng, size, 4);
            let grid = interpolation_grid(&ring, &a).unwrap();
            if grid.bounds.iter().any(|&b| b >= q) {
                extended += 1;
            }
            let expected = berkowitz(&ring, &a, &Control::new()).unwrap();
            let fast = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
            assert_eq!(
                fast,
                expected,
                "{} {nvars} variables, size {size}",
                field.spec()
            );
        }
        assert!(
            extended >= 3,
            "{}: the extension must be exercised",
            field.spec()
        );
    }
    agree(PrimeField::new(2).unwrap(), 1);
    agree(PrimeField::new(7).unwrap(), 2);
    let crate::field_kind::AnyField::Table(gf4) =
        crate::field_kind::AnyField::parse("GF(4)").unwrap()
    else {
        panic!("GF(4) is a table field")
    };
    agree(gf4, 3);
}

/// The sequence u·(A^T)^k e_1, k < 2r, of one matrix, through the lanes.
fn sequence<S: Scalars>(s: &S, a: &[Vec<S::E>], u: &[S::E]) -> Vec<S::E> {
    let columns = Columns::new(a.len(), |j, k| !s.is_zero(&a[j][k]));
    columns.sequences(s, &[a.to_vec()], u).pop().unwrap()
}

/// det(x·Id - A) by the sequence when it has full degree, else by Hessenberg reduction.
fn charpoly_of<S: Scalars>(s: &S, a: Vec<Vec<S::E>>, u: &[S::E]) -> Vec<S::E> {
    let sequence = sequence(s, &a, u);
    scalar_charpoly(s, a, &sequence)
}

/// det(x·Id - A) by the sequence alone: `None` when its minimal polynomial falls short.
fn sequence_charpoly<S: Scalars>(s: &S, a: &[Vec<S::E>], u: &[S::E]) -> Option<Vec<S::E>> {
    let connection = berlekamp_massey(s, &sequence(s, a, u));
    (connection.len() == a.len() + 1).then(|| connection.into_iter().rev().collect())
}

/// The sequence shortcut agrees with Hessenberg reduction where it applies, and declines
/// the matrices that are not cyclic for the first unit vector (a scalar matrix); both in the
/// field's arithmetic and in machine words.
#[test]
fn sequence_agrees_with_hessenberg() {
    let field = PrimeField::new(101).unwrap();
    let generic = Generic(&field);
    let words = Words::new(&field).unwrap();
    let mut rng = crate::rng::Rng::new(4);
    let mut used = 0;
    for size in 1..9 {
        let u = projection_vector(&generic, &field, size);
        assert_eq!(u, projection_vector(&words, &field, size));
        for sparse in [false, true] {
            let a = random_matrix(&mut rng, size, 101, sparse);
            if let Some(k) = sequence_charpoly(&generic, &a, &u) {
                assert_eq!(k, hessenberg_charpoly(&generic, a.clone()), "{a:?}");
                assert_eq!(Some(k), sequence_charpoly(&words, &a, &u), "{a:?}");
                used += 1;
            }
            let expected = hessenberg_charpoly(&generic, a.clone());
            assert_eq!(hessenberg_charpoly(&words, a.clone()), expected);
            assert_eq!(charpoly_of(&generic, a.clone(), &u), expected);
            assert_eq!(charpoly_of(&words, a, &u), expected);
        }
    }
    assert!(
        used > 8,
        "the shortcut should apply to most random matrices"
    );
    let scalar = vec![vec![3, 0], vec![0, 3]];
    let u = projection_vector(&generic, &field, 2);
    assert_eq!(sequence_charpoly(&generic, &scalar, &u), None);
    // (x - 3)^2 = x^2 - 6x + 9 over GF(101).
    assert_eq!(charpoly_of(&words, scalar.clone(), &u), vec![9, 95, 1]);
    assert_eq!(charpoly_of(&generic, scalar, &u), vec![9, 95, 1]);
}

/// Berlekamp–Massey finds the Fibonacci recurrence s_n - s_{n-1} - s_{n-2} = 0 from four
/// terms, and a geometric sequence's s_n - 3·s_{n-1} = 0 (textbook facts), over GF(101);
/// the all-zero sequence has the empty recurrence.
#[test]
fn berlekamp_massey_on_textbook_sequences() {
    let field = PrimeField::new(101).unwrap();
    let words = Words::new(&field).unwrap();
    assert_eq!(berlekamp_massey(&words, &[1, 1, 2, 3]), vec![1, 100, 100]);
    assert_eq!(
        berlekamp_massey(&words, &[0, 1, 1, 2, 3, 5, 8, 13]),
        vec![1, 100, 100]
    );
    assert_eq!(berlekamp_massey(&words, &[2, 6, 18, 54]), vec![1, 98]);
    assert_eq!(berlekamp_massey(&words, &[0, 0, 0]), vec![1]);
}

fn random_matrix(rng: &mut crate::rng::Rng, size: usize, p: u64, sparse: bool) -> Vec<Vec<u64>> {
    (0..size)
        .map(|_| {
            (0..size)
                .map(|_| {
                    if sparse && !rng.next_u64().is_multiple_of(3) {
                        0
                    } else {
                        rng.next_u64() % p
                    }
                })
                .collect()
        })
        .collect()
}

/// Word arithmetic over GF(4294967291) (2^32 - 5, the largest prime below 2^32) gives the
/// same characteristic polynomials as the field's own arithmetic on random 30 × 30 matrices,
/// the size of the batch benchmark's multiplication matrices.
#[test]
fn words_agree_with_the_field_near_two_to_the_32() {
    let p = 4_294_967_291;
    let field = PrimeField::new(p).unwrap();
    let words = Words::new(&field).unwrap();
    let mut rng = crate::rng::Rng::new(17);
    for sparse in [false, true] {
        let a = random_matrix(&mut rng, 30, p, sparse);
        let expected = hessenberg_charpoly(&Generic(&field), a.clone());
        let u = projection_vector(&words, &field, 30);
        assert!(sequence_charpoly(&words, &a, &u).is_some());
        assert_eq!(charpoly_of(&words, a.clone(), &u), expected);
        assert_eq!(hessenberg_charpoly(&words, a), expected);
    }
}

/// A textbook example: [[2, 1], [1, 2]] has eigenvalues 1 and 3, so det(x·Id - A) =
/// x^2 - 4x + 3 (Strang, *Linear Algebra and Its Applications*, §5.1); over GF(4294967291)
/// that is [3, p - 4, 1]. And a triangular matrix has the product of (x - a_ii).
#[test]
fn textbook_characteristic_polynomials_in_words() {
    let p = 4_294_967_291;
    let field = PrimeField::new(p).unwrap();
    let words = Words::new(&field).unwrap();
    let u = projection_vector(&words, &field, 3);
    assert_eq!(
        charpoly_of(&words, vec![vec![2, 1], vec![1, 2]], &u[..2]),
        vec![3, p - 4, 1]
    );
    // (x - 1)(x - 2)(x - 5) = x^3 - 8x^2 + 17x - 10.
    let upper = vec![vec![1, 7, 9], vec![0, 2, 4], vec![0, 0, 5]];
    assert_eq!(charpoly_of(&words, upper, &u), vec![p - 10, 17, p - 8, 1]);
}

#[test]
fn two_by_two_and_companion() {
    let ring = Ring::new(
        PrimeField::new(101).unwrap(),
        vec!["t".into()],
        MonomialOrder::Grevlex,
    )
    .unwrap();
    let p = |s: &str| parse_poly(&ring, s).unwrap();
    // det(x - [[a, b], [c, d]]) = x^2 - (a + d) x + (ad - bc).
    let a = vec![vec![p("t"), p("2")], vec![p("3"), p("t + 1")]];
    let cp = characteristic_polynomial(&ring, &a, &Control::new()).unwrap();
    assert_eq!(cp, vec![p("1"), p("-2*t - 1"), p("t^2 + t - 6")]);
    // The companion matrix of x^3 + t x + 5 has that characteristic polynomial (Lang, Algebra).
    let z = Poly::zero;
    let comp = vec![
        vec![z(), z(), p("-5")],
        vec![p("1"), z(), p("-t")],
        vec![z(), p("1"), z()],
    ];
    let cp = characteristic_polynomial(&ring, &comp, &Control::new()).unwrap();
    assert_eq!(cp, vec![p("1"), z(), p("t"), p("5")]);
}
