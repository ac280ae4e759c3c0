"""Human-readable reports of the command line's results: the main answer first, then short,
aligned ``label  value`` lines. Works on the JSON-ready dicts the commands compute, so the human
and the ``--json`` output always say the same thing."""

from __future__ import annotations

from fractions import Fraction
from typing import Any

STRATEGY_WORDS = {
    "variables": "no change of coordinates",
    "linear": "linear change",
    "nonlinear": "nonlinear change",
}


def aligned(rows: list[tuple[str, Any]], indent: str = "  ") -> str:
    """``label  value`` lines with the values in one column; continuation lines of a multi-line
    value are indented to that column."""
    rows = [(label, value) for label, value in rows if value is not None]
    if not rows:
        return ""
    width = max(len(label) for label, _ in rows)
    lines = []
    for label, value in rows:
        first, *rest = str(value).split("\n") or [""]
        lines.append(f"{indent}{label:<{width}}  {first}".rstrip())
        lines.extend(f"{indent}{'':<{width}}  {more}" for more in rest)
    return "\n".join(lines)


def plural(n: int, word: str) -> str:
    return f"{n} {word}{'' if n == 1 else 's'}"


def seconds(value: float | None) -> str | None:
    if value is None:
        return None
    return f"{value * 1000:.1f} ms" if value < 1 else f"{value:.2f} s"


def polynomial_in(coefficients: list, var: str) -> str:
    """``[1, 3, -2]`` -> ``1 + 3t - 2t^2`` (coefficient of var^i at index i); coefficients may be
    ints or exact fractions, as numbers or "a/b" texts."""
    terms = []
    for i, c in enumerate(coefficients):
        c = Fraction(c)
        if c == 0:
            continue
        power = "" if i == 0 else var if i == 1 else f"{var}^{i}"
        magnitude = abs(c)
        if magnitude.denominator != 1 and power:
            body = f"({magnitude}){power}"
        else:
            body = f"{magnitude}{power}" if magnitude != 1 or not power else power
        sign = "-" if c < 0 else "+"
        terms.append((sign, body))
    if not terms:
        return "0"
    first_sign, first = terms[0]
    text = ("-" if first_sign == "-" else "") + first
    return text + "".join(f" {sign} {body}" for sign, body in terms[1:])


def hilbert_series_text(series: dict) -> str:
    numerator = polynomial_in(series["numerator"], "t")
    d = series["denominator_exponent"]
    if d == 0:
        return numerator
    denominator = "(1 - t)" if d == 1 else f"(1 - t)^{d}"
    return f"({numerator}) / {denominator}"


def finite_over(norm: dict, field: str | None = None) -> str:
    """``finite over GF(7)[x + y, z] of rank 6 (linear change)``: the base ring is written with
    the field's name (``k`` only when none is known), so that a variable named k reads right."""
    params = norm.get("parameters") or []
    k = field or norm.get("field") or "k"
    base = f"{k}[{', '.join(map(str, params))}]" if params else k
    strategy = norm.get("strategy")
    how = STRATEGY_WORDS.get(strategy, strategy) if isinstance(strategy, str) else strategy
    return f"finite over {base} of rank {norm['rank']} ({how})"


def _variables(result: dict) -> str:
    return f"{', '.join(result['variables'])}  (order {result['order']})"


def _header_rows(result: dict) -> list[tuple[str, Any]]:
    field = result["field"] + (", Boolean (v^2 = v)" if result.get("boolean") else "")
    return [("field", field), ("variables", _variables(result)), ("polynomials", result["polynomials"])]


def _failed_parts(result: dict) -> list[tuple[str, Any]]:
    rows = []
    failed = result.get("failed") or {}
    if failed:
        rows.append(("failed", "\n".join(f"{step}: {message}" for step, message in failed.items())))
    return rows


# ----------------------------------------------------------------------------------------------


