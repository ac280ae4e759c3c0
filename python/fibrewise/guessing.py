"""Guess and determine: a measured plan of which variables to guess (``System.guess_plan``,
``fibrewise plan``, the batch task ``plan``).

Guessing k variables turns one system into q^k smaller ones (the hybrid approach,
Bettale–Faugère–Perret 2009). For k = 0, 1, ..., the plan chooses the k variables (the
parameters of a finite projection first, whose fibres are finite; then, greedily, the variable
whose guess gives the cheapest specialised systems, measured), solves ``samples`` specialised
systems with random guesses (one thread each, timed in CPU seconds) and reports, per k: the variables, the median
time and the solving degree (highest degree of a matrix) of one specialised system, its largest
matrix, q^k, the expected total time q^k × median and the expected memory of one system; and
the best k. Beside them: the cost of exhaustive search, and the degree of regularity of a
semi-regular sequence with the same degrees in n − k variables, the first non-positive
coefficient of prod(1 − z^d_i) / (1 − z)^(n−k) (over a Boolean space (1 + z)^(n−k) /
prod(1 + z^d_i)); Bardet, Faugère and Salvy 2004.

Each sample solve has a budget of wall-clock seconds (``budget``, default 10 s): a sample
that goes over is stopped by the engine itself (a time limit on its computation, checked like
Ctrl-C), no further samples of that k are run, and the row is marked over budget: its times
are the CPU time spent until the stop, lower bounds of the true cost. The best k is chosen among
the rows measured in full when there are any.

What a plan says: measured times of a few random guesses on this machine, extrapolated. It is
an estimate, not a bound: guesses whose systems are harder than the samples (or the right guess,
whose system has a solution) can cost more; the semi-regular degree is a prediction for generic
dense systems, and structured systems may fall far below it (or, rarely, above).
"""

from __future__ import annotations

import math
import random
import statistics
import time
from dataclasses import asdict, dataclass
from dataclasses import field as dataclass_field
from typing import TYPE_CHECKING, Any, Callable, Optional, TypeVar

from ._native import ResourceLimit
from .names import optional_count
from .report import aligned, seconds

if TYPE_CHECKING:
    from .bases import GroebnerStats
    from .systems import System

T = TypeVar("T")

# Bytes per non-zero entry of a matrix (a coefficient and a column index): common practice.
BYTES_PER_ENTRY = 16
# Without max_guess, k stops growing once q^k times the cheapest system seen so far costs this
# many times the best total: no larger k can then win unless single systems get cheaper still.
HOPELESS = 1000.0
# Random points at which the equations are evaluated to price exhaustive search.
EVALUATION_SAMPLES = 32
# Wall-clock seconds one sample solve may take by default: long enough for the systems a plan
# can recommend solving q^k times, short enough that a hopeless k = 0 does not hold up the plan.
DEFAULT_BUDGET = 10.0


@dataclass
class GuessRow:
    """One number k of guessed variables: which, and the measured cost."""

    k: int
    variables: list[str]
    samples: int
    seconds: float  # median time of one specialised system (a lower bound when over_budget)
    solving_degree: Optional[int]  # highest matrix degree (median over the samples run in full)
    largest_matrix: list[int]  # [rows, columns] of the largest matrix of any sample
    guesses: int  # q^k
    total_seconds: float  # guesses × seconds
    memory_bytes: int  # the largest matrix of one system
    predicted_degree: Optional[int]  # semi-regular degree of regularity in n − k variables
    over_budget: bool = False  # a sample was stopped at the budget: the times are lower bounds


@dataclass
class GuessPlan:
    """The plan: ``rows`` (one :class:`GuessRow` per k), ``best`` (the k of least expected total
    time among the rows measured in full, if any), ``exhaustive_points`` (q^n) and
    ``exhaustive_seconds`` (their evaluation at this library's speed), the field, the variables,
    the equation degrees and the ``budget`` of one sample (seconds; ``None``: none)."""

    field: str
    variables: list[str]
    degrees: list[int]
    rows: list[GuessRow] = dataclass_field(default_factory=list)
    exhaustive_points: int = 0
    exhaustive_seconds: float = 0.0
    budget: Optional[float] = DEFAULT_BUDGET

    @property
    def best(self) -> GuessRow:
        # an over-budget row's total is only a lower bound: it cannot be shown to beat a measured one
        return min(self.rows, key=lambda r: (r.over_budget, r.total_seconds, r.k))

    def to_dict(self) -> dict[str, Any]:
        d = {k: v for k, v in asdict(self).items() if k != "rows"}
        d["rows"] = [asdict(r) for r in self.rows]
        d["best"] = self.best.k
        return d

    def __str__(self) -> str:
        return render_plan(self.to_dict())


