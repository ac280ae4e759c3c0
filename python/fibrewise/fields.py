"""Coefficient fields: ``field(spec, modulus=None)`` and the ``Field`` object.

Specs: a prime ``7`` or ``"GF(7)"`` (any size; multi-precision above 2^63; expressions such as
``"GF(2^255-19)"`` inside GF(...)), ``"GF(2^8)"``, ``"GF(9)"``, ``"GF(3^2)"``, ``"Q"`` for the
rational numbers, or a ``galois.GF(...)`` class (its irreducible polynomial becomes the
modulus). ``field("GF(2^8)", modulus="a^8 + a^4 + a^3 + a^2 + 1")`` picks the modulus; such a
field prints (and reads back) as ``GF(2)[a]/(a^8 + a^4 + a^3 + a^2 + 1)``.

GF(p^k) is GF(p)[a]/(f). The default modulus f is the first monic irreducible polynomial of
degree k in the order of its integer representation (for GF(2^8): a^8 + a^4 + a^3 + a + 1);
note that galois's default is a Conway polynomial, so ``field(galois.GF(2**8))`` is the field
on a^8 + a^4 + a^3 + a^2 + 1. Elements of GF(p^k) appear as ints in ``terms()`` and
``evaluate()``: the integer representation Σ c_i p^i of c_0 + c_1 a + ..., as galois writes
them; ``Field.to_galois`` and ``Field.from_galois`` convert.
"""

from __future__ import annotations

import re
from numbers import Integral
from typing import Any, Iterable, Optional, TypeGuard, Union

from . import _native

FieldSpec = Union["Field", int, str, type]


