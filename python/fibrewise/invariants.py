"""Invariants of a system's ideal I in R = k[x1..xn]: Krull dimension, Hilbert series and
degree, the finite-dimensional quotient R/I of a zero-dimensional system, and point counts over
finite fields.

The ``System`` methods of the same names call these functions; everything is computed in the
Rust core from the system's cached reduced Gröbner basis.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING, Optional

import numpy

from . import _native
from .interop import latex_polynomial
from .solutions import in_field
from .spaces import Coercible, Polynomial

if TYPE_CHECKING:
    from .fields import FieldSpec
    from .systems import System


@dataclass(frozen=True)
class HilbertSeries:
    """The Hilbert series h(t) / (1 - t)^d of the quotient ring R/I.

    ``numerator`` lists the coefficients of h (the coefficient of t^i at index i) and
    ``denominator_exponent`` is d, with h(1) != 0 (the unit ideal has the empty numerator).
    ``graded`` says which Hilbert function it is: True for homogeneous equations (the graded
    function s -> dim_k R_s / I_s, d = dim R/I), False otherwise: the affine function
    s -> dim_k R_{<=s} / I_{<=s}, whose series has d = dim R/I + 1.
    """

    numerator: list[int]
    denominator_exponent: int
    graded: bool = True

    @property
    def degree(self) -> int:
        """The degree (multiplicity) h(1)."""
        return sum(self.numerator)

    @property
    def dimension(self) -> int:
        """Krull dimension of R/I; -1 for the unit ideal."""
        if not self.numerator:
            return -1
        return self.denominator_exponent - int(not self.graded)

    def to_dict(self) -> dict:
        """The series as JSON-ready data: numerator coefficients, the exponent d of (1 - t)^d
        and whether it is the graded series."""
        return {
            "numerator": list(self.numerator),
            "denominator_exponent": self.denominator_exponent,
            "graded": self.graded,
        }

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

    def __repr__(self) -> str:
        kind = "graded" if self.graded else "affine"
        return f"<HilbertSeries ({kind}) {self}>"

    def _repr_latex_(self) -> str:
        top = latex_polynomial(str(self).split(" / ")[0].strip("()"))
        d = self.denominator_exponent
        if d == 0:
            return f"${top}$"
        return rf"$rac{{{top}}}{{(1 - t)^{{{d}}}}}$"


def _basis(system: "System") -> tuple:
    gb = system.basis(field_equations=system.space.boolean)
    return gb.space._native, [g._native for g in gb]


def dimension(system: "System") -> int:
    """Krull dimension (maximal independent sets of the leading ideal); -1 for the unit ideal."""
    return _native.dimension(*_basis(system))


def independent_variables(system: "System") -> list[Polynomial]:
    """A maximal set of variables independent modulo I (none for the unit ideal)."""
    names = _native.independent_variables(*_basis(system)) or []
    space = system.space
    return [space.variables[space.names.index(n)] for n in names]


def hilbert(system: "System") -> HilbertSeries:
    """Hilbert series of R/I: graded for homogeneous equations, affine otherwise (computed
    from a grevlex basis when the space's order does not compare degrees first)."""
    boolean = system.space.boolean  # the ideal with the field equations, not homogeneous
    homogeneous = not boolean and all(g.is_homogeneous() for g in system.equations)
    if homogeneous or _native.is_degree_compatible(system.space._native):
        gb = system.basis(field_equations=boolean)
    else:
        gb = system.basis("grevlex", field_equations=boolean)
    numerator, d, affine = _native.hilbert(gb.space._native, [g._native for g in gb])
    return HilbertSeries(list(numerator), d, graded=not affine)


def degree(system: "System") -> int:
    """The degree (multiplicity) of R/I."""
    return hilbert(system).degree


def quotient_dimension(system: "System") -> int:
    """dim_k R/I for a zero-dimensional system (the number of solutions over the algebraic
    closure, counted with multiplicity); ``ValueError`` for a positive-dimensional one."""
    return _native.quotient_dimension(*_basis(system))


def standard_monomials(system: "System") -> list[Polynomial]:
    """The monomials outside the leading ideal, a k-basis of R/I (zero-dimensional systems
    only), increasing in the space's order."""
    space = system.space
    return [space.from_terms([(e, 1)]) for e in _native.standard_monomials(*_basis(system))]


def multiplication_matrix(system: "System", element: Coercible) -> numpy.ndarray:
    """The matrix of multiplication by ``element`` on the basis ``standard_monomials()``:
    column j holds the coordinates of element * b_j. A numpy int64 array of residues for GF(p)
    with p < 2^63, a galois array for GF(p^k), and an object array of exact ints or Fractions
    for larger primes and Q."""
    space_native, basis = _basis(system)
    rows = _native.multiplication_matrix(space_native, basis, system.space.polynomial(element)._native)
    size = len(rows)
    k = system.space.field
    if k.degree > 1:
        # GF(p^k): a galois array over the same field (entries are integer representations).
        return k.to_galois([x for row in rows for x in row]).reshape(size, size)
    if k.size is not None and k.size < 2**63:
        return numpy.array(rows, dtype=numpy.int64).reshape(size, size)
    # Exact values (Fractions over Q, residues above 2^63): numpy must not convert them.
    matrix = numpy.empty((size, size), dtype=object)
    for i, row in enumerate(rows):
        for j, x in enumerate(row):
            matrix[i, j] = x
    return matrix


def count_solutions(system: "System") -> int:
    """Number of distinct solutions over the algebraic closure (zero-dimensional systems),
    through the radical; correct in positive characteristic."""
    return _native.count_solutions(*_basis(system))


def is_closed_point(system: "System") -> bool:
    """Whether R/I is a field (the solutions are one Galois orbit): over GF(q) by the Frobenius
    fixed space, over Q by a primitive element whose minimal polynomial is tested for
    irreducibility exactly."""
    return _native.is_closed_point(*_basis(system))


def closed_point_degree(system: "System") -> int:
    """[R/I : k] when R/I is a field; ``ValueError`` otherwise."""
    return _native.closed_point_degree(*_basis(system))


def count_points(system: "System", over: Optional["FieldSpec"] = None, projective: bool = False) -> int:
    """Number of points of V(I) with coordinates in the finite field k, or in the extension
    ``over`` of k: in affine space, or for homogeneous I in projective space P^(n-1)."""
    if not isinstance(projective, bool):
        raise TypeError(f"projective must be a bool, not {type(projective).__name__}")
    if over is not None:
        system = in_field(system, over)
    if system.space.field.size is None:
        raise ValueError(f"points are counted over a finite field, not {system.space.field}")
    space = system.space
    return _native.count_points(space._native, [g._native for g in system.equations], projective)
