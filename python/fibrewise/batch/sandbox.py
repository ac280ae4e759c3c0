"""Batch worker processes: long-lived sandboxes that run one job at a time with an optional
data-memory limit and a memory budget for their computations. A job over its time limit has its
worker killed and replaced; a worker that dies (out of memory, a crash) costs only its own job,
which gets an error line. Each worker has its next job waiting in its input while it computes (so
it never waits for the parent between jobs), and its answer is the finished line itself."""

from __future__ import annotations

import ctypes
import json
import os
import resource
import signal
import subprocess
import sys
import tempfile
import threading
import time
from collections import deque
from dataclasses import dataclass, field
from multiprocessing.connection import wait
from typing import Any

from ..jobs import run_job
from ..memory import machine_memory
from .resultfile import Finished, record_line


WORKER_CODE = "from fibrewise.batch.sandbox import serve; serve()"

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
    total = machine_memory()
    return None if total is None else int(total * MACHINE_SHARE / max(1, workers))


def job_line(job: dict) -> bytes:
    """A job as the line a worker reads."""
    return json.dumps(job).encode("utf-8") + b"\n"


def readable(sandboxes: list[Sandbox], timeout: float | None) -> list[Sandbox]:
    """The sandboxes whose worker has written something, waiting up to ``timeout`` seconds."""
    # wait() takes any object with a fileno(); its type stub names only connections, sockets
    # and ints.
    return wait(sandboxes, timeout)  # type: ignore[arg-type, return-value]
