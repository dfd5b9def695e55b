"""``offgrid prices``: show a project's price list, write a template to fill in, or import CSV."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import add_project_argument, fail, open_project


def register(sub) -> None:
    p = sub.add_parser("prices", help="show, template or import the project's price list",
                       description="Without options: list the parts of the design with their "
                                   "prices and say which have none. --template writes a CSV of "
                                   "every part to fill in; --import reads such a CSV (columns "
                                   "part, unit_price) into the project file.")
    add_project_argument(p)
    act = p.add_mutually_exclusive_group()
    act.add_argument("--template", action="store_true",
                     help="write a CSV of every part with its current price (blank if none)")
    act.add_argument("--import", dest="import_csv", metavar="CSV",
                     help="read prices from CSV into the project file (a backup is kept)")
    p.add_argument("-o", "--output", metavar="FILE", help="with --template: write to FILE")
    p.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    p.set_defaults(func=run)


def _design(project, base):
    from offgrid.result import DesignError
    from offgrid.sizing import design

    try:
        return design(project, base)
    except DesignError as exc:
        fail(f"cannot design: {exc}", code=3)


def run(args: argparse.Namespace) -> int:
    from offgrid.report.bom import bill_of_materials
    from offgrid.report.costs import (
        PriceListError,
        load_price_csv,
        merge_prices,
        money,
        price_for,
        price_template_csv,
    )

    if args.import_csv:
        if args.demo:
            fail("the bundled demonstration project is read-only; save a copy and import into "
                 "that")
        project, _ = open_project(args)
        src = Path(args.import_csv)
        try:
            new = load_price_csv(src)
        except PriceListError as exc:
            fail(str(exc))
        if not new:
            fail(f"{src} has no prices filled in; nothing was changed")
        project.prices = merge_prices(project.prices, new)
        from offgrid.project.store import save_project
        from offgrid.project.validate import validate_project

        problems = validate_project(project)
        if problems:
            fail("; ".join(str(p) for p in problems))
        try:
            save_project(project, args.project)
        except OSError as exc:
            fail(f"cannot save {args.project}: {exc}; the project file was not changed")
        print(f"offgrid: {len(new)} price(s) from {src} saved in {args.project} "
              f"(previous version kept as {args.project}.bak)", file=sys.stderr)
        return 0

    project, base = open_project(args)
    d = _design(project, base)
    bom = bill_of_materials(project, d)
    if args.template:
        text = price_template_csv(bom, project.prices)
        if args.output:
            from offgrid.commands.output import check_writable, write_output

            out = Path(args.output)
            check_writable(out, args.force)
            write_output(out, text)
            print(f"offgrid: wrote {out}; fill in unit_price and load it with --import",
                  file=sys.stderr)
        else:
            sys.stdout.write(text)
        return 0
    from offgrid.report.document import Cell, Table
    from offgrid.report.text import render_table

    cur = project.economics.currency
    missing = []
    rows = []
    for ln in bom:
        p = price_for(ln.key, project.prices)
        if p is None:
            missing.append(ln.key)
        rows.append((Cell(ln.key), Cell(f"{ln.quantity:g}"), Cell(ln.unit), Cell(money(p)),
                     Cell(money(None if p is None else p * ln.quantity))))
    table = Table("prices", ("Part", "Qty", "Unit", f"Price {cur}", f"Total {cur}"),
                  tuple(rows), ("l", "r", "l", "r", "r"), wrap=(0,))
    print("\n".join(render_table(table)))
    if missing:
        print(f"no price for: {', '.join(missing)}", file=sys.stderr)
        return 1
    return 0
