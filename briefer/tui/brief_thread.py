"""The thread that builds the app's briefs: one, kept for the app's life, one brief at a time.

A Textual thread worker per brief went through a worker object, an asyncio task, the thread pool
and three state-change messages on the app's thread, and handed its result back through a
coroutine run on the app's loop: about half a millisecond of the app's own time per edit, part
of it while the brief was being built (the two threads taking turns). This thread takes what to
build from a queue and posts the result to the app as a message (Textual's thread-safe way).
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from typing import Any

_STOP = object()


class BriefThread:
    """Calls `build(item)` in its own thread for each item asked for, in order."""

    def __init__(self, build: Callable[[Any], None], name: str = "brief") -> None:
        self._build = build
        self._name = name
        self._asks: Any = None               # a queue.SimpleQueue, made with the thread
        self._thread: threading.Thread | None = None

    def ask(self, item: Any) -> None:
        """Build `item` once the items asked for before it are built (the thread starts with
        the first)."""
        if self._thread is None:
            import queue                     # after the app's first frame (not imported before)

            self._asks = queue.SimpleQueue()
            self._thread = threading.Thread(target=self._run, args=(self._asks,), name=self._name, daemon=True)
            self._thread.start()
        self._asks.put(item)

    def stop(self) -> None:
        """End the thread once what it is building is built (what was asked for after is dropped)."""
        if self._thread is not None:
            self._asks.put(_STOP)
            self._thread = None

    def _run(self, asks: Any) -> None:
        while (item := asks.get()) is not _STOP:
            self._build(item)
