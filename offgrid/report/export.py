"""Write a report or a bill of materials to a file: the entry points for the text UI.

Both refuse to overwrite an existing file unless ``force`` is given (the UI asks the
user first), check the folder before any work is done, and write atomically (a
temporary file renamed over the target), so a failure never leaves half a file.
Every failure raises :class:`ExportError` with a message that says what to do.
"""

from __future__ import annotations

import contextlib
import os
from pathlib import Path
from typing import Any

from offgrid.project.model import Project


class ExportError(Exception):
    """The file was not written; the message says why and what to do."""

    def __init__(self, message: str, exists: bool = False) -> None:
        super().__init__(message)
        self.exists = exists  # True: only because the file exists (ask, then force)


def path_problem(path: Path) -> str | None:
    """Why ``path`` cannot be written (folder missing, no permission, a folder), or None."""
    folder = path.parent if str(path.parent) else Path(".")
    if path.is_dir():
        return f"{path} is a folder; give a file name"
    if folder.exists() and not folder.is_dir():
        return (f"cannot write {path}: {folder} is a file, not a folder; choose another "
                "path")
    if not folder.is_dir():
        return (f"cannot write {path}: the folder {folder} does not exist; create it or "
                "choose another path")
    if not os.access(folder, os.W_OK | os.X_OK):
        return f"cannot write {path}: no permission to write in {folder}; choose another folder"
    return None


def write_file(path: Path, text: str) -> Path:
    """Atomic write with the user's usual file mode; raises ExportError."""
    from offgrid.project.store import atomic_write_text

    try:
        atomic_write_text(path, text, backup=False)
    except OSError as exc:
        raise ExportError(f"cannot write {path}: {exc.strerror or exc}; nothing was written") \
            from exc
    mask = os.umask(0)  # the temporary file is private (0600); a report is for sharing
    os.umask(mask)
    with contextlib.suppress(OSError):
        os.chmod(path, 0o666 & ~mask)
    return path


def _check(path: Path, force: bool) -> None:
    problem = path_problem(path)
    if problem:
        raise ExportError(problem)
    if path.exists() and not force:
        raise ExportError(f"{path} exists; overwrite it, or choose another name", exists=True)


def format_for(path: Path, fmt: str | None = None) -> str:
    """The report format: ``fmt`` if given, else from the suffix (html if unknown)."""
    from offgrid.report import FORMATS, SUFFIXES

    if fmt is not None:
        if fmt not in FORMATS:
            raise ExportError(f"unknown report format '{fmt}'; use one of {', '.join(FORMATS)}")
        return fmt
    return SUFFIXES.get(path.suffix.lower(), "html")


def export_report(project: Project, path: str | os.PathLike, base: Path | None = None, *,
                  fmt: str | None = None, force: bool = False, simulate: bool = False,
                  years: int = 30, seed: int | None = 1, reliability: Any = None,
                  design=None) -> Path:
    """Design ``project`` and write its report to ``path``; returns the path written."""
    from offgrid.report import make_report
    from offgrid.result import DesignError

    target = Path(path)
    kind = format_for(target, fmt)
    _check(target, force)
    try:
        text = make_report(project, base, kind, design=design, simulate=simulate, years=years,
                           seed=seed, reliability=reliability)
    except DesignError as exc:
        raise ExportError(f"cannot design: {exc}; no report was written") from exc
    except ValueError as exc:
        raise ExportError(f"cannot build the report: {exc}; no report was written") from exc
    return write_file(target, text)


def bom_text(project: Project, design) -> str:
    """The bill of materials as CSV, priced where the price list has prices."""
    from offgrid.report.bom import bill_of_materials, bom_csv
    from offgrid.report.costs import price_for

    lines = bill_of_materials(project, design)
    prices = {}
    for ln in lines:
        p = price_for(ln.key, project.prices)
        if p is not None:
            prices[ln.key] = p
    return bom_csv(lines, prices, project.economics.currency)


def export_bom(project: Project, path: str | os.PathLike, base: Path | None = None, *,
               force: bool = False, design=None) -> Path:
    """Design ``project`` and write its bill of materials (CSV) to ``path``."""
    from offgrid.result import DesignError
    from offgrid.sizing import design as run_design

    target = Path(path)
    _check(target, force)
    try:
        d = design if design is not None else run_design(project, base)
    except DesignError as exc:
        raise ExportError(f"cannot design: {exc}; no bill of materials was written") from exc
    return write_file(target, bom_text(project, d))
