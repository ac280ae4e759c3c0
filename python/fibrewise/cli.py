"""The ``fibrewise`` command line.

``fibrewise SUBCOMMAND FILE [options]``; ``--json`` prints one JSON object. Each subcommand computes
a JSON-ready dict; ``report`` turns it into the short human report. Bad input exits with status 2
and one message naming the file, line and column. Heavy optional packages (galois, matplotlib, dask)
are imported only by the code that needs them, so start-up stays fast.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import time
from dataclasses import dataclass
from typing import Any, Callable, Sequence

from . import _native, boolean, guess_solve, report, solving
from .batch import run_batch
from .curves import curve_summary
from .guessing import DEFAULT_BUDGET, render_plan
from .jobs import TASK_NAMES
from .memory import parse_memory
from .normalization import check_certificate
from .plot import draw_analysis, draw_plan
from .progress import Activity
from .systems import System

EXIT_OK, EXIT_FAILED, EXIT_BAD_INPUT, EXIT_INTERRUPTED = 0, 1, 2, 130
# An analyze run counts points itself only when the count is small: at most about this many.
CHEAP_POINTS = 20_000
# ... and for zero-dimensional systems in several variables, only when R/I is this small.
CHEAP_QUOTIENT = 500
# The stages of analyze that --skip can leave out.
ANALYZE_STAGES = ("dimension", "hilbert", "normalize", "points")


def _system(args: argparse.Namespace):
    return System.read(args.file, memory=args.memory)


def _timed(call: Callable[[], Any]) -> tuple[Any, float]:
    start = time.perf_counter()
    value = call()
    return value, time.perf_counter() - start


def _header(system) -> dict:
    space = system.space
    return {
        "file": system.path,
        "field": str(space.field),
        "variables": list(space.names),
        "order": str(space.order),
        "polynomials": len(system.equations),
        "boolean": space.boolean,
    }


# ----------------------------------------------------------------------------------------------
# basis


def _basis(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    order = args.order or system.space.order
    activity.set_step("Groebner basis")
    gb, seconds = _timed(
        lambda: system.basis(order, engine=args.engine, field_equations=args.field_equations)
    )
    return {
        **_header(system),
        "order": str(order),
        "basis": [str(g) for g in gb],
        "seconds": seconds,
        "stats": gb.stats.to_dict(),
    }


# ----------------------------------------------------------------------------------------------
# analyze


def _analyze(args: argparse.Namespace, activity) -> dict:
    if args.plot:
        _check_plotting()
    system = _system(args)
    result: dict[str, Any] = _header(system)
    failed: dict[str, str] = {}
    skipped: dict[str, str] = {stage: "--skip" for stage in args.skip}

    def part(name: str, step: str, call: Callable[[], Any], stage: str | None = None) -> Any:
        """One piece of the analysis; a piece that fails is noted, the rest goes on; a piece
        of a skipped stage is not run."""
        if (stage or name) in skipped:
            return None
        activity.set_step(step)
        try:
            value, result[f"seconds_{name}"] = _timed(call)
        except (ValueError, RuntimeError) as e:  # RuntimeError: fibrewise.ResourceLimit
            failed[step] = f"{type(e).__name__}: {e}" if not isinstance(e, ValueError) else str(e)
            return None
        result[name] = value
        return value

    activity.set_step("Groebner basis")
    gb, result["seconds_basis"] = _timed(system.basis)
    result["basis"] = {"size": len(gb), "max_degree": gb.stats.max_degree, "engine": gb.stats.engine}
    dim = part("dimension", "dimension", system.dimension)
    if dim is not None and dim >= 0:
        part(
            "independent_variables",
            "independent variables",
            lambda: [str(v) for v in system.independent_variables()],
            stage="dimension",
        )
        part("degree", "degree", system.degree, stage="hilbert")
        part("hilbert", "Hilbert series", lambda: _hilbert(system))
        if dim == 0:
            part("quotient_dimension", "quotient dimension", system.quotient_dimension, stage="hilbert")
        if not system.space.boolean:  # a Boolean system projects onto a point: its rank is the degree
            part("projection", "finite projection", lambda: _projection_summary(system), stage="normalize")
        if "points" in skipped:
            result["points_skipped"] = "--skip points"
        else:
            points = _cheap_points(system, args, result)
            if points is not None:
                part("points", "points", points)
            else:
                skipped["points"] = result["points_skipped"]
    if system.space.boolean:
        part("solve_method", "solve method", lambda: system.solve_method().to_dict())
    result["failed"] = failed
    result["skipped"] = skipped
    result["summary"] = _summary(result)
    result["stats"] = gb.stats.to_dict()
    if args.plot:
        activity.set_step("plot")
        draw_analysis(args.plot, result)
        result["plot"] = args.plot
    return result


def _check_plotting() -> None:
    """--plot needs matplotlib: say so before any work, as a usage error."""
    try:
        import matplotlib  # noqa: F401
    except ImportError:
        raise ValueError("--plot needs the optional package matplotlib: pip install matplotlib") from None


def _hilbert(system) -> dict:
    series = system.hilbert()
    return {
        **series.to_dict(),
        "polynomial": [_json_number(c) for c in series.polynomial()],
        "regularity_index": series.regularity_index(),
    }


def _json_number(c) -> int | str:
    """An exact rational for JSON: an int, or the text "a/b" (JSON has no exact fractions)."""
    return int(c) if int(c) == c else str(c)


def _projection_summary(system) -> dict:
    """The projection without its equations (computed lazily, so never here): about one basis."""
    cert = system.projection().summary()
    return {key: cert[key] for key in ("field", "dimension", "parameters", "rank", "strategy")}


def _cheap_points(system, args, result: dict) -> Callable[[], dict] | None:
    """The point count when it is cheap (the count bounds the size of the work), else None with
    the reason in ``result["points_skipped"]``."""
    q = system.space.field.size
    if q is None:
        result["points_skipped"] = "the field is infinite"
        return None
    dim, degree = result.get("dimension"), result.get("degree")
    homogeneous = all(g.is_homogeneous() for g in system.equations)
    if args.points is False:
        result["points_skipped"] = "--no-points"
        return None
    if args.points is None and dim != 0:
        bound = None if degree is None else degree * q**dim
        if bound is None or bound > CHEAP_POINTS:
            result["points_skipped"] = (
                f"up to {bound} points; run 'fibrewise points' to count them"
                if bound is not None
                else "no degree to bound the count; run 'fibrewise points'"
            )
            return None
    if args.points is None and dim == 0 and len(system.space.names) > 1:
        # The count works in R/I, a space of dimension deg I: beyond a few hundred that can be
        # minutes (shape-position systems are fast, but that is not known beforehand).
        size = result.get("quotient_dimension", degree)
        if size is None or size > CHEAP_QUOTIENT:
            result["points_skipped"] = (
                f"the quotient ring has dimension {size}, above {CHEAP_QUOTIENT}; "
                "run 'fibrewise points' (or analyze --points) to count them"
            )
            return None

    def count() -> dict:
        counts = {"affine": system.count_points()}
        if homogeneous and dim is not None and dim > 0:
            counts["projective"] = system.count_points(projective=True)
        return counts

    return count


def _summary(result: dict) -> str:
    """The main answer in one line: ``dimension 2, degree 6; finite over k[x + y, z] of rank 6 (linear change)``."""
    dim = result.get("dimension")
    if dim is None:
        return f"reduced Groebner basis of {report.plural(result['basis']['size'], 'polynomial')} (dimension not available in this build)"
    if dim < 0:
        return "no solutions: the equations generate the unit ideal (dimension -1)"
    text = f"dimension {dim}"
    if result.get("degree") is not None:
        text += f", degree {result['degree']}"
    norm = result.get("projection")
    if norm is not None:
        text += "; " + report.finite_over(norm, result.get("field"))
    return text


# ----------------------------------------------------------------------------------------------
# normalize, integral, points, check


def _normalize(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    activity.set_step("finite projection")
    nn, seconds = _timed(lambda: system.projection(strategy=args.strategy, seed=args.seed, equations="now"))
    result = {**_header(system), "certificate": nn.to_dict(), "seconds": seconds}
    if not args.no_verify:
        activity.set_step("verifying the certificate")
        start = time.perf_counter()
        try:
            outcome = nn.verify()
        except ValueError as e:  # the certificate does not hold: e says what is wrong
            outcome = [str(e)]
        result["seconds_verify"] = time.perf_counter() - start
        result["verified"], result["problems"] = verdict(outcome)
    if args.output:
        with open(args.output, "w", encoding="utf-8") as handle:
            json.dump({"system": system.path, **nn.to_dict()}, handle, indent=2)
            handle.write("\n")
        result["saved"] = args.output
    return result


def _integral(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    element = _polynomial(system.space, args.element, "--element")
    over = [_polynomial(system.space, g, "--over") for g in args.over]
    activity.set_step("integral equation")
    equation, seconds = _timed(lambda: system.integral_equation(element, over=over))
    result = {
        **_header(system),
        "element": str(element),
        "over": [str(g) for g in over],
        "integral": equation is not None,
        "seconds": seconds,
    }
    if equation is not None:
        result.update(
            equation=str(equation), degree=equation.degree, coefficients=list(map(str, equation.coefficients))
        )
    return result


def _polynomial(space, text: str, option: str):
    try:
        return space.parse(text)
    except ValueError as e:
        raise ValueError(f"{option} {text!r}: {e}") from None


def _points(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    if system.space.field.size is None:
        raise ValueError(f"{system.path}: points are counted over a finite field, not {system.space.field}")
    activity.set_step("counting points")
    count, seconds = _timed(lambda: system.count_points(projective=args.projective))
    return {**_header(system), "points": count, "projective": args.projective, "seconds": seconds}


def _solve(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    if system.space.boolean:
        if args.over is not None or args.closed_points:
            raise ValueError(
                f"{system.path}: --over and --closed-points are for systems that are not Boolean"
            )
        return {**_header(system), **boolean.solve_command(system, args.method, args.limit, activity)}
    if args.method != "auto":
        raise ValueError(f"{system.path}: --method chooses how Boolean systems ('boolean: yes') are solved")
    if args.guess is not None:
        return guess_solve.solve_command(args, activity, _header(system), system)
    if args.scheduler is not None or args.workers is not None or args.progress is not None:
        raise ValueError("--scheduler, --workers and --progress spread the guesses of --guess")
    return solving.solve_command(args, activity, _header(system), system)


def _plan(args: argparse.Namespace, activity) -> dict:
    if args.plot:
        _check_plotting()
    system = _system(args)
    activity.set_step("measuring specialised systems")
    plan, seconds = _timed(lambda: system.guess_plan(args.max_guess, args.samples, budget=args.budget))
    result = {**_header(system), **plan.to_dict(), "seconds": seconds}
    if args.plot:
        draw_plan(args.plot, result)
    return result


def _check(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    saved = _read_json(args.certificate)
    if not isinstance(saved, dict):
        raise ValueError(f"{args.certificate}: a certificate is a JSON object, not {type(saved).__name__}")
    if isinstance(saved.get("certificate"), dict) and "dimension" not in saved:
        saved = saved["certificate"]  # the output of 'fibrewise normalize --json' as it is
    certificate = {
        key: value for key, value in saved.items() if key != "system"
    }  # "system": where it came from
    activity.set_step("checking the certificate")
    try:
        outcome, seconds = _timed(lambda: check_certificate(certificate, system))
        valid, problems = verdict(outcome)
    except ValueError as e:  # an unreadable certificate
        valid, problems, seconds = False, [str(e)], None
    return {
        **_header(system),
        "certificate": args.certificate,
        "valid": valid,
        "problems": problems,
        "seconds": seconds,
    }


def verdict(outcome: Any) -> tuple[bool, list[str]]:
    """A check's outcome as (holds, problems): checks answer either a bool or the list of
    problems found (empty when the certificate holds)."""
    if isinstance(outcome, bool):
        return outcome, [] if outcome else ["the certificate does not hold"]
    problems = [str(p) for p in outcome]
    return not problems, problems


def _read_json(path: str) -> Any:
    with open(path, "rb") as handle:
        data = handle.read()
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        line = data.count(b"\n", 0, e.start) + 1
        raise ValueError(
            f"{path}:{line}: not UTF-8 text (byte 0x{data[e.start]:02x} at offset {e.start})"
        ) from None
    try:
        return json.loads(text)
    except json.JSONDecodeError as e:
        raise ValueError(f"{path}:{e.lineno}:{e.colno}: malformed JSON: {e.msg}") from None


# ----------------------------------------------------------------------------------------------
# curve


def _curve(args: argparse.Namespace, activity) -> dict:
    system = _system(args)
    activity.set_step("curve: smoothness, genus, point counts, zeta function")
    try:
        summary, seconds = _timed(lambda: curve_summary(system, args.up_to))
    except ValueError as e:
        raise ValueError(f"{system.path}: {e}") from None
    return {**_header(system), **summary, "seconds": seconds}


# ----------------------------------------------------------------------------------------------
# batch


def _batch(args: argparse.Namespace, activity) -> dict:
    summary = run_batch(
        args.file,
        args.output,
        workers=args.workers,
        timeout=args.timeout,
        memory_bytes=args.memory,
        scheduler=args.scheduler,
        quiet=args.quiet,
        retry_failed=args.retry_failed,
    )
    return {"input": args.file, "output": args.output, **summary.to_dict()}


# ----------------------------------------------------------------------------------------------
# Arguments of each subcommand


FILE_HELP = "system file (field:, variables:, order: headers, then one polynomial a line)"


def _positive(kind: type) -> Callable[[str], Any]:
    def parse(text: str):
        try:
            value = kind(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"expected a positive number, got {text!r}") from None
        if value <= 0:
            raise argparse.ArgumentTypeError(f"expected a positive number, got {text!r}")
        return value

    return parse


def _memory(text: str) -> int | None:
    try:
        return parse_memory(int(text) if text.isdigit() else text)
    except ValueError as e:
        raise argparse.ArgumentTypeError(str(e)) from None


def _worker_memory(text: str) -> int | None:
    """A worker's memory: a size, or a plain number of MiB (as this option always read)."""
    return _memory(str(int(text) << 20) if text.strip().isdigit() else text)


