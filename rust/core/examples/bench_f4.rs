//! Benchmark of the F4 engine over GF(65521) in grevlex on the standard systems of
//! `fibrewise_core::systems`, plus this machine's peak rate of a plain modular multiply-add loop.
//!
//! Usage: `cargo run --release -p fibrewise-core --example bench_f4 [--quick] [--threads N]
//! [--timeout SECONDS] [SYSTEM...]` where SYSTEM is e.g. `cyclic-7`, `katsura-10`, `eco-10`,
//! `noon-6`, `random-14-28`; a suffix `~s` runs it with the sampled linear algebra (engine
//! f4-sampled), `~g` with signature-based F4 (engine f4-signature), `~a` with the automatic
//! engine, `@k` on k threads, `/p255` over GF(2^255 - 19) and `/q` over the rationals instead
//! of GF(65521); `lex-suite` times the 200 small lex and elimination systems.
//! Each system runs in a fresh child process so that its peak memory is its own; a run over
//! the timeout (default 120 s) is stopped. One-thread runs also report the CPU seconds of the
//! computing thread (`cpu`), which other processes on a shared machine disturb far less than
//! the wall clock. The full run ends with a table of every engine's seconds per system and
//! auto's ratio to the fastest, in wall and in CPU seconds.

use fibrewise_core::field::{BigPrimeField, RationalField};
use fibrewise_core::groebner::{groebner_basis, Engine, Stats};
use fibrewise_core::systems::{self, System};
use fibrewise_core::{Control, Field, MonomialOrder, PrimeField, Ring};
use num_bigint::BigUint;
use std::process::Command;
use std::time::Instant;

const PRIME: u64 = 65521;

/// The systems of the full run; each runs with every engine (`~s`: f4-sampled, `~g`:
/// f4-signature, `~a`: auto, no suffix: f4). Random quadratics: m = n + 1 (n = 10, 11) and
/// m = 2n (n = 14, 16); cyclic-9 is positive-dimensional.
const SYSTEMS: [&str; 16] = [
    "cyclic-6",
    "cyclic-7",
    "cyclic-8",
    "cyclic-9",
    "katsura-10",
    "katsura-11",
    "katsura-12",
    "eco-10",
    "eco-11",
    "eco-12",
    "noon-6",
    "noon-7",
    "random-10-11",
    "random-11-12",
    "random-14-28",
    "random-16-32",
];
/// Engine suffixes of the full run, in table order.
const ENGINES: [&str; 4] = ["", "~s", "~g", "~a"];
/// Extra runs of the full list: two threads, and the fields whose ratios to GF(65521) have
/// targets (at most 4 for GF(2^255 - 19), at most 40 for the rationals).
const EXTRA: [&str; 8] = [
    "cyclic-8@2",
    "katsura-11~a@2",
    "cyclic-7~a",
    "cyclic-7~a/p255",
    "katsura-9~a",
    "katsura-9~a/p255",
    "katsura-8~a",
    "katsura-8~a/q",
];
const QUICK: [&str; 8] = [
    "cyclic-6",
    "cyclic-7",
    "katsura-9",
    "katsura-9~a",
    "eco-9",
    "noon-5",
    "random-8-9",
    "random-10-20",
];
/// Seconds after which a run is stopped and reported as over the limit (`--timeout`).
const TIMEOUT: f64 = 120.0;

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

/// The system name and engine of a label (`name`, `name~s`, `name~g`, `name~a`).
fn engine_of(label: &str) -> (&str, Engine) {
    for (suffix, engine) in [
        ("~s", Engine::F4Sampled),
        ("~g", Engine::F4Signature),
        ("~a", Engine::Auto),
    ] {
        if let Some(name) = label.strip_suffix(suffix) {
            return (name, engine);
        }
    }
    (label, Engine::F4)
}

