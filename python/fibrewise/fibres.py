"""Rational points fibre by fibre over parameters p_1..p_d, without a Gröbner basis per fibre.

One reduced basis G of I + (t_1 - p_1, ..., t_d - p_d) is computed, for a block order that
eliminates the variables; at a point v of GF(q)^d its specialisation t := v is already a Gröbner
basis of the fibre's ideal whenever no leading coefficient (a polynomial in t) vanishes at v
(Gianni 1987; Kalkbrener 1997), so such a generic fibre costs an interreduction and the
zero-dimensional solving only. A fibre where a leading coefficient vanishes gets a basis of its
own. Every point is substituted into every equation and every parameter by the core before it
is returned, and the fibres together give every rational point exactly once (each point lies
over the one point (p_1(x), ..., p_d(x)) of GF(q)^d).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Iterator, Optional, Sequence

from . import _native
from .fields import require_finite
from .names import Engine
from .spaces import Polynomial

if TYPE_CHECKING:
    from .systems import System

# Fibres per native call while enumerating lazily: the first call answers fast, later calls
# grow so that the Python overhead stays small against the work.
FIRST_CHUNK = 16
LARGEST_CHUNK = 4096


class ParametricFibres:
    """The fibres of ``system`` over ``parameters`` (polynomials of its space), ready to be
    enumerated: ``count`` fibres over GF(q)^d, ``fibre(values)``, ``points(limit)``;
    ``non_generic``: how many fibres enumerated so far needed a basis of their own."""

    def __init__(self, system: "System", parameters: Sequence[Polynomial], engine: Engine = "auto"):
        require_finite(system.space.field, "fibres")
        self.system = system
        self.parameters = list(parameters)
        self.engine = engine
        self.non_generic = 0
        space = system.space
        self._natives = ([g._native for g in system.equations], [p._native for p in self.parameters])
        self._basis = _native.parametric_basis(space._native, *self._natives, engine)

    @property
    def count(self) -> int:
        """q^d, the number of fibres."""
        size = self.system.space.field.size
        assert size is not None  # checked in __init__
        return int(size) ** len(self.parameters)

    def fibre(self, values: Sequence[int]) -> list[tuple]:
        """The points (tuples of ints) over the point ``values`` of GF(q)^d."""
        values = list(values)
        if len(values) != len(self.parameters):
            raise ValueError(
                f"a point over the parameters has {len(self.parameters)} coordinates, got {len(values)}"
            )
        found, generic = _native.fibre_at(
            self.system.space._native, *self._natives, self._basis, values, self.engine
        )
        self.non_generic += not generic
        return [tuple(p) for p in found]

    def run(self, first: int, count: int, limit: Optional[int] = None) -> tuple[list[tuple], int]:
        """The points over fibres ``first .. first + count - 1`` (fibre i lies over the point whose
        element indices are the base-q digits of i, least significant first), at most ``limit``,
        and the index of the first fibre not done (``first + count`` unless the limit stopped)."""
        found, following, non_generic = _native.fibre_points(
            self.system.space._native, *self._natives, self._basis, first, count, limit, self.engine
        )
        self.non_generic += non_generic
        return [tuple(p) for p in found], following

    def points(self, limit: Optional[int] = None) -> Iterator[tuple]:
        """Every point over every fibre, lazily, at most ``limit``."""
        first, chunk, found = 0, FIRST_CHUNK, 0
        while first < self.count and (limit is None or found < limit):
            count = min(chunk, self.count - first)
            batch, first = self.run(first, count, None if limit is None else limit - found)
            found += len(batch)
            yield from batch
            chunk = min(2 * chunk, LARGEST_CHUNK)
