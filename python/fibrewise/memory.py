"""Memory budgets: how much memory one computation may use, written as ``"4GB"``.

A budget bounds the big allocations of a computation (matrices, products, powers, quotient
rings): when one would go over it, the computation ends in ``fibrewise.ResourceLimit`` naming
what was being built, instead of exhausting the machine or aborting the interpreter. It is not
a limit on the process as a whole (small allocations are not counted); for that, run the work
in a batch worker with ``--memory``.

Sizes: an int is a number of bytes; a text is a number with a unit, ``B``, ``KB``, ``MB``,
``GB``, ``TB`` (powers of 1000) or ``KiB``, ``MiB``, ``GiB``, ``TiB`` (powers of 1024), case
ignored, or a percentage of the machine's memory (``"50%"``). ``None`` is the default: three
quarters of the machine's memory.
"""

from __future__ import annotations

import re
from numbers import Integral
from typing import Optional, Union

Memory = Union[int, str, None]

_UNITS = {
    "": 1,
    "b": 1,
    "k": 10**3,
    "kb": 10**3,
    "m": 10**6,
    "mb": 10**6,
    "g": 10**9,
    "gb": 10**9,
    "t": 10**12,
    "tb": 10**12,
    "kib": 2**10,
    "mib": 2**20,
    "gib": 2**30,
    "tib": 2**40,
}
_SIZE = re.compile(r"^\s*(\d+(?:\.\d*)?|\.\d+)\s*([A-Za-z]*|%)\s*$")
#: Budgets are counted in 64-bit bytes.
_MOST = 2**64 - 1


def machine_memory() -> Optional[int]:
    """Bytes of memory of this machine (Linux: /proc/meminfo; elsewhere from sysconf), or None."""
    try:
        with open("/proc/meminfo", encoding="ascii") as handle:
            for line in handle:
                if line.startswith("MemTotal:"):
                    return int(line.split()[1]) * 1024
    except (OSError, ValueError, IndexError):
        pass
    try:
        import os

        return os.sysconf("SC_PAGE_SIZE") * os.sysconf("SC_PHYS_PAGES")
    except (ValueError, OSError, AttributeError):
        return None


def parse_memory(value: Memory, name: str = "memory") -> Optional[int]:
    """A budget in bytes from ``value`` (see the module doc); ``None`` stays ``None``.
    ``TypeError`` for another type, ``ValueError`` for an unreadable or non-positive size,
    both naming the argument ``name``."""
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, (Integral, str)):
        raise TypeError(
            f"{name} must be a size such as '4GB' or a number of bytes, not {type(value).__name__}"
        )
    if isinstance(value, Integral):
        number = int(value)
    else:
        number = _size_of_text(value, name)
    if not 1 <= number <= _MOST:
        raise ValueError(f"{name} must be between 1 byte and 2^64 - 1 bytes, got {value!r}")
    return number


def _size_of_text(text: str, name: str) -> int:
    m = _SIZE.match(text)
    unit = m.group(2).lower() if m else None
    if not m or (unit != "%" and unit not in _UNITS):
        raise ValueError(
            f"{name}: {text!r} is not a size (expected e.g. '4GB', '512MiB', '50%' or a number of bytes)"
        )
    amount = float(m.group(1))
    if unit == "%":
        total = machine_memory()
        if total is None:
            raise ValueError(f"{name}: {text!r} is a share of the machine's memory, which is unknown here")
        if not 0 < amount <= 100:
            raise ValueError(f"{name}: {text!r} must be a percentage between 0 and 100")
        return int(total * amount / 100)
    return int(amount * _UNITS[unit])


def format_memory(size: Optional[int]) -> str:
    """``4.0 GiB`` (binary units, as memory is counted), or ``the default`` for None."""
    if size is None:
        return "the default (3/4 of the machine's memory)"
    value, unit = float(size), "bytes"
    for bigger in ("KiB", "MiB", "GiB", "TiB"):
        if value < 1024:
            break
        value, unit = value / 1024, bigger
    return f"{size} bytes" if unit == "bytes" else f"{value:.1f} {unit}"
