"""The system file format: plain UTF-8 text.

``#`` starts a comment; header lines ``field: GF(7)``, ``variables: x, y, z`` and the optional
``order: grevlex``; every other non-empty line is one polynomial. Errors name the file, the line
and the column.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Iterable

from .ideals import Ideal
from .rings import PolynomialRing

HEADERS = ("field", "variables", "order")
_HEADER = re.compile(r"^\s*([A-Za-z_]+)\s*:(.*)$")
_COLUMN = re.compile(r"^column (\d+): (.*)$")


class SystemFileError(ValueError):
    """A problem in a system file, located by file, line and column."""

    def __init__(self, path: str, line: int, column: int, message: str):
        super().__init__(f"{path}:{line}:{column}: {message}")
        self.path, self.line, self.column, self.message = path, line, column, message


@dataclass
class System:
    ring: PolynomialRing
    ideal: Ideal
    path: str


def read_system(path: str) -> System:
    """Reads a system file; raises ``SystemFileError`` (a ``ValueError``) or ``OSError``."""
    with open(path, encoding="utf-8") as handle:
        return parse_system(handle, path)


def parse_system(lines: Iterable[str], path: str = "<text>") -> System:
    headers: dict[str, tuple[str, int, int]] = {}
    polys: list[tuple[str, int, int]] = []
    for number, raw in enumerate(lines, 1):
        text = raw.split("#", 1)[0].rstrip()
        if not text.strip():
            continue
        if ":" in text:  # polynomials never contain ':', so this is a header line
            key, value, col = _header(text, path, number)
            if key in headers:
                raise SystemFileError(path, number, 1, f"'{key}:' is given twice")
            if polys:
                raise SystemFileError(path, number, 1, f"header '{key}:' after the first polynomial")
            headers[key] = (value, number, col)
        else:
            indent = len(text) - len(text.lstrip())
            polys.append((text.strip(), number, indent + 1))
    for key in ("field", "variables"):
        if key not in headers:
            raise SystemFileError(path, 1, 1, f"missing header '{key}:'")
    ring = _make_ring(headers, path)
    generators = []
    for text, number, col in polys:
        try:
            generators.append(ring(text))
        except ValueError as e:
            inner = _COLUMN.match(str(e))
            if inner:
                raise SystemFileError(path, number, col + int(inner.group(1)) - 1, inner.group(2)) from None
            raise SystemFileError(path, number, col, str(e)) from None
    return System(ring, ring.ideal(generators), path)


def _header(text: str, path: str, number: int) -> tuple[str, str, int]:
    m = _HEADER.match(text)
    if not m or m.group(1) not in HEADERS:
        name = m.group(1) if m else text.split(":", 1)[0].strip()
        raise SystemFileError(path, number, 1, f"unknown header '{name}:' (expected field, variables or order)")
    value = m.group(2)
    col = m.start(2) + 1 + len(value) - len(value.lstrip())
    return m.group(1), value.strip(), col


def _make_ring(headers: dict[str, tuple[str, int, int]], path: str) -> PolynomialRing:
    field_spec, field_line, field_col = headers["field"]
    names, var_line, var_col = headers["variables"]
    order, order_line, order_col = headers.get("order", ("grevlex", 0, 0))
    from .fields import field

    try:
        f = field(field_spec)
    except ValueError as e:
        raise SystemFileError(path, field_line, field_col, str(e)) from None
    try:
        return PolynomialRing(f, names, order=order)
    except ValueError as e:
        line, col = (order_line, order_col) if "order" in str(e) else (var_line, var_col)
        raise SystemFileError(path, line, col, str(e)) from None
