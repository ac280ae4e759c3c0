"""Ideals and their Gröbner bases."""

from __future__ import annotations

from dataclasses import dataclass, field as dataclass_field
from typing import TYPE_CHECKING, Iterable, Iterator, Sequence, Union, overload

from . import _native, invariants
from .orders import Order
from .rings import Coercible, Polynomial, PolynomialRing

if TYPE_CHECKING:
    import numpy
    from .normalization import IntegralEquation, FiniteProjection


@dataclass(frozen=True)
class StepStats:
    """One step of an engine: the degree handled, the pairs, the matrix and the time spent."""

    degree: int
    pairs: int
    rows: int
    columns: int
    nonzeros: int
    new_elements: int
    seconds_symbolic: float
    seconds_linear_algebra: float


@dataclass(frozen=True)
class GroebnerStats:
    """What the engine did. ``max_degree`` is the highest degree reached (the solving degree)."""

    engine: str
    seconds: float
    zero_reductions: int
    max_degree: int
    steps: list[StepStats] = dataclass_field(default_factory=list)

    @classmethod
    def from_native(cls, d: dict) -> "GroebnerStats":
        steps = [StepStats(**s) for s in d["steps"]]
        return cls(d["engine"], d["seconds"], d["zero_reductions"], d["max_degree"], steps)

    def to_dict(self) -> dict:
        return {
            "engine": self.engine,
            "seconds": self.seconds,
            "zero_reductions": self.zero_reductions,
            "max_degree": self.max_degree,
            "steps": [s.__dict__ for s in self.steps],
        }


class ReducedBasis(Sequence[Polynomial]):
    """The reduced Gröbner basis of an ideal: monic, sorted by decreasing leading monomial.

    The unit ideal has basis ``[1]``, the zero ideal the empty basis.
    """

    def __init__(self, ring: PolynomialRing, polys: list[Polynomial], stats: GroebnerStats):
        self.ring = ring
        self.polys = polys
        self.stats = stats

    @property
    def order(self) -> Order:
        return self.ring.order

    @overload
    def __getitem__(self, i: int) -> Polynomial: ...
    @overload
    def __getitem__(self, i: slice) -> list[Polynomial]: ...
    def __getitem__(self, i):
        return self.polys[i]

    def __len__(self) -> int:
        return len(self.polys)

    def __iter__(self) -> Iterator[Polynomial]:
        return iter(self.polys)

    def reduce(self, f: Coercible) -> Polynomial:
        """Normal form of ``f``: the remainder, unique since this is a Gröbner basis."""
        p = self.ring(f)
        return Polynomial(self.ring, _native.normal_form_of(self.ring._native, [g._native for g in self.polys], p._native))

    def leading_monomials(self) -> list[Polynomial]:
        return [g.leading_monomial() for g in self.polys]

    def __str__(self) -> str:
        return "[" + ", ".join(str(g) for g in self.polys) + "]"

    def __repr__(self) -> str:
        return f"ReducedBasis({[str(g) for g in self.polys]!r}, order={self.order!r})"


def _split_generators(text: str) -> list[str]:
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


