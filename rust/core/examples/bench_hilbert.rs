//! Hilbert series of large monomial ideals by the pivot recursion (`fibrewise_core::hilbert`):
//! leading ideals with thousands of generators. Checked against closed forms while timing:
//! (x_1..x_n)^s has C(s + n - 1, n) standard monomials (stars and bars); generic-looking random
//! monomial ideals are timed only.

use fibrewise_core::hilbert::monomial_ideal_series;
use fibrewise_core::{Control, Monomial};
use std::time::Instant;

fn all_of_degree(n: usize, s: u32) -> Vec<Monomial> {
    fn fill(k: usize, left: u32, e: &mut Vec<u32>, out: &mut Vec<Monomial>) {
        if k + 1 == e.len() {
            e[k] = left;
            out.push(Monomial::from_exponents(e.clone()).unwrap());
            return;
        }
        for x in 0..=left {
            e[k] = x;
            fill(k + 1, left - x, e, out);
        }
    }
    let mut out = vec![];
    fill(0, s, &mut vec![0; n], &mut out);
    out
}

fn binomial(n: u128, k: u128) -> u128 {
    (0..k).fold(1, |acc, i| acc * (n - i) / (i + 1))
}

/// Random monomials of degree `lo..=hi` from a 64-bit LCG (Knuth's MMIX constants).
fn random_ideal(n: usize, count: usize, lo: u32, hi: u32, seed: u64) -> Vec<Monomial> {
    let mut state = seed;
    let mut next = |m: u64| {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 33) % m
    };
    (0..count)
        .map(|_| {
            let d = lo + next((hi - lo + 1) as u64) as u32;
            let mut e = vec![0u32; n];
            for _ in 0..d {
                e[next(n as u64) as usize] += 1;
            }
            Monomial::from_exponents(e).unwrap()
        })
        .collect()
}

fn main() {
    println!(
        "{:40} {:>8} {:>10} {:>12}",
        "monomial ideal", "gens", "seconds", "degree"
    );
    for (n, s) in [(5usize, 12u32), (6, 10), (8, 6)] {
        let gens = all_of_degree(n, s);
        let start = Instant::now();
        let series = monomial_ideal_series(n, &gens, false, &Control::new()).unwrap();
        let secs = start.elapsed().as_secs_f64();
        let degree = series.degree().unwrap();
        assert_eq!(
            degree as u128,
            binomial(s as u128 + n as u128 - 1, n as u128)
        );
        println!(
            "{:40} {:>8} {:>10.4} {:>12}",
            format!("all of degree {s} in {n} vars"),
            gens.len(),
            secs,
            degree
        );
    }
    for (n, count, lo, hi) in [
        (10usize, 2000usize, 4u32, 8u32),
        (12, 5000, 5, 9),
        (16, 3000, 3, 6),
    ] {
        let gens = random_ideal(n, count, lo, hi, 1997);
        let start = Instant::now();
        let series = monomial_ideal_series(n, &gens, false, &Control::new()).unwrap();
        let secs = start.elapsed().as_secs_f64();
        println!(
            "{:40} {:>8} {:>10.4} {:>12}",
            format!("random, {n} vars, degrees {lo}..{hi}"),
            count,
            secs,
            format!("d={} e={}", series.dimension(), series.degree().unwrap())
        );
    }
}
