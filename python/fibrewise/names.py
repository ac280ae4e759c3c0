"""Names and counts the API is given: of engines, normalization strategies and monomial orders
(as ``Literal`` types), variable names with their ranges (``x0..x63``), shared by spaces, system
files and batch jobs, and limit arguments (``optional_count``).

The core holds the one list of engine and strategy names (``fibrewise._native.ENGINE_NAMES``,
``STRATEGY_NAMES``) and checks every name it is given; the ``Literal`` types here repeat them
for type checkers, and a test keeps the two equal.
"""

from __future__ import annotations

import re
from numbers import Integral
from typing import Literal, Optional, Sequence, Union, get_args

Engine = Literal["auto", "f4", "f4-sampled", "f4-signature", "buchberger"]
Strategy = Literal["auto", "variables", "linear", "nonlinear"]
OrderName = Literal["lex", "grlex", "grevlex"]

ENGINE_NAMES: tuple[str, ...] = get_args(Engine)
STRATEGY_NAMES: tuple[str, ...] = get_args(Strategy)
ORDER_NAMES: tuple[str, ...] = get_args(OrderName)


def check_name(kind: str, value: object, names: tuple[str, ...]) -> str:
    """``value`` if it is a str (TypeError otherwise). Whether it is one of ``names`` is left to
    the core for engines and strategies, which holds the one list and names the choices."""
    if not isinstance(value, str):
        raise TypeError(f"{kind} must be a str (one of {', '.join(names)}), not {type(value).__name__}")
    return value


def optional_count(name: str, value: Optional[int], least: int, most: int) -> Optional[int]:
    """A limit argument: None, or an int in [least, most] (TypeError, ValueError otherwise)."""
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, Integral):
        raise TypeError(f"{name} must be an int, not {type(value).__name__}")
    if not least <= value <= most:
        raise ValueError(f"{name} must be between {least} and {most}, got {value}")
    return int(value)


Variables = Union[str, Sequence[str]]
_RANGE = re.compile(r"^([A-Za-z_][A-Za-z0-9_]*?)(\d+)\.\.([A-Za-z_][A-Za-z0-9_]*?)(\d+)$")
# Ranges larger than this are refused before any list is built.
MAX_RANGE = 1_000_000


def expand_names(variables: Variables) -> list[str]:
    """Variable names from ``"x, y, z"``, ``"x y z"`` or a list of names; an entry ``x0..x63``
    stands for x0, x1, ..., x63. TypeError for anything but strings."""
    if isinstance(variables, str):
        items = variables.replace(",", " ").split()
    elif isinstance(variables, Sequence):
        items = []
        for v in variables:
            if not isinstance(v, str):
                raise TypeError(f"variable names must be str, not {type(v).__name__} ({v!r})")
            items.extend(v.replace(",", " ").split() or [v])
    else:
        raise TypeError(f"variables are a str or a list of str, not {type(variables).__name__}")
    names: list[str] = []
    for item in items:
        names.extend(_expand_range(item) if ".." in item else [item])
    return names


def _expand_range(item: str) -> list[str]:
    m = _RANGE.match(item)
    if not m or m.group(1) != m.group(3):
        raise ValueError(
            f"variable range '{item}': expected a name and two numbers with one prefix, such as x0..x63"
        )
    first, last = int(m.group(2)), int(m.group(4))
    if last < first:
        raise ValueError(f"variable range '{item}': {last} is below {first}")
    if last - first >= MAX_RANGE:
        raise ValueError(f"variable range '{item}': more than {MAX_RANGE} variables")
    return [f"{m.group(1)}{i}" for i in range(first, last + 1)]
