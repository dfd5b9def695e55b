"""Writing a command's output file: refuse or ask before overwriting, never half-write."""

from __future__ import annotations

import sys
from pathlib import Path

from offgrid.commands.common import fail


def check_writable(path: Path, force: bool, reading: Path | None = None) -> None:
    """Fail with a clear message unless ``path`` can be written (before any work is done).

    An existing file is overwritten only with ``force`` or after a yes at a terminal;
    without a terminal, it is refused. The project being read (``reading``) and any
    offgrid project file are never overwritten, whatever ``force`` says.
    """
    from offgrid.report.export import overwrite_refusal, path_problem

    problem = path_problem(path)
    if problem:
        fail(problem + " with -o" if problem.endswith(("path", "folder", "name")) else problem)
    refusal = overwrite_refusal(path, reading)
    if refusal:
        fail(refusal)
    if path.exists() and not force:
        if sys.stdin.isatty() and sys.stderr.isatty():
            print(
                f"offgrid: {path} exists. Overwrite it? [y/N] ", end="", file=sys.stderr, flush=True
            )
            answer = sys.stdin.readline().strip().lower()
            if answer not in ("y", "yes"):
                fail(f"{path} left unchanged")
        else:
            fail(f"{path} exists; add --force to overwrite it (or choose another path with -o)")


def write_output(path: Path, text: str, reading: Path | None = None) -> None:
    """Write atomically (a temporary file renamed over the target): whole or not at all."""
    from offgrid.report.export import ExportError, write_file

    try:
        write_file(path, text, reading)
    except ExportError as exc:
        fail(str(exc))