def render_analyze(result: dict) -> str:
    rows = _header_rows(result)
    rows.append(("dimension", result.get("dimension")))
    if "independent_variables" in result:
        rows.append(("independent variables", ", ".join(result["independent_variables"]) or "(none)"))
    rows.append(("degree", result.get("degree")))
    if "quotient_dimension" in result:
        rows.append(
            (
                "quotient dimension",
                f"{result['quotient_dimension']}  (solutions over the algebraic closure, with multiplicity)",
            )
        )
    series = result.get("hilbert")
    if series:
        kind = "graded" if series.get("graded", True) else "affine"
        rows += [
            ("Hilbert series", f"{hilbert_series_text(series)}  ({kind})"),
            ("Hilbert polynomial", polynomial_in(series["polynomial"], "s")),
            ("regularity index", series["regularity_index"]),
        ]
    if result.get("projection"):
        rows.append(("projection", finite_over(result["projection"], result["field"])))
    points = _points_text(result)
    if points is not None and result.get("points") is not None:
        points += f" over {result['field']}"
    rows.append(("points", points))
    basis = result["basis"]
    rows.append(
        (
            "Groebner basis",
            f"{plural(basis['size'], 'polynomial')}, highest degree reached "
            f"{basis['max_degree']}, {seconds(result.get('seconds_basis'))}",
        )
    )
    if result.get("solve_method"):
        rows.append(("solve method", "{method}: {reason}".format(**result["solve_method"])))
    rows += _failed_parts(result)
    skipped = {stage: why for stage, why in (result.get("skipped") or {}).items() if stage != "points"}
    if skipped:
        rows.append(("skipped", "\n".join(f"{stage}: {why}" for stage, why in skipped.items())))
    if result.get("plot"):
        rows.append(("plot", result["plot"]))
    return f"{result['file']}: {result['summary']}\n{aligned(rows)}"


def _points_text(result: dict) -> str | None:
    points = result.get("points")
    if points is None:
        skipped = result.get("points_skipped")
        return f"not counted ({skipped})" if skipped else None
    text = f"{points['affine']} affine"
    if "projective" in points:
        text += f", {points['projective']} projective"
    return text


def render_basis(result: dict) -> str:
    n = len(result["basis"])
    stats = result["stats"]
    head = (
        f"reduced Groebner basis: {plural(n, 'polynomial')} over {result['field']} in "
        f"{', '.join(result['variables'])} ({result['order']})"
    )
    body = "\n".join(f"  {g}" for g in result["basis"])
    engine = stats["engine"] + (f" ({stats['choice']})" if stats.get("choice") else "")
    tail = aligned(
        [
            ("time", seconds(result["seconds"])),
            ("engine", engine),
            ("highest degree", stats["max_degree"]),
            ("zero reductions", stats["zero_reductions"]),
        ]
    )
    return "\n".join(part for part in (head, body, tail) if part)


def render_normalize(result: dict) -> str:
    cert = result["certificate"]
    symbols = cert.get("parameter_symbols") or []
    head = f"{result['file']}: dimension {cert['dimension']}; {finite_over(cert, result['field'])}"
    rows = _header_rows(result) + [
        ("parameters", "\n".join(f"{t} = {p}" for t, p in zip(symbols, cert["parameters"])) or "(none)"),
        ("coordinates", _coordinates_text(cert)),
        ("inverse", "\n".join(f"{x} = {e}" for x, e in zip(result["variables"], cert["inverse"]))),
        (
            "equations",
            "\n".join(_equation_text(x, coeffs) for x, coeffs in zip(result["variables"], cert["equations"])),
        ),
        ("module generators", ", ".join(map(str, cert["module_generators"]))),
        ("rank", cert["rank"]),
        ("strategy", cert["strategy"]),
        ("time", seconds(result["seconds"])),
    ]
    if "verified" in result:
        rows.append(
            (
                "certificate",
                f"{'verified' if result['verified'] else 'FAILED verification'} "
                f"({seconds(result['seconds_verify'])})",
            )
        )
        rows.append(("problems", "\n".join(result["problems"]) or None))
    if result.get("saved"):
        rows.append(("saved to", result["saved"]))
    return f"{head}\n{aligned(rows)}"


def _coordinates_text(cert: dict) -> str:
    """``y1 = x + y, y2 = y``: the new coordinates, named by their symbols when the certificate
    has them (the inverse is written in those symbols)."""
    coordinates = list(map(str, cert["coordinates"]))
    symbols = cert.get("coordinate_symbols")
    if not symbols:
        return ", ".join(coordinates)
    return "\n".join(f"{s} = {c}" for s, c in zip(symbols, coordinates))


