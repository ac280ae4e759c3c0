"""Finite projections (Noether normalization) with a checkable certificate, and integrality
over subalgebras.

``System.projection()`` returns a :class:`FiniteProjection`: parameters p1..pd (d = dim R/I)
such that k[p1..pd] -> R/I is injective and R/I is a finite module over it, with a monic
equation over k[p] for every variable. The equations can cost far more than everything else
and most callers never read them: by default (``equations="lazy"``) they are computed on first
use of ``.equations`` (or ``to_dict()``, ``verify()``, ``equation()``), from the basis that
proved finiteness; ``equations="now"`` computes them at once. ``verify()`` re-checks the
certificate from the ideal alone; ``to_dict()`` / :func:`check_certificate` save and re-check it.

What the check covers: every claim of a certificate is checked from the ideal alone, never
trusted from the certificate: its shape (every entry present, of its type, no unknown entry),
the dimension, that coordinates and inverse compose to the identity, that each equation is
monic in its variable with coefficients in the parameters and lies in the ideal, that the
module generators span R/I over k[p], the rank, the strategy's kind and the homogeneity flag.
Degrees are bounded by what the system allows before anything is expanded, so a crafted
certificate is rejected at once rather than exhausting the machine.
"""

from __future__ import annotations

import re
from functools import cached_property
from numbers import Integral
from typing import TYPE_CHECKING, Literal, Optional, Sequence, get_args

from . import _native
from .fibres import ParametricFibres
from .names import STRATEGY_NAMES, Strategy, check_name
from .spaces import Coercible, Polynomial

if TYPE_CHECKING:
    from .systems import System

_IDENTIFIER = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")

#: When a projection's monic equations are computed: on first use, or at once.
EquationsWhen = Literal["lazy", "now"]

#: Keys of ``FiniteProjection.to_dict()`` (besides ``field`` and ``variables``).
CERTIFICATE_KEYS = (
    "dimension",
    "parameters",
    "parameter_symbols",
    "coordinates",
    "coordinate_symbols",
    "inverse",
    "equations",
    "module_generators",
    "rank",
    "strategy",
    "homogeneous",
)


class CertificateError(ValueError):
    """A Noether normalization certificate that does not hold; ``problems`` lists what is wrong."""

    def __init__(self, problems: list[str]):
        super().__init__("the certificate does not hold: " + "; ".join(problems))
        self.problems = problems


def _substitute_symbols(text: str, images: dict[str, str]) -> str:
    """Replaces whole identifiers by parenthesised texts."""
    return _IDENTIFIER.sub(lambda m: f"({images[m.group(0)]})" if m.group(0) in images else m.group(0), text)


def _monic_text(variable: str, coefficients: Sequence[str]) -> str:
    """x^m + c_{m-1} x^{m-1} + ... + c_0 as text, from [1, c_{m-1}, ..., c_0]."""
    m = len(coefficients) - 1
    return " + ".join(f"({c})*({variable})^{m - k}" for k, c in enumerate(coefficients))


