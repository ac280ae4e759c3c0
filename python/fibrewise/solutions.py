"""Solutions of a system over a finite field: its rational points, its closed points, and the
same system over an extension field.

Rational points (``System.points``): a zero-dimensional system is solved in the core in one call
(shape position by a random linear form and the roots of its univariate polynomial, else the
field equations and a triangular splitting; Faugère and Mou 2011, Lazard 1992). A system of
dimension d > 0 goes through a finite projection (Noether normalization): every rational point
lies over a point of k^d, the fibre over each point of k^d is finite, so the parameter values are
enumerated and each fibre is solved as a zero-dimensional system, from one parametric basis
specialised at each point (a fibre gets a basis of its own only where a leading coefficient
vanishes; ``fibres.py``). The points come lazily, fibre by fibre; q^d fibres for a field of q elements, so for large q stop after what you need
(``limit``). Every point is checked in every equation by the core before it is returned.

Closed points (``System.closed_points``): the Galois orbits of the solutions of a
zero-dimensional system, each with its degree [k(P) : k] and the reduced lex basis of its maximal
ideal (a triangular set); ``ClosedPoint.points()`` lists its points in k(P) = GF(q^degree).

Extensions (``over=``): GF(q) = GF(p)[a]/(m) embeds into GF(q^k) by sending a to a root of m
there; the coefficients are carried by that embedding, never by reading ``a`` again in the larger
field, where the name denotes the larger field's own generator, another element.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Callable, Iterator, Optional

from . import _native
from .fibres import ParametricFibres
from .fields import Field, field, require_finite
from .names import optional_count
from .spaces import Polynomial, Space

if TYPE_CHECKING:
    from .fields import FieldSpec
    from .systems import System

Point = tuple


def in_field(system: "System", over: "FieldSpec") -> "System":
    """The system with its coefficients carried into ``over``, a finite field that contains the
    system's field (GF(p^j) inside GF(p^k) when j divides k)."""
    return embedding(system, over)[0]


def embedding(system: "System", over: "FieldSpec") -> tuple["System", Optional[int]]:
    """``in_field(system, over)`` and the image of the generator ``a`` of the system's field in
    ``over`` (an int, ``over``'s integer representation; ``None`` for a prime field, whose
    embedding is unique, and when ``over`` is the system's field)."""
    base, target = system.space.field, field(over)
    require_finite(target, "points")
    require_finite(base, "points")
    if target == base:
        return system, None
    if not target.contains(base):
        raise ValueError(
            f"{target} is not a finite extension of {base}: GF(p^j) lies in GF(p^k) only "
            "for the same p and j dividing k"
        )
    space = Space(target, system.space.names, order=system.space.order)
    natives, image = _native.embed(system.space._native, [g._native for g in system.equations], space._native)
    embedded = space.system([Polynomial(space, g) for g in natives])
    embedded.path = system.path
    return embedded, image


def _optional_limit(limit: Optional[int]) -> Optional[int]:
    return optional_count("limit", limit, 0, 2**63 - 1)


def _check_flag(name: str, value: object) -> None:
    if not isinstance(value, bool):
        raise TypeError(f"{name} must be a bool, not {type(value).__name__}")


def point_converter(k: Field, as_galois: bool) -> Callable[[list], Any]:
    """How a point (a list of ints) is handed to the user: a tuple of ints, or a galois array."""
    if not as_galois:
        return tuple
    k.galois_field()  # builds the class once, and raises now for a field galois cannot take
    return k.to_galois


def points(
    system: "System", over: Optional["FieldSpec"] = None, limit: Optional[int] = None, as_galois: bool = False
) -> Iterator[Any]:
    """The rational points of the system, or its points with coordinates in the extension
    ``over``; at most ``limit`` of them. Arguments are checked at once; the points come lazily."""
    limit = _optional_limit(limit)
    _check_flag("as_galois", as_galois)
    target = system if over is None else in_field(system, over)
    if target.space.field.size is None:
        if as_galois:
            raise ValueError("as_galois=True is for finite fields; over Q the points are tuples of Fractions")
        return _points_over_q(target, limit)
    convert = point_converter(target.space.field, as_galois)
    return _generate(target, limit, convert)