def _stages(text: str) -> tuple[str, ...]:
    stages = tuple(s.strip() for s in text.split(",") if s.strip())
    unknown = [s for s in stages if s not in ANALYZE_STAGES]
    if unknown or not stages:
        raise argparse.ArgumentTypeError(
            f"unknown stage {unknown[0]!r}: expected {', '.join(ANALYZE_STAGES)}"
            if unknown
            else "expected stage names"
        )
    return stages


def _file_arguments(p: argparse.ArgumentParser) -> None:
    """What every subcommand on a system file takes: the file and the memory budget."""
    p.add_argument("file", help=FILE_HELP)
    _memory_argument(p)


def _memory_argument(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "--memory",
        type=_memory,
        metavar="SIZE",
        help="memory budget of the computation: 4GB, 512MiB, 50%% of the machine "
        "(default: 3/4 of the machine's memory); going over it is an error naming what was being built",
    )


def _basis_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument(
        "--order", choices=["lex", "grlex", "grevlex"], help="monomial order (default: the file's)"
    )
    p.add_argument(
        "--engine",
        choices=list(_native.ENGINE_NAMES),
        default="auto",
        help="auto (the default: chooses per system and step, and says what it chose), f4, "
        "f4-sampled (faster on large systems over finite fields; "
        "wrong with probability at most 2^-80 per matrix), f4-signature (exact, grlex/grevlex "
        "only; skips most rows that reduce to zero) or buchberger (the reference)",
    )
    p.add_argument(
        "--field-equations",
        action="store_true",
        help="Boolean files: include the field equations x^2 + x in the basis",
    )


