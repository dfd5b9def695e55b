"""Writing a command's output file: refuse or ask before overwriting, never half-write."""

from __future__ import annotations

import contextlib
import os
import sys
from pathlib import Path

from offgrid.commands.common import fail


def check_writable(path: Path, force: bool) -> None:
    """Fail with a clear message unless ``path`` can be written (before any work is done).

    An existing file is overwritten only with ``force`` or after a yes at a terminal;
    without a terminal, it is refused.
    """
    folder = path.parent if str(path.parent) else Path(".")
    if path.is_dir():
        fail(f"{path} is a folder; give a file name with -o")
    if not folder.is_dir():
        fail(f"cannot write {path}: the folder {folder} does not exist; create it or choose "
             "another path with -o")
    if not os.access(folder, os.W_OK | os.X_OK):
        fail(f"cannot write {path}: no permission to write in {folder}; choose another "
             "folder with -o")
    if path.exists() and not force:
        if sys.stdin.isatty() and sys.stderr.isatty():
            print(f"offgrid: {path} exists. Overwrite it? [y/N] ", end="", file=sys.stderr,
                  flush=True)
            answer = sys.stdin.readline().strip().lower()
            if answer not in ("y", "yes"):
                fail(f"{path} left unchanged")
        else:
            fail(f"{path} exists; add --force to overwrite it (or choose another path with -o)")


def write_output(path: Path, text: str) -> None:
    """Write atomically (a temporary file renamed over the target): whole or not at all."""
    from offgrid.project.store import atomic_write_text

    try:
        atomic_write_text(path, text, backup=False)
    except OSError as exc:
        fail(f"cannot write {path}: {exc.strerror or exc}; nothing was written")
    # the temporary file is private (0600); a report is for sharing: use the user's umask
    mask = os.umask(0)
    os.umask(mask)
    with contextlib.suppress(OSError):
        os.chmod(path, 0o666 & ~mask)
