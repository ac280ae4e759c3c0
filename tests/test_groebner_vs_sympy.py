"""Reduced Gröbner bases compared with sympy's ``groebner`` (reference library from PyPI, used
with ``modulus=p``) on a few hundred random small systems: 2-4 variables, several primes, and the
three basic orders. Reduced bases are unique, so they must agree exactly."""

import random

import pytest
import sympy

import fibrewise as fw
from systems import random_poly

PRIMES = [2, 3, 7, 101, 32003]
ORDERS = ["lex", "grlex", "grevlex"]
NAMES = ["x", "y", "z", "w"]


def sympy_basis(texts, nvars, p, order):
    gens = sympy.symbols(NAMES[:nvars])
    polys = [sympy.sympify(t.replace("^", "**")) for t in texts]
    gb = sympy.groebner(polys, *gens, modulus=p, order=order)
    out = set()
    for g in gb.exprs:
        poly = sympy.Poly(g, *gens, modulus=p)
        out.add(frozenset((tuple(m), int(c) % p) for m, c in poly.terms()))
    return out


def our_basis(texts, nvars, p, order):
    R = fw.Space(p, NAMES[:nvars], order=order)
    gb = R.system(texts).basis()
    return {frozenset((tuple(e), c % p) for e, c in g.terms()) for g in gb}


CASES = [(seed, PRIMES[seed % len(PRIMES)], ORDERS[seed % 3], 2 + seed % 3) for seed in range(300)]


@pytest.mark.parametrize("seed,p,order,nvars", CASES)
def test_same_reduced_basis_as_sympy(seed, p, order, nvars):
    rng = random.Random(seed)
    texts = [random_poly(rng, NAMES[:nvars], p) for _ in range(rng.randint(1, 3))]
    ours = our_basis(texts, nvars, p, order)
    theirs = sympy_basis(texts, nvars, p, order)
    assert ours == theirs, f"{texts} over GF({p}), {order}"


def test_sampled_engine_on_katsura_matches_sympy_and_the_published_count():
    # katsura-4 (small enough for sympy; its matrices are so small that the sampled engine
    # reduces them exactly) and katsura-7 (whose larger matrices it samples, so fewer rows end up
    # reduced to zero): the sampled engine's basis equals sympy's and the exact engine's;
    # katsura-n has 2^n solutions counted with multiplicity (Katsura 1990, from memory).
    from systems import katsura

    names, eqs = katsura(4)
    R = fw.Space(32003, names, order="grevlex")
    gb = R.system(eqs).basis(engine="f4-sampled")
    assert gb.stats.engine == "f4-sampled"
    ours = {frozenset((tuple(e), c % 32003) for e, c in g.terms()) for g in gb}
    gens = sympy.symbols(names)
    theirs = sympy.groebner([sympy.sympify(t) for t in eqs], *gens, modulus=32003, order="grevlex")
    assert ours == {
        frozenset((tuple(m), int(c) % 32003) for m, c in sympy.Poly(g, *gens, modulus=32003).terms())
        for g in theirs.exprs
    }

    names, eqs = katsura(7)
    ideal = fw.Space(32003, names, order="grevlex").system(eqs)
    sampled = ideal.basis(engine="f4-sampled")
    exact = ideal.basis(engine="f4")
    assert list(map(str, sampled)) == list(map(str, exact))
    assert sampled.stats.zero_reductions < exact.stats.zero_reductions
    assert ideal.degree() == 2**7


def test_unknown_engine_is_refused_with_the_choices():
    R = fw.Space(7, "x, y")
    with pytest.raises(ValueError, match="f4-sampled"):
        R.system(["x*y - 1"]).basis(engine="f5")


@pytest.mark.parametrize("seed", range(0, 300, 3))
def test_signature_engine_matches_sympy_in_degree_orders(seed):
    # The same random systems in grlex and grevlex (the orders the signature engine accepts).
    rng = random.Random(seed)
    p, nvars = PRIMES[seed % len(PRIMES)], 2 + seed % 3
    order = ["grlex", "grevlex"][seed % 2]
    texts = [random_poly(rng, NAMES[:nvars], p) for _ in range(rng.randint(1, 3))]
    R = fw.Space(p, NAMES[:nvars], order=order)
    gb = R.system(texts).basis(engine="f4-signature")
    assert gb.stats.engine == "f4-signature"
    ours = {frozenset((tuple(e), c % p) for e, c in g.terms()) for g in gb}
    assert ours == sympy_basis(texts, nvars, p, order), f"{texts} over GF({p}), {order}"


def test_signature_engine_on_katsura_skips_zero_reductions_and_refuses_lex():
    # katsura-7 has 2^7 solutions with multiplicity (Katsura 1990, from memory); its top-degree
    # forms have no common zero, so the signature criteria leave almost no row reducing to zero.
    from systems import katsura

    names, eqs = katsura(7)
    ideal = fw.Space(32003, names, order="grevlex").system(eqs)
    signature = ideal.basis(engine="f4-signature")
    exact = ideal.basis(engine="f4")
    assert list(map(str, signature)) == list(map(str, exact))
    assert signature.stats.zero_reductions * 4 < exact.stats.zero_reductions
    # Under lex, an explicit engine computes the grevlex basis and the order is changed after.
    lex = fw.Space(32003, names, order="lex").system(eqs)
    by_signatures = lex.basis(engine="f4-signature")
    assert by_signatures.stats.engine == "f4-signature"
    assert list(map(str, by_signatures)) == list(map(str, lex.basis(engine="auto")))
