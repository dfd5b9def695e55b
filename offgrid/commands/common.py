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


def reading_path(args: argparse.Namespace) -> Path | None:
    """The project file a command reads (PROJECT, or the bundled demo), or None."""
    from offgrid.paths import demo_project_path

    if getattr(args, "demo", False):
        return demo_project_path()
    return Path(args.project) if getattr(args, "project", None) else None


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


def fail(message: str, code: int = 2) -> None:
    print(f"offgrid: {message}", file=sys.stderr)
    raise SystemExit(code)


def design_failed(exc, suffix: str = "") -> None:
    """Exit for a DesignError: 2 when the input is unusable, 3 when the design cannot be met."""
    from offgrid.result import INPUT_ERROR_CODES

    if exc.code in INPUT_ERROR_CODES:
        fail(f"{exc.field + ': ' if exc.field else ''}{exc}{suffix}", code=2)
    fail(f"cannot design: {exc}{suffix}", code=3)
