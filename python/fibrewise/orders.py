"""Monomial orders: the names ``"lex"``, ``"grlex"``, ``"grevlex"``, and block and weight orders."""

from __future__ import annotations

from typing import Sequence, Union

BASIC_ORDERS = ("lex", "grlex", "grevlex")


class BlockOrder:
    """Product order: blocks compared in turn, each with its own order on its own variables.

    ``BlockOrder([("grevlex", ["x", "y"]), ("grevlex", ["z"])])``: every monomial with a larger
    (x, y)-part is larger, whatever z does. The blocks must partition the ring's variables.
    """

    def __init__(self, blocks: Sequence[tuple[Union[str, "WeightOrder"], Sequence[str]]]):
        self.blocks = [(order, list(names)) for order, names in blocks]
        if not self.blocks:
            raise ValueError("a block order needs at least one block")

    def __repr__(self) -> str:
        return f"BlockOrder({self.blocks!r})"

    def __eq__(self, other: object) -> bool:
        return isinstance(other, BlockOrder) and self.blocks == other.blocks

    def __hash__(self) -> int:
        return hash(repr(self))


class WeightOrder:
    """Order by the weighted degree sum(w_i * e_i) first, ties broken by ``tie``."""

    def __init__(self, weights: Sequence[int], tie: str = "grevlex"):
        self.weights = [int(w) for w in weights]
        if any(w < 0 for w in self.weights):
            raise ValueError(f"weights must be non-negative, got {self.weights}")
        self.tie = tie

    def __repr__(self) -> str:
        return f"WeightOrder({self.weights!r}, tie={self.tie!r})"

    def __eq__(self, other: object) -> bool:
        return isinstance(other, WeightOrder) and (self.weights, self.tie) == (other.weights, other.tie)

    def __hash__(self) -> int:
        return hash(repr(self))


Order = Union[str, BlockOrder, WeightOrder]


def native_order(order: Order, names: Sequence[str]):
    """The form the native module reads: a name, ("weight", w, tie) or ("block", [(o, idx)])."""
    if isinstance(order, str):
        if order not in BASIC_ORDERS:
            raise ValueError(f"unknown monomial order '{order}': expected lex, grlex or grevlex")
        return order
    if isinstance(order, WeightOrder):
        return ("weight", order.weights, native_order(order.tie, names))
    if isinstance(order, BlockOrder):
        blocks = []
        for inner, block_names in order.blocks:
            idx = []
            for n in block_names:
                if n not in names:
                    raise ValueError(f"block order: unknown variable '{n}' (the ring has {', '.join(names)})")
                idx.append(list(names).index(n))
            sub = [names[i] for i in idx]
            blocks.append((native_order(inner, sub), idx))
        return ("block", blocks)
    raise ValueError(f"not a monomial order: {order!r}")
