"""The recovery copy, written after every applied edit on a thread of its own.

The UI thread hands over the project's text (a few milliseconds to make) and goes
on; one writer thread writes the newest text it has been given, so a burst of
edits becomes one or two writes (coalesced) and a kill -9 right after an edit
still finds it in the recovery file. No Textual here.
"""

from __future__ import annotations

import threading
from collections.abc import Callable
from pathlib import Path

from offgrid.tui.state import RecoveryStore

Job = tuple[str, Path | None, str, str]  # text, project path, title, baseline


class RecoveryWriter:
    """Coalescing writer of one :class:`RecoveryStore`; other attributes are the store's."""

    def __init__(
        self, store: RecoveryStore, on_error: Callable[[OSError], None] | None = None
    ) -> None:
        self.store = store
        self.on_error = on_error
        self.writes = 0
        self._cond = threading.Condition()
        self._pending: Job | None = None
        self._busy = False
        self._closing = False
        self._thread: threading.Thread | None = None

    def submit(self, text: str, path: Path | None, title: str, baseline: str) -> None:
        """Write this text soon (replacing any text given before that is not written yet)."""
        with self._cond:
            self._pending = (text, path, title, baseline)
            self._closing = False
            if self._thread is None or not self._thread.is_alive():
                self._thread = threading.Thread(
                    target=self._run, name="offgrid-recovery", daemon=True
                )
                self._thread.start()
            self._cond.notify_all()

    def __getattr__(self, name: str):
        return getattr(self.store, name)

    def write(self, text: str, path: Path | None, title: str, baseline: str) -> Path:
        """Write now, on the calling thread (hang-up, crash, recovery restored)."""
        with self._cond:
            self._pending = None
            while self._busy:
                self._cond.wait()
            return self.store.write(text, path, title, baseline)

    def clear(self) -> None:
        """Drop what is not written yet, wait for a write under way, remove the file."""
        with self._cond:
            self._pending = None
            while self._busy:
                self._cond.wait()
            self.store.clear()

    def flush(self, timeout_s: float = 2.0) -> bool:
        """Wait until everything given has been written; False on timeout."""
        with self._cond:
            return self._cond.wait_for(lambda: self._pending is None and not self._busy, timeout_s)

    def close(self) -> None:
        """Let the writer thread end once the text given is written (it would idle 30 s
        first); a later :meth:`submit` starts one again, :meth:`write` needs none."""
        with self._cond:
            self._closing = True
            self._cond.notify_all()

    def _run(self) -> None:
        while True:
            with self._cond:
                ready = self._cond.wait_for(
                    lambda: self._pending is not None or self._closing, 30.0
                )
                if not ready or self._pending is None:
                    self._thread = None
                    return
                job, self._pending = self._pending, None
                self._busy = True
            try:
                self.store.write(*job)  # type: ignore[misc]
            except OSError as exc:
                if self.on_error is not None:
                    self.on_error(exc)
            finally:
                with self._cond:
                    self._busy = False
                    self.writes += 1
                    self._cond.notify_all()