def _analyze_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument(
        "--plot",
        metavar="FILE.png",
        help="draw degree and matrix size per Groebner step and the Hilbert function (needs matplotlib)",
    )
    p.add_argument(
        "--skip",
        type=_stages,
        default=(),
        metavar="STAGE,...",
        help="stages to leave out: " + ", ".join(ANALYZE_STAGES) + " (e.g. --skip normalize,points)",
    )
    group = p.add_mutually_exclusive_group()
    group.add_argument(
        "--points",
        dest="points",
        action="store_const",
        const=True,
        default=None,
        help="count the points even when the count may be large",
    )
    group.add_argument(
        "--no-points", dest="points", action="store_const", const=False, help="do not count points"
    )


def _normalize_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument(
        "--strategy",
        choices=list(_native.STRATEGY_NAMES),
        default="auto",
        help="the kind of change of coordinates to use (default: the simplest that works)",
    )
    p.add_argument("--seed", type=int, help="seed for random changes of coordinates (reproducible runs)")
    p.add_argument("--no-verify", action="store_true", help="skip re-checking the certificate")
    p.add_argument("-o", "--output", metavar="CERT.json", help="save the certificate for 'fibrewise check'")


def _integral_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument("--element", required=True, metavar="F", help="the polynomial to test")
    p.add_argument(
        "--over", nargs="*", default=[], metavar="G", help="generators of the subalgebra (none: over k)"
    )


