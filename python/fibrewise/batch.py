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
from typing import Any, Iterator

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
    handle = open(path, encoding="utf-8")
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
                raise BatchInputError(f"{path}:{number}: duplicate id {key} (first on line {first_line[key]})")
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
    """Ids already in a result file. A damaged tail (torn last line, NUL bytes after a power loss)
    is cut off; a damaged line followed by good ones is an error, since cutting would lose results."""
    if not os.path.exists(path):
        return set()
    ids: set[str] = set()
    good_end, offset, damaged_line = 0, 0, None
    with open(path, "rb") as handle:
        for number, raw in enumerate(handle, 1):
            offset += len(raw)
            record = _parse_record(raw)
            if record is None and raw.endswith(b"\n") and not raw.strip():
                if damaged_line is None:
                    good_end = offset
                continue
            if record is None:
                damaged_line = damaged_line or number
                continue
            if damaged_line is not None:
                raise BatchInputError(f"{path}:{damaged_line}: damaged result line before good ones; "
                                      "remove or fix it, then rerun")
            ids.add(_id_key(record["id"]))
            good_end = offset
    if good_end < offset:
        with open(path, "r+b") as handle:
            handle.truncate(good_end)
            os.fsync(handle.fileno())
        print(f"fibrewise batch: {path}:{damaged_line}: dropped a torn last line left by an "
              "interrupted run; that job runs again", file=sys.stderr)
    return ids


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
    anonymous mappings: RLIMIT_DATA), then read one job a line on stdin and answer one line on
    stdout, the job's status, a tab and its result line, until stdin closes."""
    import resource

    memory_bytes = int(sys.argv[1]) if len(sys.argv) > 1 else 0
    if memory_bytes:
        resource.setrlimit(resource.RLIMIT_DATA, (memory_bytes, memory_bytes))
    replies = os.fdopen(os.dup(1), "wb")
    os.dup2(2, 1)  # stray output, from Python or native code, must not break the protocol
    sys.stdout = sys.stderr
    threading.Thread(target=_exit_with_parent, args=(os.getppid(),), daemon=True).start()
    for line in sys.stdin:
        record = run_job(json.loads(line))
        replies.write(record["status"].encode("ascii") + b"\t" + record_line(record))
        replies.flush()


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
    jobs: deque = field(default_factory=deque)
    timeout: float | None = None
    deadline: float | None = None  # of the running job
    process: Any = field(default=None, repr=False)
    errors: Any = field(default=None, repr=False)
    unread: bytearray = field(default_factory=bytearray, repr=False)

    def start(self) -> "Sandbox":
        import subprocess
        import tempfile

        self.errors = tempfile.TemporaryFile()  # the worker's stderr, read if it dies
        # One core per job; numeric libraries must not start thread pools of their own either.
        env = dict(os.environ, RAYON_NUM_THREADS="1", OPENBLAS_NUM_THREADS="1", OMP_NUM_THREADS="1",
                   RUST_BACKTRACE="0")
        self.process = subprocess.Popen(
            [sys.executable, "-c", WORKER_CODE, str(self.memory_bytes or 0)],
            stdin=subprocess.PIPE, stdout=subprocess.PIPE, stderr=self.errors, env=env,
            start_new_session=True)
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
            record = {"id": job["id"], "status": "error", "error": self._death_message(), "seconds": None}
            self.restart()
            return [Finished.of(record)]
        self.unread += data
        finished, start = [], 0
        while (end := self.unread.find(b"\n", start) + 1):
            tab = self.unread.index(b"\t", start)
            self.jobs.popleft()
            finished.append(Finished(self.unread[start:tab].decode("ascii"), bytes(self.unread[tab + 1:end])))
            start = end
        if finished:
            del self.unread[:start]
            self._start_clock()
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

    def time_out(self) -> Finished:
        """The running job's timeout line; the worker is replaced."""
        job, _ = self.jobs.popleft()
        record = {"id": job["id"], "status": "timeout",
                  "error": f"over the time limit of {self.timeout:g} s", "seconds": self.timeout}
        self.restart()
        return Finished.of(record)

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


def job_line(job: dict) -> bytes:
    """A job as the line a worker reads."""
    return json.dumps(job).encode("utf-8") + b"\n"


