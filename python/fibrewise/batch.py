"""Batch runs that never lose a finished result, on local worker processes or a Dask cluster.

- The input (JSON lines) is read once and fully checked before any work starts: a malformed line,
  a bad job or a duplicate id is one error naming the line.
- Jobs run in long-lived worker processes (``Sandbox``), one job at a time each, with an optional
  data-memory limit; a job over its time limit has its worker killed and replaced. A worker that
  dies (out of memory, a crash) costs only its own job, which gets an error line. Each worker
  has its next job waiting in its input while it computes (so it never waits for the parent
  between jobs), and its answer is the finished line itself, which the parent appends as it is.
- Every finished job is appended to the output as one complete line and flushed at once; a
  background thread fsyncs the file in groups (group commit: each fsync covers every line
  written while the previous one ran), so a killed process loses nothing written and a power
  loss at most the lines of the last few milliseconds (one fsync). A rerun with the same output skips the ids already there; a torn last line (a crash
  in the middle of a write) is cut off on resume.
- ``--scheduler`` sends the same jobs to a Dask distributed cluster; each Dask worker runs them in
  its own sandbox processes, so time and memory limits mean the same there.
"""

from __future__ import annotations

import json
import os
import signal
import sys
import threading
import time
from collections import deque
from dataclasses import dataclass, field
from typing import Any, Generator

from .jobs import JobError, check_job, run_job


class BatchInputError(ValueError):
    """A problem in a batch input or output file, located by file and line."""


# ----------------------------------------------------------------------------------------------
# Input


def _id_key(value: Any) -> str:
    return json.dumps(value)


def read_jobs(path: str) -> list[dict]:
    """All jobs of a JSON-lines file, read once and checked; raises ``BatchInputError`` at the
    first bad line."""
    jobs: list[dict] = []
    first_line: dict[str, int] = {}
    handle = open(path, encoding="utf-8-sig")  # a byte-order mark some editors write is accepted
    try:
        for number, raw in enumerate(handle, 1):
            if not raw.strip():
                continue
            try:
                obj = json.loads(raw)
            except json.JSONDecodeError as e:
                raise BatchInputError(f"{path}:{number}:{e.colno}: malformed JSON: {e.msg}") from None
            try:
                job = check_job(obj)
            except JobError as e:
                raise BatchInputError(f"{path}:{number}: {e}") from None
            key = _id_key(job["id"])
            if key in first_line:
                raise BatchInputError(
                    f"{path}:{number}: duplicate id {key} (first on line {first_line[key]})"
                )
            first_line[key] = number
            jobs.append(job)
    except UnicodeDecodeError as e:
        raise BatchInputError(f"{path}: not UTF-8 text ({e.reason} at byte {e.start})") from None
    finally:
        handle.close()
    return jobs


# ----------------------------------------------------------------------------------------------
# Output: append-only, flushed per line, fsynced in groups, resumable


def finished_ids(path: str) -> set[str]:
    """Ids already in a result file; a torn last line left by an interrupted run is cut off
    (see ``read_results``)."""
    return {_id_key(record["id"]) for record, _ in read_results(path)}


#: Every result line starts so (``record_line`` writes the id first): a last line without its
#: newline that is a prefix of this, or starts with it, is one the batch itself left torn.
RESULT_LINE_START = b'{"id":'


