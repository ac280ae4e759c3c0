"""Coefficient fields: ``field(spec)`` and the ``Field`` object."""

from __future__ import annotations

from typing import Union

from . import _native

FieldSpec = Union["Field", int, str]


class Field:
    """A coefficient field. ``str(F)`` is a spec that ``field()`` reads back."""

    __slots__ = ("_native",)

    def __init__(self, native: _native.NativeField):
        self._native = native

    @property
    def characteristic(self) -> int:
        return int(self._native.characteristic)

    @property
    def order(self) -> int | None:
        """Number of elements; ``None`` for an infinite field."""
        o = self._native.order
        return None if o is None else int(o)

    @property
    def degree(self) -> int:
        """Degree k over the prime field (q = p^k)."""
        return self._native.degree

    def __str__(self) -> str:
        return self._native.spec

    def __repr__(self) -> str:
        return f"field({self._native.spec!r})"

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Field) and self._native == other._native

    def __hash__(self) -> int:
        return hash(self._native.spec)


def field(spec: FieldSpec) -> Field:
    """The field named by ``spec``: a prime ``7``, ``"GF(7)"``, or a ``Field``.

    Raises ``ValueError`` for a composite number or an unknown spec, naming what is wrong.
    """
    if isinstance(spec, Field):
        return spec
    if isinstance(spec, bool) or not isinstance(spec, (int, str)):
        raise ValueError(f"a field spec must be an int, a str or a Field, not {type(spec).__name__}")
    return Field(_native.NativeField(str(spec)))