class Ideal:
    """An ideal of a polynomial ring, given by generators. Bases are computed on demand and
    cached per monomial order."""

    def __init__(self, ring: PolynomialRing, generators: Union[str, Iterable[Coercible]]):
        self.ring = ring
        if isinstance(generators, str):
            generators = _split_generators(generators)
        self.generators: tuple[Polynomial, ...] = tuple(ring(g) for g in generators)
        self._bases: dict[str, ReducedBasis] = {}

    def groebner_basis(
        self,
        order: Order | None = None,
        *,
        engine: str = "auto",
        max_degree: int | None = None,
        max_matrix: int | None = None,
        threads: int | None = None,
    ) -> ReducedBasis:
        """The reduced Gröbner basis for ``order`` (default: the ring's order).

        ``engine``: ``"f4"`` (also ``"auto"``, the default), ``"f4-sampled"`` — F4 that reduces
        random combinations of each matrix's new rows instead of every row, much faster when most
        rows are dependent; over a finite field its basis is the exact one except with
        probability at most 2^-80 per matrix, and over QQ it is checked exactly like the others —
        ``"f4-signature"`` — F4 with signatures (exact; grlex and grevlex only), which skips most
        rows that would reduce to zero: faster on systems whose degrees do not fall, such as
        katsura-n, slower on most others — or ``"buchberger"``, the reference engine.

        ``max_degree`` and ``max_matrix`` (rows × columns) bound the work: going over raises
        ``fibrewise.ResourceLimit``. Ctrl-C raises ``KeyboardInterrupt`` promptly.
        """
        ring = self.ring if order is None else self.ring.with_order(order)
        limited = (max_degree, max_matrix) != (None, None)
        key = self._basis_key(ring.order, engine)
        if not limited and key in self._bases:
            return self._bases[key]
        polys, stats = _native.groebner_basis(
            ring._native,
            [g._native for g in self.generators],
            engine=engine,
            max_degree=max_degree,
            max_matrix=max_matrix,
            threads=threads,
        )
        gb = ReducedBasis(ring, [Polynomial(ring, p) for p in polys], GroebnerStats.from_native(stats))
        if not limited:
            self._bases[key] = gb
        return gb

    @staticmethod
    def _basis_key(order: Order, engine: str) -> str:
        return f"{order!r}/{engine}"

    def cached_basis(self, order: Order) -> ReducedBasis | None:
        """The basis for ``order`` if one was computed already (by the default engine), else
        ``None``; never computes."""
        return self._bases.get(self._basis_key(order, "auto"))

    def reduce(self, f: Coercible) -> Polynomial:
        """Normal form of ``f`` modulo the ideal (for the ring's order)."""
        return self.ring(self.groebner_basis().reduce(f))

    def __contains__(self, f: Coercible) -> bool:
        return not self.reduce(f)

    def is_subset(self, other: "Ideal") -> bool:
        """Whether this ideal is contained in ``other``."""
        self._check_same_ring(other)
        basis = other.groebner_basis()
        return all(not basis.reduce(g) for g in self.generators)

    def __eq__(self, other: object) -> bool:
        if not isinstance(other, Ideal):
            return NotImplemented
        self._check_same_ring(other)
        return list(map(str, self.groebner_basis())) == list(map(str, other.groebner_basis(self.ring.order)))

    __hash__ = None  # type: ignore[assignment]  # ideals are mutable caches; equality is costly

    # --- invariants (python/fibrewise/invariants.py) ---------------------------------------

    def dimension(self) -> int:
        """Krull dimension of R/I; -1 for the unit ideal."""
        return invariants.dimension(self)

    def independent_variables(self) -> list[str]:
        """Names of a maximal set of variables independent modulo I."""
        return invariants.independent_variables(self)

    def hilbert_series(self) -> invariants.HilbertSeries:
        """Hilbert series of R/I (affine Hilbert function for non-homogeneous I)."""
        return invariants.hilbert_series(self)

    def degree(self) -> int:
        """The degree (multiplicity) of R/I."""
        return invariants.degree(self)

    def vector_space_dimension(self) -> int:
        """dim_k R/I for zero-dimensional I; ``ValueError`` otherwise."""
        return invariants.vector_space_dimension(self)

    def standard_monomials(self) -> list[Polynomial]:
        """A monomial k-basis of R/I (zero-dimensional I)."""
        return invariants.standard_monomials(self)

    def multiplication_matrix(self, var: Coercible) -> "numpy.ndarray":
        """Matrix of multiplication by ``var`` on ``standard_monomials()`` (columns are images)."""
        return invariants.multiplication_matrix(self, var)

    def count_solutions(self) -> int:
        """Number of distinct solutions over the algebraic closure (zero-dimensional I)."""
        return invariants.count_solutions(self)

    def is_maximal(self) -> bool:
        """Whether R/I is a field."""
        return invariants.is_maximal(self)

    def residue_field_degree(self) -> int:
        """[R/I : k] for a maximal ideal; ``ValueError`` otherwise."""
        return invariants.residue_field_degree(self)

    def count_points(self, projective: bool = False) -> int:
        """Points of V(I) with coordinates in the finite field (affine, or projective)."""
        return invariants.count_points(self, projective)

    def noether_normalization(self, strategy: str = "auto", seed: int | None = None) -> "FiniteProjection":
        """Noether normalization with a checkable certificate (see ``fibrewise.normalization``)."""
        from .normalization import noether_normalization

        return noether_normalization(self, strategy=strategy, seed=seed)

    def is_integral(self, f: Coercible, over: Sequence[Coercible]) -> bool:
        """Whether ``f`` is integral over k[over] inside R/I."""
        from .normalization import is_integral

        return is_integral(self, f, over)

    def integral_equation(self, f: Coercible, over: Sequence[Coercible]) -> "IntegralEquation | None":
        """The monic relation of least degree of ``f`` over k[over] in R/I, or None."""
        from .normalization import integral_equation

        return integral_equation(self, f, over)

    def is_finite_over(self, over: Sequence[Coercible]) -> bool:
        """Whether R/I is a finitely generated k[over]-module."""
        from .normalization import is_finite_over

        return is_finite_over(self, over)

    def _check_same_ring(self, other: "Ideal") -> None:
        if not self.ring.same_space(other.ring):
            raise ValueError(f"the ideals live in different rings: {self.ring} and {other.ring}")

    def __str__(self) -> str:
        return "(" + ", ".join(str(g) for g in self.generators) + ")"

    def __repr__(self) -> str:
        return f"{self.ring!r}.ideal({[str(g) for g in self.generators]!r})"
