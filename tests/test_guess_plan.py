"""The guess-and-determine plan (System.guess_plan, `fibrewise plan`, the batch task `plan`)
against references outside the project:

- the semi-regular degree of regularity against the power series of prod(1 - z^d_i)/(1 - z)^n
  (and (1 + z)^n / prod(1 + z^d_i) over GF(2)) expanded by sympy, and against Macaulay's bound
  1 + sum(d_i - 1) for n equations in n variables (a regular sequence; Lazard 1983, from memory);
- a system built so that guessing two variables leaves linear equations: the plan picks them;
- a dense system whose whole basis is far beyond the budget of one sample (Bézout's bound
  20^3 solutions): the plan stops that sample, marks its row and picks a k it could measure.
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
    with pytest.raises(SystemExit, match="2"):  # argparse refuses it
        main(["plan", str(source), "--budget", "0", "--quiet"])
    assert main(["plan", str(source), "--budget", "nan", "--quiet"]) == 2
    hard = tmp_path / "dense.txt"
    S = dense_system(20)
    hard.write_text("field: GF(32003)\nvariables: x, y, z\n" + "\n".join(map(str, S.equations)) + "\n")
    assert (
        main(
            ["plan", str(hard), "--max-guess", "1", "--samples", "1", "--budget", "0.25", "--json", "--quiet"]
        )
        == 0
    )
    over = json.loads(capsys.readouterr().out)
    assert over["budget"] == 0.25 and over["rows"][0]["over_budget"] and over["best"] == 1

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


def dense_system(degree: int) -> fw.System:
    """Three dense random polynomials of the given degree in x, y, z over GF(32003) (coefficients
    from a seeded generator): up to degree^3 solutions (Bézout's bound); for degree 20 a basis
    of seconds, far beyond a budget of a quarter of a second, while a guess of x leaves three
    equations in two unknowns (no solution for almost every guess: milliseconds) and a guess of
    x and y a gcd of univariate polynomials."""
    rng = random.Random(17)
    V = fw.Space("GF(32003)", "x, y, z")
    terms = [
        (i, j, k) for i in range(degree + 1) for j in range(degree + 1 - i) for k in range(degree + 1 - i - j)
    ]

    def dense():
        return " + ".join(f"{rng.randrange(1, 32003)}*x^{i}*y^{j}*z^{k}" for i, j, k in terms)

    return V.system([dense() for _ in range(3)])


def test_a_sample_over_the_budget_is_stopped_and_its_row_marked():
    S = dense_system(20)
    plan = S.guess_plan(max_guess=2, samples=3, budget=0.25)
    whole = plan.rows[0]
    # k = 0 stopped at its first sample: a lower bound, no degree or matrix measured
    assert whole.over_budget and whole.samples == 1 and whole.solving_degree is None
    assert whole.total_seconds == whole.seconds and whole.largest_matrix == [0, 0]
    best = plan.best
    assert best.k > 0 and not best.over_budget and best.solving_degree is not None
    d = plan.to_dict()
    assert d["budget"] == 0.25 and d["rows"][0]["over_budget"] and json.loads(json.dumps(d)) == d
    text = str(plan)
    assert "over budget" in text and "> " in text


def test_budgets_are_checked_and_none_means_no_limit():
    S = fw.Space("GF(7)", "x, y").system(["x*y - 1", "x + y"])
    for budget in (0, -1, float("nan"), "1", True):
        with pytest.raises(ValueError, match="budget"):
            S.guess_plan(max_guess=0, samples=1, budget=budget)
    for budget in (None, float("inf")):
        plan = S.guess_plan(max_guess=1, samples=1, budget=budget)
        assert plan.budget is None and not any(r.over_budget for r in plan.rows)
    import inspect

    from fibrewise.guessing import DEFAULT_BUDGET

    assert inspect.signature(fw.System.guess_plan).parameters["budget"].default == DEFAULT_BUDGET


def test_a_basis_stops_at_its_time_limit():
    """``basis(max_seconds=...)``: the engine stops at the time limit with ResourceLimit, on the
    general engines and on the Boolean one; bad limits are refused."""
    with pytest.raises(fw.ResourceLimit, match="time limit of 0.001 s exceeded"):
        dense_system(20).basis(max_seconds=0.001)
    B = fw.Space("GF(2)", "x0..x39", boolean=True)
    rng = random.Random(3)
    names = B.names
    quadratics = [
        " + ".join(f"{a}*{b}" for i, a in enumerate(names) for b in names[i + 1 :] if rng.random() < 0.5)
        + " + 1"
        for _ in range(40)
    ]
    with pytest.raises(fw.ResourceLimit, match="time limit"):
        B.system(quadratics).basis(max_seconds=0.001)
    S = fw.Space("GF(7)", "x, y").system(["x*y - 1", "x + y"])
    for bad in (0, -2.0, float("inf"), float("nan")):
        with pytest.raises(ValueError, match="max_seconds"):
            S.basis(max_seconds=bad)
    assert [str(g) for g in S.basis(max_seconds=60)] == [str(g) for g in S.basis()]
