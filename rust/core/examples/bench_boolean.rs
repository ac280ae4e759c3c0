//! Benchmark of the Boolean path on random quadratic systems over GF(2) (the dense random
//! quadrics of `fibrewise_core::systems::random_quadratic`, read modulo 2, seed 1):
//! - exhaustive search: candidates per second per thread (one thread, 32 and 64 equations),
//!   and all solutions of a 32 x 32 system on two threads;
//! - the Gröbner engine on m = 2n (one thread), with its degree and largest matrix;
//! - the crossover: the first n where the engine's measured time beats exhaustive search
//!   at the measured rate on two threads;
//! - `solve` with the method chosen by the estimate on a 20 x 20 system.
//!
//! Usage: `cargo run --release -p fibrewise-core --example bench_boolean [--quick]`.
//! Targets (issue 18): ≥ 5e8 candidates/s per core; 32 x 32 ≤ 10 s on two cores; engine
//! n = 20 ≤ 0.05 s, n = 24 ≤ 0.5 s, n = 30 ≤ 30 s; `solve` on 20 x 20 ≤ 0.1 s picking
//! exhaustive search. Each line prints the target beside the measurement.

use fibrewise_core::boolean::{self, BoolOrder, BoolPoly, BooleanRing, Method};
use fibrewise_core::systems;
use fibrewise_core::Control;
use std::time::Instant;

fn system(n: usize, m: usize) -> (BooleanRing, Vec<BoolPoly>) {
    let sys = systems::random_quadratic(n, m, 1);
    let ring = BooleanRing::new(sys.vars.clone(), BoolOrder::Grevlex).expect("ring");
    let gens = sys
        .equations
        .iter()
        .map(|e| ring.parse(e).expect("equation"))
        .collect();
    (ring, gens)
}

fn control(threads: usize) -> Control {
    let mut c = Control::new();
    c.limits.threads = Some(threads);
    c
}

/// Candidates per second of one thread on n variables and m equations (best of `repeats`).
fn exhaustive_rate(n: usize, m: usize, repeats: usize) -> f64 {
    let (ring, gens) = system(n, m);
    let mut best = f64::INFINITY;
    for _ in 0..repeats {
        let clock = Instant::now();
        boolean::count(&ring, &gens, Method::Exhaustive, &control(1)).expect("search");
        best = best.min(clock.elapsed().as_secs_f64());
    }
    2f64.powi(n as i32) / best
}

/// Seconds of the engine on m = 2n (one thread), with a summary of its run.
fn engine(n: usize) -> (f64, String) {
    let (ring, gens) = system(n, 2 * n);
    let clock = Instant::now();
    let b = boolean::basis(&ring, &gens, &control(1)).expect("basis");
    let seconds = clock.elapsed().as_secs_f64();
    let s = &b.stats;
    let largest = s
        .steps
        .iter()
        .max_by_key(|st| st.rows * st.columns)
        .cloned()
        .unwrap_or_default();
    let la: f64 = s.steps.iter().map(|st| st.seconds_linear_algebra).sum();
    let summary = format!(
        "steps {} max_deg {} largest {}x{} lin_alg {:.0}% zero_red {} basis {} solutions {}",
        s.steps.len(),
        s.max_degree(),
        largest.rows,
        largest.columns,
        100.0 * la / seconds,
        s.zero_reductions,
        b.polys.len(),
        b.count_solutions(&Control::new()).expect("count"),
    );
    if std::env::var_os("BENCH_VERBOSE").is_some() {
        for st in &s.steps {
            eprintln!(
                "  deg {} pairs {} matrix {}x{} nnz {} new {} sym {:.3}s la {:.3}s words {:.2e}",
                st.degree,
                st.pairs,
                st.rows,
                st.columns,
                st.nonzeros,
                st.new_elements,
                st.seconds_symbolic,
                st.seconds_linear_algebra,
                st.multiply_adds as f64
            );
        }
    }
    (seconds, summary)
}

fn verdict(ok: bool) -> &'static str {
    if ok {
        "meets target"
    } else {
        "MISSES target"
    }
}

fn main() {
    let quick = std::env::args().any(|a| a == "--quick");
    println!("Boolean systems over GF(2): random dense quadrics, seed 1");

    let n_rate = if quick { 26 } else { 30 };
    let rate32 = exhaustive_rate(n_rate, 32, 3);
    let rate64 = exhaustive_rate(n_rate, 64, 3);
    println!(
        "exhaustive, 1 thread, n = {n_rate}: {rate32:.2e}/s with 32 equations, {rate64:.2e}/s \
         with 64 (target >= 5e8/s per core: {})",
        verdict(rate32.min(rate64) >= 5e8)
    );

    if !quick {
        let (ring, gens) = system(32, 32);
        let clock = Instant::now();
        let found =
            boolean::solve(&ring, &gens, Method::Exhaustive, None, &control(2)).expect("search");
        let seconds = clock.elapsed().as_secs_f64();
        println!(
            "exhaustive, 2 threads, 32 x 32, all solutions: {seconds:.2} s, {} solutions \
             (target <= 10 s: {})",
            found.points.len(),
            verdict(seconds <= 10.0)
        );
    }

    let sizes: Vec<usize> = if quick {
        vec![12, 16, 20]
    } else {
        vec![12, 14, 16, 18, 20, 22, 24, 26, 28, 30]
    };
    let mut crossover = None;
    for &n in &sizes {
        let (seconds, summary) = engine(n);
        let target = match n {
            20 => format!(" (target <= 0.05 s: {})", verdict(seconds <= 0.05)),
            24 => format!(" (target <= 0.5 s: {})", verdict(seconds <= 0.5)),
            30 => format!(" (target <= 30 s: {})", verdict(seconds <= 30.0)),
            _ => String::new(),
        };
        let exhaustive = 2f64.powi(n as i32) / (2.0 * rate32);
        println!(
            "engine, 1 thread, n = {n}, m = {}: {seconds:.4} s{target}; exhaustive on 2 threads \
             at the measured rate: {exhaustive:.4} s; {summary}",
            2 * n
        );
        if crossover.is_none() && seconds < exhaustive {
            crossover = Some(n);
        }
    }
    match crossover {
        Some(n) => println!("crossover (m = 2n): the engine beats exhaustive search from n = {n}"),
        None => println!(
            "crossover (m = 2n): exhaustive search is faster for every n up to {}",
            sizes.last().unwrap()
        ),
    }

    let (ring, gens) = system(20, 20);
    let clock = Instant::now();
    let found = boolean::solve(&ring, &gens, Method::Auto, None, &Control::new()).expect("solve");
    let seconds = clock.elapsed().as_secs_f64();
    println!(
        "solve (auto), 20 x 20: {seconds:.4} s, {} solutions, chose {} (target <= 0.1 s choosing \
         exhaustive: {}); reason: {}",
        found.points.len(),
        found.choice.method.name(),
        verdict(seconds <= 0.1 && found.choice.method == Method::Exhaustive),
        found.choice.reason
    );
}