def read_results(path: str) -> list[tuple[dict, bytes]]:
    """The result records of an output file with their lines, in file order.

    Only a line the batch itself can have left torn is cut off (and reported): the last line,
    without its newline, that starts like a result line (a write cut short by a crash), possibly
    followed by NUL bytes (a power loss). Any other line that is not a result line, complete JSON
    or not, is a ``BatchInputError`` naming the line, and the file is left as it was: the output
    may be some other file given by mistake."""
    if not os.path.exists(path):
        return []
    records: list[tuple[dict, bytes]] = []
    torn_line = torn_offset = None
    offset = 0
    with open(path, "rb") as handle:
        for number, raw in enumerate(handle, 1):
            start, offset = offset, offset + len(raw)
            record = _parse_record(raw)
            if record is not None:
                records.append((record, raw))
            elif raw.endswith(b"\n") and not raw.strip():
                continue
            elif not raw.endswith(b"\n") and _torn(raw):
                torn_line, torn_offset = number, start
            elif _is_later_good(handle):
                raise BatchInputError(
                    f"{path}:{number}: damaged result line before good ones; remove or fix it, then rerun"
                )
            else:
                raise BatchInputError(
                    f"{path}:{number}: not a result line ({_snippet(raw)}); the file is "
                    "left as it is: is it the right output file? Fix or remove that line, "
                    "or write to another file"
                )
    if torn_line is not None:
        with open(path, "r+b") as handle:
            handle.truncate(torn_offset)
            os.fsync(handle.fileno())
        print(
            f"fibrewise batch: {path}:{torn_line}: dropped a torn last line left by an "
            "interrupted run; that job runs again",
            file=sys.stderr,
        )
    return records


def _torn(raw: bytes) -> bool:
    """Whether a last line without its newline is a result line cut short (and NUL bytes)."""
    text = raw.rstrip(b"\0")
    return text.startswith(RESULT_LINE_START) or RESULT_LINE_START.startswith(text)


def _is_later_good(handle) -> bool:
    """Whether a result line follows in the rest of ``handle`` (consumed)."""
    return any(_parse_record(raw) is not None for raw in handle)


def _snippet(raw: bytes, width: int = 60) -> str:
    text = raw.decode("utf-8", "replace").rstrip("\n")
    return repr(text if len(text) <= width else text[:width] + "...")


def _parse_record(raw: bytes) -> dict | None:
    if not raw.endswith(b"\n"):
        return None
    try:
        record = json.loads(raw)
    except (ValueError, UnicodeDecodeError):
        return None
    return record if isinstance(record, dict) and "id" in record and "status" in record else None


def record_line(record: dict) -> bytes:
    """A result record as the one line that goes into the output file."""
    return (json.dumps(record, ensure_ascii=False, separators=(",", ":")) + "\n").encode("utf-8")


@dataclass
class Finished:
    """A finished job: its status and its result line, ready to append."""

    status: str
    line: bytes

    @classmethod
    def of(cls, record: dict) -> "Finished":
        return cls(record["status"], record_line(record))


