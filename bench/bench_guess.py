"""Guess and determine: fibre-by-fibre points and guesses spread over processes.

1. All GF(101)-points of a smooth plane quartic (101 fibres over x) against the time of one
   fibre solved with a basis of its own: target <= 50x (a basis per fibre would be about 101x).
2. All GF(31)-points of a cubic surface (961 fibres over x, y): target <= 5 s.
3. `solve --guess` on a toy cipher of our own over GF(503) (six rounds, two key words, a planted
   key), with the guesses the plan chooses (its whole system is over the plan's budget): two
   local worker processes against one (in-process), wall-clock and CPU seconds, target >= 1.8x
   (needs two free cores, so the load average is printed beside it; the two-worker time
   includes starting the processes). `python bench/bench_guess.py --workers` runs only this one.
   A worker computes on one core (worker processes set RAYON_NUM_THREADS=1), so this process is
   held to one thread as well: the one-worker run is one core, not the engine's own threads.
"""

from __future__ import annotations

import os
import pathlib
import sys
import time

os.environ.setdefault("RAYON_NUM_THREADS", "1")  # before the core's thread pool starts

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


EXAMPLES = pathlib.Path(__file__).resolve().parent.parent / "examples"


def toy_cipher(
    rounds: int, p: int = 503, key: tuple[int, int] = (7, 11), plaintexts: tuple[int, ...] = (3, 8)
) -> fw.System:
    """A toy cipher of our own (a demo scenario, not a real cipher) over GF(p): ``rounds`` rounds
    with two key words used in turn, round i mapping s to (s + k + i)^3 (cubing permutes GF(p)
    when 3 does not divide p - 1, as for 251 and 503); the known plaintexts and their
    ciphertexts under the planted ``key``. Unknowns: k1, k2 and the states s<j>_<i> of
    plaintext j after round i."""
    assert (p - 1) % 3 != 0, "cubing must permute the field"
    states = [[f"s{j}_{i}" for i in range(1, rounds)] for j in range(len(plaintexts))]
    space = fw.Space(f"GF({p})", ["k1", "k2"] + [s for row in states for s in row])
    equations = []
    for j, plaintext in enumerate(plaintexts):
        value, previous = plaintext, str(plaintext)
        for i in range(1, rounds + 1):
            k_name, k_value = ("k1", key[0]) if i % 2 else ("k2", key[1])
            value = pow(value + k_value + i, 3, p)
            image = f"({previous} + {k_name} + {i})^3"
            if i < rounds:
                equations.append(f"{states[j][i - 1]} - {image}")
                previous = states[j][i - 1]
            else:
                equations.append(f"{value} - {image}")
    return space.system(equations)


def cpu_of_children() -> float:
    import resource

    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    return usage.ru_utime + usage.ru_stime


def workers(rounds: int = 6) -> None:
    """One worker (in this process) against two worker processes on the guess split the plan
    chooses; wall-clock and CPU seconds of both, and the load average beside them."""
    S = toy_cipher(rounds)
    if rounds == 6:  # the system of the README's tour, written out in examples/
        example = fw.System.read(str(EXAMPLES / "toy_cipher_6round_gf503.txt"))
        assert sorted(map(str, example.equations)) == sorted(map(str, S.equations))
    # The whole system (k = 0) is far too hard to sample: the budget stops it.
    plan, t_plan = timed(lambda: S.guess_plan(max_guess=2, samples=3, budget=1.0))
    # the best split that guesses something (k = 0 leaves nothing to spread)
    split = min(plan.rows[1:], key=lambda r: (r.over_budget, r.total_seconds))
    guess = split.variables
    print(
        f"toy cipher over {S.space.field}, {rounds} rounds, plan in {t_plan:.1f} s: "
        + "; ".join(
            f"k={r.k} {','.join(r.variables) or '-'} {'>' if r.over_budget else ''}{r.total_seconds:.3g} s"
            for r in plan.rows
        )
        + f"; split: guess {', '.join(guess)} ({split.guesses} systems, expected {split.total_seconds:.1f} s)",
        flush=True,
    )
    load = os.getloadavg()[0]
    cpu = time.process_time()
    found, one = timed(lambda: sorted(guessed_points(S, guess, workers=1)))
    cpu_one = time.process_time() - cpu
    children = cpu_of_children()
    again, two = timed(lambda: sorted(guessed_points(S, guess, workers=2)))
    cpu_two = cpu_of_children() - children
    load = max(load, os.getloadavg()[0])
    assert found == again
    assert (7, 11) in [p[:2] for p in found], "the planted key is among the solutions"
    ratio = one / two
    print(
        f"{len(found)} keys found; 1 worker {one:.2f} s (CPU {cpu_one:.2f} s), "
        f"2 workers {two:.2f} s (CPU of the workers {cpu_two:.2f} s): speed-up {ratio:.2f} "
        f"(target >= 1.8) {'OK' if ratio >= 1.8 else 'MISSED'}; load average {load:.2f} "
        f"on {os.cpu_count()} cores{' (busy machine: the ratio means little)' if load >= 1.5 else ''}"
    )


if __name__ == "__main__":
    import argparse

    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--workers", action="store_true", help="only the benchmark of 1 against 2 workers")
    parser.add_argument("--rounds", type=int, default=6, help="rounds of the toy cipher (default 6)")
    args = parser.parse_args()
    if not args.workers:
        quartic()
        surface()
    workers(args.rounds)
