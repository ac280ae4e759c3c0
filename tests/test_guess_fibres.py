"""Fibre-by-fibre enumeration (System.points in positive dimension, FiniteProjection.fiber_points,
fibrewise.fibres) against references outside the project:

- brute force: every point of GF(q)^n substituted into every equation with galois's arithmetic
  (``test_solutions.brute_force``), on seeded random curves and surfaces over GF(2), GF(3), GF(4),
  GF(5) and GF(7);
- the exact point counts ``count_points()`` (Frobenius on the quotient, another computation);
- non-generic fibres, where a leading coefficient of the parametric basis vanishes, by hand.
"""

import itertools
import random

import pytest
from test_solutions import brute_force, random_system

import fibrewise as fw
from fibrewise.fibres import ParametricFibres

FIELDS = ["GF(2)", "GF(3)", "GF(4)", "GF(5)", "GF(7)"]


def curve_or_surface(k: fw.Field, rng: random.Random, surface: bool) -> fw.System:
    """A random hypersurface of the plane (a curve) or of 3-space (a surface), with a pure power
    of the last variable so that it is not a union of lines along it."""
    names = "x, y, z" if surface else "x, y"
    S = random_system(k, names, 1, 3, 4, rng)
    last = S.space.variables[-1]
    return S.space.system([S.equations[0] + last**3])


@pytest.mark.parametrize("spec", FIELDS)
def test_points_of_random_curves_and_surfaces_equal_brute_force(spec, rng):
    k = fw.field(spec)
    for surface in (False, True):
        for _ in range(3):
            S = curve_or_surface(k, rng, surface)
            got = sorted(S.points())
            assert got == brute_force(S), (spec, S.equations)
            assert len(got) == S.count_points()


@pytest.mark.parametrize("spec", FIELDS)
def test_space_curves_by_fibres_equal_brute_force(spec, rng):
    k = fw.field(spec)
    S = random_system(k, "x, y, z", 2, 2, 3, rng)
    x, y, z = S.space.variables
    S = S.space.system([S.equations[0] + y**2, S.equations[1] + z**2])
    got = sorted(S.points())
    assert got == brute_force(S)
    assert len(got) == S.count_points()


def test_fiber_points_over_every_point_give_every_point_once():
    V = fw.Space("GF(7)", "x, y, z")
    # The sphere: q^2 + η(-1) q = 49 - 7 = 42 points, η the quadratic character and -1 no square
    # mod 7 (Lidl and Niederreiter 1983, Theorem 6.27, from memory); brute force below too.
    S = V.system(["x^2 + y^2 + z^2 - 1"])
    P = S.projection()
    found = [p for v in itertools.product(range(7), repeat=P.dimension) for p in P.fiber_points(v)]
    assert sorted(found) == brute_force(S)
    assert len(found) == S.count_points() == 42
    with pytest.raises(ValueError, match="coordinates"):
        P.fiber_points([1])


def test_a_fibre_where_a_leading_coefficient_vanishes():
    # x*y^2 + y + x over x: at x = 0 the leading coefficient of y^2 vanishes and the fibre is
    # y = 0; the other fibres against the quadratic evaluated at every y.
    V = fw.Space("GF(5)", "x, y")
    S = V.system(["x*y^2 + y + x"])
    fibres = ParametricFibres(S, [V.parse("x")])
    assert fibres.fibre([0]) == [(0, 0)]
    assert fibres.non_generic == 1
    for v in range(1, 5):
        assert sorted(fibres.fibre([v])) == [(v, y) for y in range(5) if (v * y * y + y + v) % 5 == 0]
    assert fibres.non_generic == 1  # only x = 0 needed a basis of its own
    assert sorted(fibres.points()) == brute_force(S)


def test_points_are_lazy_and_limited():
    V = fw.Space("GF(101)", "x, y")
    S = V.system(["y^2 - x^3 - 7"])
    first = list(S.points(limit=3))
    assert len(first) == 3
    for x, y in first:
        assert (y * y - x**3 - 7) % 101 == 0
    assert len(list(S.points())) == S.count_points()