class ResultFile:
    """Appends one JSON line per finished job. ``append`` writes and flushes the whole line at
    once (a killed process keeps it); a syncing thread fsyncs whatever has been written since
    its last fsync, as soon as it is written, so durability costs the main loop nothing.
    (Spacing the fsyncs 50 ms apart gave 6% more jobs per second on the batch benchmark, for a
    window of lost lines ten times longer; not worth it.)"""

    def __init__(self, path: str):
        import fcntl

        self.path = path
        created = not os.path.exists(path)
        self.handle = open(path, "ab")
        try:  # two runs appending to one file could both run a job: one writer at a time
            fcntl.flock(self.handle.fileno(), fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:
            self.handle.close()
            raise BatchInputError(f"{path}: in use by another fibrewise batch run") from None
        if created:
            _fsync_directory(path)
        self.cond = threading.Condition()
        self.dirty = self.closing = False
        self.syncer = threading.Thread(target=self._sync_loop, name="fibrewise-fsync", daemon=True)
        self.syncer.start()

    def append(self, line: bytes) -> None:
        """Appends one complete result line (as made by ``record_line``)."""
        self.handle.write(line)
        self.handle.flush()
        with self.cond:
            self.dirty = True
            self.cond.notify()

    def rewritten(self, lines: list[bytes]) -> "ResultFile":
        """The result file with exactly ``lines``, replaced as a whole (a new file renamed over
        the old one, so that a crash leaves one or the other), still locked against other runs."""
        temporary = f"{self.path}.rewrite-{os.getpid()}"
        with open(temporary, "wb") as handle:
            handle.writelines(lines)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(temporary, self.path)
        _fsync_directory(self.path)
        replacement = ResultFile(self.path)
        self.close()
        return replacement

    def _sync_loop(self) -> None:
        while True:
            with self.cond:
                while not self.dirty and not self.closing:
                    self.cond.wait()
                if not self.dirty:
                    return
                self.dirty = False
            # Lines written while this runs (milliseconds of disk time) share the next one.
            os.fsync(self.handle.fileno())

    def close(self) -> None:
        with self.cond:
            self.closing = True
            self.cond.notify()
        self.syncer.join()
        self.handle.close()


def _fsync_directory(path: str) -> None:
    """Makes a new file's directory entry durable too."""
    try:
        fd = os.open(os.path.dirname(os.path.abspath(path)), os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


# ----------------------------------------------------------------------------------------------
# Worker processes


WORKER_CODE = "from fibrewise.batch import serve; serve()"

#: A second job is queued behind the running one only when its line is this short: the pipe
#: (64 KiB on Linux) then always has room, so the parent never blocks writing to a busy worker.
QUEUED_LINE_LIMIT = 16 << 10


def serve() -> None:
    """A worker's life (``python -c WORKER_CODE MEMORY_BYTES``): limit its data memory (heap and
    anonymous mappings: RLIMIT_DATA) and give its computations a memory budget below that limit
    (so that a big allocation ends in a ResourceLimit error line rather than in the worker's
    death), then read one job a line on stdin and answer on stdout:
    a line ``task<TAB>[name, value]`` for each task as it finishes, then the job's status, a tab
    and its result line, until stdin closes."""
    import resource

    _die_with_parent()
    memory_bytes = int(sys.argv[1]) if len(sys.argv) > 1 else 0
    if memory_bytes:
        resource.setrlimit(resource.RLIMIT_DATA, (memory_bytes, memory_bytes))
    budget = int(sys.argv[2]) if len(sys.argv) > 2 and int(sys.argv[2]) else None
    replies = os.fdopen(os.dup(1), "wb")
    os.dup2(2, 1)  # stray output, from Python or native code, must not break the protocol
    sys.stdout = sys.stderr
    threading.Thread(target=_exit_with_parent, args=(os.getppid(),), daemon=True).start()

    def task_done(name: str, value: Any) -> None:
        replies.write(PARTIAL + b"\t" + json.dumps([name, value], ensure_ascii=False).encode("utf-8") + b"\n")
        replies.flush()

    for line in sys.stdin:
        record = run_job(json.loads(line), task_done, budget)
        replies.write(record["status"].encode("ascii") + b"\t" + record_line(record))
        replies.flush()


#: The worker's word for "one task of the running job finished" (not a job status).
PARTIAL = b"task"


def _die_with_parent() -> None:
    """Asks Linux to kill this worker the moment its parent dies (PR_SET_PDEATHSIG), which needs
    no thread of ours to run: a worker deep in native code, or holding the GIL, still dies at
    once with its batch. Elsewhere the polling thread of ``_exit_with_parent`` does it."""
    if not sys.platform.startswith("linux"):
        return
    try:
        import ctypes

        libc = ctypes.CDLL(None, use_errno=True)
        PR_SET_PDEATHSIG = 1
        libc.prctl(PR_SET_PDEATHSIG, signal.SIGKILL, 0, 0, 0)
    except (OSError, AttributeError):
        pass


def _exit_with_parent(parent: int) -> None:
    """A worker whose parent was killed (SIGKILL, power off) must not compute on for nobody."""
    while os.getppid() == parent:
        time.sleep(1.0)
    os._exit(1)


@dataclass
class Sandbox:
    """One long-lived worker process, running one job at a time; ``jobs`` are the jobs sent to it
    with their input lines, the first one running, the others waiting in its input. It has its own session, so a Ctrl-C
    at the terminal reaches only the parent, which decides what stops."""

    memory_bytes: int | None = None
    budget: int | None = None  # the memory budget of the worker's computations
    jobs: deque = field(default_factory=deque)
    timeout: float | None = None
    deadline: float | None = None  # of the running job
    finished_tasks: dict = field(default_factory=dict)  # of the running job, by task name
    process: Any = field(default=None, repr=False)
    errors: Any = field(default=None, repr=False)
    unread: bytearray = field(default_factory=bytearray, repr=False)

    def start(self) -> "Sandbox":
        import subprocess
        import tempfile

        self.errors = tempfile.TemporaryFile()  # the worker's stderr, read if it dies
        # One core per job; numeric libraries must not start thread pools of their own either.
        env = dict(
            os.environ,
            RAYON_NUM_THREADS="1",
            OPENBLAS_NUM_THREADS="1",
            OMP_NUM_THREADS="1",
            RUST_BACKTRACE="0",
        )
        self.process = subprocess.Popen(
            [sys.executable, "-c", WORKER_CODE, str(self.memory_bytes or 0), str(self.budget or 0)],
            stdin=subprocess.PIPE,
            stdout=subprocess.PIPE,
            stderr=self.errors,
            env=env,
            start_new_session=True,
        )
        self.unread = bytearray()
        for _, line in self.jobs:  # after a restart: the jobs waiting in the old one's input
            self._send(line)
        self._start_clock()
        return self

    def fileno(self) -> int:
        return self.process.stdout.fileno()

    def can_take(self, line: bytes) -> bool:
        """Whether the job of input line ``line`` may be sent now: to an idle worker always,
        behind a running job when the line is short."""
        return not self.jobs or (len(self.jobs) == 1 and len(line) <= QUEUED_LINE_LIMIT)

    def submit(self, job: dict, timeout: float | None, line: bytes | None = None) -> None:
        self.timeout = timeout
        line = line or job_line(job)
        self.jobs.append((job, line))
        self._send(line)
        if len(self.jobs) == 1:
            self._start_clock()

    def _send(self, line: bytes) -> None:
        try:
            self.process.stdin.write(line)
            self.process.stdin.flush()
        except OSError:
            pass  # a dead worker shows up as the end of its output

    def _start_clock(self) -> None:
        """The first job runs from now on (the worker reads its next job as soon as it answers)."""
        self.deadline = None if not self.jobs or self.timeout is None else time.monotonic() + self.timeout

    def read(self) -> list[Finished]:
        """The jobs finished since the last call, once the output is readable; a dead worker's
        running job becomes an error line and the worker is replaced."""
        data = os.read(self.fileno(), 1 << 20)
        if not data:
            job, _ = self.jobs.popleft()
            record = {
                "id": job["id"],
                "status": "error",
                "error": self._death_message(),
                "seconds": None,
                **self._tasks_so_far(),
            }
            self.restart()
            return [Finished.of(record)]
        self.unread += data
        finished, start = [], 0
        while end := self.unread.find(b"\n", start) + 1:
            tab = self.unread.index(b"\t", start)
            kind = bytes(self.unread[start:tab])
            if kind == PARTIAL:
                name, value = json.loads(self.unread[tab + 1 : end])
                self.finished_tasks[name] = value
            else:
                self.jobs.popleft()
                self.finished_tasks = {}
                finished.append(Finished(kind.decode("ascii"), bytes(self.unread[tab + 1 : end])))
            start = end
        del self.unread[:start]
        if finished:
            self._start_clock()
        return finished

    def _read_available(self) -> list[Finished]:
        """What the worker has already written (finished tasks, finished jobs), without waiting."""
        finished = []
        while self.process.poll() is None and readable([self], 0):
            finished += self.read()
            if not self.jobs:
                break
        return finished

    def _death_message(self) -> str:
        code = self.process.wait()
        try:
            how = f"signal {signal.Signals(-code).name}" if code < 0 else f"exit status {code}"
        except ValueError:
            how = f"signal {-code}"
        message = f"the worker process died ({how})"
        last = self._last_error_line()
        if last:
            message += f": {last}"
        if self.memory_bytes:
            message += f"; most likely out of memory (limit {self.memory_bytes >> 20} MiB)"
        return message

    def _last_error_line(self) -> str:
        self.errors.seek(0, os.SEEK_END)
        self.errors.seek(max(0, self.errors.tell() - 4096))
        lines = [l.strip() for l in self.errors.read().decode("utf-8", "replace").splitlines() if l.strip()]
        useful = [l for l in lines if not l.startswith("note: run with")]
        return useful[-1] if useful else ""

    def _tasks_so_far(self) -> dict:
        """``{"result": ...}`` with the tasks the running job finished, if any, and forgets them."""
        tasks, self.finished_tasks = self.finished_tasks, {}
        return {"result": tasks} if tasks else {}

    def time_out(self) -> list[Finished]:
        """The lines of the jobs finished just in time, and the running job's timeout line with
        the tasks it finished; the worker is replaced."""
        finished = self._read_available()
        if finished and (self.deadline is None or self.deadline > time.monotonic()):
            return finished  # the running job answered in time; the next one has its own clock
        job, _ = self.jobs.popleft()
        record = {
            "id": job["id"],
            "status": "timeout",
            "error": f"over the time limit of {self.timeout:g} s",
            "seconds": self.timeout,
            **self._tasks_so_far(),
        }
        self.restart()
        return finished + [Finished.of(record)]

    def restart(self) -> None:
        self.kill()
        self.start()

    def kill(self) -> None:
        if self.process.poll() is None:
            self.process.kill()
        self.process.wait()
        self._close_pipes()

    def stop(self) -> None:
        """Lets an idle worker finish by closing its input, then makes sure it has."""
        try:
            self.process.stdin.close()
        except OSError:
            pass
        try:
            self.process.wait(timeout=2)
        except Exception:  # noqa: BLE001 - subprocess.TimeoutExpired; kill below
            pass
        self.kill()

    def _close_pipes(self) -> None:
        for pipe in (self.process.stdin, self.process.stdout, self.errors):
            try:
                pipe.close()
            except OSError:
                pass


#: The share of a worker's memory limit its computations may use (the rest is the interpreter's
#: and the job's own small allocations, which the budget does not count).
BUDGET_SHARE = 0.8
#: The share of the machine's memory all workers together may use when no limit is given.
MACHINE_SHARE = 0.75


def worker_budget(memory_bytes: int | None, workers: int) -> int | None:
    """The memory budget of one worker's computations: most of its limit, or without a limit
    its share of three quarters of the machine, so that workers together never exhaust it."""
    if memory_bytes:
        return int(memory_bytes * BUDGET_SHARE)
    from .memory import machine_memory

    total = machine_memory()
    return None if total is None else int(total * MACHINE_SHARE / max(1, workers))


def job_line(job: dict) -> bytes:
    """A job as the line a worker reads."""
    return json.dumps(job).encode("utf-8") + b"\n"


def readable(sandboxes: list[Sandbox], timeout: float | None) -> list[Sandbox]:
    """The sandboxes whose worker has written something, waiting up to ``timeout`` seconds."""
    from multiprocessing.connection import wait

    # wait() takes any object with a fileno(); its type stub names only connections, sockets
    # and ints.
    return wait(sandboxes, timeout)  # type: ignore[arg-type, return-value]


def run_local(
    jobs: list[dict], workers: int, timeout: float | None, memory_bytes: int | None
) -> Generator[Finished, None, None]:
    """The finished jobs, in completion order, from a pool of ``workers`` sandboxes."""
    if not jobs:
        return
    pending = deque((job, job_line(job)) for job in jobs)
    count = max(1, min(workers, len(jobs)))
    budget = worker_budget(memory_bytes, count)
    pool = [Sandbox(memory_bytes, budget).start() for _ in range(count)]
    try:
        while True:
            # A job for every idle worker first, then one more behind each running one.
            for queued in (0, 1):
                for sandbox in pool:
                    if pending and len(sandbox.jobs) == queued and sandbox.can_take(pending[0][1]):
                        job, line = pending.popleft()
                        sandbox.submit(job, timeout, line)
            busy = [s for s in pool if s.jobs]
            if not busy:
                return
            deadlines = [s.deadline for s in busy if s.deadline is not None]
            wait_for = max(0.0, min(deadlines) - time.monotonic()) if deadlines else None
            for sandbox in readable(busy, wait_for):
                yield from sandbox.read()
            now = time.monotonic()
            for sandbox in busy:
                if sandbox.jobs and sandbox.deadline is not None and sandbox.deadline <= now:
                    yield from sandbox.time_out()
    finally:
        for sandbox in pool:
            if sandbox.jobs:
                sandbox.kill()  # interrupted mid-job: its jobs get no line and run again on resume
            else:
                sandbox.stop()


# ----------------------------------------------------------------------------------------------
# Dask


_local_sandbox = threading.local()


def run_in_sandbox(job: dict, timeout: float | None, memory_bytes: int | None) -> dict:
    """Runs one job in this thread's own worker process (started on first use). This is what a
    Dask worker executes, so the limits hold on a cluster as they do locally."""
    sandbox = getattr(_local_sandbox, "sandbox", None)
    if sandbox is None or sandbox.memory_bytes != memory_bytes or sandbox.process.poll() is not None:
        if sandbox is not None:
            sandbox.kill()
        sandbox = _local_sandbox.sandbox = Sandbox(memory_bytes, worker_budget(memory_bytes, 1)).start()
    sandbox.submit(job, timeout)
    while True:
        left = None if sandbox.deadline is None else max(0.0, sandbox.deadline - time.monotonic())
        if not readable([sandbox], left):
            return _as_record(sandbox.time_out()[-1])
        finished = sandbox.read()
        if finished:
            return _as_record(finished[0])


def _as_record(finished: Finished) -> dict:
    return json.loads(finished.line)


DASK_WINDOW = 1000  # jobs in flight on the cluster at once: bounded scheduler memory, quick stop


@dataclass
class Lost:
    """A job the cluster lost (a worker machine gone, a task error outside the job): no line is
    written for it, so that it runs again on resume."""

    id: Any
    error: str


def dask_client(address: str) -> Any:
    """A client of the Dask cluster at ``address`` (a context manager); ``RuntimeError`` when
    dask and distributed are not installed."""
    try:
        from distributed import Client
    except ImportError:
        raise RuntimeError(
            "--scheduler needs the optional packages dask and distributed (pip install dask distributed)"
        ) from None
    return Client(address, timeout="30s")


def run_dask(
    jobs: list[dict], address: str, timeout: float | None, memory_bytes: int | None
) -> Generator[Finished | Lost, None, None]:
    """The finished and the lost jobs, in completion order, computed on the Dask cluster at
    ``address``."""
    from functools import partial

    task = partial(run_in_sandbox, timeout=timeout, memory_bytes=memory_bytes)
    pending = iter(jobs)
    with dask_client(address) as client:
        from distributed import as_completed

        in_flight: dict[Any, Any] = {}

        def submit_next(queue) -> None:
            job = next(pending, None)
            if job is not None:
                future = client.submit(task, job, pure=False)
                in_flight[future] = job["id"]
                queue.add(future)

        queue = as_completed()
        for _ in range(DASK_WINDOW):
            submit_next(queue)
        try:
            for future in queue:
                job_id = in_flight.pop(future)
                try:
                    record = future.result()
                except Exception as e:  # noqa: BLE001 - the cluster's failure, not the job's
                    yield Lost(job_id, f"{type(e).__name__}: {e}")
                else:
                    yield Finished.of(record)
                submit_next(queue)
        finally:
            client.cancel(list(in_flight))


# ----------------------------------------------------------------------------------------------
# The whole run


@dataclass
class BatchSummary:
    total: int
    skipped: int
    ok: int = 0
    error: int = 0
    timeout: int = 0
    retried: int = 0  # error and timeout lines replaced (--retry-failed)
    lost: int = 0  # by the cluster; not written, so they run again on resume
    seconds: float = 0.0
    interrupted: str | None = None  # the signal that stopped the run

    def to_dict(self) -> dict:
        return dict(self.__dict__)


class _Stop(BaseException):
    """SIGTERM turned into an exception so that the run ends through its cleanup code."""


def run_batch(
    input_path: str,
    output_path: str,
    *,
    workers: int | None = None,
    timeout: float | None = None,
    memory_mb: int | None = None,
    memory_bytes: int | None = None,
    scheduler: str | None = None,
    quiet: bool = False,
    retry_failed: bool = False,
) -> BatchSummary:
    """Runs every job of ``input_path`` not yet in ``output_path`` and appends its record there.
    With ``retry_failed``, jobs whose line says error or timeout run again too, and their new
    line replaces the old one (one line per id).

    Raises ``BatchInputError`` (before any work) for a bad input or a damaged output file, and
    for an output file that is the input file.
    On Ctrl-C or SIGTERM, stops at once: running jobs get no line and run again on resume.
    """
    from .progress import Progress

    if _same_file(input_path, output_path):
        raise BatchInputError(
            f"{output_path}: the output file is the input file {input_path}; results go to another file (-o)"
        )
    jobs = read_jobs(input_path)
    output = ResultFile(output_path)
    try:
        results = read_results(output_path)
        # only jobs of this input: a failed line of another job is not ours to drop
        retried = _failed_ids(results) & {_id_key(job["id"]) for job in jobs} if retry_failed else set()
        if retried:
            output = output.rewritten(
                [line for record, line in results if _id_key(record["id"]) not in retried]
            )
    except BatchInputError:
        output.close()
        raise
    done = {_id_key(record["id"]) for record, _ in results} - retried
    todo = [job for job in jobs if _id_key(job["id"]) not in done]
    summary = BatchSummary(
        total=len(jobs),
        skipped=len(jobs) - len(todo),
        retried=sum(_id_key(job["id"]) in retried for job in jobs),
    )
    memory_bytes = memory_bytes or (memory_mb << 20 if memory_mb else None)
    start = time.monotonic()
    progress = Progress(len(todo), quiet=quiet)
    previous = _on_sigterm()
    records: Generator[Finished | Lost, None, None] | None = None
    try:
        if scheduler:
            records = run_dask(todo, scheduler, timeout, memory_bytes)
        else:
            records = run_local(todo, workers or os.cpu_count() or 1, timeout, memory_bytes)
        for item in records:
            if isinstance(item, Lost):
                summary.lost += 1
                print(
                    f"fibrewise batch: job {json.dumps(item.id)} lost by the cluster "
                    f"({item.error}); it runs again on resume",
                    file=sys.stderr,
                )
            else:
                output.append(item.line)
                setattr(summary, item.status, getattr(summary, item.status) + 1)
            progress.advance()
    except KeyboardInterrupt:
        summary.interrupted = "SIGINT"
    except _Stop:
        summary.interrupted = "SIGTERM"
    finally:
        if records is not None:
            records.close()  # stops the workers; a job still running gets no line
        progress.close()
        output.close()
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)
        summary.seconds = round(time.monotonic() - start, 3)
    return summary


def _same_file(a: str, b: str) -> bool:
    """Whether two paths name one file (through links too); for an output that does not exist
    yet, whether they resolve to the same path."""
    try:
        return os.path.samefile(a, b)
    except OSError:
        return os.path.realpath(a) == os.path.realpath(b)


def _failed_ids(results: list[tuple[dict, bytes]]) -> set[str]:
    """Ids whose (last) line says error or timeout."""
    last = {_id_key(record["id"]): record["status"] for record, _ in results}
    return {key for key, status in last.items() if status in ("error", "timeout")}


def _on_sigterm():
    if threading.current_thread() is not threading.main_thread():
        return None

    def stop(signum, frame):
        raise _Stop()

    return signal.signal(signal.SIGTERM, stop)
