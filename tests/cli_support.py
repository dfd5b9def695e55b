"""``offgrid ARGS`` run in this process for the CLI tests whose subject is a command's
output, files and exit code, not the process (each ``python -m offgrid`` costs 0.3-0.9 s
of CPU to start and import; the subprocess runs kept in tests/test_cli.py,
tests/test_report_cli.py and tests/test_cli_bad_input.py check the program as started)."""

from __future__ import annotations

import contextlib
import io
import os
import subprocess
import sys


def run_cli(*args: str, cwd=None, stdin: str = "") -> subprocess.CompletedProcess:
    """Exit code, stdout and stderr of ``offgrid ARGS`` run by :func:`offgrid.cli.main` here,
    as a subprocess would give them: ``stdin`` the standard input (not a terminal, like
    ``subprocess.DEVNULL`` when empty), ``cwd`` the working folder. An exception that is
    not an exit fails the test (the program would have shown a traceback)."""
    from offgrid.cli import main

    argv = [str(a) for a in args]
    out, err = io.StringIO(), io.StringIO()
    old_in = sys.stdin
    sys.stdin = io.StringIO(stdin)
    try:
        with (
            contextlib.chdir(cwd if cwd is not None else os.getcwd()),
            contextlib.redirect_stdout(out),
            contextlib.redirect_stderr(err),
        ):
            try:
                code = main(argv)
            except SystemExit as exc:
                code = exc.code if isinstance(exc.code, int) else (0 if exc.code is None else 1)
    finally:
        sys.stdin = old_in
    return subprocess.CompletedProcess(["offgrid", *argv], code, out.getvalue(), err.getvalue())