def _points_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument("--projective", action="store_true", help="count projective points (homogeneous systems)")


def _solve_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument(
        "--over", metavar="GF(q^k)", help="list the points with coordinates in this extension field"
    )
    p.add_argument(
        "--limit",
        type=_positive(int),
        metavar="N",
        help="at most N points (the report says when there are more)",
    )
    p.add_argument(
        "--method",
        default="auto",
        metavar="METHOD",
        help="Boolean systems: auto (the cheapest by a cost estimate), exhaustive, basis, hybrid, "
        "or hybrid:K (guess K variables)",
    )
    p.add_argument(
        "--closed-points",
        action="store_true",
        help="list the closed points (Galois orbits, with their degrees and equations) instead",
    )
    p.add_argument(
        "--guess",
        metavar="X1,X2,...",
        help="guess these variables: solve the specialised system of "
        "every guess (see 'fibrewise plan'), points printed as found",
    )
    p.add_argument(
        "--scheduler",
        metavar="ADDRESS",
        help="with --guess: spread the guesses over the Dask cluster at ADDRESS (tcp://host:8786)",
    )
    p.add_argument(
        "--workers",
        type=_positive(int),
        metavar="N",
        help="with --guess: local worker processes (default 1)",
    )
    p.add_argument(
        "--progress",
        metavar="FILE",
        help="with --guess: record finished chunks in FILE; the same command again resumes where it stopped",
    )


