//! Benchmark of the F4 engine over GF(65521) in grevlex on the standard systems of
//! `fibrewise_core::systems`, plus this machine's peak rate of a plain modular multiply-add loop.
//!
//! Usage: `cargo run --release -p fibrewise-core --example bench_f4 [--quick] [--threads N] [SYSTEM...]`
//! where SYSTEM is e.g. `cyclic-7`, `katsura-10`, `eco-10`, `noon-6`, `random-14-28`; a suffix
//! `~s` runs it with the sampled linear algebra (engine f4-sampled), `~g` with signature-based
//! F4 (engine f4-signature), `@k` on k threads.
//! Each system runs in a fresh child process so that its peak memory is its own.

use fibrewise_core::groebner::{groebner_basis, Engine};
use fibrewise_core::systems::{self, System};
use fibrewise_core::{Control, MonomialOrder, PrimeField, Ring};
use std::process::Command;
use std::time::Instant;

const PRIME: u64 = 65521;

/// `name@k` runs on k threads, `name~s` with the sampled linear algebra (engine f4-sampled),
/// `name~g` with signature-based F4 (engine f4-signature).
/// Random quadratics: m = n + 1 (n = 10, 11; n = 14 takes minutes) and m = 2n (n = 14).
const DEFAULT: [&str; 18] = [
    "cyclic-6",
    "cyclic-7",
    "cyclic-8",
    "cyclic-8@2",
    "cyclic-8~s",
    "katsura-10",
    "katsura-10~s",
    "katsura-10~g",
    "katsura-11",
    "katsura-11~s",
    "katsura-11~g",
    "eco-10",
    "eco-11",
    "noon-6",
    "noon-7",
    "random-10-11",
    "random-11-12",
    "random-14-28",
];
const QUICK: [&str; 7] = [
    "cyclic-6",
    "cyclic-7",
    "katsura-9",
    "eco-9",
    "noon-5",
    "random-8-9",
    "random-10-20",
];

fn system(name: &str) -> Option<System> {
    let (family, size) = name.split_once('-')?;
    let mut sizes = size.split('-').map(|s| s.parse::<usize>().ok());
    let n = sizes.next()??;
    Some(match family {
        "cyclic" => systems::cyclic(n),
        "katsura" => systems::katsura(n),
        "eco" => systems::eco(n),
        "noon" => systems::noon(n),
        "random" => systems::random_quadratic(n, sizes.next()??, 1),
        _ => return None,
    })
}

/// Peak resident memory of this process in MB (Linux), 0 if unknown.
fn peak_memory_mb() -> f64 {
    let status = std::fs::read_to_string("/proc/self/status").unwrap_or_default();
    let line = status
        .lines()
        .find(|l| l.starts_with("VmHWM:"))
        .unwrap_or("");
    let kb: f64 = line
        .split_whitespace()
        .nth(1)
        .and_then(|v| v.parse().ok())
        .unwrap_or(0.0);
    kb / 1024.0
}

