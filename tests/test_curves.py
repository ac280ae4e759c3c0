"""Curves over finite fields (``System.curve()``, ``fibrewise curve``, batch task ``curve``)
against brute force with galois (every point of the plane over GF(q^r), q^r <= 4096) and
published facts, the source named beside each value (see tests/REFERENCE.md, "Curves")."""

from __future__ import annotations

import json
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import galois
import numpy as np
import pytest

import fibrewise as fw
from fibrewise.jobs import check_job, run_job

ROOT = Path(__file__).resolve().parent.parent


def curve(field: str, variables: str, equation: str) -> fw.Curve:
    return fw.Space(field, variables).system([equation]).curve()


def affine_count(GF, f, chunk: int = 256) -> int:
    """Points (x, y) in GF^2 with f(x, y) = 0, trying every pair (rows of x at a time); f writes
    a constant c as c * x**0 (galois adds only field elements)."""
    elements = GF.elements
    total = 0
    for start in range(0, GF.order, chunk):
        xs = elements[start : start + chunk]
        X = GF(np.repeat(xs.view(np.ndarray), GF.order))
        Y = GF(np.tile(elements.view(np.ndarray), len(xs)))
        total += int(np.count_nonzero(f(X, Y) == 0))
    return total


def projective_plane_count(GF, F) -> int:
    """Points of P^2 over GF on F(x, y, z) = 0: the chart z = 1, then (1 : y : 0), then (0 : 1 : 0)."""
    one, zero = GF(1), GF(0)
    affine = affine_count(GF, lambda X, Y: F(X, Y, one))
    Y = GF.elements
    at_infinity = int(np.count_nonzero(F(GF(np.ones(GF.order, dtype=int)), Y, zero) == 0))
    return affine + at_infinity + int(F(zero, one, zero) == 0)


def embedded_generator(base: str, GF):
    """A root in GF of the modulus of ``base`` (where its generator a goes)."""
    modulus = fw.field(base).galois_field().irreducible_poly
    return galois.Poly(modulus.coeffs.view(np.ndarray), field=GF).roots()[0]


def functional_equation_holds(zeta: fw.Zeta) -> bool:
    """q^g T^(2g) L(1/(qT)) = L(T), coefficient by coefficient, in exact arithmetic (not through
    ``Zeta.satisfies_functional_equation``)."""
    q, g, a = zeta.q, zeta.genus, zeta.l_polynomial
    # q^g T^(2g) Σ a_k (qT)^(-k) = Σ a_k q^(g-k) T^(2g-k).
    transformed = [Fraction(0)] * (2 * g + 1)
    for k, coefficient in enumerate(a):
        transformed[2 * g - k] += coefficient * Fraction(q) ** (g - k)
    return transformed == [Fraction(c) for c in a]


def test_klein_quartic_over_gf2():
    # x^3 y + y^3 z + z^3 x over GF(2): N_1, N_2, N_3 = 3, 5, 24 over GF(2), GF(4), GF(8)
    # (published counts, from memory), genus 3; every N_r against galois brute force.
    equation = "x^3*y + y^3*z + z^3*x"
    C = curve("GF(2)", "x, y, z", equation)
    assert C.is_smooth() and C.model == "plane" and C.genus == 3
    assert [C.count_points(r) for r in (1, 2, 3)] == [3, 5, 24]
    for r in (1, 2, 3, 4):
        GF = galois.GF(2**r)
        assert C.count_points(r) == projective_plane_count(GF, lambda x, y, z: x**3 * y + y**3 * z + z**3 * x)
    zeta = C.zeta()
    assert zeta.l_polynomial == (1, 0, 0, 5, 0, 0, 8)  # 1 + 5T^3 + 8T^6 (from memory)
    assert functional_equation_holds(zeta)
    assert [zeta.points(r) for r in (1, 2, 3, 4)] == [C.count_points(r) for r in (1, 2, 3, 4)]
    bound = C.check_bounds(3)
    # Serre's bound over GF(8): 9 + 3*floor(2*sqrt(8)) = 24 (Serre 1983): the curve is maximal.
    assert bound.serre == (-6, 24) and bound.maximal and bound.within


@pytest.mark.parametrize("q", [2, 3])
def test_hermitian_curves_are_maximal(q):
    # x^(q+1) + y^(q+1) + z^(q+1) over GF(q^2): q^3 + 1 points, genus q(q-1)/2,
    # L(T) = (1 + qT)^(2g) (handbook fact).
    C = curve(f"GF({q}^2)", "x, y, z", f"x^{q + 1} + y^{q + 1} + z^{q + 1}")
    g = q * (q - 1) // 2
    assert C.genus == g
    GF = galois.GF(q**2)
    assert (
        C.count_points(1)
        == q**3 + 1
        == projective_plane_count(GF, lambda x, y, z: x ** (q + 1) + y ** (q + 1) + z ** (q + 1))
    )
    zeta = C.zeta()
    binomial = [1]  # the coefficients of (1 + T)^(2g)
    for _ in range(2 * g):
        binomial = [a + b for a, b in zip(binomial + [0], [0] + binomial)]
    assert zeta.l_polynomial == tuple(c * q**k for k, c in enumerate(binomial))
    assert functional_equation_holds(zeta)
    assert C.check_bounds(1).maximal