def semi_regular_degree(degrees: list[int], n: int, boolean: bool = False) -> Optional[int]:
    """The degree of regularity of a semi-regular sequence of the given degrees in n variables:
    the index of the first non-positive coefficient of prod(1 - z^d) / (1 - z)^n, or over a
    Boolean ring of (1 + z)^n / prod(1 + z^d); ``None`` when there is none (fewer equations than
    variables: the series stays positive)."""
    if n == 0:
        return 0
    bound = sum(d - 1 for d in degrees) + 2 if not boolean else n + 2
    series = _boolean_series(degrees, n, bound) if boolean else _series(degrees, n, bound)
    return next((i for i, c in enumerate(series) if c <= 0), None)


def _series(degrees: list[int], n: int, length: int) -> list[int]:
    coefficients = [1] + [0] * (length - 1)
    for d in degrees:  # times (1 - z^d)
        coefficients = [c - (coefficients[i - d] if i >= d else 0) for i, c in enumerate(coefficients)]
    for _ in range(n):  # divided by (1 - z): prefix sums
        for i in range(1, length):
            coefficients[i] += coefficients[i - 1]
    return coefficients


def _boolean_series(degrees: list[int], n: int, length: int) -> list[int]:
    from math import comb

    coefficients = [comb(n, i) for i in range(length)]
    for d in degrees:  # divided by (1 + z^d): c_i -= c_{i-d}, in increasing i
        for i in range(d, length):
            coefficients[i] -= coefficients[i - d]
    return coefficients


def guess_plan(
    system: "System",
    max_guess: Optional[int] = None,
    samples: int = 8,
    seed: Optional[int] = None,
    *,
    budget: Optional[float] = DEFAULT_BUDGET,
) -> GuessPlan:
    """The measured guess-and-determine plan of ``system`` (see the module's description);
    ``budget``: wall-clock seconds one sample solve may take (``None`` or infinity: no limit)."""
    max_guess = optional_count("max_guess", max_guess, 0, len(system.space.names))
    checked_samples = optional_count("samples", samples, 1, 10_000)
    assert checked_samples is not None
    samples = checked_samples
    budget = check_budget(budget)
    size = system.space.field.size
    if size is None:
        raise ValueError(f"a guess plan is for finite fields; {system.space.field} is not one")
    rng = random.Random(seed)
    names = list(system.space.names)
    degrees = [g.degree() for g in system.equations]
    plan = GuessPlan(str(system.space.field), names, degrees, budget=budget)
    measure = _Sampler(system, rng, budget)
    plan.exhaustive_points = int(size) ** len(names)
    plan.exhaustive_seconds = plan.exhaustive_points * _evaluation_seconds(system, rng)
    parameters = _parameter_names(system, budget)
    chosen: list[str] = []
    last = len(names) if max_guess is None else max_guess
    for k in range(last + 1):
        if k > 0:
            chosen.append(parameters[k - 1] if k <= len(parameters) else _cheapest_next(measure, chosen))
        plan.rows.append(measure(chosen, samples))
        if max_guess is None and _hopeless(plan):
            break
    return plan


def check_budget(budget: Optional[float]) -> Optional[float]:
    """The budget of one sample in seconds: a positive number; ``None`` or infinity for none."""
    if budget is None or budget == math.inf:
        return None
    if isinstance(budget, bool) or not isinstance(budget, (int, float)) or not 0 < budget < math.inf:
        raise ValueError(
            f"budget must be a positive number of seconds (or None for no limit), not {budget!r}"
        )
    return float(budget)


def _parameter_names(system: "System", budget: Optional[float]) -> list[str]:
    """The guesses that cost nothing to choose: a maximal independent set of variables (the
    parameters of a finite projection by variables; empty for a system of dimension <= 0, and
    when the basis that tells them takes longer than the budget: the choice is then greedy)."""
    # the basis dimension() reads, computed within the budget (and kept by the system)
    if (
        _within_budget(budget, lambda s: system.basis(field_equations=system.space.boolean, max_seconds=s))
        is None
    ):
        return []
    if system.dimension() <= 0:
        return []
    return [str(v) for v in system.independent_variables()]


