"""Dimension, Hilbert series, degree, zero-dimensional invariants and point counts, checked
against published values (source beside each), Bézout's theorem, semi-regular sequences,
brute-force enumeration and sympy's Gröbner bases (reference library from PyPI)."""

import itertools
import math
import random
from fractions import Fraction

import numpy
import pytest
import sympy

import fibrewise as fw

from systems import cyclic, katsura, random_form


def series_coefficients(hs, count):
    """Values of the Hilbert function from the series numerator / (1 - t)^d."""
    c = [hs.numerator[i] if i < len(hs.numerator) else 0 for i in range(count)]
    for _ in range(hs.denominator_exponent):
        c = list(itertools.accumulate(c))
    return c


# --- published solution counts -----------------------------------------------------------------


@pytest.mark.parametrize("n,solutions", [(5, 70), (6, 156)])
def test_cyclic_solution_counts(n, solutions):
    # Cyclic-5: 70, cyclic-6: 156 solutions (Björck and Fröberg 1991, from memory), all simple.
    names, eqs = cyclic(n)
    I = fw.Space("GF(32003)", names).system(eqs)
    assert I.dimension() == 0
    assert I.quotient_dimension() == solutions
    assert I.degree() == solutions
    assert I.count_solutions() == solutions


@pytest.mark.parametrize("n", [3, 4, 5, 6])
def test_katsura_has_two_to_the_n_solutions(n):
    # Katsura-n: 2^n solutions, the Bézout bound (Katsura 1990, from memory).
    names, eqs = katsura(n)
    I = fw.Space("GF(32003)", names).system(eqs)
    assert I.quotient_dimension() == 2**n
    assert len(I.standard_monomials()) == 2**n


def test_cyclic4_is_positive_dimensional():
    # When a square m^2 > 1 divides n the cyclic-n variety is infinite (Backelin 1989, from
    # memory); n = 4 = 2^2 is the smallest case: a curve, so quotient_dimension refuses it.
    names, eqs = cyclic(4)
    I = fw.Space("GF(32003)", names).system(eqs)
    assert I.dimension() == 1
    with pytest.raises(ValueError, match="zero-dimensional"):
        I.quotient_dimension()


# --- Bézout, semi-regular sequences, classical varieties ----------------------------------------


@pytest.mark.parametrize(
    "n,degrees", [(3, [2, 2, 2]), (3, [2, 3, 2]), (4, [2, 3]), (4, [3, 3, 2]), (5, [2, 2, 2])]
)
def test_bezout_degree_of_complete_intersections(rng, n, degrees):
    # Generic forms of degrees d_1..d_c: a complete intersection of degree d_1···d_c and
    # dimension n - c (Bézout; Hartshorne I.7).
    names = [f"x{i}" for i in range(n)]
    I = fw.Space("GF(32003)", names).system([random_form(rng, names, d, 32003) for d in degrees])
    assert I.degree() == math.prod(degrees)
    assert I.dimension() == n - len(degrees)


def semi_regular(n, m, count):
    """[(1 - t^2)^m / (1 - t)^n]_+ : truncated before the first non-positive coefficient."""
    t = sympy.symbols("t")
    series = sympy.series((1 - t**2) ** m / (1 - t) ** n, t, 0, count).removeO()
    c = [int(series.coeff(t, i)) for i in range(count)]
    if m > n:
        k = next(i for i, v in enumerate(c) if v <= 0)
        c = c[:k] + [0] * (count - k)
    return c


@pytest.mark.parametrize("n,m", [(4, 4), (4, 5), (5, 6), (5, 7), (6, 7), (6, 3)])
def test_semi_regular_quadratic_systems(rng, n, m):
    # m random quadrics over a large prime are semi-regular: Hilbert series
    # [(1 - t^2)^m / (1 - t)^n]_+ (Bardet, Faugère, Salvy 2004); n = 5, m = 6 gives
    # 1 + 5t + 9t^2 + 5t^3.
    names = [f"x{i}" for i in range(n)]
    I = fw.Space("GF(65521)", names).system([random_form(rng, names, 2, 65521) for _ in range(m)])
    hs = I.hilbert()
    assert series_coefficients(hs, 10) == semi_regular(n, m, 10)
    if (n, m) == (5, 6):
        assert hs.numerator == [1, 5, 9, 5] and hs.denominator_exponent == 0


def test_twisted_cubic():
    # 2x2 minors of [[x, y, z], [y, z, w]]: projective curve of degree 3 (dimension 1 in P^3),
    # Hilbert polynomial 3s + 1; the affine cone has Krull dimension 2 (Cox–Little–O'Shea;
    # Hartshorne, from memory).
    R = fw.Space("GF(101)", "x, y, z, w")
    I = R.system(["x*z - y^2", "y*w - z^2", "x*w - y*z"])
    hs = I.hilbert()
    assert I.dimension() == 2 and hs.dimension == 2 and hs.graded
    assert I.degree() == 3
    assert hs.polynomial() == [Fraction(1), Fraction(3)]
    assert hs.regularity_index() == 0
    assert len(I.independent_variables()) == 2