class FiniteProjection:
    """A finite projection (Noether normalization) of a system's solution set and its certificate.

    Attributes (also the keys of :meth:`to_dict`): ``dimension``, ``parameters`` (polynomials in
    the space), ``parameter_symbols`` (names t1..td standing for the parameters), ``coordinates``
    (an invertible change of coordinates y1..yn, y1..yd the parameters), ``coordinate_symbols``
    (names of y1..yn), ``inverse`` (each variable written in y1..yn, as text), ``equations``
    (for every variable, coefficient texts [1, c_{m-1}, ..., c_0] in the parameter symbols),
    ``module_generators``, ``rank`` (degree of the projection), ``strategy`` ("variables",
    "linear" or "nonlinear") and ``homogeneous``.
    """

    def __init__(
        self, system: "System", certificate: dict, native: Optional[_native.NativeProjection] = None
    ):
        self.system = system
        self._certificate = {k: certificate[k] for k in CERTIFICATE_KEYS}
        # The native projection computes the equations on first use; None once they are here.
        self._native = native
        if native is None:
            self._certificate["equations"] = [list(e) for e in certificate["equations"]]
        self.dimension: int = certificate["dimension"]
        self.parameter_symbols: list[str] = list(certificate["parameter_symbols"])
        self.coordinate_symbols: list[str] = list(certificate["coordinate_symbols"])
        self.inverse: list[str] = list(certificate["inverse"])
        self.rank: int = certificate["rank"]
        self.strategy: str = certificate["strategy"]
        self.homogeneous: bool = certificate["homogeneous"]
        self._fibres: Optional["ParametricFibres"] = None  # built by fiber_points on first use

    @property
    def equations(self) -> list[list[str]]:
        """For every variable, the coefficient texts [1, c_{m-1}, ..., c_0] of its monic
        equation over k[t]; computed on first use when the projection was made lazily."""
        if self._native is not None:
            self._certificate["equations"] = [list(e) for e in self._native.equations()]
            self._native = None
        return self._certificate["equations"]

    @property
    def has_equations(self) -> bool:
        """Whether the equations are computed already (reading them never fails, but may take long)."""
        return self._native is None

    # The polynomials are read from their texts on first use: a batch job only saves the texts.

    @cached_property
    def parameters(self) -> list[Polynomial]:
        return [self.system.space.parse(p) for p in self._certificate["parameters"]]

    @cached_property
    def coordinates(self) -> list[Polynomial]:
        return [self.system.space.parse(p) for p in self._certificate["coordinates"]]

    @cached_property
    def module_generators(self) -> list[Polynomial]:
        return [self.system.space.parse(p) for p in self._certificate["module_generators"]]

    @classmethod
    def from_dict(cls, certificate: dict, system: "System") -> "FiniteProjection":
        """A saved certificate (from :meth:`to_dict`) for ``system``; raises ``ValueError`` when an
        entry is missing or unreadable. Use :meth:`verify` to check it."""
        missing = [k for k in CERTIFICATE_KEYS if k not in certificate]
        if missing:
            raise ValueError(f"certificate entry '{missing[0]}' is missing")
        projection = cls(system, certificate)
        for name in ("parameters", "coordinates", "module_generators"):
            getattr(projection, name)  # read now, so that an unreadable entry raises here
        return projection

    def to_dict(self) -> dict:
        """The certificate as plain JSON-ready data (texts, ints, bools), equations included
        (computed now if they were not yet)."""
        _ = self.equations  # computes and keeps them
        d = {"field": str(self.system.space.field), "variables": list(self.system.space.names)}
        d.update(self._certificate)
        return d

    def summary(self) -> dict:
        """Every entry of :meth:`to_dict` but the equations: what a projection costs about one
        basis to find (the equations are not computed for it)."""
        d = {"field": str(self.system.space.field), "variables": list(self.system.space.names)}
        d.update((k, v) for k, v in self._certificate.items() if k != "equations")
        return d

    def problems(self) -> list[str]:
        """What is wrong with the certificate, checked from the ideal alone (empty: it holds)."""
        return check_certificate(self.to_dict(), self.system)

    def verify(self) -> bool:
        """Re-checks the whole certificate from the ideal alone, independently of how it was
        found: each equation is monic and lies in the ideal once t_j := p_j, coordinates and
        inverse compose to the identity, and d is the dimension. Returns True, or raises
        :class:`CertificateError` saying what is wrong."""
        problems = self.problems()
        if problems:
            raise CertificateError(problems)
        return True

    def equation(self, variable: str) -> Polynomial:
        """The monic equation of ``variable`` (a name) as a polynomial of the space (parameters
        substituted for their symbols); it lies in the ideal."""
        space = self.system.space
        if not isinstance(variable, str):
            raise TypeError(f"equation takes a variable name, not {type(variable).__name__}")
        if variable not in space.names:
            raise ValueError(f"unknown variable '{variable}' (the variables are {', '.join(space.names)})")
        coefficients = self.equations[space.names.index(variable)]
        images = {s: str(p) for s, p in zip(self.parameter_symbols, self.parameters)}
        return space.parse(_monic_text(variable, [_substitute_symbols(c, images) for c in coefficients]))

    def fiber(self, point: Sequence[int]) -> "System":
        """The zero-dimensional system I + (p1 - a1, ..., pd - ad) of the fibre over a point of k^d.
        Its vector-space dimension is at most ``len(module_generators)``."""
        point = list(point)
        if len(point) != self.dimension:
            raise ValueError(f"the fibre needs a point with {self.dimension} coordinates, got {len(point)}")
        space = self.system.space
        return space.system(
            list(self.system.equations) + [p - space.polynomial(a) for p, a in zip(self.parameters, point)]
        )

    def fiber_points(self, point: Sequence[int]) -> list[tuple]:
        """The rational points (tuples of ints) of the fibre over a point of k^d, from the
        parametric basis of the projection (computed on first use, then specialised: no basis
        per fibre where the specialisation is generic; see ``fibrewise.fibres``)."""
        if self._fibres is None:
            self._fibres = ParametricFibres(self.system, self.parameters)
        return self._fibres.fibre(point)

    def __repr__(self) -> str:
        params = ", ".join(str(p) for p in self.parameters)
        return f"FiniteProjection(dimension={self.dimension}, parameters=[{params}], rank={self.rank}, strategy={self.strategy!r})"