def _hopeless(plan: GuessPlan) -> bool:
    cheapest = min(r.seconds for r in plan.rows)
    return plan.rows[-1].guesses * cheapest > HOPELESS * plan.best.total_seconds


def _cheapest_next(measure: "_Sampler", chosen: list[str]) -> str:
    """The variable whose guess, with ``chosen``, gives the cheapest specialised systems (two
    samples each): measured within the budget first, then lowest solving degree, then smallest
    largest matrix, then least time (the middle two do not depend on the machine's load)."""
    candidates = [x for x in measure.system.space.names if x not in chosen]

    def cost(x: str) -> tuple[bool, float, int, float]:
        row = measure(chosen + [x], 2)
        degree = math.inf if row.solving_degree is None else row.solving_degree
        return row.over_budget, degree, row.largest_matrix[0] * row.largest_matrix[1], row.seconds

    return min(candidates, key=cost)


def specialised(system: "System", guessed: list[str], values: list[int]) -> "System":
    """The system with the guessed variables replaced by the values (same space)."""
    space = system.space
    images = {x: space.polynomial(v) for x, v in zip(guessed, values)}
    return space.system([g.substitute(images) if images else g for g in system.equations])


def _within_budget(budget: Optional[float], solve: Callable[[Optional[float]], T]) -> Optional[T]:
    """``solve(budget)``, or ``None`` when the engine stopped at the time limit ``budget``
    (another limit, such as memory, is raised: it fires before the budget is spent)."""
    wall = time.monotonic()
    try:
        return solve(budget)
    except ResourceLimit:
        if budget is None or time.monotonic() - wall < budget:
            raise
        return None


def _random_values(system: "System", count: int, rng: random.Random) -> list[int]:
    size = system.space.field.size
    assert size is not None
    return [rng.randrange(int(size)) for _ in range(count)]


class _Sampler:
    """Measures one k: solves random specialisations, each within the budget."""

    def __init__(self, system: "System", rng: random.Random, budget: Optional[float]):
        self.system, self.rng, self.budget = system, rng, budget

    def __call__(self, guessed: list[str], samples: int) -> GuessRow:
        size = self.system.space.field.size
        assert size is not None
        guesses = int(size) ** len(guessed)
        times: list[float] = []
        stats: list["GroebnerStats"] = []
        over_budget = False
        for _ in range(min(samples, guesses)):
            seconds, gb_stats = self._solve(guessed)
            times.append(seconds)
            if gb_stats is None:  # stopped at the budget: the other samples would be stopped too
                over_budget = True
                break
            stats.append(gb_stats)
        return self._row(guessed, guesses, times, stats, over_budget)

    def _solve(self, guessed: list[str]) -> tuple[float, Optional["GroebnerStats"]]:
        """The CPU time of one random specialisation, and its statistics (``None`` when the
        budget stopped it: the time is then a lower bound)."""
        system = specialised(self.system, guessed, _random_values(self.system, len(guessed), self.rng))
        # CPU time of the process (the engine on one thread, the caller idle while it waits):
        # what one core spends, not inflated when other work shares the machine. The budget is
        # wall-clock time: how long the plan waits.
        start = time.process_time()
        gb = _within_budget(self.budget, lambda s: system.basis(threads=1, max_seconds=s))
        return time.process_time() - start, None if gb is None else gb.stats

    def _row(
        self,
        guessed: list[str],
        guesses: int,
        times: list[float],
        stats: list["GroebnerStats"],
        over_budget: bool,
    ) -> GuessRow:
        seconds = statistics.median(times)
        rows, columns, nonzeros = _largest_matrix(stats)
        n = len(self.system.space.names) - len(guessed)
        degrees = [g.degree() for g in self.system.equations]
        return GuessRow(
            k=len(guessed),
            variables=list(guessed),
            samples=len(times),
            seconds=seconds,
            solving_degree=int(statistics.median_low(s.max_degree for s in stats)) if stats else None,
            largest_matrix=[rows, columns],
            guesses=guesses,
            total_seconds=guesses * seconds,
            memory_bytes=nonzeros * BYTES_PER_ENTRY,
            predicted_degree=semi_regular_degree(degrees, n, self.system.space.boolean),
            over_budget=over_budget,
        )


