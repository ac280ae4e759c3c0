"""The Dask back end of a batch run (``--scheduler``): the same jobs sent to a Dask distributed
cluster, each Dask worker running them in its own sandbox processes, so that time and memory limits
mean the same there; a job the cluster loses gets no line and runs again on resume."""

from __future__ import annotations

import json
import threading
import time
from dataclasses import dataclass
from functools import partial
from typing import Any, Generator

from .resultfile import Finished
from .sandbox import Sandbox, readable, worker_budget


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
