"""The system file format: plain UTF-8 text.

``#`` starts a comment; header lines ``field: GF(7)``, ``variables: x, y, z`` (ranges such as
``x0..x63`` allowed), the optional ``order: grevlex`` and the optional ``boolean: yes`` (GF(2)
only: every variable satisfies v^2 = v, see ``fibrewise.boolean``); every other non-empty line is
one polynomial. Errors are ``SystemFileError`` (a ``fibrewise.ParseError``) naming the file, the line
and the column.
"""

from __future__ import annotations

import re
from typing import Iterable, NamedTuple, cast

from ._native import ParseError, ResourceLimit
from .fields import field
from .names import OrderName
from .spaces import Polynomial, Space

HEADERS = ("field", "variables", "order", "boolean")
BOOLEAN_VALUES = {"yes": True, "true": True, "no": False, "false": False}
_HEADER = re.compile(r"^\s*([A-Za-z_]+)\s*:(.*)$")


class SystemFileError(ParseError):
    """A problem in a system file: ``.path``, ``.line``, ``.column`` and ``.message``."""

    def __init__(self, path: str, line: int, column: int, message: str):
        super().__init__(f"{path}:{line}:{column}: {message}")
        self.path, self.line, self.column, self.message = path, line, column, message


class SystemText(NamedTuple):
    """What a system file says: its space, its equations and the file's path
    (``System.read`` makes the system)."""

    space: Space
    equations: list[Polynomial]
    path: str


def read_system_file(path: str, memory=None) -> SystemText:
    """Reads a system file; raises ``SystemFileError`` (a ``ValueError``) or ``OSError``.
    ``memory``: the budget of the system's space (see ``Space``)."""
    with open(path, "rb") as handle:
        data = handle.read()
    return parse_system_text(_text_of(data, path).splitlines(), path, memory=memory)


def _text_of(data: bytes, path: str) -> str:
    """The file's text (UTF-8, a byte-order mark accepted); an error naming the file, line and
    column of the first byte that is not UTF-8."""
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data.count(b"\n", 0, e.start) + 1
        column = e.start - (data.rfind(b"\n", 0, e.start) + 1) + 1
        raise SystemFileError(
            path, line, column, f"not UTF-8 text (byte 0x{data[e.start]:02x}); save the file as UTF-8"
        ) from None


def parse_system_text(lines: Iterable[str], path: str = "<text>", memory=None) -> SystemText:
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
    space = _make_space(headers, path, memory)
    equations = []
    for text, number, col in polys:
        try:
            equations.append(space.parse(text))
        except ParseError as e:
            # The text is one line of the file: its column counts from the polynomial's start.
            raise SystemFileError(path, number + e.line - 1, col + e.column - 1, e.message) from None
        except ValueError as e:
            raise SystemFileError(path, number, col, str(e)) from None
        except ResourceLimit as e:
            raise ResourceLimit(f"{path}:{number}: {e}") from None
    return SystemText(space, equations, path)


def _header(text: str, path: str, number: int) -> tuple[str, str, int]:
    m = _HEADER.match(text)
    if not m or m.group(1) not in HEADERS:
        name = m.group(1) if m else text.split(":", 1)[0].strip()
        raise SystemFileError(path, number, 1, f"unknown header '{name}:' (expected {', '.join(HEADERS)})")
    value = m.group(2)
    col = m.start(2) + 1 + len(value) - len(value.lstrip())
    return m.group(1), value.strip(), col


def _make_space(headers: dict[str, tuple[str, int, int]], path: str, memory=None) -> Space:
    field_spec, field_line, field_col = headers["field"]
    names, var_line, var_col = headers["variables"]
    order, order_line, order_col = headers.get("order", ("grevlex", 0, 0))
    try:
        f = field(field_spec)
    except ValueError as e:
        raise SystemFileError(path, field_line, field_col, str(e)) from None
    boolean = _boolean_header(headers, f, path)
    try:
        # The file's text as it is: Space checks the name and says what is wrong.
        return Space(f, names, order=cast(OrderName, order), boolean=boolean, memory=memory)
    except ValueError as e:
        line, col = (order_line, order_col) if "order" in str(e) else (var_line, var_col)
        raise SystemFileError(path, line, col, str(e)) from None


def _boolean_header(headers: dict[str, tuple[str, int, int]], f, path: str) -> bool:
    """The ``boolean:`` header: yes/no (or true/false); yes only over GF(2)."""
    if "boolean" not in headers:
        return False
    value, line, col = headers["boolean"]
    if value.lower() not in BOOLEAN_VALUES:
        raise SystemFileError(path, line, col, f"'boolean:' is yes or no, not {value!r}")
    boolean = BOOLEAN_VALUES[value.lower()]
    if boolean and str(f) != "GF(2)":
        raise SystemFileError(
            path, line, col, f"'boolean: yes' needs the field GF(2); the file's field is {f}"
        )
    return boolean