def _plan_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument(
        "--max-guess",
        type=int,
        metavar="K",
        help="plan k = 0..K guessed variables (default: until more guesses cannot pay)",
    )
    p.add_argument(
        "--samples",
        type=_positive(int),
        default=8,
        metavar="N",
        help="random guesses solved per k (default 8)",
    )
    p.add_argument(
        "--budget",
        type=_positive(float),
        default=DEFAULT_BUDGET,
        metavar="SECONDS",
        help="wall-clock seconds one sample may take; a k whose sample goes over is reported "
        f"as over budget, with lower bounds (default {DEFAULT_BUDGET:g}; inf: no limit)",
    )
    p.add_argument(
        "--plot", metavar="FILE.png", help="draw the expected total time against k (needs matplotlib)"
    )


def _curve_arguments(p: argparse.ArgumentParser) -> None:
    _file_arguments(p)
    p.add_argument(
        "--up-to",
        type=_positive(int),
        metavar="R",
        help="report N_r for r = 1..R (default: the genus; N_r beyond the genus come from the zeta function)",
    )


def _check_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "certificate",
        metavar="CERT.json",
        help="a certificate saved by 'fibrewise normalize -o', or the output of 'normalize --json'",
    )
    p.add_argument("file", metavar="SYSTEM", help=FILE_HELP)
    _memory_argument(p)


