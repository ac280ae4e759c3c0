"""Boolean systems over GF(2) (every variable satisfies v^2 = v) from Python, the system files, the
command line and batch jobs.

Outside checks: brute force over all of GF(2)^n in numpy (n <= 16: every solution and the
counts), the general Gröbner engine over GF(2) with the field equations x^2 + x written out, and
for the toy cipher an independent implementation of its description with the PRESENT S-box as its
designers publish it (Bogdanov et al., "PRESENT: An Ultra-Lightweight Block Cipher", CHES 2007;
from memory).
"""

import json
import subprocess
import sys
from pathlib import Path

import numpy
import pytest

import fibrewise as fw
from fibrewise.jobs import JobError, check_job, run_job
from fibrewise.systemfile import SystemFileError, parse_system_text

ROOT = Path(__file__).resolve().parent.parent
CIPHER = ROOT / "examples" / "toy_spn_cipher_gf2.txt"


def names(n):
    return [f"x{i}" for i in range(n)]


def random_system(n, m, degree, seed, density=0.5):
    """m random equations of degree <= `degree` in n variables, as lists of monomials (tuples
    of variable indices; () is the constant 1)."""
    rng = numpy.random.default_rng(seed)
    monomials = [()] + [(i,) for i in range(n)]
    monomials += [(i, j) for i in range(n) for j in range(i + 1, n)]
    if degree >= 3:
        monomials += [(i, j, k) for i in range(n) for j in range(i + 1, n) for k in range(j + 1, n)]
    return [[mono for mono in monomials if rng.random() < density] or [()] for _ in range(m)]


def text(equation, variables):
    return " + ".join("*".join(variables[i] for i in mono) if mono else "1" for mono in equation) or "0"


def brute_force(equations, n):
    """Every point of GF(2)^n where all equations vanish, in increasing order of the number
    whose bit i is x_i (numpy evaluation of all 2^n points)."""
    index = numpy.arange(2**n, dtype=numpy.int64)
    bits = ((index[:, None] >> numpy.arange(n)) & 1).astype(bool)
    ok = numpy.ones(2**n, dtype=bool)
    for equation in equations:
        value = numpy.zeros(2**n, dtype=bool)
        for mono in equation:
            value ^= numpy.logical_and.reduce(bits[:, list(mono)], axis=1) if mono else True
        ok &= ~value
    return [tuple(int(b) for b in bits[i]) for i in numpy.flatnonzero(ok)]


def boolean_system(equations, n, order="grevlex"):
    space = fw.Space("GF(2)", names(n), order=order, boolean=True)
    return space.system([text(e, space.names) for e in equations])


# (n, m, degree, seed): square, overdetermined, underdetermined (many solutions), cubic.
SHAPES = [(10, 10, 2, 1), (12, 20, 2, 2), (12, 6, 2, 3), (16, 14, 2, 4), (8, 4, 3, 5), (9, 1, 2, 6)]


@pytest.mark.parametrize("n, m, degree, seed", SHAPES)
def test_solutions_and_counts_equal_brute_force(n, m, degree, seed):
    equations = random_system(n, m, degree, seed)
    expected = brute_force(equations, n)
    S = boolean_system(equations, n)
    for method in ["auto", "exhaustive", "basis", "hybrid", "hybrid:3"]:
        assert list(S.points(method=method)) == expected, method
        assert S.count_points(method=method) == len(expected), method
    assert S.count_points() == S.degree() == S.quotient_dimension() == S.count_solutions() == len(expected)
    assert S.dimension() == (0 if expected else -1)
    # A limit returns that many solutions (which ones depends on the method and the threads).
    for method in ["exhaustive", "basis", "hybrid"]:
        some = list(S.points(limit=2, method=method))
        assert len(some) == min(2, len(expected)) and set(some) <= set(expected), method


