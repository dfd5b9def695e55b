"""Command line: ``offgrid`` opens the text UI; subcommands run headless.

Each subcommand lives in :mod:`offgrid.commands` as a module with
``register(subparsers)``; modules are imported only when needed so start-up
stays quick.
"""

from __future__ import annotations

import argparse
import importlib
import sys

#: Subcommand modules under offgrid.commands, in the order ``--help`` lists them.
COMMANDS: tuple[str, ...] = (
    "size",
    "climate",
    "loads",
    "simulate",
    "report",
    "bom",
    "prices",
    "variants",
    "plan",
    "generator",
    "parts",
    "water",
)
VERSION_FLAGS = ("--version", "-V")


def package_version() -> str:
    """The installed version, from the package metadata (pyproject.toml is the one place)."""
    from importlib.metadata import PackageNotFoundError, version

    try:
        return version("offgrid")
    except PackageNotFoundError:
        return "unknown (not installed: run pip install . in the checkout)"


class _VersionAction(argparse.Action):
    """``--version``: reads the metadata only when asked (start-up stays quick)."""

    def __init__(self, option_strings, dest=argparse.SUPPRESS, **kwargs) -> None:
        super().__init__(option_strings, dest, nargs=0, default=argparse.SUPPRESS, **kwargs)

    def __call__(self, parser, namespace, values, option_string=None) -> None:
        print(f"offgrid {package_version()}")
        parser.exit()


class _Parser(argparse.ArgumentParser):
    """argparse, but a bad option goes through ``fail`` (JSON too when ``--json`` is given)."""

    def error(self, message: str):  # type: ignore[override]
        import re

        from offgrid.commands.common import fail

        self.print_usage(sys.stderr)
        m = re.match(r"argument ([^:/ ]+)", message)
        fail(
            f"{message} (see `{self.prog} --help`)",
            2,
            field=m.group(1) if m else None,
            error="bad-arguments",
        )


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="offgrid",
        description="Size stand-alone solar power systems from a load list and a site climate. "
        "With no subcommand, opens the text interface.",
    )
    from offgrid.commands.common import with_example

    with_example(
        parser,
        "offgrid size --demo",
        "sizes the bundled demonstration project (an "
        "invented health post); `offgrid COMMAND --help` shows an example for each "
        "command.",
    )
    parser.add_argument(*VERSION_FLAGS, action=_VersionAction, help="print the version and exit")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    for name in COMMANDS:
        importlib.import_module(f"offgrid.commands.{name}").register(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    if not argv or (argv[0] not in COMMANDS and argv[0] not in ("-h", "--help", *VERSION_FLAGS)):
        ui = _ui_entry()
        if ui is not None:
            return ui(argv)
    json_errors = "--json" in argv
    if json_errors:
        from offgrid.commands.common import set_json_errors

        set_json_errors(True)
    out, err = sys.stdout, sys.stderr
    sys.stdout, sys.stderr = _Visible(out), _Visible(err)
    try:
        parser = build_parser()
        args = parser.parse_args(argv)
        if not getattr(args, "func", None):
            parser.print_help()
            return 2
        return int(args.func(args) or 0)
    except KeyboardInterrupt:
        return 130
    except BrokenPipeError:
        return 0
    finally:
        sys.stdout, sys.stderr = out, err
        if json_errors:  # this run's, not the next main() call's in the same process
            set_json_errors(False)


class _Visible:
    """A text stream that shows control characters as visible escapes.

    Everything a subcommand prints (summaries, reports to the screen, CSV, error messages
    quoting a name) goes through :func:`offgrid.safetext.visible`, so a name holding a
    terminal escape (OSC 52 clipboard, window title, clear screen) cannot reach the terminal.
    """

    def __init__(self, stream) -> None:
        self._stream = stream

    def write(self, text: str) -> int:
        from offgrid.safetext import visible

        return self._stream.write(visible(text))

    def __getattr__(self, name: str):
        return getattr(self._stream, name)


def _ui_entry():
    """The text UI's entry point, or None while the UI is not installed."""
    try:
        module = importlib.import_module("offgrid.tui.launch")
    except ModuleNotFoundError as exc:
        if exc.name and exc.name.startswith("offgrid.tui"):
            return None
        raise
    return module.run
