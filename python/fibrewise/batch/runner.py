"""A whole batch run: read and check the input, resume from the output, run the jobs not yet done on
the local or the Dask back end, append each finished line, stop cleanly on Ctrl-C or SIGTERM."""

from __future__ import annotations

import json
import os
import sys
import time
from dataclasses import dataclass
from typing import Generator

from ..progress import Progress
from ..signals import Terminated, raise_on_sigterm, restore_sigterm
from .cluster import Lost, run_dask
from .jobfile import BatchInputError, id_key, read_jobs
from .local import run_local
from .resultfile import Finished, ResultFile, read_results


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
    if _same_file(input_path, output_path):
        raise BatchInputError(
            f"{output_path}: the output file is the input file {input_path}; results go to another file (-o)"
        )
    jobs = read_jobs(input_path)
    output = ResultFile(output_path)
    try:
        results = read_results(output_path)
        # only jobs of this input: a failed line of another job is not ours to drop
        retried = _failed_ids(results) & {id_key(job["id"]) for job in jobs} if retry_failed else set()
        if retried:
            output = output.rewritten(
                [line for record, line in results if id_key(record["id"]) not in retried]
            )
    except BatchInputError:
        output.close()
        raise
    done = {id_key(record["id"]) for record, _ in results} - retried
    todo = [job for job in jobs if id_key(job["id"]) not in done]
    summary = BatchSummary(
        total=len(jobs),
        skipped=len(jobs) - len(todo),
        retried=sum(id_key(job["id"]) in retried for job in jobs),
    )
    memory_bytes = memory_bytes or (memory_mb << 20 if memory_mb else None)
    start = time.monotonic()
    progress = Progress(len(todo), quiet=quiet)
    previous = raise_on_sigterm()
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
    except Terminated:
        summary.interrupted = "SIGTERM"
    finally:
        if records is not None:
            records.close()  # stops the workers; a job still running gets no line
        progress.close()
        output.close()
        restore_sigterm(previous)
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
    last = {id_key(record["id"]): record["status"] for record, _ in results}
    return {key for key, status in last.items() if status in ("error", "timeout")}
