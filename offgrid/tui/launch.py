"""``offgrid`` with no subcommand: start the text UI.

``offgrid`` opens the start screen, ``offgrid FILE`` opens a project and
``offgrid --demo`` the bundled demonstration project.  A hang-up (dropped SSH
connection) or termination writes the recovery file before the process ends,
and so does a crash; the next start offers it.
"""

from __future__ import annotations

import contextlib
import gc
import os
import signal
import sys

USAGE = """usage: offgrid [FILE | --demo]
       offgrid COMMAND ...   (see offgrid --help)

  FILE     open a project file (.toml)
  --demo   open the bundled demonstration project (invented data)
With no argument the start screen lists recent projects and demo scenarios."""


def _parse(argv: list[str]) -> tuple[str | None, bool] | str:
    """(file, demo) or an error message."""
    if not argv:
        return None, False
    if argv == ["--demo"]:
        return None, True
    if len(argv) == 1 and not argv[0].startswith("-"):
        return argv[0], False
    return f"offgrid: cannot use {' '.join(argv)!r} here\n{USAGE}"


def _collector_back_on() -> None:
    """After the first paint: the garbage collector runs again, without the objects made
    so far (imports, the stylesheet, the first screen: about 120,000), which stay for the
    whole run. A full pass over them took 35-90 ms, now and then in the middle of an
    edit; frozen, the passes see only what was made since. (What start-up left for the
    collector, a few thousand objects, is kept too: a full collection first would put a
    pause of ~50 ms at the first paint.)"""
    gc.freeze()
    gc.enable()


def run(argv: list[str]) -> int:
    """Run the text UI; returns the process exit status."""
    # Start-up allocates much and frees little (imports, the stylesheet, the first
    # screen): the garbage collector's passes over it are off until the first paint.
    gc.disable()
    try:
        return _run(argv)
    finally:
        gc.enable()


def _run(argv: list[str]) -> int:
    from offgrid.safetext import visible

    parsed = _parse(list(argv))
    if isinstance(parsed, str):
        print(visible(parsed), file=sys.stderr)
        return 2
    path, demo = parsed
    from offgrid.project.store import ProjectFileError
    from offgrid.tui.app import make_app

    try:
        app = make_app(path, demo=demo)
    except ProjectFileError as exc:
        print(
            visible(f"offgrid: {exc}\nNothing was opened; the file was not changed."),
            file=sys.stderr,
        )
        return 2

    app.on_first_paint = _collector_back_on

    def hang_up(signum, _frame) -> None:
        try:
            app.write_recovery_now()
        finally:
            os._exit(128 + signum)

    for sig in (signal.SIGHUP, signal.SIGTERM):
        # (ValueError: not the main thread; OSError: not on this platform)
        with contextlib.suppress(ValueError, OSError):
            signal.signal(sig, hang_up)
    try:
        app.run()
    finally:
        with contextlib.suppress(OSError):
            app.write_recovery_now()  # a crash or lost terminal: keep what was on screen
    return int(app.return_code or 0)