def _batch_arguments(p: argparse.ArgumentParser) -> None:
    p.add_argument(
        "file",
        metavar="IN.jsonl",
        help='one job a line: {"id", "field", "variables", "polynomials", "tasks"}; tasks: '
        + ", ".join(TASK_NAMES),
    )
    p.add_argument(
        "-o",
        "--output",
        metavar="OUT.jsonl",
        required=True,
        help="results, one line a job; ids already there are skipped (resume)",
    )
    p.add_argument(
        "--workers", type=_positive(int), metavar="N", help="worker processes (default: all cores)"
    )
    p.add_argument("--timeout", type=_positive(float), metavar="S", help="time limit per job, in seconds")
    p.add_argument(
        "--memory",
        type=_worker_memory,
        metavar="SIZE",
        help="memory limit per worker: 4GB, 512MiB, 25%% of the machine, or a number of MiB "
        "(default: 3/4 of the machine's memory shared by the workers)",
    )
    p.add_argument(
        "--scheduler", metavar="ADDRESS", help="run on the Dask cluster at ADDRESS (tcp://host:8786)"
    )
    p.add_argument(
        "--retry-failed",
        action="store_true",
        help="run again the jobs whose line says error or timeout, replacing their line",
    )


# ----------------------------------------------------------------------------------------------
# Reports and exit status of each subcommand (the reports themselves are in report.py)


def _render_plan(result: dict) -> str:
    return render_plan(result)


def _render_solve(result: dict) -> str:
    """Boolean solving, guessed solving and plain solving report differently."""
    if isinstance(result.get("method"), dict):
        return boolean.render_solve(result)
    if "guess" in result:
        return guess_solve.render_solve(result)
    return solving.render_solve(result)


def _ok(result: dict) -> int:
    return EXIT_OK


def _interrupted_status(result: dict) -> int:
    """A run stopped by a signal: 143 for SIGTERM, 130 for Ctrl-C (its report is still shown)."""
    return 143 if result["interrupted"] == "SIGTERM" else EXIT_INTERRUPTED


def _batch_status(result: dict) -> int:
    if result.get("interrupted"):
        return _interrupted_status(result)
    return EXIT_FAILED if result.get("lost") else EXIT_OK


def _solve_status(result: dict) -> int:
    return _interrupted_status(result) if result.get("interrupted") else EXIT_OK


def _check_status(result: dict) -> int:
    return EXIT_OK if result["valid"] else EXIT_FAILED


def _normalize_status(result: dict) -> int:
    return EXIT_FAILED if result.get("verified") is False else EXIT_OK


# ----------------------------------------------------------------------------------------------
# The subcommands


@dataclass(frozen=True)
class Subcommand:
    """One subcommand: its help line and example, its arguments, what it computes (a JSON-ready
    dict), the human report of that dict and the exit status it means."""

    help: str
    example: str
    arguments: Callable[[argparse.ArgumentParser], None]
    run: Callable[[argparse.Namespace, Any], dict]
    render: Callable[[dict], str]
    exit_status: Callable[[dict], int] = _ok
    own_progress: bool = False  # draws its own progress display (jobs done / total)


