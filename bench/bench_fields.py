"""Gröbner bases over the other fields next to GF(65521), same system, same engine, same run:
cyclic-7 over GF(2^8) and GF(2^255 - 19), katsura-8 over Q (multi-modular).

Over GF(2^8) cyclic-n is a different (characteristic-2) problem: its basis is smaller, so the
ratio there says more about the problem than the field. cyclic-n: sum over i of products of k cyclically consecutive variables, k = 1..n-1, and
x0 x1 ... x(n-1) = 1 (Björck and Fröberg 1991). katsura-n: the system of Katsura 1990 in
variables u0..un. Both are the classical benchmark families; the systems are generated here.

`python bench/bench_fields.py --quick` runs cyclic-6 and katsura-6 instead. Prints seconds and
the ratio to GF(65521); the targets below are goals, not assertions.
"""

from __future__ import annotations

import pathlib
import sys
import time

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

import fibrewise as fw  # noqa: E402
from systems import cyclic, katsura  # noqa: E402

P255 = 2**255 - 19
# Goals: a 255-bit prime within 10x of a word-size prime, GF(2^8) (tables) within 2x, Q within
# (number of primes used + 2)x.
TARGETS = {"GF(2^8)": 2.0, f"GF({P255})": 10.0}


def timed(spec: str, system: tuple[list[str], list[str]]) -> tuple[float, int, str]:
    names, eqs = system
    R = fw.Space(spec, names)
    start = time.perf_counter()
    gb = R.system(eqs).basis()
    return time.perf_counter() - start, len(gb), gb.stats.engine


def main(argv: list[str]) -> int:
    quick = "--quick" in argv
    nc, nk = (6, 6) if quick else (7, 8)
    cases = [
        (f"cyclic-{nc}", cyclic(nc), ["GF(65521)", "GF(2^8)", f"GF({P255})"]),
        (f"katsura-{nk}", katsura(nk), ["GF(65521)", "Q"]),
    ]
    print(f"{'system':<11} {'field':<16} {'basis':>6} {'seconds':>9} {'ratio':>7}  engine")
    for name, system, specs in cases:
        base = None
        for spec in specs:
            seconds, size, engine = timed(spec, system)
            base = base or seconds
            label = "GF(2^255-19)" if spec == f"GF({P255})" else spec
            goal = TARGETS.get(spec)
            note = f"  (goal <= {goal}x)" if goal else ""
            print(
                f"{name:<11} {label:<16} {size:>6} {seconds:>9.2f} {seconds / base:>6.1f}x  {engine}{note}",
                flush=True,
            )
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
