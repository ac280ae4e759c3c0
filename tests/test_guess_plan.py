"""The guess-and-determine plan (System.guess_plan, `fibrewise plan`, the batch task `plan`)
against references outside the project:

- the semi-regular degree of regularity against the power series of prod(1 - z^d_i)/(1 - z)^n
  (and (1 + z)^n / prod(1 + z^d_i) over GF(2)) expanded by sympy, and against Macaulay's bound
  1 + sum(d_i - 1) for n equations in n variables (a regular sequence; Lazard 1983, from memory);
- a system built so that guessing two variables leaves linear equations: the plan picks them.
"""

import json
import random

import pytest
import sympy

import fibrewise as fw
from fibrewise.cli import main
from fibrewise.guessing import semi_regular_degree


def sympy_degree(degrees, n, boolean=False):
    z = sympy.symbols("z")
    numerator = sympy.Integer(1)
    for d in degrees:
        numerator *= (1 + z**d) if boolean else (1 - z**d)
    series = ((1 + z) ** n / numerator) if boolean else (numerator / (1 - z) ** n)
    length = sum(d - 1 for d in degrees) + n + 3
    poly = sympy.Poly(sympy.series(series, z, 0, length).removeO(), z)
    coefficients = [poly.coeff_monomial(z**i) for i in range(length)]
    return next((i for i, c in enumerate(coefficients) if c <= 0), None)


@pytest.mark.parametrize(
    "n, degrees",
    [
        (4, [2] * 4),
        (5, [2] * 6),
        (6, [2] * 8),
        (8, [2] * 12),
        (10, [2] * 20),
        (5, [3] * 7),
        (6, [2, 2, 3, 3, 4, 4, 4]),
        (7, [2] * 14),
    ],
)
def test_semi_regular_degree_against_the_series_expanded_by_sympy(n, degrees):
    assert semi_regular_degree(degrees, n) == sympy_degree(degrees, n)


@pytest.mark.parametrize("n, m", [(6, 8), (8, 12), (10, 15), (12, 24)])
def test_boolean_semi_regular_degree_against_sympy(n, m):
    assert semi_regular_degree([2] * m, n, boolean=True) == sympy_degree([2] * m, n, boolean=True)


def test_macaulay_bound_for_square_systems():
    for degrees in ([2] * 5, [3, 3, 2], [4, 2, 2, 3]):
        assert semi_regular_degree(degrees, len(degrees)) == 1 + sum(d - 1 for d in degrees)
    assert semi_regular_degree([2, 2], 3) is None  # fewer equations than variables


def linearised_system(rng: random.Random) -> fw.System:
    """Eight equations in x1, x2, y1..y6 over GF(3), each sum_j a_j(x) y_j + b(x) with a_j and b
    random cubics in x1, x2: once x1 and x2 are guessed, the equations are linear in the y's
    (a construction of our own)."""
    V = fw.Space("GF(3)", "x1, x2, y1, y2, y3, y4, y5, y6")
    x1, x2, *ys = V.variables
    monomials = [x1**i * x2**j for i in range(4) for j in range(4) if i + j <= 3]

    def random_cubic():
        return sum((rng.randrange(1, 3) * m for m in monomials), V.polynomial(0))

    return V.system([sum((random_cubic() * y for y in ys), random_cubic()) for _ in range(8)])


def test_the_plan_guesses_the_variables_that_linearise_the_rest():
    S = linearised_system(random.Random(5))
    plan = S.guess_plan(max_guess=3, samples=5)
    assert [r.k for r in plan.rows] == [0, 1, 2, 3]
    best = plan.best
    assert best.k == 2 and sorted(best.variables) == ["x1", "x2"]
    assert best.solving_degree == 1  # linear equations: one matrix of degree 1
    assert best.guesses == 9 and best.total_seconds == pytest.approx(9 * best.seconds)
    assert plan.rows[0].solving_degree > 1
    assert plan.exhaustive_points == 3**8
    d = plan.to_dict()
    assert d["best"] == 2 and json.loads(json.dumps(d)) == d
    assert "best" in str(plan)


def test_parameters_of_the_projection_are_guessed_first():
    V = fw.Space("GF(7)", "x, y, z")
    S = V.system(["x^2 + y^2 + z^2 - 1"])  # a surface: two independent variables
    plan = S.guess_plan(max_guess=2, samples=2)
    assert sorted(plan.rows[2].variables) == sorted(str(v) for v in S.independent_variables())
    assert plan.rows[2].guesses == 49


def test_plan_arguments_are_checked():
    S = fw.Space("GF(7)", "x, y").system(["x*y - 1"])
    with pytest.raises(ValueError):
        S.guess_plan(max_guess=3)
    with pytest.raises(ValueError):
        S.guess_plan(samples=0)
    with pytest.raises(ValueError):
        fw.Space("Q", "x").system(["x - 1"]).guess_plan()


def test_plan_command_and_batch_task(tmp_path, capsys):
    source = tmp_path / "s.txt"
    source.write_text("field: GF(7)\nvariables: x, y, z\nx*y - z\ny*z - x\nz*x - y\n")
    assert main(["plan", str(source), "--max-guess", "2", "--samples", "2", "--json", "--quiet"]) == 0
    result = json.loads(capsys.readouterr().out)
    assert [r["k"] for r in result["rows"]] == [0, 1, 2] and result["best"] in (0, 1, 2)
    assert main(["plan", str(source), "--max-guess", "1", "--samples", "2", "--quiet"]) == 0
    out = capsys.readouterr().out
    assert "<- best" in out and "exhaustive search" in out
    assert main(["plan", str(source), "--max-guess", "-1", "--quiet"]) == 2

    from fibrewise.jobs import check_job, run_job

    record = run_job(
        check_job(
            {
                "id": 1,
                "field": "GF(7)",
                "variables": ["x", "y"],
                "polynomials": ["x*y - 1", "x + y"],
                "tasks": ["plan"],
            }
        )
    )
    assert record["status"] == "ok" and record["result"]["plan"]["rows"][0]["k"] == 0
