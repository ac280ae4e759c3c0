//! Checks of the Boolean path against brute force (every point of GF(2)^n evaluated), against
//! the general Gröbner engine with the field equations written out, and against a published
//! S-box fact.

use super::*;
use crate::groebner::{groebner_basis, Engine};
use crate::rng::Rng;

fn ring(n: usize, order: BoolOrder) -> BooleanRing {
    BooleanRing::new((0..n).map(|i| format!("x{i}")).collect(), order).unwrap()
}

/// A random polynomial: every square-free monomial of degree ≤ `degree` with probability
/// `percent` / 100.
fn random_poly(r: &BooleanRing, degree: u32, percent: u64, rng: &mut Rng) -> BoolPoly {
    let n = r.nvars();
    let mut data = Vec::new();
    let mut push = |vars: &[usize]| {
        let mut m = vec![0u64; r.words()];
        for &v in vars {
            m[v / 64] |= 1 << (v % 64);
        }
        data.extend(m);
    };
    let mut chosen = |vars: &[usize], rng: &mut Rng| {
        if rng.below(100) < percent {
            push(vars);
        }
    };
    chosen(&[], rng);
    for a in 0..n {
        chosen(&[a], rng);
        if degree >= 2 {
            for b in a + 1..n {
                chosen(&[a, b], rng);
                if degree >= 3 {
                    for c in b + 1..n {
                        chosen(&[a, b, c], rng);
                    }
                }
            }
        }
    }
    r.from_words(&data).unwrap()
}

/// `m` random polynomials; with `planted`, each is made to vanish at that point (by its
/// constant term), so the system has at least one solution.
fn random_system(
    r: &BooleanRing,
    m: usize,
    degree: u32,
    percent: u64,
    planted: Option<&[bool]>,
    rng: &mut Rng,
) -> Vec<BoolPoly> {
    (0..m)
        .map(|_| {
            let f = random_poly(r, degree, percent, rng);
            match planted {
                Some(p) if r.evaluate(&f, p).unwrap() => r.add(&f, &r.one()).unwrap(),
                _ => f,
            }
        })
        .collect()
}

/// Every point of GF(2)^n where all of `gens` vanish, in increasing order of the number with
/// bit v = x_v.
fn brute_force(r: &BooleanRing, gens: &[BoolPoly]) -> Vec<Vec<bool>> {
    let n = r.nvars();
    (0u64..1 << n)
        .map(|x| (0..n).map(|v| x >> v & 1 == 1).collect::<Vec<bool>>())
        .filter(|p| gens.iter().all(|g| !r.evaluate(g, p).unwrap()))
        .collect()
}

fn random_point(n: usize, rng: &mut Rng) -> Vec<bool> {
    (0..n).map(|_| rng.below(2) == 1).collect()
}

/// Systems of every kind the tests run on: sizes up to 16 variables (up to 10 for lex and
/// deglex, whose bases of random systems are far costlier), over- and underdetermined, with
/// and without a planted solution, quadratic, cubic and linear, dense and sparse.
fn systems(order: BoolOrder, rng: &mut Rng) -> Vec<(BooleanRing, Vec<BoolPoly>)> {
    let mut out = Vec::new();
    let shapes: [(usize, usize, u32, u64); 12] = [
        (1, 1, 1, 50),
        (3, 2, 2, 50),
        (5, 3, 2, 50),
        (6, 6, 2, 50),
        (8, 4, 2, 30),
        (8, 8, 3, 20),
        (10, 10, 2, 50),
        (10, 20, 2, 50),
        (12, 6, 2, 10),
        (13, 13, 2, 50),
        (16, 16, 2, 50),
        (16, 32, 2, 50),
    ];
    let largest = if order == BoolOrder::Grevlex { 16 } else { 10 };
    for (i, &(n, m, degree, percent)) in shapes.iter().enumerate() {
        if n > largest {
            continue;
        }
        let r = ring(n, order);
        let planted = (i % 2 == 0).then(|| random_point(n, rng));
        let gens = random_system(&r, m, degree, percent, planted.as_deref(), rng);
        out.push((r, gens));
    }
    out
}

#[test]
fn exhaustive_search_equals_brute_force() {
    let mut rng = Rng::new(18);
    for (r, gens) in systems(BoolOrder::Grevlex, &mut rng) {
        let expected = brute_force(&r, &gens);
        let found = solve(&r, &gens, Method::Exhaustive, None, &Control::new()).unwrap();
        assert_eq!(found.points, expected, "n = {}", r.nvars());
        assert_eq!(found.count, Some(BigUint::from(expected.len())));
        let counted = count(&r, &gens, Method::Exhaustive, &Control::new()).unwrap();
        assert_eq!(counted.count, Some(BigUint::from(expected.len())));
        let first = solve(&r, &gens, Method::Exhaustive, Some(1), &Control::new()).unwrap();
        assert_eq!(first.points.len(), expected.len().min(1));
        assert!(first.points.iter().all(|p| expected.contains(p)));
    }
}

