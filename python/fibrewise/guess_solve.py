"""Solving by guessing, spread over processes or a Dask cluster (``fibrewise solve --guess``).

The guess space GF(q)^k of the guessed variables is cut into chunks of consecutive guesses
(guess i: the values whose integer representations are the base-q digits of i, least
significant first). Each chunk goes to a worker, which solves the specialised system of every
guess in it (the system with x_j - v_j added; every point checked in every equation by the core)
and sends back the points. Points are written as their chunks come back, each chunk's in sorted
order; after a chunk's last point, its number is appended to the progress file, so that a run
started again with the same progress file does only the chunks not recorded there: none twice,
none skipped. A run that stops inside a chunk's points (``--limit``, Ctrl-C, SIGTERM, a closed
pipe) appends how many of them it wrote, and the next run computes that chunk again and writes
only the others: every point exactly once over a run and its resumptions. Ctrl-C during the
writing of a point, or of a progress line, takes effect when it is done. Only a hard kill
(SIGKILL, a power cut) between writing points and recording them can lead a resumed run to
write those points again.

What a run proves: every written point is a solution (checked). The list is complete when the
run finished every chunk (the summary says so).
"""

from __future__ import annotations

import functools
import hashlib
import json
import multiprocessing
import os
import signal
import sys
import threading
import time
from concurrent.futures import FIRST_COMPLETED, ProcessPoolExecutor, wait
from contextlib import closing, contextmanager
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Callable, Generator, Iterator, Optional

from . import _native
from .batch import dask_client
from .fields import field
from .report import aligned, plural, seconds
from .signals import Terminated, raise_on_sigterm, restore_sigterm
from .spaces import Space

if TYPE_CHECKING:
    from .systems import System

