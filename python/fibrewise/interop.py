"""Conversions to and from sympy, and LaTeX text for Jupyter.

sympy is optional: it is imported only by ``Polynomial.to_sympy`` and ``Space.from_sympy``.
Variables map to sympy symbols of the same names (assumptions on the symbols are ignored);
over GF(p^k) the generator is the symbol of its name (``a`` unless the field names it otherwise).
"""

from __future__ import annotations

import re
from fractions import Fraction
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from .spaces import Polynomial, Space


def _sympy():
    try:
        import sympy
    except ImportError:  # pragma: no cover - sympy is a test dependency
        raise ImportError("sympy interop needs sympy: pip install sympy") from None
    return sympy


def _digits(code: int, p: int, k: int) -> list[int]:
    """Coefficients c_0..c_{k-1} of the element with integer representation ``code``."""
    out = []
    for _ in range(k):
        code, c = divmod(code, p)
        out.append(c)
    return out


def polynomial_to_sympy(f: "Polynomial") -> Any:
    sympy = _sympy()
    space = f.space
    symbols = [sympy.Symbol(n) for n in space.names]
    k, p = space.field.degree, space.field.characteristic
    generator = sympy.Symbol(space.field.generator or "a")

    def coefficient(c: Any) -> Any:
        if isinstance(c, Fraction):
            return sympy.Rational(c.numerator, c.denominator)
        if k > 1:
            return sympy.Add(*[d * generator**i for i, d in enumerate(_digits(int(c), p, k)) if d])
        return sympy.Integer(c - p if c > p // 2 else c)

    terms = []
    for exps, c in f.terms():
        monomial = sympy.Mul(*[s**e for s, e in zip(symbols, exps) if e])
        terms.append(coefficient(c) * monomial)
    return sympy.Add(*terms)


def polynomial_from_sympy(space: "Space", expr: Any) -> "Polynomial":
    sympy = _sympy()
    if isinstance(expr, sympy.Poly):
        expr = expr.as_expr()
    if not isinstance(expr, sympy.Basic):
        raise TypeError(f"from_sympy takes a sympy expression or Poly, not {type(expr).__name__}")
    allowed = list(space.names) + ([space.field.generator] if space.field.degree > 1 else [])
    free = sorted(expr.free_symbols, key=lambda s: s.name)
    unknown = [s.name for s in free if s.name not in allowed]
    if unknown:
        raise ValueError(
            f"from_sympy: unknown symbol '{unknown[0]}' (the variables are {', '.join(space.names)})"
        )
    expr = expr.xreplace({s: sympy.Symbol(s.name) for s in free})
    gens = [sympy.Symbol(n) for n in allowed]
    try:
        poly = sympy.Poly(expr, *gens, domain="QQ")
    except (sympy.PolynomialError, sympy.CoercionFailed) as e:
        raise ValueError(f"from_sympy: {expr} is not a polynomial with rational coefficients ({e})") from None
    pieces = []
    for exps, c in poly.terms():
        factors = [f"{n}^{e}" for n, e in zip(allowed, exps) if e]
        pieces.append("*".join([f"({c.p}/{c.q})"] + factors))
    return space.parse(" + ".join(pieces) or "0")


_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")
_INDEXED = re.compile(r"([A-Za-z]+)_?(\d+)")


def _latex_name(m: re.Match) -> str:
    indexed = _INDEXED.fullmatch(m.group(0))
    return f"{indexed.group(1)}_{{{indexed.group(2)}}}" if indexed else m.group(0)


def latex_polynomial(text: str) -> str:
    """LaTeX for polynomial text as ``str()`` prints it: ``3/4*x1^2*y`` -> ``\\frac{3}{4} x_{1}^{2} y``."""
    text = re.sub(r"(\d+)/(\d+)", r"\\frac{\1}{\2}", text)
    text = _NAME.sub(_latex_name, text)
    text = re.sub(r"\^(\d+)", r"^{\1}", text)
    return text.replace("*", " ")


def latex_equations(texts: list[str]) -> str:
    """A brace of equations f = 0, one per line."""
    rows = r" \\ ".join(f"{latex_polynomial(t)} &= 0" for t in texts)
    return r"\left\{\begin{aligned}" + rows + r"\end{aligned}\right."
