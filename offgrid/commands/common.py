"""Shared pieces of the subcommands: the PROJECT / --demo argument, ``-`` for the standard
streams, the worked example under each ``--help``, and error printing."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.project.model import Project

#: What ``-`` stands for in a file argument.
STDIO = "-"


class ExampleFormatter(argparse.HelpFormatter):
    """Wraps the description as usual but keeps the ``Example:`` epilog line by line."""

    def _fill_text(self, text: str, width: int, indent: str) -> str:
        if text.startswith("Example:"):
            return "".join(indent + line for line in text.splitlines(keepends=True))
        return super()._fill_text(text, width, indent)


def with_example(parser: argparse.ArgumentParser, command: str, what: str) -> None:
    """Show one worked example (``command``, then what it does) at the end of ``--help``."""
    import textwrap

    parser.formatter_class = ExampleFormatter
    lines = textwrap.wrap(what, width=74, initial_indent="    ", subsequent_indent="    ")
    parser.epilog = "Example:\n  " + command + "\n" + "\n".join(lines)


def read_stdin(what: str) -> str:
    """The standard input as text, for a ``-`` argument; fails clearly at a terminal."""
    if sys.stdin is None or sys.stdin.isatty():
        fail(
            f"{what} '-' reads the standard input: pipe or redirect the file into offgrid "
            "(for example: offgrid size - < project.toml)"
        )
    from offgrid.textfile import MAX_TEXT_BYTES

    stream = getattr(sys.stdin, "buffer", None)
    data = (
        stream.read(MAX_TEXT_BYTES + 1)
        if stream is not None
        else sys.stdin.read(MAX_TEXT_BYTES + 1).encode("utf-8")
    )
    if len(data) > MAX_TEXT_BYTES:  # /dev/zero or a runaway pipe: never read it all
        fail(
            f"{what} '-': the standard input is longer than {MAX_TEXT_BYTES // 1_000_000} MB; "
            "give the file itself"
        )
    try:
        return data.decode("utf-8").removeprefix("\ufeff")
    except UnicodeDecodeError:
        fail(f"{what} '-': the standard input is not UTF-8 text; save the file as UTF-8")
    raise AssertionError  # unreachable


def add_project_argument(parser: argparse.ArgumentParser, required: bool = True) -> None:
    parser.add_argument(
        "project",
        nargs="?",
        metavar="PROJECT",
        help="a saved project file (.toml); - reads it from the standard input",
    )
    parser.add_argument(
        "--demo",
        action="store_true",
        help="use the bundled demonstration project instead of PROJECT",
    )


def reading_path(args: argparse.Namespace) -> Path | None:
    """The project file a command reads (PROJECT, or the bundled demo), or None."""
    from offgrid.paths import demo_project_path

    if getattr(args, "demo", False):
        return demo_project_path()
    project = getattr(args, "project", None)
    return Path(project) if project and project != STDIO else None  # "-": no file to guard


def open_project(args: argparse.Namespace) -> tuple[Project, Path | None]:
    """The project named by PROJECT or --demo; raises SystemExit(2) with a message on failure."""
    from offgrid.paths import demo_project_path
    from offgrid.project.store import ProjectFileError, load_project
    from offgrid.safetext import printable

    if args.demo and args.project:
        fail("give either PROJECT or --demo, not both")
    notes: list[str] = []  # what migrating an older schema could not carry over
    if args.project == STDIO:
        from offgrid.project.store import loads_project

        try:
            project = loads_project(read_stdin("PROJECT"), source="standard input", notes=notes)
        except ProjectFileError as exc:
            fail(str(exc))
        for note in notes:
            print(f"offgrid: note: standard input: {note}", file=sys.stderr)
        return project, Path.cwd()
    path = demo_project_path() if args.demo else Path(args.project) if args.project else None
    if path is None:
        fail("name a project file, or use --demo for the bundled demonstration project")
    try:
        project = load_project(path, notes=notes)
    except ProjectFileError as exc:
        fail(str(exc), field=first_field(exc))
    for note in notes:
        print(f"offgrid: note: {printable(str(path))}: {note}", file=sys.stderr)
    return project, path.parent


def json_text(data, indent: int | None = 2, separators: tuple[str, str] | None = None) -> str:
    """Strict JSON (RFC 8259): a NaN or infinity is never written as ``NaN``/``Infinity``."""
    import json

    try:
        return json.dumps(
            data, indent=indent, ensure_ascii=False, allow_nan=False, separators=separators
        )
    except ValueError:
        fail(
            "a figure came out as a non-finite number; nothing was written. Please report "
            "this with the project file",
            code=1,
        )
        raise


#: Set by the command line when ``--json`` is given: a refusal is then also printed as a
#: JSON object on stdout (see :func:`fail`).
_JSON_ERRORS = {"on": False}


def set_json_errors(on: bool) -> None:
    """Print refusals as JSON on stdout too (for the subcommands given ``--json``)."""
    _JSON_ERRORS["on"] = bool(on)


def error_json(message: str, code: int, field: str | None = None, error: str | None = None) -> dict:
    """The refusal as JSON: ``{"error": {code, message, field, exit_code}}``."""
    default = {2: "bad-input", 3: "cannot-design"}.get(code, "failed")
    return {
        "error": {"code": error or default, "message": message, "field": field, "exit_code": code}
    }


def fail(message: str, code: int = 2, field: str | None = None, error: str | None = None) -> None:
    """Print the message on stderr and exit with ``code`` (2 bad input, 3 cannot design).

    With ``--json`` the same refusal is printed on stdout as :func:`error_json`; ``field``
    names what to change (a dotted project path, a CSV column or an option), ``error`` a
    short code (a DesignError's own code, or ``bad-input`` / ``cannot-design``).
    """
    if _JSON_ERRORS["on"]:
        import json

        print(json.dumps(error_json(message, code, field, error), indent=2, ensure_ascii=False))
    print(f"offgrid: {message}", file=sys.stderr)
    raise SystemExit(code)


def first_field(exc) -> str | None:
    """The field of the first problem of a ProjectFileError / LoadListError, if any."""
    # getattr stays: any exception reaches here (not a result record); the project and the
    # load-list errors name their problem's field differently (``path`` / ``field``)
    problems = getattr(exc, "problems", None) or []
    if not problems:
        return getattr(exc, "field", None)
    first = problems[0]
    return getattr(first, "path", None) or getattr(first, "field", None)


def design_failed(exc, suffix: str = "") -> None:
    """Exit for a DesignError: 2 when the input is unusable, 3 when the design cannot be met."""
    from offgrid.design.result import INPUT_ERROR_CODES

    if exc.code in INPUT_ERROR_CODES:
        fail(
            f"{exc.field + ': ' if exc.field else ''}{exc}{suffix}",
            code=2,
            field=exc.field,
            error=exc.code,
        )
    fail(f"cannot design: {exc}{suffix}", code=3, field=exc.field, error=exc.code)
