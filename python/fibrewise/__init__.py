"""fibrewise: exact, characteristic-aware analysis of polynomial systems.

The algorithms live in a Rust core (``fibrewise._native``); this package is the user-facing API:

>>> import fibrewise as fw
>>> R = fw.PolynomialRing("GF(7)", "x, y", order="grevlex")
>>> I = R.ideal(["x*y - 1", "x^2 - y"])
>>> list(I.groebner_basis())
[R('x^2 - y'), R('x*y - 1'), R('y^2 - x')]
"""

from ._native import ResourceLimit
from .fields import Field, field
from .ideals import ReducedBasis, GroebnerStats, Ideal
from .invariants import HilbertSeries
from .normalization import IntegralEquation, FiniteProjection
from .orders import BlockOrder, WeightOrder
from .rings import Polynomial, PolynomialRing

__all__ = [
    "BlockOrder",
    "Field",
    "ReducedBasis",
    "GroebnerStats",
    "HilbertSeries",
    "Ideal",
    "IntegralEquation",
    "FiniteProjection",
    "Polynomial",
    "PolynomialRing",
    "ResourceLimit",
    "WeightOrder",
    "field",
]

__version__ = "0.1.0"
