"""Boolean systems over GF(2): every variable satisfies v^2 = v, so the solutions are the points
of GF(2)^n and the ideal is I + (x_1^2 + x_1, ..., x_n^2 + x_n).

``Space("GF(2)", "x0..x63", boolean=True)`` makes a Boolean space: its polynomials are sums of
square-free monomials (products reduce on the fly, x*x = x). The ``System`` methods dispatch here
for such spaces: bases come from the Boolean Gröbner engine of the core, with the field
equations implicit (shown only with ``field_equations=True``); solutions and counts come from the
method a cost estimate picks (exhaustive search, the engine, or a hybrid that guesses some
variables), which the caller can override and which is reported with its reason.

What the results prove: bases, counts and lists of solutions are exact. The method choice is an
estimate of running time and never changes an answer.
"""

from __future__ import annotations

import time
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Iterator, Optional

from . import _native
from .bases import BasisLimits, GroebnerStats, ReducedBasis, kept_basis
from .fields import field
from .names import optional_count
from .report import aligned, plural, seconds
from .spaces import Polynomial, Space, check_boolean_flag

if TYPE_CHECKING:
    from .fields import FieldSpec
    from .orders import Order
    from .systems import System

METHOD_NAMES = ("auto", "exhaustive", "basis", "hybrid")


@dataclass(frozen=True)
class MethodChoice:
    """How a Boolean system is (or would be) solved: ``method`` is ``"exhaustive"``,
    ``"basis"`` or ``"hybrid"`` (with ``guess`` variables guessed), ``reason`` says why in a
    sentence, ``estimates`` holds the estimated seconds of each method (``exhaustive``,
    ``basis``, ``hybrid``; None where not applicable), the hybrid's best ``hybrid_guess`` and
    the ``degree`` the engine would reach on a random system of the same shape."""

    method: str
    guess: Optional[int]
    reason: str
    estimates: dict

    @classmethod
    def _from_native(cls, d: dict) -> "MethodChoice":
        return cls(d["method"], d["guess"], d["reason"], dict(d["estimates"]))

    def to_dict(self) -> dict:
        return {
            "method": self.method,
            "guess": self.guess,
            "reason": self.reason,
            "estimates": self.estimates,
        }

    def __str__(self) -> str:
        return f"{self.method}: {self.reason}"


@dataclass(frozen=True)
class BooleanSolutions:
    """The solutions found (each a tuple of 0/1 values in the order of the variables, sorted by
    the number whose bit i is the i-th variable), their ``count`` (None when the search stopped
    at the limit), the method used and the engine's statistics when it ran."""

    points: list[tuple[int, ...]]
    count: Optional[int]
    choice: MethodChoice
    stats: Optional[GroebnerStats]


def check_method(method: object) -> str:
    """``method`` if it is a str; the core checks the name (``auto``, ``exhaustive``, ``basis``,
    ``hybrid``, or ``hybrid:K`` to guess K variables)."""
    if not isinstance(method, str):
        raise TypeError(
            f"method must be a str (one of {', '.join(METHOD_NAMES)}), not {type(method).__name__}"
        )
    return method


def _require_boolean(system: "System", what: str) -> None:
    if not system.space.boolean:
        raise ValueError(
            f"{what} is for Boolean systems (Space(..., boolean=True) or 'boolean: yes'); "
            f"this system is over {system.space.field} without the field equations"
        )


def _native_space(space: "Space") -> _native.NativeBooleanSpace:
    """The native Boolean space beside ``space`` (a space made with ``boolean=True``)."""
    if space._boolean is None:
        raise ValueError(f"{space} is not a Boolean space (made with boolean=True)")
    return space._boolean


def _gens(system: "System") -> list:
    return [g._native for g in system.equations]


def general_space(space: "Space") -> "Space":
    """The space over GF(2) with the same variables and order, without the field equations."""
    return Space(space.field, list(space.names), order=space.order)


# --- bases --------------------------------------------------------------------------------------


def basis(
    system: "System",
    order: "Order | None",
    engine: str,
    field_equations: bool,
    max_degree: int | None,
    max_matrix: int | None,
    threads: int | None,
    max_seconds: float | None = None,
) -> ReducedBasis:
    """The reduced Boolean Gröbner basis (``System.basis`` on a Boolean space); with
    ``field_equations``, the reduced Gröbner basis of the ideal with the field equations, as
    polynomials of ``general_space`` (x^2 + x is not a polynomial of the Boolean space)."""
    _require_boolean(system, "field_equations=True")
    check_boolean_flag(field_equations)
    if engine != "auto":
        raise ValueError(f"a Boolean system has one engine, the Boolean F4 (engine='auto'), not {engine!r}")
    limits = BasisLimits.checked(max_degree, max_matrix, threads, max_seconds)
    space = system.space if order is None else system.space.with_order(order)
    gens = _gens(system)
    gb = kept_basis(
        system._bases,
        system._basis_key(space.order, "boolean"),
        space,
        limits,
        lambda space, limits: _native_space(space).basis(gens, **limits.keywords()),
    )
    if not field_equations:
        return gb
    home = general_space(space)
    polys = _native_space(space).with_field_equations([g._native for g in gb])
    return ReducedBasis(home, [Polynomial(home, p) for p in polys], gb.stats)


