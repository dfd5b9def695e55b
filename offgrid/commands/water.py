"""``offgrid water``: size the project's solar water supplies (``[[water]]`` tables)."""

from __future__ import annotations

import argparse
import sys

from offgrid.commands.common import add_project_argument, fail, open_project, with_example


def register(sub) -> None:
    p = sub.add_parser(
        "water",
        help="size the project's solar water pumping",
        description="Size each [[water]] supply of a project: head, the pump on the "
        "array through the day, the array, the tank, and the tank's water balance over "
        "years of synthetic weather.  --demo uses the bundled demonstration water point.",
    )
    add_project_argument(p)
    p.add_argument("--json", action="store_true", help="print the result as JSON")
    p.add_argument(
        "--years", type=int, default=30, help="years of synthetic weather (default 30; 0: none)"
    )
    p.add_argument("--seed", type=int, default=1, help="seed of the synthetic weather")
    p.add_argument(
        "--report",
        metavar="FILE",
        help="also write the pumping report to FILE (.md: Markdown, else plain text)",
    )
    p.add_argument("--force", action="store_true", help="overwrite the report FILE if it exists")
    with_example(
        p,
        "offgrid water --demo",
        "sizes the bundled (invented) village water point: its head, array, tank and "
        "30 years of tank balance.",
    )
    p.set_defaults(func=run)


def run(args: argparse.Namespace) -> int:
    from offgrid.design.result import DesignError
    from offgrid.paths import demo_water_path
    from offgrid.water.balance import simulate_tank
    from offgrid.water.design import water_design
    from offgrid.water.text import water_lines, water_section

    if args.demo:
        if args.project:
            fail("give either PROJECT or --demo, not both")
        args.project, args.demo = str(demo_water_path()), False
    if not 0 <= args.years <= 1000:
        fail("--years: give 0 to 1000 years", field="--years")
    from pathlib import Path

    from offgrid.commands.common import reading_path
    from offgrid.commands.output import check_writable, write_output

    out = Path(args.report) if args.report else None
    if out is not None:
        check_writable(out, args.force, reading_path(args))
    project, base = open_project(args)
    if not project.water:
        fail(
            "the project has no [[water]] supply: add a [[water]] table (see offgrid water "
            "--demo for an example)",
            field="water",
        )
    sections, lines = [], []
    for i, supply in enumerate(project.water):
        try:
            w = water_design(project, i, base)
            rel = simulate_tank(project, i, args.years, args.seed, base)[1] if args.years else None
        except DesignError as exc:
            from offgrid.commands.common import design_failed

            design_failed(exc)
            raise
        sections.append(water_section(w, supply, rel))
        lines.extend(water_lines(w, supply, rel))
        lines.append("")
    if out is not None:
        from offgrid.water.report import water_report

        report = water_report(project, base)
        if out.suffix.lower() in (".md", ".markdown"):
            from offgrid.report.markdown import render_markdown as render
        else:
            from offgrid.report.text import render_text as render
        write_output(out, render(report), reading_path(args))
        print(f"offgrid: wrote {out}", file=sys.stderr)
    if args.json:
        from offgrid.commands.common import json_text

        print(json_text({"water": sections}))
    else:
        from offgrid.wording import confirm_words

        sys.stdout.write(confirm_words("\n".join(lines)))
    return 0
