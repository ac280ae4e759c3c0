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


@pytest.mark.parametrize("field, p", [("GF(2^8)", 2), ("GF(3^5)", 3)])
def test_quartic_fibres_by_the_fixed_size_path_against_brute_force(field, p):
    # A plane quartic of our own whose fibres over x are quartics in y (the fixed-size Frobenius
    # path: semilinear squarings in characteristic 2, square-and-multiply in characteristic 3),
    # N_1 against galois brute force over all of P^2 (a is the field's generator, integer p).
    C = curve(field, "x, y, z", "x^3*y + y^3*z + z^3*x + a*y^4 + x^2*z^2")
    assert C.is_smooth() and C.genus == 3
    GF = fw.field(field).galois_field()
    a = GF(p)
    expected = projective_plane_count(
        GF, lambda x, y, z: x**3 * y + y**3 * z + z**3 * x + a * y**4 + x**2 * z**2
    )
    assert C.count_points(1) == expected


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


def test_singular_closed_points_over_extensions_against_brute_force():
    # (x^2 + z^2)^2 + y^2 z^2 over GF(3) is singular at (+-i : 0 : 1), conjugate over GF(3) (-1 is
    # not a square mod 3), and at (0 : 1 : 0). Every point of P^2(GF(3^r)), r = 1, 2, 4, where F
    # and its three partials vanish (galois brute force) is a point of exactly one listed closed
    # point whose degree divides r.
    C = curve("GF(3)", "x, y, z", "(x^2 + z^2)^2 + y^2*z^2")
    assert not C.is_smooth() and C.singular_points() == [(0, 1, 0)]
    closed = C.singular_closed_points()
    assert [p.degree for p in closed] == [1, 2]
    assert closed[0].rational_point() == (0, 1, 0) and str(closed[1].residue_field) == "GF(3^2)"

    def F(x, y, z):
        return (x**2 + z**2) ** 2 + y**2 * z**2

    partials = [
        lambda x, y, z: x * (x**2 + z**2),  # dF/dx = 4x(x^2 + z^2) = x(x^2 + z^2) mod 3
        lambda x, y, z: 2 * y * z**2,
        lambda x, y, z: z * (x**2 + z**2) + 2 * y**2 * z,
    ]
    for r in (1, 2, 4):
        GF = fw.field(f"GF(3^{r})").galois_field()  # the integer representation of fibrewise's GF(3^r)
        brute = set()
        for p in projective_plane_points(GF):
            x, y, z = GF(p[0]), GF(p[1]), GF(p[2])
            if F(x, y, z) == 0 and all(d(x, y, z) == 0 for d in partials):
                brute.add(p)
        listed = set()
        for point in closed:
            if r % point.degree == 0:
                system = fw.Space("GF(3)", list(C.coordinate_names)).system([str(g) for g in point.equations])
                listed |= {tuple(int(c) for c in q) for q in system.points(over=f"GF(3^{r})")}
        assert listed == brute, r


def projective_plane_points(GF) -> list[tuple[int, int, int]]:
    """P^2(GF) with the first nonzero coordinate 1, as integer triples."""
    q = GF.order
    return [(1, b, c) for b in range(q) for c in range(q)] + [(0, 1, c) for c in range(q)] + [(0, 0, 1)]


def projective_space_count(GF, equations) -> int:
    """Points of P^3(GF) where every F(X0, X1, X2, X3) in ``equations`` vanishes (normalized with
    the first nonzero coordinate 1, chart by chart, vectorized over the chart)."""
    q = GF.order
    total = 0
    for lead in range(4):
        free = 3 - lead
        grid = np.indices((q,) * free).reshape(free, -1) if free else np.zeros((0, 1), dtype=int)
        size = grid.shape[1]
        coords = [GF(np.zeros(size, dtype=int)) for _ in range(lead)] + [GF(np.ones(size, dtype=int))]
        coords += [GF(row) for row in grid]
        ok = np.ones(size, dtype=bool)
        for F in equations:
            ok &= F(*coords) == 0
        total += int(np.count_nonzero(ok))
    return total


@pytest.mark.parametrize(
    "field, equations, fs",
    [
        # The twisted cubic: genus 0, N_r = q^r + 1 (handbook fact).
        (
            "GF(3)",
            ["x*z - y^2", "y*w - z^2", "x*w - y*z"],
            [
                lambda x, y, z, w: x * z - y**2,
                lambda x, y, z, w: y * w - z**2,
                lambda x, y, z, w: x * w - y * z,
            ],
        ),
        # y^2 + xy = x^3 + 1 in P^3 by (1 : x : y : x^2) (see the Rust test of the same curve).
        (
            "GF(2)",
            ["x*w - y^2", "z^2 + y*z + y*w + x^2"],
            [lambda x, y, z, w: x * w - y**2, lambda x, y, z, w: z**2 + y * z + y * w + x**2],
        ),
    ],
)
def test_space_curves_by_projection_against_brute_force(field, equations, fs):
    C = fw.Space(field, "x, y, z, w").system(equations).curve()
    assert C.is_smooth()
    p = fw.field(field).size
    r_max = max(r for r in range(1, 13) if p**r <= 4096 and (p**r) ** 3 <= 2**18)
    for r in range(1, r_max + 1):
        assert C.count_points(r) == projective_space_count(galois.GF(p**r), fs), r
    if len(equations) == 3:
        assert C.model == "space curve" and C.genus == 0
        assert C.count_points(11) == 3**11 + 1  # GF(3^11), beyond 2^16 elements
    else:
        assert C.model == "complete intersection" and C.genus == 1
        assert C.zeta().points(r_max) == C.count_points(r_max)


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