def _equation_text(x: str, coefficients: list[str]) -> str:
    """``x^m + c_{m-1} x^{m-1} + ... + c_0 = 0`` from [1, c_{m-1}, ..., c_0]; a coefficient that is
    a sum is parenthesised, a single term (``3``, ``-t1``) is not."""
    m = len(coefficients) - 1
    terms: list[tuple[str, str]] = []
    for i, c in enumerate(map(str, coefficients)):
        if c == "0":
            continue
        power = m - i
        monomial = "" if power == 0 else x if power == 1 else f"{x}^{power}"
        if " " in c:  # a sum: keep it together
            terms.append(("+", f"({c})*{monomial}" if monomial else f"({c})"))
            continue
        sign, magnitude = ("-", c[1:]) if c.startswith("-") else ("+", c)
        if not monomial:
            body = magnitude
        else:
            body = monomial if magnitude == "1" else f"{magnitude}*{monomial}"
        terms.append((sign, body))
    if not terms:
        return "0 = 0"
    sign, body = terms[0]
    text = ("-" if sign == "-" else "") + body
    return text + "".join(f" {s} {b}" for s, b in terms[1:]) + " = 0"


def render_integral(result: dict) -> str:
    k = result["field"]
    base = f"{k}[{', '.join(result['over'])}]" if result["over"] else k
    if result["integral"]:
        head = f"{result['element']} is integral over {base}, degree {result['degree']}"
        rows = [("equation", result["equation"])]
    else:
        head = f"{result['element']} is not integral over {base}"
        rows = []
    rows += [
        ("field", result["field"]),
        ("variables", _variables(result)),
        ("time", seconds(result["seconds"])),
    ]
    return f"{result['file']}: {head}\n{aligned(rows)}"


def render_points(result: dict) -> str:
    kind = "projective" if result["projective"] else "affine"
    head = f"{result['file']}: {plural(result['points'], kind + ' point')} over {result['field']}"
    return f"{head}\n{aligned(_header_rows(result) + [('time', seconds(result['seconds']))])}"


def render_check(result: dict) -> str:
    verdict = "certificate verified" if result["valid"] else "certificate REJECTED"
    rows = [("certificate", result["certificate"])] + _header_rows(result)
    rows += [("problems", "\n".join(result["problems"]) or None), ("time", seconds(result.get("seconds")))]
    return f"{result['file']}: {verdict}\n{aligned(rows)}"


def render_batch(result: dict) -> str:
    ran = result["ok"] + result["error"] + result["timeout"]
    head = f"batch {result['input']} -> {result['output']}: {plural(ran, 'job')} run"
    if result["interrupted"]:
        head += f", interrupted by {result['interrupted']} (rerun the same command to resume)"
    rows = [
        ("ok", result["ok"]),
        ("error", result["error"]),
        ("timeout", result["timeout"]),
        (
            "retried",
            f"{result['retried']} (error and timeout lines replaced)" if result.get("retried") else None,
        ),
        ("skipped", f"{result['skipped']} (already in {result['output']})"),
        (
            "lost",
            f"{result['lost']} (by the cluster; rerun the same command to run them)"
            if result.get("lost")
            else None,
        ),
        ("total in input", result["total"]),
        ("time", seconds(result["seconds"])),
    ]
    if ran and result["seconds"]:
        rows.append(("rate", f"{ran / result['seconds']:.1f} jobs/s"))
    return f"{head}\n{aligned(rows)}"


def render_curve(result: dict) -> str:
    zeta = result["zeta"]
    head = (
        f"{result['file']}: smooth {result['model']} curve of genus {result['genus']} over {result['field']}"
    )
    counts = [f"N_{b['r']} = {b['points']}  ({b['note']})" for b in result["bounds"]]
    rows = _header_rows(result) + [
        ("model", result["model"]),
        ("genus", result["genus"]),
        ("points over GF(q^r)", "\n".join(counts)),
        (
            "counted",
            f"N_1..N_{result['counted_up_to']} fibre by fibre; later N_r from L(T)"
            if result["counted_up_to"]
            else "genus 0: N_r = q^r + 1, nothing to count",
        ),
        ("L(T)", zeta["numerator"]),
        ("zeta function", f"Z(T) = L(T) / ({zeta['denominator']})"),
        (
            "Jacobian order",
            f"{zeta['jacobian_order']}  (L(1), points of the Jacobian over {result['field']})",
        ),
        ("time", seconds(result["seconds"])),
    ]
    return f"{head}\n{aligned(rows)}"
