"""Every operation over every field kind: prime fields (word size and 255-bit), GF(p^k) and QQ.

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
FIELDS = ["GF(65521)", f"GF({P255})", "GF(4)", "GF(8)", "GF(3^2)", "QQ"]
TWISTED_CUBIC = ["x*z - y^2", "y*w - z^2", "x*w - y*z"]


@pytest.mark.parametrize("spec", FIELDS)
def test_twisted_cubic_over_each_field(spec):
    R = fw.PolynomialRing(spec, "x, y, z, w")
    I = R.ideal(TWISTED_CUBIC)
    assert I.dimension() == 2 and I.degree() == 3
    hs = I.hilbert_series()
    assert hs.numerator == [1, 2] and hs.denominator_exponent == 2
    nn = I.noether_normalization(seed=3)
    assert nn.dimension == 2 and nn.rank == 3 and nn.verify()
    assert I.is_finite_over([str(p) for p in nn.parameters])
    assert I.is_integral("y", over=[str(p) for p in nn.parameters])
    F = R.field
    if F.order is None:
        with pytest.raises(ValueError):
            I.count_points(projective=True)
    elif F.order < 100:
        assert I.count_points(projective=True) == F.order + 1


@pytest.mark.parametrize("spec,q", [("GF(4)", 4), ("GF(8)", 8), ("GF(2)", 2), ("GF(3)", 3)])
def test_union_of_rational_lines_needs_a_nonlinear_change(spec, q):
    R = fw.PolynomialRing(spec, "x, y")
    I = R.ideal([f"x^{q}*y - x*y^{q}"])
    nn = I.noether_normalization(seed=1)
    assert nn.strategy == "nonlinear" and nn.dimension == 1 and nn.verify()
    with pytest.raises(ValueError):
        I.noether_normalization(strategy="linear", seed=1)


# x^2 + x + 1 (the third cyclotomic polynomial) splits over GF(q) iff q ≡ 1 mod 3 (GF(q)* is
# cyclic of order q - 1; any finite fields text), is (x - 1)^2 in characteristic 3 and is
# irreducible over QQ (cyclotomic polynomials are). 65521 ≡ 1 and 2^255 - 19 ≡ 1 mod 3;
# GF(4) ≡ 1, GF(8) ≡ 2. Entries: (distinct solutions, maximal).
CYCLOTOMIC_THREE = {
    "GF(65521)": (2, False),
    f"GF({P255})": (2, False),
    "GF(4)": (2, False),
    "GF(8)": (2, True),
    "GF(3^2)": (1, False),
    "QQ": (2, True),
}


@pytest.mark.parametrize("spec", FIELDS)
def test_maximality_of_the_cube_roots_of_unity_over_each_field(spec):
    I = fw.PolynomialRing(spec, "x, y").ideal(["x^2 + x + 1", "y - x^2"])
    solutions, maximal = CYCLOTOMIC_THREE[spec]
    assert I.vector_space_dimension() == 2
    assert I.count_solutions() == solutions
    assert I.is_maximal() == maximal
    if maximal:
        assert I.residue_field_degree() == 2
    else:
        with pytest.raises(ValueError, match="not maximal"):
            I.residue_field_degree()