@pytest.mark.parametrize(
    "field, equation, f",
    [
        ("GF(7)", "y^2 - x^3 - 3*x - 2", lambda x, y: y**2 - x**3 - 3 * x - 2 * x**0),
        ("GF(101)", "y^2 - x^3 - x - 1", lambda x, y: y**2 - x**3 - x - x**0),
        ("GF(2)", "y^2 + x*y + x^3 + 1", lambda x, y: y**2 + x * y + x**3 + x**0),
    ],
)
def test_elliptic_curves_follow_hasse(field, equation, f):
    # #E = q + 1 - a and L(T) = 1 - aT + qT^2 (Hasse 1936); the curve has one point at infinity.
    C = curve(field, "x, y", equation)
    q = fw.field(field).size
    assert C.genus == 1 and C.model == "hyperelliptic"
    n = affine_count(galois.GF(q), f) + 1
    assert C.count_points(1) == n
    a = q + 1 - n
    zeta = C.zeta()
    assert zeta.l_polynomial == (1, -a, q) and zeta.jacobian_order == n
    assert functional_equation_holds(zeta)
    if q * q <= 4096:
        assert zeta.points(2) == C.count_points(2) == affine_count(galois.GF(q * q), f) + 1


def test_genus_two_curve_over_gf16_and_its_jacobian():
    # The example of examples/curve_genus2_gf16.txt: y^2 + xy = x^5 + a x^2 + 1 over GF(16).
    # N_1, N_2, N_3 by brute force over GF(16), GF(256), GF(4096) (a mapped to a root of its
    # modulus there; one point at infinity, deg f odd), and #J = (N_1^2 + N_2)/2 - q for genus 2
    # (formula from Newton's identities, from memory).
    S = fw.System.read(str(ROOT / "examples" / "curve_genus2_gf16.txt"))
    C = S.curve()
    assert C.is_smooth() and C.genus == 2
    counts = []
    for r in (1, 2, 3):
        GF = galois.GF(2 ** (4 * r))
        a = embedded_generator("GF(2^4)", GF)
        counts.append(affine_count(GF, lambda x, y, a=a: y**2 + x * y + x**5 + a * x**2 + x**0) + 1)
    assert [C.count_points(1), C.count_points(2)] == counts[:2]
    zeta = C.zeta()
    assert zeta.points(3) == counts[2]
    assert zeta.jacobian_order == (counts[0] ** 2 + counts[1]) // 2 - 16
    assert functional_equation_holds(zeta)


def test_two_points_at_infinity_on_an_even_degree_model():
    # y^2 = x^6 + 1 over GF(7): the smooth model has two points at infinity (1 is a square),
    # its plane closure one singular point; against brute force on the affine part.
    C = curve("GF(7)", "x, y", "y^2 - x^6 - 1")
    assert C.is_smooth() and C.genus == 2
    assert C.count_points(1) == affine_count(galois.GF(7), lambda x, y: y**2 - x**6 - x**0) + 2
    assert functional_equation_holds(C.zeta())


def test_singular_curves_are_refused_naming_their_singular_points():
    # y^2 z = x^3 + x^2 z: the nodal cubic, singular at (0 : 0 : 1) only (textbook example).
    C = curve("GF(5)", "x, y, z", "y^2*z - x^3 - x^2*z")
    assert not C.is_smooth()
    assert C.singular_points() == [(0, 0, 1)]
    with pytest.raises(ValueError, match="singular"):
        _ = C.genus
    with pytest.raises(ValueError, match="singular"):
        C.zeta()


def test_large_fields_are_refused_at_once():
    C = curve("GF(2^61-1)", "x, y", "y^2 - x^3 - 7")
    assert C.genus == 1
    with pytest.raises(fw.ResourceLimit, match="fibre by fibre"):
        C.count_points(1)


def run_cli(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run(
        [sys.executable, "-m", "fibrewise.cli", *map(str, args)], capture_output=True, text=True, timeout=120
    )


def test_command_line_reports_the_curve_and_refuses_singular_ones(tmp_path):
    done = run_cli("curve", ROOT / "examples" / "curve_genus2_gf16.txt", "--up-to", "3", "--json")
    assert done.returncode == 0, done.stderr
    result = json.loads(done.stdout)
    C = fw.System.read(str(ROOT / "examples" / "curve_genus2_gf16.txt")).curve()
    assert result["genus"] == 2 and result["points"]["1"] == C.count_points(1)
    assert result["zeta"]["jacobian_order"] == C.zeta().jacobian_order
    assert [b["r"] for b in result["bounds"]] == [1, 2, 3]
    human = run_cli("curve", ROOT / "examples" / "curve_genus2_gf16.txt")
    assert human.returncode == 0 and "Jacobian order" in human.stdout
    singular = tmp_path / "cusp.txt"
    singular.write_text("field: GF(5)\nvariables: x, y, z\ny^2*z - x^3\n", encoding="utf-8")
    refused = run_cli("curve", singular)
    assert refused.returncode == 2
    assert "singular" in refused.stderr and "(0, 0, 1)" in refused.stderr


def test_batch_task_curve():
    job = check_job(
        {
            "id": 1,
            "field": "GF(7)",
            "variables": ["x", "y"],
            "polynomials": ["y^2 - x^3 - 3*x - 2"],
            "tasks": ["curve"],
        }
    )
    record = run_job(job)
    assert record["status"] == "ok", record
    n = affine_count(galois.GF(7), lambda x, y: y**2 - x**3 - 3 * x - 2 * x**0) + 1
    assert record["result"]["curve"]["points"]["1"] == n
    json.dumps(record)