/// Runs one system and prints one tab-separated result line.
fn run_one(label: &str, threads: usize) -> Result<(), String> {
    let (name, engine) = if let Some(name) = label.strip_suffix("~s") {
        (name, Engine::F4Sampled)
    } else if let Some(name) = label.strip_suffix("~g") {
        (name, Engine::F4Signature)
    } else {
        (label, Engine::F4)
    };
    let sys = system(name).ok_or_else(|| format!("unknown system {name}"))?;
    let field = PrimeField::new(PRIME).map_err(|e| e.to_string())?;
    let ring =
        Ring::new(field, sys.vars.clone(), MonomialOrder::Grevlex).map_err(|e| e.to_string())?;
    let gens = sys.polys(&ring).map_err(|e| e.to_string())?;
    let mut control = Control::new();
    control.limits.threads = Some(threads);
    let clock = Instant::now();
    let gb = groebner_basis(&ring, &gens, engine, &control).map_err(|e| e.to_string())?;
    let seconds = clock.elapsed().as_secs_f64();
    let s = &gb.stats;
    if std::env::var_os("BENCH_VERBOSE").is_some() {
        for st in &s.steps {
            eprintln!(
                "  deg {} pairs {} matrix {}x{} nnz {} new {} sym {:.3}s la {:.3}s madds {:.2e}",
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
        eprintln!("  zero reductions {}", s.zero_reductions);
    }
    let largest = s
        .steps
        .iter()
        .max_by_key(|st| st.rows * st.columns)
        .cloned()
        .unwrap_or_default();
    let la: f64 = s.steps.iter().map(|st| st.seconds_linear_algebra).sum();
    let madds: u64 = s.steps.iter().map(|st| st.multiply_adds).sum();
    println!(
        "{label}\t{threads}\t{seconds:.3}\t{:.0}\t{}\t{}\t{}x{}\t{}\t{:.0}%\t{:.2e}\t{}",
        peak_memory_mb(),
        s.steps.len(),
        s.max_degree(),
        largest.rows,
        largest.columns,
        largest.nonzeros,
        100.0 * la / seconds,
        madds as f64 / la.max(1e-9),
        gb.polys.len(),
    );
    Ok(())
}

/// Multiply-adds per second of the plain loop `acc[i] += m · x[i]` on u64 accumulators with
/// residues mod 65521 (no reduction needed for 2^32 rounds): the machine's peak for this kernel.
fn peak_rate() -> f64 {
    let len = 4096;
    let x: Vec<u64> = (0..len as u64).map(|i| (i * 7919) % PRIME).collect();
    let mut acc = vec![0u64; len];
    let rounds = 20_000;
    let clock = Instant::now();
    for r in 0..rounds {
        let m = (r as u64 * 31 + 7) % PRIME;
        for (a, &v) in acc.iter_mut().zip(&x) {
            *a += m * v;
        }
        std::hint::black_box(&mut acc);
    }
    let seconds = clock.elapsed().as_secs_f64();
    std::hint::black_box(acc.iter().fold(0u64, |s, a| s ^ (a % PRIME)));
    (len * rounds) as f64 / seconds
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if args.first().map(String::as_str) == Some("--one") {
        let threads = args.get(2).and_then(|t| t.parse().ok()).unwrap_or(1);
        if let Err(e) = run_one(&args[1], threads) {
            eprintln!("{e}");
            std::process::exit(1);
        }
        return;
    }
    let mut threads = 1;
    let mut names: Vec<String> = Vec::new();
    let mut it = args.iter();
    while let Some(a) = it.next() {
        match a.as_str() {
            "--quick" => names.extend(QUICK.iter().map(|s| s.to_string())),
            "--threads" => threads = it.next().and_then(|t| t.parse().ok()).unwrap_or(1),
            other => names.push(other.to_string()),
        }
    }
    if names.is_empty() {
        names.extend(DEFAULT.iter().map(|s| s.to_string()));
    }
    println!(
        "F4 over GF({PRIME}), grevlex; peak multiply-add rate of this machine: {:.2e}/s",
        peak_rate()
    );
    println!("system\tthreads\tseconds\tpeak_MB\tsteps\tmax_deg\tlargest_matrix\tnonzeros\tlin_alg\tmadds/s\tbasis");
    let exe = std::env::current_exe().expect("own path");
    for name in names {
        // `name@k` runs with k threads.
        let (sys, t) = match name.split_once('@') {
            Some((s, t)) => (s.to_string(), t.parse().unwrap_or(threads)),
            None => (name.clone(), threads),
        };
        let status = Command::new(&exe)
            .args(["--one", &sys, &t.to_string()])
            .status();
        if !matches!(status, Ok(s) if s.success()) {
            println!("{sys}\t{t}\tfailed");
        }
    }
}