/// Brute force for up to 64 variables on monomial masks (bit v = x_v): the points, as numbers,
/// where every equation has an even number of monomials inside the point.
fn brute_force_masks(r: &BooleanRing, gens: &[BoolPoly]) -> Vec<u64> {
    let eqs: Vec<Vec<u64>> = gens
        .iter()
        .map(|g| g.monomials().map(|m| m[0]).collect())
        .collect();
    (0u64..1 << r.nvars())
        .filter(|&x| {
            eqs.iter()
                .all(|eq| eq.iter().filter(|&&m| m & !x == 0).count() % 2 == 0)
        })
        .collect()
}

fn as_numbers(points: &[Vec<bool>]) -> Vec<u64> {
    points
        .iter()
        .map(|p| p.iter().enumerate().map(|(v, &b)| (b as u64) << v).sum())
        .collect()
}

/// More than 64 equations: the walk filters on the first 64, the rest are checked per
/// candidate. Cubic equations take the general walk; more than 20 variables split the search
/// over several walks (both kernels).
#[test]
fn exhaustive_search_with_many_equations_degree_three_and_split_walks() {
    let mut rng = Rng::new(64);
    let r = ring(10, BoolOrder::Grevlex);
    let planted = random_point(10, &mut rng);
    let mut gens = random_system(&r, 64, 2, 50, Some(&planted), &mut rng);
    gens.extend(random_system(&r, 6, 2, 50, None, &mut rng));
    let expected = brute_force(&r, &gens);
    let found = solve(&r, &gens, Method::Exhaustive, None, &Control::new()).unwrap();
    assert_eq!(found.points, expected);
    for (n, m, degree, percent) in [
        (12, 6, 3, 10),
        (16, 16, 3, 5),
        (22, 3, 3, 1),
        (23, 4, 2, 30),
    ] {
        let r = ring(n, BoolOrder::Grevlex);
        let planted = random_point(n, &mut rng);
        let gens = random_system(&r, m, degree, percent, Some(&planted), &mut rng);
        let expected = brute_force_masks(&r, &gens);
        let found = count(&r, &gens, Method::Exhaustive, &Control::new()).unwrap();
        assert_eq!(found.count, Some(BigUint::from(expected.len())), "n = {n}");
        let found = solve(&r, &gens, Method::Exhaustive, None, &Control::new()).unwrap();
        assert_eq!(as_numbers(&found.points), expected, "n = {n}");
    }
}

#[test]
fn basis_solutions_and_counts_equal_brute_force() {
    let mut rng = Rng::new(2010);
    for order in [BoolOrder::Grevlex, BoolOrder::Lex, BoolOrder::Deglex] {
        for (r, gens) in systems(order, &mut rng) {
            let expected = brute_force(&r, &gens);
            let b = basis(&r, &gens, &Control::new()).unwrap();
            assert_eq!(
                b.count_solutions(&Control::new()).unwrap(),
                BigUint::from(expected.len()),
                "{order:?} n = {}",
                r.nvars()
            );
            assert_eq!(b.is_unit(), expected.is_empty());
            assert_eq!(b.points(None, &Control::new()).unwrap(), expected);
            // A polynomial lies in the ideal exactly when it vanishes on every solution.
            for _ in 0..3 {
                let f = random_poly(&r, 2, 30, &mut rng);
                let vanishes = expected.iter().all(|p| !r.evaluate(&f, p).unwrap());
                assert_eq!(b.contains(&f, &Control::new()).unwrap(), vanishes);
            }
        }
    }
}

#[test]
fn hybrid_equals_brute_force() {
    let mut rng = Rng::new(2009);
    for (r, gens) in systems(BoolOrder::Grevlex, &mut rng) {
        let expected = brute_force(&r, &gens);
        for k in [0, 1, 3.min(r.nvars())] {
            let found = solve(
                &r,
                &gens,
                Method::Hybrid { guess: Some(k) },
                None,
                &Control::new(),
            )
            .unwrap();
            assert_eq!(found.points, expected, "n = {} k = {k}", r.nvars());
            assert_eq!(found.count, Some(BigUint::from(expected.len())));
        }
    }
}