def _points_over_q(system: "System", limit: Optional[int]) -> Iterator[Point]:
    """Points in Q^n of a zero-dimensional system: a finite list, computed in one call."""
    dimension = system.dimension()
    if dimension > 0:
        raise ValueError(
            f"points over Q: the system has dimension {dimension}, so its rational points are "
            "not a finite list; points are listed over Q for zero-dimensional systems only"
        )
    return _points_over_q_list(system, limit)


def _points_over_q_list(system: "System", limit: Optional[int]) -> Iterator[Point]:
    if limit == 0 or system.dimension() < 0:
        return
    yield from (tuple(p) for p in _solve(system.space, system.equations, limit))


def _generate(system: "System", limit: Optional[int], convert: Callable[[list], Any]) -> Iterator[Any]:
    if limit == 0:
        return
    # One grevlex basis serves both the dimension and the solver (whatever the space's order:
    # a lex basis would cost a change of order for nothing).
    gb = system.basis(order="grevlex")
    basis = [g._native for g in gb]
    dimension = _native.dimension(gb.space._native, basis)
    if dimension < 0:
        return
    if dimension == 0:
        equations = [g._native for g in system.equations]
        for point in _native.rational_points_of_basis(gb.space._native, basis, equations, limit):
            yield convert(point)
        return
    yield from (convert(p) for p in _points_by_fibres(system, limit))


def _solve(space: Space, equations, limit: Optional[int]) -> list[list]:
    return _native.rational_points(space._native, [g._native for g in equations], limit)


def _points_by_fibres(system: "System", limit: Optional[int]) -> Iterator[list]:
    """Points of a positive-dimensional system, fibre by fibre over a finite projection, by
    specialising one parametric basis (``fibres.ParametricFibres``)."""
    yield from (list(p) for p in ParametricFibres(system, system.projection().parameters).points(limit))


# ----------------------------------------------------------------------------------------------
# closed points


class ClosedPoint:
    """A closed point of a zero-dimensional system over GF(q): one Galois orbit of solutions
    over the algebraic closure, i.e. one maximal ideal containing the system's ideal.

    ``degree``: [k(P) : k], the number of solutions in the orbit. ``equations``: the reduced lex
    basis of the maximal ideal, a triangular set (polynomials of the system's variables, order
    lex). ``residue_field``: k(P) as GF(q^degree) on its default modulus. ``points()``: the
    ``degree`` points of the orbit with coordinates in k(P); ``rational_point()``: the point
    itself when the degree is 1.
    """

    def __init__(self, space: Space, degree: int, equations: list[Polynomial]):
        self.space = space
        self.degree = degree
        self.equations: tuple[Polynomial, ...] = tuple(equations)

    @property
    def residue_field(self) -> Field:
        k = self.space.field
        if self.degree == 1:
            return k
        return field(f"GF({k.characteristic}^{k.degree * self.degree})")

    def points(self, as_galois: bool = False) -> list[Any]:
        """The points of the orbit, coordinates in ``residue_field`` (ints in its integer
        representation, or galois arrays); the generator of the system's field is sent to
        a root of its modulus in ``residue_field``."""
        _check_flag("as_galois", as_galois)
        system = self.space.system(self.equations)
        k = self.residue_field
        convert = point_converter(k, as_galois)
        target = in_field(system, k)
        return [convert(p) for p in _solve(target.space, target.equations, None)]

    def rational_point(self) -> Optional[Point]:
        """The coordinates (ints) when the point is rational (degree 1), else ``None``."""
        if self.degree != 1:
            return None
        return tuple(self.points()[0])

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, ClosedPoint):
            return NotImplemented
        return self.space.same_coordinates(other.space) and self.equations == other.equations

    def __hash__(self) -> int:
        return hash(self.equations)

    def __str__(self) -> str:
        return "(" + ", ".join(str(g) for g in self.equations) + ")"

    def __repr__(self) -> str:
        return f"<ClosedPoint of degree {self.degree} over {self.space.field}: {self}>"


