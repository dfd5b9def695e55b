"""``offgrid report``: the design report of a project as HTML, Markdown or text."""

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
        "report",
        help="write the design report (HTML, Markdown or text)",
        description="Design a project and write its report: site, climate, loads, design "
        "month, every figure with its reason, strings, wiring, bill of materials, "
        "costs, variants, cautions and assumptions. Without -o the report goes to "
        "the standard output.",
    )
    add_project_argument(p)
    p.add_argument(
        "--format",
        choices=("html", "md", "txt", "client"),
        help="report format (default: from the -o suffix; txt on the standard "
        "output, html for a file without a known suffix); client: the one-page client "
        "summary (text)",
    )
    p.add_argument(
        "-o",
        "--output",
        metavar="FILE",
        help="write the report to FILE (default, or -: the standard output)",
    )
    p.add_argument("--force", action="store_true", help="overwrite FILE if it exists")
    p.add_argument("--no-charts", action="store_true", help="leave the charts out (HTML)")
    p.add_argument(
        "--no-variants",
        action="store_true",
        help="leave out the side-by-side comparison of the project's variants",
    )
    p.add_argument(
        "--bom",
        metavar="CSV",
        help="also write the bill of materials as CSV (- for the standard output)",
    )
    sim = p.add_argument_group("reliability")
    sim.add_argument(
        "--simulate",
        action="store_true",
        help="run the reliability simulation and include it (LOLP, state of "
        "charge, battery life, trade-off; about a second more)",
    )
    sim.add_argument(
        "--years", default="30", metavar="N", help="with --simulate: years of weather (default 30)"
    )
    sim.add_argument(
        "--seed",
        default="1",
        metavar="S",
        help="with --simulate: seed of the weather generator (default 1)",
    )
    with_example(
        p,
        "offgrid report --demo -o demo-report.html",
        "writes the demonstration project's report as one HTML file with charts "
        "(-o - or no -o: text on the standard output).",
    )
    p.set_defaults(func=run)


def choose_format(fmt: str | None, output: str | None) -> str:
    from offgrid.report import SUFFIXES

    if fmt:
        return fmt
    if output:
        return SUFFIXES.get(Path(output).suffix.lower(), "html")
    return "txt"


def run(args: argparse.Namespace) -> int:
    from offgrid.commands.output import check_writable, write_output
    from offgrid.design.result import DesignError

    if args.output == STDIO and args.bom == STDIO:
        fail("-o - and --bom - cannot both use the standard output: give one of them a file")
    if args.output == STDIO:
        args.output = None
    fmt = choose_format(args.format, args.output)
    years, seed = 30, 1
    if args.simulate:
        from offgrid.simulate.weather import check_seed, check_years

        try:
            years, seed = check_years(args.years), check_seed(args.seed)
        except ValueError as exc:
            fail(str(exc))
    out = Path(args.output) if args.output else None
    bom_path = Path(args.bom) if args.bom and args.bom != STDIO else None
    if out is not None:
        check_writable(out, args.force, reading_path(args))
    if bom_path is not None:
        check_writable(bom_path, args.force, reading_path(args))
    project, base = open_project(args)

    from offgrid.design.sizing import design
    from offgrid.report import make_report

    try:
        result = design(project, base)
    except DesignError as exc:
        fail(f"cannot design: {exc}; no report was written", code=3)
    try:
        text = make_report(
            project,
            base,
            fmt,
            design=result,
            with_charts=False if args.no_charts else None,
            with_variants=not args.no_variants,
            simulate=args.simulate,
            years=years,
            seed=seed,
        )
    except (ValueError, DesignError) as exc:
        fail(f"cannot build the report: {exc}; no report was written", code=3)
    if bom_path is not None or args.bom == STDIO:
        from offgrid.report.export import bom_text

        if bom_path is None:
            sys.stdout.write(bom_text(project, result))
        else:
            write_output(bom_path, bom_text(project, result), reading_path(args))
    if out is None:
        sys.stdout.write(text)
        return 0
    write_output(out, text, reading_path(args))
    print(f"offgrid: wrote {out} ({fmt}, {len(text.encode('utf-8')):,} bytes)", file=sys.stderr)
    return 0
