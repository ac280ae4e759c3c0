"""sympy and galois interop. sympy (PyPI) is the reference for polynomial arithmetic: random
polynomials go to sympy and back unchanged, and products and sums computed by fibrewise equal
those sympy computes on the converted operands. galois (PyPI) is the reference for GF(p^k)
arithmetic: field elements and multiplication matrices as galois arrays equal what fibrewise
computes."""

import random

import numpy as np
import pytest
import sympy

import fibrewise as fw

PRIMES = [2, 7, 65521, 2**61 - 1]


def random_polynomial(rng, V, coefficient):
    terms = []
    for _ in range(rng.randint(0, 6)):
        exps = [rng.randint(0, 3) for _ in V.names]
        terms.append((exps, coefficient(rng)))
    return V.from_terms(terms)


def sympy_poly(expr, V, p=None):
    gens = [sympy.Symbol(n) for n in V.names]
    return sympy.Poly(expr, *gens, modulus=p) if p else sympy.Poly(expr, *gens, domain="QQ")


@pytest.mark.parametrize("p", PRIMES)
def test_sympy_round_trip_and_arithmetic_over_prime_fields(p):
    rng = random.Random(p)
    V = fw.Space(p, "x, y, z")
    for _ in range(40):
        f, g = (random_polynomial(rng, V, lambda r: r.randrange(p)) for _ in range(2))
        F, G = f.to_sympy(), g.to_sympy()
        assert V.from_sympy(F) == f and V.from_sympy(sympy_poly(F, V, p)) == f
        assert sympy_poly((f * g + f**2 - g).to_sympy(), V, p) == sympy_poly(F * G + F**2 - G, V, p)


def test_sympy_round_trip_and_arithmetic_over_the_rationals():
    rng = random.Random(5)
    V = fw.Space("Q", "x, y")
    for _ in range(40):
        f, g = (
            random_polynomial(rng, V, lambda r: sympy.Rational(r.randint(-9, 9), r.randint(1, 9)))
            for _ in range(2)
        )
        F, G = f.to_sympy(), g.to_sympy()
        assert V.from_sympy(F) == f
        assert sympy_poly((f * g - 3 * g**2).to_sympy(), V) == sympy_poly(F * G - 3 * G**2, V)


def test_sympy_round_trip_over_an_extension_field():
    rng = random.Random(9)
    V = fw.Space("GF(3^4)", "x, y")
    for _ in range(30):
        f = random_polynomial(rng, V, lambda r: r.randrange(81))
        assert V.from_sympy(f.to_sympy()) == f


def test_systems_from_sympy_expressions():
    x, y = sympy.symbols("x y", real=True)  # assumptions on symbols do not matter
    V = fw.Space(101, "x, y")
    S = V.system([x**2 - 2 * y, sympy.Rational(1, 2) * x * y - 1, sympy.Poly(y**3 - x, x, y)])
    assert S == V.system(["x^2 - 2*y", "1/2*x*y - 1", "y^3 - x"])
    with pytest.raises(ValueError, match="unknown symbol 'w'"):
        V.from_sympy(sympy.Symbol("w") + x)
    with pytest.raises(ValueError, match="not a polynomial with rational coefficients"):
        V.from_sympy(sympy.sqrt(2) * x)
    with pytest.raises(ValueError, match="not a polynomial"):
        V.from_sympy(1 / x)
    with pytest.raises(TypeError, match="sympy expression"):
        V.from_sympy(3.5)


@pytest.mark.parametrize("spec", ["GF(2^8)", "GF(3^5)", "GF(7^2)"])
def test_galois_elements_equal_the_field_elements(spec):
    F = fw.field(spec)
    GF = F.galois_field()
    assert GF.order == F.size and GF.characteristic == F.characteristic
    V = fw.Space(F, "x")
    rng = random.Random(spec)
    for _ in range(50):
        c1, c0, v = (rng.randrange(F.size) for _ in range(3))
        f = V.from_terms([((1,), c1), ((0,), c0)])
        # c1*v + c0 computed by fibrewise equals the same expression in galois.
        assert F.to_galois(f.evaluate([v])) == GF(c1) * GF(v) + GF(c0)
        assert F.from_galois(F.to_galois(v)) == v


def test_multiplication_matrices_over_extension_fields_are_galois_arrays():
    # x^2 + a*x + 1 over GF(2^8): on the basis [1, x], x * x = -a*x - 1 = a*x + 1 (characteristic 2).
    F = fw.field("GF(2^8)")
    V = fw.Space(F, "x")
    M = V.system(["x^2 + a*x + 1"]).multiplication_matrix("x")
    GF = F.galois_field()
    assert type(M) is GF
    assert np.array_equal(M, GF([[0, 1], [1, 2]]))  # a has integer representation 2
    # Over Q the entries stay exact fractions (x^2 - 1/3 after making 3x^2 - 1 monic).
    M = fw.Space("Q", "x").system(["3*x^2 - 1"]).multiplication_matrix("x")
    assert M.dtype == object and M.tolist() == [[0, sympy.Rational(1, 3)], [1, 0]]
