"""Batch runs that never lose a finished result, on local worker processes or a Dask cluster.

One module per part of a run:

- ``jobfile``: the input (JSON lines), read once and fully checked before any work starts;
- ``resultfile``: the output, append-only, flushed per line, fsynced in groups, resumable;
- ``sandbox``: the worker processes (one job at a time, time and memory limits);
- ``local`` and ``cluster``: the back ends (a local pool of sandboxes; a Dask cluster whose
  workers run the jobs in sandboxes of their own);
- ``runner``: the whole run (resume, ``--retry-failed``, Ctrl-C and SIGTERM).
"""

from .cluster import Lost, dask_client, run_dask, run_in_sandbox
from .jobfile import BatchInputError, read_jobs
from .local import run_local
from .resultfile import Finished, ResultFile, finished_ids, read_results, record_line
from .runner import BatchSummary, run_batch
from .sandbox import Sandbox, serve

__all__ = [
    "BatchInputError",
    "BatchSummary",
    "Finished",
    "Lost",
    "ResultFile",
    "Sandbox",
    "dask_client",
    "finished_ids",
    "read_jobs",
    "read_results",
    "record_line",
    "run_batch",
    "run_dask",
    "run_in_sandbox",
    "run_local",
    "serve",
]
