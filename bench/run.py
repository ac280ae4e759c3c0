"""`make bench`: runs every benchmark of the project in one go and prints their tables.

Each benchmark is a script `bench/bench_*.py` (run with this interpreter) or a Rust example listed
in RUST_BENCHES (built in release mode). Speed targets are stated and compared inside each
benchmark as ratios measured in the same run; nothing here is a test.
"""

from __future__ import annotations

import pathlib
import subprocess
import sys
import time

HERE = pathlib.Path(__file__).resolve().parent
ROOT = HERE.parent
RUST_BENCHES: list[str] = [
    "bench_f4",
    "bench_hilbert",
    "bench_boolean",
    "bench_projection",
    "bench_univariate",
    "bench_solutions",
    "bench_curves",
    "bench_small_fields",
]


def run(title: str, cmd: list[str]) -> bool:
    print(f"\n=== {title} ===", flush=True)
    start = time.perf_counter()
    ok = subprocess.run(cmd, cwd=ROOT).returncode == 0
    print(f"--- {title}: {'done' if ok else 'FAILED'} in {time.perf_counter() - start:.1f} s", flush=True)
    return ok


def main(argv: list[str]) -> int:
    only = set(argv)
    results = []
    for example in RUST_BENCHES:
        if not only or example in only:
            cmd = ["cargo", "run", "--quiet", "--release", "-p", "fibrewise-core", "--example", example]
            results.append(run(example, cmd))
    for script in sorted(HERE.glob("bench_*.py")):
        if not only or script.stem in only:
            results.append(run(script.stem, [sys.executable, str(script)]))
    return 0 if all(results) else 1


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
