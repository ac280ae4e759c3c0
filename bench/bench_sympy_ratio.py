"""F4 next to sympy's ``groebner`` (the general-purpose reference library from PyPI) on the
instances sympy can finish: cyclic-5, cyclic-6 and katsura-5..7 over GF(65521) in grevlex.

    python bench/bench_sympy_ratio.py [--timeout SECONDS]

Both sides compute the reduced basis from the same polynomial text, one thread each; sympy runs
in a child process so that an instance it cannot finish within the timeout is reported as such
instead of stopping the run. Each line also checks that both bases have the same leading
monomials and length. Target (issue 3): at least 1000 times faster than sympy on cyclic-6.
"""

from __future__ import annotations

import argparse
import multiprocessing
import pathlib
import sys
import time

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

import fibrewise as fw  # noqa: E402
from systems import cyclic, katsura  # noqa: E402

P = 65521
TARGET_RATIO_CYCLIC6 = 1000.0


def instances():
    yield "cyclic-5", *cyclic(5)
    yield "cyclic-6", *cyclic(6)
    for n in (5, 6, 7):
        yield f"katsura-{n}", *katsura(n)


def ours(names, texts):
    space = fw.Space(P, names, order="grevlex")
    start = time.perf_counter()
    basis = space.system(texts).basis(engine="f4", threads=1)
    seconds = time.perf_counter() - start
    leads = sorted(tuple(g.terms()[0][0]) for g in basis)
    return seconds, leads


def sympy_child(names, texts, queue):
    import sympy

    gens = sympy.symbols(names)
    polys = [sympy.sympify(t.replace("^", "**")) for t in texts]
    start = time.perf_counter()
    gb = sympy.groebner(polys, *gens, modulus=P, order="grevlex")
    seconds = time.perf_counter() - start
    leads = sorted(tuple(sympy.Poly(g, *gens, modulus=P).monoms(order="grevlex")[0]) for g in gb.exprs)
    queue.put((seconds, leads))


def theirs(names, texts, timeout):
    queue = multiprocessing.Queue()
    child = multiprocessing.Process(target=sympy_child, args=(names, texts, queue))
    child.start()
    child.join(timeout)
    if child.is_alive():
        child.terminate()
        child.join()
        return None
    return queue.get()


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--timeout", type=float, default=120.0, help="seconds allowed to sympy per instance")
    args = parser.parse_args()
    print(
        f"F4 vs sympy.groebner over GF({P}), grevlex, one thread each (sympy {__import__('sympy').__version__})"
    )
    print(f"{'system':<11} {'fibrewise s':>12} {'sympy s':>10} {'ratio':>9}  same basis")
    verdict = "not measured"
    ours(["x", "y"], ["x^2 - y", "y^2 - x"])  # warm-up: loads the extension before the first timing
    for name, names, texts in instances():
        our_seconds, our_leads = ours(names, texts)
        result = theirs(names, texts, args.timeout)
        if result is None:
            print(
                f"{name:<11} {our_seconds:>12.4f} {'>' + format(args.timeout, '.0f'):>10} {'':>9}  (sympy timed out)"
            )
            continue
        sympy_seconds, sympy_leads = result
        ratio = sympy_seconds / max(our_seconds, 1e-9)
        same = "yes" if sympy_leads == our_leads else "NO"
        print(f"{name:<11} {our_seconds:>12.4f} {sympy_seconds:>10.2f} {ratio:>8.0f}x  {same}")
        if name == "cyclic-6":
            met = ratio >= TARGET_RATIO_CYCLIC6
            verdict = f"{ratio:.0f}x ({'met' if met else 'missed'}; target >= {TARGET_RATIO_CYCLIC6:.0f}x)"
        if same != "yes":
            print(f"  leading monomials differ on {name}", file=sys.stderr)
            return 1
    print(f"ratio to sympy on cyclic-6: {verdict}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