def test_segre_threefold():
    # Segre embedding of P^1 x P^2 in P^5 (2x2 minors of a generic 2x3 matrix): dimension 3,
    # degree 3 = C(3, 1) (Harris, Algebraic Geometry: A First Course, chapter 2 and Example 18.15, from memory).
    R = fw.Space("GF(32003)", "a, b, c, d, e, f")
    I = R.system(["a*e - b*d", "a*f - c*d", "b*f - c*e"])
    assert (I.dimension(), I.degree()) == (4, 3)


def test_affine_hilbert_function_and_lex_input():
    # The parabola y = x^2: affine Hilbert function 2s + 1, degree 2 (Cox–Little–O'Shea §9.3).
    R = fw.Space("GF(7)", "x, y", order="lex")
    hs = R.system(["y - x^2"]).hilbert()
    assert not hs.graded and hs.dimension == 1 and hs.degree == 2
    assert hs.polynomial() == [1, 2]
    assert series_coefficients(hs, 4) == [1, 3, 5, 7]


def test_unit_and_zero_ideals():
    R = fw.Space("GF(7)", "x, y, z")
    unit = R.system(["x*y - 1", "x"])
    assert unit.dimension() == -1 and unit.degree() == 0 and unit.quotient_dimension() == 0
    assert unit.independent_variables() == []
    zero = R.system(["0"])
    assert zero.dimension() == 3 and zero.independent_variables() == list(R.variables)
    assert str(zero.hilbert()) == "(1) / (1 - t)^3"


# --- zero-dimensional quotients ------------------------------------------------------------------


def test_multiplication_matrices_obey_stickelberger():
    # (x(x-1)(x-2), y - x^2) is the three points (0,0), (1,1), (2,4); Stickelberger's theorem
    # (Cox–Little–O'Shea, Using Algebraic Geometry §2.4): eigenvalues of M_x, M_y are the
    # coordinates, so traces are 3 and 5 and det M_x = 0. Checked with galois' GF(101) arrays.
    import galois

    GF = galois.GF(101)
    R = fw.Space("GF(101)", "x, y")
    I = R.system(["x*(x - 1)*(x - 2)", "y - x^2"])
    mx, my = I.multiplication_matrix("x"), I.multiplication_matrix("y")
    assert isinstance(mx, numpy.ndarray) and mx.shape == (3, 3)
    assert int(numpy.trace(mx)) % 101 == 3 and int(numpy.trace(my)) % 101 == 5
    assert numpy.linalg.matrix_rank(GF(mx)) == 2
    assert (GF(mx) @ GF(my) == GF(my) @ GF(mx)).all()
    # Column j holds the image of the j-th standard monomial: x * 1 = x.
    basis = [str(m) for m in I.standard_monomials()]
    assert mx[:, basis.index("1")].tolist() == [1 if b == "x" else 0 for b in basis]


def test_distinct_solutions_in_characteristic_three():
    # Over GF(3): (x+1)^3 (x^2+1)^2 = 0 = y^3 has dim R/I = 7·3 = 21 but 3 distinct solutions
    # over the closure (x = -1, ±i; y = 0); (x+1)^3 = x^3 + 1 has zero derivative mod 3.
    I = fw.Space("GF(3)", "x, y").system(["(x + 1)^3*(x^2 + 1)^2", "y^3"])
    assert I.quotient_dimension() == 21
    assert I.count_solutions() == 3


def test_maximal_ideals_and_residue_field_degrees():
    R = fw.Space("GF(3)", "x, y")
    # x^2 + 1 is irreducible mod 3 (3 ≡ 3 mod 4): residue field GF(9).
    field9 = R.system(["x^2 + 1", "y - x"])
    assert field9.is_closed_point() and field9.closed_point_degree() == 2
    two_orbits = R.system(["x^2 + 1", "y^2 + 1"])
    assert not two_orbits.is_closed_point()
    with pytest.raises(ValueError, match="not maximal"):
        two_orbits.closed_point_degree()
    assert not R.system(["x*y - 1"]).is_closed_point()
    # x^5 - x - 1 is irreducible over GF(5) (an Artin–Schreier polynomial x^p - x - a, a ≠ 0;
    # Lidl–Niederreiter, Finite Fields, Thm. 3.78).
    S = fw.Space("GF(5)", "x, y, z")
    I = S.system(["x^5 - x - 1", "y - x^2 - 1", "z - x*y"])
    assert I.is_closed_point() and I.closed_point_degree() == 5


