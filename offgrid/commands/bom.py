"""``offgrid bom``: the bill of materials of a project as CSV, priced where the list has prices."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import (
    STDIO,
    add_project_argument,
    fail,
    open_project,
    reading_path,
    with_example,
)


def register(sub) -> None:
    p = sub.add_parser(
        "bom",
        help="write the bill of materials as CSV",
        description="Design a project and write the quantity of every part "
        "(CSV), with unit prices and totals from the project's "
        "price list.",
    )
    add_project_argument(p)
    p.add_argument(
        "-o",
        "--output",
        metavar="FILE",
        help="write the CSV to FILE (default, or -: the standard output)",
    )
    p.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    with_example(
        p,
        "offgrid bom --demo -o parts.csv",
        "writes the demonstration project's bill of materials to parts.csv, priced "
        "from its price list.",
    )
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from offgrid.commands.output import check_writable, write_output
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design

    out = Path(args.output) if args.output and args.output != STDIO else None
    if out is not None:
        check_writable(out, args.force, reading_path(args))
    project, base = open_project(args)
    try:
        result = design(project, base)
    except DesignError as exc:
        fail(f"cannot design: {exc}; no bill of materials was written", code=3)
    from offgrid.report.export import bom_text

    text = bom_text(project, result)
    from offgrid.economics.generator_bom import unpriced_note

    note = unpriced_note(project, result)
    if note:
        print(f"offgrid: note: {note}", file=sys.stderr)
    if out is None:
        sys.stdout.write(text)
    else:
        write_output(out, text, reading_path(args))
        print(f"offgrid: wrote {out}", file=sys.stderr)
    return 0
