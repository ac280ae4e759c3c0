"""Systems of polynomial equations in a space, and their reduced Gröbner bases.

A ``System`` is a list of equations f = 0 in a ``Space``; what it says about its solution set
(dimension, degree, point counts, finite projections, ...) is computed in the Rust core from the
reduced Gröbner basis of the ideal the equations generate, computed once per order and engine.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Iterable, Iterator, Optional, Sequence, Union

from . import _native, boolean, guessing, invariants, normalization, solutions
from .bases import BasisLimits, GroebnerStats, ReducedBasis, StepStats, kept_basis
from .curves import Curve
from .interop import latex_equations
from .names import ENGINE_NAMES, Engine, Strategy, check_name
from .orders import Order
from .spaces import Coercible, Polynomial, Space
from .systemfile import read_system_file

if TYPE_CHECKING:
    import numpy
    from .fields import FieldSpec
    from .memory import Memory
    from .invariants import HilbertSeries
    from .normalization import EquationsWhen, FiniteProjection, IntegralEquation
    from .solutions import ClosedPoint
    from .boolean import MethodChoice
    from .guessing import GuessPlan

# Re-exported: the basis types were defined here before python/fibrewise/bases.py.
__all__ = ["GroebnerStats", "ReducedBasis", "StepStats", "System"]


def _split_equations(text: str) -> list[str]:
    body = text.strip()
    if body.startswith("(") and body.endswith(")") and _balanced(body[1:-1]):
        body = body[1:-1]
    return [part for part in (p.strip() for p in body.split(",")) if part]


def _balanced(text: str) -> bool:
    depth = 0
    for ch in text:
        depth += {"(": 1, ")": -1}.get(ch, 0)
        if depth < 0:
            return False
    return depth == 0


class System:
    """A system of polynomial equations f = 0 in a ``Space``. Bases are computed on demand and
    kept per monomial order and engine."""

    def __init__(self, space: Space, equations: Union[str, Iterable[Coercible]]):
        if not isinstance(space, Space):
            raise TypeError(f"a system lives in a Space, not {type(space).__name__}")
        if isinstance(equations, str):
            equations = _split_equations(equations)
        elif not isinstance(equations, Iterable):
            raise TypeError(f"equations are a list of polynomials or texts, not {type(equations).__name__}")
        self.space = space
        self.equations: tuple[Polynomial, ...] = tuple(space.polynomial(g) for g in equations)
        self.path: Optional[str] = None
        self._bases: dict[str, ReducedBasis] = {}

    @classmethod
    def read(cls, path: str, *, memory: "Memory" = None) -> "System":
        """Reads a system file (``field:``, ``variables:``, optional ``order:`` headers, then one
        polynomial a line). Errors are ``fibrewise.ParseError`` naming file, line and column.
        ``memory``: the budget of its space (see ``Space``)."""
        text = read_system_file(path, memory=memory)
        system = cls(text.space, text.equations)
        system.path = text.path
        return system

    # --- bases ------------------------------------------------------------------------------

    def basis(
        self,
        order: Order | None = None,
        engine: Engine = "auto",
        *,
        max_degree: int | None = None,
        max_matrix: int | None = None,
        threads: int | None = None,
        field_equations: bool = False,
        max_seconds: float | None = None,
    ) -> ReducedBasis:
        """The reduced Gröbner basis for ``order`` (default: the space's order).

        ``engine``: ``"auto"`` (the library's choice), ``"f4"``, ``"f4-sampled"`` — F4 that
        reduces random combinations of each matrix's new rows instead of every row, much faster
        when most rows are dependent; over a finite field its basis is the exact one except with
        probability at most 2^-80 per matrix, and over Q it is checked exactly like the others —
        ``"f4-signature"`` — F4 with signatures (exact; grlex and grevlex only), which skips most
        rows that would reduce to zero: faster on systems whose degrees do not fall, such as
        katsura-n, slower on most others — or ``"buchberger"``, the reference engine.

        ``max_degree`` and ``max_matrix`` (rows × columns) bound the work, and ``max_seconds``
        its wall-clock time: going over raises ``fibrewise.ResourceLimit`` (the engine stops
        cleanly, as on Ctrl-C). Ctrl-C raises ``KeyboardInterrupt`` promptly.

        On a Boolean space the Boolean engine computes the basis with the field equations
        x^2 + x implicit; ``field_equations=True`` includes them (the reduced basis of the
        ideal in GF(2)[x], in the space without ``boolean``).
        """
        check_name("engine", engine, ENGINE_NAMES)
        if self.space.boolean or field_equations:
            return boolean.basis(
                self, order, engine, field_equations, max_degree, max_matrix, threads, max_seconds
            )
        limits = BasisLimits.checked(max_degree, max_matrix, threads, max_seconds)
        space = self.space if order is None else self.space.with_order(order)
        gens = [g._native for g in self.equations]
        return kept_basis(
            self._bases,
            self._basis_key(space.order, engine),
            space,
            limits,
            lambda space, limits: _native.reduced_basis(
                space._native, gens, engine=engine, **limits.keywords()
            ),
        )

    @staticmethod
    def _basis_key(order: Order, engine: str) -> str:
        return f"{order!r}/{engine}"

    def _cached_basis(self, order: Order) -> ReducedBasis | None:
        """The basis for ``order`` if one was computed already (by the default engine), else
        ``None``; never computes."""
        return self._bases.get(self._basis_key(order, "auto"))

    def normal_form(self, f: Coercible) -> Polynomial:
        """Normal form of ``f`` modulo the ideal (for the space's order)."""
        return self.basis().normal_form(f)

    def __contains__(self, f: Coercible) -> bool:
        """Whether ``f`` lies in the ideal the equations generate (which is more than vanishing
        on the solutions)."""
        return not self.normal_form(f)

    def ideal_contains(self, other: "System") -> bool:
        """Whether the ideal of this system contains the ideal of ``other``."""
        self._check_same_space(other)
        basis = self.basis()
        return all(not basis.normal_form(g) for g in other.equations)

    def same_ideal(self, other: "System") -> bool:
        """Whether the two systems generate the same ideal."""
        self._check_same_space(other)
        ours = self.basis()
        return list(map(str, ours)) == list(map(str, other.basis(ours.order)))

    def _check_same_space(self, other: "System") -> None:
        if not isinstance(other, System):
            raise TypeError(f"expected a System, not {type(other).__name__}")
        if not self.space.same_coordinates(other.space):
            raise ValueError(f"the systems live in different spaces: {self.space} and {other.space}")

    # --- invariants (python/fibrewise/invariants.py) ----------------------------------------

    def dimension(self) -> int:
        """Krull dimension of the solution set; -1 when there are no solutions over the
        algebraic closure.

        >>> from fibrewise import Space
        >>> Space("GF(7)", "x, y, z").system(["x*y - z", "x - 1"]).dimension()  # the line y = z
        1
        >>> Space("GF(7)", "x").system(["x", "x - 1"]).dimension()
        -1
        """
        return invariants.dimension(self)

    def independent_variables(self) -> list[Polynomial]:
        """A maximal set of variables independent on the solution set (as polynomials)."""
        return invariants.independent_variables(self)

    def hilbert(self) -> "HilbertSeries":
        """Hilbert series (graded for homogeneous equations, affine otherwise: see ``.graded``)."""
        return invariants.hilbert(self)

    def degree(self) -> int:
        """The degree of the solution set (of the ideal: with multiplicity); on a Boolean
        space the number of solutions.

        >>> from fibrewise import Space
        >>> V = Space("Q", "x, y")
        >>> V.system(["x^2 + y^2 - 1", "x*y - 2"]).degree()  # two conics: 2 * 2 (Bezout's bound)
        4
        >>> V.system(["x^2"]).degree()  # the double line: multiplicity counts
        2
        """
        if self.space.boolean:
            return self._boolean_count()
        return invariants.degree(self)

    def quotient_dimension(self) -> int:
        """dim_k of the quotient ring (zero-dimensional systems); ``ValueError`` otherwise."""
        if self.space.boolean:
            return self._boolean_count()
        return invariants.quotient_dimension(self)

    def standard_monomials(self) -> list[Polynomial]:
        """A monomial k-basis of the quotient ring (zero-dimensional systems)."""
        return invariants.standard_monomials(self)

    def multiplication_matrix(self, f: Coercible) -> "numpy.ndarray":
        """Matrix of multiplication by ``f`` on ``standard_monomials()`` (columns are images)."""
        return invariants.multiplication_matrix(self, f)

    def count_solutions(self) -> int:
        """Number of distinct solutions over the algebraic closure (zero-dimensional systems)."""
        if self.space.boolean:
            return self._boolean_count()
        return invariants.count_solutions(self)

    def is_closed_point(self) -> bool:
        """Whether the solutions form one Galois orbit, i.e. the ideal is maximal."""
        return invariants.is_closed_point(self)

    def closed_point_degree(self) -> int:
        """The degree [k(P) : k] of the closed point; ``ValueError`` if the solutions are not one."""
        return invariants.closed_point_degree(self)

    def count_points(
        self, over: "FieldSpec | None" = None, projective: bool = False, *, method: str = "auto"
    ) -> int:
        """Points with coordinates in the field, or in the extension ``over`` (affine, or for
        homogeneous equations projective). ``method`` is for Boolean systems (see ``points``).

        The circle x^2 + y^2 = 1 over GF(p) has p - (-1/p) points (a handbook fact): p + 1 for
        p = 7, and p^2 + 1 over GF(7^2), where -1 is a square.

        >>> from fibrewise import Space
        >>> circle = Space("GF(7)", "x, y").system(["x^2 + y^2 - 1"])
        >>> circle.count_points(), circle.count_points(over="GF(7^2)")
        (8, 48)
        """
        if self.space.boolean:
            return boolean.count_points(self, over, projective, boolean.check_method(method))
        if method != "auto":
            raise ValueError(f"method={method!r} is for Boolean systems; this one is over {self.space.field}")
        return invariants.count_points(self, over=over, projective=projective)

    # --- solutions (python/fibrewise/solutions.py; Boolean spaces: python/fibrewise/boolean.py) --

    def points(
        self,
        over: "FieldSpec | None" = None,
        limit: int | None = None,
        as_galois: bool = False,
        *,
        method: str = "auto",
    ) -> Iterator[Any]:
        """Iterator over the points with coordinates in the finite field, or in the extension
        ``over`` (``"GF(7^3)"``; the generator of GF(p^j) is sent to a root of its modulus
        there): tuples of ints (residues for GF(p), integer representations for GF(p^k)), or
        galois arrays with ``as_galois=True``; at most ``limit``. Every point is checked in
        every equation. Positive dimension: fibre by fibre over a finite projection (q^d fibres).

        On a Boolean space: tuples of 0/1, found by ``method``: ``"auto"`` (the cheapest by a
        cost estimate, see ``solve_method``), ``"exhaustive"`` (Gray-code enumeration of GF(2)^n,
        n <= 64), ``"basis"`` (the Boolean Gröbner engine) or ``"hybrid"`` (guess some variables,
        run the engine on each guess; ``"hybrid:K"`` guesses K). ``method`` is for Boolean
        spaces only.

        >>> from fibrewise import Space
        >>> S = Space("GF(7)", "x, y").system(["x^2 + y^2 - 1", "x - y"])  # 2x^2 = 1: x = 2, 5
        >>> sorted(S.points())
        [(2, 2), (5, 5)]
        """
        if self.space.boolean:
            return boolean.points(self, over=over, limit=limit, method=method)
        if method != "auto":
            raise ValueError(
                f"method={method!r} chooses how Boolean systems are solved; this space is not Boolean"
            )
        return solutions.points(self, over=over, limit=limit, as_galois=as_galois)

    def closed_points(self) -> "list[ClosedPoint]":
        """The Galois orbits of the solutions of a zero-dimensional system over a finite field,
        as ``ClosedPoint`` objects (degree, triangular set, points in the residue field).

        >>> from fibrewise import Space
        >>> S = Space("GF(7)", "x, y").system(["x^2 + 1", "y - 3"])  # -1 is no square mod 7
        >>> [P.degree for P in S.closed_points()]
        [2]
        """
        return solutions.closed_points(self._general())

    def solve_method(self, method: str = "auto") -> "MethodChoice":
        """Boolean systems: the method ``points`` and ``count_points`` use for ``method`` and why
        (a ``MethodChoice`` with the estimated seconds of each method), without solving."""
        return boolean.choose_method(self, method)

    def with_field_equations(self) -> "System":
        """Boolean systems: the same equations with x^2 + x for every variable, as a system of
        the space without ``boolean`` (for the general engines)."""
        return boolean.with_field_equations(self)

    def _boolean_count(self) -> int:
        return boolean.count(self)

    def _general(self) -> "System":
        """The system the general algorithms see: itself, or with the field equations written
        out on a Boolean space."""
        return self.with_field_equations() if self.space.boolean else self

    # --- finite projections (python/fibrewise/normalization.py) -----------------------------

    def projection(
        self, strategy: Strategy = "auto", seed: int | None = None, equations: "EquationsWhen" = "lazy"
    ) -> "FiniteProjection":
        """A finite projection onto d-space (Noether normalization) with its certificate.
        Parameters, coordinates, rank, module generators and strategy come at about the cost of
        one basis; the monic equations (``.equations``) are computed on first use, or at once
        with ``equations="now"``.

        >>> from fibrewise import Space
        >>> P = Space("GF(7)", "x, y").system(["x^2 + y^2 - 1"]).projection()
        >>> [str(p) for p in P.parameters], P.rank  # x is a root of x^2 + (y^2 - 1) over k[y]
        (['y'], 2)
        """
        return normalization.finite_projection(self, strategy=strategy, seed=seed, equations=equations)

    def is_integral(self, f: Coercible, over: Sequence[Coercible]) -> bool:
        """Whether ``f`` is integral over k[over] in the quotient ring."""
        return normalization.is_integral(self, f, over)

    def integral_equation(self, f: Coercible, over: Sequence[Coercible]) -> "IntegralEquation | None":
        """The monic relation of least degree of ``f`` over k[over] in the quotient ring, or None."""
        return normalization.integral_equation(self, f, over)

    def is_finite_over(self, over: Sequence[Coercible]) -> bool:
        """Whether the quotient ring is a finitely generated k[over]-module."""
        return normalization.is_finite_over(self, over)

    # --- curves (python/fibrewise/curves.py) -------------------------------------------------

    def guess_plan(
        self, max_guess: int | None = None, samples: int = 8, *, budget: float | None = 10.0
    ) -> "GuessPlan":
        """Guess and determine, measured: for k = 0..max_guess guessed variables, which ones, the
        median time and solving degree of one specialised system (``samples`` random guesses),
        q^k, the expected total, and the best k (``fibrewise.guessing``). An estimate, not a bound.
        ``budget``: wall-clock seconds one sample may take (``None``: no limit); a k whose
        sample goes over is marked over budget, its times lower bounds."""
        return guessing.guess_plan(self, max_guess, samples, budget=budget)

    def curve(self) -> Curve:
        """The solution set as a curve over the (finite) field: smoothness, genus, counts over
        GF(q^r), zeta function (see ``fibrewise.curves``)."""
        return Curve(self)

    # --- text -------------------------------------------------------------------------------

    def __eq__(self, other: object) -> bool:
        """The same equations in the same space (``same_ideal`` compares the ideals)."""
        if not isinstance(other, System):
            return NotImplemented
        return self.space.same_coordinates(other.space) and self.equations == other.equations

    def __hash__(self) -> int:
        return hash((self.space.field, self.space.names, self.equations))

    def __str__(self) -> str:
        return "(" + ", ".join(str(g) for g in self.equations) + ")"

    def __repr__(self) -> str:
        n = len(self.equations)
        return f"<System of {n} equation{'' if n == 1 else 's'} over {self.space}: {self}>"

    def _repr_latex_(self) -> str:
        return "$" + latex_equations([str(g) for g in self.equations]) + "$"


# Spaces sit below systems in the module layers (DEVELOPERS.md): a space makes its systems
# through this factory, which the module defining ``System`` provides.
Space._system_type = System
