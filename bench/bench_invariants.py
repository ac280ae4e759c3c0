"""Time of dimension, Hilbert series, vector-space dimension and point counts next to the time of
the Gröbner basis they are read from, on benchmark systems (cyclic, katsura, random quadrics).

The invariants reuse the ideal's cached basis, so their columns are the invariant alone;
count_points computes its own bases (with the field equations). Target: every invariant read
off the basis costs a small fraction of the basis itself (ratio column)."""

from __future__ import annotations

import pathlib
import random
import sys
import time

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

import fibrewise as fw  # noqa: E402
from systems import cyclic, katsura, random_form  # noqa: E402


def timed(fn):
    start = time.perf_counter()
    value = fn()
    return value, time.perf_counter() - start


def systems():
    for n in (5, 6):
        yield f"cyclic-{n}", "GF(32003)", *cyclic(n)
    for n in (5, 6, 7):
        yield f"katsura-{n}", "GF(32003)", *katsura(n)
    rng = random.Random(2004)
    for n, m in ((7, 8), (8, 9)):
        names = [f"x{i}" for i in range(n)]
        yield (
            f"quadrics n={n} m={m}",
            "GF(65521)",
            names,
            [random_form(rng, names, 2, 65521) for _ in range(m)],
        )
    rng = random.Random(7)
    names = [f"x{i}" for i in range(5)]
    yield "3 quadrics, 5 vars (dim 2)", "GF(7)", names, [random_form(rng, names, 2, 7) for _ in range(3)]


def main() -> None:
    header = f"{'system':28} {'basis':>8} {'dim':>8} {'hilbert':>8} {'vsdim':>8} {'points':>8} {'ratio':>7}  result"
    print(header)
    print("-" * len(header))
    for name, spec, names, eqs in systems():
        I = fw.Space(spec, names).system(eqs)
        gb, t_gb = timed(I.basis)
        d, t_dim = timed(I.dimension)
        hs, t_hs = timed(I.hilbert)
        if d == 0:
            vs, t_vs = timed(I.quotient_dimension)
        else:
            vs, t_vs = None, float("nan")
        # Point counts over a small field: GF(101) for finite sets, GF(7) for positive dimension
        # (the count is then about 7^dim, all of it in one zero-dimensional basis).
        q = 101 if d == 0 else 7
        pts, t_pts = timed(fw.Space(q, names).system(eqs).count_points)
        ratio = max(t_dim, t_hs, 0 if vs is None else t_vs) / max(t_gb, 1e-9)
        result = f"dim {d}, degree {hs.degree}, GF({q})-points {pts}"
        print(
            f"{name:28} {t_gb:8.3f} {t_dim:8.4f} {t_hs:8.4f} {t_vs:8.4f} {t_pts:8.3f} {ratio:7.3f}  {result}",
            flush=True,
        )
    print(
        "\nseconds; 'ratio' = slowest of dim/hilbert/vsdim over the basis time; points over GF(101) or GF(7)."
    )


if __name__ == "__main__":
    main()
