"""Finite projections (Noether normalization) with a checkable certificate, and integrality
over subalgebras.

``System.projection()`` returns a :class:`FiniteProjection`: parameters p1..pd (d = dim R/I)
such that k[p1..pd] -> R/I is injective and R/I is a finite module over it, with a monic
equation over k[p] for every variable. ``verify()`` re-checks the certificate from the ideal
alone; ``to_dict()`` / :func:`check_certificate` save and re-check it.
"""

from __future__ import annotations

import re
from functools import cached_property
from typing import TYPE_CHECKING, Optional, Sequence

from . import _native
from .names import STRATEGY_NAMES, Strategy, check_name
from .spaces import Coercible, Polynomial

if TYPE_CHECKING:
    from .systems import System

_IDENTIFIER = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")

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

    def __init__(self, system: "System", certificate: dict):
        self.system = system
        self._certificate = {k: certificate[k] for k in CERTIFICATE_KEYS}
        self.dimension: int = certificate["dimension"]
        self.parameter_symbols: list[str] = list(certificate["parameter_symbols"])
        self.coordinate_symbols: list[str] = list(certificate["coordinate_symbols"])
        self.inverse: list[str] = list(certificate["inverse"])
        self.equations: list[list[str]] = [list(e) for e in certificate["equations"]]
        self.rank: int = certificate["rank"]
        self.strategy: str = certificate["strategy"]
        self.homogeneous: bool = certificate["homogeneous"]

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
        """The certificate as plain JSON-ready data (texts, ints, bools)."""
        d = {"field": str(self.system.space.field), "variables": list(self.system.space.names)}
        d.update(self._certificate)
        return d

    def problems(self) -> list[str]:
        """What is wrong with the certificate, checked from the ideal alone (empty: it holds)."""
        return check_certificate(self._certificate, self.system)

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
        return space.system(list(self.system.equations) + [p - space.polynomial(a) for p, a in zip(self.parameters, point)])

    def __repr__(self) -> str:
        params = ", ".join(str(p) for p in self.parameters)
        return f"FiniteProjection(dimension={self.dimension}, parameters=[{params}], rank={self.rank}, strategy={self.strategy!r})"


def finite_projection(system: "System", strategy: Strategy = "auto", seed: Optional[int] = None) -> FiniteProjection:
    """A finite projection of ``system``: the simplest kind of change that works (``strategy``
    "auto"), or only "variables", "linear" or "nonlinear". ``seed`` fixes every random choice.
    A system without solutions (the unit ideal) raises ``ValueError``."""
    system = system._general()  # a Boolean system with its field equations written out
    check_name("strategy", strategy, STRATEGY_NAMES)
    if seed is not None and (not isinstance(seed, int) or isinstance(seed, bool)):
        raise TypeError(f"seed must be an int, not {type(seed).__name__}")
    if seed is not None and seed < 0:
        raise ValueError(f"seed must be non-negative, got {seed}")
    space = system.space
    # The search starts from the grevlex basis: hand over the one already computed, if any.
    grevlex = system._cached_basis("grevlex")
    certificate = _native.finite_projection(
        space._native, [g._native for g in system.equations], strategy=strategy, seed=(seed or 0) % 2**64,
        grevlex_basis=None if grevlex is None else [g._native for g in grevlex],
    )
    return FiniteProjection(system, certificate)


def check_certificate(certificate: dict, system: "System") -> list[str]:
    """The problems of a saved certificate against ``system`` (empty when it holds): unreadable
    entries, equations that are not monic or not in the ideal, coordinates that do not invert,
    a wrong dimension. Used by ``fibrewise check CERT.json SYSTEM``."""
    system = system._general()  # a Boolean system with its field equations written out
    if not isinstance(certificate, dict):
        return [f"a certificate is a dict, not {type(certificate).__name__}"]
    space = system.space
    problems = []
    if "field" in certificate and str(certificate["field"]) != str(space.field):
        problems.append(f"the certificate is over {certificate['field']}, the system over {space.field}")
    if "variables" in certificate and list(certificate["variables"]) != list(space.names):
        problems.append(f"the certificate has variables {certificate['variables']}, the system {list(space.names)}")
    if problems:
        return problems
    try:
        return _native.check_certificate(space._native, [g._native for g in system.equations], certificate)
    except ValueError as e:
        return [str(e)]


class IntegralEquation:
    """A monic relation u^m + c_{m-1} u^{m-1} + ... + c_0 = 0 of an element u over k[g1..gr]
    modulo a system's ideal. ``coefficients`` are texts [1, c_{m-1}, ..., c_0] in ``symbols`` (t1..tr,
    standing for g1..gr)."""

    def __init__(self, element: Polynomial, over: list[Polynomial], symbols: list[str], coefficients: list[str]):
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
    return [system.space.polynomial(g) for g in over]


def integral_equation(system: "System", f: Coercible, over: Sequence[Coercible]) -> Optional[IntegralEquation]:
    """The monic relation of least degree of ``f`` over k[over] in R/I, or None when ``f`` is not
    integral over it (elimination with tag variables)."""
    system = system._general()  # a Boolean system with its field equations written out
    space = system.space
    element, gs = space.polynomial(f), _over(system, over)
    found = _native.integral_equation(space._native, [g._native for g in system.equations], element._native, [g._native for g in gs])
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
    return _native.is_finite_over(space._native, [g._native for g in system.equations], [g._native for g in gs])


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
