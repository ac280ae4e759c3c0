"""Coefficient fields: ``field(spec)`` and the ``Field`` object.

Specs: a prime ``7`` or ``"GF(7)"`` (any size; multi-precision above 2^63), ``"GF(2^8)"``,
``"GF(9)"``, ``"GF(3^2)"``, ``"GF(2^8, modulus='a^8+a^4+a^3+a+1')"``, ``"QQ"``, or a
``galois.GF(...)`` class (its irreducible polynomial becomes the modulus).

GF(p^k) is GF(p)[a]/(f). The default modulus f is the first monic irreducible polynomial of
degree k in the order of its integer representation (for GF(2^8): a^8 + a^4 + a^3 + a + 1);
note that galois's default is a Conway polynomial, so ``field(galois.GF(2**8))`` is the field
on a^8 + a^4 + a^3 + a^2 + 1. Elements of GF(p^k) appear as ints in ``terms()`` and
``evaluate()``: the integer representation Σ c_i p^i of c_0 + c_1 a + ..., as galois writes
them; ``Field.to_galois`` and ``Field.from_galois`` convert.
"""

from __future__ import annotations

from typing import Any, Iterable, Union

from . import _native

FieldSpec = Union["Field", int, str, type]


class Field:
    """A coefficient field. ``str(F)`` is a spec that ``field()`` reads back."""

    __slots__ = ("_native", "_galois")

    def __init__(self, native: _native.NativeField):
        self._native = native
        self._galois = None

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

    @property
    def modulus(self) -> str | None:
        """The modulus of GF(p^k) as text in ``a`` (``a^8 + a^4 + a^3 + a + 1``); None otherwise."""
        coeffs = _native.field_modulus(self._native)
        if coeffs is None:
            return None
        terms = []
        for i in reversed(range(len(coeffs))):
            c = coeffs[i]
            if c == 0:
                continue
            power = "" if i == 0 else "a" if i == 1 else f"a^{i}"
            terms.append(str(c) if i == 0 else power if c == 1 else f"{c}*{power}")
        return " + ".join(terms)

    def galois_field(self) -> Any:
        """The same field as a ``galois.GF`` class (same modulus); ValueError for QQ."""
        if self._galois is None:
            import galois

            if self.order is None:
                raise ValueError("QQ has no galois counterpart: galois handles finite fields only")
            coeffs = _native.field_modulus(self._native)
            if coeffs is None:
                self._galois = galois.GF(self.characteristic)
            else:
                p = self.characteristic
                code = sum(c * p**i for i, c in enumerate(coeffs))
                self._galois = galois.GF(self.order, irreducible_poly=code)
        return self._galois

    def to_galois(self, values: Union[int, Iterable[int]]) -> Any:
        """A galois FieldArray from ints (residues for GF(p), integer representations for GF(p^k))."""
        gf = self.galois_field()
        if self.degree == 1:
            p = self.characteristic
            values = values % p if isinstance(values, int) else [v % p for v in values]
        return gf(values)

    def from_galois(self, array: Any) -> Union[int, list[int]]:
        """Ints from a galois FieldArray (or scalar) of a field with the same modulus."""
        import numpy as np

        theirs = getattr(type(array), "irreducible_poly", None)
        gf = self.galois_field()
        if theirs is None or int(theirs) != int(gf.irreducible_poly) or type(array).order != gf.order:
            raise ValueError(f"{array!r} is not an array over {self}")
        flat = [int(x) for x in np.ravel(np.asarray(array.view(np.ndarray)))]
        return flat[0] if np.ndim(array) == 0 else flat

    def __str__(self) -> str:
        return self._native.spec

    def __repr__(self) -> str:
        return f"field({self._native.spec!r})"

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Field) and self._native == other._native

    def __hash__(self) -> int:
        return hash(self._native.spec)


def _is_galois_class(spec: object) -> bool:
    return isinstance(spec, type) and all(
        hasattr(spec, a) for a in ("characteristic", "degree", "irreducible_poly")
    )


def field(spec: FieldSpec) -> Field:
    """The field named by ``spec`` (see the module doc), or a ``Field`` as it is.

    Raises ``ValueError`` for a composite number, a reducible modulus or an unknown spec,
    naming what is wrong.
    """
    if isinstance(spec, Field):
        return spec
    if _is_galois_class(spec):
        coeffs = [int(c) for c in spec.irreducible_poly.coeffs[::-1]]
        return Field(_native.field_from_modulus(int(spec.characteristic), coeffs))
    if isinstance(spec, bool) or not isinstance(spec, (int, str)):
        raise ValueError(
            f"a field spec must be an int, a str, a galois.GF class or a Field, not {type(spec).__name__}"
        )
    return Field(_native.NativeField(str(spec)))
