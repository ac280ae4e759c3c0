"""Benchmark systems as polynomial text, and random small systems, for the tests and the
benchmarks. The standard systems (cyclic, katsura, eco, noon) come from the one generator in the
core (``fibrewise_core::systems``, definitions in tests/REFERENCE.md), which the core's own tests
and benchmarks use too."""

import itertools

from fibrewise._native import standard_system


def cyclic(n):
    """cyclic-n in x0..x{n-1}: for k = 1..n-1 the sum over i of x_i ... x_{i+k-1} (indices mod n),
    and x_0...x_{n-1} - 1."""
    return standard_system("cyclic", n)


def katsura(n):
    """katsura-n in u0..un: sum_l u_l = 1 and sum_l u_l u_{m-l} = u_m (m < n), l in -n..n,
    u_{-l} = u_l, u_l = 0 past n."""
    return standard_system("katsura", n)


def eco(n):
    """eco-n in x1..xn."""
    return standard_system("eco", n)


def noon(n):
    """noon-n in x1..xn (coefficients times 10: 10 x_i sum_{j != i} x_j^2 - 11 x_i + 10)."""
    return standard_system("noon", n)


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
