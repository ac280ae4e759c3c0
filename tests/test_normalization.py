"""Noether normalization, its certificate, and integrality.

Sources: textbook examples of commutative algebra (named beside each case); the union of the
GF(q)-rational lines through the origin (x^q*y - x*y^q is the product of all linear forms over
GF(q) up to scalars, Lidl and Niederreiter, *Finite Fields*, ch. 3 — from memory); random ideals
checked against sympy (reference library from PyPI) for the equations and against a dimension
computed here from sympy's basis by brute-force independent sets (Kredel and Weispfenning 1988).
"""

import itertools
import json
import random

import pytest
import sympy

import fibrewise as fw
from fibrewise.normalization import CertificateError, check_certificate
from systems import random_poly

NAMES = ["x", "y", "z", "w"]


def ideal(p, names, gens):
    return fw.Space(p, names).system(gens)


def zero_dim_quotient_dimension(I):
    """dim_k R/I for zero-dimensional I: standard monomials of its grevlex basis, counted here."""
    gb = I.basis("grevlex")
    leads = [g.leading_monomial().terms()[0][0] for g in gb]
    if any(sum(m) == 0 for m in leads):
        return 0
    n = len(I.space.names)
    bound = [min(m[i] for m in leads if m[i] > 0 and sum(m) == m[i]) for i in range(n)]
    count = 0
    for exps in itertools.product(*(range(b) for b in bound)):
        if not any(all(a >= b for a, b in zip(exps, m)) for m in leads):
            count += 1
    return count


# --- textbook cases -------------------------------------------------------------------------


def test_coordinate_cross_needs_a_linear_change():
    # xy = 0 (Eisenbud, Commutative Algebra, §13.1, from memory): over k[x] the y-axis is a whole
    # fiber and vice versa, so no variable is a parameter; a linear form x + c*y is, of rank 2.
    I = ideal(32003, "x, y", ["x*y"])
    nn = I.projection()
    assert nn.dimension == 1
    assert nn.strategy == "linear"
    assert nn.homogeneous
    assert nn.rank == 2
    assert str(nn.parameters[0]) not in ("x", "y")
    assert nn.verify()
    assert not I.is_finite_over(["x"]) and not I.is_finite_over(["y"])
    assert I.is_finite_over([nn.parameters[0]])


def test_cusp_is_finite_over_x_with_rank_two():
    # y^2 = x^3 (Reid, Undergraduate Commutative Algebra, §4, from memory): y is integral over
    # k[x] by y^2 - x^3, and no relation of degree 1 exists.
    I = ideal(32003, "x, y", ["y^2 - x^3"])
    assert I.is_finite_over(["x"])
    eq = I.integral_equation("y", over=["x"])
    assert eq.degree == 2
    assert eq.coefficients == ["1", "0", "-t1^3"]
    assert eq.polynomial() in I
    nn = I.projection()
    assert nn.dimension == 1 and nn.verify()


def test_x_is_integral_over_x_squared():
    # Atiyah–Macdonald ch. 5: x is a root of u^2 - x^2 over k[x^2].
    I = ideal(7, "x", [])
    assert I.is_integral("x", over=["x^2"])
    eq = I.integral_equation("x", over=["x^2"])
    assert (eq.degree, eq.coefficients) == (2, ["1", "0", "-t1"])
    assert "u^2" in str(eq) and "t1 = x^2" in str(eq)


def test_x_is_not_integral_over_xy():
    # In k[x, y], x is not integral over k[xy]: over xy = 0 the fiber is infinite.
    I = ideal(7, "x, y", [])
    assert not I.is_integral("x", over=["x*y"])
    assert I.integral_equation("x", over=["x*y"]) is None
    assert not I.is_finite_over(["x*y"])


def test_affine_twisted_cubic():
    # (t, t^2, t^3): y = x^2, z = x^3 (Cox, Little and O'Shea, Ideals, Varieties, and
    # Algorithms, §1.2): d = 1, finite over k[x] of rank 1, y and z of degree 1 over k[x].
    I = ideal(32003, "x, y, z", ["y - x^2", "z - x^3"])
    nn = I.projection()
    assert nn.dimension == 1 and nn.verify()
    assert I.is_finite_over(["x"])
    assert I.integral_equation("y", over=["x"]).coefficients == ["1", "-t1^2"]
    assert I.integral_equation("z", over=["x"]).coefficients == ["1", "-t1^3"]


