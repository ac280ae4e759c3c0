"""The output of a batch run: append-only, one complete JSON line per finished job, flushed per line
and fsynced in groups (group commit: each fsync covers every line written while the previous one
ran), so a killed process loses nothing written and a power loss at most the lines of the last few
milliseconds. A rerun reads it back to skip the ids already there; only a torn last line that the
batch itself can have left (a crash in the middle of a write) is cut off."""

from __future__ import annotations

import fcntl
import json
import os
import sys
import threading
from dataclasses import dataclass

from .jobfile import BatchInputError, id_key


def finished_ids(path: str) -> set[str]:
    """Ids already in a result file; a torn last line left by an interrupted run is cut off
    (see ``read_results``)."""
    return {id_key(record["id"]) for record, _ in read_results(path)}


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
