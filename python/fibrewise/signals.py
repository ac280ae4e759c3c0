"""SIGTERM as an exception, for the long runs (``fibrewise batch``, ``solve --guess``) that must
end through their cleanup code: record what they delivered, stop their workers."""

from __future__ import annotations

import signal
import threading
from typing import Any


class Terminated(BaseException):
    """SIGTERM, raised in the main thread while :func:`raise_on_sigterm` is in force."""


def raise_on_sigterm() -> Any:
    """Installs the handler that raises :class:`Terminated`; returns the previous one for
    :func:`restore_sigterm` (``None`` outside the main thread, where signals cannot be handled)."""
    if threading.current_thread() is not threading.main_thread():
        return None

    def stop(signum: int, frame: Any) -> None:
        raise Terminated()

    return signal.signal(signal.SIGTERM, stop)


def restore_sigterm(previous: Any) -> None:
    """Puts back the handler :func:`raise_on_sigterm` replaced."""
    if previous is not None:
        signal.signal(signal.SIGTERM, previous)
