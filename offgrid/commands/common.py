"""Shared pieces of the subcommands: the PROJECT / --demo argument and error printing."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.project.model import Project


def add_project_argument(parser: argparse.ArgumentParser, required: bool = True) -> None:
    parser.add_argument("project", nargs="?", metavar="PROJECT",
                        help="a saved project file (.toml)")
    parser.add_argument("--demo", action="store_true",
                        help="use the bundled demonstration project instead of PROJECT")


def open_project(args: argparse.Namespace) -> tuple[Project, Path | None]:
    """The project named by PROJECT or --demo; raises SystemExit(2) with a message on failure."""
    from offgrid.paths import demo_project_path
    from offgrid.project.store import ProjectFileError, load_project

    if args.demo and args.project:
        fail("give either PROJECT or --demo, not both")
    path = demo_project_path() if args.demo else Path(args.project) if args.project else None
    if path is None:
        fail("name a project file, or use --demo for the bundled demonstration project")
    try:
        return load_project(path), path.parent
    except ProjectFileError as exc:
        fail(str(exc))
    raise AssertionError  # unreachable


def json_text(data) -> str:
    """Strict JSON (RFC 8259): a NaN or infinity is never written as ``NaN``/``Infinity``."""
    import json

    try:
        return json.dumps(data, indent=2, ensure_ascii=False, allow_nan=False)
    except ValueError:
        fail("a figure came out as a non-finite number; nothing was written. Please report "
             "this with the project file", code=1)
        raise


def fail(message: str, code: int = 2) -> None:
    print(f"offgrid: {message}", file=sys.stderr)
    raise SystemExit(code)


def design_failed(exc, suffix: str = "") -> None:
    """Exit for a DesignError: 2 when the input is unusable, 3 when the design cannot be met."""
    from offgrid.result import INPUT_ERROR_CODES

    if exc.code in INPUT_ERROR_CODES:
        fail(f"{exc.field + ': ' if exc.field else ''}{exc}{suffix}", code=2)
    fail(f"cannot design: {exc}{suffix}", code=3)
