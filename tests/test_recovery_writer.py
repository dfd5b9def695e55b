"""The recovery copy's writer thread (offgrid/tui/autosave.py, no Textual): it ends when
told to instead of idling 30 s after an app has gone. A thread left running makes
planning in the same process refuse to fork its workers (offgrid/plan/rows.py: fork is
unsafe once threads run), so a test process that had run a UI test planned serially."""

from __future__ import annotations

from offgrid.tui.autosave import RecoveryWriter
from offgrid.tui.state import RecoveryStore


def test_close_ends_the_writer_thread_after_its_last_write(tmp_path):
    writer = RecoveryWriter(RecoveryStore(tmp_path, pid=4242))
    writer.submit("text 1", None, "Title", "")
    assert writer.flush()
    thread = writer._thread
    assert thread is not None and thread.is_alive()  # idle, waiting for the next text
    writer.close()
    thread.join(2.0)
    assert not thread.is_alive()
    assert writer.store.file.exists() and writer.writes == 1
    # a text given after close starts a writer again
    writer.submit("text 2", None, "Title", "")
    assert writer.flush() and writer.writes == 2
    writer.close()
