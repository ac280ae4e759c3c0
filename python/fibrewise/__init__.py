"""fibrewise: exact, characteristic-aware analysis of polynomial systems.

The algorithms live in a Rust core (``fibrewise._native``); this package is the user-facing API:

>>> import fibrewise as fw
>>> V = fw.Space("GF(7)", "x, y", order="grevlex")
>>> S = V.system(["x*y - 1", "x^2 - y"])
>>> [str(g) for g in S.basis()]
['x^2 - y', 'x*y - 1', 'y^2 - x']
"""

from importlib.metadata import PackageNotFoundError, version as _version

from ._native import ParseError, ResourceLimit
from .curves import BoundCheck, Curve, Zeta
from .fields import Field, field
from .invariants import HilbertSeries
from .names import Engine, OrderName, Strategy
from .normalization import CertificateError, FiniteProjection, IntegralEquation
from .orders import BlockOrder, WeightOrder
from .solutions import ClosedPoint
from .spaces import Polynomial, Space
from .bases import GroebnerStats, ReducedBasis, StepStats
from .systems import System

__all__ = [
    "BlockOrder",
    "BoundCheck",
    "CertificateError",
    "ClosedPoint",
    "Curve",
    "Engine",
    "Field",
    "FiniteProjection",
    "GroebnerStats",
    "HilbertSeries",
    "IntegralEquation",
    "OrderName",
    "ParseError",
    "Polynomial",
    "ReducedBasis",
    "ResourceLimit",
    "Space",
    "StepStats",
    "Strategy",
    "System",
    "WeightOrder",
    "Zeta",
    "field",
]

try:
    __version__ = _version("fibrewise")
except PackageNotFoundError:  # pragma: no cover - running from a source tree without metadata
    __version__ = "unknown"
