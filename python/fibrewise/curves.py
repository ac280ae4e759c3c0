"""Curves over finite fields: smoothness, genus, point counts over every GF(q^r), the zeta
function and the order of the Jacobian.

``System.curve()`` reads a system as a curve (see ``Curve``); everything is computed in the Rust
core (``fibrewise_core::curves``):

- homogeneous equations in three or more variables: a projective curve (one equation in P^2, a
  complete intersection of n - 2 equations in P^(n-1), or a space curve given by more equations,
  such as the twisted cubic); an affine equation in two variables:
  a hyperelliptic model y^2 + h(x)*y = f(x) with its smooth projective model, or else the
  projective closure of the plane curve;
- smoothness by the Jacobian criterion, over the algebraic closure (one Gröbner basis);
- the genus: (d - 1)(d - 2)/2 for a smooth plane curve of degree d, the arithmetic genus from the
  Hilbert polynomial for a smooth curve in P^(n-1), n >= 4, ceil(max(2 deg h, deg f)/2) - 1 for a
  hyperelliptic model;
- N_r = #C(GF(q^r)) fibre by fibre over the x-line (one root count per Frobenius orbit of x), for
  curves in P^(n-1), n >= 4, fibre by fibre over a projection onto one coordinate (one
  specialised parametric basis per Frobenius orbit of its values);
- the singular points: those with coordinates in GF(q), and every singular point over the
  algebraic closure as closed points (one Galois orbit each, with its degree and residue field);
- the zeta function Z(T) = L(T) / ((1 - T)(1 - qT)) from N_1..N_g (Weil), N_r for every r from L,
  the Jacobian's order L(1), and the Hasse–Weil and Serre bounds.

What a result proves: the counts are exact, and L(T) is the exact L-polynomial of the smooth
projective curve when the curve is geometrically irreducible, which smooth plane curves, smooth
complete intersections and smooth hyperelliptic models are. A smooth space curve given by more
than n - 2 equations is assumed to be connected (hence irreducible), not checked: for a
disconnected one the arithmetic genus, and so the zeta function, would be wrong (its counts stay
exact). Singular curves other than
hyperelliptic models are refused (``ValueError``), and so are fields where counting fibre by
fibre is out of reach (``fibrewise.ResourceLimit``: about 2^28 root counts at most, so an
elliptic curve over a 61-bit prime is refused at once rather than run for years). The zeta
function says nothing about the discrete-logarithm hardness of the Jacobian beyond its order.
"""

from __future__ import annotations

from dataclasses import dataclass
from numbers import Integral
from typing import TYPE_CHECKING, Any

from . import _native
from .solutions import ClosedPoint
from .spaces import Polynomial, Space

if TYPE_CHECKING:
    from .systems import System


def _positive_r(r: Any) -> int:
    if isinstance(r, bool) or not isinstance(r, Integral):
        raise TypeError(f"r must be an int, not {type(r).__name__}")
    value = int(r)
    if not 1 <= value <= 2**32 - 1:
        raise ValueError(f"r must be between 1 and 2^32 - 1, got {r}")
    return value


def _polynomial_text(coefficients: list[int], var: str = "T") -> str:
    """``[1, 0, -2]`` -> ``1 - 2*T^2``."""
    terms = []
    for k, a in enumerate(coefficients):
        if a == 0:
            continue
        power = "" if k == 0 else var if k == 1 else f"{var}^{k}"
        magnitude = abs(a)
        body = str(magnitude) if not power else power if magnitude == 1 else f"{magnitude}*{power}"
        terms.append(("-" if a < 0 else "+", body))
    if not terms:
        return "0"
    text = ("-" if terms[0][0] == "-" else "") + terms[0][1]
    return text + "".join(f" {sign} {body}" for sign, body in terms[1:])


