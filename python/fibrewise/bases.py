"""Reduced Gröbner bases as the API returns them, and what the engine did to compute them.

``ReducedBasis`` is a list of polynomials of a space (monic, sorted by decreasing leading
monomial) with the engine's ``GroebnerStats``; ``System.basis`` computes it (python/fibrewise/
systems.py) and the Boolean engine (python/fibrewise/boolean.py) makes the same type.
"""

from __future__ import annotations

from dataclasses import dataclass, field as dataclass_field
from typing import Any, Callable, Iterator, Optional, Sequence, overload

from . import _native
from .interop import latex_polynomial
from .names import optional_count
from .orders import Order
from .spaces import Coercible, Polynomial, Space


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
    """What the engine did. ``max_degree`` is the highest degree reached (the solving degree).
    ``choice`` says what the automatic engine (``engine="auto"``) chose and why (``"grevlex basis
    (...), then FGLM in the quotient R/I of dimension 16"`` for a lex basis of a zero-dimensional
    system); empty for the other engines."""

    engine: str
    seconds: float
    zero_reductions: int
    max_degree: int
    steps: list[StepStats] = dataclass_field(default_factory=list)
    choice: str = ""

    @classmethod
    def _from_native(cls, d: dict) -> "GroebnerStats":
        steps = [StepStats(**s) for s in d["steps"]]
        return cls(
            d["engine"], d["seconds"], d["zero_reductions"], d["max_degree"], steps, d.get("choice", "")
        )

    def to_dict(self) -> dict:
        return {
            "engine": self.engine,
            "choice": self.choice,
            "seconds": self.seconds,
            "zero_reductions": self.zero_reductions,
            "max_degree": self.max_degree,
            "steps": [s.__dict__ for s in self.steps],
        }


class ReducedBasis(Sequence[Polynomial]):
    """The reduced Gröbner basis of a system's ideal: monic, sorted by decreasing leading
    monomial. The unit ideal has basis ``[1]``, the zero ideal the empty basis."""

    def __init__(self, space: Space, polys: list[Polynomial], stats: GroebnerStats):
        self.space = space
        self.polys = polys
        self.stats = stats

    @property
    def order(self) -> Order:
        return self.space.order

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

    def normal_form(self, f: Coercible) -> Polynomial:
        """Normal form of ``f``: the remainder, unique since this is a Gröbner basis."""
        space = self.space
        p = space.polynomial(f)
        basis = [g._native for g in self.polys]
        if space._boolean is not None:  # the field equations v^2 = v are implicit in the basis
            return Polynomial(space, space._boolean.normal_form(basis, p._native))
        return Polynomial(space, _native.normal_form(space._native, basis, p._native))

    def leading_monomials(self) -> list[Polynomial]:
        return [g.leading_monomial() for g in self.polys]

    def __str__(self) -> str:
        return "[" + ", ".join(str(g) for g in self.polys) + "]"

    def __repr__(self) -> str:
        return (
            f"<ReducedBasis of {len(self.polys)} polynomials over {self.space}, order {self.order!r}: {self}>"
        )

    def _repr_latex_(self) -> str:
        return r"$\left[" + r",\ ".join(latex_polynomial(str(g)) for g in self.polys) + r"\right]$"


@dataclass(frozen=True)
class BasisLimits:
    """The bounds of one basis computation, checked: ``max_degree``, ``max_matrix`` (rows ×
    columns), ``threads`` and ``max_seconds`` (see ``System.basis``)."""

    max_degree: Optional[int] = None
    max_matrix: Optional[int] = None
    threads: Optional[int] = None
    max_seconds: Optional[float] = None

    @classmethod
    def checked(
        cls,
        max_degree: Optional[int],
        max_matrix: Optional[int],
        threads: Optional[int],
        max_seconds: Optional[float],
    ) -> "BasisLimits":
        return cls(
            optional_count("max_degree", max_degree, 0, 2**32 - 1),
            optional_count("max_matrix", max_matrix, 1, 2**64 - 1),
            optional_count("threads", threads, 1, 4096),
            max_seconds,
        )

    @property
    def cuts_the_work(self) -> bool:
        """Whether a degree or matrix bound may stop the engine early: such a result is not
        kept, since a later call without the bound must compute the whole basis. (A time
        bound either ends in ResourceLimit or leaves the whole basis.)"""
        return self.max_degree is not None or self.max_matrix is not None

    def keywords(self) -> dict[str, Any]:
        return {
            "max_degree": self.max_degree,
            "max_matrix": self.max_matrix,
            "threads": self.threads,
            "max_seconds": self.max_seconds,
        }


NativeBasis = Callable[[Space, BasisLimits], tuple[list, dict]]


def kept_basis(
    kept: dict[str, ReducedBasis], key: str, space: Space, limits: BasisLimits, compute: NativeBasis
) -> ReducedBasis:
    """The basis under ``key`` in ``kept`` (a system's computed bases), or computed by
    ``compute`` (a native call returning the polynomials and the engine's statistics) and kept
    unless ``limits`` cut the work."""
    if not limits.cuts_the_work and key in kept:
        return kept[key]
    polys, stats = compute(space, limits)
    gb = ReducedBasis(space, [Polynomial(space, p) for p in polys], GroebnerStats._from_native(stats))
    if not limits.cuts_the_work:
        kept[key] = gb
    return gb