def test_twisted_cubic_cone_has_rank_three():
    # The cone over the twisted cubic, 2x2 minors of [[x, y, z], [y, z, w]], has dimension 2 and
    # degree 3 (Harris, Algebraic Geometry: A First Course, Example 1.10 and chapter 18, from
    # memory); a finite linear projection has degree equal to the degree of the variety.
    I = ideal(32003, "x, y, z, w", ["x*z - y^2", "y*w - z^2", "x*w - y*z"])
    nn = I.projection()
    assert nn.dimension == 2
    assert nn.rank == 3
    assert nn.homogeneous and nn.strategy in ("variables", "linear")
    assert all(p.is_homogeneous() and p.degree() == 1 for p in nn.parameters)
    assert nn.verify()
    # Generic fiber: exactly rank points with multiplicity; every fiber at most #generators.
    fiber = nn.fiber([3, 5])
    assert zero_dim_quotient_dimension(fiber) == 3 <= len(nn.module_generators)


def test_the_cached_grevlex_basis_gives_the_same_certificate():
    # The twisted cubic cone again (dimension 2, degree 3: Harris, as above). Once the ideal has
    # its grevlex basis, the normalization starts from it instead of computing it again; the
    # certificate must not change, and it must still verify.
    gens = ["x*z - y^2", "y*w - z^2", "x*w - y*z"]
    fresh = ideal(32003, "x, y, z, w", gens)
    assert fresh._cached_basis("grevlex") is None
    expected = fresh.projection().to_dict()
    warm = ideal(32003, "x, y, z, w", gens)
    assert warm.dimension() == 2
    assert warm._cached_basis("grevlex") is not None
    nn = warm.projection()
    assert nn.to_dict() == expected
    assert nn.rank == 3 and nn.verify()


def test_zero_dimensional_maximal_ideal():
    # (x^2 + 1, y - x) over GF(3) is maximal (-1 is not a square mod 3, Ireland–Rosen ch. 5):
    # d = 0, R/I = GF(9) of rank 2, each variable a root of u^2 + 1.
    I = ideal(3, "x, y", ["x^2 + 1", "y - x"])
    nn = I.projection()
    assert (nn.dimension, nn.rank, nn.parameters) == (0, 2, [])
    assert nn.equations == [["1", "0", "1"], ["1", "0", "1"]]
    assert nn.verify()


def test_zero_ideal_and_unit_ideal():
    I = ideal(5, "x, y", [])
    nn = I.projection()
    assert nn.dimension == 2 and [str(p) for p in nn.parameters] == ["x", "y"]
    assert nn.equations == [["1", "-t1"], ["1", "-t2"]]
    assert nn.verify()
    with pytest.raises(ValueError, match="no solutions over the algebraic closure"):
        ideal(5, "x, y", ["x*y - 1", "x"]).projection()


def test_symbols_avoid_variable_names():
    I = ideal(101, "t1, t2", ["t1*t2"])
    nn = I.projection()
    assert not set(nn.parameter_symbols) & {"t1", "t2"}
    assert nn.verify()


# --- rational lines: no linear parameter over GF(q) ------------------------------------------


@pytest.mark.parametrize("q", [2, 3, 5, 7])
def test_rational_lines_need_a_nonlinear_change(q):
    # Every linear form over GF(q) vanishes on one of the q + 1 rational lines, so its projection
    # has an infinite fiber: the result must be nonlinear, and it must verify.
    I = ideal(q, "x, y", [f"x^{q}*y - x*y^{q}"])
    nn = I.projection()
    assert nn.dimension == 1
    assert nn.strategy == "nonlinear"
    assert not nn.homogeneous
    assert nn.parameters[0].degree() > 1
    assert nn.verify()
    for v in ("x", "y"):
        assert nn.equation(v) in I
    with pytest.raises(ValueError, match="linear"):
        I.projection(strategy="linear")


# --- certificates: JSON, tampering -----------------------------------------------------------


def test_certificate_round_trips_through_json():
    I = ideal(32003, "x, y, z", ["x*y - z^2", "x*z"])
    nn = I.projection(seed=5)
    saved = json.loads(json.dumps(nn.to_dict()))
    assert saved["variables"] == ["x", "y", "z"] and saved["field"] == "GF(32003)"
    assert check_certificate(saved, I) == []
    again = fw.FiniteProjection.from_dict(saved, I)
    assert again.verify() and again.to_dict() == nn.to_dict()
    assert I.projection(seed=5).to_dict() == nn.to_dict()


def tampered(nn, change):
    d = json.loads(json.dumps(nn.to_dict()))
    change(d)
    return d