/// The Boolean basis is the reduced basis of the general engine over GF(2) with the field
/// equations x^2 + x added, minus those field equations (every x_v^2 + x_v is reducible by a
/// linear element x_v + c or stays as the only element with leading monomial x_v^2).
#[test]
fn boolean_bases_equal_general_bases_with_field_equations() {
    let mut rng = Rng::new(1988);
    for order in [BoolOrder::Grevlex, BoolOrder::Lex, BoolOrder::Deglex] {
        for (n, m, percent) in [
            (3, 2, 50),
            (4, 2, 50),
            (5, 3, 40),
            (6, 4, 50),
            (7, 3, 30),
            (7, 7, 50),
        ] {
            let r = ring(n, order);
            let gens = random_system(&r, m, 2, percent, None, &mut rng);
            let general = r.general_ring();
            let mut with_fe: Vec<_> = gens
                .iter()
                .map(|g| r.to_poly(general, g).unwrap())
                .collect();
            for v in 0..n {
                let x = general.var(v);
                with_fe.push(general.add(&general.mul(&x, &x).unwrap(), &x));
            }
            let expected = groebner_basis(general, &with_fe, Engine::Buchberger, &Control::new())
                .unwrap()
                .polys;
            let b = basis(&r, &gens, &Control::new()).unwrap();
            let step_degrees = b.stats.steps.iter().map(|s| s.degree);
            assert_eq!(b.stats.max_degree(), step_degrees.max().unwrap_or(0));
            assert_eq!(
                b.with_field_equations().unwrap(),
                expected,
                "with field equations, {order:?} n = {n} m = {m}"
            );
            // Drop the field equations that stay in the general basis: those are exactly the
            // elements whose leading monomial is a square.
            let expected: Vec<_> = expected
                .into_iter()
                .filter(|p| {
                    p.leading_monomial()
                        .unwrap()
                        .exponents()
                        .iter()
                        .all(|&e| e <= 1)
                })
                .collect();
            let ours: Vec<_> = b
                .polys
                .iter()
                .map(|p| r.to_poly(general, p).unwrap())
                .collect();
            assert_eq!(ours, expected, "{order:?} n = {n} m = {m}");
        }
    }
}

#[test]
fn inconsistent_and_trivial_systems() {
    let r = ring(4, BoolOrder::Grevlex);
    let gens = vec![
        r.parse("x0*x1 + 1").unwrap(),
        r.parse("x0 + x1").unwrap(),
        r.parse("x0 + 1").unwrap(),
        r.parse("x1").unwrap(),
    ];
    let b = basis(&r, &gens, &Control::new()).unwrap();
    assert!(b.is_unit());
    assert_eq!(b.count_solutions(&Control::new()).unwrap(), BigUint::ZERO);
    let empty = basis(&r, &[], &Control::new()).unwrap();
    assert!(empty.polys.is_empty());
    assert_eq!(
        empty.count_solutions(&Control::new()).unwrap(),
        BigUint::from(16u8)
    );
    // x0*x1*x2*x3 + 1 = 0 has the single solution (1, 1, 1, 1).
    let one = solve(
        &r,
        &[r.parse("x0*x1*x2*x3 + 1").unwrap()],
        Method::Basis,
        None,
        &Control::new(),
    )
    .unwrap();
    assert_eq!(one.points, vec![vec![true; 4]]);
}

/// Systems with more variables than one word holds: 100 variables, solutions counted exactly
/// (2^95 · 3 for x0 x1 = 0 with x2..x4 fixed ... checked by the standard-monomial count).
#[test]
fn many_variables() {
    let r = ring(100, BoolOrder::Grevlex);
    let gens = vec![
        r.parse("x0*x99").unwrap(),
        r.parse("x64 + x65 + 1").unwrap(),
        r.parse("x70*x71*x72 + x70").unwrap(),
    ];
    let b = basis(&r, &gens, &Control::new()).unwrap();
    // x0 x99 = 0: 3 of 4 values; x64 = x65 + 1: 2 of 4; x70 (x71 x72 + 1) = 0: 7 of 8 minus
    // those with x70 = 1 and x71 x72 = 0 (3 of them): 5 of 8. Other 93 variables free.
    let expected = BigUint::from(3u32 * 2 * 5) << 93;
    assert_eq!(b.count_solutions(&Control::new()).unwrap(), expected);
}

