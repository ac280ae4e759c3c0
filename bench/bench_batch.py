"""Batch throughput and the per-call overhead of the Python layer.

    python bench/bench_batch.py [--jobs 2000] [--workers 2] [--tasks dimension,normalize]

1. Throughput: JOBS small random systems (4-6 variables, 3-5 random quadratics over the word-size
   prime 4294967291 = 2^32 - 5), run by ``fibrewise batch`` with WORKERS worker processes; reports
   jobs per second (target: >= 300 on two cores) and how many jobs ended ok / error / timeout.
2. Overhead: for tiny systems, the time of one Python-level call minus the time the core itself
   reports (``ReducedBasis.stats.seconds``): what parsing, conversion and the call machinery cost
   (target: <= 50 microseconds).

The systems are random but seeded, so runs are comparable.
"""

from __future__ import annotations

import argparse
import json
import os
import random
import statistics
import sys
import tempfile
import time

P = 4294967291  # the largest prime below 2^32


def random_job(rng: random.Random, number: int, tasks: list[str]) -> dict:
    n = rng.randint(4, 6)
    names = [f"x{i}" for i in range(n)]
    monomials = [f"{a}*{b}" for i, a in enumerate(names) for b in names[i:]] + names + ["1"]

    def quadric() -> str:
        chosen = rng.sample(monomials, k=min(len(monomials), rng.randint(4, 8)))
        return " + ".join(f"{rng.randrange(1, P)}*{m}" for m in chosen)

    return {
        "id": number,
        "field": f"GF({P})",
        "variables": names,
        "polynomials": [quadric() for _ in range(rng.randint(3, 5))],
        "tasks": tasks,
    }


def throughput(
    jobs: int, workers: int, tasks: list[str], timeout: float, memory_mb: int, keep: str | None
) -> dict:
    from fibrewise.batch import run_batch

    rng = random.Random(2026)
    with tempfile.TemporaryDirectory() as tmp:
        folder = keep or tmp
        os.makedirs(folder, exist_ok=True)
        source, out = os.path.join(folder, "in.jsonl"), os.path.join(folder, "out.jsonl")
        if os.path.exists(out):
            os.remove(out)
        with open(source, "w") as handle:
            for number in range(jobs):
                handle.write(json.dumps(random_job(rng, number, tasks)) + "\n")
        summary = run_batch(source, out, workers=workers, timeout=timeout, memory_mb=memory_mb, quiet=True)
        with open(out) as handle:
            records = [json.loads(line) for line in handle]
    errors = [r["error"] for r in records if r["status"] == "error"]
    result = summary.to_dict()
    result["slow_ids"] = [r["id"] for r in records if r["status"] == "timeout"][:10]
    result["jobs_per_second"] = round(jobs / summary.seconds, 1)
    result["first_error"] = errors[0] if errors else None
    return result


def overhead(repeats: int = 2000) -> dict:
    """Microseconds per call outside the core, median over ``repeats`` tiny systems."""
    import fibrewise as fw

    R = fw.Space(f"GF({P})", "x, y, z, w")
    texts = ["x*y - 1", "z - w + 3", "x^2 - z"]
    gens = [R.parse(t) for t in texts]
    calls, cores = [], []
    for _ in range(repeats):
        system = R.system(gens)  # a fresh system: no cached basis
        start = time.perf_counter()
        gb = system.basis()
        calls.append(time.perf_counter() - start)
        cores.append(gb.stats.seconds)
    parse = []
    for _ in range(repeats):
        start = time.perf_counter()
        R.system(texts)
        parse.append(time.perf_counter() - start)
    call, core = statistics.median(calls), statistics.median(cores)
    return {
        "call_us": round(call * 1e6, 1),
        "core_us": round(core * 1e6, 1),
        "overhead_us": round((call - core) * 1e6, 1),
        "parse_3_polys_us": round(statistics.median(parse) * 1e6, 1),
    }


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--jobs", type=int, default=2000)
    parser.add_argument("--workers", type=int, default=2)
    parser.add_argument("--tasks", default="dimension,normalize")
    parser.add_argument(
        "--timeout", type=float, default=10.0, help="per job, so that one hard system cannot stall the run"
    )
    parser.add_argument("--memory", type=int, default=2000, help="MiB per worker")
    parser.add_argument("--keep", metavar="DIR", help="keep in.jsonl and out.jsonl in DIR")
    args = parser.parse_args()
    tasks = args.tasks.split(",")
    o = overhead()
    print(
        f"per call on a tiny system: {o['call_us']} us, of which the core {o['core_us']} us: "
        f"overhead {o['overhead_us']} us (target <= 50: {'met' if o['overhead_us'] <= 50 else 'MISSED'}); "
        f"parsing 3 polynomials {o['parse_3_polys_us']} us"
    )
    t = throughput(args.jobs, args.workers, tasks, args.timeout, args.memory, args.keep)
    print(
        f"batch of {args.jobs} jobs ({', '.join(tasks)}) on {args.workers} workers: "
        f"{t['jobs_per_second']} jobs/s (target >= 300: {'met' if t['jobs_per_second'] >= 300 else 'MISSED'}); "
        f"ok {t['ok']}, error {t['error']}, "
        f"timeout {t['timeout']}, {t['seconds']} s"
    )
    if t["first_error"]:
        print(f"first error: {t['first_error']}")
    if t["slow_ids"]:
        print(f"ids over the {args.timeout:g} s limit (first 10): {t['slow_ids']}")
    sys.stdout.flush()


if __name__ == "__main__":
    main()
