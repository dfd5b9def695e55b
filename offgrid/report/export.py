"""Write a report or a bill of materials to a file: the entry points for the text UI.

Both refuse to overwrite an existing file unless ``force`` is given (the UI asks the
user first), refuse always to write over the project being read or over any offgrid
project file (:func:`overwrite_refusal`), check the folder before any work is done,
and write atomically (a temporary file renamed over the target), so a failure never
leaves half a file.
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
        return f"cannot write {path}: {folder} is a file, not a folder; choose another path"
    if not folder.is_dir():
        return (
            f"cannot write {path}: the folder {folder} does not exist; create it or "
            "choose another path"
        )
    if not os.access(folder, os.W_OK | os.X_OK):
        return f"cannot write {path}: no permission to write in {folder}; choose another folder"
    return None


#: How much of a file is read to tell whether it is an offgrid project [bytes].
PROJECT_SNIFF_BYTES = 65536


def is_project_file(path: str | os.PathLike) -> bool:
    """True if ``path`` is a regular file whose text declares ``format = "offgrid-project"``
    (a project, or a project's ``.bak``)."""
    import re
    import stat

    from offgrid.project.model import FORMAT_NAME

    try:
        with open(path, "rb") as fh:
            if not stat.S_ISREG(os.fstat(fh.fileno()).st_mode):
                return False
            head = fh.read(PROJECT_SNIFF_BYTES).decode("utf-8", errors="replace")
    except OSError:
        return False
    return (
        re.search(r"(?m)^\s*format\s*=\s*[\"']" + re.escape(FORMAT_NAME) + r"[\"']", head)
        is not None
    )


def overwrite_refusal(
    path: str | os.PathLike, reading: str | os.PathLike | None = None
) -> str | None:
    """Why an output must never be written to ``path``, even when forced: it is the project
    being read (``reading``), or any offgrid project file. None when it may be written."""
    p = Path(path)
    if not p.exists():
        return None
    same = False
    if reading is not None:
        with contextlib.suppress(OSError):
            same = os.path.samefile(p, reading)
    if same or is_project_file(p):
        which = "the project being read" if same else "an offgrid project file"
        return (
            f"{p} is {which}: no output is ever written over a project, even when "
            "forced (--force, or a yes to replace it); choose another file name"
        )
    return None


def write_file(path: Path, text: str, reading: str | os.PathLike | None = None) -> Path:
    """Atomic write (a new file gets the usual mode, 0666 less the umask; a replaced one
    keeps its own); raises ExportError."""
    from offgrid.project.atomic import atomic_write_text

    refusal = overwrite_refusal(path, reading)
    if refusal:
        raise ExportError(refusal)
    try:
        atomic_write_text(path, text, backup=False)
    except OSError as exc:
        raise ExportError(
            f"cannot write {path}: {exc.strerror or exc}; nothing was written"
        ) from exc
    return path


def _check(path: Path, force: bool, reading: str | os.PathLike | None = None) -> None:
    problem = path_problem(path) or overwrite_refusal(path, reading)
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


def export_report(
    project: Project,
    path: str | os.PathLike,
    base: Path | None = None,
    *,
    fmt: str | None = None,
    force: bool = False,
    simulate: bool = False,
    years: int = 30,
    seed: int | None = 1,
    reliability: Any = None,
    design=None,
    reading: str | os.PathLike | None = None,
) -> Path:
    """Design ``project`` and write its report to ``path``; returns the path written.

    ``reading``: the project file it came from, never overwritten (nor any project)."""
    from offgrid.design.result import DesignError
    from offgrid.report import make_report

    target = Path(path)
    kind = format_for(target, fmt)
    _check(target, force, reading)
    try:
        text = make_report(
            project,
            base,
            kind,
            design=design,
            simulate=simulate,
            years=years,
            seed=seed,
            reliability=reliability,
        )
    except DesignError as exc:
        raise ExportError(f"cannot design: {exc}; no report was written") from exc
    except ValueError as exc:
        raise ExportError(f"cannot build the report: {exc}; no report was written") from exc
    return write_file(target, text, reading)


def bom_text(project: Project, design) -> str:
    """The bill of materials as CSV, priced where the price list has prices."""
    from offgrid.economics.bom import bill_of_materials, bom_csv
    from offgrid.economics.generator_bom import bom_prices
    from offgrid.economics.prices import price_for

    lines = bill_of_materials(project, design)
    table = bom_prices(project)
    prices = {}
    for ln in lines:
        p = price_for(ln.key, table)
        if p is not None:
            prices[ln.key] = p
    return bom_csv(lines, prices, project.economics.currency)


def export_bom(
    project: Project,
    path: str | os.PathLike,
    base: Path | None = None,
    *,
    force: bool = False,
    design=None,
    reading: str | os.PathLike | None = None,
    complete: bool = False,
) -> Path:
    """Design ``project`` and write its bill of materials (CSV) to ``path``.

    ``complete``: everything the crew packs (:func:`offgrid.stock.kit.priced_bom_csv`:
    the main parts, protection, mounting, connectors, surge protection, earthing,
    interconnects, lugs, labels and cable with its allowance, each line saying why),
    as the text UI writes it; else the main parts, as ``offgrid bom`` writes them."""
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design as run_design

    target = Path(path)
    _check(target, force, reading)
    try:
        d = design if design is not None else run_design(project, base)
    except DesignError as exc:
        raise ExportError(f"cannot design: {exc}; no bill of materials was written") from exc
    if complete:
        from offgrid.stock.kit import priced_bom_csv

        text, _unpriced = priced_bom_csv(project, d)  # unpriced lines are marked in it
        return write_file(target, text, reading)
    return write_file(target, bom_text(project, d), reading)