/// The PRESENT S-box (Bogdanov, Knudsen, Leander, Paar, Poschmann, Robshaw, Seurin and
/// Vikkelsoe, CHES 2007): its designers state that it is described by 21 linearly independent
/// quadratic equations in the eight input/output bits (from memory). Derived here: the 37
/// monomials of degree ≤ 2 in x0..x3, y0..y3 evaluated at the 16 points (x, S(x)); the
/// equations are the kernel, of dimension 37 - rank.
#[test]
fn present_sbox_has_21_quadratic_equations() {
    const SBOX: [u8; 16] = [0xC, 5, 6, 0xB, 9, 0, 0xA, 0xD, 3, 0xE, 0xF, 8, 4, 7, 1, 2];
    let mut monomials: Vec<Vec<usize>> = vec![vec![]];
    for a in 0..8 {
        monomials.push(vec![a]);
        for b in a + 1..8 {
            monomials.push(vec![a, b]);
        }
    }
    assert_eq!(monomials.len(), 37);
    // Rows: monomials; columns: the 16 inputs. The kernel of the 16 x 37 evaluation matrix is
    // the space of equations; its dimension is 37 minus the rank (= the rank of this transpose).
    let mut m = linalg::BitMatrix::zeros(37, 16);
    for (row, mono) in monomials.iter().enumerate() {
        for (x, &y) in SBOX.iter().enumerate() {
            let bits = x | (y as usize) << 4;
            if mono.iter().all(|&v| bits >> v & 1 == 1) {
                m.set(row, x);
            }
        }
    }
    let rank = linalg::row_echelon(&mut m, 0, 16, &Control::new(), &mut linalg::Work(0))
        .unwrap()
        .len();
    assert_eq!(37 - rank, 21);
    // The 21 equations are the kernel; check it through the Boolean engine too: the system of
    // the S-box graph (16 points) has exactly 16 solutions.
    let r = ring(8, BoolOrder::Grevlex);
    let points: Vec<Vec<bool>> = (0..16usize)
        .map(|x| {
            (0..8)
                .map(|v| (x | (SBOX[x] as usize) << 4) >> v & 1 == 1)
                .collect()
        })
        .collect();
    let kernel = kernel_polys(&r, &monomials, &points);
    assert_eq!(kernel.len(), 21);
    let b = basis(&r, &kernel, &Control::new()).unwrap();
    assert_eq!(
        b.count_solutions(&Control::new()).unwrap(),
        BigUint::from(16u8)
    );
}

/// A basis of the polynomials spanned by `monomials` that vanish on `points`, by plain
/// elimination on the evaluation matrix (monomials as columns).
fn kernel_polys(r: &BooleanRing, monomials: &[Vec<usize>], points: &[Vec<bool>]) -> Vec<BoolPoly> {
    let k = monomials.len();
    // Augmented rows [evaluation at the points | identity]: rows that become zero on the left
    // carry kernel vectors on the right.
    let mut m = linalg::BitMatrix::zeros(k, points.len() + k);
    for (i, mono) in monomials.iter().enumerate() {
        for (j, p) in points.iter().enumerate() {
            if mono.iter().all(|&v| p[v]) {
                m.set(i, j);
            }
        }
        m.set(i, points.len() + i);
    }
    let pivots = linalg::row_echelon(
        &mut m,
        0,
        points.len() + k,
        &Control::new(),
        &mut linalg::Work(0),
    )
    .unwrap();
    let rank_left = pivots.iter().filter(|&&c| c < points.len()).count();
    (rank_left..pivots.len())
        .map(|row| {
            let mut data = Vec::new();
            for (i, mono) in monomials.iter().enumerate() {
                let c = points.len() + i;
                if m.row(row)[c / 64] >> (c % 64) & 1 == 1 {
                    let mut w = vec![0u64; r.words()];
                    for &v in mono {
                        w[v / 64] |= 1 << (v % 64);
                    }
                    data.extend(w);
                }
            }
            r.from_words(&data).unwrap()
        })
        .collect()
}

#[test]
fn limits_and_interruption() {
    let mut rng = Rng::new(5);
    let r = ring(14, BoolOrder::Grevlex);
    let gens = random_system(&r, 14, 2, 50, None, &mut rng);
    let mut control = Control::new();
    control.limits.max_degree = Some(2);
    let err = basis(&r, &gens, &control).unwrap_err();
    assert!(matches!(err, Error::ResourceLimit(_)), "{err}");
    let control = Control::new();
    control.request_stop();
    assert_eq!(basis(&r, &gens, &control).unwrap_err(), Error::Interrupted);
    assert_eq!(
        solve(&r, &gens, Method::Exhaustive, None, &control).unwrap_err(),
        Error::Interrupted
    );
}

