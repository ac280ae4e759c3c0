"""Solving by guessing, spread over processes or a Dask cluster (``fibrewise solve --guess``).

The guess space GF(q)^k of the guessed variables is cut into chunks of consecutive guesses
(guess i: the values whose integer representations are the base-q digits of i, least
significant first). Each chunk goes to a worker, which solves the specialised system of every
guess in it (the system with x_j - v_j added; every point checked in every equation by the core)
and sends back the points. Points are written as their chunks come back; after a chunk's points
are written, its number is appended to the progress file, so that a run started again with the
same progress file does only the chunks not recorded there: none twice, none skipped (a chunk
interrupted half-way is done again whole, and only its points written before the interruption
can repeat; the window is the time to write one chunk's points).

What a run proves: every written point is a solution (checked). The list is complete when the
run finished every chunk (the summary says so).
"""

from __future__ import annotations

import json
import os
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Callable, Iterator, Optional

from . import _native

if TYPE_CHECKING:
    from .systems import System

# Chunks per worker: enough for a balanced finish, few enough that the overhead stays small.
CHUNKS_PER_WORKER = 8
LARGEST_CHUNK = 4096
# Chunks in flight per worker on a cluster (the rest wait in the client).
WINDOW_PER_WORKER = 2


@dataclass(frozen=True)
class GuessJob:
    """What a worker needs (plain data, so that it pickles): the system as texts, the guessed
    variables and the chunk size."""

    field: str
    variables: tuple[str, ...]
    order: str
    polynomials: tuple[str, ...]
    guess: tuple[str, ...]
    chunk: int

    @classmethod
    def of(cls, system: "System", guess: list[str], chunk: int) -> "GuessJob":
        space = system.space
        return cls(
            str(space.field),
            tuple(space.names),
            str(space.order),
            tuple(str(g) for g in system.equations),
            tuple(guess),
            chunk,
        )

    @property
    def guesses(self) -> int:
        from .fields import field

        size = field(self.field).size
        assert size is not None
        return int(size) ** len(self.guess)

    @property
    def chunks(self) -> int:
        return -(-self.guesses // self.chunk)

    def header(self) -> dict[str, Any]:
        """The first line of a progress file: a resume must be the same run (the system by a
        digest of its text, which keeps the file small)."""
        import hashlib

        text = "\n".join([self.field, ",".join(self.variables), self.order, *self.polynomials])
        return {
            "system": hashlib.sha256(text.encode()).hexdigest(),
            "guess": list(self.guess),
            "chunk": self.chunk,
            "chunks": self.chunks,
        }


def check_guess(system: "System", guess: list[str]) -> list[str]:
    """The guessed variable names, checked."""
    names = system.space.names
    unknown = [x for x in guess if x not in names]
    if unknown:
        raise ValueError(f"--guess: unknown variable '{unknown[0]}' (the variables are {', '.join(names)})")
    if len(set(guess)) != len(guess):
        raise ValueError("--guess: a variable is named twice")
    if not guess:
        raise ValueError("--guess: name at least one variable")
    if system.space.field.size is None:
        raise ValueError(f"--guess works over finite fields, not {system.space.field}")
    return guess


def chunk_size(guesses: int, workers: int) -> int:
    return max(1, min(LARGEST_CHUNK, guesses // (workers * CHUNKS_PER_WORKER)))


def solve_chunk(job: GuessJob, index: int) -> tuple[int, list[list[int]]]:
    """The points of the guesses of chunk ``index`` (run by a worker)."""
    from .spaces import Space

    # Points do not depend on the order: grevlex, whatever order (block, weights) the system's
    # space has, which the job keeps only to tell runs apart.
    space = Space(job.field, list(job.variables), order="grevlex")
    gens = [space.parse(p)._native for p in job.polynomials]
    size = space.field.size
    assert size is not None
    guessed = [space.parse(x)._native for x in job.guess]
    found: list[list[int]] = []
    for guess in range(index * job.chunk, min((index + 1) * job.chunk, job.guesses)):
        values = [(guess // size**j) % size for j in range(len(guessed))]
        fixes = [x.sub(space._native.constant(v)) for x, v in zip(guessed, values)]
        found.extend(_native.rational_points(space._native, gens + fixes, None))
    return index, found


class Progress:
    """The progress file: a header line (the run), then one line per finished chunk."""

    def __init__(self, path: Optional[str], job: GuessJob):
        self.path = path
        self.done: set[int] = set()
        if path is None:
            return
        if os.path.exists(path) and os.path.getsize(path) > 0:
            self._read(path, job)
        else:
            with open(path, "w", encoding="utf-8") as f:
                f.write(json.dumps(job.header()) + "\n")

    def _read(self, path: str, job: GuessJob) -> None:
        with open(path, encoding="utf-8") as f:
            lines = f.read().splitlines()
        try:
            header = json.loads(lines[0])
        except json.JSONDecodeError:
            raise ValueError(f"{path}: line 1 is not a progress header") from None
        if header != job.header():
            raise ValueError(
                f"{path}: the progress file belongs to another run (system, --guess or chunk size); "
                "use a new progress file"
            )
        for number, line in enumerate(lines[1:], 2):
            try:
                self.done.add(int(json.loads(line)["chunk"]))
            except (json.JSONDecodeError, KeyError, TypeError, ValueError):
                if number == len(lines):  # a line torn by the interruption: that chunk runs again
                    break
                raise ValueError(f"{path}: line {number} is not a progress line") from None

    def record(self, index: int, points: int) -> None:
        self.done.add(index)
        if self.path is not None:
            with open(self.path, "a", encoding="utf-8") as f:
                f.write(json.dumps({"chunk": index, "points": points}) + "\n")
                f.flush()
                os.fsync(f.fileno())


def guessed_points(
    system: "System",
    guess: list[str],
    *,
    workers: int = 1,
    scheduler: Optional[str] = None,
    progress: Optional[str] = None,
    limit: Optional[int] = None,
    chunk: Optional[int] = None,
    on_chunk: Optional[Callable[[int, int], None]] = None,
) -> Iterator[tuple]:
    """The points of ``system``, by solving the specialised system of every guess of the
    variables ``guess``: chunks on ``workers`` local processes (1: in this process) or on the
    Dask cluster at ``scheduler``; points as their chunks finish, at most ``limit``;
    ``progress``: the file that lets an interrupted run resume. ``on_chunk(done, total)`` hears
    of each finished chunk."""
    check_guess(system, guess)
    system = system._general()  # a Boolean system with its field equations written out
    size = system.space.field.size
    assert size is not None
    guesses = int(size) ** len(guess)
    job = GuessJob.of(system, guess, chunk or chunk_size(guesses, workers))
    record = Progress(progress, job)
    todo = [i for i in range(job.chunks) if i not in record.done]
    found = 0
    for index, points in _run(job, todo, workers, scheduler):
        for point in points:
            if limit is not None and found >= limit:
                return
            found += 1
            yield tuple(point)
        record.record(index, len(points))
        if on_chunk is not None:
            on_chunk(len(record.done), job.chunks)


def _run(
    job: GuessJob, todo: list[int], workers: int, scheduler: Optional[str]
) -> Iterator[tuple[int, list]]:
    if scheduler is not None:
        yield from _run_dask(job, todo, scheduler)
    elif workers == 1:
        yield from (solve_chunk(job, i) for i in todo)
    else:
        yield from _run_processes(job, todo, workers)


def _run_processes(job: GuessJob, todo: list[int], workers: int) -> Iterator[tuple[int, list]]:
    import multiprocessing
    from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait

    # spawn: the workers start clean, without the parent's rayon threads.
    with ProcessPoolExecutor(workers, mp_context=multiprocessing.get_context("spawn")) as pool:
        pending = iter(todo)
        in_flight = {pool.submit(solve_chunk, job, i) for i in _take(pending, 2 * workers)}
        try:
            while in_flight:
                done, in_flight = wait(in_flight, return_when=FIRST_COMPLETED)
                for future in done:
                    yield future.result()
                    in_flight |= {pool.submit(solve_chunk, job, i) for i in _take(pending, 1)}
        finally:
            for future in in_flight:
                future.cancel()


def _take(items: Iterator[int], count: int) -> list[int]:
    return [i for _, i in zip(range(count), items)]


def _run_dask(job: GuessJob, todo: list[int], address: str) -> Iterator[tuple[int, list]]:
    from .batch import dask_client

    from distributed import as_completed

    with dask_client(address) as client:
        window = WINDOW_PER_WORKER * max(1, len(client.scheduler_info().get("workers", {})))
        pending = iter(todo)
        queue = as_completed()
        futures = []
        try:
            for i in _take(pending, window):
                futures.append(client.submit(solve_chunk, job, i, pure=False))
                queue.add(futures[-1])
            for future in queue:
                yield future.result()
                for i in _take(pending, 1):
                    futures.append(client.submit(solve_chunk, job, i, pure=False))
                    queue.add(futures[-1])
        finally:
            client.cancel([f for f in futures if not f.done()])


def solve_command(args: Any, activity: Any, header: dict, system: "System") -> dict:
    """``fibrewise solve FILE --guess x1,x2``: points printed as their chunks finish (with
    ``--json`` collected into the one JSON object instead), then the summary."""
    import sys
    import time

    if args.over is not None or args.closed_points:
        raise ValueError(
            "--guess lists the rational points over the file's field; drop --over and --closed-points"
        )
    guess = check_guess(system, [x.strip() for x in args.guess.split(",") if x.strip()])
    start = time.perf_counter()
    names = system.space.names
    text = system.space.field.element_text
    points: list[list[str]] = []
    chunks = {"done": 0, "total": 0}

    def on_chunk(done: int, total: int) -> None:
        chunks.update(done=done, total=total)
        activity.set_step(f"guesses: chunk {done} of {total}")

    activity.set_step("guesses")
    # one point more than --limit tells whether the list was cut
    wanted = None if args.limit is None else args.limit + 1
    truncated = False
    for point in guessed_points(
        system,
        guess,
        workers=args.workers or 1,
        scheduler=args.scheduler,
        progress=args.progress,
        limit=wanted,
        on_chunk=on_chunk,
    ):
        if args.limit is not None and len(points) == args.limit:
            truncated = True  # a point beyond the limit exists
            break
        points.append([text(c) for c in point])
        if not args.json:
            print(", ".join(f"{x} = {v}" for x, v in zip(names, points[-1])), flush=True)
    result: dict[str, Any] = {
        **header,
        "guess": guess,
        "limit": args.limit,
        "progress": args.progress,
        "scheduler": args.scheduler,
        "workers": args.workers or 1,
        "chunks_done": chunks["done"],
        "chunks": chunks["total"],
        "points": points,
        "truncated": truncated,
        "seconds": time.perf_counter() - start,
    }
    sys.stdout.flush()
    return result


def render_solve(result: dict) -> str:
    """The summary after the streamed points (the points themselves are printed as found)."""
    from .report import aligned, plural, seconds

    processes = f"{result['workers']} local process" + ("es" if result["workers"] > 1 else "")
    where = f"the Dask cluster at {result['scheduler']}" if result["scheduler"] else processes
    head = f"{result['file']}: {plural(len(result['points']), 'point')} over {result['field']}"
    if result["truncated"]:
        head += " (stopped at --limit)"
    rows = [
        ("guessed", ", ".join(result["guess"])),
        ("ran on", where),
        (
            "chunks",
            f"{result['chunks_done']} of {result['chunks']} done"
            + (f" (progress in {result['progress']})" if result["progress"] else ""),
        ),
        ("checked", "every point satisfies every equation (substituted before printing)"),
        (
            "complete",
            "yes: every guess was solved"
            if not result["truncated"] and result["chunks_done"] == result["chunks"]
            else "no: run the same command again with the same --progress file to go on",
        ),
        ("time", seconds(result["seconds"])),
    ]
    return f"{head}\n{aligned(rows)}"