def test_the_order_does_not_change_the_solutions():
    equations = random_system(9, 7, 2, 11)
    expected = brute_force(equations, 9)
    for order in ["lex", "grlex", "grevlex"]:
        S = boolean_system(equations, 9, order=order)
        assert list(S.points(method="basis")) == expected, order
        gb = S.basis()
        assert gb.order == order
        assert all(not gb.normal_form(g) for g in S.equations)


@pytest.mark.parametrize("order", ["lex", "grlex", "grevlex"])
def test_boolean_bases_equal_general_bases_with_the_field_equations(order):
    """The reduced basis of the general engine (Buchberger, the reference) on the equations
    plus x^2 + x for every variable, over GF(2) without the Boolean flag."""
    for n, m, seed in [(4, 2, 21), (5, 3, 22), (6, 4, 23), (7, 3, 24), (7, 8, 25)]:
        equations = random_system(n, m, 2, seed, density=0.4)
        S = boolean_system(equations, n, order=order)
        general = fw.Space("GF(2)", names(n), order=order)
        field_equations = [f"{v}^2 + {v}" for v in general.names]
        T = general.system([text(e, general.names) for e in equations] + field_equations)
        expected = [str(g) for g in T.basis(engine="buchberger")]
        assert [str(g) for g in S.basis(field_equations=True)] == expected
        assert S.with_field_equations().same_ideal(T)
        # Without them: the same basis minus the elements whose leading monomial is a square.
        squares = {f"{v}^2 + {v}" for v in general.names}
        assert [str(g) for g in S.basis()] == [g for g in expected if g not in squares]
        assert S.basis().stats.engine == "boolean-f4"


def test_products_reduce_on_the_fly():
    B = fw.Space("GF(2)", "x0..x2", boolean=True)
    x0, x1, x2 = B.variables
    # (x0 + 1)(x0 + x1) = x0^2 + x0 x1 + x0 + x1 = x0 x1 + x1 once x0^2 = x0 (by hand).
    assert (x0 + 1) * (x0 + x1) == B.parse("x0*x1 + x1")
    assert str(B.parse("x0^3*x1 + x1*x0 + x2 + 1")) == "x2 + 1"
    assert (x0 + x1 + 1) ** 5 == x0 + x1 + 1 and (x0 * x1) ** 0 == B.parse("1")
    assert (x0 * x1).degree() == 2 and B.boolean and repr(B).endswith("boolean=True)")
    # The same names without the flag are another space: there x0^2 stays.
    V = fw.Space("GF(2)", "x0..x2")
    assert V != B and str(V.parse("x0") ** 2) == "x0^2"
    assert str(V.polynomial(B.parse("x0*x1"))) == "x0*x1"  # moves by its square-free form
    assert B.polynomial(V.parse("x0^2*x1")) == x0 * x1


def test_membership_and_normal_forms_use_the_field_equations():
    B = fw.Space("GF(2)", "a, b, c", boolean=True)
    S = B.system(["a*b + c", "a + b + 1"])
    # Solutions by hand: a + b = 1 forces ab = 0, so c = 0: the points (1,0,0) and (0,1,0).
    assert list(S.points()) == [(1, 0, 0), (0, 1, 0)]
    assert "c" in S and "a*b" in S and "a" not in S
    assert S.normal_form("a*c + b") == S.normal_form("b")
    assert S.hilbert().degree == 2 and S.independent_variables() == []


def test_method_choice_is_reported_and_can_be_overridden():
    equations = random_system(20, 20, 2, 31)
    S = boolean_system(equations, 20)
    auto = S.solve_method()
    assert auto.method == "exhaustive" and "2^20" in auto.reason  # 2^20 candidates take milliseconds
    assert auto.estimates["exhaustive"] < auto.estimates["basis"]
    forced = S.solve_method("basis")
    assert forced.method == "basis" and "requested" in forced.reason and "exhaustive" in forced.reason
    assert S.solve_method("hybrid:4").guess == 4
    from fibrewise import boolean

    found = boolean.solve(S, method="hybrid:4")
    assert found.choice.method == "hybrid" and found.count == len(found.points)
    assert list(S.points(method="exhaustive")) == found.points