def run_local(jobs: list[dict], workers: int, timeout: float | None,
              memory_bytes: int | None) -> Iterator[Finished]:
    """The finished jobs, in completion order, from a pool of ``workers`` sandboxes."""
    from multiprocessing.connection import wait

    if not jobs:
        return
    pending = deque((job, job_line(job)) for job in jobs)
    pool = [Sandbox(memory_bytes).start() for _ in range(max(1, min(workers, len(jobs))))]
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
            for sandbox in wait(busy, timeout=wait_for):
                yield from sandbox.read()
            now = time.monotonic()
            for sandbox in busy:
                if sandbox.jobs and sandbox.deadline is not None and sandbox.deadline <= now:
                    yield sandbox.time_out()
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
        sandbox = _local_sandbox.sandbox = Sandbox(memory_bytes).start()
    from multiprocessing.connection import wait

    sandbox.submit(job, timeout)
    while True:
        left = None if sandbox.deadline is None else max(0.0, sandbox.deadline - time.monotonic())
        if not wait([sandbox], timeout=left):
            return _as_record(sandbox.time_out())
        finished = sandbox.read()
        if finished:
            return _as_record(finished[0])


def _as_record(finished: Finished) -> dict:
    return json.loads(finished.line)


DASK_WINDOW = 1000  # jobs in flight on the cluster at once: bounded scheduler memory, quick stop


def run_dask(jobs: list[dict], address: str, timeout: float | None, memory_bytes: int | None) -> Iterator[dict]:
    """Records of the jobs, in completion order, computed on the Dask cluster at ``address``.

    A job the cluster loses (a worker machine gone, a task error outside the job) yields a record
    with status ``"lost"``, which is not written: it runs again on resume."""
    try:
        from distributed import Client, as_completed
    except ImportError:
        raise RuntimeError("--scheduler needs the optional packages dask and distributed "
                           "(pip install dask distributed)") from None
    from functools import partial

    task = partial(run_in_sandbox, timeout=timeout, memory_bytes=memory_bytes)
    pending = iter(jobs)
    with Client(address, timeout="30s") as client:
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
                    yield future.result()
                except Exception as e:  # noqa: BLE001 - the cluster's failure, not the job's
                    yield {"id": job_id, "status": "lost", "error": f"{type(e).__name__}: {e}"}
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
    lost: int = 0  # by the cluster; not written, so they run again on resume
    seconds: float = 0.0
    interrupted: str | None = None  # the signal that stopped the run

    def to_dict(self) -> dict:
        return dict(self.__dict__)


class _Stop(BaseException):
    """SIGTERM turned into an exception so that the run ends through its cleanup code."""


def run_batch(input_path: str, output_path: str, *, workers: int | None = None,
              timeout: float | None = None, memory_mb: int | None = None,
              scheduler: str | None = None, quiet: bool = False) -> BatchSummary:
    """Runs every job of ``input_path`` not yet in ``output_path`` and appends its record there.

    Raises ``BatchInputError`` (before any work) for a bad input or a damaged output file.
    On Ctrl-C or SIGTERM, stops at once: running jobs get no line and run again on resume.
    """
    from .progress import Progress

    jobs = read_jobs(input_path)
    output = ResultFile(output_path)
    try:
        done = finished_ids(output_path)
    except BatchInputError:
        output.close()
        raise
    todo = [job for job in jobs if _id_key(job["id"]) not in done]
    summary = BatchSummary(total=len(jobs), skipped=len(jobs) - len(todo))
    memory_bytes = memory_mb << 20 if memory_mb else None
    start = time.monotonic()
    progress = Progress(len(todo), quiet=quiet)
    previous = _on_sigterm()
    records = None
    try:
        if scheduler:
            records = run_dask(todo, scheduler, timeout, memory_bytes)
        else:
            records = run_local(todo, workers or os.cpu_count() or 1, timeout, memory_bytes)
        for item in records:
            if isinstance(item, dict) and item["status"] == "lost":
                summary.lost += 1
                print(f"fibrewise batch: job {json.dumps(item['id'])} lost by the cluster "
                      f"({item['error']}); it runs again on resume", file=sys.stderr)
            else:
                finished = item if isinstance(item, Finished) else Finished.of(item)
                output.append(finished.line)
                setattr(summary, finished.status, getattr(summary, finished.status) + 1)
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


def _on_sigterm():
    if threading.current_thread() is not threading.main_thread():
        return None

    def stop(signum, frame):
        raise _Stop()

    return signal.signal(signal.SIGTERM, stop)

