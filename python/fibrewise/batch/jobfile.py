"""The input of a batch run: a JSON-lines file of jobs, read once and fully checked before any
work starts (a malformed line, a bad job or a duplicate id is one error naming the line)."""

from __future__ import annotations

import json
from typing import Any

from ..jobs import JobError, check_job


class BatchInputError(ValueError):
    """A problem in a batch input or output file, located by file and line."""


def id_key(value: Any) -> str:
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
            key = id_key(job["id"])
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
