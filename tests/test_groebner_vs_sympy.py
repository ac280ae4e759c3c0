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
    R = fw.PolynomialRing(p, NAMES[:nvars], order=order)
    gb = R.ideal(texts).groebner_basis()
    return {frozenset((tuple(e), c % p) for e, c in g.terms()) for g in gb}


CASES = [(seed, PRIMES[seed % len(PRIMES)], ORDERS[seed % 3], 2 + seed % 3) for seed in range(300)]


@pytest.mark.parametrize("seed,p,order,nvars", CASES)
def test_same_reduced_basis_as_sympy(seed, p, order, nvars):
    rng = random.Random(seed)
    texts = [random_poly(rng, NAMES[:nvars], p) for _ in range(rng.randint(1, 3))]
    ours = our_basis(texts, nvars, p, order)
    theirs = sympy_basis(texts, nvars, p, order)
    assert ours == theirs, f"{texts} over GF({p}), {order}"
