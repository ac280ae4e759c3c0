"""One batch job: checking its description and computing its tasks.

A job is one JSON object, ``{"id": ..., "field": "GF(7)", "variables": ["x", "y"], "polynomials":
[...], "tasks": [...], "order": "grevlex", "boolean": false}`` (``"boolean": true``: a Boolean
system over GF(2), every variable satisfying v^2 = v). ``check_job`` validates its shape without the native
engine (so a whole input file is checked before any work starts); ``run_job`` computes the tasks
and always returns one result record ``{"id", "status", "result", "error", "seconds"}``: a failing
job becomes a record with status ``"error"``, never an exception.
"""

from __future__ import annotations

import time
from typing import Any, Callable

from .curves import curve_summary
from .names import expand_names
from .solving import solutions_task
from .spaces import Space

# Most points the "solutions" task lists unless the job gives "limit" (the result says when cut).
SOLUTIONS_LIMIT = 1000

TASK_NAMES = (
    "dimension",
    "independent_variables",
    "degree",
    "hilbert",
    "projection",
    "normalize",
    "points",
    "basis",
    "solutions",
    "curve",
    "plan",
)
DEFAULT_TASKS = ("dimension",)
JOB_KEYS = ("id", "field", "variables", "polynomials", "tasks", "order", "limit", "boolean")


class JobError(ValueError):
    """A job description that is not well-formed (reported before any work starts)."""


def job_id(obj: dict) -> str | int:
    value = obj.get("id")
    if isinstance(value, bool) or not isinstance(value, (str, int)):
        raise JobError('"id" must be a string or an integer')
    return value


def check_job(obj: Any) -> dict:
    """The job with defaults filled in; raises ``JobError`` saying which key is wrong."""
    if not isinstance(obj, dict):
        raise JobError(f"a job must be a JSON object, not {type(obj).__name__}")
    unknown = [k for k in obj if k not in JOB_KEYS]
    if unknown:
        raise JobError(f'unknown key "{unknown[0]}" (expected {", ".join(JOB_KEYS)})')
    job_id(obj)
    if not isinstance(obj.get("field"), (str, int)) or isinstance(obj.get("field"), bool):
        raise JobError('"field" must be a field spec such as "GF(7)"')
    variables = obj.get("variables")
    if not isinstance(variables, (str, list)) or not all(isinstance(v, str) for v in variables):
        raise JobError('"variables" must be a non-empty list of names (ranges such as "x0..x63" allowed)')
    try:
        variables = expand_names(variables)
    except ValueError as e:
        raise JobError(f'"variables": {e}') from None
    if not variables:
        raise JobError('"variables" must be a non-empty list of names (ranges such as "x0..x63" allowed)')
    polys = obj.get("polynomials")
    if not isinstance(polys, list) or not all(isinstance(p, str) for p in polys):
        raise JobError('"polynomials" must be a list of strings')
    tasks = obj.get("tasks", list(DEFAULT_TASKS))
    if not isinstance(tasks, list) or not tasks:
        raise JobError('"tasks" must be a non-empty list')
    for task in tasks:
        if task not in TASK_NAMES:
            raise JobError(f'unknown task "{task}" (expected {", ".join(TASK_NAMES)})')
    order = obj.get("order", "grevlex")
    if not isinstance(order, str):
        raise JobError('"order" must be "lex", "grlex" or "grevlex"')
    limit = obj.get("limit", SOLUTIONS_LIMIT)
    if isinstance(limit, bool) or not isinstance(limit, int) or limit < 1:
        raise JobError('"limit" (most points the "solutions" task lists) must be a positive integer')
    boolean = obj.get("boolean", False)
    if not isinstance(boolean, bool):
        raise JobError('"boolean" must be true or false')
    return {
        "id": obj["id"],
        "field": obj["field"],
        "variables": variables,
        "polynomials": polys,
        "tasks": tasks,
        "order": order,
        "limit": limit,
        "boolean": boolean,
    }