def with_field_equations(system: "System") -> "System":
    """The same equations with x^2 + x for every variable, in ``general_space`` (what the
    general engines and the finite projections work on)."""
    _require_boolean(system, "with_field_equations()")
    space = general_space(system.space)
    equations = [str(g) for g in system.equations] + [f"{v}^2 + {v}" for v in space.names]
    general = space.system(equations)
    general.path = system.path
    return general


# --- solutions ----------------------------------------------------------------------------------


def choose_method(system: "System", method: str = "auto", threads: int | None = None) -> MethodChoice:
    """The method ``solve``/``points``/``count_points`` would use, and why (without solving)."""
    _require_boolean(system, "solve_method()")
    check_method(method)
    threads = optional_count("threads", threads, 1, 4096)
    return MethodChoice._from_native(
        _native_space(system.space).choose_method(_gens(system), method, threads)
    )


def solve(
    system: "System", method: str = "auto", limit: int | None = None, threads: int | None = None
) -> BooleanSolutions:
    """The solutions in GF(2)^n (at most ``limit``; all when None, up to 2^26 of them: beyond,
    ``fibrewise.ResourceLimit`` asks for a count or a limit) by ``method``."""
    _require_boolean(system, "solve")
    check_method(method)
    limit = optional_count("limit", limit, 0, 2**63 - 1)
    threads = optional_count("threads", threads, 1, 4096)
    points, count, choice, stats = _native_space(system.space).solve(_gens(system), method, limit, threads)
    return BooleanSolutions(
        [tuple(p) for p in points],
        None if count is None else int(count),
        MethodChoice._from_native(choice),
        None if stats is None else GroebnerStats._from_native(stats),
    )


def points(
    system: "System", over: "FieldSpec | None" = None, limit: int | None = None, method: str = "auto"
) -> Iterator[tuple[int, ...]]:
    """``System.points`` on a Boolean space: the solutions as tuples of 0/1 values."""
    _check_over(system, over)
    return iter(solve(system, method=method, limit=limit).points)


def count(system: "System", method: str = "auto", threads: int | None = None) -> int:
    """The number of solutions in GF(2)^n, by ``method`` (from the cached basis when there is
    one and the method is left to the library)."""
    _require_boolean(system, "count")
    check_method(method)
    cached = system._bases.get(system._basis_key(system.space.order, "boolean"))
    if method == "auto" and cached is not None:
        return int(_native_space(system.space).count_of_basis([g._native for g in cached]))
    threads = optional_count("threads", threads, 1, 4096)
    number, _ = _native_space(system.space).count(_gens(system), method, threads)
    return int(number)


def count_points(system: "System", over: "FieldSpec | None", projective: bool, method: str) -> int:
    """``System.count_points`` on a Boolean space. Every solution of I + (x^2 + x) has
    coordinates in GF(2), so the count over any extension GF(2^k) is the same."""
    if not isinstance(projective, bool):
        raise TypeError(f"projective must be a bool, not {type(projective).__name__}")
    if projective:
        raise ValueError(
            "projective points are not defined for a Boolean system: the field equations "
            "x^2 + x are not homogeneous"
        )
    _check_over(system, over)
    return count(system, method=method)


def _check_over(system: "System", over: "FieldSpec | None") -> None:
    if over is None:
        return
    target = field(over)
    if target.size is None or target.characteristic != 2:
        raise ValueError(f"{target} is not a finite extension of GF(2), the field of a Boolean system")


# --- command line -------------------------------------------------------------------------------


def solve_command(system: "System", method: str, limit: int | None, activity: Any) -> dict:
    """The JSON-ready result of ``fibrewise solve`` on a Boolean system file."""
    activity.set_step(f"solving (method {method})")
    start = time.perf_counter()
    found = solve(system, method=method, limit=limit)
    elapsed = time.perf_counter() - start
    return {
        "points": [[str(v) for v in p] for p in found.points],
        "count": found.count,
        "complete": found.count is not None,
        "limit": limit,
        "method": found.choice.to_dict(),
        "seconds": elapsed,
        "stats": None if found.stats is None else found.stats.to_dict(),
    }


def render_solve(result: dict) -> str:
    """The human report of ``fibrewise solve`` on a Boolean system: the count and the method,
    then one line per solution, its bits in the order of the variables."""
    count, shown = result["count"], len(result["points"])
    found = (
        plural(count, "solution")
        if count is not None
        else f"at least {plural(shown, 'solution')} (stopped at the limit)"
    )
    method = result["method"]
    how = method["method"] + (f" (guessing {method['guess']} variables)" if method.get("guess") else "")
    rows = [
        ("field", f"{result['field']}, Boolean (v^2 = v)"),
        ("variables", f"{', '.join(result['variables'])}  (order {result['order']})"),
        ("polynomials", result["polynomials"]),
        ("method", how),
        ("why", method["reason"]),
        ("time", seconds(result["seconds"])),
    ]
    lines = [f"{result['file']}: {found} in GF(2)^{len(result['variables'])}", aligned(rows)]
    if shown:
        lines.append(f"solutions (the values of {_name_span(result['variables'])}, in that order):")
        lines.extend("  " + "".join(p) for p in result["points"])
    return "\n".join(lines)


def _name_span(names: list[str]) -> str:
    return ", ".join(names) if len(names) <= 4 else f"{names[0]}, {names[1]}, ..., {names[-1]}"
