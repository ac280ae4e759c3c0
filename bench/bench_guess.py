"""Guess and determine: fibre-by-fibre points and guesses spread over processes.

1. All GF(101)-points of a smooth plane quartic (101 fibres over x) against the time of one
   fibre solved with a basis of its own: target <= 50x (a basis per fibre would be about 101x).
2. All GF(31)-points of a cubic surface (961 fibres over x, y): target <= 5 s.
3. `solve --guess` on a toy cipher of our own over GF(251), with the guesses the plan chooses:
   two local worker processes against one (in-process), target >= 1.8x (needs two free cores;
   the two-worker time includes starting the processes).
"""

from __future__ import annotations

import pathlib
import sys
import time

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent.parent / "tests"))

import fibrewise as fw  # noqa: E402
from fibrewise import _native  # noqa: E402
from fibrewise.guess_solve import guessed_points  # noqa: E402


def timed(fn):
    start = time.perf_counter()
    value = fn()
    return value, time.perf_counter() - start


def one_fibre_with_its_own_basis(S: fw.System, value: int) -> float:
    space = S.space
    x = space.variables[0]
    gens = [g._native for g in S.equations] + [(x - value)._native]
    return timed(lambda: _native.rational_points(space._native, gens, None))[1]


def quartic() -> None:
    S = fw.Space("GF(101)", "x, y").system(["x^4 + y^4 + 1 + x*y"])
    fibres = [one_fibre_with_its_own_basis(S, v) for v in range(1, 8)]
    one = sorted(fibres)[len(fibres) // 2]
    points, total = timed(lambda: list(S.points()))
    count = S.count_points()
    ratio = total / one
    print(
        f"plane quartic over GF(101): {len(points)} points (count_points {count}) in {total:.3f} s; "
        f"one fibre with its own basis {one * 1e3:.2f} ms; ratio {ratio:.1f} (target <= 50) "
        f"{'OK' if ratio <= 50 else 'MISSED'}"
    )


def surface() -> None:
    S = fw.Space("GF(31)", "x, y, z").system(["z^3 + x^3 + y^3 + x*y*z + x + 1"])
    points, total = timed(lambda: list(S.points()))
    print(
        f"cubic surface over GF(31): {len(points)} points over 961 fibres in {total:.2f} s "
        f"(target <= 5 s) {'OK' if total <= 5 else 'MISSED'}"
    )


def toy_cipher() -> fw.System:
    """The toy cipher of our own in examples/ (four rounds over GF(251), two key words)."""
    return fw.System.read(
        str(pathlib.Path(__file__).resolve().parent.parent / "examples" / "toy_cipher_2key_gf251.txt")
    )


def workers() -> None:
    S = toy_cipher()
    plan, t_plan = timed(lambda: S.guess_plan(max_guess=2, samples=3))
    # the best split that guesses something (k = 0 leaves nothing to spread)
    split = min(plan.rows[1:], key=lambda r: r.total_seconds)
    guess = split.variables
    found, one = timed(lambda: sorted(guessed_points(S, guess, workers=1)))
    again, two = timed(lambda: sorted(guessed_points(S, guess, workers=2)))
    assert found == again
    ratio = one / two
    print(
        f"toy cipher over GF(251), 4 rounds, {len(found)} keys found: plan ({t_plan:.1f} s) guesses {', '.join(guess)} ({split.guesses} systems, best k overall {plan.best.k}); "
        f"1 worker {one:.2f} s, 2 workers {two:.2f} s: speed-up {ratio:.2f} (target >= 1.8) "
        f"{'OK' if ratio >= 1.8 else 'MISSED'}"
    )


if __name__ == "__main__":
    quartic()
    surface()
    workers()