# --- point counts --------------------------------------------------------------------------------


def brute_force_count(p, names, texts, projective=False):
    """Common zeros by evaluating at every point (projective: cone points minus 0, over p - 1)."""
    R = fw.Space(p, names)
    polys = [R.parse(t) for t in texts]
    zeros = sum(
        all(f.evaluate(list(pt)) == 0 for f in polys) for pt in itertools.product(range(p), repeat=len(names))
    )
    return (zeros - 1) // (p - 1) if projective else zeros


def test_textbook_elliptic_curve():
    # y^2 = x^3 + x + 1 over GF(5): 8 affine points, 9 projective (common textbook example).
    assert fw.Space("GF(5)", "x, y").system(["y^2 - x^3 - x - 1"]).count_points() == 8
    E = fw.Space("GF(5)", "x, y, z").system(["y^2*z - x^3 - x*z^2 - z^3"])
    assert E.count_points(projective=True) == 9


def random_poly(rng, names, p):
    terms = []
    for _ in range(rng.randint(1, 4)):
        exps = [rng.randint(0, 2) for _ in names]
        terms.append(f"{rng.randrange(1, p)}*" + "*".join(f"{n}^{e}" for n, e in zip(names, exps)))
    return " + ".join(terms)


@pytest.mark.parametrize("seed", range(12))
def test_point_counts_against_enumeration(seed):
    rng = random.Random(seed)
    p = [2, 3, 5, 7][seed % 4]
    names = ["x", "y", "z"][: 2 + seed % 2]
    texts = [random_poly(rng, names, p) for _ in range(rng.randint(1, 2))]
    I = fw.Space(p, names).system(texts)
    assert I.count_points() == brute_force_count(p, names, texts), f"{texts} over GF({p})"


@pytest.mark.parametrize(
    "p,texts",
    [
        (7, ["x^3*y + y^3*z + z^3*x"]),
        (5, ["x^2 + y^2 + z^2"]),
        (3, ["x*y - z*w", "x^2 - y*w"]),
        (11, ["x^4 + y^4 - z^4"]),
    ],
)
def test_projective_counts_against_enumeration(p, texts):
    names = ["x", "y", "z", "w"][: 4 if len(texts) == 2 else 3]
    I = fw.Space(p, names).system(texts)
    assert I.count_points(projective=True) == brute_force_count(p, names, texts, projective=True)


@pytest.mark.parametrize("q,a,b", [(53, 3, 8), (101, 2, 3), (103, 1, 1)])
def test_hasse_weil_bound(q, a, b):
    # y^2 = x^3 + a x + b with 4a^3 + 27b^2 ≠ 0 mod q: a genus-1 curve, so its N projective
    # points satisfy |N - (q + 1)| <= 2 sqrt(q) (Hasse 1936; REFERENCE-VALUES.md).
    assert (4 * a**3 + 27 * b**2) % q != 0
    E = fw.Space(q, "x, y, z").system([f"y^2*z - x^3 - {a}*x*z^2 - {b}*z^3"])
    n = E.count_points(projective=True)
    assert abs(n - (q + 1)) <= 2 * math.sqrt(q)


def test_large_prime_field():
    # p = 2^61 - 1 (Mersenne prime, ≡ 1 mod 3 and ≡ 3 mod 4): x^2 = 4 has 2 roots, y^3 = 8 has 3.
    R = fw.Space(2**61 - 1, "x, y")
    assert R.system(["x^2 - 4", "y^3 - 8"]).count_points() == 6
    assert R.system(["x^2 - 4", "y^2 + 1"]).count_points() == 0


def test_conic_without_rational_points_over_gf2_splits_over_gf4():
    # x^2 + x + 1 is the only irreducible quadratic over GF(2): (x^2 + x + 1) is maximal with
    # residue field GF(4) and has no GF(2)-point (any finite fields text).
    I = fw.Space("GF(2)", "x, y").system(["x^2 + x + 1", "y - x"])
    assert I.is_closed_point() and I.closed_point_degree() == 2
    assert I.count_points() == 0 and I.count_solutions() == 2


def prime_power_field(spec):
    try:
        return fw.field(spec)
    except ValueError:
        pytest.skip(f"{spec} needs GF(p^k) support")


def test_counts_over_gf4():
    # Hermitian curve y^q + y = x^(q+1), q = 2, over GF(4): 8 affine points, 9 projective
    # (Stichtenoth, Algebraic Function Fields and Codes, from memory; enumerated).
    prime_power_field("GF(4)")
    assert fw.Space("GF(4)", "x, y").system(["y^2 + y - x^3"]).count_points() == 8
    H = fw.Space("GF(4)", "x, y, z").system(["y^2*z + y*z^2 - x^3"])
    assert H.count_points(projective=True) == 9
    # x^2 + x + 1 splits over GF(4): two rational points, not maximal.
    I = fw.Space("GF(4)", "x, y").system(["x^2 + x + 1", "y - x"])
    assert I.count_points() == 2 and not I.is_closed_point()
    assert I.multiplication_matrix("x").shape == (2, 2)