def _largest_matrix(stats: list["GroebnerStats"]) -> tuple[int, int, int]:
    steps = [s for st in stats for s in st.steps]
    if not steps:
        return 0, 0, 0
    largest = max(steps, key=lambda s: (s.rows * s.columns, s.nonzeros))
    return largest.rows, largest.columns, max(s.nonzeros for s in steps)


def _evaluation_seconds(system: "System", rng: random.Random) -> float:
    """The time to evaluate every equation at one point (mean over a few random points)."""
    points = [_random_values(system, len(system.space.names), rng) for _ in range(EVALUATION_SAMPLES)]
    start = time.perf_counter()
    for point in points:
        for g in system.equations:
            g.evaluate(point)
    return (time.perf_counter() - start) / EVALUATION_SAMPLES


def render_plan(result: dict[str, Any]) -> str:
    """The plan as a table (``fibrewise plan``; ``result``: ``GuessPlan.to_dict()`` and the
    command's header)."""
    head = f"{result.get('file') or 'system'}: guess-and-determine plan over {result['field']}"
    lines = [
        head,
        f"{'k':>3}  {'guessed':<22}  {'one system':>10}  {'degree':>6}  {'(semi-reg.)':>11}  "
        f"{'largest matrix':>17}  {'q^k':>9}  {'expected total':>14}  {'memory':>8}",
    ]
    for r in result["rows"]:
        guessed = ", ".join(r["variables"]) or "-"
        if len(guessed) > 22:
            guessed = guessed[:19] + "..."
        predicted = "-" if r["predicted_degree"] is None else f"({r['predicted_degree']})"
        degree = "-" if r["solving_degree"] is None else r["solving_degree"]
        rows_, columns = r["largest_matrix"]
        matrix = f"{rows_} x {columns}" if rows_ else "-"
        at_least = "> " if r["over_budget"] else ""
        one = f"{at_least}{seconds(r['seconds'])}"
        total = f"{at_least}{_duration(r['total_seconds'])}"
        mark = "  <- best" if r["k"] == result["best"] else ""
        mark += "  over budget" if r["over_budget"] else ""
        lines.append(
            f"{r['k']:>3}  {guessed:<22}  {one:>10}  {degree:>6}  {predicted:>11}  "
            f"{matrix:>17}  {r['guesses']:>9.3g}  {total:>14}  "
            f"{_size(r['memory_bytes']):>8}{mark}"
        )
    rows = [
        (
            "exhaustive search",
            f"{result['exhaustive_points']:.3g} points, about "
            f"{_duration(result['exhaustive_seconds'])} at this library's evaluation speed",
        ),
        (
            "degree",
            "the highest degree reached by one specialised system (its solving degree); in "
            "brackets the degree of regularity of a semi-regular sequence of degrees "
            f"{result['degrees']} in n - k variables (Bardet-Faugere-Salvy 2004)",
        ),
        ("budget", _budget_note(result)),
        (
            "caution",
            "an estimate from a few random guesses per k on this machine, one thread each, CPU time; "
            "not a bound: other guesses may cost more",
        ),
    ]
    return "\n".join(lines) + "\n" + aligned(rows)


def _budget_note(result: dict[str, Any]) -> str:
    if result["budget"] is None:
        return "none: every sample ran to its end"
    note = f"{_duration(result['budget'])} of wall-clock time per sample"
    if not any(r["over_budget"] for r in result["rows"]):
        return note + "; no sample went over"
    return (
        note + "; a row over budget had a sample stopped there: its times are lower bounds (>, "
        "the CPU time spent until the stop), and it is the best k only when no k was measured in full"
    )


def _duration(value: float) -> str:
    for unit, size in (("years", 365.25 * 86400), ("days", 86400.0), ("h", 3600.0), ("min", 60.0)):
        if value >= size:
            return f"{value / size:.3g} {unit}"
    return f"{value:.3g} s" if value >= 1 else f"{value * 1000:.3g} ms"


def _size(value: int) -> str:
    for unit, size in (("GB", 1 << 30), ("MB", 1 << 20), ("kB", 1 << 10)):
        if value >= size:
            return f"{value / size:.3g} {unit}"
    return f"{value} B"
