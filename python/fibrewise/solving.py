"""Solutions as text, for the command line (``fibrewise solve``) and the batch task
``solutions``: each point a list of element texts (integers for GF(p), polynomials in the
generator ``a`` for GF(p^k)), cut at a limit with a flag that says so.

What a listed point proves: the core substitutes every point into every equation of the system
before returning it, so each printed point is a solution. The list is complete (every point with
coordinates in the field) unless it is marked truncated.
"""

from __future__ import annotations

import argparse
import time
from typing import Any, Optional

from .report import aligned, plural, seconds
from .solutions import RationalClosedPoint, closed_points, embedding, points


def solution_texts(system, limit: Optional[int], over: Optional[str] = None) -> dict:
    """``{"points": [[text, ...], ...], "truncated": bool, "field": ..., "generator_image": ...}``:
    the points over the system's field (or ``over``), at most ``limit`` of them."""
    target, image = (system, None) if over is None else embedding(system, over)
    wanted = None if limit is None else limit + 1  # one more tells whether the list was cut
    found = [[target.space.field.element_text(c) for c in p] for p in points(target, limit=wanted)]
    truncated = limit is not None and len(found) > limit
    result: dict[str, Any] = {
        "points": found[:limit] if truncated else found,
        "truncated": truncated,
        "field": str(target.space.field),
    }
    if image is not None:
        result["generator_image"] = target.space.field.element_text(image)
    return result


def closed_point_texts(system) -> list[dict]:
    """Each closed point as ``{"degree", "equations", "point"}`` (``point`` for degree 1); over
    Q also ``"form"`` u, its ``"minimal_polynomial"`` m(t) and the ``"coordinates"`` x_i = g_i(t)
    in Q[t]/(m)."""
    out = []
    for cp in closed_points(system):
        entry: dict[str, Any] = {"degree": cp.degree, "equations": [str(g) for g in cp.equations]}
        if isinstance(cp, RationalClosedPoint):
            entry.update(
                form=str(cp.form),
                minimal_polynomial=str(cp.minimal_polynomial),
                coordinates=[str(g) for g in cp.coordinates],
            )
        rational = cp.rational_point()
        if rational is not None:
            entry["point"] = [system.space.field.element_text(c) for c in rational]
        out.append(entry)
    return out


def solve_command(args: argparse.Namespace, activity, header: dict, system) -> dict:
    """The result of ``fibrewise solve`` (JSON-ready)."""
    start = time.perf_counter()
    result: dict[str, Any] = {**header, "over": args.over, "limit": args.limit}
    if args.closed_points:
        if args.over is not None:
            raise ValueError("--closed-points lists the closed points over the file's field; drop --over")
        activity.set_step("closed points")
        result["closed_points"] = closed_point_texts(system)
    else:
        activity.set_step("rational points")
        found = solution_texts(system, args.limit, args.over)
        result["points_field"] = found.pop("field")
        result.update(found)
    result["seconds"] = time.perf_counter() - start
    return result


def render_solve(result: dict) -> str:
    rows = [
        ("field", result["field"]),
        ("variables", ", ".join(result["variables"])),
        ("polynomials", result["polynomials"]),
    ]
    if "closed_points" in result:
        found = result["closed_points"]
        degrees = sorted({p["degree"] for p in found})
        by_degree = ", ".join(f"{sum(p['degree'] == d for p in found)} of degree {d}" for d in degrees)
        head = f"{result['file']}: {plural(len(found), 'closed point')} over {result['field']}"
        head += f" ({by_degree})" if found else ""
        lines = [_closed_point_line(result["variables"], p) for p in found]
    else:
        found = result["points"]
        where = result["points_field"]
        more = " (truncated at --limit; there are more)" if result["truncated"] else ""
        head = f"{result['file']}: {plural(len(found), 'point')} over {where}{more}"
        if result.get("generator_image"):
            rows.append(("embedding", f"a of {result['field']} -> {result['generator_image']} in {where}"))
        lines = [_point_line(result["variables"], p) for p in found]
    rows.append(("checked", "every point satisfies every equation (substituted before printing)"))
    rows.append(("time", seconds(result["seconds"])))
    return "\n".join([head, *lines, aligned(rows)])


def _point_line(names: list[str], values: list[str]) -> str:
    return ", ".join(f"{x} = {v}" for x, v in zip(names, values))


def _closed_point_line(names: list[str], point: dict) -> str:
    if "point" in point:
        return _point_line(names, point["point"])
    if "minimal_polynomial" in point:
        return (
            f"degree {point['degree']}: "
            + _point_line(names, point["coordinates"])
            + f", where t = {point['form']} is a root of {point['minimal_polynomial']}"
        )
    return f"degree {point['degree']}: " + ", ".join(f"{g} = 0" for g in point["equations"])


def solutions_task(system, limit: int) -> dict:
    """The batch task ``solutions``: ``{"points": [[text, ...], ...], "truncated": bool}``."""
    found = solution_texts(system, limit)
    return {"points": found["points"], "truncated": found["truncated"]}
