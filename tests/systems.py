"""Benchmark systems as polynomial text, from their standard definitions (REFERENCE-VALUES.md),
and random small systems. Shared by the tests and bench/bench_invariants.py."""

import itertools


def cyclic(n):
    """For k = 1..n-1 the sum over i of x_i ... x_{i+k-1} (indices mod n), and x_0...x_{n-1} - 1."""
    v = [f"x{i}" for i in range(n)]
    eqs = [" + ".join("*".join(v[(i + j) % n] for j in range(k)) for i in range(n)) for k in range(1, n)]
    return v, eqs + ["*".join(v) + " - 1"]


def katsura(n):
    """sum_l u_l = 1 and sum_l u_l u_{m-l} = u_m (m < n), l in -n..n, u_{-l} = u_l, u_l = 0 past n."""
    v = [f"u{i}" for i in range(n + 1)]

    def u(l):
        return abs(l) if abs(l) <= n else None

    eqs = [" + ".join(["u0"] + [f"2*u{l}" for l in range(1, n + 1)]) + " - 1"]
    for m in range(n):
        pairs = [(u(l), u(m - l)) for l in range(-n, n + 1)]
        eqs.append(" + ".join(f"u{a}*u{b}" for a, b in pairs if a is not None and b is not None) + f" - u{m}")
    return v, eqs


def random_form(rng, names, degree, p):
    """A dense form of the given degree with random coefficients in GF(p)."""
    terms = []
    for exps in itertools.product(range(degree + 1), repeat=len(names)):
        if sum(exps) == degree:
            mono = "*".join(f"{n}^{e}" for n, e in zip(names, exps) if e)
            terms.append(f"{rng.randrange(p)}*{mono}")
    return " + ".join(terms)


def random_poly(rng, names, p):
    """A sparse random polynomial over GF(p): 1-4 terms of degree at most 3 in ``names``, nonzero
    coefficients (always 1 over GF(2), where no draw is needed)."""
    terms = []
    for _ in range(rng.randint(1, 4)):
        exps = [0] * len(names)
        for _ in range(rng.randint(0, 3)):
            exps[rng.randrange(len(names))] += 1
        mono = "*".join(f"{names[i]}^{e}" for i, e in enumerate(exps) if e) or "1"
        terms.append(f"{rng.randint(1, p - 1) if p > 2 else 1}*{mono}")
    return " + ".join(terms)