@dataclass(frozen=True)
class Zeta:
    """The zeta function Z(T) = L(T) / ((1 - T)(1 - qT)) of a smooth projective curve of genus g
    over GF(q). ``l_polynomial``: a_0 = 1, a_1, ..., a_2g with L(T) = sum a_k T^k, satisfying
    the functional equation a_(2g-k) = q^(g-k) a_k."""

    q: int
    genus: int
    l_polynomial: tuple[int, ...]

    @property
    def numerator(self) -> str:
        """L(T) as text, the numerator of Z(T)."""
        return _polynomial_text(list(self.l_polynomial))

    @property
    def denominator(self) -> str:
        return f"(1 - T)*(1 - {self.q}*T)"

    @property
    def jacobian_order(self) -> int:
        """L(1): the number of GF(q)-rational points of the Jacobian."""
        return sum(self.l_polynomial)

    def points(self, r: int) -> int:
        """N_r = #C(GF(q^r)), for any r >= 1, from L(T)."""
        return _native.zeta_points(self.q, self.genus, list(self.l_polynomial), _positive_r(r))

    def satisfies_functional_equation(self) -> bool:
        """Whether q^g T^(2g) L(1/(qT)) = L(T)."""
        g, a = self.genus, self.l_polynomial
        return len(a) == 2 * g + 1 and all(a[2 * g - k] == self.q ** (g - k) * a[k] for k in range(g + 1))

    def to_dict(self) -> dict:
        return {
            "q": self.q,
            "genus": self.genus,
            "l_polynomial": list(self.l_polynomial),
            "numerator": self.numerator,
            "denominator": self.denominator,
            "jacobian_order": self.jacobian_order,
        }

    def __str__(self) -> str:
        return f"Z(T) = ({self.numerator}) / ({self.denominator})"


@dataclass(frozen=True)
class BoundCheck:
    """N_r = #C(GF(q^r)) against the Hasse–Weil bound |N - (Q + 1)| <= 2g sqrt(Q) and Serre's
    bound |N - (Q + 1)| <= g floor(2 sqrt(Q)), Q = q^r (intervals of integers, ends included).
    ``maximal``/``minimal``: the count reaches Serre's upper/lower bound (g > 0)."""

    r: int
    points: int
    hasse_weil: tuple[int, int]
    serre: tuple[int, int]
    within: bool
    maximal: bool
    minimal: bool

    @property
    def note(self) -> str:
        if not self.within:
            return "outside the bounds: not a smooth projective geometrically irreducible curve of this genus"
        if self.maximal:
            return "maximal: the count reaches Serre's upper bound"
        if self.minimal:
            return "minimal: the count reaches Serre's lower bound"
        return "within the Hasse-Weil and Serre bounds"

    def to_dict(self) -> dict:
        return {
            "r": self.r,
            "points": self.points,
            "hasse_weil": list(self.hasse_weil),
            "serre": list(self.serre),
            "within": self.within,
            "maximal": self.maximal,
            "minimal": self.minimal,
            "note": self.note,
        }