def finite_projection(
    system: "System",
    strategy: Strategy = "auto",
    seed: Optional[int] = None,
    equations: EquationsWhen = "lazy",
) -> FiniteProjection:
    """A finite projection of ``system``: the simplest kind of change that works (``strategy``
    "auto"), or only "variables", "linear" or "nonlinear". ``seed`` fixes every random choice.
    ``equations``: "lazy" (computed on first use of ``.equations``) or "now".
    A system without solutions (the unit ideal) raises ``ValueError``."""
    system = system._general()  # a Boolean system with its field equations written out
    check_name("strategy", strategy, STRATEGY_NAMES)
    if not isinstance(equations, str):
        raise TypeError(f"equations must be 'lazy' or 'now', not {type(equations).__name__}")
    if equations not in get_args(EquationsWhen):
        raise ValueError(f"equations must be 'lazy' or 'now', got {equations!r}")
    if seed is not None and (not isinstance(seed, int) or isinstance(seed, bool)):
        raise TypeError(f"seed must be an int, not {type(seed).__name__}")
    if seed is not None and seed < 0:
        raise ValueError(f"seed must be non-negative, got {seed}")
    space = system.space
    # The search starts from the grevlex basis: hand over the one already computed, if any.
    grevlex = system._cached_basis("grevlex")
    summary, native = _native.finite_projection_lazy(
        space._native,
        [g._native for g in system.equations],
        strategy=strategy,
        seed=(seed or 0) % 2**64,
        grevlex_basis=None if grevlex is None else [g._native for g in grevlex],
    )
    projection = FiniteProjection(system, summary, native)
    if equations == "now":
        _ = projection.equations  # computes and keeps them
    return projection


def check_certificate(certificate: dict, system: "System") -> list[str]:
    """The problems of a saved certificate (``FiniteProjection.to_dict()``, with its ``field``
    and ``variables``) against ``system`` (empty when it holds): missing, unknown or mistyped
    entries, equations that are not monic or not in the ideal, coordinates that do not invert,
    wrong module generators, rank, dimension, strategy or homogeneity (see the module doc).
    Used by ``fibrewise check CERT.json SYSTEM``."""
    system = system._general()  # a Boolean system with its field equations written out
    if not isinstance(certificate, dict):
        return [f"a certificate is a dict, not {type(certificate).__name__}"]
    problems = shape_problems(certificate)
    if problems:
        return problems
    space = system.space
    if "field" in certificate and str(certificate["field"]) != str(space.field):
        problems.append(f"the certificate is over {certificate['field']}, the system over {space.field}")
    if "variables" in certificate and list(certificate["variables"]) != list(space.names):
        problems.append(
            f"the certificate has variables {certificate['variables']}, the system {list(space.names)}"
        )
    if problems:
        return problems
    try:
        return _native.check_certificate(space._native, [g._native for g in system.equations], certificate)
    except ValueError as e:
        return [str(e)]


def _is_int(v: object) -> bool:
    return isinstance(v, Integral) and not isinstance(v, bool)


def _is_texts(v: object) -> bool:
    return isinstance(v, list) and all(isinstance(x, str) for x in v)


#: The type every certificate entry must have, with its description for messages.
_ENTRY_TYPES = {
    "dimension": (_is_int, "an int"),
    "parameters": (_is_texts, "a list of polynomial texts"),
    "parameter_symbols": (_is_texts, "a list of names"),
    "coordinates": (_is_texts, "a list of polynomial texts"),
    "coordinate_symbols": (_is_texts, "a list of names"),
    "inverse": (_is_texts, "a list of polynomial texts"),
    "equations": (lambda v: isinstance(v, list) and all(_is_texts(e) for e in v), "a list of lists of texts"),
    "module_generators": (_is_texts, "a list of polynomial texts"),
    "rank": (_is_int, "an int"),
    "strategy": (lambda v: v in ("variables", "linear", "nonlinear"), "one of variables, linear, nonlinear"),
    "homogeneous": (lambda v: isinstance(v, bool), "true or false"),
    "field": (lambda v: isinstance(v, str), "a field spec text"),
    "variables": (_is_texts, "a list of names"),
}