def test_klein_quartic_over_gf8():
    # x^3 y + y^3 z + z^3 x = 0 over GF(8): 24 projective points (classical; REFERENCE-VALUES).
    prime_power_field("GF(8)")
    K = fw.Space("GF(8)", "x, y, z").system(["x^3*y + y^3*z + z^3*x"])
    assert K.count_points(projective=True) == 24


def test_projective_count_rejects_inhomogeneous_input():
    I = fw.Space(5, "x, y, z").system(["x^2 - y"])
    with pytest.raises(ValueError, match="not homogeneous"):
        I.count_points(projective=True)


# --- agreement with sympy's Gröbner bases --------------------------------------------------------


def sympy_leading_exponents(texts, names, p):
    gens = sympy.symbols(names)
    gb = sympy.groebner(
        [sympy.sympify(t.replace("^", "**")) for t in texts], *gens, modulus=p, order="grevlex"
    )
    return [sympy.Poly(g, *gens, modulus=p).monoms(order="grevlex")[0] for g in gb.exprs]


def dimension_from_leads(leads, n):
    """Largest set of variables containing no leading monomial's support (brute force)."""
    if any(sum(m) == 0 for m in leads):
        return -1
    for size in range(n, -1, -1):
        for subset in itertools.combinations(range(n), size):
            if all(any(m[i] > 0 for i in range(n) if i not in subset) for m in leads):
                return size
    return 0


def standard_monomials_by_degree(leads, n, top):
    """Number of monomials of each degree <= top divisible by no leading monomial."""
    counts = [0] * (top + 1)
    for exps in itertools.product(range(top + 1), repeat=n):
        s = sum(exps)
        if s <= top and not any(all(e >= m for e, m in zip(exps, lead)) for lead in leads):
            counts[s] += 1
    return counts


@pytest.mark.parametrize("seed", range(25))
def test_dimension_and_hilbert_function_agree_with_sympy(seed):
    rng = random.Random(1000 + seed)
    p = [3, 7, 101][seed % 3]
    names = ["x", "y", "z", "w"][: 2 + seed % 3]
    texts = [random_poly(rng, names, p) for _ in range(rng.randint(1, 3))]
    I = fw.Space(p, names).system(texts)
    leads = sympy_leading_exponents(texts, names, p)
    assert I.dimension() == dimension_from_leads(leads, len(names)), texts
    # Affine Hilbert function from grevlex leading monomials: standard monomials of degree <= s.
    hs = I.hilbert()
    counts = standard_monomials_by_degree(leads, len(names), 6)
    if not hs.graded:
        counts = list(itertools.accumulate(counts))
    assert series_coefficients(hs, 7) == counts, texts
    if I.dimension() == 0:
        assert I.quotient_dimension() == len(I.standard_monomials())


def test_ctrl_c_interrupts_a_point_count():
    # A projective cubic over GF(1009) takes far longer than the test (minutes at q = 401 with the
    # reference engine); Ctrl-C stops it.
    import os
    import signal
    import threading

    E = fw.Space(1009, "x, y, z").system(["y^2*z - x^3 - 2*x*z^2 - 3*z^3"])
    timer = threading.Timer(0.3, lambda: os.kill(os.getpid(), signal.SIGINT))
    timer.start()
    try:
        with pytest.raises(KeyboardInterrupt):
            E.count_points(projective=True)
    finally:
        timer.cancel()


# --- errors --------------------------------------------------------------------------------------


def test_clear_errors():
    R = fw.Space("GF(7)", "x, y")
    with pytest.raises(ValueError, match="dimension 1"):
        R.system(["x*y - 1"]).quotient_dimension()
    with pytest.raises(ValueError, match="zero-dimensional"):
        R.system(["x*y - 1"]).multiplication_matrix("x")


def test_rationals_count_solutions_but_not_points():
    Q = fw.Space("Q", "x, y")
    # x^2 = 2, y^2 = x: 4 simple solutions over the closure (y^4 = 2); ((x - 1)^3, y^2): one.
    I = Q.system(["x^2 - 2", "y^2 - x"])
    assert I.quotient_dimension() == 4 and I.count_solutions() == 4
    assert Q.system(["(x - 1)^3", "y^2"]).count_solutions() == 1
    with pytest.raises(ValueError, match="over a finite field, not Q"):
        I.count_points()