class Curve:
    """A curve over a finite field, read from a ``System`` (``System.curve()``).

    ``model``: ``"plane"``, ``"complete intersection"``, ``"space curve"`` (more equations than a
    complete intersection), ``"plane closure"`` (the projective closure of an affine plane curve)
    or ``"hyperelliptic"`` (y^2 + h(x)*y = f(x) with its smooth
    projective model). Counts are on the smooth projective model.
    """

    def __init__(self, system: "System"):
        self.system = system
        self._native = _native.curve_of(system.space._native, [g._native for g in system.equations])
        self._counts: dict[int, int] = {}
        self._zeta: Zeta | None = None

    @property
    def model(self) -> str:
        return self._native.model()

    @property
    def q(self) -> int:
        """The size of the field of definition."""
        size = self.system.space.field.size
        if size is None:
            raise TypeError("q is the size of a finite field; this curve is over Q")
        return size

    def is_smooth(self) -> bool:
        """Whether the model has no singular point over the algebraic closure (Jacobian
        criterion; for a hyperelliptic equation, its smooth model: the affine curve and its
        points at infinity)."""
        return self._native.is_smooth()

    def singular_points(self) -> list[tuple]:
        """The singular points with coordinates in the field: projective points (first nonzero
        coordinate 1) in the coordinates ``coordinate_names``, or affine points of a
        hyperelliptic equation. A curve may be singular only at points over extensions: then
        this list is empty and ``is_smooth()`` is False."""
        return [tuple(p) for p in self._native.singular_points()]

    def singular_closed_points(self) -> list[ClosedPoint]:
        """Every singular point over the algebraic closure, one Galois orbit at a time (see
        ``ClosedPoint``): its ``degree``, ``residue_field`` GF(q^degree) and ``points()`` there.
        Projective points are normalized with their first nonzero coordinate 1 (the maximal ideal
        contains the equations of that chart), in the coordinates ``coordinate_names``; for a
        hyperelliptic equation, the affine singular points. ``ValueError`` when the singular locus
        is not finite (a multiple component)."""
        space = Space(self.system.space.field, list(self.coordinate_names), order="lex")
        return [
            ClosedPoint(space, degree, [Polynomial(space, g) for g in equations])
            for degree, equations in self._native.singular_closed_points()
        ]

    @property
    def coordinate_names(self) -> tuple[str, ...]:
        return tuple(self._native.coordinate_names())

    @property
    def genus(self) -> int:
        """The genus of the smooth projective curve; ``ValueError`` for singular curves other
        than hyperelliptic models."""
        return self._native.genus()

    def count_points(self, r: int = 1) -> int:
        """N_r = #C(GF(q^r)) on the smooth projective model."""
        r = _positive_r(r)
        if r not in self._counts:
            self._counts[r] = self._native.count_points(r)
        return self._counts[r]

    def zeta(self) -> Zeta:
        """The zeta function, from N_1..N_g (computed once)."""
        if self._zeta is None:
            q, genus, coefficients = self._native.zeta()
            self._zeta = Zeta(q, genus, tuple(int(a) for a in coefficients))
        return self._zeta

    def check_bounds(self, r: int = 1) -> BoundCheck:
        """N_r against the Hasse–Weil and Serre bounds (N_r from the zeta function when it is
        known, else counted)."""
        r = _positive_r(r)
        count = self._counts.get(r)
        if count is None:
            count = self._zeta.points(r) if self._zeta is not None else self.count_points(r)
        d = self._native.check_bounds(r, count)
        return BoundCheck(
            d["r"],
            int(d["points"]),
            tuple(d["hasse_weil"]),
            tuple(d["serre"]),
            d["within"],
            d["maximal"],
            d["minimal"],
        )

    def __repr__(self) -> str:
        return f"<Curve ({self.model}) over {self.system.space.field}: {self.system}>"


def curve_summary(system: "System", up_to: int | None = None) -> dict:
    """What ``fibrewise curve`` and the batch task ``curve`` report, as a JSON-ready dict:
    model, smoothness, singular points, genus, N_1..N_R (R = ``up_to``, default the genus, at
    least 1), the zeta function and the bounds. Singular curves out of scope raise
    ``ValueError`` naming the singular points."""
    curve = system.curve()
    result: dict[str, Any] = {"model": curve.model, "smooth": curve.is_smooth()}
    if not result["smooth"]:
        _refuse_singular(curve)
    result["genus"] = genus = curve.genus
    up_to = max(genus, 1) if up_to is None else _positive_r(up_to)
    zeta = curve.zeta()
    # N_1..N_g are counted (the zeta function is made from them); later N_r follow from L(T).
    result["points"] = {str(r): zeta.points(r) for r in range(1, up_to + 1)}
    result["counted_up_to"] = genus
    result["zeta"] = zeta.to_dict()
    result["bounds"] = [curve.check_bounds(r).to_dict() for r in range(1, up_to + 1)]
    return result


def _refuse_singular(curve: Curve) -> None:
    """Raises ``ValueError``: why a singular curve is out of scope, and where it is singular (the
    singular closed points, with their degrees)."""
    field = curve.system.space.field
    names = ", ".join(curve.coordinate_names)
    try:
        closed = curve.singular_closed_points()
        where = f"singular points in ({names}) over {field} and its extensions: " + ", ".join(
            str(p.rational_point()) if p.degree == 1 else f"the closed point {p} of degree {p.degree}"
            for p in closed
        )
    except ValueError as e:
        where = str(e)
    try:
        reason = f"genus {curve.genus}"
    except ValueError as e:
        reason = str(e)
    raise ValueError(f"{reason}; {where}")
