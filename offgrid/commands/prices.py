"""``offgrid prices``: show a project's price list, write a template to fill in, or import CSV."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from offgrid.commands.common import (
    STDIO,
    add_project_argument,
    fail,
    open_project,
    read_stdin,
    reading_path,
    with_example,
)


def register(sub) -> None:
    p = sub.add_parser(
        "prices",
        help="show, template or import the project's price list",
        description="Without options: list the parts of the design with their "
        "prices and say which have none. --template writes a CSV of "
        "every part to fill in; --import reads such a CSV (columns "
        "part, unit_price) into the project file.",
    )
    add_project_argument(p)
    act = p.add_mutually_exclusive_group()
    act.add_argument(
        "--template",
        action="store_true",
        help="write a CSV of every part with its current price (blank if none)",
    )
    act.add_argument(
        "--import",
        dest="import_csv",
        metavar="CSV",
        help="read prices from CSV into the project file (a backup is kept; "
        "- reads the standard input)",
    )
    p.add_argument(
        "-o",
        "--output",
        metavar="FILE",
        help="with --template: write to FILE (default, or -: the standard output)",
    )
    p.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    with_example(
        p,
        "offgrid prices site.toml --template -o prices.csv",
        "writes every part of site.toml's design with its price (blank if none) to "
        "prices.csv; fill in unit_price, then `offgrid prices site.toml --import "
        "prices.csv`.",
    )
    p.set_defaults(func=run)


def _design(project, base):
    from offgrid.design.result import DesignError
    from offgrid.design.sizing import design

    try:
        return design(project, base)
    except DesignError as exc:
        fail(f"cannot design: {exc}", code=3)


def run(args: argparse.Namespace) -> int:
    from offgrid.economics.bom import bill_of_materials
    from offgrid.economics.costs import money
    from offgrid.economics.prices import (
        PriceListError,
        load_price_csv,
        merge_prices,
        price_for,
        price_template_csv,
        read_price_csv,
    )

    if args.import_csv:
        if args.demo:
            fail("the bundled demonstration project is read-only; save a copy and import into that")
        if args.project == STDIO:
            fail("--import saves into the project file: name the file, not -")
        if args.import_csv == STDIO and args.project is None:
            fail("name the project file to import the prices into")
        from offgrid.project.atomic import fingerprint

        seen = fingerprint(args.project) if args.project else None  # before reading it
        project, _ = open_project(args)
        src = Path(args.import_csv)
        try:
            if args.import_csv == STDIO:
                src = Path("the standard input")
                new = read_price_csv(read_stdin("--import"), str(src))
            else:
                new = load_price_csv(src)
        except PriceListError as exc:
            fail(str(exc))
        if not new:
            fail(f"{src} has no prices filled in; nothing was changed")
        project.prices = merge_prices(project.prices, new)
        from offgrid.project.atomic import ChangedOnDisk, real_target
        from offgrid.project.store import save_project
        from offgrid.project.validate import validate_project

        problems = validate_project(project)
        if problems:
            fail("; ".join(str(p) for p in problems))
        try:
            save_project(project, args.project, expect=seen)
        except ChangedOnDisk:
            fail(
                f"{args.project} was changed by another program while the prices were "
                "being read; nothing was written. Run the import again (on the new version)"
            )
        except OSError as exc:
            fail(f"cannot save {args.project}: {exc}; the project file was not changed")
        bak = real_target(args.project).with_name(real_target(args.project).name + ".bak")
        print(
            f"offgrid: {len(new)} price(s) from {src} saved in {args.project} "
            f"(previous version kept as {bak})",
            file=sys.stderr,
        )
        return 0

    project, base = open_project(args)
    d = _design(project, base)
    bom = bill_of_materials(project, d)
    if args.template:
        text = price_template_csv(bom, project.prices)
        if args.output and args.output != STDIO:
            from offgrid.commands.output import check_writable, write_output

            out = Path(args.output)
            check_writable(out, args.force, reading_path(args))
            write_output(out, text, reading_path(args))
            print(
                f"offgrid: wrote {out}; fill in unit_price and load it with --import",
                file=sys.stderr,
            )
        else:
            sys.stdout.write(text)
        return 0
    from offgrid.economics.generator_bom import bom_prices
    from offgrid.report.document import Cell, Table
    from offgrid.report.text import render_table

    cur = project.economics.currency
    missing = []
    rows = []
    table = bom_prices(project)  # the generator set: generator.price when not listed
    for ln in bom:
        p = price_for(ln.key, table)
        if p is None:
            missing.append(ln.key)
        rows.append(
            (
                Cell(ln.key),
                Cell(f"{ln.quantity:g}"),
                Cell(ln.unit),
                Cell(money(p)),
                Cell(money(None if p is None else p * ln.quantity)),
            )
        )
    table = Table(
        "prices",
        ("Part", "Qty", "Unit", f"Price {cur}", f"Total {cur}"),
        tuple(rows),
        ("l", "r", "l", "r", "r"),
        wrap=(0,),
    )
    print("\n".join(render_table(table)))
    if missing:
        print(f"no price for: {', '.join(missing)}", file=sys.stderr)
        return 1
    return 0