def test_tampered_certificates_fail_with_a_clear_message():
    I = ideal(32003, "x, y", ["x*y"])
    nn = I.projection()

    def bump_coefficient(d):
        d["equations"][0][-1] = f"({d['equations'][0][-1]}) + 1"

    problems = check_certificate(tampered(nn, bump_coefficient), I)
    assert any("equation for x does not lie in the ideal" in p for p in problems), problems

    def drop_equation(d):
        d["equations"].pop()

    problems = check_certificate(tampered(nn, drop_equation), I)
    assert any("1 equations for 2 variables" in p for p in problems), problems

    def wrong_dimension(d):
        d["dimension"] = 2

    problems = check_certificate(tampered(nn, wrong_dimension), I)
    assert any("d = 2" in p for p in problems), problems

    def not_monic(d):
        d["equations"][1][0] = "3"

    assert any("not monic" in p for p in check_certificate(tampered(nn, not_monic), I))

    def other_field(d):
        d["field"] = "GF(7)"

    assert "GF(7)" in check_certificate(tampered(nn, other_field), I)[0]
    assert "missing" in check_certificate({"dimension": 1}, I)[0]

    bad = fw.FiniteProjection.from_dict(tampered(nn, bump_coefficient), I)
    with pytest.raises(CertificateError, match="does not lie in the ideal"):
        bad.verify()


def test_bad_arguments():
    I = ideal(7, "x, y", ["x*y"])
    with pytest.raises(ValueError, match="unknown normalization strategy"):
        I.projection(strategy="bogus")
    with pytest.raises(ValueError, match="variables"):
        I.projection(strategy="variables")
    with pytest.raises(ValueError, match="seed"):
        I.projection(seed=-1)
    nn = I.projection()
    with pytest.raises(ValueError, match="coordinates"):
        nn.fiber([1, 2])
    with pytest.raises(ValueError):
        I.is_integral("x +* y", over=["x"])


# --- random ideals against sympy -------------------------------------------------------------


def sympy_dimension(basis, gens):
    """Krull dimension from sympy's basis: the largest set of variables containing the support of
    no leading monomial (brute force over subsets); -1 for the unit ideal."""
    leads = [sympy.Poly(g, *gens).monoms(order="grevlex")[0] for g in basis.exprs]
    if any(sum(m) == 0 for m in leads):
        return -1
    n = len(gens)
    for size in range(n, -1, -1):
        for subset in itertools.combinations(range(n), size):
            if not any(all(m[i] == 0 or i in subset for i in range(n)) for m in leads):
                return size
    return 0


PRIMES = [2, 3, 5, 7, 101, 32003]
CASES = [(seed, PRIMES[seed % len(PRIMES)], 2 + seed % 2) for seed in range(240)]


@pytest.mark.parametrize("seed,p,nvars", CASES)
def test_random_ideals_against_sympy(seed, p, nvars):
    rng = random.Random(seed)
    texts = [random_poly(rng, NAMES[:nvars], p) for _ in range(rng.randint(1, nvars))]
    names = NAMES[:nvars]
    I = ideal(p, names, texts)
    gens = sympy.symbols(names)
    basis = sympy.groebner(
        [sympy.sympify(t.replace("^", "**")) for t in texts], *gens, modulus=p, order="grevlex"
    )
    dim = sympy_dimension(basis, gens)
    if dim < 0:
        with pytest.raises(ValueError):
            I.projection(seed=seed)
        return
    nn = I.projection(seed=seed)
    assert nn.dimension == dim == I.dimension(), texts
    assert nn.verify()
    # Independent check: each equation, parameters substituted, reduces to 0 modulo sympy's basis.
    t = sympy.symbols(nn.parameter_symbols) if nn.parameter_symbols else ()
    params = {s: sympy.sympify(str(q).replace("^", "**")) for s, q in zip(t, nn.parameters)}
    for v, coefficients in zip(gens, nn.equations):
        m = len(coefficients) - 1
        expr = sum(
            sympy.sympify(c.replace("^", "**"), locals={str(s): s for s in t}) * v ** (m - k)
            for k, c in enumerate(coefficients)
        )
        expr = sympy.expand(expr.subs(params, simultaneous=True))
        assert coefficients[0] == "1"
        _, remainder = basis.reduce(expr)
        assert sympy.Poly(remainder, *gens, modulus=p).is_zero, (texts, str(v), coefficients)
    # A fiber is spanned by the module generators.
    point = [rng.randrange(p) for _ in range(nn.dimension)]
    assert zero_dim_quotient_dimension(nn.fiber(point)) <= len(nn.module_generators)
