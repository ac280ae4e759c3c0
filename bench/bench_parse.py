"""Reading polynomial text: time against the length of the text.

A sum of n terms is read in time linear in n (up to sorting the terms): the table reads sums of
3,000, 30,000 and 300,000 terms in three variables, and a linear form in 3,000 variables, and
prints the time per term and the ratio to printing the same polynomial. Target: the time per term
stays flat (within 2x) while n grows a hundredfold.
"""

from __future__ import annotations

import sys
import time

import fibrewise as fw


def timed(call):
    start = time.perf_counter()
    value = call()
    return value, time.perf_counter() - start


def row(label: str, V: fw.Space, text: str, terms: int) -> float:
    f, read = timed(lambda: V.parse(text))
    assert len(f.terms()) == terms, (label, len(f.terms()))
    _, printed = timed(lambda: str(f))
    per_term = read / terms * 1e6
    print(f"{label:<34} {terms:>8} {read:>9.3f} {per_term:>9.2f} {read / printed:>8.1f}x", flush=True)
    return per_term


def main() -> int:
    print(f"{'text':<34} {'terms':>8} {'seconds':>9} {'us/term':>9} {'/print':>9}")
    V = fw.Space(65521, "x, y, z")
    per_term = []
    for n in (3_000, 30_000, 300_000):
        text = " + ".join(f"{i % 65520 + 1}*x^{i // 900}*y^{i // 30 % 30}*z^{i % 30}" for i in range(n))
        per_term.append(row(f"sum of {n} terms", V, text, n))
    names = [f"v{i}" for i in range(3000)]
    W = fw.Space(32003, names)
    row("linear form in 3000 variables", W, " + ".join(f"{i + 1}*{v}" for i, v in enumerate(names)), 3000)
    flat = max(per_term) / min(per_term)
    print(
        f"time per term, largest / smallest over a 100x range of n: {flat:.2f} (target <= 2: "
        f"{'met' if flat <= 2 else 'missed'})"
    )
    return 0


if __name__ == "__main__":
    sys.exit(main())