class Field:
    """A coefficient field. ``str(F)`` is a spec that ``field()`` reads back."""

    __slots__ = ("_native", "_galois")

    def __init__(self, native: _native.NativeField):
        self._native = native
        self._galois: Any = None  # the galois class, made on first use

    @property
    def characteristic(self) -> int:
        return int(self._native.characteristic)

    @property
    def size(self) -> Optional[int]:
        """Number of elements q; ``None`` for Q."""
        q = self._native.size
        return None if q is None else int(q)

    @property
    def degree(self) -> int:
        """Degree k over the prime field (q = p^k); 1 for prime fields and Q."""
        return self._native.degree

    @property
    def generator(self) -> Optional[str]:
        """The name of the generator of GF(p^k) in polynomial texts (``a`` unless chosen with
        ``field(..., generator=)``); None for prime fields and Q."""
        return self._native.generator

    @property
    def modulus(self) -> Optional[str]:
        """The modulus of GF(p^k) as text in the generator (``a^8 + a^4 + a^3 + a + 1``); None
        otherwise."""
        coeffs = _native.field_modulus(self._native)
        if coeffs is None:
            return None
        return polynomial_in_generator(coeffs, self.generator or "a")

    def element_text(self, value: int) -> str:
        """An element (an int: a residue for GF(p), the integer representation for GF(p^k)) as
        text: ``3`` for GF(p), a polynomial in the generator with coefficients in [0, p) for
        GF(p^k) (``2*a + 1``)."""
        if self.degree == 1:
            return str(value)
        p = self.characteristic
        return polynomial_in_generator(
            [(value // p**i) % p for i in range(self.degree)], self.generator or "a"
        )

    def contains(self, other: FieldSpec) -> bool:
        """Whether ``other`` is (isomorphic to) a subfield of this field: GF(p^j) lies in
        GF(p^k) exactly when j divides k; Q contains only itself."""
        other = field(other)
        if self.size is None or other.size is None:
            return self.size is None and other.size is None
        return self.characteristic == other.characteristic and self.degree % other.degree == 0

    def galois_field(self) -> Any:
        """The same field as a ``galois.GF`` class (same modulus); ValueError for Q.

        Built once per field, on first use. For GF(p^k) the class is made without
        just-in-time compilation (galois's ``"python-calculate"`` mode): building a compiled
        class for a modulus other than galois's own default takes tens of seconds, far more than
        any conversion here needs. Arithmetic on large arrays is faster after
        ``F.galois_field().compile("auto")``."""
        if self._galois is None:
            import galois

            if self.size is None:
                raise ValueError("Q has no galois counterpart: galois handles finite fields only")
            coeffs = _native.field_modulus(self._native)
            if coeffs is None:
                self._galois = galois.GF(self.characteristic)
            else:
                p = self.characteristic
                code = sum(c * p**i for i, c in enumerate(coeffs))
                # galois would search a primitive element itself, which is what takes the time.
                self._galois = galois.GF(
                    self.size,
                    irreducible_poly=code,
                    verify=False,
                    primitive_element=self._primitive_element(),
                    compile="python-calculate",
                )
        return self._galois

    def _primitive_element(self) -> Optional[int]:
        """A generator of the multiplicative group of GF(q) (integer representation), found
        by the order test g^((q-1)/r) != 1 for every prime r dividing q - 1; None when q - 1 is
        too large to factor by trial division (galois then searches one itself)."""
        q = self.size
        if q is None or q - 1 >= 2**40:
            return None
        primes = _prime_factors(q - 1)
        # Powers of constants, computed by the core in a ring of one variable over this field.
        ring = _native.NativeSpace(self._native, ["u" if self.generator != "u" else "v"], "grevlex")
        for g in range(self.characteristic, q):
            c = ring.constant(g)
            if all(c.pow((q - 1) // r).terms() != [([0], 1)] for r in primes):
                return g
        return None

    def to_galois(self, values: Union[int, Iterable[int]]) -> Any:
        """A galois FieldArray from ints (residues for GF(p), integer representations for GF(p^k))."""
        gf = self.galois_field()
        if self.degree == 1:
            p = self.characteristic
            # int is an Integral; naming it lets the type checker see the rest is iterable.
            if isinstance(values, (int, Integral)):
                return gf(values % p)
            return gf([v % p for v in values])
        return gf(values)

    def from_galois(self, array: Any) -> Union[int, list[int]]:
        """Ints from a galois FieldArray (or scalar) of a field with the same modulus."""
        import numpy as np

        theirs = getattr(type(array), "irreducible_poly", None)
        gf = self.galois_field()
        if theirs is None:
            raise TypeError(f"expected a galois FieldArray over {self}, not {type(array).__name__}")
        if int(theirs) != int(gf.irreducible_poly) or type(array).order != gf.order:
            raise ValueError(f"{array!r} is not an array over {self}")
        flat = [int(x) for x in np.ravel(np.asarray(array.view(np.ndarray)))]
        return flat[0] if np.ndim(array) == 0 else flat

    def __str__(self) -> str:
        return self._native.spec

    def __repr__(self) -> str:
        return f"field({self._native.spec!r})"

    def _repr_latex_(self) -> str:
        return "$" + latex_field(str(self)) + "$"

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Field) and self._native == other._native

    def __hash__(self) -> int:
        return hash(self._native.spec)


def _prime_factors(n: int) -> list[int]:
    """The prime divisors of n, by trial division (n < 2^40: at most about a million steps)."""
    primes, d = [], 2
    while d * d <= n:
        if n % d == 0:
            primes.append(d)
            while n % d == 0:
                n //= d
        d += 1 if d == 2 else 2
    if n > 1:
        primes.append(n)
    return primes


def polynomial_in_generator(coefficients: list[int], generator: str = "a") -> str:
    """``c_0 + c_1 a + ...`` (coefficient of a^i at index i) as text, highest power first:
    ``a^8 + a^4 + a^3 + a + 1``; ``0`` when every coefficient is zero."""
    terms = []
    for i in reversed(range(len(coefficients))):
        c = coefficients[i]
        if c == 0:
            continue
        power = "" if i == 0 else generator if i == 1 else f"{generator}^{i}"
        terms.append(str(c) if i == 0 else power if c == 1 else f"{c}*{power}")
    return " + ".join(terms) or "0"


_GF = re.compile(r"GF\((\d+)(?:\^(\d+))?\)")


def latex_field(spec: str) -> str:
    """``GF(7)`` -> ``\\mathbb{F}_{7}``, ``GF(2^8)`` -> ``\\mathbb{F}_{2^{8}}``, ``Q`` -> ``\\mathbb{Q}``."""
    if spec == "Q":
        return r"\mathbb{Q}"

    def gf(m: re.Match) -> str:
        return r"\mathbb{F}_{" + m.group(1) + (f"^{{{m.group(2)}}}" if m.group(2) else "") + "}"

    return _GF.sub(gf, spec)


def _is_galois_class(spec: object) -> TypeGuard[Any]:
    return isinstance(spec, type) and all(
        hasattr(spec, a) for a in ("characteristic", "degree", "irreducible_poly")
    )


def field(spec: FieldSpec, modulus: Optional[str] = None, generator: str = "a") -> Field:
    """The field named by ``spec`` (see the module doc), or a ``Field`` as it is. ``modulus``
    (text in the generator) picks the modulus of GF(p^k); ``generator`` names the generator of
    GF(p^k), a root of the modulus, in every polynomial text (``a`` by default): with
    ``field("GF(9)", generator="w")``, ``Space(F, "x, y").parse("w*x + 1")`` reads, and such a
    field prints (and reads back) as ``GF(3)[w]/(w^2 + 1)``.

    Raises ``ValueError`` for a composite number, a reducible modulus, an unknown spec, or a
    modulus or generator name for a field without a generator (GF(p), Q), naming what is wrong,
    and ``TypeError`` for a spec, modulus or generator of the wrong type.
    """
    if modulus is not None and not isinstance(modulus, str):
        raise TypeError(f"modulus must be a str (a polynomial in {generator}), not {type(modulus).__name__}")
    if not isinstance(generator, str):
        raise TypeError(f"generator must be a str (a name such as 'a'), not {type(generator).__name__}")
    if isinstance(spec, Field) or _is_galois_class(spec):
        if modulus is not None or generator != "a":
            raise ValueError(
                f"{spec} already has its modulus and generator: pass the field spec text "
                "with modulus= and generator="
            )
        if isinstance(spec, Field):
            return spec
        coeffs = [int(c) for c in spec.irreducible_poly.coeffs[::-1]]
        return Field(_native.field_from_modulus(int(spec.characteristic), coeffs))
    if isinstance(spec, bool) or not isinstance(spec, (Integral, str)):
        raise TypeError(
            f"a field spec is an int, a str, a galois.GF class or a Field, not {type(spec).__name__}"
        )
    return Field(
        _native.NativeField(str(int(spec)) if isinstance(spec, Integral) else spec, modulus, generator)
    )


def require_finite(k: Field, what: str) -> None:
    """``ValueError`` unless ``k`` is a finite field."""
    if k.size is None:
        raise ValueError(
            f"{what} over {k}: this needs a finite field (GF(p) and GF(p^k)); over Q only the points and "
            "closed points of the system itself (zero-dimensional, no over=) are listed"
        )
