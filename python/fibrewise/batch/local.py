"""The local back end of a batch run: a pool of sandboxes on this machine, each job sent to an idle
worker (or queued behind a running one), finished lines yielded in completion order."""

from __future__ import annotations

import time
from collections import deque
from typing import Generator

from .resultfile import Finished
from .sandbox import Sandbox, job_line, readable, worker_budget


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