/// Runs one system and prints one tab-separated result line.
fn run_one(label: &str, threads: usize) -> Result<(), String> {
    if label == "lex-suite" {
        return lex_suite();
    }
    // `name/field`: over GF(2^255 - 19) (`p255`) or the rationals (`q`) instead of GF(65521).
    let (label_engine, field) = label.split_once('/').unwrap_or((label, ""));
    let (name, engine) = engine_of(label_engine);
    let sys = system(name).ok_or_else(|| format!("unknown system {name}"))?;
    let (timing, s, basis) = match field {
        "" => solve(
            PrimeField::new(PRIME).map_err(|e| e.to_string())?,
            &sys,
            engine,
            threads,
        )?,
        "p255" => {
            let p = (BigUint::from(1u8) << 255u32) - 19u32;
            let field = BigPrimeField::<4>::new(&p).map_err(|e| e.to_string())?;
            solve(field, &sys, engine, threads)?
        }
        "q" => solve(RationalField::new(), &sys, engine, threads)?,
        other => return Err(format!("unknown field {other}: expected p255 or q")),
    };
    let s = &s;
    if std::env::var_os("BENCH_VERBOSE").is_some() {
        for st in &s.steps {
            eprintln!("  {st}");
        }
        eprintln!("  zero reductions {}", s.zero_reductions);
    }
    if !s.choice.is_empty() && std::env::var_os("BENCH_VERBOSE").is_some() {
        eprintln!("  {label}: {}", s.choice);
    }
    let largest = s
        .steps
        .iter()
        .max_by_key(|st| st.rows * st.columns)
        .cloned()
        .unwrap_or_default();
    let la: f64 = s.steps.iter().map(|st| st.seconds_linear_algebra).sum();
    let madds: u64 = s.steps.iter().map(|st| st.multiply_adds).sum();
    let seconds = timing.seconds;
    let cpu = match threads {
        1 => format!("{:.3}", timing.cpu),
        _ => "-".into(),
    };
    println!(
        "{label}\t{threads}\t{seconds:.3}\t{:.0}\t{}\t{}\t{}x{}\t{}\t{:.0}%\t{:.2e}\t{}\t{cpu}",
        peak_memory_mb(),
        s.steps.len(),
        s.max_degree(),
        largest.rows,
        largest.columns,
        largest.nonzeros,
        100.0 * la / seconds,
        madds as f64 / la.max(1e-9),
        basis,
    );
    Ok(())
}

/// The basis of `sys` over `field` in grevlex: seconds, statistics and number of elements.
fn solve<F: Field>(
    field: F,
    sys: &System,
    engine: Engine,
    threads: usize,
) -> Result<(Timing, Stats, usize), String> {
    let ring =
        Ring::new(field, sys.vars.clone(), MonomialOrder::Grevlex).map_err(|e| e.to_string())?;
    let gens = sys.polys(&ring).map_err(|e| e.to_string())?;
    let mut control = Control::new();
    control.limits.threads = Some(threads);
    let (clock, cpu) = (Instant::now(), thread_cpu_seconds());
    let gb = groebner_basis(&ring, &gens, engine, &control).map_err(|e| e.to_string())?;
    let (seconds, cpu) = (clock.elapsed().as_secs_f64(), thread_cpu_seconds() - cpu);
    Ok((Timing { seconds, cpu }, gb.stats, gb.polys.len()))
}

/// Wall seconds of a run, and CPU seconds of the calling thread (all of the work on one
/// thread: no pool is started then).
struct Timing {
    seconds: f64,
    cpu: f64,
}

