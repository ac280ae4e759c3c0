"""The cost of checking a certificate against the cost of producing it, over a random batch.

For each of N random positive-dimensional systems (2 to 5 variables, one to three equations of
degree up to 3, over GF(2), GF(3), GF(7), GF(101) and GF(65521), seeded), the whole certificate
of a finite projection is produced (`projection(equations="now").to_dict()`) and then checked from
the ideal alone (`check_certificate`), each timed. Prints the distribution of check / produce
(median, 90th percentile, largest, with the slowest cases) and the number of checks over 20 s.
Target (issue 22): checking costs at most a small multiple of producing, on every system.

Usage: python bench/bench_check.py [N] [--seed S]   (N = 200 by default)
"""

from __future__ import annotations

import random
import statistics
import sys
import time

import fibrewise as fw
from fibrewise.normalization import check_certificate

FIELDS = [2, 3, 7, 101, 65521]


def random_system(rng: random.Random) -> tuple[int, list[str], list[str]]:
    """A random system with fewer equations than variables (so usually of positive dimension)."""
    p = rng.choice(FIELDS)
    n = rng.randint(2, 5)
    names = [f"x{i}" for i in range(n)]
    m = rng.randint(1, min(3, n - 1))
    polys = []
    for _ in range(m):
        terms = []
        for _ in range(rng.randint(1, 5)):
            degree = rng.randint(0, 3)
            mono = "*".join(rng.choice(names) for _ in range(degree)) or "1"
            terms.append(f"{rng.randrange(1, p)}*{mono}")
        polys.append(" + ".join(terms))
    return p, names, polys


def main() -> None:
    args = sys.argv[1:]
    seed = 1
    if "--seed" in args:
        at = args.index("--seed")
        seed = int(args[at + 1])
        del args[at : at + 2]
    count = int(args[0]) if args else 200
    rng = random.Random(seed)
    rows = []
    skipped = 0
    for case in range(count):
        p, names, polys = random_system(rng)
        system = fw.Space(p, names).system(polys)
        try:
            if system.dimension() == 0:
                skipped += 1
                continue
            start = time.perf_counter()
            certificate = system.projection(seed=case, equations="now").to_dict()
            produce = time.perf_counter() - start
        except ValueError:  # the unit ideal: no projection to certify
            skipped += 1
            continue
        start = time.perf_counter()
        problems = check_certificate(certificate, system)
        check = time.perf_counter() - start
        if problems:
            raise SystemExit(f"case {case}: a genuine certificate was rejected: {problems}")
        rows.append((check / max(produce, 1e-4), produce, check, case, p, polys))
    ratios = sorted(r[0] for r in rows)
    print(
        f"{len(rows)} certificates produced and checked ({skipped} systems of dimension 0 or unit skipped), seed {seed}"
    )
    print(
        f"check / produce: median {statistics.median(ratios):.2f}, "
        f"90th percentile {ratios[int(0.9 * (len(ratios) - 1))]:.2f}, largest {ratios[-1]:.2f}"
    )
    print(
        f"total: produce {sum(r[1] for r in rows):.2f} s, check {sum(r[2] for r in rows):.2f} s; "
        f"checks over 20 s: {sum(r[2] > 20 for r in rows)}"
    )
    worst = max(rows)
    print(
        f"largest ratio: case {worst[3]}, produced in {worst[1] * 1e3:.2f} ms, checked in {worst[2] * 1e3:.2f} ms"
    )
    timed = sorted(r[0] for r in rows if r[1] >= 0.01)
    if timed:
        print(
            f"among the {len(timed)} certificates that took 10 ms or more to produce: median "
            f"{statistics.median(timed):.2f}, largest {timed[-1]:.2f}"
        )
    print("slowest checks (ratio, produce s, check s, case, field, equations):")
    for ratio, produce, check, case, p, polys in sorted(rows, key=lambda r: -r[2])[:5]:
        print(f"  {ratio:6.2f} {produce:8.4f} {check:8.4f}  case {case} GF({p}) {polys}")


if __name__ == "__main__":
    main()
