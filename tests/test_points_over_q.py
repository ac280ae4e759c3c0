"""Points over Q (System.points, System.closed_points, `fibrewise solve` on a file over Q)
against references outside the project:

- sympy's `solve` (all complex solutions, exactly) and `roots`, filtered to the rational ones;
- sympy's `factor_list` over Q for the minimal polynomials of the closed points;
- published counts: katsura-n has 2^n solutions (Bézout's bound attained; Katsura 1990, from
  memory), so the degrees of its closed points add up to 2^n.
"""

from fractions import Fraction

import pytest
import sympy

import fibrewise as fw
from fibrewise.cli import main
from systems import katsura


def sympy_rational_points(names, equations):
    """The rational solutions found by sympy's solve, as sorted tuples of Fractions."""
    symbols = sympy.symbols(names)
    found = sympy.solve([sympy.sympify(e.replace("^", "**")) for e in equations], symbols, dict=True)
    rational = [tuple(s[x] for x in symbols) for s in found if all(s[x].is_Rational for x in symbols)]
    return sorted(tuple(Fraction(int(c.p), int(c.q)) for c in point) for point in rational)


SYSTEMS = [
    # (4, 3) and (-3, -4).
    ("x, y", ["x^2 + y^2 - 25", "x - y - 1"]),
    # x in {1, 2, 3}, y^2 = x: rational only above x = 1.
    ("x, y", ["x^3 - 6*x^2 + 11*x - 6", "y^2 - x"]),
    # None rational (y = x, x^2 = 2).
    ("x, y", ["x^2 - 2", "y - x"]),
    # Fractions: (2x - 3)(5x + 7) = 0 and 3y = x.
    ("x, y", ["10*x^2 - x - 21", "3*y - x"]),
    # katsura-2 written out: rational solutions (1, 0, 0) and (1/5, 0, 2/5).
    ("x, y, z", ["x^2 + y^2 + z^2 - x", "2*x*y + 2*y*z - y", "x + 2*y + 2*z - 1"]),
]


@pytest.mark.parametrize("names, equations", SYSTEMS)
def test_rational_points_agree_with_sympy_solve(names, equations):
    system = fw.Space("Q", names).system(equations)
    got = sorted(system.points())
    assert got == sympy_rational_points(names, equations)
    for point in got:
        assert all(isinstance(c, Fraction) for c in point)
        assert all(g.evaluate(list(point)) == 0 for g in system.equations)


def test_the_limit_cuts_the_list_over_q():
    system = fw.Space("Q", "x, y").system(SYSTEMS[0][1])
    assert len(list(system.points(limit=1))) == 1
    assert list(system.points(limit=0)) == []


def test_univariate_rational_points_agree_with_sympy_roots():
    x = sympy.Symbol("x")
    f = sympy.expand((2 * x - 3) * (5 * x + 7) * (x**2 + 1) * (x**3 - 2) * (7 * x + 10**12))
    expected = sorted(Fraction(int(r.p), int(r.q)) for r in sympy.roots(f, filter="Q"))
    got = [p[0] for p in fw.Space("Q", "x").system([str(f).replace("**", "^")]).points()]
    assert sorted(got) == expected


@pytest.mark.parametrize("names, equations", SYSTEMS)
def test_closed_points_over_q_match_sympy_and_the_solution_count(names, equations):
    system = fw.Space("Q", names).system(equations)
    found = system.closed_points()
    # Every complex solution lies in exactly one orbit.
    assert sum(cp.degree for cp in found) == system.count_solutions()
    rational = sorted(cp.rational_point() for cp in found if cp.degree == 1)
    assert rational == sympy_rational_points(names, equations)
    t = sympy.Symbol("t")
    for cp in found:
        m = cp.minimal_polynomial.to_sympy()
        assert sympy.Poly(m, t).degree() == cp.degree
        _, factors = sympy.factor_list(m, t)
        assert len(factors) == 1 and factors[0][1] == 1, f"{m} is not irreducible over Q (sympy)"
        # The maximal ideal's equations vanish at the orbit's point with coordinates in Q[t]/(m).
        point = cp.points()[0]
        for g in cp.equations:
            if cp.degree == 1:
                assert g.evaluate(list(point)) == 0
            else:
                values = {sympy.Symbol(x): c.to_sympy() for x, c in zip(system.space.names, point)}
                assert sympy.rem(sympy.expand(g.to_sympy().subs(values)), m, t) == 0


def test_katsura_closed_point_degrees_add_up_to_the_published_count():
    names, equations = katsura(3)
    system = fw.Space("Q", names).system(equations)
    assert sum(cp.degree for cp in system.closed_points()) == 2**3  # Katsura 1990, from memory


def test_points_over_q_need_a_zero_dimensional_system():
    with pytest.raises(ValueError, match="dimension 1"):
        fw.Space("Q", "x, y").system(["x^2 - y"]).points()
    with pytest.raises(ValueError, match="finite field"):
        fw.Space("Q", "x").system(["x^2 - 4"]).points(over="GF(7)")
    with pytest.raises(ValueError, match="as_galois"):
        fw.Space("Q", "x").system(["x^2 - 4"]).points(as_galois=True)
    assert list(fw.Space("Q", "x").system(["x^2 - 4", "x - 1"]).points()) == []


def test_solve_lists_rational_points_of_a_file_over_q(tmp_path, capsys):
    path = tmp_path / "q.txt"
    path.write_text("field: Q\nvariables: x, y\n10*x^2 - x - 21\n3*y - x\n")
    assert main(["solve", str(path), "-q"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert lines[0].endswith("2 points over Q")
    assert sorted(lines[1:3]) == ["x = -7/5, y = -7/15", "x = 3/2, y = 1/2"]
    assert main(["solve", str(path), "--closed-points", "-q"]) == 0
    out = capsys.readouterr().out
    assert "2 closed points over Q (2 of degree 1)" in out


def test_solve_shows_the_minimal_polynomial_of_an_irrational_orbit(tmp_path, capsys):
    path = tmp_path / "q.txt"
    path.write_text("field: Q\nvariables: x, y\nx^2 - 2\ny - x - 1\n")
    assert main(["solve", str(path), "--closed-points", "--json"]) == 0
    import json

    (point,) = json.loads(capsys.readouterr().out)["closed_points"]
    assert point["degree"] == 2
    t = sympy.Symbol("t")
    m = sympy.sympify(point["minimal_polynomial"].replace("^", "**"))
    # t is a root of m, x = g_1(t) and x^2 = 2 in Q[t]/(m).
    x = sympy.sympify(point["coordinates"][0].replace("^", "**"))
    assert sympy.rem(sympy.expand(x**2 - 2), m, t) == 0
