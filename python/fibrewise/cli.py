"""The ``fibrewise`` command line.

``fibrewise SUBCOMMAND FILE [options]``; ``--json`` prints one JSON object. Bad input exits with
status 2 and one message naming the file, line and column.
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from typing import Callable, Sequence

EXIT_BAD_INPUT = 2


def _basis(args: argparse.Namespace) -> dict:
    from .systemfile import read_system

    system = read_system(args.file)
    order = args.order or system.ring.order
    start = time.perf_counter()
    gb = system.ideal.groebner_basis(order)
    seconds = time.perf_counter() - start
    return {
        "field": str(system.ring.field),
        "variables": list(system.ring.variables),
        "order": str(order),
        "basis": [str(g) for g in gb],
        "seconds": seconds,
        "stats": gb.stats.to_dict(),
    }


def _print_basis(result: dict) -> None:
    n = len(result["basis"])
    print(f"reduced Groebner basis: {n} polynomial{'s' * (n != 1)} "
          f"over {result['field']} in {', '.join(result['variables'])} ({result['order']})")
    for g in result["basis"]:
        print(f"  {g}")
    stats = result["stats"]
    print(f"time {result['seconds']:.4f} s, engine {stats['engine']}, highest degree {stats['max_degree']}, "
          f"{stats['zero_reductions']} zero reductions")


SUBCOMMANDS: dict[str, tuple[str, str, Callable, Callable]] = {
    "basis": (
        "reduced Groebner basis of a system file",
        "example: fibrewise basis examples/toy_cipher_gf101.txt --order lex",
        _basis,
        _print_basis,
    ),
}


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="fibrewise", description="Exact analysis of polynomial systems.")
    sub = parser.add_subparsers(dest="command", required=True)
    for name, (help_text, example, _, _) in SUBCOMMANDS.items():
        p = sub.add_parser(name, help=help_text, description=help_text, epilog=example)
        p.add_argument("file", help="system file (field:, variables:, order: headers, one polynomial a line)")
        p.add_argument("--json", action="store_true", help="print one JSON object")
        if name == "basis":
            p.add_argument("--order", choices=["lex", "grlex", "grevlex"], help="monomial order (default: the file's)")
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    _, _, compute, show = SUBCOMMANDS[args.command]
    try:
        result = compute(args)
    except (ValueError, OSError) as e:
        print(f"fibrewise {args.command}: error: {e}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print(f"fibrewise {args.command}: interrupted", file=sys.stderr)
        return 130
    if args.json:
        print(json.dumps(result))
    else:
        show(result)
    return 0


if __name__ == "__main__":
    sys.exit(main())