def test_more_than_64_variables_use_the_engine():
    # x_i = x_{i+1} for all i and x_0 + x_69 = 1 has no solution; x_i = x_{i+1} alone has two.
    B = fw.Space("GF(2)", "x0..x69", boolean=True)
    chain = [f"x{i} + x{i + 1}" for i in range(69)]
    assert list(B.system(chain).points()) == [(0,) * 70, (1,) * 70]
    assert B.system(chain + ["x0 + x69 + 1"]).count_points() == 0
    with pytest.raises(ValueError, match="at most 64 variables"):
        B.system(chain).count_points(method="exhaustive")


def test_bad_input_errors():
    with pytest.raises(ValueError, match="GF\\(2\\)"):
        fw.Space("GF(3)", "x, y", boolean=True)
    with pytest.raises(ValueError, match="GF\\(2\\)"):
        fw.Space("GF(4)", "x, y", boolean=True)
    with pytest.raises(TypeError, match="boolean"):
        fw.Space("GF(2)", "x, y", boolean="yes")
    with pytest.raises(ValueError, match="lex, grlex or grevlex"):
        fw.Space("GF(2)", "x, y", order=fw.WeightOrder([1, 2]), boolean=True)
    B = fw.Space("GF(2)", "x, y", boolean=True)
    S = B.system(["x*y + 1"])
    with pytest.raises(ValueError, match="unknown method 'guess'"):
        list(S.points(method="guess"))
    with pytest.raises(TypeError, match="method"):
        S.count_points(method=3)
    with pytest.raises(ValueError, match="not homogeneous"):
        S.count_points(projective=True)
    with pytest.raises(ValueError, match="extension of GF\\(2\\)"):
        S.count_points(over="GF(9)")
    assert S.count_points(over="GF(2^8)") == 1  # the solutions of x^2 = x lie in GF(2)
    with pytest.raises(ValueError, match="one engine"):
        S.basis(engine="f4")
    general = fw.Space("GF(7)", "x, y").system(["x*y + 1"])
    with pytest.raises(ValueError, match="Boolean"):
        general.basis(field_equations=True)
    with pytest.raises(ValueError, match="Boolean"):
        general.solve_method()
    with pytest.raises(ValueError, match="Boolean"):
        general.count_points(method="exhaustive")
    with pytest.raises(ValueError, match="limit"):
        list(S.points(limit=-1))


# --- system files and the command line -----------------------------------------------------------


def test_system_file_header():
    text = parse_system_text(["field: GF(2)", "boolean: yes", "variables: x0..x3", "x0*x1 + x2", "x3 + 1"])
    S = text.space.system(text.equations)
    assert S.space.boolean and S.count_points() == 4  # by hand: x3 = 1, x2 = x0*x1, x0 and x1 free
    for lines, line, column, message in [
        (["field: GF(3)", "boolean: yes", "variables: x", "x"], 2, 10, "needs the field GF(2)"),
        (["field: GF(2)", "boolean: maybe", "variables: x", "x"], 2, 10, "yes or no"),
    ]:
        with pytest.raises(SystemFileError) as e:
            parse_system_text(lines, "bad.txt")
        assert (e.value.line, e.value.column) == (line, column) and message in e.value.message
    assert not parse_system_text(["field: GF(2)", "boolean: no", "variables: x", "x^2"]).space.boolean


def cli(*args):
    run = subprocess.run(
        [sys.executable, "-m", "fibrewise.cli", *map(str, args)], capture_output=True, text=True
    )
    return run.returncode, run.stdout, run.stderr


def toy_encrypt(key, plaintext):
    """The toy cipher as its file describes it, written from that description."""
    sbox = [0xC, 5, 6, 0xB, 9, 0, 0xA, 0xD, 3, 0xE, 0xF, 8, 4, 7, 1, 2]  # PRESENT's (CHES 2007)
    perm = [0, 2, 4, 6, 1, 3, 5, 7]

    def round_key(r):
        return sum(((key >> ((4 * r + i) % 16)) & 1) << i for i in range(8))

    state = plaintext
    for r in range(3):
        x = state ^ round_key(r)
        u = sbox[x & 15] | sbox[x >> 4] << 4
        state = sum(((u >> i) & 1) << perm[i] for i in range(8))
    return state ^ round_key(3)


