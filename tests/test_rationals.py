"""Maximal ideals over Q: ``is_closed_point`` and ``closed_point_degree`` against handbook facts
and against sympy (reference library from PyPI): sympy's ``groebner`` gives dim_Q R/I and, by
eliminating all variables from I + (t - u) in lex order, the minimal polynomial of a linear form
u; sympy's ``Poly.is_irreducible`` decides whether it is irreducible. When that polynomial has
degree dim R/I, R/I = Q[t]/(m) is a field iff m is irreducible; a reducible one always means
"not a field"."""

from itertools import product

import pytest
import sympy

import fibrewise as fw


def sympy_verdict(names, texts, rng):
    """(maximal, dim R/I) decided by sympy alone, trying random small linear forms."""
    xs = sympy.symbols(names)
    t = sympy.Symbol("t_")
    polys = [sympy.sympify(s.replace("^", "**")) for s in texts]
    basis = sympy.groebner(polys, *xs, order="grevlex")
    dimension = standard_monomial_count(basis, xs)
    for _ in range(20):
        u = sum(rng.randint(-3, 3) * x for x in xs) or xs[0]
        eliminated = sympy.groebner(polys + [t - u], *xs, t, order="lex")
        minimal = sympy.Poly([g for g in eliminated.exprs if g.free_symbols <= {t}][0], t)
        if not minimal.is_irreducible:
            return False, dimension
        if minimal.degree() == dimension:
            return True, dimension
    raise AssertionError("no primitive element among the random linear forms")


def standard_monomial_count(basis, xs):
    leads = [sympy.Poly(g, *xs).monoms(order="grevlex")[0] for g in basis.exprs]
    bound = max(max(m) for m in leads) + 1
    return sum(
        1
        for exps in product(range(bound), repeat=len(xs))
        if not any(all(e >= l for e, l in zip(exps, lead)) for lead in leads)
    )


# (variables, generators, maximal, [R/I : Q] when maximal), each with its outside source.
CASES = [
    # Q(√2, √3) has degree 4 over Q (handbook fact).
    (["x", "y"], ["x^2 - 2", "y^2 - 3"], True, 4),
    # (y - x)(y + x) = y^2 - x^2 = 0 in R/I: a zero divisor.
    (["x", "y"], ["x^2 - 2", "y^2 - 2"], False, None),
    # y = ±2x: again two components.
    (["x", "y"], ["x^2 - 2", "y^2 - 8"], False, None),
    # Q(i) has degree 2.
    (["x"], ["x^2 + 1"], True, 2),
    # x^4 + 4 = (x^2 + 2x + 2)(x^2 - 2x + 2) (Sophie Germain's identity).
    (["x"], ["x^4 + 4"], False, None),
    # The minimal polynomial of √2 + √3 (Swinnerton-Dyer): irreducible over Q, reducible
    # modulo every prime.
    (["x"], ["x^4 - 10*x^2 + 1"], True, 4),
    # The same field with y = (x^3 - 9x)/2 = √2 adjoined again (expand (√2 + √3)^3).
    (["x", "y"], ["x^4 - 10*x^2 + 1", "y - x^3/2 + 9/2*x"], True, 4),
    # Q(√2, √3, √5) has degree 8 (handbook fact: square roots of distinct squarefree integers
    # are linearly independent).
    (["x", "y", "z"], ["x^2 - 2", "y^2 - 3", "z^2 - 5"], True, 8),
    # The splitting field of x^3 - 2, Q(∛2, ω), has degree 6 (handbook fact); y = ωx.
    (["x", "y"], ["x^3 - 2", "y^2 + x*y + x^2"], True, 6),
    # A rational point is maximal of degree 1; a double point is not.
    (["x", "y"], ["x - 3/4", "y + 2"], True, 1),
    (["x", "y"], ["x^2", "y - 1"], False, None),
]


@pytest.mark.parametrize("names, gens, maximal, degree", CASES)
def test_known_maximal_and_non_maximal_ideals(names, gens, maximal, degree, rng):
    I = fw.Space("Q", names).system(gens)
    assert I.is_closed_point() == maximal
    assert sympy_verdict(names, gens, rng) == (maximal, I.quotient_dimension())
    if maximal:
        assert I.closed_point_degree() == degree
    else:
        with pytest.raises(ValueError, match="not maximal"):
            I.closed_point_degree()


def random_univariate(rng, degree):
    coeffs = [rng.randint(-4, 4) for _ in range(degree)] + [rng.choice([1, 2, 3])]
    return " + ".join(f"({c})*x^{i}" for i, c in enumerate(coeffs) if c)


def test_random_simple_extensions_against_sympy(rng):
    # (f(x), y - x^2 + 1): R/I = Q[x]/(f), a field iff f is irreducible (sympy decides).
    # Half of the f are products, so both answers occur.
    R = fw.Space("Q", "x, y")
    x = sympy.Symbol("x")
    seen = set()
    for k in range(16):
        f = random_univariate(rng, rng.randint(2, 5))
        if k % 2:
            f = f"({f})*({random_univariate(rng, rng.randint(1, 2))})"
        poly = sympy.Poly(sympy.sympify(f.replace("^", "**")), x)
        if poly.degree() < 1 or not sympy.Poly(sympy.gcd(poly, poly.diff(x)), x).degree() == 0:
            continue  # keep squarefree f of positive degree
        I = R.system([f, "y - x^2 + 1"])
        assert I.is_closed_point() == poly.is_irreducible, f
        if poly.is_irreducible:
            assert I.closed_point_degree() == poly.degree()
        seen.add(poly.is_irreducible)
    assert seen == {True, False}


def test_positive_dimensional_and_unit_ideals_are_not_maximal():
    R = fw.Space("Q", "x, y")
    assert not R.system(["x*y - 1"]).is_closed_point()
    assert not R.system(["1"]).is_closed_point()
    with pytest.raises(ValueError, match="not maximal"):
        R.system(["x*y - 1"]).closed_point_degree()