#[test]
fn the_chooser_prefers_exhaustive_search_for_square_systems() {
    let mut rng = Rng::new(20);
    let r = ring(20, BoolOrder::Grevlex);
    let gens = random_system(&r, 20, 2, 50, None, &mut rng);
    let choice = choose_method(&r, &gens, &Control::new());
    assert_eq!(choice.method, Method::Exhaustive, "{choice}");
    // Beyond 64 variables exhaustive search is impossible.
    let r = ring(80, BoolOrder::Grevlex);
    let gens = random_system(&r, 160, 2, 3, None, &mut rng);
    let choice = choose_method(&r, &gens, &Control::new());
    assert_ne!(choice.method, Method::Exhaustive, "{choice}");
    assert!(choice.estimates.exhaustive.is_none());
}

/// The toy cipher of `examples/toy_spn_cipher_gf2.txt` (our own, described in the file).
fn toy_encrypt(key: u16, plaintext: u8) -> u8 {
    const SBOX: [u8; 16] = [0xC, 5, 6, 0xB, 9, 0, 0xA, 0xD, 3, 0xE, 0xF, 8, 4, 7, 1, 2];
    const P: [usize; 8] = [0, 2, 4, 6, 1, 3, 5, 7];
    let round_key = |r: u32| -> u8 { (key.rotate_right(4 * r) & 0xFF) as u8 };
    let mut s = plaintext;
    for r in 0..3 {
        let x = s ^ round_key(r);
        let u = SBOX[(x & 15) as usize] | SBOX[(x >> 4) as usize] << 4;
        s = (0..8).fold(0, |acc, i| acc | (u >> i & 1) << P[i]);
    }
    s ^ round_key(3)
}

/// Expands `k0..k15` ranges in a list of variable names.
fn expand_names(list: &str) -> Vec<String> {
    let mut out = Vec::new();
    for item in list.split(',').map(str::trim) {
        match item.split_once("..") {
            Some((a, b)) => {
                let prefix = a.trim_end_matches(|c: char| c.is_ascii_digit());
                let from: usize = a[prefix.len()..].parse().unwrap();
                let to: usize = b[prefix.len()..].parse().unwrap();
                out.extend((from..=to).map(|i| format!("{prefix}{i}")));
            }
            None => out.push(item.to_string()),
        }
    }
    out
}

/// The README's cipher example: the key is recovered from the file's polynomials, and it
/// encrypts every listed plaintext to its ciphertext under an independent implementation of
/// the cipher (the file's description).
#[test]
fn toy_cipher_key_is_recovered_from_the_example_file() {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../examples/toy_spn_cipher_gf2.txt"
    );
    let text = std::fs::read_to_string(path).unwrap();
    let (mut names, mut equations, mut pairs, mut boolean) = (vec![], vec![], vec![], false);
    for line in text.lines().map(str::trim) {
        if let Some(pair) = line.strip_prefix("# pair ") {
            let hex = |tag: &str| {
                let at = pair.find(tag).unwrap() + tag.len();
                u8::from_str_radix(&pair[at..at + 2], 16).unwrap()
            };
            pairs.push((hex("plaintext 0x"), hex("ciphertext 0x")));
        } else if line.is_empty() || line.starts_with('#') {
            continue;
        } else if let Some(v) = line.strip_prefix("variables:") {
            names = expand_names(v);
        } else if let Some(b) = line.strip_prefix("boolean:") {
            boolean = b.trim() == "yes";
        } else if !line.starts_with("field:") && !line.starts_with("order:") {
            equations.push(line.to_string());
        }
    }
    assert!(boolean && pairs.len() == 3 && names.len() == 88);
    let r = BooleanRing::new(names, BoolOrder::Grevlex).unwrap();
    let gens: Vec<BoolPoly> = equations.iter().map(|e| r.parse(e).unwrap()).collect();
    let found = solve(&r, &gens, Method::Basis, None, &Control::new()).unwrap();
    assert_eq!(found.points.len(), 1, "the three pairs determine the key");
    let key = (0..16).fold(0u16, |k, i| k | (found.points[0][i] as u16) << i);
    for &(plaintext, ciphertext) in &pairs {
        assert_eq!(toy_encrypt(key, plaintext), ciphertext);
    }
    assert_eq!(key, 0xB5E3, "the key the file says was used");
    // Exhaustive search cannot run on 88 variables and every estimate is beyond the horizon:
    // the chooser takes the engine, which solves this structured system.
    let choice = choose_method(&r, &gens, &Control::new());
    assert_eq!(choice.method, Method::Basis, "{choice}");
}
