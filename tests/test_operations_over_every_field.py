"""Every operation over every field kind: prime fields (word size and 255-bit), GF(p^k) and Q.

Check values:
- The twisted cubic (2x2 minors of [[x, y, z], [y, z, w]]) has an affine cone of Krull dimension 2,
  degree 3 and Hilbert series (1 + 2t)/(1 - t)^2 over every field (Cox, Little, O'Shea; Harris,
  Algebraic Geometry: A First Course, Example 1.10, from memory). It is isomorphic to P^1, so it has
  q + 1 points in P^3(GF(q)) (the rational normal curve is the image of P^1; same sources).
- x^q*y - x*y^q over GF(q) is the product of the q + 1 linear forms through the origin defined
  over GF(q) (Moore determinant; any finite fields text), so no linear form over GF(q) is a
  parameter: a Noether normalization over GF(q) must be nonlinear.
"""

import pytest

import fibrewise as fw

P255 = 2**255 - 19  # prime (Bernstein's Curve25519 field, from memory; also sympy.isprime)
FIELDS = ["GF(65521)", f"GF({P255})", "GF(4)", "GF(8)", "GF(3^2)", "Q"]
TWISTED_CUBIC = ["x*z - y^2", "y*w - z^2", "x*w - y*z"]


@pytest.mark.parametrize("spec", FIELDS)
def test_twisted_cubic_over_each_field(spec):
    R = fw.Space(spec, "x, y, z, w")
    I = R.system(TWISTED_CUBIC)
    assert I.dimension() == 2 and I.degree() == 3
    hs = I.hilbert()
    assert hs.numerator == [1, 2] and hs.denominator_exponent == 2
    nn = I.projection(seed=3)
    assert nn.dimension == 2 and nn.rank == 3 and nn.verify()
    assert I.is_finite_over([str(p) for p in nn.parameters])
    assert I.is_integral("y", over=[str(p) for p in nn.parameters])
    F = R.field
    if F.size is None:
        with pytest.raises(ValueError):
            I.count_points(projective=True)
    elif F.size < 100:
        assert I.count_points(projective=True) == F.size + 1


@pytest.mark.parametrize("spec,q", [("GF(4)", 4), ("GF(8)", 8), ("GF(2)", 2), ("GF(3)", 3)])
def test_union_of_rational_lines_needs_a_nonlinear_change(spec, q):
    R = fw.Space(spec, "x, y")
    I = R.system([f"x^{q}*y - x*y^{q}"])
    nn = I.projection(seed=1)
    assert nn.strategy == "nonlinear" and nn.dimension == 1 and nn.verify()
    with pytest.raises(ValueError):
        I.projection(strategy="linear", seed=1)


# x^2 + x + 1 (the third cyclotomic polynomial) splits over GF(q) iff q ≡ 1 mod 3 (GF(q)* is
# cyclic of order q - 1; any finite fields text), is (x - 1)^2 in characteristic 3 and is
# irreducible over Q (cyclotomic polynomials are). 65521 ≡ 1 and 2^255 - 19 ≡ 1 mod 3;
# GF(4) ≡ 1, GF(8) ≡ 2. Entries: (distinct solutions, maximal).
CYCLOTOMIC_THREE = {
    "GF(65521)": (2, False),
    f"GF({P255})": (2, False),
    "GF(4)": (2, False),
    "GF(8)": (2, True),
    "GF(3^2)": (1, False),
    "Q": (2, True),
}


@pytest.mark.parametrize("spec", FIELDS)
def test_maximality_of_the_cube_roots_of_unity_over_each_field(spec):
    I = fw.Space(spec, "x, y").system(["x^2 + x + 1", "y - x^2"])
    solutions, maximal = CYCLOTOMIC_THREE[spec]
    assert I.quotient_dimension() == 2
    assert I.count_solutions() == solutions
    assert I.is_closed_point() == maximal
    if maximal:
        assert I.closed_point_degree() == 2
    else:
        with pytest.raises(ValueError, match="not maximal"):
            I.closed_point_degree()
