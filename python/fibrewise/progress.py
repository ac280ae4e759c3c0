"""Progress on stderr for work that runs longer than a second.

``Progress`` counts jobs done out of a total and shows the rate and the time left; ``Activity``
shows what a single long computation is doing and for how long. Both draw one line, redrawn in
place, only when the stream is a terminal and not ``quiet``, and only once the work has run for
``delay`` seconds, so quick commands and redirected runs stay silent.
"""

from __future__ import annotations

import sys
import threading
import time
from typing import TextIO


def wants_display(stream: TextIO, quiet: bool) -> bool:
    return not quiet and hasattr(stream, "isatty") and stream.isatty()


def format_duration(seconds: float) -> str:
    seconds = max(0, int(round(seconds)))
    if seconds < 60:
        return f"{seconds} s"
    minutes, seconds = divmod(seconds, 60)
    if minutes < 60:
        return f"{minutes} min {seconds:02d} s"
    hours, minutes = divmod(minutes, 60)
    return f"{hours} h {minutes:02d} min"


class _Line:
    """One status line redrawn in place; remembers its width to blank out leftovers."""

    def __init__(self, stream: TextIO):
        self.stream = stream
        self.width = 0

    def draw(self, text: str) -> None:
        pad = " " * max(0, self.width - len(text))
        self.stream.write("\r" + text + pad)
        self.stream.flush()
        self.width = len(text)

    def clear(self) -> None:
        if self.width:
            self.stream.write("\r" + " " * self.width + "\r")
            self.stream.flush()
            self.width = 0


class Progress:
    """``done / total`` with rate and time left: ``batch  120/2000 jobs  310.4 jobs/s  about 6 s left``."""

    def __init__(
        self,
        total: int,
        label: str = "batch",
        *,
        stream: TextIO | None = None,
        quiet: bool = False,
        delay: float = 1.0,
        interval: float = 0.1,
    ):
        self.total, self.label, self.done = total, label, 0
        self.stream = stream if stream is not None else sys.stderr
        self.enabled = wants_display(self.stream, quiet)
        self.delay, self.interval = delay, interval
        self.start = time.monotonic()
        self.last_draw = 0.0
        self.line = _Line(self.stream)

    def advance(self, n: int = 1) -> None:
        self.done += n
        now = time.monotonic()
        if self.enabled and now - self.start >= self.delay and now - self.last_draw >= self.interval:
            self.last_draw = now
            self.line.draw(self.status(now))

    def status(self, now: float | None = None) -> str:
        elapsed = (now if now is not None else time.monotonic()) - self.start
        rate = self.done / elapsed if elapsed > 0 else 0.0
        width = len(str(self.total))
        text = f"{self.label}  {self.done:>{width}}/{self.total} jobs  {rate:.1f} jobs/s"
        if 0 < rate and self.done < self.total:
            left = (self.total - self.done) / rate
            text += "  under 1 s left" if left < 1 else f"  about {format_duration(left)} left"
        return text

    def close(self) -> None:
        self.line.clear()


class Activity:
    """Context manager showing ``label: step  3.2 s`` while one long computation runs."""

    def __init__(
        self,
        label: str,
        *,
        stream: TextIO | None = None,
        quiet: bool = False,
        delay: float = 1.0,
        interval: float = 0.2,
    ):
        self.label, self.step = label, ""
        self.stream = stream if stream is not None else sys.stderr
        self.enabled = wants_display(self.stream, quiet)
        self.delay, self.interval = delay, interval
        self.line = _Line(self.stream)
        self.stopped = threading.Event()
        self.lock = threading.Lock()
        self.thread: threading.Thread | None = None

    def __enter__(self) -> "Activity":
        self.start = time.monotonic()
        if self.enabled:
            self.thread = threading.Thread(target=self._tick, daemon=True)
            self.thread.start()
        return self

    def set_step(self, step: str) -> None:
        self.step = step

    def _tick(self) -> None:
        if self.stopped.wait(self.delay):
            return
        while not self.stopped.is_set():
            with self.lock:
                step = f": {self.step}" if self.step else ""
                self.line.draw(f"{self.label}{step}  {time.monotonic() - self.start:.1f} s")
            self.stopped.wait(self.interval)

    def __exit__(self, *exc) -> None:
        self.stopped.set()
        if self.thread is not None:
            self.thread.join()
        with self.lock:
            self.line.clear()
