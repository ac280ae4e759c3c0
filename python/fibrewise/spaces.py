"""Spaces (affine space over a field with named coordinates and a monomial order) and their
polynomials.

``Space("GF(7)", "x, y, z", order="grevlex")``: variables as a comma- or space-separated string
or a list of names, with ranges ``x0..x63``; the first variable is the largest. ``V.variables``
are the coordinates as polynomials, ``V.parse(text)`` reads a polynomial, ``V.system([...])``
makes a system of equations.
"""

from __future__ import annotations

from fractions import Fraction
from functools import cached_property
from numbers import Integral, Rational
from typing import TYPE_CHECKING, Any, ClassVar, Iterable, Mapping, Sequence, Union

from . import _native
from .fields import Field, FieldSpec, field
from .interop import latex_polynomial, polynomial_from_sympy, polynomial_to_sympy
from .memory import Memory, parse_memory
from .names import Variables, expand_names
from .orders import Order, native_order

if TYPE_CHECKING:
    from .systems import System

# What the API accepts where a polynomial of a space is wanted: a polynomial of the space, its
# text, an int or a fraction (constants), a galois scalar of the field, or a sympy expression.
Coercible = Union["Polynomial", str, int, Fraction, Any]


class Space:
    """Affine space k^n with named coordinates and a monomial order (the default for bases).

    ``Space("GF(7)", "x, y, z", order="grevlex")``. Polynomials move freely between spaces that
    differ only in the order.

    >>> V = Space("GF(7)", "x, y")
    >>> x, y = V.variables
    >>> str((x + y) ** 7)  # the Frobenius: (x + y)^p = x^p + y^p in characteristic p
    'x^7 + y^7'
    >>> str(V.parse("3*x*y - 10"))  # residues print between -p/2 and p/2
    '3*x*y - 3'

    ``memory="4GB"`` (or ``"512MiB"``, ``"50%"`` of the machine, or a number of bytes; see
    ``fibrewise.memory``) is the memory budget of every computation in this space: its
    polynomials' products, powers and substitutions, and the bases, invariants, projections and
    checks of its systems. A computation that would go over it ends in ``fibrewise.ResourceLimit``
    naming what it was building. The default is three quarters of the machine's memory.

    ``Space("GF(2)", "x0..x63", boolean=True)`` is a Boolean space: every coordinate satisfies
    v^2 = v (the field equations, implicit), polynomials are sums of square-free monomials and
    the solutions of its systems are points of GF(2)^n (see ``fibrewise.boolean``).
    """

    # Set by python/fibrewise/systems.py to ``System``: spaces sit below systems in the module
    # layers (DEVELOPERS.md), so a space makes its systems through this factory.
    _system_type: ClassVar[type["System"]]

    def __init__(
        self,
        field_spec: FieldSpec,
        variables: Variables,
        order: Order = "grevlex",
        boolean: bool = False,
        *,
        memory: Memory = None,
    ):
        self.field: Field = field(field_spec)
        self.names: tuple[str, ...] = tuple(expand_names(variables))
        self.order: Order = order
        self.boolean: bool = check_boolean_flag(boolean)
        self.memory: int | None = parse_memory(memory)
        self._native = _native.NativeSpace(
            self.field._native, list(self.names), native_order(order, self.names), memory=self.memory
        )
        self._boolean = _native.NativeBooleanSpace(self._native) if boolean else None

    def with_order(self, order: Order) -> "Space":
        """The same space with another monomial order."""
        if order == self.order:
            return self
        other = Space.__new__(Space)
        other.field, other.names, other.order, other.memory = self.field, self.names, order, self.memory
        other.boolean = self.boolean
        other._native = self._native.with_order(native_order(order, self.names))
        other._boolean = _native.NativeBooleanSpace(other._native) if self.boolean else None
        return other

    def with_memory(self, memory: Memory) -> "Space":
        """The same space with another memory budget (see the class doc)."""
        return Space(self.field, self.names, self.order, memory=memory)

    @cached_property
    def variables(self) -> tuple["Polynomial", ...]:
        """The coordinates as polynomials."""
        return tuple(Polynomial(self, self._native.var(i)) for i in range(len(self.names)))

    def parse(self, text: str) -> "Polynomial":
        """A polynomial from text: ``+ - * ^ ** ( )``, integers, fractions, variable names (and
        ``a``, the generator of GF(p^k)). Raises ``fibrewise.ParseError`` with ``.line`` and
        ``.column``."""
        if not isinstance(text, str):
            raise TypeError(f"parse takes a str, not {type(text).__name__}")
        return Polynomial(self, self._native.parse(text))

    def polynomial(self, value: Coercible) -> "Polynomial":
        """``value`` as a polynomial of this space: a polynomial of the same field and variables,
        text, an int or fraction, a galois scalar of the field, or a sympy expression."""
        if isinstance(value, Polynomial):
            # Between a Boolean space and the plain one on the same coordinates, a polynomial
            # moves by its square-free representative.
            if (value.space.field, value.space.names) != (self.field, self.names):
                raise ValueError(f"{value!r} does not belong to {self}")
            return value if value.space is self else Polynomial(self, value._native)
        if isinstance(value, str):
            return self.parse(value)
        if isinstance(value, (bool, float, complex)):
            raise TypeError(
                f"a {type(value).__name__} is not an element of {self.field} (use an int or a Fraction)"
            )
        if isinstance(value, Integral):
            # As text, an int is an integer in every field (3 = 0 in GF(9)).
            return self.parse(str(int(value)))
        if isinstance(value, Rational):
            return self._fraction(Fraction(int(value.numerator), int(value.denominator)))
        if hasattr(type(value), "irreducible_poly"):  # a galois scalar
            return Polynomial(self, self._native.constant(value))
        if _is_sympy(value):
            return self.from_sympy(value)
        raise TypeError(f"cannot make a polynomial of {self} from {type(value).__name__} {value!r}")

    def _fraction(self, q: Fraction) -> "Polynomial":
        try:
            return self.parse(f"{q.numerator}/{q.denominator}")
        except ValueError:
            raise ValueError(f"{q} is not an element of {self.field}: {q.denominator} is 0 there") from None

    def from_terms(self, terms: Iterable[tuple[Sequence[int], Any]]) -> "Polynomial":
        """A polynomial from (exponent tuple, coefficient) pairs (coefficients as in ``terms()``)."""
        rows = []
        for exps, c in terms:
            for e in exps:
                if isinstance(e, bool) or not isinstance(e, Integral):
                    raise TypeError(f"exponents are ints, got {e!r}")
                if e < 0 or e >= 2**32:
                    raise ValueError(f"exponent {e} is out of range (0 to 2^32 - 1)")
            rows.append(([int(e) for e in exps], _plain_number(c)))
        return Polynomial(self, self._native.from_terms(rows))

    def system(self, equations: Union[str, Iterable[Coercible]]) -> "System":
        """The system of equations f = 0 for each given polynomial (texts, polynomials or sympy
        expressions); a single string may list them separated by commas, with optional
        surrounding parentheses, as ``str(system)`` prints."""
        return self._system_type(self, equations)

    def from_sympy(self, expr: Any) -> "Polynomial":
        """A polynomial from a sympy expression or ``sympy.Poly`` in this space's variable names
        (and ``a`` for GF(p^k)), with rational coefficients."""
        return polynomial_from_sympy(self, expr)

    def same_coordinates(self, other: "Space") -> bool:
        """Same field and variables, both Boolean or neither (the order may differ)."""
        return self.field == other.field and self.names == other.names and self.boolean == other.boolean

    def __eq__(self, other: object) -> bool:
        return isinstance(other, Space) and self.same_coordinates(other) and self.order == other.order

    def __hash__(self) -> int:
        return hash((self.field, self.names, repr(self.order), self.boolean))

    def __str__(self) -> str:
        return f"{self.field}[{', '.join(self.names)}]" + (" with v^2 = v" if self.boolean else "")

    def __repr__(self) -> str:
        flag = ", boolean=True" if self.boolean else ""
        return f"Space({str(self.field)!r}, {', '.join(self.names)!r}, order={self.order!r}{flag})"


