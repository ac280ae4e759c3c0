"""Monomial orders: the names ``"lex"``, ``"grlex"``, ``"grevlex"``, and block and weight orders."""

from __future__ import annotations

from numbers import Integral
from typing import Sequence, Union

from .names import ORDER_NAMES, OrderName, check_name


class BlockOrder:
    """Product order: blocks compared in turn, each with its own order on its own variables.

    ``BlockOrder([("grevlex", ["x", "y"]), ("grevlex", ["z"])])``: every monomial with a larger
    (x, y)-part is larger, whatever z does. The blocks must partition the space's variables.
    """

    def __init__(self, blocks: Sequence[tuple[Union[OrderName, "WeightOrder"], Sequence[str]]]):
        if isinstance(blocks, (str, bytes)) or not isinstance(blocks, Sequence):
            raise TypeError(
                f"a block order takes a list of (order, variable names), not {type(blocks).__name__}"
            )
        self.blocks = []
        for block in blocks:
            if not isinstance(block, (tuple, list)) or len(block) != 2:
                raise TypeError(f"each block is a pair (order, variable names), not {block!r}")
            order, names = block
            if isinstance(names, str) or not all(isinstance(n, str) for n in names):
                raise TypeError(f"the variables of a block are a list of names, not {names!r}")
            self.blocks.append((order, list(names)))
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

    def __init__(self, weights: Sequence[int], tie: OrderName = "grevlex"):
        for w in weights:
            if isinstance(w, bool) or not isinstance(w, Integral):
                raise TypeError(f"weights must be ints, got {w!r}")
        self.weights = [int(w) for w in weights]
        if any(w < 0 for w in self.weights):
            raise ValueError(f"weights must be non-negative, got {self.weights}")
        check_name("tie order", tie, ORDER_NAMES)
        if tie not in ORDER_NAMES:
            raise ValueError(f"unknown monomial order '{tie}': expected lex, grlex or grevlex")
        self.tie: OrderName = tie

    def __repr__(self) -> str:
        return f"WeightOrder({self.weights!r}, tie={self.tie!r})"

    def __eq__(self, other: object) -> bool:
        return isinstance(other, WeightOrder) and (self.weights, self.tie) == (other.weights, other.tie)

    def __hash__(self) -> int:
        return hash(repr(self))


Order = Union[OrderName, BlockOrder, WeightOrder]


def native_order(order: Order, names: Sequence[str]):
    """The form the native module reads: a name, ("weight", w, tie) or ("block", [(o, idx)])."""
    if isinstance(order, str):
        if order not in ORDER_NAMES:
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
                    raise ValueError(
                        f"block order: unknown variable '{n}' (the variables are {', '.join(names)})"
                    )
                idx.append(list(names).index(n))
            sub = [names[i] for i in idx]
            blocks.append((native_order(inner, sub), idx))
        return ("block", blocks)
    raise TypeError(
        f"a monomial order is 'lex', 'grlex', 'grevlex', a BlockOrder or a WeightOrder, not {order!r}"
    )
