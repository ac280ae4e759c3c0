"""Single-field changes of a projection certificate, for the tamper tests (tests/test_fuzz.py).

Every change below makes a certificate that must not be accepted: a key removed or added, a value
of another type, an int moved by one, a flag flipped, another strategy, a list entry dropped,
repeated, added or altered, an equation coefficient altered. None of them can leave the claims
of the certificate true, except by accident of the particular system (handled where noted).
"""

from __future__ import annotations

import copy
from typing import Any, Iterator

#: Values of other types put in place of an entry.
OTHER_VALUES: tuple[Any, ...] = (None, True, False, 0, 1, -1, 2.5, "1", "x", [], ["1"], {}, [[]])


def altered_text(text: str) -> list[str]:
    """Texts that differ from a polynomial text as polynomials (not just in spelling); doubling
    and squaring change every polynomial but the constants 0 and 1 (doubling is 0 in
    characteristic 2, a change too)."""
    out = [f"{text} + 1", "1" if text == "0" else "0"]
    if text not in ("0", "1"):
        out += [f"2*({text})", f"({text})^2"]
    return out


def changes(cert: dict) -> Iterator[tuple[str, dict]]:
    """(description, changed certificate) for every single-field change of ``cert``."""

    def changed(key: str, value: Any) -> dict:
        out = copy.deepcopy(cert)
        out[key] = value
        return out

    for key in cert:
        out = copy.deepcopy(cert)
        del out[key]
        yield f"without {key}", out
    yield "with an extra key", {**copy.deepcopy(cert), "verified": True}
    for key, value in cert.items():
        for other in OTHER_VALUES:
            if not (type(other) is type(value) and other == value):
                yield f"{key} = {other!r}", changed(key, other)
    for key in ("dimension", "rank"):
        for delta in (-1, 1, 2):
            yield f"{key} {delta:+d}", changed(key, cert[key] + delta)
    yield "homogeneous flipped", changed("homogeneous", not cert["homogeneous"])
    for strategy in ("variables", "linear", "nonlinear", "cheating", ""):
        if strategy != cert["strategy"]:
            yield f"strategy {strategy!r}", changed("strategy", strategy)
    yield "another field", changed("field", "GF(11)" if cert["field"] != "GF(11)" else "GF(13)")
    yield "variables renamed", changed("variables", [v + "_" for v in cert["variables"]])
    if len(cert["variables"]) > 1:
        yield "variables reversed", changed("variables", list(reversed(cert["variables"])))
    for key in (
        "parameters",
        "parameter_symbols",
        "coordinates",
        "coordinate_symbols",
        "inverse",
        "module_generators",
    ):
        entries = cert[key]
        for i, entry in enumerate(entries):
            yield f"{key}[{i}] dropped", changed(key, entries[:i] + entries[i + 1 :])
            yield f"{key}[{i}] repeated", changed(key, entries[: i + 1] + entries[i:])
            for text in altered_text(entry) if "symbols" not in key else [entry + "_", "x"]:
                if text == entry:
                    continue
                yield f"{key}[{i}] = {text!r}", changed(key, entries[:i] + [text] + entries[i + 1 :])
        yield f"{key} + ['1']", changed(key, entries + ["1"])
    if len(cert["module_generators"]) > 1:
        yield "module generators cut to 1", changed("module_generators", ["1"])
    yield "module generators 1, 1, 1", changed("module_generators", ["1", "1", "1"])
    for i, equation in enumerate(cert["equations"]):
        yield (
            f"equation {i} dropped",
            changed("equations", cert["equations"][:i] + cert["equations"][i + 1 :]),
        )
        for j, c in enumerate(equation):
            for text in altered_text(c):
                if j == 0 and text == "0":
                    continue  # a leading coefficient 0 is caught as well, but also covered below
                new = copy.deepcopy(cert["equations"])
                new[i][j] = text
                yield f"equations[{i}][{j}] = {text!r}", changed("equations", new)
        new = copy.deepcopy(cert["equations"])
        new[i] = equation[1:] or ["0"]
        yield f"equation {i} lost its leading term", changed("equations", new)
        new = copy.deepcopy(cert["equations"])
        new[i] = ["2"] + equation[1:]
        yield f"equation {i} not monic", changed("equations", new)