def check_boolean_flag(value: object) -> bool:
    """``value`` if it is a bool (the ``boolean`` flag of spaces and ``field_equations``)."""
    if not isinstance(value, bool):
        raise TypeError(f"boolean must be True or False, not {type(value).__name__}")
    return value


def _plain_number(c: Any) -> Any:
    """Python's own int or Fraction for any integer or rational number type (numpy, sympy);
    anything else (a galois element) as it is."""
    if isinstance(c, bool):
        return c
    if isinstance(c, Integral):
        return int(c)
    if isinstance(c, Rational) and not isinstance(c, Fraction):
        return Fraction(int(c.numerator), int(c.denominator))
    return c


def _is_sympy(value: object) -> bool:
    return type(value).__module__.startswith("sympy")


class Polynomial:
    """A polynomial on a ``Space``. Immutable; ``str()`` is text that ``Space.parse`` reads back."""

    __slots__ = ("space", "_native")

    def __init__(self, space: Space, native: _native.NativePoly):
        self.space = space
        # In a Boolean space every exponent above 0 is 1 (v^2 = v): products reduce on the fly.
        self._native = native if space._boolean is None else space._boolean.reduce(native)

    def _coerce(self, other: object) -> "Polynomial | None":
        if isinstance(other, Polynomial):
            return other
        if isinstance(other, (str, bool, float, complex)):
            return None  # text is read only by Space.parse; floats are not field elements
        try:
            return self.space.polynomial(other)
        except TypeError:
            return None

    def _binary(self, other, op, reflected=False):
        o = self._coerce(other)
        if o is None:
            return NotImplemented
        a, b = (o, self) if reflected else (self, o)
        return Polynomial(a.space, getattr(a._native, op)(b._native))

    def __add__(self, other):
        return self._binary(other, "add")

    def __radd__(self, other):
        return self._binary(other, "add", reflected=True)

    def __sub__(self, other):
        return self._binary(other, "sub")

    def __rsub__(self, other):
        return self._binary(other, "sub", reflected=True)

    def __mul__(self, other):
        return self._binary(other, "mul")

    def __rmul__(self, other):
        return self._binary(other, "mul", reflected=True)

    def __truediv__(self, other):
        """Division by a nonzero constant."""
        o = self._coerce(other)
        if o is None:
            return NotImplemented
        if o.degree() > 0:
            raise ValueError(f"division by the non-constant polynomial {o}")
        if not o:
            raise ZeroDivisionError(f"division by zero in {self.space.field}")
        return self * self.space.parse(f"1/({o})")

    def __neg__(self):
        return Polynomial(self.space, self._native.neg())

    def __pos__(self):
        return self

    def __pow__(self, e: int):
        if isinstance(e, bool) or not isinstance(e, Integral):
            raise TypeError(f"polynomial powers need an int exponent, not {type(e).__name__}")
        if e < 0:
            raise ValueError(f"polynomial powers need a non-negative exponent, got {e}")
        if e >= 2**64:
            raise ValueError(f"exponent {e} is out of range (below 2^64)")
        if self.space.boolean and e > 0:  # f^2 = f when v^2 = v for every variable
            return self
        return Polynomial(self.space, self._native.pow(int(e)))

    def __eq__(self, other: object) -> bool:
        if isinstance(other, Polynomial):
            return self.space.same_coordinates(other.space) and self._native.equals(other._native)
        if isinstance(other, (str, bool, float, complex)):
            return NotImplemented
        try:
            o = self.space.polynomial(other)
        except (TypeError, ValueError):
            return NotImplemented
        return self._native.equals(o._native)

    def __hash__(self) -> int:
        return hash((self.space.field, self.space.names, frozenset(self.terms())))

    def __bool__(self) -> bool:
        return not self._native.is_zero()

    def __str__(self) -> str:
        return self._native.format()

    def __repr__(self) -> str:
        return f"<Polynomial {self} over {self.space}>"

    def _repr_latex_(self) -> str:
        return "$" + latex_polynomial(str(self)) + "$"

    def terms(self) -> list[tuple[tuple[int, ...], Any]]:
        """(exponent tuple, coefficient) pairs, decreasing in the space's order."""
        return [(tuple(e), c) for e, c in self._native.terms()]

    def degree(self) -> int:
        """Total degree; -1 for the zero polynomial."""
        d = self._native.degree()
        return -1 if d is None else d

    def is_homogeneous(self) -> bool:
        return self._native.is_homogeneous()

    def leading_monomial(self, order: Order | None = None) -> "Polynomial":
        """The leading monomial for ``order`` (default: the space's); zero for zero."""
        space = self.space if order is None else self.space.with_order(order)
        exps = self._native.leading_monomial(space._native)
        if exps is None:
            return self.space.polynomial(0)
        return self.space.from_terms([(exps, 1)])

    def evaluate(self, point: Union[Sequence[Any], Mapping[str, Any]]) -> Any:
        """The value at a point of k^n, given as a sequence or a {name: value} mapping."""
        names = self.space.names
        if isinstance(point, Mapping):
            missing = [v for v in names if v not in point]
            if missing:
                raise ValueError(f"evaluate: no value for {', '.join(missing)}")
            point = [point[v] for v in names]
        if isinstance(point, (str, bytes)) or not isinstance(point, Sequence):
            raise TypeError(
                f"evaluate takes a sequence or a mapping of coordinates, not {type(point).__name__}"
            )
        if len(point) != len(names):
            raise ValueError(f"evaluate: {len(point)} coordinates for {len(names)} variables")
        return self._native.evaluate(list(point))

    def substitute(self, images: Mapping[str, Coercible]) -> "Polynomial":
        """Replace variables by polynomials (or texts, or constants): ``f.substitute({"x": "y + 1"})``."""
        if not isinstance(images, Mapping):
            raise TypeError(f"substitute takes a mapping {{name: polynomial}}, not {type(images).__name__}")
        names = self.space.names
        unknown = [n for n in images if n not in names]
        if unknown:
            raise ValueError(
                f"substitute: unknown variable '{unknown[0]}' (the variables are {', '.join(names)})"
            )
        native = [self.space.polynomial(images[v])._native if v in images else None for v in names]
        return Polynomial(self.space, self._native.substitute(native))

    def to_sympy(self) -> Any:
        """The polynomial as a sympy expression in symbols of the same names: integer
        coefficients (symmetric residues) over GF(p), rationals over Q, polynomials in the
        symbol ``a`` over GF(p^k)."""
        return polynomial_to_sympy(self)