def _hilbert(system) -> dict:
    return system.hilbert().to_dict()


def _points(system) -> int:
    return system.count_points()


def _projection(system) -> dict | None:
    """The projection without its monic equations (``FiniteProjection.summary()``): dimension,
    parameters, coordinates, rank, module generators, strategy, at about the cost of one basis;
    ``None`` for a system without solutions, as for ``normalize``."""
    if _no_solutions(system):
        return None
    return system.projection().summary()


def _no_solutions(system) -> bool:
    basis = system.basis()
    return len(basis) == 1 and basis[0].degree() == 0


def _normalize(system) -> dict | None:
    """The certificate; ``None`` for a system without solutions (the unit ideal, dimension -1),
    which has nothing to normalize, so that its other tasks still get their answers.

    The monic equations are most of a job's time, but they are computed here, never deferred:
    they are part of the result (``to_dict()``) and they are what makes it checkable.
    Finiteness itself is proved by the pure powers in the leading ideal of the basis that the
    equations come from; the batch does not re-check the certificate (``fibrewise check``
    does, from the ideal alone) and does not claim that it did."""
    if _no_solutions(system):
        return None
    return system.projection(equations="now").to_dict()


def _curve(system) -> dict:
    """Model, genus, N_1..N_g, the zeta function and the bounds (``fibrewise.curves``)."""
    return curve_summary(system)


TASKS: dict[str, Callable[[Any], Any]] = {
    "dimension": lambda S: S.dimension(),
    "independent_variables": lambda S: [str(v) for v in S.independent_variables()],
    "degree": lambda S: S.degree(),
    "hilbert": _hilbert,
    "projection": _projection,
    "normalize": _normalize,
    "points": _points,
    "basis": lambda S: [str(g) for g in S.basis()],
    "curve": _curve,
    "plan": lambda S: S.guess_plan().to_dict(),
}


def compute_tasks(
    job: dict, on_task: Callable[[str, Any], None] | None = None, memory: int | None = None
) -> dict:
    """The results of a checked job's tasks, by task name; raises on bad input. ``on_task(name,
    value)`` hears of each task as it finishes (a batch worker passes them on at once, so that a
    job killed at its time limit keeps the tasks it finished). ``memory``: the memory budget in
    bytes of every computation of the job (None: the default)."""
    space = Space(
        job["field"], job["variables"], order=job["order"], memory=memory, boolean=job.get("boolean", False)
    )
    system = space.system(_polynomials(space, job["polynomials"]))
    tasks = {**TASKS, "solutions": lambda S: solutions_task(S, job.get("limit", SOLUTIONS_LIMIT))}
    results = {}
    for task in job["tasks"]:
        results[task] = tasks[task](system)
        if on_task is not None:
            on_task(task, results[task])
    return results


def _polynomials(space, texts: list[str]) -> list:
    polys = []
    for number, text in enumerate(texts, 1):
        try:
            polys.append(space.parse(text))
        except ValueError as e:
            raise ValueError(f"polynomial {number}: {e}") from None
    return polys


def run_job(job: dict, on_task: Callable[[str, Any], None] | None = None, memory: int | None = None) -> dict:
    """One result record for a checked job; errors become status ``"error"`` with a message."""
    start = time.perf_counter()
    record: dict[str, Any] = {"id": job["id"]}
    try:
        record["status"], record["result"] = "ok", compute_tasks(job, on_task, memory)
    except MemoryError:
        record["status"], record["error"] = "error", "out of memory"
    except Exception as e:  # noqa: BLE001 - a failing job is reported, the batch goes on
        record["status"], record["error"] = "error", _describe(e)
    record["seconds"] = round(time.perf_counter() - start, 6)
    return record


def _describe(e: Exception) -> str:
    if isinstance(e, ValueError):
        return str(e)
    return f"{type(e).__name__}: {e}"