# Chunks per worker: enough for a balanced finish (the last chunks leave workers idle for about
# half a chunk: 1/64 of a worker's share), few enough that the overhead (a task and a progress
# line per chunk, milliseconds) stays small.
CHUNKS_PER_WORKER = 32
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
        size = field(self.field).size
        assert size is not None
        return int(size) ** len(self.guess)

    @property
    def chunks(self) -> int:
        return -(-self.guesses // self.chunk)

    def header(self) -> dict[str, Any]:
        """The first line of a progress file: a resume must be the same run (the system by a
        digest of its text, which keeps the file small)."""
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


@functools.lru_cache(maxsize=4)
def _parsed(job: GuessJob) -> tuple[Any, list, list, int]:
    """The space, equations and guessed variables of a job, read once per worker process (a
    worker solves many chunks of one job)."""
    # Points do not depend on the order: grevlex, whatever order (block, weights) the system's
    # space has, which the job keeps only to tell runs apart.
    space = Space(job.field, list(job.variables), order="grevlex")
    gens = [space.parse(p)._native for p in job.polynomials]
    size = space.field.size
    assert size is not None
    return space, gens, [space.parse(x)._native for x in job.guess], int(size)


def solve_chunk(job: GuessJob, index: int) -> tuple[int, list[list[int]]]:
    """The points of the guesses of chunk ``index`` (run by a worker)."""
    space, gens, guessed, size = _parsed(job)
    found: list[list[int]] = []
    for guess in range(index * job.chunk, min((index + 1) * job.chunk, job.guesses)):
        values = [(guess // size**j) % size for j in range(len(guessed))]
        fixes = [x.sub(space._native.constant(v)) for x, v in zip(guessed, values)]
        found.extend(_native.rational_points(space._native, gens + fixes, None))
    return index, found


class ProgressFile:
    """The progress file: a header line (the run), then one line per finished chunk
    (``{"chunk": i, "points": n}``) and one per chunk whose points were written in part when the
    run stopped (``{"chunk": i, "written": w}``: its first w points, in sorted order)."""

    def __init__(self, path: Optional[str], job: GuessJob):
        self.path = path
        self.done: set[int] = set()
        self.written: dict[int, int] = {}
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
                self._take(json.loads(line))
            except (json.JSONDecodeError, KeyError, TypeError, ValueError):
                if number == len(lines):  # a line torn by a hard kill: that chunk runs again
                    break
                raise ValueError(f"{path}: line {number} is not a progress line") from None

    def _take(self, entry: dict) -> None:
        index = int(entry["chunk"])
        if "written" in entry:
            self.written[index] = int(entry["written"])
        else:
            int(entry["points"])
            self.done.add(index)

    def skip(self, index: int) -> int:
        """How many of the chunk's points (in sorted order) an earlier run wrote."""
        return self.written.get(index, 0)

    def record(self, index: int, points: int) -> None:
        """Chunk ``index`` is finished: all its ``points`` were written."""
        self.done.add(index)
        self.written.pop(index, None)
        self._append({"chunk": index, "points": points})

    def record_written(self, index: int, written: int) -> None:
        """The first ``written`` points of chunk ``index`` were written; the chunk is not finished."""
        self.written[index] = written
        self._append({"chunk": index, "written": written})

    def _append(self, entry: dict) -> None:
        if self.path is not None:
            with open(self.path, "a", encoding="utf-8") as f:
                f.write(json.dumps(entry) + "\n")
                f.flush()
                os.fsync(f.fileno())


@contextmanager
def held_signals() -> Iterator[None]:
    """Ctrl-C (and SIGTERM, where Python handles it) arriving inside the block takes effect at its
    end, so that writing a point and counting it, or writing a progress line, is never cut in
    half. Only the main thread handles signals; elsewhere the block runs as it is."""
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    caught: list[signal.Signals] = []
    held = [s for s in (signal.SIGINT, signal.SIGTERM) if callable(signal.getsignal(s))]
    previous = {
        s: signal.signal(s, lambda signum, frame: caught.append(signal.Signals(signum))) for s in held
    }
    try:
        yield
    finally:
        for s, handler in previous.items():
            signal.signal(s, handler)
        for s in dict.fromkeys(caught):
            handler = previous[s]
            if callable(handler):
                handler(s, None)


class GuessedRun:
    """The points of ``system``, by solving the specialised system of every guess of the
    variables ``guess``: chunks on ``workers`` local processes (1: in this process) or on the
    Dask cluster at ``scheduler``; iterating gives the points as their chunks finish, at most
    ``limit`` of them (``truncated`` tells whether there were more); ``progress``: the file that
    lets a stopped run resume; ``on_chunk(done, total)`` hears of each finished chunk.

    Every point is delivered exactly once over a run and its resumptions. A chunk's points go out
    in sorted order (the same in every run), and a point counts as delivered once it is handed
    out: once ``write(point)`` returned when ``write`` is given (Ctrl-C during it is held until
    the point is counted), else once it is yielded. A chunk is recorded finished after its last
    point; a run that stops in the middle of a chunk (``limit``, Ctrl-C, an error, the iterator
    closed) records how many of its points were delivered, and the next run skips them."""

    def __init__(
        self,
        system: "System",
        guess: list[str],
        *,
        workers: int = 1,
        scheduler: Optional[str] = None,
        progress: Optional[str] = None,
        limit: Optional[int] = None,
        chunk: Optional[int] = None,
        on_chunk: Optional[Callable[[int, int], None]] = None,
        write: Optional[Callable[[tuple], None]] = None,
    ):
        check_guess(system, guess)
        system = system._general()  # a Boolean system with its field equations written out
        size = system.space.field.size
        assert size is not None
        guesses = int(size) ** len(guess)
        self.job = GuessJob.of(system, guess, chunk or chunk_size(guesses, workers))
        self.record = ProgressFile(progress, self.job)
        self.workers, self.scheduler, self.limit = workers, scheduler, limit
        self.on_chunk, self.write = on_chunk, write
        self.delivered = 0
        self.truncated = False

    @property
    def chunks(self) -> int:
        return self.job.chunks

    @property
    def chunks_done(self) -> int:
        return len(self.record.done)

    def __iter__(self) -> Iterator[tuple]:
        return self.points()

    def points(self) -> Generator[tuple, None, None]:
        """The points as they come (what iterating gives); closing it records what was delivered."""
        todo = [i for i in range(self.job.chunks) if i not in self.record.done]
        with closing(_run(self.job, todo, self.workers, self.scheduler)) as results:
            for index, points in results:
                if (yield from self._deliver(index, sorted(tuple(p) for p in points))) == "limit":
                    return
                if self.on_chunk is not None:
                    self.on_chunk(self.chunks_done, self.job.chunks)

    def _deliver(self, index: int, points: list[tuple]) -> Generator[tuple, None, str]:
        """The points of chunk ``index`` not delivered by an earlier run; what was delivered is
        recorded however the delivery ends. Returns "limit" when the limit stopped it."""
        skipped = delivered = self.record.skip(index)
        try:
            while delivered < len(points):
                if self.limit is not None and self.delivered >= self.limit:
                    self.truncated = True  # a point beyond the limit exists
                    return "limit"
                with held_signals():
                    if self.write is not None:
                        self.write(points[delivered])
                    delivered += 1
                    self.delivered += 1
                yield points[delivered - 1]
        finally:
            with held_signals():
                if delivered == len(points):
                    self.record.record(index, len(points))
                elif delivered > skipped:
                    self.record.record_written(index, delivered)
        return "done"


def guessed_points(system: "System", guess: list[str], **options: Any) -> Iterator[tuple]:
    """The points of a :class:`GuessedRun` with these arguments (``workers``, ``scheduler``,
    ``progress``, ``limit``, ``chunk``, ``on_chunk``), as they come."""
    return GuessedRun(system, guess, **options).points()


def _run(
    job: GuessJob, todo: list[int], workers: int, scheduler: Optional[str]
) -> Generator[tuple[int, list], None, None]:
    if scheduler is not None:
        yield from _run_dask(job, todo, scheduler)
    elif workers == 1:
        yield from (solve_chunk(job, i) for i in todo)
    else:
        yield from _run_processes(job, todo, workers)


def _one_thread() -> None:
    """A worker process computes on one thread (read by the core's thread pool when it starts)."""
    os.environ["RAYON_NUM_THREADS"] = "1"


def _run_processes(job: GuessJob, todo: list[int], workers: int) -> Generator[tuple[int, list], None, None]:
    # spawn: the workers start clean, without the parent's rayon threads; each computes on one
    # core (as batch workers do), so that N workers use N cores and do not oversubscribe them.
    with ProcessPoolExecutor(
        workers, mp_context=multiprocessing.get_context("spawn"), initializer=_one_thread
    ) as pool:
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


def _run_dask(job: GuessJob, todo: list[int], address: str) -> Generator[tuple[int, list], None, None]:
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
    ``--json`` collected into the one JSON object instead), then the summary. Ctrl-C and SIGTERM
    end the run with what it delivered (and recorded in the progress file), as the summary or
    the JSON object, and the interrupted exit status."""
    if args.over is not None or args.closed_points:
        raise ValueError(
            "--guess lists the rational points over the file's field; drop --over and --closed-points"
        )
    guess = check_guess(system, [x.strip() for x in args.guess.split(",") if x.strip()])
    start = time.perf_counter()
    names = system.space.names
    text = system.space.field.element_text
    points: list[list[str]] = []

    def write(point: tuple) -> None:
        values = [text(c) for c in point]
        if not args.json:
            print(", ".join(f"{x} = {v}" for x, v in zip(names, values)), flush=True)
        points.append(values)

    def on_chunk(done: int, total: int) -> None:
        activity.set_step(f"guesses: chunk {done} of {total}")

    activity.set_step("guesses")
    run = GuessedRun(
        system,
        guess,
        workers=args.workers or 1,
        scheduler=args.scheduler,
        progress=args.progress,
        limit=args.limit,
        on_chunk=on_chunk,
        write=write,
    )
    interrupted = None
    previous = raise_on_sigterm()
    delivery = run.points()
    try:
        for _ in delivery:
            pass
    except KeyboardInterrupt:
        interrupted = "SIGINT"
    except Terminated:
        interrupted = "SIGTERM"
    finally:
        delivery.close()  # records what was delivered of a chunk cut short
        restore_sigterm(previous)
    result: dict[str, Any] = {
        **header,
        "guess": guess,
        "limit": args.limit,
        "progress": args.progress,
        "scheduler": args.scheduler,
        "workers": args.workers or 1,
        "chunks_done": run.chunks_done,
        "chunks": run.chunks,
        "points": points,
        "truncated": run.truncated,
        "interrupted": interrupted,
        "seconds": time.perf_counter() - start,
    }
    sys.stdout.flush()
    return result


def render_solve(result: dict) -> str:
    """The summary after the streamed points (the points themselves are printed as found)."""
    processes = f"{result['workers']} local process" + ("es" if result["workers"] > 1 else "")
    where = f"the Dask cluster at {result['scheduler']}" if result["scheduler"] else processes
    head = f"{result['file']}: {plural(len(result['points']), 'point')} over {result['field']}"
    if result["truncated"]:
        head += " (stopped at --limit)"
    elif result.get("interrupted"):
        head += f" (interrupted by {result['interrupted']})"
    rows = [
        ("guessed", ", ".join(result["guess"])),
        ("ran on", where),
        (
            "chunks",
            f"{result['chunks_done']} of {result['chunks']} done"
            + (f" (progress in {result['progress']})" if result["progress"] else ""),
        ),
        ("checked", "every point satisfies every equation (substituted before printing)"),
        ("complete", _completeness(result)),
        ("time", seconds(result["seconds"])),
    ]
    return f"{head}\n{aligned(rows)}"


def _completeness(result: dict) -> str:
    if not result["truncated"] and result["chunks_done"] == result["chunks"]:
        return "yes: every guess was solved"
    if result["progress"]:
        return (
            "no: run the same command again with the same --progress file to go on "
            "(it writes only the points not written yet)"
        )
    return "no: without --progress a new run starts from the beginning"