def shape_problems(certificate: dict) -> list[str]:
    """What is wrong with the shape of a certificate: missing, unknown or mistyped entries (a
    bool is not an int here, although Python counts it as one). Empty when the shape is right."""
    required = ("field", "variables") + CERTIFICATE_KEYS
    problems = [f"certificate entry '{k}' is missing" for k in required if k not in certificate]
    problems += [f"unknown certificate entry {k!r}" for k in certificate if k not in _ENTRY_TYPES]
    for key, value in certificate.items():
        check = _ENTRY_TYPES.get(key)
        if check is not None and not check[0](value):
            problems.append(f"certificate entry '{key}' must be {check[1]}, not {json_type(value)}")
    return problems


def json_type(value: object) -> str:
    """The JSON name of a value's type, as a certificate's reader sees it."""
    names = {
        bool: "a boolean",
        int: "a number",
        float: "a number",
        str: "a string",
        list: "a list",
        dict: "an object",
        type(None): "null",
    }
    return names.get(type(value), type(value).__name__)


class IntegralEquation:
    """A monic relation u^m + c_{m-1} u^{m-1} + ... + c_0 = 0 of an element u over k[g1..gr]
    modulo a system's ideal. ``coefficients`` are texts [1, c_{m-1}, ..., c_0] in ``symbols`` (t1..tr,
    standing for g1..gr)."""

    def __init__(
        self, element: Polynomial, over: list[Polynomial], symbols: list[str], coefficients: list[str]
    ):
        self.element = element
        self.over = over
        self.symbols = symbols
        self.coefficients = coefficients

    @property
    def degree(self) -> int:
        return len(self.coefficients) - 1

    def polynomial(self) -> Polynomial:
        """The relation with g_j and the element substituted: an element of the ideal."""
        images = {s: str(g) for s, g in zip(self.symbols, self.over)}
        coefficients = [_substitute_symbols(c, images) for c in self.coefficients]
        return self.element.space.parse(_monic_text(str(self.element), coefficients))

    def __str__(self) -> str:
        m = self.degree
        terms = []
        for k, c in enumerate(self.coefficients):
            power = "" if m - k == 0 else ("u" if m - k == 1 else f"u^{m - k}")
            if c == "0":
                continue
            if power == "":
                terms.append(f"({c})")
            else:
                terms.append(power if c == "1" else f"({c})*{power}")
        where = ", ".join([f"u = {self.element}"] + [f"{s} = {g}" for s, g in zip(self.symbols, self.over)])
        return f"{' + '.join(terms) or '0'} = 0 where {where}"

    def __repr__(self) -> str:
        return f"IntegralEquation({str(self)!r})"


def _over(system: "System", over: Sequence[Coercible]) -> list[Polynomial]:
    if isinstance(over, (str, Polynomial)):
        over = [over]
    if not isinstance(over, (list, tuple)):
        raise TypeError(f"over must be a list of polynomials (or texts), not {type(over).__name__}")
    return [system.space.polynomial(g) for g in over]


def integral_equation(
    system: "System", f: Coercible, over: Sequence[Coercible]
) -> Optional[IntegralEquation]:
    """The monic relation of least degree of ``f`` over k[over] in R/I, or None when ``f`` is not
    integral over it (elimination with tag variables)."""
    system = system._general()  # a Boolean system with its field equations written out
    space = system.space
    element, gs = space.polynomial(f), _over(system, over)
    found = _native.integral_equation(
        space._native, [g._native for g in system.equations], element._native, [g._native for g in gs]
    )
    if found is None:
        return None
    symbols, coefficients = found
    return IntegralEquation(element, gs, symbols, coefficients)


def is_integral(system: "System", f: Coercible, over: Sequence[Coercible]) -> bool:
    """Whether ``f`` is integral over k[over] inside R/I."""
    return integral_equation(system, f, over) is not None


def is_finite_over(system: "System", over: Sequence[Coercible]) -> bool:
    """Whether R/I is a finitely generated k[over]-module."""
    system = system._general()  # a Boolean system with its field equations written out
    space = system.space
    gs = _over(system, over)
    return _native.is_finite_over(
        space._native, [g._native for g in system.equations], [g._native for g in gs]
    )


__all__ = [
    "CertificateError",
    "IntegralEquation",
    "FiniteProjection",
    "check_certificate",
    "integral_equation",
    "is_finite_over",
    "is_integral",
    "finite_projection",
]