class RationalClosedPoint(ClosedPoint):
    """A closed point of a zero-dimensional system over Q: one Galois orbit of solutions over
    the algebraic numbers, described by a primitive element.

    ``form``: the separating linear form u (a ``Polynomial``); ``minimal_polynomial``: the
    minimal polynomial m of u at the point (monic, irreducible over Q, a ``Polynomial`` in
    ``t``); ``coordinates``: x_i = g_i(t) with deg g_i < deg m (``Polynomial`` in ``t``). The
    residue field is Q[t]/(m), of degree ``degree`` = deg m; the solutions of the orbit are the
    points (g_1(θ), ..., g_n(θ)) for the deg m complex roots θ of m. ``equations``: the reduced
    lex basis of the maximal ideal (m(u), x_i − g_i(u)), computed on first use.
    ``points()``: the point (g_1(t), ..., g_n(t)) with coordinates in Q[t]/(m) (the other
    points of the orbit are its conjugates, which in general do not lie in Q[t]/(m));
    ``rational_point()``: the tuple of Fractions when the degree is 1.
    """

    def __init__(self, space: Space, degree: int, form: list, minimal_polynomial: list, coordinates: list):
        self.space = space
        self.degree = degree
        self._lex = space.with_order("lex")
        self.residue_space = Space(space.field, ["t"])
        self._form_text = " + ".join(f"({c})*{space.names[i]}" for i, c in form) or "0"
        self.form = space.parse(self._form_text)
        self.minimal_polynomial = self.residue_space.from_terms(
            ([i], c) for i, c in enumerate(minimal_polynomial)
        )
        self.coordinates = tuple(
            self.residue_space.from_terms(([i], c) for i, c in enumerate(g)) for g in coordinates
        )
        self._minimal_coefficients = minimal_polynomial
        self._coordinate_coefficients = coordinates
        self._equations: Optional[tuple[Polynomial, ...]] = None

    def _of_form(self, coefficients: list) -> str:
        """g(u) as text in the space's variables, for g given by its coefficients."""
        powers = (
            f"({c})" if i == 0 else f"({c})*({self._form_text})^{i}" for i, c in enumerate(coefficients)
        )
        return " + ".join(powers) or "0"

    @property
    def equations(self) -> tuple[Polynomial, ...]:  # type: ignore[override]
        if self._equations is None:
            gens = [self._lex.parse(self._of_form(self._minimal_coefficients))]
            gens += [
                self._lex.parse(f"{x} - ({self._of_form(g)})")
                for x, g in zip(self.space.names, self._coordinate_coefficients)
            ]
            self._equations = tuple(self._lex.system(gens).basis(order="lex"))
        return self._equations

    @property
    def residue_field(self) -> Field:
        return self.space.field

    def points(self, as_galois: bool = False) -> list[Any]:
        _check_flag("as_galois", as_galois)
        if as_galois:
            raise ValueError("as_galois=True is for finite fields")
        if self.degree == 1:
            return [self.rational_point()]
        return [self.coordinates]

    def rational_point(self) -> Optional[Point]:
        if self.degree != 1:
            return None
        root = -self.minimal_polynomial.evaluate({"t": 0})
        return tuple(g.evaluate({"t": root}) for g in self.coordinates)

    def __str__(self) -> str:
        names = ", ".join(f"{x} = {g}" for x, g in zip(self.space.names, self.coordinates))
        return f"({names}; t a root of {self.minimal_polynomial}, t = {self.form})"

    def __repr__(self) -> str:
        return f"<ClosedPoint of degree {self.degree} over Q: {self}>"


def closed_points(system: "System") -> list[ClosedPoint]:
    """The closed points of a zero-dimensional system over a finite field or Q, by increasing
    degree; ``ValueError`` for a system of positive dimension."""
    if system.space.field.size is None:
        over_q = _native.closed_points_over_q(system.space._native, [g._native for g in system.equations])
        return [RationalClosedPoint(system.space, *point) for point in over_q]
    lex = system.space.with_order("lex")
    found = _native.closed_points(system.space._native, [g._native for g in system.equations])
    return [ClosedPoint(lex, degree, [Polynomial(lex, g) for g in equations]) for degree, equations in found]
