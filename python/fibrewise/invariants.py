"""Invariants of an ideal I in R = k[x1..xn]: Krull dimension, Hilbert series and degree, the
finite-dimensional algebra R/I of a zero-dimensional ideal, and point counts over finite fields.

The ``Ideal`` methods of the same names call these functions; everything is computed in the
Rust core from the ideal's cached Gröbner basis.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

import numpy

from . import _native
from .rings import Coercible, Polynomial

if TYPE_CHECKING:
    from .ideals import Ideal


@dataclass(frozen=True)
class HilbertSeries:
    """The Hilbert series h(t) / (1 - t)^d of R/I.

    ``numerator`` lists the coefficients of h (the coefficient of t^i at index i) and
    ``denominator_exponent`` is d, with h(1) != 0 (the unit ideal has the empty numerator).
    For a non-homogeneous ideal (``affine``) it is the series of the affine Hilbert function
    s -> dim_k R_{<=s} / I_{<=s}, and d = dim R/I + 1.
    """

    numerator: list[int]
    denominator_exponent: int
    affine: bool = False

    @property
    def degree(self) -> int:
        """The degree (multiplicity) h(1)."""
        return sum(self.numerator)

    @property
    def dimension(self) -> int:
        """Krull dimension of R/I; -1 for the unit ideal."""
        if not self.numerator:
            return -1
        return self.denominator_exponent - int(self.affine)

    def polynomial(self) -> list[Fraction]:
        """Coefficients of the Hilbert polynomial, constant term first (empty when it is 0)."""
        pairs = _native.hilbert_polynomial(self.numerator, self.denominator_exponent)
        return [Fraction(n, d) for n, d in pairs]

    def regularity_index(self) -> int:
        """The least s0 >= 0 such that the Hilbert function equals the polynomial from s0 on."""
        return _native.regularity_index(self.numerator, self.denominator_exponent)

    def __str__(self) -> str:
        terms = []
        for i, c in enumerate(self.numerator):
            if c:
                power = "" if i == 0 else ("t" if i == 1 else f"t^{i}")
                coeff = str(c) if not power or abs(c) != 1 else ("-" if c < 0 else "")
                terms.append(coeff + ("*" if power and coeff not in ("", "-") else "") + power)
        top = " + ".join(terms).replace("+ -", "- ") or "0"
        d = self.denominator_exponent
        if d == 0:
            return top
        return f"({top}) / (1 - t)" + (f"^{d}" if d > 1 else "")


def _basis(ideal: "Ideal") -> tuple:
    gb = ideal.groebner_basis()
    return gb.ring._native, [g._native for g in gb]


def dimension(ideal: "Ideal") -> int:
    """Krull dimension of R/I (maximal independent sets of the leading ideal); -1 for the unit ideal."""
    return _native.krull_dimension(*_basis(ideal))


def independent_variables(ideal: "Ideal") -> list[str]:
    """Names of a maximal set of variables independent modulo I (none for the unit ideal)."""
    names = _native.independent_variables(*_basis(ideal))
    return [] if names is None else names


def hilbert_series(ideal: "Ideal") -> HilbertSeries:
    """Hilbert series of R/I: graded for homogeneous generators, affine otherwise (computed
    from a grevlex basis when the ring's order does not compare degrees first)."""
    homogeneous = all(g._native.is_homogeneous() for g in ideal.generators)
    if homogeneous or _native.is_degree_compatible(ideal.ring._native):
        gb = ideal.groebner_basis()
    else:
        gb = ideal.groebner_basis("grevlex")
    numerator, d, affine = _native.hilbert_series(gb.ring._native, [g._native for g in gb])
    return HilbertSeries(list(numerator), d, affine)


def degree(ideal: "Ideal") -> int:
    """The degree (multiplicity) of R/I."""
    return hilbert_series(ideal).degree


def vector_space_dimension(ideal: "Ideal") -> int:
    """dim_k R/I for zero-dimensional I (the number of solutions over the algebraic closure,
    counted with multiplicity); ``ValueError`` for a positive-dimensional ideal."""
    return _native.vector_space_dimension(*_basis(ideal))


def standard_monomials(ideal: "Ideal") -> list[Polynomial]:
    """The monomials outside the leading ideal, a k-basis of R/I (zero-dimensional I only),
    increasing in the ring's order."""
    ring = ideal.ring
    return [ring.from_terms([(e, 1)]) for e in _native.standard_monomials(*_basis(ideal))]


def multiplication_matrix(ideal: "Ideal", element: Coercible) -> numpy.ndarray:
    """The matrix of multiplication by ``element`` (e.g. a variable name) on the basis
    ``standard_monomials()``: column j holds the coordinates of element * b_j. A numpy array
    (int64 residues for GF(p)), or a galois array for GF(p^k)."""
    ring_native, basis = _basis(ideal)
    rows = _native.multiplication_matrix(ring_native, basis, ideal.ring(element)._native)
    size = len(rows)
    k = ideal.ring.field
    if k.degree > 1:
        # GF(p^k): a galois array over the same field (entries are integer representations).
        return k.to_galois([x for row in rows for x in row]).reshape(size, size)
    try:
        return numpy.array(rows, dtype=numpy.int64).reshape(size, size)
    except (OverflowError, TypeError):
        # Residues above 2^63 or exact rationals: Python objects.
        return numpy.array(rows, dtype=object).reshape(size, size)


def count_solutions(ideal: "Ideal") -> int:
    """Number of distinct solutions over the algebraic closure (zero-dimensional I), through the
    radical; correct in positive characteristic."""
    return _native.count_solutions(*_basis(ideal))


def is_maximal(ideal: "Ideal") -> bool:
    """Whether R/I is a field: over GF(q) by the Frobenius fixed space, over QQ by a primitive
    element whose minimal polynomial is tested for irreducibility exactly."""
    return _native.is_maximal(*_basis(ideal))


def residue_field_degree(ideal: "Ideal") -> int:
    """[R/I : k] for a maximal ideal; ``ValueError`` if I is not maximal."""
    return _native.residue_field_degree(*_basis(ideal))


def count_points(ideal: "Ideal", projective: bool = False) -> int:
    """Number of points of V(I) with coordinates in the finite field k: in k^n, or for
    homogeneous I in projective space P^(n-1)(k)."""
    return _native.count_points(ideal.ring._native, [g._native for g in ideal.generators], projective)