def test_cli_solve_recovers_the_toy_cipher_key():
    status, out, err = cli("solve", CIPHER, "--json", "-q")
    assert status == 0, err
    result = json.loads(out)
    assert result["boolean"] and result["count"] == 1 and result["method"]["method"] != "exhaustive"
    bits = result["points"][0]
    key = sum(int(bits[i]) << i for i in range(16))
    pairs = [(0x3A, 0x0E), (0xC4, 0x0B), (0x71, 0xD4)]  # the pairs listed in the file
    assert all(toy_encrypt(key, p) == c for p, c in pairs)
    assert key == 0xB5E3
    status, out, _ = cli("solve", CIPHER, "-q")
    assert status == 0 and "1 solution in GF(2)^88" in out and "1100011110101101" in out


def test_cli_solve_analyze_and_basis_on_a_small_file(tmp_path):
    equations = random_system(10, 6, 2, 41)
    expected = brute_force(equations, 10)
    path = tmp_path / "small.txt"
    path.write_text(
        "field: GF(2)\nboolean: yes\nvariables: x0..x9\n"
        + "\n".join(text(e, names(10)) for e in equations)
        + "\n"
    )
    for method in ["exhaustive", "basis", "hybrid"]:
        status, out, err = cli("solve", path, "--method", method, "--json", "-q")
        assert status == 0, err
        result = json.loads(out)
        assert result["method"]["method"] == method and result["count"] == len(expected)
        assert [tuple(int(v) for v in p) for p in result["points"]] == expected
    status, out, _ = cli("solve", path, "--limit", "1", "--json", "-q")
    assert json.loads(out)["points"] == [[str(v) for v in expected[0]]]
    status, out, err = cli("analyze", path, "--json", "-q")
    assert status == 0, err
    result = json.loads(out)
    assert result["dimension"] == 0 and result["degree"] == len(expected)
    assert result["points"]["affine"] == len(expected) and result["solve_method"]["method"] == "exhaustive"
    status, out, _ = cli("basis", path, "--json", "-q")
    assert not any("^2" in g for g in json.loads(out)["basis"])  # no field equation unless asked
    status, out, _ = cli("basis", path, "--field-equations", "--json", "-q")
    assert any(g.endswith("^2 + " + g.split("^")[0]) for g in json.loads(out)["basis"])
    status, _, err = cli("solve", path, "--method", "guess", "-q")
    assert status == 2 and "unknown method 'guess'" in err


# --- batch ---------------------------------------------------------------------------------------


def test_batch_jobs_on_boolean_systems():
    equations = random_system(8, 5, 2, 51)
    expected = brute_force(equations, 8)
    job = check_job(
        {
            "id": "b",
            "field": "GF(2)",
            "variables": "x0..x7",
            "boolean": True,
            "polynomials": [text(e, names(8)) for e in equations],
            "tasks": ["dimension", "degree", "points", "solutions", "basis"],
        }
    )
    record = run_job(job)
    assert record["status"] == "ok", record
    result = record["result"]
    assert result["points"] == result["degree"] == len(expected) and result["dimension"] == (
        0 if expected else -1
    )
    assert sorted(tuple(int(v) for v in p) for p in result["solutions"]["points"]) == sorted(expected)
    assert result["solutions"]["truncated"] is False
    assert not any("^2" in g for g in result["basis"])
    with pytest.raises(JobError, match='"boolean"'):
        check_job({"id": 1, "field": "GF(2)", "variables": "x", "polynomials": ["x"], "boolean": "yes"})
    record = run_job(
        check_job({"id": 2, "field": "GF(5)", "variables": "x", "polynomials": ["x"], "boolean": True})
    )
    assert record["status"] == "error" and "GF(2)" in record["error"]