SUBCOMMANDS: dict[str, Subcommand] = {
    "analyze": Subcommand(
        "dimension, degree, Hilbert series, a finite projection and, where cheap, the point count",
        "example: fibrewise analyze examples/curve_code_gf7.txt --plot steps.png",
        _analyze_arguments,
        _analyze,
        report.render_analyze,
    ),
    "basis": Subcommand(
        "reduced Groebner basis of a system file",
        "example: fibrewise basis examples/toy_cipher_gf101.txt --order lex",
        _basis_arguments,
        _basis,
        report.render_basis,
    ),
    "normalize": Subcommand(
        "finite projection (Noether normalization) with its certificate",
        "example: fibrewise normalize examples/curve_code_gf7.txt -o cert.json",
        _normalize_arguments,
        _normalize,
        report.render_normalize,
        _normalize_status,
    ),
    "integral": Subcommand(
        "is an element integral over a subalgebra, and its monic equation",
        "example: fibrewise integral examples/curve_code_gf7.txt --element y --over x",
        _integral_arguments,
        _integral,
        report.render_integral,
    ),
    "points": Subcommand(
        "number of points with coordinates in the (finite) field",
        "example: fibrewise points examples/curve_code_gf7_projective.txt --projective",
        _points_arguments,
        _points,
        report.render_points,
    ),
    "solve": Subcommand(
        "the points with coordinates in the field (finite, or Q for zero-dimensional systems), one per line, "
        "each checked in every equation "
        "(Boolean files: exhaustive search, a basis or a hybrid, --method)",
        "example: fibrewise solve examples/toy_cipher_gf101.txt",
        _solve_arguments,
        _solve,
        _render_solve,
        _solve_status,
    ),
    "plan": Subcommand(
        "guess-and-determine plan: for k guessed variables, the measured cost of one specialised system, "
        "q^k, the expected total and the best k",
        "example: fibrewise plan examples/toy_cipher_gf101.txt --max-guess 2 --plot plan.png",
        _plan_arguments,
        _plan,
        _render_plan,
    ),
    "curve": Subcommand(
        "smoothness, genus, point counts over GF(q^r), zeta function and Jacobian order of a curve",
        "example: fibrewise curve examples/curve_genus2_gf16.txt --up-to 4",
        _curve_arguments,
        _curve,
        report.render_curve,
    ),
    "check": Subcommand(
        "verify a saved projection certificate against the system file",
        "example: fibrewise check cert.json examples/curve_code_gf7.txt",
        _check_arguments,
        _check,
        report.render_check,
        _check_status,
    ),
    "batch": Subcommand(
        "run a JSON-lines file of jobs in worker processes or on a Dask cluster, resumably",
        "example: fibrewise batch examples/batch.jsonl -o results.jsonl --timeout 10",
        _batch_arguments,
        _batch,
        report.render_batch,
        _batch_status,
        own_progress=True,
    ),
}


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="fibrewise",
        description="Exact analysis of polynomial systems.",
        epilog="example: fibrewise analyze examples/toy_cipher_4round_gf101.txt   "
        "(fibrewise SUBCOMMAND --help for each subcommand)",
    )
    sub = parser.add_subparsers(dest="command", required=True, metavar="SUBCOMMAND")
    for name, command in SUBCOMMANDS.items():
        p = sub.add_parser(name, help=command.help, description=command.help, epilog=command.example)
        command.arguments(p)
        p.add_argument("--json", action="store_true", help="print one JSON object")
        p.add_argument("-q", "--quiet", action="store_true", help="no progress display on stderr")
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    command = SUBCOMMANDS[args.command]
    try:
        # the others show what they compute
        with Activity(f"fibrewise {args.command}", quiet=args.quiet or command.own_progress) as activity:
            result = command.run(args, activity)
    except ValueError as e:
        return _fail(args, str(e), EXIT_BAD_INPUT)
    except OSError as e:
        where = f"{e.filename}: " if e.filename else ""
        return _fail(args, f"{where}{e.strerror or e}", EXIT_BAD_INPUT)
    except RuntimeError as e:  # fibrewise.ResourceLimit and engine failures
        return _fail(args, f"{type(e).__name__}: {e}", EXIT_FAILED)
    except KeyboardInterrupt:
        return _fail(args, "interrupted", EXIT_INTERRUPTED)
    text = json.dumps(result) if args.json else command.render(result)
    try:
        print(text, flush=True)
    except BrokenPipeError:  # `fibrewise ... | head`: the reader has seen enough
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
    return command.exit_status(result)


def _fail(args: argparse.Namespace, message: str, status: int) -> int:
    print(f"fibrewise {args.command}: error: {message}", file=sys.stderr)
    if args.json:
        print(json.dumps({"error": message, "status": status}))
    return status


if __name__ == "__main__":
    sys.exit(main())