/// CPU seconds this thread has run so far (Linux; 0 if unknown): the first field of
/// `/proc/thread-self/schedstat`, in nanoseconds.
fn thread_cpu_seconds() -> f64 {
    let stat = std::fs::read_to_string("/proc/thread-self/schedstat").unwrap_or_default();
    let nanos: f64 = stat
        .split_whitespace()
        .next()
        .and_then(|v| v.parse().ok())
        .unwrap_or(0.0);
    nanos / 1e9
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

/// The 200 small systems of the lex and elimination suite (`systems::lex_suite_case`, the
/// same cases as the Rust test that checks them against the reference engine), each in its
/// order with the automatic engine: the slowest case and the total. Target: no case over 1 s.
fn lex_suite() -> Result<(), String> {
    let mut slowest = (0.0f64, 0u64);
    let mut total = 0.0;
    for k in 0..200u64 {
        let sys = systems::lex_suite_case(k);
        let n = sys.vars.len();
        let order = match k % 2 {
            0 => MonomialOrder::Lex,
            _ => MonomialOrder::elimination(&[0], n),
        };
        let p = [7u64, 101, 32003, 65521][(k / 2 % 4) as usize];
        let field = PrimeField::new(p).map_err(|e| e.to_string())?;
        let ring = Ring::new(field, sys.vars.clone(), order).map_err(|e| e.to_string())?;
        let gens = sys.polys(&ring).map_err(|e| e.to_string())?;
        let clock = Instant::now();
        groebner_basis(&ring, &gens, Engine::Auto, &Control::new()).map_err(|e| e.to_string())?;
        let seconds = clock.elapsed().as_secs_f64();
        total += seconds;
        if seconds > slowest.0 {
            slowest = (seconds, k);
        }
    }
    println!(
        "lex-suite\t1\t{total:.3}\tslowest case {} in {:.3} s (target: every case under 1 s: {})",
        slowest.1,
        slowest.0,
        if slowest.0 < 1.0 { "met" } else { "missed" }
    );
    Ok(())
}

/// Wall seconds of a finished run and, on one thread, its CPU seconds.
type Measured = (f64, Option<f64>);

/// Runs `label` in a child process; its wall and CPU seconds (the latter on one thread only),
/// or `None` when it failed or ran out of time.
fn run_child(label: &str, threads: usize, timeout: f64) -> Option<Measured> {
    let exe = std::env::current_exe().expect("own path");
    let mut child = Command::new(&exe)
        .args(["--one", label, &threads.to_string()])
        .stdout(std::process::Stdio::piped())
        .spawn()
        .ok()?;
    let clock = Instant::now();
    loop {
        match child.try_wait() {
            Ok(Some(_)) => break,
            Ok(None) if clock.elapsed().as_secs_f64() > timeout => {
                let _ = child.kill();
                let _ = child.wait();
                println!("{label}\t{threads}\t> {timeout:.0} (stopped)");
                return None;
            }
            Ok(None) => std::thread::sleep(std::time::Duration::from_millis(20)),
            Err(_) => return None,
        }
    }
    let output = child.wait_with_output().ok()?;
    let line = String::from_utf8_lossy(&output.stdout).trim().to_string();
    if !output.status.success() || line.is_empty() {
        println!("{label}\t{threads}\tfailed");
        return None;
    }
    println!("{line}");
    let fields: Vec<&str> = line.split('\t').collect();
    let seconds = fields.get(2)?.parse().ok()?;
    Some((seconds, fields.get(11).and_then(|c| c.parse().ok())))
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
    let mut timeout = TIMEOUT;
    let mut names: Vec<String> = Vec::new();
    let mut it = args.iter();
    while let Some(a) = it.next() {
        match a.as_str() {
            "--quick" => names.extend(QUICK.iter().map(|s| s.to_string())),
            "--threads" => threads = it.next().and_then(|t| t.parse().ok()).unwrap_or(1),
            "--timeout" => timeout = it.next().and_then(|t| t.parse().ok()).unwrap_or(TIMEOUT),
            other => names.push(other.to_string()),
        }
    }
    let full = names.is_empty();
    if full {
        for sys in SYSTEMS {
            names.extend(ENGINES.iter().map(|e| format!("{sys}{e}")));
        }
        names.extend(EXTRA.iter().map(|s| s.to_string()));
        names.push("lex-suite".to_string());
    }
    println!(
        "F4 over GF({PRIME}), grevlex; peak multiply-add rate of this machine: {:.2e}/s",
        peak_rate()
    );
    println!("system\tthreads\tseconds\tpeak_MB\tsteps\tmax_deg\tlargest_matrix\tnonzeros\tlin_alg\tmadds/s\tbasis\tcpu");
    let mut seconds: Vec<(String, Option<Measured>)> = Vec::new();
    for name in names {
        // `name@k` runs with k threads.
        let (label, t) = match name.split_once('@') {
            Some((s, t)) => (s.to_string(), t.parse().unwrap_or(threads)),
            None => (name.clone(), threads),
        };
        let result = run_child(&label, t, timeout);
        if t == 1 {
            seconds.push((label, result));
        }
    }
    print_engine_table(&seconds, timeout);
}

/// One line per system: the seconds of each engine on one thread, and auto's time over the
/// fastest engine's (target: at most 1.2), in wall seconds and in CPU seconds.
fn print_engine_table(seconds: &[(String, Option<Measured>)], timeout: f64) {
    let systems: Vec<&str> = SYSTEMS
        .iter()
        .copied()
        .filter(|sys| seconds.iter().any(|(l, _)| engine_of(l).0 == *sys))
        .collect();
    if systems.is_empty() {
        return;
    }
    println!("\nsystem\tf4\tf4-sampled\tf4-signature\tauto\tauto/fastest\tin cpu");
    for sys in systems {
        let time = |suffix: &str| {
            let label = format!("{sys}{suffix}");
            seconds.iter().find(|(l, _)| *l == label).map(|(_, s)| *s)
        };
        let cells: Vec<String> = ENGINES
            .iter()
            .map(|e| match time(e) {
                Some(Some((s, _))) => format!("{s:.3}"),
                Some(None) => format!("> {timeout:.0}"),
                None => "-".into(),
            })
            .collect();
        let ratio = |measure: &dyn Fn(Measured) -> Option<f64>| {
            let fastest = ENGINES
                .iter()
                .filter_map(|e| time(e).flatten().and_then(measure))
                .fold(f64::INFINITY, f64::min);
            match time("~a").flatten().and_then(measure) {
                Some(auto) if fastest.is_finite() => format!("{:.2}", auto / fastest),
                _ => "-".into(),
            }
        };
        let (wall, cpu) = (ratio(&|(s, _)| Some(s)), ratio(&|(_, c)| c));
        println!("{sys}\t{}\t{wall}\t{cpu}", cells.join("\t"));
    }
}
