"""Noether normalization against one grevlex basis of the input, on positive-dimensional systems.

Target: the whole normalization (search + certificate) costs at most 3x one grevlex basis when a
change of variables or a linear change works. The nonlinear fallback (Nagata's substitutions) is
measured on the rational-lines system x^q*y - x*y^q over GF(q) (no linear parameter exists) and
by forcing strategy="nonlinear" on the other systems.

Systems: random underdetermined quadratic systems (m < n, dense, GF(32003)); katsura-n with its
last equation dropped (Katsura's magnetism systems, as commonly stated: u0 + 2(u1 + ... + un) = 1
and sum_l u_|l| u_|m-l| = u_m); cyclic-4, which has dimension 1; edge ideals of cycles (monomial
ideals, whose own basis costs nothing, that need a linear change); cyclic-8 only with --cyclic8,
since its grevlex basis alone is long for the reference engine; 7 variables and
5 quadrics (rank 32) only with --large, since verify() alone takes minutes there.

Usage: python bench/bench_normalization.py [--cyclic8] [--large]
"""

from __future__ import annotations

import pathlib
import random
import sys
import time

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

import fibrewise as fw  # noqa: E402
from systems import cyclic, katsura  # noqa: E402

P = 32003


def random_quadrics(n: int, m: int, seed: int) -> tuple[list[str], list[str]]:
    rng = random.Random(seed)
    names = [f"x{i}" for i in range(n)]
    monos = [f"{a}*{b}" for i, a in enumerate(names) for b in names[i:]] + names + ["1"]
    polys = [" + ".join(f"{rng.randrange(1, P)}*{mono}" for mono in monos) for _ in range(m)]
    return names, polys


def katsura_minus_one(n: int) -> tuple[list[str], list[str]]:
    """katsura-n without its last equation: a curve."""
    names, polys = katsura(n)
    return names, polys[:-1]


def timed(f):
    start = time.perf_counter()
    value = f()
    return value, time.perf_counter() - start


def measure(title: str, field: int, names: list[str], polys: list[str], strategy: str = "auto") -> None:
    space = fw.Space(field, names)
    _, basis_s = timed(lambda: space.system(polys).basis("grevlex"))
    I = space.system(polys)
    nn, norm_s = timed(lambda: I.projection(strategy=strategy))
    _, verify_s = timed(nn.verify)
    ratio = norm_s / basis_s if basis_s > 0 else float("inf")
    eq_deg = max(len(e) - 1 for e in nn.equations)
    print(
        f"{title:<34} d={nn.dimension} {nn.strategy:<10} rank={nn.rank:<4} gens={len(nn.module_generators):<5}"
        f" maxeq={eq_deg:<4} basis {basis_s:8.3f}s  normalization {norm_s:8.3f}s  ratio {ratio:6.2f}"
        f"  verify {verify_s:7.3f}s",
        flush=True,
    )


def main(argv: list[str]) -> int:
    print("system                             d  strategy   rank gens  max eq. degree | seconds")
    sizes = [(5, 3), (6, 4), (7, 4)] + ([(7, 5)] if "--large" in argv else [])
    for n, m in sizes:
        names, polys = random_quadrics(n, m, seed=n * 10 + m)
        measure(f"random quadrics n={n} m={m}", P, names, polys)
    for n in [3, 4, 5]:
        names, polys = katsura_minus_one(n)
        measure(f"katsura-{n} minus last equation", P, names, polys)
    names, polys = cyclic(4)
    measure("cyclic-4", P, names, polys)
    # Edge ideals of cycles (x_i x_{i+1}): unions of coordinate subspaces, where no subset of the
    # variables is a set of parameters, so a linear change is needed.
    for n in [5, 7, 9]:
        names = [f"x{i}" for i in range(n)]
        measure(
            f"edge ideal of the {n}-cycle", P, names, [f"{names[i]}*{names[(i + 1) % n]}" for i in range(n)]
        )
    if "--cyclic8" in argv:
        names, polys = cyclic(8)
        measure("cyclic-8", P, names, polys)
    print("\nnonlinear fallback")
    for q in [2, 3, 5, 7]:
        measure(f"rational lines over GF({q})", q, ["x", "y"], [f"x^{q}*y - x*y^{q}"])
    for n, m in [(5, 3)]:
        names, polys = random_quadrics(n, m, seed=n * 10 + m)
        measure(f"random quadrics n={n} m={m}, forced", P, names, polys, strategy="nonlinear")
    names, polys = katsura_minus_one(3)
    measure("katsura-3 minus last, forced", P, names, polys, strategy="nonlinear")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
